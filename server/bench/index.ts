/**
 * `npm run bench`: performance figures, printed (never asserted in tests). Optional filter: `npm run bench -- trip`.
 */
import { benchIncidentEnergy } from './incidentEnergy';
import { benchShortCircuit } from './shortCircuit';
import { benchLabels } from './labels';
import { benchMitigation } from './mitigation';
import { benchOneLine } from './oneLine';
import { benchScaling, benchStudyApi10k } from './scaling';
import { benchStudyThroughApi } from './study';
import { benchTrip } from './trip';

interface BenchResult {
  name: string;
  opsPerSecond: number;
  detail: string;
}

const BENCHES: [string, () => Promise<BenchResult>][] = [
  ['incident-energy', benchIncidentEnergy],
  ['trip', benchTrip],
  ['short-circuit', benchShortCircuit],
  ['study', benchStudyThroughApi],
  ['scaling', benchScaling],
  ['api-10k', benchStudyApi10k],
  ['labels', benchLabels],
  ['oneline', benchOneLine],
  ['mitigation', benchMitigation],
];

async function main(): Promise<void> {
  const filter = process.argv[2];
  console.log(`Emberline benchmarks (node ${process.version})\n`);
  for (const [key, run] of BENCHES) {
    if (filter && !key.includes(filter)) continue;
    const r = await run();
    const rate = r.opsPerSecond < 10 ? r.opsPerSecond.toFixed(2) : r.opsPerSecond.toFixed(0);
    console.log(`${r.name}\n  ${rate} per second\n  ${r.detail.split('\n').join('\n  ')}\n`);
  }
}

void main();
