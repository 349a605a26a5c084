import { z } from 'zod';

/** A field value as compared and shown: numbers, strings, booleans, or a list/object written as compact JSON. */
const fieldValue = z.union([z.string(), z.number(), z.boolean(), z.null()]);

export const MODEL_ELEMENT_KINDS = [
  'model',
  'buses',
  'sources',
  'transformers',
  'cables',
  'motors',
  'ties',
  'devices',
  'scenarios',
] as const;
export type ModelElementKind = (typeof MODEL_ELEMENT_KINDS)[number];

export const elementChangeSchema = z
  .object({
    kind: z.enum(MODEL_ELEMENT_KINDS),
    id: z.string(),
    name: z.string().nullable(),
    change: z.enum(['added', 'removed', 'changed']),
    /** Field by field, for a changed element: dotted path (e.g. "equipment.workingDistanceMm", "device.timeDial"). */
    fields: z.array(z.object({ field: z.string(), before: fieldValue.optional(), after: fieldValue.optional() })),
  })
  .meta({ id: 'ElementChange' });
export type ElementChange = z.infer<typeof elementChangeSchema>;

/** What a revision's results give at one bus (null where it has no ok result there). */
export const busHazardSchema = z.object({
  status: z.enum(['ok', 'error']),
  incidentEnergyCalPerCm2: z.number().nullable(),
  arcFlashBoundaryMm: z.number().nullable(),
  ppeLevel: z.string().nullable(),
  signalWord: z.enum(['DANGER', 'WARNING']).nullable(),
  clearingDeviceId: z.string().nullable(),
  scenarioId: z.string().nullable(),
});
export type BusHazard = z.infer<typeof busHazardSchema>;

export const busChangeSchema = z
  .object({
    busId: z.string(),
    busName: z.string(),
    change: z.enum(['added', 'removed', 'changed', 'unchanged']),
    before: busHazardSchema.nullable(),
    after: busHazardSchema.nullable(),
    /** after − before, cal/cm² (a bus only in one revision counts from 0); null when either side has no number. */
    energyRiseCalPerCm2: z.number().nullable(),
    /** Relative change of the incident energy, percent; null where there is no base to compare with. */
    energyRisePct: z.number().nullable(),
    ppeLevelChanged: z.boolean(),
    signalWordChanged: z.boolean(),
  })
  .meta({ id: 'BusChange' });
export type BusChange = z.infer<typeof busChangeSchema>;

const revisionRef = z.object({
  id: z.string(),
  revision: z.number(),
  title: z.string(),
  status: z.string(),
  /** The run whose results are compared; null when the revision has none. */
  runId: z.string().nullable(),
  /** The run was made on the revision's current model. */
  resultsCurrent: z.boolean(),
});

export const revisionComparisonSchema = z
  .object({
    /** The revision under review (the newer one). */
    study: revisionRef,
    /** The revision it is compared with (usually the approved one). */
    baseline: revisionRef,
    model: z.object({
      counts: z.object({ added: z.number(), removed: z.number(), changed: z.number() }),
      elements: z.array(elementChangeSchema),
    }),
    /** Every bus of either revision's results, the largest rise in hazard first. */
    buses: z.array(busChangeSchema),
    counts: z.object({
      higher: z.number(),
      lower: z.number(),
      ppeLevelChanged: z.number(),
      signalWordChanged: z.number(),
    }),
    /** What limits the comparison (no results yet, results older than the model). */
    notes: z.array(z.string()),
  })
  .meta({ id: 'RevisionComparison' });
export type RevisionComparison = z.infer<typeof revisionComparisonSchema>;
