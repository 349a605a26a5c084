/**
 * The mitigation search's evaluator (server/engine/mitigation/search.ts, BusEvaluator) evaluates a patched model only
 * at the buses the patch can act at, shares one short-circuit solution between the patched models, and is shared by
 * the report appendix's searches. None of that may change an option.
 *
 * Source of every check: the study engine's own full evaluation, done here without any of those shortcuts — a fresh
 * runner (its own short-circuit factorization) on the model as written and on `applyModelPatch(model, option's
 * patch)`, every labelled bus, every operating scenario. The list of other buses an option changes must be exactly
 * the buses where those two full runs differ, and at every bus the evaluator leaves out the full runs must give the
 * same result. Models: the demo plant (generator, motors, no scenarios) and the solids building (four operating
 * scenarios), on their buses above 8 cal/cm² (the target figure, NFPA 70E Table 130.7(C)(15)(c) PPE step).
 */
import { applyModelPatch } from '../../shared/modelPatch';
import type { MitigationResponse } from '../../shared/schemas/mitigation';
import { modelSchema, type Model } from '../../shared/schemas/model';
import type { BusResult } from '../../shared/schemas/studyResults';
import { mitigate, mitigationOutcomes } from '../../server/engine/mitigation';
import { BusEvaluator } from '../../server/engine/mitigation/search';
import { createScenarioRunner } from '../../server/engine/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';

jest.setTimeout(300_000);

const TARGET = 8;

/** Every labelled bus of a model by a fresh runner (no shared solver, nothing kept). */
function fullRun(model: Model): Map<string, BusResult> {
  const runner = createScenarioRunner(model, {});
  return new Map(runner.busIds.map((id) => [id, runner.runBus(id)]));
}

const energy = (r: BusResult) => (r.status === 'ok' ? (r.incidentEnergyCalPerCm2 ?? null) : null);

/** The demo plant with operating scenarios added (invented for this test): utility at a lower fault level, motors stopped, generator out. */
function demoWithScenarios() {
  return {
    ...larkspurModel(),
    scenarios: [
      { id: 'util-low', name: 'Utility at 100 MVA', sources: { UTIL: { shortCircuitMva: 100 } } },
      { id: 'motors-off', name: 'Motors stopped', allMotorsOff: true },
      { id: 'gen-off', name: 'Generator out', sources: { 'GEN-1': { inService: false } } },
    ],
  };
}

/**
 * `searches`: buses and targets to search; null takes the three highest buses above 8 cal/cm². SWGR-A toward
 * 1.2 cal/cm² and USS-1 toward 2 cal/cm² on the demo are searches whose options change other buses (a lower
 * instantaneous pickup at a relay upstream of them), so the lists compared below are not all empty.
 */
function checkModel(name: string, input: () => unknown, searches: [string, number][] | null, minChanged: number) {
  describe(name, () => {
    const model = modelSchema.parse(input());
    const base = fullRun(model);
    const above = [...base.values()]
      .filter((r) => (energy(r) ?? 0) > TARGET)
      .sort((a, b) => (energy(b) as number) - (energy(a) as number))
      .map((r) => r.busId);
    const cases: [string, number][] = searches ?? above.slice(0, 3).map((id) => [id, TARGET]);

    it('lists as other buses exactly those where the full runs with and without the patch differ', () => {
      let options = 0;
      let changed = 0;
      for (const [busId, target] of cases) {
        const r = mitigate(model, busId, target, {});
        const evaluator = new BusEvaluator(model, {});
        for (const o of r.options) {
          options++;
          const after = fullRun(applyModelPatch(model, o.modelPatch));
          // The option's own bus: the energy the full run gives.
          expect(o.result.incidentEnergyCalPerCm2).toBe(energy(after.get(busId)!));
          const expected = [...base.keys()]
            .filter((id) => id !== busId)
            .flatMap((id) => {
              const b = energy(base.get(id)!);
              const a = energy(after.get(id)!);
              // The search's own rule: a difference of at most 1e-9 cal/cm² is float noise of a re-run.
              if (b === a || (b !== null && a !== null && Math.abs(a - b) <= 1e-9)) return [];
              return [{ busId: id, busName: base.get(id)!.busName, beforeCalPerCm2: b, afterCalPerCm2: a }];
            });
          expect(o.otherBuses).toEqual(expected);
          changed += expected.length;
          // Where the evaluator does not look, the full runs agree in everything, not only the energy.
          const actedOn = new Set(evaluator.busesActedOn(o.modelPatch));
          for (const id of base.keys()) if (!actedOn.has(id)) expect(after.get(id)).toEqual(base.get(id));
        }
      }
      expect(options).toBeGreaterThan(0);
      expect(changed).toBeGreaterThanOrEqual(minChanged);
    });

    it('gives each bus of a shared evaluation (the report appendix) the options of its own search', () => {
      const buses = above.slice(0, 3);
      expect(buses.length).toBeGreaterThan(0);
      const together = mitigationOutcomes(model, buses, TARGET, {});
      expect(together.map((o) => o.kind)).toEqual(buses.map(() => 'ok'));
      buses.forEach((busId, k) => {
        const alone: Omit<MitigationResponse, 'studyId'> = mitigate(model, busId, TARGET, {});
        expect(together[k]).toEqual({ kind: 'ok', response: alone });
      });
    });
  });
}

checkModel(
  'the demo plant',
  larkspurModel,
  [
    ['USS-1', TARGET],
    ['SWGR-A', 1.2],
    ['USS-1', 2],
  ],
  1,
);
checkModel('the demo plant with operating scenarios', demoWithScenarios, [['SWGR-A', 1.2]], 1);
checkModel('the solids building (operating scenarios)', solidsBuildingModel, null, 0);

describe('shared evaluation: a bus the search cannot take', () => {
  it('answers it as invalid, naming the field, and still computes the others', () => {
    const model = modelSchema.parse(larkspurModel());
    const worst = [...fullRun(model).values()].sort((a, b) => (energy(b) ?? 0) - (energy(a) ?? 0))[0].busId;
    const [bad, good] = mitigationOutcomes(model, ['NO-SUCH-BUS', worst], TARGET, {});
    expect(bad).toMatchObject({ kind: 'invalid', code: 'UNKNOWN_BUS', field: 'busId' });
    expect(good).toEqual({ kind: 'ok', response: mitigate(model, worst, TARGET, {}) });
  });
});
