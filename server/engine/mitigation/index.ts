/**
 * Mitigation entry (docs/ARCHITECTURE.md, Mitigation): every option generator and the selectivity check, wired into
 * the search (search.ts). `mitigate` is what the API computes for POST /studies/:id/mitigate (in the study worker for
 * a large model: `mitigationOutcome` is the worker's call, it answers a bad bus as data instead of throwing across
 * the thread boundary). Pure: no I/O, no clock.
 */
import type { MitigationKind, MitigationResponse } from '../../../shared/schemas/mitigation';
import type { ElectronicTripType } from '../../../shared/schemas/device';
import type { Model } from '../../../shared/schemas/model';
import { EngineError } from '../errors';
import type { StudyOptions } from '../study';
import { arcFlashRelay, currentLimitingFuse, lineSideIsolation } from './additions';
import { BusEvaluator, mitigateBus, type OptionGenerator } from './search';
import { checkSelectivity } from './selectivity';
import { settingGenerators } from './settings';

/**
 * The organization's electronic trip-unit types by device-type id: a placed device taken from the library
 * (`library.deviceTypeId` with its switch positions) is searched over its own type's positions. Plain JSON (it crosses
 * to the study worker).
 */
export type TripTypes = Record<string, ElectronicTripType>;

/** Every option generator, in the order they are asked (the search sorts the options best first). */
export function generators(tripTypes: TripTypes = {}): { kind: MitigationKind; generate: OptionGenerator }[] {
  const settings = settingGenerators({
    tripTypeOf: (placed) => (placed.library ? (tripTypes[placed.library.deviceTypeId] ?? null) : null),
  });
  return [
    { kind: 'instantaneous-setting', generate: settings.instantaneousSetting },
    { kind: 'short-time-delay', generate: settings.shortTimeDelay },
    { kind: 'maintenance-mode', generate: settings.maintenanceMode },
    { kind: 'arc-flash-relay', generate: arcFlashRelay },
    { kind: 'current-limiting-fuse', generate: currentLimitingFuse },
    { kind: 'line-side-isolation', generate: lineSideIsolation },
  ];
}

/**
 * The options for one bus of a model: best first, each evaluated by the study engine on the patched model.
 * `evaluator`: one shared by several searches on this model with these options (`mitigationOutcomes`).
 */
export function mitigate(
  model: Model,
  busId: string,
  targetCalPerCm2: number,
  options: StudyOptions,
  tripTypes: TripTypes = {},
  evaluator?: BusEvaluator,
): Omit<MitigationResponse, 'studyId'> {
  return mitigateBus({
    model,
    busId,
    targetCalPerCm2,
    options,
    generators: generators(tripTypes),
    selectivity: checkSelectivity,
    evaluator,
  });
}

/** What the worker answers: the options, or why the bus cannot be mitigated (the field it names). */
export type MitigationOutcome =
  | { kind: 'ok'; response: Omit<MitigationResponse, 'studyId'> }
  | { kind: 'invalid'; code: string; message: string; field: string | null };

/** `mitigate` with the bus's input errors as data (`model` may be the checked model's JSON text). */
export function mitigationOutcome(
  model: Model | string,
  busId: string,
  targetCalPerCm2: number,
  options: StudyOptions,
  tripTypes: TripTypes = {},
): MitigationOutcome {
  return mitigationOutcomes(model, [busId], targetCalPerCm2, options, tripTypes)[0];
}

/**
 * The outcomes of several buses of one model toward one target (the report's appendix), in the order asked: one
 * evaluator for all of them, so the short-circuit solutions and every result already computed (the base buses, a
 * change another bus's search tried too) are reused. Each bus's options equal `mitigate`'s for that bus alone.
 */
export function mitigationOutcomes(
  model: Model | string,
  busIds: readonly string[],
  targetCalPerCm2: number,
  options: StudyOptions,
  tripTypes: TripTypes = {},
): MitigationOutcome[] {
  const parsed = typeof model === 'string' ? (JSON.parse(model) as Model) : model;
  const invalid = (e: unknown): MitigationOutcome => {
    if (e instanceof EngineError) return { kind: 'invalid', code: e.code, message: e.message, field: e.field ?? null };
    throw e;
  };
  let evaluator: BusEvaluator;
  try {
    evaluator = new BusEvaluator(parsed, options);
  } catch (e) {
    const outcome = invalid(e);
    return busIds.map(() => outcome);
  }
  return busIds.map((busId) => {
    try {
      return { kind: 'ok', response: mitigate(parsed, busId, targetCalPerCm2, options, tripTypes, evaluator) };
    } catch (e) {
      return invalid(e);
    }
  });
}
