import type { Model } from './schemas/model';
import type { ModelWarning } from './schemas/modelWarnings';

/**
 * Plausibility warnings on a sound model: values the schema accepts but that are rarely right — most often a wrong
 * unit or a slipped decimal point. They never block a save, an import or a run; they are shown beside the field in
 * the editor, returned with an import, and carried into the run's warnings. The limits are common practice, no
 * source, except the nominal voltages (ANSI C84.1 and IEC 60038 standard nominal system voltages, from memory).
 */

/** Above this available three-phase fault current a utility value is probably in the wrong unit. */
export const MAX_PLAUSIBLE_FAULT_KA = 200;
/** Usual impedance of power and distribution transformers, percent on their own rating. */
export const TRANSFORMER_Z_RANGE_PCT = [2, 15] as const;
/** A low-voltage (at most 1 kV) cable longer than this is probably in feet or millimetres. */
export const MAX_PLAUSIBLE_LV_CABLE_M = 1000;
/** X/R ratios above this are implausible for any element of a distribution system. */
export const MAX_PLAUSIBLE_XR = 100;
/** Locked-rotor current of induction motors, multiples of rated current. */
export const LOCKED_ROTOR_RANGE = [3, 12] as const;
/** Generator subtransient reactance X"d, percent on the machine rating. */
export const GENERATOR_XD2_RANGE_PCT = [5, 35] as const;

/** Standard nominal system voltages, kV line to line (ANSI C84.1, IEC 60038; from memory). */
export const NOMINAL_KV = [
  0.12, 0.208, 0.22, 0.23, 0.24, 0.38, 0.4, 0.415, 0.44, 0.48, 0.6, 0.69, 1, 2.4, 3.3, 4.16, 4.8, 6.6, 6.9, 10, 11, 12,
  12.47, 13.2, 13.8, 15, 20, 22, 23, 24.94, 33, 34.5, 46, 66, 69, 110, 115, 132, 138, 161, 220, 230, 345, 400, 500, 765,
] as const;
const KV_TOLERANCE = 0.01;

/** kVA of a motor: given, or from its horsepower at about 1 kVA per hp (common practice, no source). */
function motorKva(m: Model['motors'][number]): number {
  return m.kva ?? m.hp ?? 0;
}

const fmt = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(0) : x.toPrecision(3).replace(/\.?0+$/, ''));

export function plausibilityWarnings(model: Model): ModelWarning[] {
  const out: ModelWarning[] = [];
  const add = (collection: string, index: number, elementId: string, field: string, message: string) =>
    out.push({ code: 'implausible', path: `${collection}[${index}].${field}`, elementId, field, message });
  const busKv = new Map(model.buses.map((b) => [b.id, b.nominalKv]));

  model.buses.forEach((b, i) => {
    if (!NOMINAL_KV.some((kv) => Math.abs(b.nominalKv - kv) <= KV_TOLERANCE * kv)) {
      add(
        'buses',
        i,
        b.id,
        'nominalKv',
        `${fmt(b.nominalKv)} kV is not a usual nominal system voltage: check it is the line-to-line voltage in kV.`,
      );
    }
  });

  const faultKa = (s: { shortCircuitMva?: number; shortCircuitKa?: number }, kv: number | undefined) =>
    s.shortCircuitKa ?? (s.shortCircuitMva !== undefined && kv ? s.shortCircuitMva / (Math.sqrt(3) * kv) : 0);
  const checkFault = (collection: string, index: number, id: string, field: string, ka: number) => {
    if (ka > MAX_PLAUSIBLE_FAULT_KA) {
      add(
        collection,
        index,
        id,
        field,
        `An available fault current of ${fmt(ka)} kA is above ${MAX_PLAUSIBLE_FAULT_KA} kA: check the value and its unit (MVA or kA).`,
      );
    }
  };
  const checkXr = (collection: string, index: number, id: string, field: string, xr: number | undefined) => {
    if (xr !== undefined && xr > MAX_PLAUSIBLE_XR) {
      add(collection, index, id, field, `An X/R ratio of ${fmt(xr)} is above ${MAX_PLAUSIBLE_XR}: check the value.`);
    }
  };

  model.sources.forEach((s, i) => {
    checkXr('sources', i, s.id, 'xr', s.xr);
    if (s.kind === 'utility') {
      checkFault(
        'sources',
        i,
        s.id,
        s.shortCircuitKa !== undefined ? 'shortCircuitKa' : 'shortCircuitMva',
        faultKa(s, busKv.get(s.bus)),
      );
    } else if (s.subtransientPct < GENERATOR_XD2_RANGE_PCT[0] || s.subtransientPct > GENERATOR_XD2_RANGE_PCT[1]) {
      add(
        'sources',
        i,
        s.id,
        'subtransientPct',
        `A subtransient reactance of ${fmt(s.subtransientPct)} % is outside the usual ${GENERATOR_XD2_RANGE_PCT[0]}–${GENERATOR_XD2_RANGE_PCT[1]} % of generators: check it is a percentage on the machine rating.`,
      );
    }
  });

  model.transformers.forEach((t, i) => {
    const [lo, hi] = TRANSFORMER_Z_RANGE_PCT;
    if (t.impedancePct < lo || t.impedancePct > hi) {
      add(
        'transformers',
        i,
        t.id,
        'impedancePct',
        `An impedance of ${fmt(t.impedancePct)} % is outside the usual ${lo}–${hi} % of power transformers: check it is a percentage on the transformer's own rating.`,
      );
    }
    checkXr('transformers', i, t.id, 'xr', t.xr);
  });

  model.cables.forEach((c, i) => {
    const kv = busKv.get(c.fromBus);
    if (kv !== undefined && kv <= 1 && c.lengthM > MAX_PLAUSIBLE_LV_CABLE_M) {
      add(
        'cables',
        i,
        c.id,
        'lengthM',
        `A ${fmt(kv * 1000)} V cable of ${fmt(c.lengthM)} m is unusually long: check the length is in metres.`,
      );
    }
  });

  // Transformer and generator capacity of each voltage area (buses joined by cables and ties).
  const area = new Map<string, string>(model.buses.map((b) => [b.id, b.id]));
  const find = (id: string): string => {
    let x = id;
    while (area.get(x) !== x) x = area.get(x)!;
    return x;
  };
  for (const l of [...model.cables, ...model.ties]) {
    if (busKv.has(l.fromBus) && busKv.has(l.toBus)) area.set(find(l.fromBus), find(l.toBus));
  }
  const capacity = new Map<string, number>();
  const addCapacity = (bus: string, kva: number) => {
    if (!busKv.has(bus)) return;
    const root = find(bus);
    capacity.set(root, (capacity.get(root) ?? 0) + kva);
  };
  for (const t of model.transformers) addCapacity(t.toBus, t.kva);
  for (const s of model.sources) if (s.kind === 'generator') addCapacity(s.bus, s.kva);
  model.motors.forEach((m, i) => {
    checkXr('motors', i, m.id, 'xr', m.xr);
    if (m.lockedRotorMultiple !== undefined) {
      const [lo, hi] = LOCKED_ROTOR_RANGE;
      if (m.lockedRotorMultiple < lo || m.lockedRotorMultiple > hi) {
        add(
          'motors',
          i,
          m.id,
          'lockedRotorMultiple',
          `A locked-rotor current of ${fmt(m.lockedRotorMultiple)} × rated is outside the usual ${lo}–${hi} ×: check the value.`,
        );
      }
    }
    if (!busKv.has(m.bus)) return;
    const cap = capacity.get(find(m.bus));
    const kva = motorKva(m);
    if (cap !== undefined && cap > 0 && kva > cap) {
      add(
        'motors',
        i,
        m.id,
        m.kva !== undefined ? 'kva' : 'hp',
        `This motor (about ${fmt(kva)} kVA) is larger than the transformers and generators that feed its bus (${fmt(cap)} kVA in all): check its rating and unit.`,
      );
    }
  });

  (model.scenarios ?? []).forEach((sc, i) => {
    for (const [id, o] of Object.entries(sc.sources ?? {})) {
      const s = model.sources.find((x) => x.id === id);
      if (s?.kind !== 'utility') continue;
      if (o.shortCircuitKa !== undefined || o.shortCircuitMva !== undefined) {
        checkFault(
          'scenarios',
          i,
          sc.id,
          `sources.${id}.${o.shortCircuitKa !== undefined ? 'shortCircuitKa' : 'shortCircuitMva'}`,
          faultKa(o, busKv.get(s.bus)),
        );
      }
      checkXr('scenarios', i, sc.id, `sources.${id}.xr`, o.xr);
    }
  });
  return out;
}
