/**
 * Mitigation search benchmark (server/engine/mitigation): the options toward 8 cal/cm² for the demo plant's worst bus,
 * the report appendix's shared evaluation of the demo's buses above 8 cal/cm², and one search on the worst bus of a
 * generated 2 000-bus plant given a relay on each transformer primary (without one its worst bus has no device to
 * change, only isolation: a search with nothing to do). Engine only (as the study worker computes it), the engine's
 * default run options.
 * Prints milliseconds (the first search of each model includes the warm-up of the engine code); asserts nothing.
 */
import { performance } from 'node:perf_hooks';
import { modelSchema, type Model } from '../../shared/schemas/model';
import { mitigate, mitigationOutcomes } from '../engine/mitigation';
import { runStudy } from '../engine/study';
import { generatedPlant } from '../seed/generatedPlant';
import { larkspurModel } from '../seed/larkspurModel';

const TARGET = 8;

/** The labelled buses above the target, highest energy first. */
function busesAbove(model: Model): { busId: string; energy: number }[] {
  return runStudy(model, {})
    .buses.flatMap((b) =>
      b.incidentEnergyCalPerCm2 !== undefined && b.incidentEnergyCalPerCm2 > TARGET
        ? [{ busId: b.busId, energy: b.incidentEnergyCalPerCm2 }]
        : [],
    )
    .sort((a, b) => b.energy - a.energy);
}

function timed<T>(f: () => T): [T, number] {
  const t0 = performance.now();
  const out = f();
  return [out, performance.now() - t0];
}

export async function benchMitigation(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const demo = modelSchema.parse(larkspurModel());
  const above = busesAbove(demo);
  const worst = above[0].busId;
  const [first, coldMs] = timed(() => mitigate(demo, worst, TARGET, {}));
  const [, warmMs] = timed(() => mitigate(demo, worst, TARGET, {}));
  const appendixBuses = above.slice(0, 12).map((b) => b.busId);
  const [, appendixMs] = timed(() => mitigationOutcomes(demo, appendixBuses, TARGET, {}));

  const input = generatedPlant();
  // An inverse-time relay (no instantaneous element) on each transformer primary: 100 A pickup (about 1.4 × the
  // 1 500 kVA rating at 12.47 kV), time dial 2, 5-cycle breaker. Invented for the benchmark.
  for (const t of input.transformers ?? [])
    input.devices!.push({
      id: `R-${t.id}`,
      branch: t.id,
      end: 'from',
      device: { kind: 'relay', curve: 'IEEE-VI', pickupA: 100, timeDial: 2, breakerCycles: 5 },
    });
  const plant = modelSchema.parse(input);
  const plantWorst = busesAbove(plant)[0]?.busId;
  const [plantOptions, plantMs] = plantWorst
    ? timed(() => mitigate(plant, plantWorst, TARGET, {}))
    : [null, Number.NaN];

  return {
    name: `mitigation search toward ${TARGET} cal/cm² (demo plant, ${demo.buses.length} buses)`,
    opsPerSecond: 1000 / warmMs,
    detail: [
      `demo worst bus ${worst}: ${coldMs.toFixed(0)} ms first, ${warmMs.toFixed(0)} ms again (${first.options.length} options)`,
      `demo report appendix, ${appendixBuses.length} buses above ${TARGET} cal/cm² in one evaluation: ${appendixMs.toFixed(0)} ms`,
      plantWorst
        ? `generated plant with primary relays (${plant.buses.length} buses) worst bus ${plantWorst}: ${plantMs.toFixed(0)} ms (${plantOptions!.options.length} options)`
        : `generated plant with primary relays (${plant.buses.length} buses): no bus above ${TARGET} cal/cm²`,
    ].join('\n'),
  };
}
