import { z } from 'zod';
import { printableName } from './text';
import {
  bandDeviceSchema,
  deviceSchema,
  electronicPositionsSchema,
  electronicTripTypeSchema,
  fuseDeviceSchema,
  relayDeviceSchema,
  thermalMagneticDeviceSchema,
} from './device';

/**
 * A device type of the organization's library. Electronic trip units are stored as their type (switches with
 * named positions) plus the chosen positions; every other kind is stored as its settings.
 */
export const electronicDefinitionSchema = z
  .object({
    kind: z.literal('electronic'),
    tripType: electronicTripTypeSchema,
    positions: electronicPositionsSchema.describe('The chosen position of each switch'),
  })
  .meta({ id: 'ElectronicDefinition' });

export const deviceDefinitionSchema = z
  .discriminatedUnion('kind', [
    relayDeviceSchema,
    fuseDeviceSchema,
    bandDeviceSchema,
    thermalMagneticDeviceSchema,
    electronicDefinitionSchema,
  ])
  .meta({ id: 'DeviceDefinition' });
export type DeviceDefinition = z.infer<typeof deviceDefinitionSchema>;

export const DEVICE_KIND_LABELS = {
  'thermal-magnetic': 'Thermal-magnetic breaker',
  electronic: 'Electronic trip unit',
  fuse: 'Fuse',
  relay: 'Relay with breaker',
  band: 'Digitized band',
} as const;

export const deviceTypeInputSchema = z
  .object({
    name: printableName(z.string().trim().min(1, 'Enter a name').max(160)),
    description: z.string().trim().max(2000).default(''),
    source: z
      .string()
      .trim()
      .max(400)
      .default('')
      .describe('Where the curve data came from (e.g. a published curve and its date)'),
    definition: deviceDefinitionSchema,
  })
  .meta({ id: 'DeviceTypeInput' });
export type DeviceTypeInput = z.input<typeof deviceTypeInputSchema>;

/** Shown with every type of the generic starter set, in the library and wherever the device is placed. */
export const GENERIC_DEVICE_NOTE = "generic — verify against the manufacturer's published curve";

/** The note as a sentence on screen: "Generic — verify against the manufacturer's published curve." */
export const genericNoteSentence = (note: string): string => `${note.charAt(0).toUpperCase()}${note.slice(1)}.`;

export const deviceTypeSchema = z
  .object({
    id: z.string(),
    name: z.string(),
    description: z.string(),
    source: z.string(),
    genericNote: z
      .string()
      .nullable()
      .describe(
        `A type of the generic starter set (invented, not a maker's data): "${GENERIC_DEVICE_NOTE}"; null for the organization's own types`,
      ),
    kind: z.enum(['thermal-magnetic', 'electronic', 'fuse', 'relay', 'band']),
    definition: deviceDefinitionSchema,
    /** The device with every setting as a number, ready for the engine. */
    device: deviceSchema,
    createdAt: z.string(),
    updatedAt: z.string(),
  })
  .meta({ id: 'DeviceType' });
export type DeviceType = z.infer<typeof deviceTypeSchema>;

export const deviceTypeListSchema = z.object({ deviceTypes: z.array(deviceTypeSchema) });

/** Bounds of a time-current plot's current axis: sampling work grows with the decades it spans. */
export const PLOT_LIMITS = { minA: 1e-3, maxA: 1e9, maxDecades: 10 } as const;
const plotCurrentA = z
  .number()
  .min(PLOT_LIMITS.minA, `Must be at least ${PLOT_LIMITS.minA} A`)
  .max(PLOT_LIMITS.maxA, `Must be at most ${PLOT_LIMITS.maxA} A`);

export const bandCurvesRequestSchema = z
  .object({
    device: deviceSchema,
    fromA: plotCurrentA.optional().describe('Lowest current of the plot, amperes'),
    toA: plotCurrentA.optional().describe('Highest current of the plot, amperes'),
  })
  .superRefine((d, ctx) => {
    if (d.fromA === undefined || d.toA === undefined) return;
    if (!(d.toA > d.fromA)) {
      ctx.addIssue({ code: 'custom', path: ['toA'], message: 'toA must be greater than fromA' });
    } else if (d.toA / d.fromA > 10 ** PLOT_LIMITS.maxDecades) {
      ctx.addIssue({
        code: 'custom',
        path: ['toA'],
        message: `The plot may span at most ${PLOT_LIMITS.maxDecades} decades of current (toA / fromA ≤ 1e${PLOT_LIMITS.maxDecades})`,
      });
    }
  })
  .meta({ id: 'BandCurvesRequest' });

export const bandCurvesResponseSchema = z
  .object({
    fromA: z.number(),
    toA: z.number(),
    min: z.array(z.tuple([z.number(), z.number()])),
    max: z.array(z.tuple([z.number(), z.number()])),
    featuresA: z.array(z.number()),
  })
  .meta({ id: 'BandCurves' });
export type BandCurvesResponse = z.infer<typeof bandCurvesResponseSchema>;

export const resolveTripUnitRequestSchema = z
  .object({ tripType: electronicTripTypeSchema, positions: electronicPositionsSchema })
  .meta({ id: 'ResolveTripUnitRequest' });

export const bandCsvResponseSchema = z
  .object({
    currentUnit: z.enum(['multiple', 'ampere']),
    min: z.array(z.tuple([z.number(), z.number()])),
    max: z.array(z.tuple([z.number(), z.number()])),
  })
  .meta({ id: 'BandCsv' });
