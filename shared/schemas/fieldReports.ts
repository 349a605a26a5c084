import { z } from 'zod';

/** What a field report says does not match a label. */
export const REPORT_KINDS = ['voltage', 'device', 'setting', 'equipment-changed', 'label-damaged', 'other'] as const;
export type ReportKind = (typeof REPORT_KINDS)[number];
export const REPORT_KIND_LABELS: Record<ReportKind, string> = {
  voltage: 'Voltage',
  device: 'Protective device',
  setting: 'Device setting',
  'equipment-changed': 'Equipment changed',
  'label-damaged': 'Label damaged',
  other: 'Other',
};
/** Words for a kind (a stored value not in the list is shown as it is). */
export const reportKindLabel = (kind: string): string => REPORT_KIND_LABELS[kind as ReportKind] ?? kind;

export const FIELD_REPORT_STATUSES = ['open', 'acknowledged', 'resolved'] as const;
export const fieldReportStatusSchema = z.enum(FIELD_REPORT_STATUSES);
export type FieldReportStatus = z.infer<typeof fieldReportStatusSchema>;

export const FIELD_REPORT_STATUS_LABELS: Record<FieldReportStatus, string> = {
  open: 'Open',
  acknowledged: 'Acknowledged',
  resolved: 'Resolved',
};

export const fieldReportSchema = z
  .object({
    id: z.string(),
    siteId: z.string(),
    siteName: z.string(),
    labelId: z.string(),
    labelCode: z.string(),
    equipmentTag: z.string(),
    kind: z.string(),
    text: z.string(),
    hasPhoto: z.boolean(),
    status: fieldReportStatusSchema,
    reporter: z.object({ id: z.string(), name: z.string() }),
    acknowledgedAt: z.string().nullable(),
    acknowledgedBy: z.string().nullable(),
    resolvedAt: z.string().nullable(),
    resolvedBy: z.string().nullable(),
    resolutionNote: z.string().nullable(),
    createdAt: z.string(),
    ageDays: z.number().describe('Whole days since the report was made'),
  })
  .meta({ id: 'FieldReport' });
export type FieldReportDto = z.infer<typeof fieldReportSchema>;

export const fieldReportQuerySchema = z.object({
  status: fieldReportStatusSchema.optional(),
  siteId: z.string().max(64).optional(),
  mine: z.enum(['1', 'true']).optional().describe('Only reports I made (electricians always see only their own)'),
});

export const fieldReportListSchema = z.object({ reports: z.array(fieldReportSchema) });

/** Triage: open → acknowledged → resolved; resolving needs a note of what was done. */
export const fieldReportTriageSchema = z
  .discriminatedUnion('status', [
    z.object({ status: z.literal('acknowledged'), note: z.string().trim().max(2000).optional() }),
    z.object({ status: z.literal('resolved'), note: z.string().trim().min(1, 'Say what was done').max(2000) }),
  ])
  .meta({ id: 'FieldReportTriage' });
export type FieldReportTriage = z.infer<typeof fieldReportTriageSchema>;
