import { z } from 'zod';

/**
 * The safety officer's dashboard: lists of what needs attention (docs/ARCHITECTURE.md, Audit and attention). Each list
 * has a fixed key; the dashboard shows the count of each, per site; each count opens its list; each list exports as
 * CSV.
 */
export const ATTENTION_LISTS = [
  'review-overdue',
  'review-due-30',
  'review-due-90',
  'stale-studies',
  'superseded-installed',
  'not-installed',
  'open-reports',
] as const;
export const attentionListSchema = z.enum(ATTENTION_LISTS).describe('Which list of things needing attention');
export type AttentionList = z.infer<typeof attentionListSchema>;

export const ATTENTION_LIST_INFO: Record<
  AttentionList,
  { title: string; description: string; severity: 'high' | 'medium' | 'low' }
> = {
  'review-overdue': {
    title: 'Studies past review',
    description:
      'Approved studies whose review date has passed (organization review interval; NFPA 70E: at least every 5 years).',
    severity: 'high',
  },
  'review-due-30': {
    title: 'Review due within 30 days',
    description: 'Approved studies whose review date falls in the next 30 days.',
    severity: 'medium',
  },
  'review-due-90': {
    title: 'Review due within 90 days',
    description: 'Approved studies whose review date falls in the next 90 days (includes those due within 30 days).',
    severity: 'low',
  },
  'stale-studies': {
    title: 'Stale studies',
    description: 'Approved studies whose site model has been changed in a later revision since the approval.',
    severity: 'medium',
  },
  'superseded-installed': {
    title: 'Superseded labels still installed',
    description: 'Labels replaced by a newer revision but still marked installed on the equipment: replace them.',
    severity: 'high',
  },
  'not-installed': {
    title: 'Labels not installed',
    description: 'Current labels not marked installed within the organization’s set number of days after issue.',
    severity: 'medium',
  },
  'open-reports': {
    title: 'Open field reports',
    description: 'Mismatches reported from the field that are not resolved yet, oldest first.',
    severity: 'high',
  },
};

export const attentionQuerySchema = z.object({
  siteId: z.string().max(64).optional().describe('Only this site'),
});
export type AttentionQuery = z.infer<typeof attentionQuerySchema>;

export const attentionCountsSchema = z.record(attentionListSchema, z.number().int());
export type AttentionCounts = z.infer<typeof attentionCountsSchema>;

export const attentionSummarySchema = z
  .object({
    asOf: z.string(),
    siteId: z.string().nullable(),
    notInstalledAfterDays: z.number(),
    reviewIntervalMonths: z.number(),
    counts: attentionCountsSchema,
    /** Open field reports by age. */
    openReportAges: z.object({ under7Days: z.number(), from7To30Days: z.number(), over30Days: z.number() }),
    sites: z.array(z.object({ siteId: z.string(), siteName: z.string(), counts: attentionCountsSchema })),
  })
  .meta({ id: 'AttentionSummary' });
export type AttentionSummary = z.infer<typeof attentionSummarySchema>;

export const attentionColumnSchema = z.object({
  key: z.string(),
  label: z.string(),
  kind: z.enum(['text', 'date', 'number']),
});
export type AttentionColumn = z.infer<typeof attentionColumnSchema>;

export const attentionRowSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  siteName: z.string(),
  /** What the row opens in the app. */
  link: z.object({ kind: z.enum(['study', 'label', 'field-report']), id: z.string() }),
  cells: z.record(z.string(), z.union([z.string(), z.number(), z.null()])),
});
export type AttentionRow = z.infer<typeof attentionRowSchema>;

export const attentionListResponseSchema = z
  .object({
    list: attentionListSchema,
    title: z.string(),
    description: z.string(),
    asOf: z.string(),
    columns: z.array(attentionColumnSchema),
    rows: z.array(attentionRowSchema),
  })
  .meta({ id: 'AttentionListResponse' });
export type AttentionListResponse = z.infer<typeof attentionListResponseSchema>;
