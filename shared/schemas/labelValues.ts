import { z } from 'zod';
import { ppeLevelSchema } from './organization';

const approachDistanceSchema = z.object({
  m: z.number().optional(),
  ftIn: z.string().optional(),
  imperialMm: z.number().optional(),
  text: z.string(),
});

/**
 * The values a label carries (docs/ARCHITECTURE.md, Label values), computed from a result, the nominal voltage and
 * organization settings.
 */
export const labelValuesSchema = z
  .object({
    nominalVoltageV: z.number(),
    incidentEnergyCalPerCm2: z.number(),
    incidentEnergyJPerCm2: z.number(),
    workingDistanceMm: z.number(),
    arcFlashBoundaryMm: z.number(),
    governingCase: z.enum(['full', 'reduced']),
    minimumArcRatingCalPerCm2: z.number(),
    minimumArcRatingBasis: z.string(),
    belowArcFlashThreshold: z.boolean(),
    ppeLevel: ppeLevelSchema.nullable(),
    ppeLevelBasis: z.string(),
    shockApproach: z
      .object({
        range: z.string(),
        limitedApproachMovable: approachDistanceSchema,
        limitedApproachFixed: approachDistanceSchema,
        restrictedApproach: approachDistanceSchema,
        source: z.string(),
        status: z.string(),
      })
      .nullable(),
    gloveClass: z
      .object({ class: z.string(), maxUseVoltageAcV: z.number(), source: z.string(), status: z.string() })
      .nullable(),
    signalWord: z.enum(['DANGER', 'WARNING']),
    signalColor: z.string(),
    signalWordBasis: z.string(),
    noAdequatePpe: z.boolean(),
    cautions: z.array(z.string()),
  })
  .meta({ id: 'LabelValues' });
export type LabelValuesDto = z.infer<typeof labelValuesSchema>;
