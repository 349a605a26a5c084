/**
 * Mitigation options for a bus of a revision (POST /studies/:id/mitigate) and applying one in a new draft revision
 * (POST /studies/:id/mitigate/apply). The options are computed by the engine (server/engine/mitigation) on the
 * revision's checked model with the organization's run settings, exactly as a run of that revision would start
 * (`runSettingsOf`), so running a revision made from an option's patch gives the energy the option promised.
 */
import { createHash, randomUUID } from 'node:crypto';
import { LRUCache } from 'lru-cache';
import { Op, type Transaction } from 'sequelize';
import { applyModelPatch, ModelPatchError } from '../../shared/modelPatch';
import type {
  ApplyMitigationRequest,
  ApplyMitigationResponse,
  MitigateRequest,
  MitigationResponse,
} from '../../shared/schemas/mitigation';
import { deviceDefinitionSchema } from '../../shared/schemas/deviceLibrary';
import type { Model } from '../../shared/schemas/model';
import { DeviceType, Study } from '../db/models';
import type { MitigationOutcome, TripTypes } from '../engine/mitigation';
import { recordAudit } from './audit';
import type { AppContext, AuthUser } from './context';
import { ApiError, modelIssuesError } from './errors';
import { checkModelText } from './modelCheck';
import { getSettings } from './organization';
import { runSettingsOf } from './runs';
import { findStudy } from './scope';
import { nextRevision, toStudyDtos } from './studies';
import { mitigationOffThread, mitigationsOffThread } from './studyWorker';

/**
 * Answers kept by everything they depend on (the checked model's text, the run settings, the bus and the target):
 * the screen asks again when it returns to a bus, and applying an option recomputes the same answer.
 */
const answers = new LRUCache<string, Omit<MitigationResponse, 'studyId'>>({ max: 32 });
const inFlight = new Map<string, Promise<MitigationOutcome>>();

/** Clears the kept answers (tests). */
export function clearMitigationAnswers(): void {
  answers.clear();
}

/**
 * Searches computed at once in this process; more wait their turn (each takes a study worker — a thread with its own
 * engine and up to 1.5 GB — for seconds to minutes on a large plant: a few engineers asking at once must not start a
 * worker each). An engineering choice for a small server, no source.
 */
export const MITIGATION_SEARCHES_AT_ONCE = 2;
let searching = 0;
const waiting: (() => void)[] = [];

async function inTurn<T>(search: () => Promise<T>): Promise<T> {
  if (searching < MITIGATION_SEARCHES_AT_ONCE) searching += 1;
  else await new Promise<void>((resolve) => waiting.push(resolve)); // the slot is handed over as it is
  try {
    return await search();
  } finally {
    const next = waiting.shift();
    if (next) next();
    else searching -= 1;
  }
}

/**
 * The organization's electronic trip-unit types the model's placed devices were taken from (by device-type id), so a
 * setting is searched over the unit's own switch positions. A type that no longer reads is left out (the generic
 * starter set is then looked up by name, or the device's settings are searched as numbers).
 */
async function tripTypesOf(actor: AuthUser, model: Model): Promise<TripTypes> {
  const ids = [...new Set(model.devices.flatMap((d) => (d.library?.positions ? [d.library.deviceTypeId] : [])))];
  if (!ids.length) return {};
  const rows = await DeviceType.findAll({
    where: { organizationId: actor.organizationId, id: { [Op.in]: ids } },
    attributes: ['id', 'definition'],
  });
  const out: TripTypes = {};
  for (const row of rows) {
    const parsed = deviceDefinitionSchema.safeParse(JSON.parse(row.definition));
    if (parsed.success && parsed.data.kind === 'electronic') out[row.id] = parsed.data.tripType;
  }
  return out;
}

/** What a search of a revision starts from: its checked model, the run settings, the trip-unit types, the answer keys. */
async function searchInputs(actor: AuthUser, study: Study) {
  const checked = checkModelText(study.model);
  if (checked.snapshot === null) throw modelIssuesError([...checked.issues], 'model.');
  const snapshot = checked.snapshot;
  const options = runSettingsOf(await getSettings(actor.organizationId));
  // Only a model with library switch positions needs its device types (and is parsed here for them).
  const tripTypes = snapshot.includes('"positions"') ? await tripTypesOf(actor, JSON.parse(snapshot) as Model) : {};
  // By a digest: a large model's text is megabytes, not to be kept as a key.
  const digest = createHash('sha256')
    .update(`${JSON.stringify(options)}\n${JSON.stringify(tripTypes)}\n`)
    .update(snapshot)
    .digest('hex');
  const keyOf = (busId: string, targetCalPerCm2: number) =>
    createHash('sha256').update(`${digest}\n${busId}\n${targetCalPerCm2}`).digest('hex');
  return { snapshot, options, tripTypes, keyOf };
}

/** The answer of an outcome, or the 400 naming the field the search refused. */
function answerOf(outcome: MitigationOutcome): Omit<MitigationResponse, 'studyId'> {
  if (outcome.kind === 'invalid') {
    const field = outcome.field ?? 'busId';
    throw new ApiError('bad_request', outcome.message, { [field]: outcome.message });
  }
  return outcome.response;
}

async function computeOptions(
  actor: AuthUser,
  study: Study,
  busId: string,
  targetCalPerCm2: number,
): Promise<Omit<MitigationResponse, 'studyId'>> {
  const { snapshot, options, tripTypes, keyOf } = await searchInputs(actor, study);
  const key = keyOf(busId, targetCalPerCm2);
  const hit = answers.get(key);
  if (hit) return hit;
  let computing = inFlight.get(key);
  if (!computing) {
    // Always in the study worker: the search runs the engine on the whole model once per candidate setting and
    // option (seconds even for a plant of ten buses), which would hold up every other request in the main thread.
    computing = inTurn(() => mitigationOffThread(snapshot, options, busId, targetCalPerCm2, tripTypes));
    inFlight.set(key, computing);
    void computing.then(
      () => inFlight.delete(key),
      () => inFlight.delete(key),
    );
  }
  const response = answerOf(await computing);
  answers.set(key, response);
  return response;
}

/**
 * The options of several buses of one revision toward one target (the report's appendix), in the order asked: each
 * the answer `mitigationOptions` gives for that bus (kept answers are taken; the others are computed together in one
 * worker call, sharing the short-circuit solutions and the results already computed), or the error it would answer.
 */
export async function mitigationOptionsOfBuses(
  actor: AuthUser,
  studyId: string,
  busIds: readonly string[],
  targetCalPerCm2: number,
): Promise<({ response: MitigationResponse } | { error: ApiError })[]> {
  const study = await findStudy(actor, studyId);
  let inputs: Awaited<ReturnType<typeof searchInputs>>;
  try {
    inputs = await searchInputs(actor, study);
  } catch (e) {
    // A model that cannot be searched: the same answer for every bus.
    if (e instanceof ApiError) return busIds.map(() => ({ error: e }));
    throw e;
  }
  const { snapshot, options, tripTypes, keyOf } = inputs;
  const missing = [...new Set(busIds.filter((id) => !answers.has(keyOf(id, targetCalPerCm2))))];
  const computed = new Map<string, MitigationOutcome>();
  if (missing.length) {
    const outcomes = await inTurn(() => mitigationsOffThread(snapshot, options, missing, targetCalPerCm2, tripTypes));
    missing.forEach((id, k) => computed.set(id, outcomes[k]));
  }
  return busIds.map((busId) => {
    const key = keyOf(busId, targetCalPerCm2);
    try {
      let response = answers.get(key);
      if (!response) {
        response = answerOf(computed.get(busId)!);
        answers.set(key, response);
      }
      return { response: { studyId: study.id, ...response } };
    } catch (e) {
      if (e instanceof ApiError) return { error: e };
      throw e;
    }
  });
}

/** The options for one bus of any revision the engineer sees (draft, in review, approved, superseded). */
export async function mitigationOptions(
  actor: AuthUser,
  studyId: string,
  body: MitigateRequest,
): Promise<MitigationResponse> {
  const study = await findStudy(actor, studyId);
  const response = await computeOptions(actor, study, body.busId, body.targetCalPerCm2);
  return { studyId: study.id, ...response };
}

/** 409 unless a new revision may start from `from`: approved or superseded, and no other revision of the site open. */
async function requireRevisable(from: Study, transaction?: Transaction): Promise<void> {
  if (from.status === 'draft' || from.status === 'in-review') {
    throw ApiError.conflict(
      `Revision ${from.revision} is still ${from.status}: edit it (or its model) instead of applying an option to a new revision`,
    );
  }
  const open = await Study.findOne({
    where: { siteId: from.siteId, status: { [Op.in]: ['draft', 'in-review'] } },
    attributes: ['id', 'revision', 'status'],
    transaction,
  });
  if (open) {
    throw ApiError.conflict(
      `Revision ${open.revision} of this site is already open (${open.status}); finish it before applying an option to a new revision`,
    );
  }
}

/**
 * A new draft revision of the site (like POST /studies/:id/revise) whose model is this revision's with the option's
 * patch applied. The option is computed again here from the stored model (never taken from the client).
 */
export async function applyMitigation(
  ctx: AppContext,
  actor: AuthUser,
  studyId: string,
  body: ApplyMitigationRequest,
): Promise<ApplyMitigationResponse> {
  const from = await findStudy(actor, studyId);
  await requireRevisable(from);
  const response = await computeOptions(actor, from, body.busId, body.targetCalPerCm2);
  const option = response.options.find((o) => o.id === body.optionId);
  if (!option) {
    const ids = response.options.map((o) => o.id);
    const message = `No option "${body.optionId}" for bus ${body.busId} at ${body.targetCalPerCm2} cal/cm²${
      ids.length ? ` (the options are ${ids.join(', ')})` : ' (there is no option for this bus)'
    }`;
    throw new ApiError('bad_request', message, { optionId: message });
  }
  // The patch is applied to the model as stored (the engineer's own text, not its checked form): the revision keeps
  // every element as written and differs only by the option's change.
  let text: string;
  try {
    text = JSON.stringify(applyModelPatch(JSON.parse(from.model) as Model, option.modelPatch));
  } catch (e) {
    if (e instanceof ModelPatchError) throw new ApiError('bad_request', e.message, { optionId: e.message });
    throw e;
  }
  const checked = checkModelText(text);
  if (checked.snapshot === null) throw modelIssuesError([...checked.issues], 'model.');

  const study = await ctx.db.sequelize.transaction(async (transaction) => {
    const source = await findStudy(actor, studyId, transaction);
    await requireRevisable(source, transaction);
    if (source.model !== from.model)
      throw ApiError.conflict('This revision changed meanwhile; ask for the options again');
    const s = await Study.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        siteId: source.siteId,
        revision: await nextRevision(source.siteId, transaction),
        title: source.title,
        status: 'draft',
        model: text,
        modelUpdatedAt: ctx.now(),
        lastEditedById: actor.id,
        parentStudyId: source.id,
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'study.mitigation-applied',
        entityType: 'study',
        entityId: s.id,
        summary: {
          from: source.id,
          revision: s.revision,
          busId: body.busId,
          optionId: option.id,
          kind: option.kind,
          targetCalPerCm2: body.targetCalPerCm2,
          promisedCalPerCm2: option.result.incidentEnergyCalPerCm2,
        },
      },
      transaction,
    );
    return s;
  });
  return { study: (await toStudyDtos(ctx, actor.organizationId, [study]))[0], option };
}
