import { z } from 'zod';

export const ppeLevelSchema = z.object({
  name: z.string().trim().min(1, 'Name the level').max(60),
  maxCalPerCm2: z.number({ error: 'Enter a number' }).positive('Must be above zero').max(200),
  description: z.string().trim().max(300).optional(),
});
export type PpeLevel = z.infer<typeof ppeLevelSchema>;

/**
 * Default site-specific PPE levels: the arc-rating steps of NFPA 70E Table 130.7(C)(15)(c) (4, 8, 25, 40 cal/cm²)
 * used as upper limits of incident energy under our own names. Using the category thresholds this way is common
 * practice, no source; the organization sets its own table.
 */
export const DEFAULT_PPE_LEVELS: readonly PpeLevel[] = [
  { name: 'PPE level 1', maxCalPerCm2: 4, description: 'Arc-rated clothing and face protection, at least 4 cal/cm²' },
  {
    name: 'PPE level 2',
    maxCalPerCm2: 8,
    description: 'Arc-rated clothing and hood or face shield, at least 8 cal/cm²',
  },
  { name: 'PPE level 3', maxCalPerCm2: 25, description: 'Arc flash suit, at least 25 cal/cm²' },
  { name: 'PPE level 4', maxCalPerCm2: 40, description: 'Arc flash suit, at least 40 cal/cm²' },
];

/** Organization settings (admin). Every field has a default, so an empty object is valid. */
export const organizationSettingsSchema = z
  .object({
    reviewIntervalMonths: z
      .number()
      .int('Whole months')
      .min(1)
      .max(120)
      .default(60)
      .describe('Study review interval in months (NFPA 70E: at least every 5 years)'),
    signalWord: z
      .object({
        dangerAboveCalPerCm2: z.number().positive().max(200).default(40),
        dangerAboveVoltageV: z.number().positive().optional().describe('Also DANGER above this nominal voltage'),
      })
      .default({ dangerAboveCalPerCm2: 40 }),
    ppeLevels: z
      .array(ppeLevelSchema)
      .min(1, 'Keep at least one level')
      .max(10)
      .superRefine((levels, ctx) => {
        for (let i = 1; i < levels.length; i++) {
          if (!(levels[i].maxCalPerCm2 > levels[i - 1].maxCalPerCm2)) {
            ctx.addIssue({
              code: 'custom',
              path: [i, 'maxCalPerCm2'],
              message: 'Each level must cover more energy than the one before',
            });
          }
        }
      })
      .default(() => DEFAULT_PPE_LEVELS.map((l) => ({ ...l }))),
    maxArcDurationMs: z
      .number()
      .positive()
      .max(10_000)
      .default(2000)
      .describe('Cap of the arc duration (IEEE 1584 2 s guidance)'),
    motorDecayModel: z
      .enum(['higher', 'step', 'exponential'], { error: "Choose 'higher', 'step' or 'exponential'" })
      .default('higher')
      .describe(
        'Motor contribution: higher (default: both models evaluated, the higher energy kept, since neither is always the higher), step (full first-cycle current until the decay time, then none) or exponential (e^(−t/τ), τ the decay time, dropped after 5 τ).',
      ),
    requireIndependentApprover: z.boolean().default(false).describe('The approver must differ from the last editor'),
    notInstalledAfterDays: z
      .number()
      .int('Whole days')
      .min(1)
      .max(365)
      .default(30)
      .describe('An approved label not marked installed this many days after issue needs attention'),
    labelUnitOrder: z
      .enum(['us-first', 'si-first'])
      .default('si-first')
      .describe('Units printed first on labels: US customary (ft-in, then m) or SI (m, then ft-in)'),
    reminderHourUtc: z
      .number()
      .int('Whole hours')
      .min(0)
      .max(23)
      .default(6)
      .describe('Hour (UTC) at which the daily reminders go out'),
  })
  .meta({ id: 'OrganizationSettings' });
export type OrganizationSettings = z.infer<typeof organizationSettingsSchema>;
export type OrganizationSettingsInput = z.input<typeof organizationSettingsSchema>;

export const organizationSchema = z
  .object({ id: z.string(), name: z.string(), settings: organizationSettingsSchema })
  .meta({ id: 'Organization' });
export type OrganizationDto = z.infer<typeof organizationSchema>;
