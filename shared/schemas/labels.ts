import { z } from 'zod';
import { LABEL_DISPLAY_FIELDS, type LabelDisplayField } from '../labelDisplay';

export const LABEL_STATUSES = ['current', 'superseded', 'past-review'] as const;
export const labelStatusSchema = z.enum(LABEL_STATUSES);
export type LabelStatus = z.infer<typeof labelStatusSchema>;

export const LABEL_STATUS_LABELS: Record<LabelStatus, string> = {
  current: 'Current',
  superseded: 'Superseded',
  'past-review': 'Past review',
};

/**
 * What a printed label says (docs/ARCHITECTURE.md, Label values; Labels and field checks): a snapshot of the approved
 * values. The public check page shows exactly these fields and nothing more.
 */
export const labelContentSchema = z
  .object({
    signalWord: z.enum(['DANGER', 'WARNING']),
    equipmentTag: z.string(),
    equipmentName: z.string(),
    siteName: z.string(),
    nominalVoltageV: z.number(),
    incidentEnergyCalPerCm2: z.number(),
    incidentEnergyJPerCm2: z.number(),
    workingDistanceMm: z.number(),
    arcFlashBoundaryMm: z.number(),
    minimumArcRatingCalPerCm2: z.number(),
    ppeLevel: z.string().nullable().describe('The organization’s PPE level; null when no arc-rated PPE is adequate'),
    noAdequatePpe: z.boolean(),
    limitedApproachMovable: z.string().nullable(),
    limitedApproachFixed: z.string().nullable(),
    restrictedApproach: z.string().nullable(),
    gloveClass: z.string().nullable(),
    clearingDevice: z.string().nullable().describe('Id and name of the device that clears the governing arc'),
    governingCase: z.string().describe('e.g. "reduced arcing current, line side of the main"'),
    studyTitle: z.string(),
    studyRevision: z.number(),
    studyDate: z.string().describe('Approval date, YYYY-MM-DD'),
    reviewByDate: z.string().describe('YYYY-MM-DD'),
    approvedBy: z.string().describe('Approving engineer, licence number and jurisdiction'),
    caution: z.string(),
    otherSourcesClearedBy: z
      .array(z.string())
      .optional()
      .describe(
        'With several sources: the devices that cut off the sources other than the one the clearing device ends',
      ),
    arcDurationCapS: z
      .number()
      .nullable()
      .optional()
      .describe("The arc-duration cap that applied at this bus (its own or the study's), s; null: none"),
    ppeDescription: z.string().nullable().optional().describe('The clothing and equipment of the PPE level'),
    unitOrder: z.enum(['us-first', 'si-first']).optional().describe('Units printed first: US customary or SI'),
  })
  .meta({ id: 'LabelContent' });
export type LabelContent = z.infer<typeof labelContentSchema>;

const displayValueSchema = z.object({ value: z.string(), unit: z.string(), secondary: z.string().optional() });

/** Every printed field of a label as the exact strings printed (shared/labelDisplay.ts). */
export const labelDisplaySchema = z
  .object(
    Object.fromEntries(LABEL_DISPLAY_FIELDS.map((f) => [f, displayValueSchema])) as Record<
      LabelDisplayField,
      typeof displayValueSchema
    >,
  )
  .meta({ id: 'LabelDisplay' });

export const labelSchema = z
  .object({
    id: z.string(),
    code: z.string(),
    siteId: z.string(),
    studyId: z.string(),
    equipmentTag: z.string(),
    status: labelStatusSchema,
    content: labelContentSchema,
    display: labelDisplaySchema.describe('What the label prints, field by field'),
    issuedAt: z.string(),
    printedAt: z.string().nullable(),
    installedAt: z.string().nullable(),
    installedBy: z.string().nullable(),
    supersededAt: z.string().nullable(),
  })
  .meta({ id: 'Label' });
export type LabelDto = z.infer<typeof labelSchema>;

/** The public check of a printed label: what it says, its status, and where superseded the current values. */
export const labelCheckSchema = z
  .object({
    code: z.string(),
    status: labelStatusSchema,
    content: labelContentSchema,
    display: labelDisplaySchema.describe('What this label prints, field by field'),
    current: labelContentSchema
      .nullable()
      .describe('When superseded: what the current label of the same equipment says'),
    currentDisplay: labelDisplaySchema.nullable().describe('When superseded: what the current label prints'),
    statusNotice: z.string().describe('What the check says about the status'),
    checkedAt: z.string(),
  })
  .meta({ id: 'LabelCheck' });
export type LabelCheck = z.infer<typeof labelCheckSchema>;

export const LABEL_SIZES = ['4x6', '4x4', 'letter', 'a4'] as const;
export const labelSizeSchema = z.enum(LABEL_SIZES);
export type LabelSize = z.infer<typeof labelSizeSchema>;
