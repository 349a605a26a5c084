import { LRUCache } from 'lru-cache';
import { BASE_SCENARIO_ID, type Model } from '../../shared/schemas/model';
import type { BusResult } from '../../shared/schemas/studyResults';
import { applyScenario, createStudyRunner, scenariosOf, type StudyOptions, type StudyRunner } from '../engine/study';

/**
 * One bus of a finished run evaluated again in one operating scenario (GET /studies/:id/results/buses/:busId?scenario=…).
 * The run stores each bus's governing scenario with its whole trace, and only a summary of the others; the trace of
 * another scenario is the same engine on the same model snapshot and settings with that scenario applied — exactly
 * what the run evaluated for it (`createScenarioRunner` builds each scenario's model with `applyScenario` and runs
 * `createStudyRunner(…).runBus`), so its numbers are the run's. Pure (no database, no clock): it runs in the study
 * worker thread for a large model and in the main thread for a small one (server/services/results.ts).
 */

/** What a scenario gives at the bus: its result, or that no source in service reaches the bus in it. */
export type ScenarioBusOutcome =
  /** The bus, and the model's protective devices its trace names (to draw their bands). */
  | { kind: 'result'; bus: BusResult; devices: { id: string; device: Model['devices'][number]['device'] }[] }
  | { kind: 'de-energized' }
  | { kind: 'unknown-scenario' }
  | { kind: 'unknown-bus' };

interface Prepared {
  runner: StudyRunner;
  deEnergized: Set<string>;
  devices: Map<string, Model['devices'][number]>;
}

/**
 * A scenario's runner (its short-circuit network factored once) kept for the next bus of the same run and scenario:
 * an engineer walking from bus to bus in one scenario pays for the network once. Two at most (a large plant's
 * factored network is tens of megabytes).
 */
const prepared = new LRUCache<string, Prepared>({ max: 2 });

/** Clears the kept runners (tests). */
export function clearScenarioRunners(): void {
  prepared.clear();
}

/**
 * The bus `busId` in scenario `scenarioId` (`base`: the model as written) of `model` (a run's parsed model snapshot)
 * with `options` (the run's settings snapshot). `key` names the run and scenario for the runner cache (its model and
 * options never change: a run's snapshots are written once); without it nothing is kept.
 */
export function scenarioBusResult(
  model: Model,
  options: StudyOptions,
  scenarioId: string,
  busId: string,
  key?: string,
): ScenarioBusOutcome {
  let p = key ? prepared.get(key) : undefined;
  if (!p) {
    let applied;
    if (scenarioId === BASE_SCENARIO_ID) applied = scenariosOf(model)[0];
    else {
      const scenario = model.scenarios?.find((s) => s.id === scenarioId);
      if (!scenario) return { kind: 'unknown-scenario' };
      applied = applyScenario(model, scenario);
    }
    p = {
      runner: createStudyRunner(applied.model, options),
      deEnergized: applied.deEnergizedBusIds,
      devices: new Map(model.devices.map((d) => [d.id, d])),
    };
    if (key) prepared.set(key, p);
  }
  if (p.deEnergized.has(busId)) return { kind: 'de-energized' };
  if (!p.runner.busIds.includes(busId)) return { kind: 'unknown-bus' };
  const bus = p.runner.runBus(busId);
  const ids = new Set<string>();
  for (const c of bus.cases) for (const d of c.devices) ids.add(d.deviceId);
  const devices = [...ids].flatMap((id) => {
    const d = p.devices.get(id);
    return d ? [{ id: d.id, device: d.device }] : [];
  });
  return { kind: 'result', bus, devices };
}
