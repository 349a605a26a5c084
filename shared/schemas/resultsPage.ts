import { z } from 'zod';
import { deviceSchema } from './device';
import { runSchema } from './studies';
import { busResultSchema, studyResultsSchema } from './studyResults';

/** Rows per page of study results: the default and the most a caller may ask for. */
export const RESULTS_PAGE_SIZE_DEFAULT = 50;
export const RESULTS_PAGE_SIZE_MAX = 500;

/** Columns the results can be sorted by. */
export const RESULTS_SORTS = ['busId', 'name', 'kv', 'ibf', 'energy', 'boundary', 'duration'] as const;
export type ResultsSort = (typeof RESULTS_SORTS)[number];

/** The order a sort takes when none is given: hazards (energy, boundary, duration, fault current) highest first. */
export const DEFAULT_ORDER: Record<ResultsSort, 'asc' | 'desc'> = {
  busId: 'asc',
  name: 'asc',
  kv: 'desc',
  ibf: 'desc',
  energy: 'desc',
  boundary: 'desc',
  duration: 'desc',
};

/** PPE-level filter value for a bus whose energy is above every level of the organization. */
export const PPE_ABOVE_EVERY_LEVEL = 'Above every level';
/** PPE-level filter value for a bus that could not be evaluated. */
export const PPE_ERROR = 'Error';

const flag = z
  .enum(['true', 'false'])
  .transform((v) => v === 'true')
  .describe('true or false');

const calPerCm2 = z.coerce.number().min(0).max(1e6);

/** Query of GET /studies/:studyId/results: sort, filters and the page. */
export const resultsPageQuerySchema = z.object({
  sort: z.enum(RESULTS_SORTS).default('busId'),
  order: z
    .enum(['asc', 'desc'])
    .optional()
    .describe('Default: ascending for busId and name, descending for the others (highest hazard first)'),
  minCal: calPerCm2
    .optional()
    .describe('Only buses whose incident energy is above this, cal/cm² (exclusive; buses without energy drop out)'),
  maxCal: calPerCm2
    .optional()
    .describe('Only buses whose incident energy is at most this, cal/cm² (inclusive; buses without energy drop out)'),
  ppe: z
    .string()
    .min(1)
    .max(120)
    .optional()
    .describe(`Only buses of this PPE level (its name; "${PPE_ABOVE_EVERY_LEVEL}" or "${PPE_ERROR}")`),
  warnings: flag.optional().describe('true: only buses with warnings; false: only buses without'),
  errors: flag.optional().describe('true: only buses that could not be evaluated; false: only buses that could'),
  scenarioId: z.string().min(1).max(120).optional().describe('Only rows of this scenario'),
  page: z.coerce.number().int().min(1).max(1_000_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(RESULTS_PAGE_SIZE_MAX).default(RESULTS_PAGE_SIZE_DEFAULT),
});
export type ResultsPageQuery = z.infer<typeof resultsPageQuerySchema>;
/** The query as the client writes it (strings, booleans and numbers before coercion). */
export type ResultsPageParams = Partial<{
  sort: ResultsSort;
  order: 'asc' | 'desc';
  minCal: number;
  maxCal: number;
  ppe: string;
  warnings: boolean;
  errors: boolean;
  scenarioId: string;
  page: number;
  pageSize: number;
}>;

/** One bus of the results without its clearing trace (the `cases`): what a row of the results table shows. */
export const busResultRowSchema = busResultSchema
  .omit({ cases: true })
  .extend({
    /** Arcing current of the governing case, kA (null for a bus that could not be evaluated). */
    governingArcingCurrentKa: z.number().nullable(),
    /** The PPE-level name the `ppe` filter matches. */
    ppeName: z.string(),
    scenarioId: z.string().nullable(),
  })
  .meta({ id: 'BusResultRow' });
export type BusResultRow = z.infer<typeof busResultRowSchema>;

/** Counts over the whole study (never only the page): what the results screen summarizes. */
export const resultsSummarySchema = z
  .object({
    buses: z.number(),
    ok: z.number(),
    errors: z.number(),
    withWarnings: z.number(),
    /** Highest incident energy of any bus, cal/cm² (null when no bus has one). */
    maxIncidentEnergyCalPerCm2: z.number().nullable(),
    maxArcFlashBoundaryMm: z.number().nullable(),
    bySignalWord: z.object({ DANGER: z.number(), WARNING: z.number() }),
    /** Buses per PPE-level name, in the order of the levels (then above every level, then errors). */
    byPpeLevel: z.array(z.object({ name: z.string(), count: z.number() })),
    /** Buses per energy band: ≤ 1.2, 1.2–8, 8–40, > 40 cal/cm² (buses without energy not counted). */
    byEnergyBand: z.object({ le1_2: z.number(), le8: z.number(), le40: z.number(), gt40: z.number() }),
    scenarioIds: z.array(z.string()),
  })
  .meta({ id: 'StudyResultsSummary' });
export type ResultsSummary = z.infer<typeof resultsSummarySchema>;

export const resultsPageSchema = z
  .object({
    run: runSchema,
    /** The study-wide part of the results (method, cap, motor decay, short-circuit warnings). */
    study: studyResultsSchema.omit({ buses: true }),
    summary: resultsSummarySchema,
    rows: z.array(busResultRowSchema),
    /** Rows matching the filters (all pages). */
    total: z.number(),
    page: z.number(),
    pageSize: z.number(),
    pages: z.number(),
  })
  .meta({ id: 'StudyResultsPage' });
export type ResultsPage = z.infer<typeof resultsPageSchema>;

/** Query of GET /studies/:studyId/results/buses/:busId. */
export const busResultQuerySchema = z.object({
  scenario: z
    .string()
    .min(1)
    .max(120)
    .optional()
    .describe(
      "An operating scenario of the run's model (its id; `base` for the model as written). Default: the governing " +
        'scenario, the one the label takes. Unknown id: 400 naming `scenario`; a scenario in which no source reaches ' +
        "the bus: 409 naming `scenario` (the bus's `scenarios` entry says so too)",
    ),
});
export type BusResultQuery = z.infer<typeof busResultQuerySchema>;

/** GET /studies/:studyId/results/buses/:busId: one bus with its whole clearing trace. */
export const busResultResponseSchema = z
  .object({
    run: runSchema,
    study: studyResultsSchema.omit({ buses: true }),
    /**
     * The bus in the scenario asked for (`scenarioId`): by default the stored result of the governing scenario; for
     * another scenario the same engine on the run's model and settings with that scenario applied. Its `scenarios`
     * lists what every scenario gives at the bus (the spread), whichever scenario is shown.
     */
    bus: busResultSchema,
    /** The model's protective devices that appear in the bus's trace (to draw their bands). */
    devices: z.array(z.object({ id: z.string(), device: deviceSchema })),
    /** The scenario of this trace (`base` for the model as written, and always for a model without scenarios). */
    scenarioId: z.string(),
    /** The scenario the label takes at this bus: the highest incident energy, or the one that failed. */
    governingScenarioId: z.string(),
  })
  .meta({ id: 'StudyBusResult' });
export type BusResultResponse = z.infer<typeof busResultResponseSchema>;
