import { z } from 'zod';
import { deviceSchema, tripRegionSchema } from './device';
import { placedDeviceSchema } from './model';
import { studySchema } from './studies';

/**
 * Mitigation options for one bus (docs/ARCHITECTURE.md, Mitigation): which setting or device change brings the bus's
 * governing incident energy to or under a target, what it gives there and at every other bus it changes, and what it
 * costs in selectivity. Every option carries its change as a model patch; applying it in a new revision and running
 * that revision gives exactly the energy the option promised (the option was computed by the same engine on the
 * patched model).
 */

export const MITIGATION_KINDS = [
  'instantaneous-setting',
  'short-time-delay',
  'maintenance-mode',
  'arc-flash-relay',
  'current-limiting-fuse',
  'line-side-isolation',
] as const;
export const mitigationKindSchema = z.enum(MITIGATION_KINDS);
export type MitigationKind = z.infer<typeof mitigationKindSchema>;

/** What to compute: the bus and the energy to get to or under. */
export const mitigateRequestSchema = z
  .object({
    busId: z.string().trim().min(1, 'Name the bus').max(64),
    targetCalPerCm2: z
      .number({ error: 'Enter the target incident energy in cal/cm²' })
      .positive('The target must be above zero')
      .max(200, 'The target is at most 200 cal/cm²'),
  })
  .strict()
  .meta({ id: 'MitigateRequest' });
export type MitigateRequest = z.infer<typeof mitigateRequestSchema>;

export const applyMitigationRequestSchema = mitigateRequestSchema
  .extend({ optionId: z.string().trim().min(1, 'Name the option').max(200) })
  .strict()
  .meta({ id: 'ApplyMitigationRequest' });
export type ApplyMitigationRequest = z.infer<typeof applyMitigationRequestSchema>;

/**
 * One change to a model. `replace-device`: a placed device's protective device gets new settings (its id, name and
 * place stay; `library` is dropped when the settings no longer match the library type's positions, and replaced by
 * `library` when given). `add-device`: a device is placed (an arc-flash relay, a maintenance-switch element, a fuse).
 * `set-main-isolated`: the bus's main device moves into an isolated compartment (equipment.mainIsolated = true).
 */
export const modelPatchOpSchema = z
  .discriminatedUnion('op', [
    z.object({
      op: z.literal('replace-device'),
      deviceId: z.string(),
      device: deviceSchema,
      library: placedDeviceSchema.shape.library,
    }),
    z.object({ op: z.literal('add-device'), placed: placedDeviceSchema }),
    z.object({ op: z.literal('set-main-isolated'), busId: z.string() }),
  ])
  .meta({ id: 'ModelPatchOp' });
export type ModelPatchOp = z.infer<typeof modelPatchOpSchema>;

/** The hazard at the bus with or without the option: the governing result across every operating scenario. */
export const mitigationHazardSchema = z
  .object({
    incidentEnergyCalPerCm2: z.number(),
    arcFlashBoundaryMm: z.number(),
    arcDurationS: z.number(),
    arcDurationCapped: z.boolean(),
    governing: z.object({ arcCase: z.enum(['full', 'reduced']), location: z.enum(['load-side', 'line-side']) }),
    clearingDeviceId: z.string().nullable(),
    clearingDeviceName: z.string().nullable(),
    clearingRegion: tripRegionSchema.nullable(),
    /** The operating scenario that governs (absent without scenarios). */
    scenarioId: z.string().optional(),
    /** The PPE level name of the organization's levels (null: above every level). */
    ppeLevel: z.string().nullable(),
    signalWord: z.enum(['DANGER', 'WARNING']),
  })
  .meta({ id: 'MitigationHazard' });
export type MitigationHazard = z.infer<typeof mitigationHazardSchema>;

/** One current at which an upstream and a downstream band were compared. */
export const selectivityPointSchema = z.object({
  /** Which fault current: the bolted fault or an arc (full or reduced arcing current) at `faultBusId`. */
  current: z.enum(['bolted', 'arcing-full', 'arcing-reduced']),
  /** The current each device sees, amperes at its own voltage. */
  upstreamA: z.number(),
  downstreamA: z.number(),
  /** Upstream minimum (no-trip) time and downstream maximum (clearing) time at those currents, s (null: does not operate). */
  upstreamMinimumS: z.number().nullable(),
  downstreamClearingS: z.number().nullable(),
  /** upstreamMinimumS − downstreamClearingS; positive: the downstream device clears first. Null when either is null. */
  marginS: z.number().nullable(),
  selective: z.boolean(),
});

/** One downstream device checked against the changed one. */
export const selectivityCheckSchema = z.object({
  upstreamDeviceId: z.string(),
  downstreamDeviceId: z.string(),
  downstreamDeviceName: z.string(),
  /** The bus faulted for the comparison (the downstream device's load side). */
  faultBusId: z.string(),
  points: z.array(selectivityPointSchema),
  /** The smallest margin over the points, s (null when no point has both times). */
  marginS: z.number().nullable(),
  selective: z.boolean(),
  /** Before the change, for comparison. */
  selectiveBefore: z.boolean(),
  marginBeforeS: z.number().nullable(),
});
export type SelectivityCheck = z.infer<typeof selectivityCheckSchema>;

export const selectivitySchema = z
  .object({
    /**
     * 'kept': every checked pair stays selective; 'lost': at least one pair that was selective overlaps after the
     * change; 'already-lost': pairs overlap, but they overlapped before as well; 'while-on': a maintenance switch
     * gives up selectivity only while it is on; 'not-affected': the change acts only for arcs at this bus (an
     * arc-flash relay) or moves no band (isolation); 'no-downstream': no device downstream to check.
     */
    verdict: z.enum(['kept', 'lost', 'already-lost', 'while-on', 'not-affected', 'no-downstream']),
    sentence: z.string(),
    /** The downstream devices on the path to the largest load, nearest first. */
    checks: z.array(selectivityCheckSchema),
  })
  .meta({ id: 'Selectivity' });
export type Selectivity = z.infer<typeof selectivitySchema>;

/** Another bus whose governing energy the option changes. */
export const otherBusChangeSchema = z.object({
  busId: z.string(),
  busName: z.string(),
  beforeCalPerCm2: z.number().nullable(),
  afterCalPerCm2: z.number().nullable(),
});

export const mitigationOptionSchema = z
  .object({
    /** Stable for the same model, bus and target (apply names it). */
    id: z.string(),
    kind: mitigationKindSchema,
    /** One line: what changes (e.g. "Lower the instantaneous pickup of R-TX2 from 6 000 A to 3 100 A"). */
    title: z.string(),
    /** The device concerned: the one changed, or the one the new device acts with or beside; null for isolation. */
    deviceId: z.string().nullable(),
    deviceName: z.string().nullable(),
    /** Setting by setting: what it is now and what the option makes it. */
    changes: z.array(z.object({ setting: z.string(), before: z.string(), after: z.string() })),
    modelPatch: z.array(modelPatchOpSchema),
    reachesTarget: z.boolean(),
    /** The bus with the option applied. */
    result: mitigationHazardSchema,
    otherBuses: z.array(otherBusChangeSchema),
    selectivity: selectivitySchema,
    /** What the option assumes and what it needs (work procedure, equipment, maintenance); shown with it. */
    notes: z.array(z.string()),
  })
  .meta({ id: 'MitigationOption' });
export type MitigationOption = z.infer<typeof mitigationOptionSchema>;

/** A kind that gave no option, and why (e.g. "the clearing device is a fuse: no setting to change"). */
export const mitigationSkippedSchema = z.object({ kind: mitigationKindSchema, reason: z.string() });

export const mitigationResponseSchema = z
  .object({
    studyId: z.string(),
    busId: z.string(),
    busName: z.string(),
    targetCalPerCm2: z.number(),
    before: mitigationHazardSchema,
    /** Best first: those that reach the target, then by selectivity kept, then by lower energy. */
    options: z.array(mitigationOptionSchema),
    skipped: z.array(mitigationSkippedSchema),
    /** Shown with every option: a model result, to be reviewed and sealed by a qualified engineer. */
    cautions: z.array(z.string()),
  })
  .meta({ id: 'MitigationResponse' });
export type MitigationResponse = z.infer<typeof mitigationResponseSchema>;

export const applyMitigationResponseSchema = z
  .object({ study: studySchema, option: mitigationOptionSchema })
  .meta({ id: 'ApplyMitigationResponse' });
export type ApplyMitigationResponse = z.infer<typeof applyMitigationResponseSchema>;
