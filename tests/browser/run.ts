/**
 * Browser tests: the real app, built and served by the real server, in headless Chromium (playwright-core).
 * Each spec is a named async function; the runner prints a closing "N passed, N failed" line and exits non-zero on failure.
 */
import { startHarness, type Harness } from './harness';
import { specs as signInSpecs } from './specs/signIn';
import { specs as adminSpecs } from './specs/admin';
import { specs as calcSpecs } from './specs/calc';
import { specs as studySpecs } from './specs/studies';
import { specs as modelScenarioSpecs } from './specs/modelScenarios';
import { specs as scenarioResultSpecs } from './specs/scenarioResults';
import { specs as deviceSettingsSpecs } from './specs/deviceSettings';
import { specs as labelSpecs } from './specs/labels';
import { specs as attentionSpecs } from './specs/attention.spec';
import { specs as reminderApprovalSpecs } from './specs/reminderApproval';
import { specs as unitsSpecs } from './specs/units';
import { specs as a11ySpecs } from './specs/a11y';
import { specs as oneLineSpecs } from './specs/oneLine';
import { specs as mitigationSpecs } from './specs/mitigation';
import { specs as largeModelSpecs } from './specs/largeModel';
import { closeAxe } from './axe';

export type Spec = { name: string; run: (h: Harness) => Promise<void> };

async function main(): Promise<void> {
  const all: Spec[] = [
    ...signInSpecs,
    ...adminSpecs,
    ...calcSpecs,
    ...studySpecs,
    ...modelScenarioSpecs,
    ...scenarioResultSpecs,
    ...deviceSettingsSpecs,
    ...labelSpecs,
    ...unitsSpecs,
    ...attentionSpecs,
    ...reminderApprovalSpecs,
    ...a11ySpecs,
    ...oneLineSpecs,
    ...mitigationSpecs,
    ...largeModelSpecs,
  ];
  const only = process.argv[2];
  const selected = only ? all.filter((s) => s.name.includes(only)) : all;
  const h = await startHarness();
  let passed = 0;
  let failed = 0;
  for (const spec of selected) {
    const start = Date.now();
    try {
      await spec.run(h);
      passed++;
      console.log(`  ✓ ${spec.name} (${Date.now() - start} ms)`);
    } catch (e) {
      failed++;
      console.log(`  ✗ ${spec.name}\n    ${(e as Error).stack?.split('\n').slice(0, 6).join('\n    ')}`);
    }
  }
  await closeAxe();
  await h.stop();
  console.log(`\nbrowser: ${passed} passed, ${failed} failed`);
  process.exit(failed ? 1 : 0);
}

void main().catch((e) => {
  console.error(e);
  process.exit(1);
});
