import { z } from 'zod';
import '../zodMessages';
import { ELECTRODE_CONFIGS } from '../equipmentClasses';

/**
 * Contract of `POST /api/calc/incident-energy` (docs/API.md, Calculations): IEEE Std 1584-2018 incident energy of one
 * equipment. The server validates with these schemas, the client pre-validates its forms, OpenAPI is generated from
 * them.
 */

/** A positive, finite number (zod 4 numbers reject Infinity and NaN). */
function positive(description: string, message = 'Enter a number greater than zero') {
  return z.number({ error: 'Enter a number' }).positive(message).describe(description);
}

export const electrodeConfigSchema = z
  .enum(ELECTRODE_CONFIGS)
  .describe(
    'IEEE 1584-2018 electrode configuration: VCB (vertical conductors in a box), VCBB (vertical, terminated in an ' +
      'insulating barrier, in a box), HCB (horizontal in a box), VOA (vertical, open air), HOA (horizontal, open air)',
  )
  .meta({ id: 'ElectrodeConfig' });

export const enclosureSizeSchema = z
  .object({
    height: positive('Enclosure height, mm'),
    width: positive('Enclosure width, mm'),
    depth: positive('Enclosure depth, mm'),
  })
  .describe('Enclosure size, mm (used by VCB, VCBB and HCB; CF = 1 in open air)')
  .meta({ id: 'EnclosureSize' });

export const clearingTimesSchema = z
  .object({
    full: positive('Clearing time at the full arcing current, ms'),
    reduced: positive('Clearing time at the reduced arcing current, ms'),
  })
  .describe('Arc durations read from the protective device at the full and the reduced arcing current, ms');

export const incidentEnergyRequestSchema = z
  .object({
    voltageV: positive('Nominal system voltage, phase to phase, V (model range 208 V to 15 kV)'),
    boltedFaultKa: positive('Bolted three-phase fault current, symmetrical rms, kA'),
    electrodeConfig: electrodeConfigSchema,
    gapMm: positive('Gap between conductors, mm'),
    workingDistanceMm: positive('Working distance, mm'),
    enclosureMm: enclosureSizeSchema.optional(),
    arcDurationMs: positive('One arc duration for both cases, ms (give this or clearingMs)').optional(),
    clearingMs: clearingTimesSchema.optional(),
    maxArcDurationMs: positive('Cap of the arc duration, ms (default 2000, the IEEE 1584 2 s guidance)').optional(),
  })
  .superRefine((value, ctx) => {
    const single = value.arcDurationMs !== undefined;
    const pair = value.clearingMs !== undefined;
    if (single && pair) {
      ctx.addIssue({
        code: 'custom',
        path: ['clearingMs'],
        message: 'Give either one arc duration or the two clearing times, not both',
      });
    } else if (!single && !pair) {
      ctx.addIssue({
        code: 'custom',
        path: ['arcDurationMs'],
        message: 'Enter an arc duration or the two clearing times',
      });
    }
  })
  .describe('IEEE 1584-2018 incident-energy calculation of one equipment. Exactly one of arcDurationMs or clearingMs.')
  .meta({ id: 'IncidentEnergyRequest' });
export type IncidentEnergyRequest = z.infer<typeof incidentEnergyRequestSchema>;

export const engineWarningSchema = z
  .object({
    code: z.string().describe('Stable warning code, e.g. BOLTED_CURRENT_OUT_OF_RANGE'),
    message: z.string(),
  })
  .meta({ id: 'EngineWarning' });

const levelValuesSchema = z
  .object({
    at600V: z.number(),
    at2700V: z.number().optional(),
    at14300V: z.number().optional(),
  })
  .describe('Intermediate values at the model voltages 600, 2700 and 14300 V (the last two only above 600 V)');

const fullLevelValuesSchema = z.object({ at600V: z.number(), at2700V: z.number(), at14300V: z.number() });

export const incidentEnergyCaseSchema = z
  .object({
    arcingCurrentKa: z.number().describe('Arcing current of this case, kA'),
    arcDurationMs: z.number().describe('Arc duration used, ms (after the cap)'),
    requestedArcDurationMs: z.number().describe('Arc duration asked for, ms'),
    arcDurationCapped: z.boolean(),
    incidentEnergyJPerCm2: z.number(),
    incidentEnergyCalPerCm2: z.number(),
    arcFlashBoundaryMm: z.number(),
    intermediate: z
      .object({ incidentEnergyJPerCm2: fullLevelValuesSchema, arcFlashBoundaryMm: fullLevelValuesSchema })
      .optional()
      .describe('Above 600 V: E (Eqs. 3-5) and AFB (Eqs. 7-9) at 600, 2700, 14300 V before interpolation'),
  })
  .meta({ id: 'IncidentEnergyCase' });
export type IncidentEnergyCase = z.infer<typeof incidentEnergyCaseSchema>;

export const arcCaseSchema = z.enum(['full', 'reduced']).describe('Arcing-current case');

export const incidentEnergyResponseSchema = z
  .object({
    method: z.literal('IEEE 1584-2018'),
    voltageV: z.number(),
    voltageRegime: z.enum(['low-voltage', 'medium-voltage']).describe('≤ 600 V (Eq. 25) or above (interpolation)'),
    electrodeConfig: electrodeConfigSchema,
    boltedFaultKa: z.number(),
    gapMm: z.number(),
    workingDistanceMm: z.number(),
    maxArcDurationMs: z.number(),
    arcingCurrentKa: z.object({ full: z.number(), reduced: z.number() }).describe('Final arcing currents, kA'),
    varCf: z.number().describe('Arcing current variation correction factor, IEEE 1584-2018 Eq. (2)'),
    enclosureCorrectionFactor: z.number().describe('Enclosure size correction factor CF (1 in open air)'),
    enclosure: z.object({
      enclosureType: z.enum(['typical', 'shallow', 'open-air']),
      enclosureMm: enclosureSizeSchema.nullable(),
      enclosureDefaulted: z.boolean(),
      height1In: z.number().optional(),
      width1In: z.number().optional(),
      equivalentEnclosureSizeIn: z.number().optional(),
    }),
    intermediateArcingCurrentKa: z.object({ full: levelValuesSchema, reduced: levelValuesSchema }),
    cases: z.object({ full: incidentEnergyCaseSchema, reduced: incidentEnergyCaseSchema }),
    governingCase: arcCaseSchema.describe('The case with the larger incident energy, which the label uses'),
    incidentEnergyCalPerCm2: z.number(),
    incidentEnergyJPerCm2: z.number(),
    arcFlashBoundaryMm: z.number(),
    warnings: z.array(engineWarningSchema),
  })
  .meta({ id: 'IncidentEnergyResponse' });
export type IncidentEnergyResponse = z.infer<typeof incidentEnergyResponseSchema>;
