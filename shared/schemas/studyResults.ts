import { z } from 'zod';
import { tripRegionSchema } from './device';
import { labelValuesSchema } from './labelValues';

const warning = z.object({ code: z.string(), message: z.string() });

/** One protective device carrying fault current for a fault at the bus, read at the current it sees during the arc. */
export const deviceReadingSchema = z.object({
  deviceId: z.string(),
  name: z.string(),
  /** Where it sits: a branch end or a source/motor. */
  location: z.string(),
  /** Nominal voltage where the device sits, kV (its current is in amperes at this voltage). */
  kv: z.number(),
  /** Current the device sees during the arc, amperes at its own voltage. */
  currentA: z.number(),
  /** Share of the bolted fault current through this device (current at its voltage referred to the bus voltage / Ibf). */
  share: z.number(),
  clearingTimeS: z.number().nullable(),
  minimumTimeS: z.number().nullable(),
  region: tripRegionSchema,
  warnings: z.array(warning),
  /** When it operates as the current it sees changes during the arc (∫ dt / t(I) = 1, IEEE C37.112); null if not before the arc ends. */
  operatedAtS: z.number().nullable().default(null),
  /** The element that operated and its region. */
  operatingElement: z.string().nullable().default(null),
  operatingRegion: tripRegionSchema.nullable().default(null),
  /** Elements that had started timing and stopped because the current fell below their pickup. */
  dropouts: z.array(z.object({ element: z.string(), atS: z.number() })).default([]),
});
export type DeviceReading = z.infer<typeof deviceReadingSchema>;

/** One time step of the arc: its currents (the higher of its two ends) and its energy. */
export const arcStepSchema = z.object({
  fromS: z.number(),
  toS: z.number(),
  boltedFaultKa: z.number(),
  arcingCurrentKa: z.number(),
  incidentEnergyJPerCm2: z.number(),
  /** Devices that operate at the end of this step. */
  openedDeviceIds: z.array(z.string()).default([]),
});

/**
 * A stretch of the arc during which the same sources feed it. Its currents are those of its first step (they fall
 * within the stretch while a generator or motor contribution decays); its energy is the sum of its steps.
 */
export const arcIntervalSchema = z.object({
  fromS: z.number(),
  toS: z.number(),
  /** Sources and motors still feeding the arc. */
  sourceIds: z.array(z.string()),
  boltedFaultKa: z.number(),
  arcingCurrentKa: z.number(),
  incidentEnergyJPerCm2: z.number(),
  /** Devices that operate within or at the end of the stretch. */
  openedDeviceIds: z.array(z.string()).default([]),
  /** The time steps within the stretch; empty when the stretch is a single step (constant currents). */
  steps: z.array(arcStepSchema).default([]),
});

export const sourceCutSchema = z.object({
  sourceId: z.string(),
  kind: z.enum(['utility', 'generator', 'motor']),
  share: z.number(),
  /** When its contribution stops, s (the cap when nothing stops it). */
  stopsAtS: z.number(),
  /** The device whose opening cuts it off; null when none does before the cap (or a motor's decay ends it). */
  cutByDeviceId: z.string().nullable(),
  reason: z.enum(['device', 'motor-decay', 'cap']),
});

export const arcCaseTraceSchema = z.object({
  arcCase: z.enum(['full', 'reduced']),
  location: z.enum(['load-side', 'line-side']),
  arcingCurrentKa: z.number(),
  devices: z.array(deviceReadingSchema),
  sources: z.array(sourceCutSchema),
  intervals: z.array(arcIntervalSchema),
  /** Arc duration used, s (after the cap). */
  arcDurationS: z.number(),
  arcDurationCapped: z.boolean(),
  /** The device that ends the arc (the last to cut a source off); null when none does before the cap. */
  clearingDeviceId: z.string().nullable(),
  clearingRegion: tripRegionSchema.nullable(),
  incidentEnergyJPerCm2: z.number(),
  incidentEnergyCalPerCm2: z.number(),
  arcFlashBoundaryMm: z.number(),
  sentence: z.string(),
  /**
   * The motor decay model of this case when motors feed the arc: the run's, or with 'higher' the one that gave the
   * higher energy. Absent without motor contribution, and in results stored before it was recorded.
   */
  motorDecayModel: z.enum(['step', 'exponential']).optional(),
});
export type ArcCaseTrace = z.infer<typeof arcCaseTraceSchema>;

/** What one operating scenario gives at a bus (the base is the model as written). */
export const busScenarioSchema = z
  .object({
    scenarioId: z.string(),
    name: z.string(),
    /** 'de-energized': no source reaches the bus in this scenario (skipped, see note). */
    status: z.enum(['ok', 'error', 'de-energized']),
    note: z.string().optional(),
    boltedFaultKa: z.number().optional(),
    arcingCurrentKa: z.object({ full: z.number(), reduced: z.number() }).optional(),
    governing: z
      .object({ arcCase: z.enum(['full', 'reduced']), location: z.enum(['load-side', 'line-side']) })
      .optional(),
    arcDurationS: z.number().optional(),
    clearingDeviceId: z.string().nullable().optional(),
    clearingRegion: tripRegionSchema.nullable().optional(),
    incidentEnergyJPerCm2: z.number().optional(),
    incidentEnergyCalPerCm2: z.number().optional(),
    arcFlashBoundaryMm: z.number().optional(),
  })
  .meta({ id: 'BusScenario' });
export type BusScenario = z.infer<typeof busScenarioSchema>;

export const busResultSchema = z
  .object({
    busId: z.string(),
    busName: z.string(),
    nominalKv: z.number(),
    status: z.enum(['ok', 'error']),
    error: warning.optional(),
    equipment: z
      .object({
        class: z.string(),
        electrodeConfig: z.string(),
        gapMm: z.number(),
        workingDistanceMm: z.number(),
        enclosureMm: z.object({ height: z.number(), width: z.number(), depth: z.number() }).nullable(),
        mainIsolated: z.boolean(),
        /** Fields taken from the class's typical values. */
        typicalValuesUsed: z.array(z.string()),
      })
      .optional(),
    boltedFaultKa: z.number(),
    xr: z.number(),
    arcingCurrentKa: z.object({ full: z.number(), reduced: z.number() }).optional(),
    varCf: z.number().optional(),
    enclosureCorrectionFactor: z.number().optional(),
    cases: z.array(arcCaseTraceSchema),
    governing: z
      .object({ arcCase: z.enum(['full', 'reduced']), location: z.enum(['load-side', 'line-side']) })
      .optional(),
    incidentEnergyCalPerCm2: z.number().optional(),
    incidentEnergyJPerCm2: z.number().optional(),
    arcFlashBoundaryMm: z.number().optional(),
    arcDurationS: z.number().optional(),
    /** The arc-duration cap applied at this bus: the study's, or the bus's own (or none) with its reason. */
    arcDurationCap: z
      .object({
        capS: z.number().nullable(),
        source: z.enum(['study', 'bus']),
        reason: z.string().nullable(),
      })
      .optional(),
    clearingDeviceId: z.string().nullable().optional(),
    labelValues: labelValuesSchema.optional(),
    warnings: z.array(warning),
    /**
     * With operating scenarios in the model: the scenario whose result this is (the one with the highest incident
     * energy, or the one that failed), and what every scenario gives at the bus. Absent when the model has none.
     */
    scenarioId: z.string().optional(),
    scenarios: z.array(busScenarioSchema).optional(),
  })
  .meta({ id: 'BusResult' });
export type BusResult = z.infer<typeof busResultSchema>;

export const studyResultsSchema = z
  .object({
    method: z.string(),
    maxArcDurationMs: z.number(),
    motorDecayS: z.number(),
    /**
     * 'step': motors feed in full for motorDecayS then stop; 'exponential': e^(−t/τ), τ = motorDecayS; 'higher':
     * both, the higher energy kept per case (each case's `motorDecayModel` says which). Results stored before the
     * setting existed lack it and were computed with the step model.
     */
    motorDecayModel: z.enum(['step', 'exponential', 'higher']).default('step'),
    buses: z.array(busResultSchema),
    warnings: z.array(warning),
    /** The scenarios evaluated, base first; absent when the model has none (only the base was evaluated). */
    scenarios: z.array(z.object({ id: z.string(), name: z.string() })).optional(),
  })
  .meta({ id: 'StudyResults' });
export type StudyResults = z.infer<typeof studyResultsSchema>;
