import { z } from 'zod';
import { printableName } from './text';
import { modelIssueSchema, modelSchema, type ModelInput } from './model';
import { modelWarningSchema } from './modelWarnings';
import { studyResultsSchema } from './studyResults';

export const STUDY_STATUSES = ['draft', 'in-review', 'approved', 'superseded'] as const;
export const studyStatusSchema = z.enum(STUDY_STATUSES);
export type StudyStatus = z.infer<typeof studyStatusSchema>;

export const STUDY_STATUS_LABELS: Record<StudyStatus, string> = {
  draft: 'Draft',
  'in-review': 'In review',
  approved: 'Approved',
  superseded: 'Superseded',
};

export const runSchema = z
  .object({
    id: z.string(),
    status: z.enum(['queued', 'running', 'done', 'failed']),
    progress: z.number().describe('0 to 1'),
    message: z.string(),
    modelVersion: z.number(),
    startedAt: z.string(),
    finishedAt: z.string().nullable(),
  })
  .meta({ id: 'StudyRun' });
export type RunDto = z.infer<typeof runSchema>;

export const studySchema = z
  .object({
    id: z.string(),
    siteId: z.string(),
    siteName: z.string(),
    revision: z.number(),
    title: z.string(),
    status: studyStatusSchema,
    modelVersion: z.number(),
    modelUpdatedAt: z.string(),
    lastEditedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
    parentStudyId: z.string().nullable(),
    submittedAt: z.string().nullable(),
    approval: z
      .object({
        approvedAt: z.string(),
        approvedById: z.string(),
        approverName: z.string(),
        licenceNumber: z.string(),
        jurisdiction: z.string(),
        reviewDueAt: z.string(),
      })
      .nullable(),
    supersededAt: z.string().nullable(),
    /** Approved, and the review date has passed. */
    pastReview: z.boolean(),
    /** Approved, and the site's model has changed since (a newer revision was edited). */
    stale: z.boolean(),
    latestRun: runSchema.nullable(),
    /** The latest finished run was made on the current model. */
    resultsCurrent: z.boolean(),
    createdAt: z.string(),
  })
  .meta({ id: 'Study' });
export type StudyDto = z.infer<typeof studySchema>;

export const studyListSchema = z.object({ studies: z.array(studySchema) });

export const createStudySchema = z
  .object({
    title: printableName(z.string().trim().min(1, 'Enter a title').max(200)),
  })
  .meta({ id: 'CreateStudy' });

const isPlainObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v);

/** The model's element lists (buses, sources, …, scenarios): the fields of `modelSchema` that are arrays. */
const MODEL_COLLECTIONS = Object.entries(modelSchema.shape)
  .filter(([, field]) => {
    let inner: z.ZodType = field;
    while (inner instanceof z.ZodDefault || inner instanceof z.ZodOptional) inner = inner.unwrap() as z.ZodType;
    return inner instanceof z.ZodArray;
  })
  .map(([key]) => key);

/**
 * The system model of a draft as saved: it may be incomplete or invalid (a draft keeps the engineer's work while it has
 * problems), so it cannot be checked with `modelSchema`. It is typed as the model's input form (`ModelInput`), the shape
 * the editor works on, and checked here for that shape's structure only: an object whose element lists, where given,
 * are arrays of objects. The values are checked by `parseModel`, and the envelope's `issues` name what does not pass
 * (docs/MODEL-FORMAT.md, Validation). The same check guards PUT, so whatever is saved reads back.
 */
export const draftModelSchema = z
  .custom<ModelInput>(isPlainObject, { error: 'Send the model as an object' })
  .superRefine((model, ctx) => {
    const fields: unknown = model;
    if (!isPlainObject(fields)) return; // reported by the check above
    for (const key of MODEL_COLLECTIONS) {
      const list = fields[key];
      if (list === undefined) continue;
      if (!Array.isArray(list)) {
        ctx.addIssue({ code: 'custom', path: [key], message: `${key} must be a list` });
        continue;
      }
      list.forEach((item, i) => {
        if (!isPlainObject(item))
          ctx.addIssue({ code: 'custom', path: [key, i], message: 'Each element is an object' });
      });
    }
  })
  .meta({
    id: 'DraftModel',
    type: 'object',
    description:
      'The system model (docs/MODEL-FORMAT.md, SystemModel); a draft may be incomplete or invalid: its issues are listed beside it',
  });

export const modelEnvelopeSchema = z
  .object({
    model: draftModelSchema,
    version: z
      .number()
      .int()
      .describe('Model version: PUT must send the version it read (409 when another edit came first)'),
    issues: z.array(modelIssueSchema),
    /** Values a sound model accepts but that are rarely right (a wrong unit?): shown, never blocking. */
    warnings: z.array(modelWarningSchema),
  })
  .meta({ id: 'ModelEnvelope' });
export type ModelEnvelope = z.infer<typeof modelEnvelopeSchema>;

export const putModelSchema = z
  .object({
    model: draftModelSchema,
    version: z.number().int(),
  })
  .meta({ id: 'PutModel' });

export const approveSchema = z
  .object({
    approverName: printableName(z.string().trim().min(1, 'Enter the approving engineer’s name').max(120)),
    licenceNumber: printableName(z.string().trim().min(1, 'Enter the licence number').max(60)),
    jurisdiction: printableName(z.string().trim().min(1, 'Enter the licensing jurisdiction').max(120)),
    confirm: z.literal(true, { error: 'Confirm that you reviewed the results' }),
  })
  .meta({ id: 'Approve' });
export type ApproveInput = z.infer<typeof approveSchema>;

export const resultsResponseSchema = z
  .object({
    run: runSchema,
    /** The model the run computed: it passed `modelSchema` when the run started, and is stored parsed. */
    model: modelSchema.describe('The model snapshot the results were computed from'),
    results: studyResultsSchema,
  })
  .meta({ id: 'StudyResultsResponse' });
export type ResultsResponse = z.infer<typeof resultsResponseSchema>;

export const equipmentSchema = z
  .object({
    id: z.string(),
    tag: z.string(),
    name: z.string(),
    equipmentClass: z.string(),
    nominalKv: z.number(),
    lastStudyId: z.string().nullable(),
    updatedAt: z.string(),
  })
  .meta({ id: 'SiteEquipment' });
export type EquipmentDto = z.infer<typeof equipmentSchema>;

export const importErrorSchema = z.object({
  file: z.string().optional(),
  sheet: z.string().optional(),
  row: z.number().optional(),
  column: z.string().optional(),
  path: z.string().optional(),
  message: z.string(),
});
