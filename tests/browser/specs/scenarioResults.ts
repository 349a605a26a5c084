/**
 * Results of a study with operating scenarios (issue 19): the bus trace says which scenario the label takes and why,
 * and switches to another scenario's trace; a scenario in which the bus is de-energized cannot be chosen and says why;
 * the results table shows each bus's governing scenario and filters by it. Looked at on a desktop and on a phone.
 */
import { larkspurModel } from '../../../server/seed/larkspurModel';
import type { ModelInput } from '../../../shared/schemas/model';
import { axePage, checkA11y } from '../axe';
import type { Harness, Spec } from '../harness';
import {
  DEMO_PASSWORD,
  DESKTOP,
  PHONE,
  clearLocalStorage,
  pollUntil,
  api,
  assert,
  draftStudyWithModel,
  runToDone,
} from '../harness';

const SCENARIOS = [
  { id: 'util-min', name: 'Utility minimum', sources: { UTIL: { shortCircuitMva: 60 } } },
  { id: 'gen-only', name: 'Standby generator only', sources: { UTIL: { inService: false } } },
  { id: 'tie-open', name: 'Spare panel tie open', ties: { 'TIE-9': { closed: false } } },
];

/** A draft study of its own with the demo plant, a spare panel fed only through a tie, and three scenarios; run. */
async function runScenarioStudy(h: Harness): Promise<{ id: string; token: string }> {
  const m = larkspurModel();
  const model: ModelInput = {
    ...m,
    buses: [
      ...(m.buses ?? []),
      { id: 'PP-9', name: 'Spare panel', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-shallow' } },
    ],
    ties: [...(m.ties ?? []), { id: 'TIE-9', name: 'Spare panel tie', fromBus: 'PP-1', toBus: 'PP-9', closed: true }],
    scenarios: SCENARIOS,
  };
  const study = await draftStudyWithModel(h, {
    siteName: 'Scenario results plant (invented)',
    title: 'Results in operating scenarios',
    model,
  });
  await runToDone(h, study.id, study.token, 120_000);
  return { id: study.id, token: study.token };
}

interface BusBody {
  scenarioId: string;
  governingScenarioId: string;
  bus: {
    busId: string;
    scenarios: { scenarioId: string; name: string; status: string; incidentEnergyCalPerCm2?: number }[];
  };
}

export const specs: Spec[] = [
  {
    name: 'trace scenario switch: the label basis and why, another scenario’s trace, a de-energized one disabled; results by scenario',
    run: async (h) => {
      const { id, token } = await runScenarioStudy(h);
      // A bus where some scenario other than the governing one gives a trace (to switch to).
      const page1 = await api<{ rows: { busId: string; scenarioId: string }[] }>(
        h,
        `/studies/${id}/results?pageSize=100`,
        { token },
      );
      const bodies = await Promise.all(
        page1.rows.map((r) =>
          api<BusBody>(h, `/studies/${id}/results/buses/${encodeURIComponent(r.busId)}`, { token }),
        ),
      );
      const target =
        bodies.find((b) => b.governingScenarioId !== 'base') ??
        bodies.find((b) => b.bus.scenarios.filter((s) => s.status === 'ok').length > 1)!;
      const busId = target.bus.busId;
      const governing = target.bus.scenarios.find((s) => s.scenarioId === target.governingScenarioId)!;
      const other = target.bus.scenarios.find((s) => s.scenarioId !== governing.scenarioId && s.status === 'ok')!;
      assert(other, `a second scenario with a trace at ${busId}`);
      const otherTrace = await api<BusBody & { bus: { cases: { sentence: string }[] } }>(
        h,
        `/studies/${id}/results/buses/${encodeURIComponent(busId)}?scenario=${other.scenarioId}`,
        { token },
      );

      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/studies/${id}/bus/${encodeURIComponent(busId)}`);
      const basis = page.getByTestId('scenario-basis');
      await basis.getByText(`The label takes the scenario “${governing.name}”`, { exact: false }).waitFor();
      assert((await basis.textContent())?.includes('highest incident energy'), 'the sentence says why it governs');
      await page.getByTestId(`scenario-${governing.scenarioId}`).getByText('label basis').waitFor();
      assert(
        (await page.getByTestId(`scenario-${governing.scenarioId}`).getAttribute('aria-checked')) === 'true',
        'the governing scenario is shown first',
      );
      await page.getByTestId('trace-sentence').waitFor();
      const governingSentence = await page.getByTestId('trace-sentence').textContent();
      await page.getByTestId('cautions').waitFor();
      await h.shot(page, 'trace-scenarios-desktop');

      // Another scenario: its own trace, said not to be the label's basis; the cautions stay.
      await page.getByTestId(`scenario-${other.scenarioId}`).click();
      await page.getByTestId('trace-not-label').waitFor();
      await basis.getByText(`The trace below is of “${other.name}”`, { exact: false }).waitFor();
      const wanted = otherTrace.bus.cases.map((c) => c.sentence);
      await pollUntil(
        async () => wanted.includes((await page.getByTestId('trace-sentence').textContent()) ?? ''),
        `the trace of ${other.name}`,
      );
      assert(
        (await page.getByTestId(`scenario-${other.scenarioId}`).getAttribute('aria-checked')) === 'true',
        'the chosen scenario is checked',
      );
      if (governingSentence !== null && !wanted.includes(governingSentence)) {
        assert(
          (await page.getByTestId('trace-sentence').textContent()) !== governingSentence,
          'the trace changed with the scenario',
        );
      }
      await page.getByTestId('cautions').waitFor();
      await h.shot(page, 'trace-scenarios-other-desktop');

      // The spare panel is dead with its tie open: that scenario cannot be chosen, and says why.
      await page.goto(`${h.baseUrl}/studies/${id}/bus/PP-9`);
      const dead = page.getByTestId('scenario-tie-open');
      await dead.waitFor();
      assert((await dead.getAttribute('aria-disabled')) === 'true', 'the de-energized scenario is disabled');
      await page.getByTestId('scenario-note-tie-open').getByText('De-energized', { exact: false }).waitFor();
      await h.shot(page, 'trace-scenarios-deenergized-desktop');

      // The phone: the chips wrap, the sentence stays above the trace.
      await page.setViewportSize(PHONE);
      await page.goto(`${h.baseUrl}/studies/${id}/bus/${encodeURIComponent(busId)}`);
      await page.getByTestId('scenario-basis').waitFor();
      await page.getByTestId('trace-sentence').waitFor();
      await h.shot(page, 'trace-scenarios-phone-top');
      await page.getByTestId(`scenario-${other.scenarioId}`).click();
      await page.getByTestId('trace-not-label').waitFor();
      await h.shot(page, 'trace-scenarios-phone');

      // The results table: each bus's governing scenario, and the filter by it.
      await page.setViewportSize(DESKTOP);
      await page.goto(`${h.baseUrl}/studies/${id}?tab=results`);
      await page.getByTestId(`result-${busId}-scenario`).getByText(governing.name).waitFor();
      await page.getByTestId(`scenario-filter-${governing.scenarioId}`).click();
      const expected = page1.rows.filter((r) => r.scenarioId === governing.scenarioId).length;
      await page.getByTestId('results-count').getByText(`${expected} of ${page1.rows.length} buses`).waitFor();
      await h.shot(page, 'results-scenarios-desktop');
      await page.setViewportSize(PHONE);
      await page.getByTestId(`result-${busId}-scenario`).getByText(`Scenario: ${governing.name}`).waitFor();
      await h.shot(page, 'results-scenarios-phone');
      await page.close();

      // No serious accessibility violation on the trace (either scenario) and the results (the axe context).
      const ax = await axePage(DESKTOP);
      try {
        await ax.goto(`${h.baseUrl}/sign-in`);
        await clearLocalStorage(ax);
        await ax.goto(`${h.baseUrl}/sign-in`);
        await ax.getByTestId('email').fill('engineer@larkspur.example');
        await ax.getByTestId('password').fill(DEMO_PASSWORD);
        await ax.getByTestId('sign-in-submit').click();
        await ax.getByTestId('side-nav').waitFor();
        await ax.goto(`${h.baseUrl}/studies/${id}/bus/${encodeURIComponent(busId)}`);
        await ax.getByTestId('trace-sentence').waitFor();
        await checkA11y(ax, 'bus trace with scenarios');
        await ax.getByTestId(`scenario-${other.scenarioId}`).click();
        await ax.getByTestId('trace-not-label').waitFor();
        await checkA11y(ax, 'bus trace of another scenario');
        await ax.goto(`${h.baseUrl}/studies/${id}/bus/PP-9`);
        await ax.getByTestId('scenario-note-tie-open').waitFor();
        await checkA11y(ax, 'bus trace with a de-energized scenario');
        await ax.goto(`${h.baseUrl}/studies/${id}?tab=results`);
        await ax.getByTestId(`result-${busId}-scenario`).waitFor();
        await checkA11y(ax, 'results with scenarios');
      } finally {
        await ax.close();
      }
    },
  },
];
