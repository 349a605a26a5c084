import { z } from 'zod';
import { printableName } from './text';
import { modelIssueSchema } from './model';
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

export const modelEnvelopeSchema = z
  .object({
    model: z
      .record(z.string(), z.unknown())
      .describe('The system model (docs/MODEL-FORMAT.md); a draft may be incomplete'),
    version: z
      .number()
      .int()
      .describe('Model version: PUT must send the version it read (409 when another edit came first)'),
    issues: z.array(modelIssueSchema),
  })
  .meta({ id: 'ModelEnvelope' });
export type ModelEnvelope = z.infer<typeof modelEnvelopeSchema>;

export const putModelSchema = z
  .object({
    model: z.record(z.string(), z.unknown()),
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
    model: z.record(z.string(), z.unknown()).describe('The model snapshot the results were computed from'),
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
