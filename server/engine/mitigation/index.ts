/**
 * Mitigation entry (docs/ARCHITECTURE.md, Mitigation): every option generator and the selectivity check, wired into
 * the search (search.ts). `mitigate` is what the API computes for POST /studies/:id/mitigate (in the study worker for
 * a large model: `mitigationOutcome` is the worker's call, it answers a bad bus as data instead of throwing across
 * the thread boundary). Pure: no I/O, no clock.
 */
import type { MitigationKind, MitigationResponse, Selectivity } from '../../../shared/schemas/mitigation';
import type { Model } from '../../../shared/schemas/model';
import { EngineError } from '../errors';
import type { StudyOptions } from '../study';
import { mitigateBus, type OptionGenerator, type SelectivityCheck } from './search';

/** Every option generator, in the order their options are proposed (the search sorts them best first). */
export const GENERATORS: { kind: MitigationKind; generate: OptionGenerator }[] = [];

/** The verdict of a change that moves no band of the devices downstream (an arc-flash relay, an isolated main). */
const selectivity: SelectivityCheck = ({ mode }) => {
  if (mode !== 'not-affected') throw new Error(`No selectivity check for mode ${mode}`);
  return {
    verdict: 'not-affected',
    sentence: 'Selectivity is not affected: the change moves no time-current band of the devices downstream.',
    checks: [],
  } satisfies Selectivity;
};

/** The options for one bus of a model: best first, each evaluated by the study engine on the patched model. */
export function mitigate(
  model: Model,
  busId: string,
  targetCalPerCm2: number,
  options: StudyOptions,
): Omit<MitigationResponse, 'studyId'> {
  return mitigateBus({ model, busId, targetCalPerCm2, options, generators: GENERATORS, selectivity });
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
): MitigationOutcome {
  const parsed = typeof model === 'string' ? (JSON.parse(model) as Model) : model;
  try {
    return { kind: 'ok', response: mitigate(parsed, busId, targetCalPerCm2, options) };
  } catch (e) {
    if (e instanceof EngineError) return { kind: 'invalid', code: e.code, message: e.message, field: e.field ?? null };
    throw e;
  }
}
