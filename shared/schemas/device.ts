import { z } from 'zod';
import '../zodMessages';

/**
 * Protective devices and their trip bands (docs/ARCHITECTURE.md, Clearing time from a trip band; docs/MODEL-FORMAT.md,
 * Devices; `POST /api/calc/clearing-time`).
 *
 * A band is a minimum curve and a maximum (total clearing) curve of time against current on log-log axes.
 * Point lists are `[current, seconds]` pairs with current strictly increasing and time not increasing.
 * The engine (server/engine/trip/) checks the same rules again, so it is safe to call without zod.
 */

/**
 * Realistic bounds of published time-current data (common practice, no source: published curves span roughly
 * 0.01–1000 s and a few amperes to a few hundred kiloamperes). Values outside them are typing errors or abuse,
 * and unbounded magnitudes would make plotting and sampling unbounded work.
 */
export const CURVE_LIMITS = {
  /** Lowest current of a point, amperes or multiple of rating. */
  minCurrent: 1e-3,
  /** Highest current of a point given in amperes. */
  maxCurrentA: 1e7,
  /** Highest current of a point given as a multiple of rating. */
  maxMultiple: 1e5,
  minTimeS: 1e-3,
  maxTimeS: 1e5,
  /** Most points in one curve. */
  maxPoints: 500,
} as const;

/** One published point of a time-current curve: `[current, seconds]` (amperes or multiples of rating). */
export const curvePointSchema = z.tuple([
  z
    .number()
    .min(CURVE_LIMITS.minCurrent, `Current must be at least ${CURVE_LIMITS.minCurrent}`)
    .max(CURVE_LIMITS.maxCurrentA, `Current must be at most ${CURVE_LIMITS.maxCurrentA} A`)
    .describe('Current (amperes or multiple of rating)'),
  z
    .number()
    .min(CURVE_LIMITS.minTimeS, `Time must be at least ${CURVE_LIMITS.minTimeS} s`)
    .max(CURVE_LIMITS.maxTimeS, `Time must be at most ${CURVE_LIMITS.maxTimeS} s`)
    .describe('Time in seconds'),
]);
export type CurvePoint = z.infer<typeof curvePointSchema>;

/** A point list read off a time-current curve: current strictly increasing, time not increasing. */
export const curvePointsSchema = z
  .array(curvePointSchema)
  .min(1, 'Give at least one point')
  .max(CURVE_LIMITS.maxPoints, `Give at most ${CURVE_LIMITS.maxPoints} points`)
  .superRefine((points, ctx) => {
    for (let i = 1; i < points.length; i += 1) {
      const [prevCurrent, prevTime] = points[i - 1];
      const [current, time] = points[i];
      if (!(current > prevCurrent)) {
        ctx.addIssue({
          code: 'custom',
          path: [i, 0],
          message: `Point ${i}: current ${current} must be greater than the previous point's ${prevCurrent}`,
        });
      }
      if (time > prevTime) {
        ctx.addIssue({
          code: 'custom',
          path: [i, 1],
          message: `Point ${i}: time ${time} s must not exceed the previous point's ${prevTime} s (a trip curve falls with current)`,
        });
      }
    }
  })
  .describe('Points [current, seconds], current strictly increasing, time not increasing');
export type CurvePoints = z.infer<typeof curvePointsSchema>;

/** Issues for points whose current, as a multiple of rating, exceeds CURVE_LIMITS.maxMultiple. */
function checkMultiples(points: readonly CurvePoint[], path: (string | number)[], ctx: z.RefinementCtx): void {
  points.forEach(([current], i) => {
    if (current > CURVE_LIMITS.maxMultiple) {
      ctx.addIssue({
        code: 'custom',
        path: [...path, i, 0],
        message: `Current ${current} × rating exceeds ${CURVE_LIMITS.maxMultiple} × rating`,
      });
    }
  });
}

const positive = z.number().positive();
const nonNegative = z.number().nonnegative();
const pct = z.number().min(0).max(100);

export const RELAY_CURVES = ['IEEE-MI', 'IEEE-VI', 'IEEE-EI', 'IEC-SI', 'IEC-VI', 'IEC-EI', 'IEC-LTI'] as const;
export const relayCurveSchema = z
  .enum(RELAY_CURVES)
  .describe(
    'IEEE C37.112 moderately/very/extremely inverse, IEC 60255-151 standard/very/extremely inverse, long-time inverse',
  );
export type RelayCurve = z.infer<typeof relayCurveSchema>;

/**
 * Overcurrent relay with its breaker. Pickups are primary amperes (`pickupA`), or secondary amperes
 * through the CT ratio (`ctRatio` = primary/secondary, e.g. 600/5 = 120). Where both are given they must agree.
 */
export const relayDeviceSchema = z
  .object({
    kind: z.literal('relay'),
    name: z.string().max(160).optional(),
    curve: relayCurveSchema,
    pickupA: positive.optional().describe('Inverse-time pickup, primary amperes'),
    ctRatio: positive.optional().describe('CT ratio, primary over secondary amperes (e.g. 600/5 = 120)'),
    pickupSecondaryA: positive.optional().describe('Inverse-time pickup, relay (secondary) amperes'),
    timeDial: positive.describe('Time dial (IEEE) or time multiplier setting (IEC)'),
    instantaneousA: positive.optional().describe('Instantaneous pickup, primary amperes'),
    instantaneousSecondaryA: positive.optional().describe('Instantaneous pickup, secondary amperes'),
    instantaneousDelayS: nonNegative
      .optional()
      .describe('Relay operating time of the instantaneous element (default 0.016 s at 60 Hz, IEEE 1584-2002)'),
    definiteTime: z
      .object({
        pickupA: positive.optional().describe('Primary amperes'),
        pickupSecondaryA: positive.optional().describe('Secondary amperes'),
        delayS: nonNegative.describe('Definite-time delay in seconds'),
      })
      .optional()
      .describe('Definite-time overcurrent element'),
    breakerCycles: positive.describe('Breaker interrupting time in cycles (IEEE 1584 table: 1.5 / 3 / 5 / 8)'),
    frequencyHz: positive.optional().describe('System frequency, default 60 Hz'),
    curveLimitMultiple: z
      .number()
      .gt(1)
      .optional()
      .describe(
        'Multiple of pickup above which the inverse-time element stops following its curve and keeps the time at this multiple (IEC 60255-151 lets the relay declare it); default 20',
      ),
    instantaneousTolerancePct: pct
      .optional()
      .describe(
        'Instantaneous pickup tolerance, ± percent: up to pickup × (1 + tolerance) the maximum curve stays on the slower element; default 10',
      ),
  })
  .superRefine((d, ctx) => {
    if (d.pickupA === undefined && (d.ctRatio === undefined || d.pickupSecondaryA === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['pickupA'], message: 'Give pickupA, or ctRatio with pickupSecondaryA' });
    }
    if (d.instantaneousSecondaryA !== undefined && d.ctRatio === undefined) {
      ctx.addIssue({ code: 'custom', path: ['ctRatio'], message: 'instantaneousSecondaryA needs ctRatio' });
    }
    if (d.definiteTime && d.definiteTime.pickupA === undefined) {
      if (d.definiteTime.pickupSecondaryA === undefined || d.ctRatio === undefined) {
        ctx.addIssue({
          code: 'custom',
          path: ['definiteTime', 'pickupA'],
          message: 'Give definiteTime.pickupA, or ctRatio with definiteTime.pickupSecondaryA',
        });
      }
    }
  })
  .meta({ id: 'RelayDevice' });
export type RelayDevice = z.infer<typeof relayDeviceSchema>;

/**
 * Fuse: total-clearing curve (maximum) and minimum-melting curve (minimum), amperes against seconds.
 * Where only an average-melt curve is published, give `averageMelt`: the engine adds the published
 * melt-to-clear allowance (IEEE 1584-2002 §4.6).
 */
export const fuseDeviceSchema = z
  .object({
    kind: z.literal('fuse'),
    name: z.string().max(160).optional(),
    ratingA: positive,
    totalClearing: curvePointsSchema.optional().describe('Total-clearing curve [amperes, seconds]'),
    minimumMelt: curvePointsSchema.optional().describe('Minimum-melting curve [amperes, seconds]'),
    averageMelt: curvePointsSchema
      .optional()
      .describe('Average-melting curve [amperes, seconds], used only when no total-clearing curve is given'),
  })
  .superRefine((d, ctx) => {
    if (!d.totalClearing && !d.averageMelt && !d.minimumMelt) {
      ctx.addIssue({ code: 'custom', path: ['totalClearing'], message: 'Give the total-clearing curve' });
    } else if (!d.totalClearing && !d.averageMelt) {
      ctx.addIssue({
        code: 'custom',
        path: ['totalClearing'],
        message: 'A minimum-melting curve alone does not give a clearing time: give totalClearing or averageMelt',
      });
    }
  })
  .meta({ id: 'FuseDevice' });
export type FuseDevice = z.infer<typeof fuseDeviceSchema>;

export const CURRENT_UNITS = ['multiple', 'ampere'] as const;
export const currentUnitSchema = z.enum(CURRENT_UNITS);
export type CurrentUnit = z.infer<typeof currentUnitSchema>;

/** Digitized band: any device given as minimum and maximum point lists (e.g. from a CSV upload). */
export const bandDeviceSchema = z
  .object({
    kind: z.literal('band'),
    name: z.string().max(160).optional(),
    ratingA: positive,
    currentUnit: currentUnitSchema.describe('Currents in the point lists: multiples of ratingA, or amperes'),
    min: curvePointsSchema.describe('Minimum curve [current, seconds]'),
    max: curvePointsSchema.describe('Maximum (total clearing) curve [current, seconds]'),
  })
  .superRefine((d, ctx) => {
    if (d.currentUnit !== 'multiple') return;
    checkMultiples(d.min, ['min'], ctx);
    checkMultiples(d.max, ['max'], ctx);
  })
  .meta({ id: 'BandDevice' });
export type BandDevice = z.infer<typeof bandDeviceSchema>;

/** Thermal-magnetic breaker: thermal band in multiples of rating plus a magnetic instantaneous element. */
export const thermalMagneticDeviceSchema = z
  .object({
    kind: z.literal('thermal-magnetic'),
    name: z.string().max(160).optional(),
    ratingA: positive,
    thermal: z
      .object({
        min: curvePointsSchema.describe('Thermal minimum curve [multiple of rating, seconds]'),
        max: curvePointsSchema.describe('Thermal maximum curve [multiple of rating, seconds]'),
      })
      .superRefine((t, ctx) => {
        checkMultiples(t.min, ['min'], ctx);
        checkMultiples(t.max, ['max'], ctx);
      })
      .describe('Thermal (overload) band in multiples of rating'),
    instantaneous: z
      .object({
        pickupMultiple: positive
          .optional()
          .describe('Instantaneous pickup, multiple of rating (fixed, or the chosen setting), with tolerancePct'),
        tolerancePct: pct.optional().describe('Pickup tolerance, ± percent (e.g. 20)'),
        lowMultiple: positive
          .optional()
          .describe('Or: low edge of the pickup range, multiple of rating (e.g. 5 for IEC 60898-1 type C)'),
        highMultiple: positive.optional().describe('And the high edge (e.g. 10 for type C)'),
        setting: z
          .string()
          .max(40)
          .optional()
          .describe('Name of the chosen adjustable position or type (e.g. "LO", "C")'),
      })
      .superRefine((i, ctx) => {
        const byTolerance = i.pickupMultiple !== undefined && i.tolerancePct !== undefined;
        const byEdges = i.lowMultiple !== undefined && i.highMultiple !== undefined;
        if (byTolerance === byEdges) {
          ctx.addIssue({
            code: 'custom',
            path: ['pickupMultiple'],
            message: 'Give pickupMultiple with tolerancePct, or lowMultiple with highMultiple',
          });
        } else if (byEdges && !((i.highMultiple as number) >= (i.lowMultiple as number))) {
          ctx.addIssue({
            code: 'custom',
            path: ['highMultiple'],
            message: 'highMultiple must not be below lowMultiple',
          });
        }
      })
      .optional(),
    instantaneousClearingS: positive
      .optional()
      .describe('Clearing time in the instantaneous region (default 1.5 cycles, IEEE 1584-2002 Table 1)'),
    instantaneousClearingCycles: positive.optional().describe('Same, in cycles at frequencyHz'),
    instantaneousMinimumS: positive
      .optional()
      .describe('Minimum (no-trip) time in the instantaneous region (default 0.01 s, common practice)'),
    frequencyHz: positive.optional(),
  })
  .meta({ id: 'ThermalMagneticDevice' });
export type ThermalMagneticDevice = z.infer<typeof thermalMagneticDeviceSchema>;

/**
 * Electronic trip unit, settings already resolved to numbers (see `electronicTripTypeSchema` for the
 * unit's named switch positions). Ir = longTime.pickup × sensorA; short-time pickup is a multiple of Ir;
 * instantaneous pickup is a multiple of sensorA.
 */
export const electronicDeviceSchema = z
  .object({
    kind: z.literal('electronic'),
    name: z.string().max(160).optional(),
    sensorA: positive.describe('Sensor or rating-plug amperes (In)'),
    longTime: z.object({
      pickup: positive.describe('Long-time pickup Ir as a multiple of In'),
      delayS: positive.describe('Long-time delay: nominal time at delayMultiple × Ir'),
      delayMultiple: positive.optional().describe('Multiple of Ir at which delayS is stated (default 6)'),
    }),
    shortTime: z
      .object({
        pickup: positive.describe('Short-time pickup as a multiple of Ir'),
        delayS: positive.describe('Short-time delay (flat part), seconds'),
        i2t: z.boolean().describe('I²t in: ramp t = delayS·(i2tMultiple/M)² up to the flat delay'),
        i2tMultiple: positive
          .optional()
          .describe('Multiple of Ir where the I²t ramp meets the flat delay (default 10)'),
      })
      .optional(),
    instantaneous: z.object({ pickup: positive.describe('Instantaneous pickup as a multiple of In') }).optional(),
    groundFault: z
      .object({ pickupA: positive, delayS: nonNegative })
      .optional()
      .describe('Ground-fault element (residual current; does not act on balanced three-phase faults)'),
    pickupTolerancePct: pct.describe('Pickup tolerance, ± percent, all elements (e.g. 10)'),
    timeTolerancePct: z
      .number()
      .min(0)
      .max(99)
      .optional()
      .describe('Time-band tolerance, ± percent on long- and short-time delays (default 0)'),
    clearingS: positive.describe('Breaker clearing time in the instantaneous region, seconds (e.g. 0.05)'),
    instantaneousMinimumS: positive
      .optional()
      .describe('Minimum (no-trip) time of the instantaneous element (default 0.01 s)'),
  })
  .meta({ id: 'ElectronicDevice' });
export type ElectronicDevice = z.infer<typeof electronicDeviceSchema>;

export const deviceSchema = z
  .discriminatedUnion('kind', [
    relayDeviceSchema,
    fuseDeviceSchema,
    bandDeviceSchema,
    thermalMagneticDeviceSchema,
    electronicDeviceSchema,
  ])
  .meta({ id: 'Device' });
export type Device = z.infer<typeof deviceSchema>;
export type DeviceKind = Device['kind'];

// ---------------------------------------------------------------------------------------------
// Electronic trip unit type: settings as named switch positions mapped to numbers.

/** One switch: position names mapped to numbers, e.g. `{ positions: { "0.5": 0.5, "1.0": 1.0 } }`. 0 means OFF. */
export const switchPositionsSchema = z.object({
  positions: z
    .record(z.string().min(1).max(40), nonNegative)
    .refine((p) => Object.keys(p).length > 0, 'Give at least one position'),
});
export type SwitchPositions = z.infer<typeof switchPositionsSchema>;

export const ELECTRONIC_SETTING_NAMES = [
  'ratingPlug',
  'longTimePickup',
  'longTimeDelay',
  'shortTimePickup',
  'shortTimeDelay',
  'shortTimeI2t',
  'instantaneousPickup',
  'groundFaultPickup',
  'groundFaultDelay',
] as const;
export type ElectronicSettingName = (typeof ELECTRONIC_SETTING_NAMES)[number];

export const electronicTripTypeSchema = z
  .object({
    name: z.string().min(1).max(160),
    sensorA: positive.describe('Sensor amperes; the rating plug, if any, sets In instead'),
    settings: z.object({
      ratingPlug: switchPositionsSchema.optional().describe('In, amperes'),
      longTimePickup: switchPositionsSchema.describe('Ir as a multiple of In'),
      longTimeDelay: switchPositionsSchema.describe('Seconds at longTimeDelayMultiple × Ir'),
      shortTimePickup: switchPositionsSchema.optional().describe('Multiple of Ir (0 = OFF)'),
      shortTimeDelay: switchPositionsSchema.optional().describe('Seconds'),
      shortTimeI2t: switchPositionsSchema.optional().describe('1 = I²t in, 0 = out'),
      instantaneousPickup: switchPositionsSchema.optional().describe('Multiple of In (0 = OFF)'),
      groundFaultPickup: switchPositionsSchema.optional().describe('Amperes (0 = OFF)'),
      groundFaultDelay: switchPositionsSchema.optional().describe('Seconds'),
    }),
    longTimeDelayMultiple: positive
      .optional()
      .describe('Multiple of Ir at which the long-time delay is stated (default 6)'),
    shortTimeI2tMultiple: positive
      .optional()
      .describe('Multiple of Ir where the short-time I²t ramp meets the flat delay (default 10)'),
    pickupTolerancePct: pct,
    timeTolerancePct: z.number().min(0).max(99).optional(),
    clearingS: positive,
    instantaneousMinimumS: positive.optional(),
  })
  .meta({ id: 'ElectronicTripType' });
export type ElectronicTripType = z.infer<typeof electronicTripTypeSchema>;

/** The chosen position name of each switch, e.g. `{ longTimePickup: "0.8", longTimeDelay: "4" }`. */
export const electronicPositionsSchema = z.partialRecord(z.enum(ELECTRONIC_SETTING_NAMES), z.string().min(1).max(40));
export type ElectronicPositions = z.infer<typeof electronicPositionsSchema>;

// ---------------------------------------------------------------------------------------------
// API: POST /api/calc/clearing-time

export const clearingTimeRequestSchema = z
  .object({
    device: deviceSchema,
    currentA: positive.describe('Current the device sees, amperes rms'),
  })
  .meta({ id: 'ClearingTimeRequest' });
export type ClearingTimeRequest = z.infer<typeof clearingTimeRequestSchema>;

export const TRIP_REGIONS = [
  'long-time',
  'short-time',
  'instantaneous',
  'curve-segment',
  'definite-time',
  'inverse-time',
  'no-trip',
] as const;
export const tripRegionSchema = z.enum(TRIP_REGIONS);
export type TripRegion = z.infer<typeof tripRegionSchema>;

export const warningSchema = z.object({ code: z.string(), message: z.string() });

export const clearingTimeResponseSchema = z
  .object({
    clearingTimeS: z
      .number()
      .nullable()
      .describe('Maximum (total clearing) curve time = arc duration; null when the device does not clear'),
    minimumTimeS: z.number().nullable().describe('Minimum curve time; null when even the minimum curve does not trip'),
    region: tripRegionSchema,
    warnings: z.array(warningSchema),
    trace: z
      .record(z.string(), z.unknown())
      .optional()
      .describe('How the time was found: multiple of rating, tolerance edge, element times, points used'),
  })
  .meta({ id: 'ClearingTimeResponse' });
export type ClearingTimeResponse = z.infer<typeof clearingTimeResponseSchema>;
