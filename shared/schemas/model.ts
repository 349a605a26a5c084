import { z } from 'zod';
import '../zodMessages';
import { printableName } from './text';
import { deviceSchema, electronicPositionsSchema } from './device';
import { ELECTRODE_CONFIGS, EQUIPMENT_CLASSES, type ElectrodeConfig } from '../equipmentClasses';

/**
 * The system model of a site (docs/MODEL-FORMAT.md): `"format": "emberline-model", "version": 1`.
 *
 * Two layers of checks:
 * - `modelSchema` (zod): shapes and non-physical values (every physical quantity is a positive finite number);
 * - `validateModel(model)`: what a schema cannot see — unknown references, duplicate ids across all element kinds,
 *   islands without a source, transformer ratings against the buses' nominal voltages, cables and ties joining
 *   different voltages, closed ties forming a loop.
 * `parseModel(input)` runs both and reports every problem in one shape, `ModelIssue`, naming the element id and field.
 */

// ---------------------------------------------------------------------------------------------
// Primitives

const elementIdSchema = z.string().trim().min(1, 'Give an id').max(64);
const nameSchema = printableName(z.string().trim().max(160).optional());
/** A physical quantity: finite and greater than zero (zod 4 numbers already reject ±Infinity and NaN). */
const positive = z.number().positive();

export const electrodeConfigSchema = z.enum(ELECTRODE_CONFIGS).describe('IEEE 1584-2018 electrode configuration');
export type { ElectrodeConfig };

const EQUIPMENT_CLASS_IDS = EQUIPMENT_CLASSES.map((c) => c.id) as [string, ...string[]];
/**
 * Equipment class id (shared/equipmentClasses.ts): its typical gap, enclosure size and working distance are the
 * defaults the engineer can override on the bus.
 */
export const equipmentClassIdSchema = z.enum(EQUIPMENT_CLASS_IDS).describe('Equipment class id');
export type EquipmentClassId = z.infer<typeof equipmentClassIdSchema>;

export const CONDUCTOR_MATERIALS = ['Cu', 'Al'] as const;
export const CONDUIT_KINDS = ['steel', 'pvc', 'aluminum'] as const;

/** Conductor sizes of NEC Chapter 9 Table 9 (AWG, then kcmil), in the engine's canonical spelling. */
export const CONDUCTOR_SIZES = [
  '14',
  '12',
  '10',
  '8',
  '6',
  '4',
  '3',
  '2',
  '1',
  '1/0',
  '2/0',
  '3/0',
  '4/0',
  '250',
  '300',
  '350',
  '400',
  '500',
  '600',
  '750',
  '1000',
] as const;
export type ConductorSize = (typeof CONDUCTOR_SIZES)[number];

/**
 * Canonical conductor size from the usual spellings: "500kcmil", "500 MCM", "4/0", "4/0 AWG", "#2", "2 AWG",
 * "0000" (= 4/0). Returns null when the size is not one of NEC Chapter 9 Table 9's rows.
 */
export function normalizeConductorSize(size: string): ConductorSize | null {
  const known = conductorSizeCache.get(size);
  if (known !== undefined) return known;
  const canonical = canonicalConductorSize(size);
  if (conductorSizeCache.size < 1000) conductorSizeCache.set(size, canonical);
  return canonical;
}
const conductorSizeCache = new Map<string, ConductorSize | null>();

function canonicalConductorSize(size: string): ConductorSize | null {
  let s = size.trim().toLowerCase().replace(/\s+/g, '');
  s = s
    .replace(/^#/, '')
    .replace(/(kcmil|mcm|awg)$/, '')
    .replace(/^(awg)/, '');
  const aught: Record<string, string> = { '0': '1/0', '00': '2/0', '000': '3/0', '0000': '4/0' };
  if (aught[s]) s = aught[s];
  return (CONDUCTOR_SIZES as readonly string[]).includes(s) ? (s as ConductorSize) : null;
}

// ---------------------------------------------------------------------------------------------
// Elements

export const enclosureMmSchema = z.object({
  height: positive.describe('Enclosure height, mm'),
  width: positive.describe('Enclosure width, mm'),
  depth: positive.describe('Enclosure depth, mm'),
});

export const equipmentSchema = z
  .object({
    class: equipmentClassIdSchema,
    electrodeConfig: electrodeConfigSchema.optional().describe('Omitted: the typical value of the class'),
    gapMm: positive.optional().describe('Gap between conductors, mm; omitted: typical value of the class'),
    workingDistanceMm: positive.optional().describe('Working distance, mm; omitted: typical value of the class'),
    enclosureMm: enclosureMmSchema.optional().describe('Enclosure size, mm; omitted: typical value of the class'),
    mainIsolated: z
      .boolean()
      .optional()
      .describe(
        'true: the main device is isolated from the bus; false: it shares the enclosure (a line-side arc is cleared by the next device upstream). Omitted: treated as false (the conservative choice) and reported as defaulted',
      ),
    arcDurationCapS: z
      .number()
      .positive()
      .max(3600)
      .nullable()
      .optional()
      .describe(
        "Arc-duration cap at this bus, s, instead of the study's (e.g. where escape is not possible); null: no cap, the clearing time stands. Needs arcDurationCapReason",
      ),
    arcDurationCapReason: z
      .string()
      .trim()
      .max(500)
      .optional()
      .describe('Why this bus has its own arc-duration cap (required with arcDurationCapS)'),
  })
  .superRefine((e, ctx) => {
    if (e.arcDurationCapS !== undefined && !e.arcDurationCapReason) {
      ctx.addIssue({
        code: 'custom',
        path: ['arcDurationCapReason'],
        message: 'Give the reason for the arc-duration cap of this bus (e.g. confined space, escape not possible)',
      });
    }
  })
  .meta({ id: 'Equipment' });
export type Equipment = z.infer<typeof equipmentSchema>;

export const busSchema = z
  .object({
    id: elementIdSchema,
    name: nameSchema,
    nominalKv: positive.max(1000).describe('Nominal line-to-line voltage, kV'),
    equipment: equipmentSchema.optional(),
  })
  .meta({ id: 'Bus' });
export type Bus = z.infer<typeof busSchema>;

export const utilitySourceSchema = z
  .object({
    id: elementIdSchema,
    name: nameSchema,
    kind: z.literal('utility'),
    bus: elementIdSchema,
    shortCircuitMva: positive.optional().describe('Available three-phase short-circuit MVA at the bus'),
    shortCircuitKa: positive.optional().describe('Available three-phase short-circuit kA at the bus nominal voltage'),
    xr: positive.describe('X/R ratio of the source impedance'),
  })
  .superRefine((s, ctx) => {
    if ((s.shortCircuitMva === undefined) === (s.shortCircuitKa === undefined)) {
      ctx.addIssue({
        code: 'custom',
        path: ['shortCircuitMva'],
        message: 'Give exactly one of shortCircuitMva or shortCircuitKa',
      });
    }
  })
  .meta({ id: 'UtilitySource' });

export const generatorSourceSchema = z
  .object({
    id: elementIdSchema,
    name: nameSchema,
    kind: z.literal('generator'),
    bus: elementIdSchema,
    kva: positive.describe('Rated kVA'),
    kv: positive.describe('Rated line-to-line kV'),
    subtransientPct: positive.max(100).describe('Subtransient reactance X"d, percent on the machine rating'),
    xr: positive.describe('X/R ratio'),
    transientPct: positive
      .max(1000)
      .optional()
      .describe("Transient reactance X'd, percent on the machine rating; omitted: a typical value, with a warning"),
    synchronousPct: positive
      .max(1000)
      .optional()
      .describe('Synchronous reactance Xd, percent on the machine rating; omitted: a typical value, with a warning'),
    sustainedCurrentMultiple: positive
      .max(20)
      .optional()
      .describe('Sustained fault current with excitation support, multiple of rated current (instead of Xd)'),
    subtransientTimeConstantS: positive
      .max(10)
      .optional()
      .describe('Short-circuit subtransient time constant T"d, s; omitted: a typical value, with a warning'),
    transientTimeConstantS: positive
      .max(100)
      .optional()
      .describe("Short-circuit transient time constant T'd, s; omitted: a typical value, with a warning"),
  })
  .superRefine((g, ctx) => {
    if (g.synchronousPct !== undefined && g.sustainedCurrentMultiple !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['sustainedCurrentMultiple'],
        message: 'Give synchronousPct or sustainedCurrentMultiple, not both',
      });
    }
    if (g.transientPct !== undefined && g.transientPct < g.subtransientPct) {
      ctx.addIssue({
        code: 'custom',
        path: ['transientPct'],
        message: 'transientPct must not be below subtransientPct',
      });
    }
    if (g.synchronousPct !== undefined && g.synchronousPct < (g.transientPct ?? g.subtransientPct)) {
      ctx.addIssue({
        code: 'custom',
        path: ['synchronousPct'],
        message: 'synchronousPct must not be below transientPct (or subtransientPct)',
      });
    }
    if (
      g.subtransientTimeConstantS !== undefined &&
      g.transientTimeConstantS !== undefined &&
      g.subtransientTimeConstantS >= g.transientTimeConstantS
    ) {
      ctx.addIssue({
        code: 'custom',
        path: ['subtransientTimeConstantS'],
        message: 'subtransientTimeConstantS must be below transientTimeConstantS',
      });
    }
  })
  .meta({ id: 'GeneratorSource' });

export const sourceSchema = z
  .discriminatedUnion('kind', [utilitySourceSchema, generatorSourceSchema])
  .meta({ id: 'Source' });
export type Source = z.infer<typeof sourceSchema>;
export type UtilitySource = z.infer<typeof utilitySourceSchema>;
export type GeneratorSource = z.infer<typeof generatorSourceSchema>;

export const transformerSchema = z
  .object({
    id: elementIdSchema,
    name: nameSchema,
    fromBus: elementIdSchema.describe('Primary-side bus'),
    toBus: elementIdSchema.describe('Secondary-side bus'),
    kva: positive.describe('Self-cooled rating, kVA'),
    primaryKv: positive.describe('Rated primary line-to-line kV (tap in service)'),
    secondaryKv: positive.describe('Rated secondary line-to-line kV'),
    impedancePct: positive.max(100).describe('Impedance %Z on the transformer rating'),
    xr: positive.optional().describe('X/R ratio; omitted: a typical value by size, with a warning'),
  })
  .meta({ id: 'Transformer' });
export type Transformer = z.infer<typeof transformerSchema>;

export const cableSchema = z
  .object({
    id: elementIdSchema,
    name: nameSchema,
    fromBus: elementIdSchema,
    toBus: elementIdSchema,
    lengthM: positive.describe('Route length, m'),
    sets: z.number().int().positive().max(100).default(1).describe('Parallel sets of conductors per phase'),
    size: z
      .string()
      .refine((s) => normalizeConductorSize(s) !== null, {
        message: `Unknown conductor size: use one of ${CONDUCTOR_SIZES.join(', ')} (AWG or kcmil)`,
      })
      .optional(),
    material: z.enum(CONDUCTOR_MATERIALS).optional(),
    conduit: z.enum(CONDUIT_KINDS).optional(),
    rOhmPerKm: positive.optional().describe('Resistance of one conductor (one set), ohm/km'),
    xOhmPerKm: positive.optional().describe('Reactance of one conductor (one set), ohm/km, at the model frequency'),
  })
  .superRefine((c, ctx) => {
    const table = c.size !== undefined || c.material !== undefined || c.conduit !== undefined;
    const explicit = c.rOhmPerKm !== undefined || c.xOhmPerKm !== undefined;
    if (table && explicit) {
      ctx.addIssue({
        code: 'custom',
        path: ['rOhmPerKm'],
        message: 'Give either size/material/conduit or rOhmPerKm/xOhmPerKm, not both',
      });
    } else if (explicit) {
      for (const key of ['rOhmPerKm', 'xOhmPerKm'] as const) {
        if (c[key] === undefined) ctx.addIssue({ code: 'custom', path: [key], message: `Give ${key}` });
      }
    } else {
      for (const key of ['size', 'material', 'conduit'] as const) {
        if (c[key] === undefined) {
          ctx.addIssue({ code: 'custom', path: [key], message: `Give ${key} (or rOhmPerKm and xOhmPerKm)` });
        }
      }
    }
  })
  .meta({ id: 'Cable' });
export type Cable = z.infer<typeof cableSchema>;

export const motorSchema = z
  .object({
    id: elementIdSchema,
    name: nameSchema,
    bus: elementIdSchema,
    hp: positive.optional().describe('Rated horsepower'),
    kva: positive.optional().describe('Rated kVA (instead of hp)'),
    kv: positive.describe('Rated line-to-line kV'),
    lockedRotorMultiple: positive
      .optional()
      .describe('Locked-rotor current as a multiple of rated current (X" = 1/multiple)'),
    subtransientPct: positive.max(100).optional().describe('Subtransient reactance X", percent on the motor kVA'),
    rpm: positive
      .max(100000)
      .optional()
      .describe(
        'Synchronous speed, rpm (medium-voltage first-cycle multiplier: 3600 rpm motors of 250 hp and above take 1.0); omitted: 3600 assumed where it matters, with a warning',
      ),
    firstCycleMultiplier: positive
      .max(10)
      .optional()
      .describe(
        'Multiplier on X" for the first-cycle network; omitted: by size (IEEE 551 below 1 kV, IEEE C37.010 practice above)',
      ),
    xr: positive.optional().describe('X/R ratio; omitted: a typical value, with a warning'),
  })
  .superRefine((m, ctx) => {
    if ((m.hp === undefined) === (m.kva === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['hp'], message: 'Give exactly one of hp or kva' });
    }
    if (m.lockedRotorMultiple !== undefined && m.subtransientPct !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['lockedRotorMultiple'],
        message: 'Give lockedRotorMultiple or subtransientPct, not both',
      });
    }
  })
  .meta({ id: 'Motor' });
export type Motor = z.infer<typeof motorSchema>;

/** A bus tie or closed switch of negligible impedance: the buses it joins are one electrical node while closed. */
export const tieSchema = z
  .object({
    id: elementIdSchema,
    name: nameSchema,
    fromBus: elementIdSchema,
    toBus: elementIdSchema,
    closed: z.boolean().default(true),
  })
  .meta({ id: 'Tie' });
export type Tie = z.infer<typeof tieSchema>;

export const BRANCH_ENDS = ['from', 'to'] as const;

/** A protective device placed at one end of a branch (transformer, cable or tie) or on a source or motor. */
export const placedDeviceSchema = z
  .object({
    id: elementIdSchema,
    name: nameSchema,
    branch: elementIdSchema.optional().describe('Transformer, cable or tie id'),
    end: z.enum(BRANCH_ENDS).optional().describe('End of the branch the device sits at'),
    source: elementIdSchema.optional().describe('Source or motor id (instead of branch)'),
    device: deviceSchema,
    library: z
      .object({
        deviceTypeId: z.string().max(64),
        name: z.string().max(160),
        positions: electronicPositionsSchema.optional(),
      })
      .optional()
      .describe('The library device type this device was taken from, and the switch positions chosen (electronic)'),
    onlyAt: z
      .object({
        busIds: z.array(elementIdSchema).min(1).max(200).describe('The buses whose arcs it acts for'),
        purpose: z
          .enum(['arc-flash-relay', 'maintenance-switch'])
          .describe(
            "'arc-flash-relay': light sensors in that equipment plus current supervision, tripping this branch end's breaker; 'maintenance-switch': an alternate setting the work procedure switches on while working there",
          ),
        note: z.string().trim().max(300).optional(),
      })
      .optional()
      .describe(
        'Acts only for arcs at these buses (an arc-flash relay, or a maintenance switch turned on by the work procedure). Omitted: acts for every fault whose current it carries',
      ),
  })
  .superRefine((d, ctx) => {
    if ((d.branch === undefined) === (d.source === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['branch'], message: 'Give exactly one of branch or source' });
    }
    if (d.branch !== undefined && d.end === undefined) {
      ctx.addIssue({ code: 'custom', path: ['end'], message: 'Give the end of the branch: "from" or "to"' });
    }
    if (d.source !== undefined && d.end !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['end'], message: '"end" applies to a branch, not to a source' });
    }
  })
  .meta({ id: 'PlacedDevice' });
export type PlacedDevice = z.infer<typeof placedDeviceSchema>;

/** The model as written: the base operating scenario, always evaluated. */
export const BASE_SCENARIO_ID = 'base' as const;

/** What an operating scenario may change on a source (unknown keys are rejected: a typo must not pass silently). */
export const scenarioSourceOverrideSchema = z
  .object({
    inService: z.boolean().optional().describe('false: the source is out of service in this scenario'),
    shortCircuitMva: positive.optional().describe('Utility only: available short-circuit MVA in this scenario'),
    shortCircuitKa: positive.optional().describe('Utility only: available short-circuit kA in this scenario'),
    xr: positive.optional().describe('X/R ratio in this scenario'),
  })
  .strict()
  .superRefine((o, ctx) => {
    if (o.shortCircuitMva !== undefined && o.shortCircuitKa !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['shortCircuitMva'],
        message: 'Give shortCircuitMva or shortCircuitKa, not both',
      });
    }
  })
  .meta({ id: 'ScenarioSourceOverride' });
export type ScenarioSourceOverride = z.infer<typeof scenarioSourceOverrideSchema>;

/**
 * An operating state of the system (docs/MODEL-FORMAT.md, Operating scenarios): it overrides only what it names.
 * A run evaluates the base (the model as written) and every scenario; each bus's label takes the scenario with the
 * highest incident energy.
 */
export const scenarioSchema = z
  .object({
    id: elementIdSchema.refine((id) => id !== BASE_SCENARIO_ID, {
      message: `"${BASE_SCENARIO_ID}" is the model as written; give the scenario another id`,
    }),
    name: nameSchema,
    sources: z
      .record(z.string(), scenarioSourceOverrideSchema)
      .optional()
      .describe('By source id: in service, available fault level, X/R'),
    ties: z
      .record(z.string(), z.object({ closed: z.boolean() }).strict())
      .optional()
      .describe('By tie id: open or closed'),
    motors: z
      .record(z.string(), z.object({ inService: z.boolean() }).strict())
      .optional()
      .describe('By motor id: running (in service) or stopped'),
    allMotorsOff: z.boolean().optional().describe('true: every motor stopped (no motor contribution)'),
  })
  .strict()
  .meta({ id: 'Scenario' });
export type Scenario = z.infer<typeof scenarioSchema>;

export const MODEL_FORMAT = 'emberline-model' as const;
export const MODEL_VERSION = 1 as const;

export const modelSchema = z
  .object({
    format: z.literal(MODEL_FORMAT),
    version: z.literal(MODEL_VERSION),
    name: nameSchema,
    frequencyHz: z.union([z.literal(50), z.literal(60)]).default(60),
    prefaultPu: positive.min(0.5).max(1.5).optional().describe('Pre-fault voltage, per unit (default 1.0)'),
    buses: z.array(busSchema).min(1, 'Give at least one bus'),
    sources: z.array(sourceSchema).default([]),
    transformers: z.array(transformerSchema).default([]),
    cables: z.array(cableSchema).default([]),
    motors: z.array(motorSchema).default([]),
    ties: z.array(tieSchema).default([]),
    devices: z.array(placedDeviceSchema).default([]),
    scenarios: z
      .array(scenarioSchema)
      .max(50, 'At most 50 scenarios')
      .optional()
      .describe('Operating scenarios evaluated besides the model as written (the base)'),
  })
  .meta({ id: 'SystemModel' });
export type Model = z.infer<typeof modelSchema>;
export type ModelInput = z.input<typeof modelSchema>;

// ---------------------------------------------------------------------------------------------
// Semantic checks

export const MODEL_ISSUE_CODES = [
  'invalid-value',
  'duplicate-id',
  'unknown-reference',
  'self-loop',
  'voltage-mismatch',
  'island',
  'tie-loop',
  'missing-table-value',
] as const;
export type ModelIssueCode = (typeof MODEL_ISSUE_CODES)[number];

export const modelIssueSchema = z
  .object({
    code: z.enum(MODEL_ISSUE_CODES),
    path: z.string().describe('Where, e.g. "cables[2].toBus"'),
    elementId: z.string().optional().describe('Id of the element at fault, e.g. "FDR-3"'),
    field: z.string().optional().describe('Field of that element, e.g. "toBus"'),
    message: z.string(),
    elementIds: z.array(z.string()).optional().describe('All elements concerned (e.g. the buses of an island)'),
  })
  .meta({ id: 'ModelIssue' });
export type ModelIssue = z.infer<typeof modelIssueSchema>;

/** Tolerance between a transformer's rated kV and its bus's nominal kV (taps, 480/460 V style ratings). */
export const TRANSFORMER_KV_TOLERANCE = 0.05;
/** Tolerance between a generator's or motor's rated kV and its bus's nominal kV (e.g. 460 V motors on 480 V). */
export const MACHINE_KV_TOLERANCE = 0.1;
/** Buses joined by a cable or tie must have the same nominal voltage (to rounding). */
const SAME_KV_TOLERANCE = 0.001;

const relDiff = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), Number.MIN_VALUE);

type Collection = 'buses' | 'sources' | 'transformers' | 'cables' | 'motors' | 'ties' | 'devices' | 'scenarios';

/** Disjoint-set forest over indices, with union by size and path halving. */
class UnionFind {
  private readonly parent: Int32Array;
  private readonly size: Int32Array;
  constructor(n: number) {
    this.parent = new Int32Array(n);
    this.size = new Int32Array(n).fill(1);
    for (let i = 0; i < n; i += 1) this.parent[i] = i;
  }
  find(i: number): number {
    let x = i;
    while (this.parent[x] !== x) {
      this.parent[x] = this.parent[this.parent[x]];
      x = this.parent[x];
    }
    return x;
  }
  /** Joins the sets of a and b; false when they were already one set. */
  union(a: number, b: number): boolean {
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra === rb) return false;
    const [small, large] = this.size[ra] < this.size[rb] ? [ra, rb] : [rb, ra];
    this.parent[small] = large;
    this.size[large] += this.size[small];
    return true;
  }
}

const MAX_LISTED = 20;
function listIds(ids: string[]): string {
  const shown = ids
    .slice(0, MAX_LISTED)
    .map((id) => `"${id}"`)
    .join(', ');
  return ids.length > MAX_LISTED ? `${shown} and ${ids.length - MAX_LISTED} more` : shown;
}

/**
 * Semantic checks of a model that passed `modelSchema`. Returns every problem found (empty: the model is sound).
 * Each issue names the element id and the field, e.g.
 * `{ path: 'cables[2].toBus', elementId: 'FDR-3', field: 'toBus', message: 'unknown bus "MCC-9"' }`.
 */
export function validateModel(model: Model): ModelIssue[] {
  const issues: ModelIssue[] = [];
  const sources = model.sources ?? [];
  const transformers = model.transformers ?? [];
  const cables = model.cables ?? [];
  const motors = model.motors ?? [];
  const ties = model.ties ?? [];
  const devices = model.devices ?? [];

  const add = (
    code: ModelIssueCode,
    collection: Collection,
    index: number,
    elementId: string,
    field: string | undefined,
    message: string,
    elementIds?: string[],
  ) => {
    issues.push({
      code,
      path: `${collection}[${index}]${field ? `.${field}` : ''}`,
      elementId,
      field,
      message,
      ...(elementIds ? { elementIds } : {}),
    });
  };

  // Duplicate ids across every element kind. One map: id → collection number × 2²⁴ + index.
  const collections: [Collection, { id: string }[]][] = [
    ['buses', model.buses],
    ['sources', sources],
    ['transformers', transformers],
    ['cables', cables],
    ['motors', motors],
    ['ties', ties],
    ['devices', devices],
  ];
  const SHIFT = 2 ** 24;
  const seen = new Map<string, number>();
  collections.forEach(([collection, items], c) => {
    for (let index = 0; index < items.length; index += 1) {
      const id = items[index].id;
      const first = seen.get(id);
      if (first !== undefined) {
        const where = `${collections[Math.floor(first / SHIFT)][0]}[${first % SHIFT}]`;
        add('duplicate-id', collection, index, id, 'id', `duplicate id "${id}" (first used at ${where})`);
      } else {
        seen.set(id, c * SHIFT + index);
      }
    }
  });

  /** Bus index of an id (buses are collection 0), or undefined. */
  const busIndex = {
    get(id: string): number | undefined {
      const v = seen.get(id);
      return v !== undefined && v < SHIFT ? v : undefined;
    },
    has(id: string): boolean {
      const v = seen.get(id);
      return v !== undefined && v < SHIFT;
    },
  };
  const busKv = (id: string) => model.buses[busIndex.get(id)!].nominalKv;

  const checkBus = (collection: Collection, index: number, elementId: string, field: string, busId: string) => {
    if (busIndex.has(busId)) return true;
    add('unknown-reference', collection, index, elementId, field, `unknown bus "${busId}"`);
    return false;
  };

  sources.forEach((s, i) => {
    if (!checkBus('sources', i, s.id, 'bus', s.bus)) return;
    if (s.kind === 'generator' && relDiff(s.kv, busKv(s.bus)) > MACHINE_KV_TOLERANCE) {
      add(
        'voltage-mismatch',
        'sources',
        i,
        s.id,
        'kv',
        `generator rated ${s.kv} kV does not match bus "${s.bus}" at ${busKv(s.bus)} kV`,
      );
    }
  });

  motors.forEach((m, i) => {
    if (!checkBus('motors', i, m.id, 'bus', m.bus)) return;
    if (relDiff(m.kv, busKv(m.bus)) > MACHINE_KV_TOLERANCE) {
      add(
        'voltage-mismatch',
        'motors',
        i,
        m.id,
        'kv',
        `motor rated ${m.kv} kV does not match bus "${m.bus}" at ${busKv(m.bus)} kV`,
      );
    }
  });

  const twoEnded = (collection: Collection, items: { id: string; fromBus: string; toBus: string }[]) =>
    items.map((item, i) => {
      const okFrom = checkBus(collection, i, item.id, 'fromBus', item.fromBus);
      const okTo = checkBus(collection, i, item.id, 'toBus', item.toBus);
      if (okFrom && okTo && item.fromBus === item.toBus) {
        add('self-loop', collection, i, item.id, 'toBus', `both ends on bus "${item.fromBus}"`);
        return false;
      }
      return okFrom && okTo;
    });

  const txOk = twoEnded('transformers', transformers);
  transformers.forEach((t, i) => {
    if (!txOk[i]) return;
    const kvFrom = busKv(t.fromBus);
    const kvTo = busKv(t.toBus);
    if (relDiff(t.primaryKv, kvFrom) > TRANSFORMER_KV_TOLERANCE) {
      add(
        'voltage-mismatch',
        'transformers',
        i,
        t.id,
        'primaryKv',
        `primary ${t.primaryKv} kV does not match bus "${t.fromBus}" at ${kvFrom} kV (tolerance ${TRANSFORMER_KV_TOLERANCE * 100} %)`,
      );
    }
    if (relDiff(t.secondaryKv, kvTo) > TRANSFORMER_KV_TOLERANCE) {
      add(
        'voltage-mismatch',
        'transformers',
        i,
        t.id,
        'secondaryKv',
        `secondary ${t.secondaryKv} kV does not match bus "${t.toBus}" at ${kvTo} kV (tolerance ${TRANSFORMER_KV_TOLERANCE * 100} %)`,
      );
    }
  });

  const cableOk = twoEnded('cables', cables);
  cables.forEach((c, i) => {
    if (cableOk[i] && relDiff(busKv(c.toBus), busKv(c.fromBus)) > SAME_KV_TOLERANCE) {
      add(
        'voltage-mismatch',
        'cables',
        i,
        c.id,
        'toBus',
        `cable joins buses of different voltages: "${c.fromBus}" ${busKv(c.fromBus)} kV and "${c.toBus}" ${busKv(c.toBus)} kV`,
      );
    }
    if (c.size !== undefined && c.material === 'Al' && normalizeConductorSize(c.size) === '14') {
      add('missing-table-value', 'cables', i, c.id, 'size', 'NEC Chapter 9 Table 9 lists no 14 AWG aluminum conductor');
    }
  });

  const tieOk = twoEnded('ties', ties);
  const tieSets = new UnionFind(model.buses.length);
  ties.forEach((t, i) => {
    if (!tieOk[i]) return;
    if (relDiff(busKv(t.toBus), busKv(t.fromBus)) > SAME_KV_TOLERANCE) {
      add(
        'voltage-mismatch',
        'ties',
        i,
        t.id,
        'toBus',
        `tie joins buses of different voltages: "${t.fromBus}" ${busKv(t.fromBus)} kV and "${t.toBus}" ${busKv(t.toBus)} kV`,
      );
      return;
    }
    if (t.closed !== false && !tieSets.union(busIndex.get(t.fromBus)!, busIndex.get(t.toBus)!)) {
      add(
        'tie-loop',
        'ties',
        i,
        t.id,
        'closed',
        'closed ties form a loop: the current split between zero-impedance paths is indeterminate (open one tie, or model it as a cable)',
      );
    }
  });

  // Device placement.
  const kindOf = (id: string): Collection | undefined => {
    const v = seen.get(id);
    return v === undefined ? undefined : collections[Math.floor(v / SHIFT)][0];
  };
  const isBranch = (id: string) => ['transformers', 'cables', 'ties'].includes(kindOf(id) ?? '');
  const isInjection = (id: string) => ['sources', 'motors'].includes(kindOf(id) ?? '');
  devices.forEach((d, i) => {
    if (d.branch !== undefined && !isBranch(d.branch)) {
      add(
        'unknown-reference',
        'devices',
        i,
        d.id,
        'branch',
        `unknown branch "${d.branch}" (a transformer, cable or tie id)`,
      );
    }
    if (d.source !== undefined && !isInjection(d.source)) {
      add('unknown-reference', 'devices', i, d.id, 'source', `unknown source "${d.source}" (a source or motor id)`);
    }
    d.onlyAt?.busIds.forEach((b, k) => {
      if (!busIndex.has(b)) add('unknown-reference', 'devices', i, d.id, `onlyAt.busIds[${k}]`, `unknown bus "${b}"`);
    });
  });

  // Islands: every bus must reach a utility or generator through transformers, cables and closed ties.
  const connected = new UnionFind(model.buses.length);
  const join = (items: { fromBus: string; toBus: string }[], ok: boolean[]) =>
    items.forEach((b, i) => {
      if (ok[i]) connected.union(busIndex.get(b.fromBus)!, busIndex.get(b.toBus)!);
    });
  join(transformers, txOk);
  join(cables, cableOk);
  join(
    ties,
    ties.map((t, i) => tieOk[i] && t.closed !== false),
  );
  const fed = new Set<number>();
  for (const s of sources) {
    const b = busIndex.get(s.bus);
    if (b !== undefined) fed.add(connected.find(b));
  }
  const islands = new Map<number, string[]>();
  model.buses.forEach((b, i) => {
    if (busIndex.get(b.id) !== i) return; // a duplicate id was already reported
    const root = connected.find(i);
    if (fed.has(root)) return;
    const members = islands.get(root);
    if (members) members.push(b.id);
    else islands.set(root, [b.id]);
  });
  for (const members of islands.values()) {
    const first = busIndex.get(members[0])!;
    issues.push({
      code: 'island',
      path: `buses[${first}]`,
      elementId: members[0],
      field: 'id',
      elementIds: members,
      message: `no source (utility or generator) reaches ${members.length === 1 ? 'bus' : 'buses'} ${listIds(members)}`,
    });
  }

  // Operating scenarios: references by id, what each override applies to, and the ties each one closes.
  const scenarioIds = new Map<string, number>();
  (model.scenarios ?? []).forEach((sc, i) => {
    const first = scenarioIds.get(sc.id);
    if (first !== undefined) {
      add(
        'duplicate-id',
        'scenarios',
        i,
        sc.id,
        'id',
        `duplicate scenario id "${sc.id}" (first used at scenarios[${first}])`,
      );
    } else {
      scenarioIds.set(sc.id, i);
    }
    const refs = (
      map: Record<string, unknown> | undefined,
      key: 'sources' | 'ties' | 'motors',
      expected: Collection,
      what: string,
    ) => {
      for (const id of Object.keys(map ?? {})) {
        if (kindOf(id) !== expected) {
          add('unknown-reference', 'scenarios', i, sc.id, `${key}.${id}`, `unknown ${what} "${id}"`);
        }
      }
    };
    refs(sc.sources, 'sources', 'sources', 'source');
    refs(sc.ties, 'ties', 'ties', 'tie');
    refs(sc.motors, 'motors', 'motors', 'motor');
    for (const [id, o] of Object.entries(sc.sources ?? {})) {
      const v = seen.get(id);
      const source = v !== undefined && Math.floor(v / SHIFT) === 1 ? sources[v % SHIFT] : undefined;
      if (source?.kind !== 'generator') continue;
      for (const field of ['shortCircuitMva', 'shortCircuitKa'] as const) {
        if (o[field] !== undefined) {
          add(
            'invalid-value',
            'scenarios',
            i,
            sc.id,
            `sources.${id}.${field}`,
            `${field} applies to a utility source; "${id}" is a generator`,
          );
        }
      }
    }
    const inService = sources.filter((s) => sc.sources?.[s.id]?.inService !== false);
    if (sources.length > 0 && inService.length === 0) {
      add(
        'island',
        'scenarios',
        i,
        sc.id,
        'sources',
        'no source (utility or generator) is in service in this scenario',
      );
    }
    if (Object.keys(sc.ties ?? {}).length === 0) return; // the base's ties, checked above
    const scenarioTies = new UnionFind(model.buses.length);
    ties.forEach((t, k) => {
      const closed = sc.ties?.[t.id]?.closed ?? t.closed !== false;
      if (!tieOk[k] || !closed || relDiff(busKv(t.toBus), busKv(t.fromBus)) > SAME_KV_TOLERANCE) return;
      if (!scenarioTies.union(busIndex.get(t.fromBus)!, busIndex.get(t.toBus)!)) {
        add(
          'tie-loop',
          'scenarios',
          i,
          sc.id,
          `ties.${t.id}`,
          `closed ties form a loop in this scenario at tie "${t.id}" (open one tie in the scenario, or model it as a cable)`,
        );
      }
    });
  });

  return issues;
}

/** Path of a zod issue in the model's own notation: `cables[2].lengthM`. */
function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out === '' ? String(key) : `.${String(key)}`;
  }
  return out;
}

export type ParseModelResult = { success: true; model: Model; issues: [] } | { success: false; issues: ModelIssue[] };

/**
 * Parses an untrusted model (zod), then runs `validateModel`. Every problem comes back as a `ModelIssue`
 * naming the element id (when the element has one) and its field.
 */
export function parseModel(input: unknown): ParseModelResult {
  const parsed = modelSchema.safeParse(input);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((issue): ModelIssue => {
      const path = issue.path;
      let elementId: string | undefined;
      let field: string | undefined;
      if (path.length >= 2 && typeof path[0] === 'string' && typeof path[1] === 'number') {
        const item = (input as Record<string, unknown>)?.[path[0]];
        const element = Array.isArray(item) ? item[path[1]] : undefined;
        if (element && typeof element === 'object' && typeof (element as { id?: unknown }).id === 'string') {
          elementId = (element as { id: string }).id;
        }
        field = path.length > 2 ? formatPath(path.slice(2)) : undefined;
      } else if (path.length >= 1) {
        field = formatPath(path);
      }
      return {
        code: 'invalid-value',
        path: formatPath(path),
        ...(elementId !== undefined ? { elementId } : {}),
        ...(field !== undefined ? { field } : {}),
        message: issue.message,
      };
    });
    return { success: false, issues };
  }
  const issues = validateModel(parsed.data);
  return issues.length === 0 ? { success: true, model: parsed.data, issues: [] } : { success: false, issues };
}
