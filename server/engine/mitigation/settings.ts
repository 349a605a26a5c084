/**
 * Mitigation options that change a setting of the device clearing the arc (docs/ARCHITECTURE.md, Mitigation): a lower
 * instantaneous pickup, a shorter short-time (definite-time) delay, and a maintenance switch (an alternate
 * instantaneous setting the work procedure turns on while working at the bus). Each generator searches the device's
 * own adjustable range with the study engine (`ctx.evaluate`): it proposes the setting that brings the bus to or under
 * the target with the least loss of selectivity — the highest pickup, the longest delay that still reaches it — or,
 * when none does, the one that comes closest. Nothing here computes an energy.
 *
 * The range searched:
 * - relay: instantaneous and definite-time are adjustable continuously (primary amperes, seconds). Pickups are read
 *   in steps of 0.01 A secondary through the CT ratio, or to three significant figures of primary amperes without
 *   one (common practice, from memory: digital relays set to 0.01 A); the instantaneous is never set below the
 *   inverse-time pickup, the definite-time delay not below 0.05 s (both common practice, no source). The candidates
 *   are the pickups at which the element just picks up at the currents the relay sees at this bus (each current ÷
 *   (1 + tolerance), rounded down to a step) and a geometric grid between the bounds.
 * - electronic trip unit: the positions of its library trip-unit type where the placed device was taken from the
 *   library with switch positions and that type is known (the caller's `tripTypeOf`, else the generic starter set by
 *   name) and still gives the device's numbers; otherwise the usual ranges (common practice, from memory, as the
 *   generic starter set: instantaneous 1.5–15 × In in steps of 0.5 × In; short-time pickup 1.5–10 × Ir at the
 *   generic positions, delay 0.1–0.5 s in steps of 0.1 s).
 * - thermal-magnetic breaker: only an adjustable instantaneous entered as its whole range (the generic library's
 *   "LO–HI"); its positions are taken as whole multiples across that range, each with ± 25 % tolerance (the upper
 *   end of the usual ± 20–25 %, from memory: the higher hazard).
 * - fuse, digitized band: no setting.
 *
 * The search assumes the bus energy does not rise when a pickup or a delay is lowered (a device that opens sooner
 * cuts its current sooner), and halves the candidate list (binary search) instead of evaluating every candidate: the
 * candidate proposed is always one the engine evaluated.
 */
import type {
  Device,
  ElectronicDevice,
  ElectronicTripType,
  RelayDevice,
  ThermalMagneticDevice,
} from '../../../shared/schemas/device';
import type { ModelPatchOp } from '../../../shared/schemas/mitigation';
import type { Model, PlacedDevice } from '../../../shared/schemas/model';
import type { ArcCaseTrace, BusResult } from '../../../shared/schemas/studyResults';
import { formatSig } from '../../../shared/numberFormat';
import { genericElectronicTripType, genericLibrary, ELECTRONIC_SENSORS_A } from '../trip/genericLibrary';
import { resolveElectronicSettings } from '../trip/resolveElectronicSettings';
import { DEFAULT_INSTANTANEOUS_TOLERANCE_PCT, relaySettings } from '../trip/relay';
import type { OptionGenerator, OptionProposal, SearchContext } from './search';
import { directlyBelow, formatAmperes } from './selectivity';

/** Maintenance pickup: this multiple of the largest downstream instantaneous pickup (common practice, no source; 1.5–2 ×). */
export const MAINTENANCE_PICKUP_MULTIPLE = 1.5;
/** Lowest definite-time delay searched for a relay, s (common practice, no source). */
const RELAY_MIN_DELAY_S = 0.05;
/** Step of a relay's definite-time delay, s (common practice, from memory). */
const RELAY_DELAY_STEP_S = 0.05;
/** Resolution of a relay pickup in secondary amperes (common practice, from memory). */
const RELAY_SECONDARY_STEP_A = 0.01;
/** Points of the geometric grid between a relay element's bounds. */
const RELAY_GRID_POINTS = 16;
/** Without library positions: electronic instantaneous 1.5–15 × In in 0.5 × In steps (common practice, from memory). */
const ELECTRONIC_INST_RANGE = { low: 1.5, high: 15, step: 0.5 };
/** Without library positions: the generic unit's short-time positions (genericLibrary.ts). */
const ELECTRONIC_ST_PICKUPS = [1.5, 2, 3, 4, 5, 6, 8, 10];
const ELECTRONIC_ST_DELAYS = [0.1, 0.2, 0.3, 0.4, 0.5];
/** Tolerance of a thermal-magnetic instantaneous set within its range, ± percent (upper end of 20–25 %, from memory). */
const TM_SET_TOLERANCE_PCT = 25;
/** The generic library's marker of an adjustable thermal-magnetic instantaneous entered as its whole range. */
const TM_WHOLE_RANGE = 'LO–HI';

const fmt = (v: number, digits = 3) => formatSig(v, digits);
const amps = (a: number) => formatAmperes(a, 4);
const secs = (s: number) => `${fmt(s)} s`;
const cal = (e: number) => `${fmt(e)} cal/cm²`;
const nameOf = (p: PlacedDevice) => p.name ?? p.id;
const busNameOf = (model: Model, busId: string) => model.buses.find((b) => b.id === busId)?.name ?? busId;

// ---------------------------------------------------------------------------------------------
// The device to change

interface Target {
  placed: PlacedDevice;
  /** How it was chosen (a note when the arc is not ended by one device). */
  why: string | null;
}

/**
 * The device whose setting governs the bus's energy: the device that ends the governing arc; when none ends it before
 * the cap (several sources, one still feeding), the device that cuts off the source feeding the most
 * (share × time until cut), else the device reading the shortest clearing time.
 */
export function governingDevice(ctx: SearchContext): Target | { skipped: string } {
  const { model, base } = ctx;
  const g = base.governing;
  const gc = g ? base.cases.find((c) => c.arcCase === g.arcCase && c.location === g.location) : undefined;
  const byId = (id: string | null | undefined) => (id ? model.devices.find((d) => d.id === id) : undefined);
  const direct = byId(ctx.baseHazard.clearingDeviceId);
  if (direct?.onlyAt) {
    return {
      skipped: `The arc is already cleared by ${nameOf(direct)}, ${direct.onlyAt.purpose === 'arc-flash-relay' ? 'an arc-flash relay' : 'a maintenance-switch element'} acting only for arcs at named buses: change it in the model.`,
    };
  }
  if (direct) return { placed: direct, why: null };
  if (!gc) return { skipped: 'The bus has no governing arc case to change.' };
  const cut = gc.sources
    .filter((s) => s.cutByDeviceId && !byId(s.cutByDeviceId)?.onlyAt)
    .sort((a, b) => b.share * b.stopsAtS - a.share * a.stopsAtS)[0];
  const fromCut = byId(cut?.cutByDeviceId);
  if (fromCut) {
    return {
      placed: fromCut,
      why: `No device ends the arc before the ${secs(gc.arcDurationS)} cap (another source still feeds it); ${nameOf(fromCut)} cuts off ${cut!.sourceId}, the largest part of it.`,
    };
  }
  const fastest = gc.devices
    .filter((d) => d.clearingTimeS !== null && byId(d.deviceId) && !byId(d.deviceId)!.onlyAt)
    .sort((a, b) => (a.clearingTimeS as number) - (b.clearingTimeS as number))[0];
  const p = byId(fastest?.deviceId);
  if (p) {
    return {
      placed: p,
      why: `No device ends the arc before the ${secs(gc.arcDurationS)} cap; ${nameOf(p)} reads the shortest clearing time at the first-cycle current.`,
    };
  }
  return { skipped: 'No protective device carrying the arc current operates: there is no setting to change.' };
}

/** The currents a device sees at the start of each arc case at the bus (amperes at its voltage). */
function currentsSeen(r: BusResult, deviceId: string): number[] {
  const out: number[] = [];
  for (const c of r.cases as ArcCaseTrace[])
    for (const d of c.devices) if (d.deviceId === deviceId && d.currentA > 0) out.push(d.currentA);
  return out;
}

const energyOf = (r: BusResult) =>
  r.status === 'ok' && r.incidentEnergyCalPerCm2 !== undefined ? r.incidentEnergyCalPerCm2 : Infinity;

// ---------------------------------------------------------------------------------------------
// The search

interface Candidate<T> {
  value: T;
  patch: ModelPatchOp[];
}

interface Found<T> {
  chosen: Candidate<T>;
  energy: number;
  reaches: boolean;
  evaluated: number;
}

/**
 * `candidates` ordered from the least change (best selectivity) to the most: the first that reaches the target
 * (binary search, energy taken as not rising along the list), or the one giving the lowest energy of those evaluated.
 */
function search<T>(ctx: SearchContext, candidates: Candidate<T>[]): Found<T> | null {
  if (!candidates.length) return null;
  const seen = new Map<number, number>();
  const energyAt = (i: number) => {
    let e = seen.get(i);
    if (e === undefined) {
      e = energyOf(ctx.evaluate(candidates[i].patch));
      seen.set(i, e);
    }
    return e;
  };
  const reaches = (i: number) => energyAt(i) <= ctx.targetCalPerCm2;
  const last = candidates.length - 1;
  if (reaches(last)) {
    let lo = 0;
    let hi = last; // hi reaches; find the first index that reaches
    if (reaches(0)) hi = 0;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (reaches(mid)) hi = mid;
      else lo = mid;
    }
    return { chosen: candidates[hi], energy: energyAt(hi), reaches: true, evaluated: seen.size };
  }
  // None reaches: the most aggressive is the closest if the energy does not rise along the list; check the first too.
  let best = last;
  if (energyAt(0) < energyAt(last)) best = 0;
  return { chosen: candidates[best], energy: energyAt(best), reaches: false, evaluated: seen.size };
}

function alreadyMet(ctx: SearchContext): { skipped: string } | null {
  return ctx.baseHazard.incidentEnergyCalPerCm2 <= ctx.targetCalPerCm2
    ? { skipped: `The bus is already at ${cal(ctx.baseHazard.incidentEnergyCalPerCm2)}, at or under the target.` }
    : null;
}

/** What every setting search starts from: the device to change, its name, the choice's note and what it sees. */
interface SearchStart {
  placed: PlacedDevice;
  name: string;
  /** The note on how the device was chosen, when the arc is not ended by one device. */
  pre: string[];
  /** The currents it sees at the start of each arc case (amperes at its voltage). */
  seen: number[];
  /** The patch that gives it these settings. */
  patchFor: (device: Device, library?: PlacedDevice['library']) => ModelPatchOp[];
}

function searchStart(ctx: SearchContext): SearchStart | { skipped: string } {
  const met = alreadyMet(ctx);
  if (met) return met;
  const t = governingDevice(ctx);
  if ('skipped' in t) return t;
  const { placed } = t;
  return {
    placed,
    name: nameOf(placed),
    pre: t.why ? [t.why] : [],
    seen: currentsSeen(ctx.base, placed.id),
    patchFor: (device, library) => [
      { op: 'replace-device', deviceId: placed.id, device, ...(library ? { library } : {}) },
    ],
  };
}

function outcomeNote(ctx: SearchContext, found: Found<unknown>, lowestWords: string): string {
  return found.reaches
    ? `The ${found.evaluated} setting${found.evaluated === 1 ? '' : 's'} evaluated by the study engine: this is the least change that brings ${busNameOf(ctx.model, ctx.busId)} to ${cal(found.energy)}, at or under ${cal(ctx.targetCalPerCm2)}.`
    : `No setting in the range reaches ${cal(ctx.targetCalPerCm2)}: ${lowestWords} comes closest, ${cal(found.energy)}.`;
}

const COORDINATION_NOTE =
  'A lower or faster setting costs selectivity: check the coordination study, and the settings sheet of the device, before changing it.';

// ---------------------------------------------------------------------------------------------
// Library trip-unit types

export interface SettingGeneratorOptions {
  /** The organization's trip-unit type a placed device was taken from (library.deviceTypeId), or null when unknown. */
  tripTypeOf?: (placed: PlacedDevice) => ElectronicTripType | null;
}

/** The generic starter set's trip-unit types by their library name ("Generic LSIG trip unit, 1600 A frame"). */
let genericTripTypes: Map<string, ElectronicTripType> | null = null;
function genericTripTypeByName(name: string): ElectronicTripType | null {
  if (!genericTripTypes) {
    genericTripTypes = new Map();
    for (const t of genericLibrary())
      if (t.definition.kind === 'electronic') genericTripTypes.set(t.name, t.definition.tripType);
    for (const s of ELECTRONIC_SENSORS_A)
      genericTripTypes.set(genericElectronicTripType(s).name, genericElectronicTripType(s));
  }
  return genericTripTypes.get(name) ?? null;
}

function sameNumbers(a: unknown, b: unknown): boolean {
  if (typeof a === 'number' && typeof b === 'number') return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a));
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)].filter((k) => k !== 'name'));
    for (const k of keys) {
      const x = (a as Record<string, unknown>)[k];
      const y = (b as Record<string, unknown>)[k];
      if (x === undefined && y === undefined) continue;
      if (!sameNumbers(x, y)) return false;
    }
    return true;
  }
  return a === b;
}

/** The placed device's library trip-unit type and positions, when known and still giving its numbers. */
function libraryPositions(
  placed: PlacedDevice,
  opts: SettingGeneratorOptions,
): { tripType: ElectronicTripType; positions: Record<string, string> } | null {
  if (placed.device.kind !== 'electronic' || !placed.library?.positions) return null;
  const tripType = opts.tripTypeOf?.(placed) ?? genericTripTypeByName(placed.library.name);
  if (!tripType) return null;
  try {
    const resolved = resolveElectronicSettings(tripType, placed.library.positions);
    if (!sameNumbers(resolved, placed.device)) return null;
  } catch {
    return null;
  }
  return { tripType, positions: placed.library.positions as Record<string, string> };
}

type Positions = { name: string; value: number }[];
function positionsOf(tripType: ElectronicTripType, setting: keyof ElectronicTripType['settings']): Positions | null {
  const s = tripType.settings[setting];
  if (!s) return null;
  return Object.entries(s.positions).map(([name, value]) => ({ name, value }));
}

// ---------------------------------------------------------------------------------------------
// Relay helpers

const floorTo = (x: number, step: number) => Math.floor(x / step + 1e-9) * step;
/** A relay pickup rounded down to a settable value (primary amperes). */
function relayStep(device: RelayDevice, primaryA: number): number {
  if (device.ctRatio)
    return Number((floorTo(primaryA / device.ctRatio, RELAY_SECONDARY_STEP_A) * device.ctRatio).toFixed(6));
  const digits = Math.floor(Math.log10(primaryA)) - 2;
  return floorTo(primaryA, 10 ** digits);
}

function withRelayInstantaneous(device: RelayDevice, primaryA: number): RelayDevice {
  const out: RelayDevice = { ...device, instantaneousA: primaryA };
  delete out.instantaneousSecondaryA;
  if (device.ctRatio && device.instantaneousSecondaryA !== undefined)
    out.instantaneousSecondaryA = primaryA / device.ctRatio;
  return out;
}

/** Pickups from `high` down to `low`: the pick-up thresholds of the currents seen, and a geometric grid. */
function relayPickupCandidates(device: RelayDevice, low: number, high: number, thresholds: number[]): number[] {
  const set = new Set<number>();
  for (const t of thresholds) if (t >= low && t < high) set.add(relayStep(device, t));
  for (let k = 0; k < RELAY_GRID_POINTS; k++) {
    const v = high * (low / high) ** (k / (RELAY_GRID_POINTS - 1));
    const s = relayStep(device, v);
    if (s >= low && s < high) set.add(s);
  }
  return [...set].filter((v) => v > 0).sort((a, b) => b - a);
}

// ---------------------------------------------------------------------------------------------
// Instantaneous setting

function instantaneousOption(
  ctx: SearchContext,
  opts: SettingGeneratorOptions,
): OptionProposal[] | { skipped: string } {
  const start = searchStart(ctx);
  if ('skipped' in start) return start;
  const { placed, name, pre, seen, patchFor } = start;
  const d = placed.device;

  if (d.kind === 'fuse') return { skipped: `${name} is a fuse: no setting to change.` };
  if (d.kind === 'band') return { skipped: `${name} is a digitized band: its adjustable range is not known.` };

  if (d.kind === 'relay') {
    const s = relaySettings(d);
    const tol = d.instantaneousTolerancePct ?? DEFAULT_INSTANTANEOUS_TOLERANCE_PCT;
    const present = s.instantaneousA;
    const high = present ?? Math.max(...seen, s.pickupA * 2);
    const low = s.pickupA;
    const values = relayPickupCandidates(
      d,
      low,
      present === null ? high * (1 + 1e-9) : high,
      seen.map((a) => a / (1 + tol / 100)),
    );
    if (!values.length)
      return {
        skipped: `${name}: no instantaneous pickup below the present one and above its inverse-time pickup ${amps(low)}.`,
      };
    const found = search(
      ctx,
      values.map((v) => ({ value: v, patch: patchFor(withRelayInstantaneous(d, v)) })),
    )!;
    const v = found.chosen.value;
    const before = present === null ? 'none (no instantaneous element)' : amps(present);
    return [
      {
        kind: 'instantaneous-setting',
        variant: `${placed.id}@${fmt(v, 6)}A`,
        title:
          present === null
            ? `Turn on the instantaneous element of ${name} at ${amps(v)}`
            : `Lower the instantaneous pickup of ${name} from ${amps(present)} to ${amps(v)}`,
        deviceId: placed.id,
        deviceName: name,
        changes: [
          {
            setting: 'Instantaneous pickup (primary)',
            before,
            after: d.ctRatio
              ? `${amps(v)} (${fmt(v / d.ctRatio, 4)} A secondary, CT ratio ${fmt(d.ctRatio)})`
              : amps(v),
          },
        ],
        modelPatch: found.chosen.patch,
        notes: [
          ...pre,
          outcomeNote(ctx, found, `the lowest pickup searched (${amps(v)})`),
          `Pickup tolerance ± ${fmt(tol)} %: the element is counted on only at and above ${amps(v * (1 + tol / 100))}. Relay operating time ${secs(s.instantaneousDelayS)} plus the breaker's ${fmt(d.breakerCycles)} cycles (${secs(s.breakerS)}).`,
          `Searched continuously between the inverse-time pickup ${amps(low)} and ${present === null ? 'the currents seen' : `the present ${amps(present)}`}, in steps of ${d.ctRatio ? `${RELAY_SECONDARY_STEP_A} A secondary` : 'three significant figures'}.`,
          'Keep the instantaneous pickup above the transformer magnetizing inrush and the motor starting currents it sees.',
          COORDINATION_NOTE,
        ],
        selectivity: 'check',
      },
    ];
  }

  if (d.kind === 'electronic') {
    const lib = libraryPositions(placed, opts);
    const present = d.instantaneous?.pickup ?? null;
    let cands: { multiple: number; position: string | null }[];
    let rangeWords: string;
    if (lib && positionsOf(lib.tripType, 'instantaneousPickup')) {
      cands = positionsOf(lib.tripType, 'instantaneousPickup')!
        .filter((p) => p.value > 0)
        .map((p) => ({ multiple: p.value, position: p.name }));
      rangeWords = `the positions of the trip-unit type "${lib.tripType.name}"`;
    } else {
      cands = [];
      for (let m = ELECTRONIC_INST_RANGE.high; m >= ELECTRONIC_INST_RANGE.low - 1e-9; m -= ELECTRONIC_INST_RANGE.step)
        cands.push({ multiple: Number(m.toFixed(3)), position: null });
      rangeWords = `${ELECTRONIC_INST_RANGE.low}–${ELECTRONIC_INST_RANGE.high} × In in steps of ${ELECTRONIC_INST_RANGE.step} × In (the usual range; the unit's own positions are not known)`;
    }
    cands = cands
      .filter((c) => present === null || c.multiple < present - 1e-9)
      .sort((a, b) => b.multiple - a.multiple);
    if (!cands.length)
      return { skipped: `${name}: no instantaneous position below the present ${fmt(present ?? 0)} × In.` };
    const found = search(
      ctx,
      cands.map((c) => {
        const device: ElectronicDevice = { ...d, instantaneous: { pickup: c.multiple } };
        const library =
          lib && c.position && placed.library
            ? { ...placed.library, positions: { ...lib.positions, instantaneousPickup: c.position } }
            : undefined;
        return { value: c, patch: patchFor(device, library) };
      }),
    )!;
    const c = found.chosen.value;
    const words = (m: number) => `${fmt(m)} × In (${amps(m * d.sensorA)})`;
    return [
      {
        kind: 'instantaneous-setting',
        variant: `${placed.id}@${fmt(c.multiple, 6)}xIn`,
        title: `${present === null ? 'Turn on' : 'Lower'} the instantaneous pickup of ${name}${present === null ? '' : ` from ${amps(present * d.sensorA)}`} to ${amps(c.multiple * d.sensorA)}`,
        deviceId: placed.id,
        deviceName: name,
        changes: [
          {
            setting: 'Instantaneous pickup',
            before: present === null ? 'OFF' : words(present),
            after: words(c.multiple) + (c.position ? ` (position ${c.position})` : ''),
          },
        ],
        modelPatch: found.chosen.patch,
        notes: [
          ...pre,
          outcomeNote(ctx, found, `the lowest position (${words(c.multiple)})`),
          `Pickup tolerance ± ${fmt(d.pickupTolerancePct)} %: the element is counted on only at and above ${amps(c.multiple * d.sensorA * (1 + d.pickupTolerancePct / 100))}; breaker clearing ${secs(d.clearingS)}.`,
          `Searched: ${rangeWords}.`,
          COORDINATION_NOTE,
        ],
        selectivity: 'check',
      },
    ];
  }

  // Thermal-magnetic
  const inst = d.instantaneous;
  if (!inst || inst.setting !== TM_WHOLE_RANGE || inst.lowMultiple === undefined || inst.highMultiple === undefined) {
    return {
      skipped: `${name} is a thermal-magnetic breaker with a fixed instantaneous pickup (no adjustable range entered): no setting to change.`,
    };
  }
  const presentHigh = inst.highMultiple;
  const multiples: number[] = [];
  for (let m = Math.floor(inst.highMultiple); m >= Math.ceil(inst.lowMultiple); m--)
    if (m * (1 + TM_SET_TOLERANCE_PCT / 100) < presentHigh - 1e-9) multiples.push(m);
  if (!multiples.length) {
    return {
      skipped: `${name}: no position of its instantaneous range ${fmt(inst.lowMultiple)}–${fmt(inst.highMultiple)} × rating acts sooner than the range entered.`,
    };
  }
  const found = search(
    ctx,
    multiples.map((m) => {
      const device: ThermalMagneticDevice = {
        ...d,
        instantaneous: { pickupMultiple: m, tolerancePct: TM_SET_TOLERANCE_PCT, setting: `${fmt(m)}×` },
      };
      return { value: m, patch: patchFor(device) };
    }),
  )!;
  const m = found.chosen.value;
  return [
    {
      kind: 'instantaneous-setting',
      variant: `${placed.id}@${m}xrating`,
      title: `Set the instantaneous of ${name} to ${fmt(m)} × rating (${amps(m * d.ratingA)})`,
      deviceId: placed.id,
      deviceName: name,
      changes: [
        {
          setting: 'Instantaneous pickup',
          before: `${fmt(inst.lowMultiple)}–${fmt(inst.highMultiple)} × rating (whole adjustable range, not set)`,
          after: `${fmt(m)} × rating (${amps(m * d.ratingA)}), ± ${TM_SET_TOLERANCE_PCT} %`,
        },
      ],
      modelPatch: found.chosen.patch,
      notes: [
        ...pre,
        outcomeNote(ctx, found, `the lowest position (${fmt(m)} × rating)`),
        `Positions taken as whole multiples of the rating across the range, each with ± ${TM_SET_TOLERANCE_PCT} % tolerance (the upper end of the usual ± 20–25 %, from memory): check the breaker's own dial.`,
        COORDINATION_NOTE,
      ],
      selectivity: 'check',
    },
  ];
}

// ---------------------------------------------------------------------------------------------
// Short-time (definite-time) delay

function shortTimeOption(ctx: SearchContext, opts: SettingGeneratorOptions): OptionProposal[] | { skipped: string } {
  const start = searchStart(ctx);
  if ('skipped' in start) return start;
  const { placed, name, pre, seen, patchFor } = start;
  const d = placed.device;
  const lowestSeen = seen.length ? Math.min(...seen) : null;
  if (d.kind === 'fuse') return { skipped: `${name} is a fuse: no setting to change.` };
  if (d.kind === 'band') return { skipped: `${name} is a digitized band: its adjustable range is not known.` };
  if (d.kind === 'thermal-magnetic')
    return { skipped: `${name} is a thermal-magnetic breaker: it has no short-time element.` };

  if (d.kind === 'relay') {
    const s = relaySettings(d);
    if (!s.definiteTime) {
      return {
        skipped: `${name} has no definite-time element: no delay to shorten (its inverse-time curve is not searched here).`,
      };
    }
    const dt = s.definiteTime;
    // The pickup stays unless the element does not pick up at the lowest current seen: then the highest step that does.
    const pickup =
      lowestSeen === null || dt.pickupA <= lowestSeen ? dt.pickupA : Math.max(relayStep(d, lowestSeen), s.pickupA);
    const delays: number[] = [];
    for (
      let x = floorTo(dt.delayS - (pickup === dt.pickupA ? RELAY_DELAY_STEP_S : 0), RELAY_DELAY_STEP_S);
      x >= RELAY_MIN_DELAY_S - 1e-9;
      x -= RELAY_DELAY_STEP_S
    )
      delays.push(Number(x.toFixed(4)));
    if (!delays.length)
      return {
        skipped: `${name}: its definite-time delay ${secs(dt.delayS)} is already at the lowest searched (${secs(RELAY_MIN_DELAY_S)}).`,
      };
    const found = search(
      ctx,
      delays.map((delayS) => {
        const definiteTime: RelayDevice['definiteTime'] = { pickupA: pickup, delayS };
        if (d.ctRatio && d.definiteTime?.pickupSecondaryA !== undefined)
          definiteTime.pickupSecondaryA = pickup / d.ctRatio;
        return { value: delayS, patch: patchFor({ ...d, definiteTime }) };
      }),
    )!;
    const delayS = found.chosen.value;
    const changes: OptionProposal['changes'] = [
      { setting: 'Definite-time delay', before: secs(dt.delayS), after: secs(delayS) },
    ];
    if (pickup !== dt.pickupA)
      changes.push({ setting: 'Definite-time pickup (primary)', before: amps(dt.pickupA), after: amps(pickup) });
    return [
      {
        kind: 'short-time-delay',
        variant: `${placed.id}@${fmt(delayS, 6)}s@${fmt(pickup, 6)}A`,
        title: `Shorten the definite-time delay of ${name} from ${secs(dt.delayS)} to ${secs(delayS)}${pickup !== dt.pickupA ? ` and lower its pickup to ${amps(pickup)}` : ''}`,
        deviceId: placed.id,
        deviceName: name,
        changes,
        modelPatch: found.chosen.patch,
        notes: [
          ...pre,
          outcomeNote(ctx, found, `the shortest delay searched (${secs(delayS)})`),
          `Searched: ${secs(RELAY_MIN_DELAY_S)} to the present delay in steps of ${secs(RELAY_DELAY_STEP_S)}; the breaker's ${fmt(d.breakerCycles)} cycles (${secs(s.breakerS)}) are added.`,
          COORDINATION_NOTE,
        ],
        selectivity: 'check',
      },
    ];
  }

  // Electronic
  if (!d.shortTime) return { skipped: `${name} has its short-time element off: no delay to shorten.` };
  const st = d.shortTime;
  const irA = d.longTime.pickup * d.sensorA;
  const tol = d.pickupTolerancePct / 100;
  const lib = libraryPositions(placed, opts);
  const libDelays = lib ? positionsOf(lib.tripType, 'shortTimeDelay') : null;
  const libPickups = lib ? positionsOf(lib.tripType, 'shortTimePickup') : null;
  const delays: Positions = (libDelays ?? ELECTRONIC_ST_DELAYS.map((v) => ({ name: '', value: v }))).filter(
    (p) => p.value > 0,
  );
  const pickups: Positions = (libPickups ?? ELECTRONIC_ST_PICKUPS.map((v) => ({ name: '', value: v }))).filter(
    (p) => p.value > 0,
  );
  // The pickup stays unless the element does not pick up at the lowest current seen (high edge above it).
  const picksUp = (m: number) => lowestSeen !== null && m * irA * (1 + tol) <= lowestSeen;
  let pickup: { name: string; value: number } = { name: lib?.positions.shortTimePickup ?? '', value: st.pickup };
  if (!picksUp(st.pickup)) {
    const fit = pickups.filter((p) => p.value < st.pickup && picksUp(p.value)).sort((a, b) => b.value - a.value)[0];
    const lowest = [...pickups].sort((a, b) => a.value - b.value)[0];
    if (fit) pickup = fit;
    else if (lowest && lowest.value < st.pickup) pickup = lowest;
  }
  const changedPickup = Math.abs(pickup.value - st.pickup) > 1e-9;
  const cands = delays
    .filter((p) => p.value < st.delayS - 1e-9 || (changedPickup && Math.abs(p.value - st.delayS) <= 1e-9))
    .sort((a, b) => b.value - a.value);
  if (!cands.length)
    return { skipped: `${name}: its short-time delay ${secs(st.delayS)} is already the lowest position.` };
  const found = search(
    ctx,
    cands.map((delay) => {
      const device: ElectronicDevice = { ...d, shortTime: { ...st, delayS: delay.value, pickup: pickup.value } };
      const library =
        lib && placed.library && (delay.name || !libDelays) && (pickup.name || !changedPickup)
          ? {
              ...placed.library,
              positions: {
                ...lib.positions,
                ...(delay.name ? { shortTimeDelay: delay.name } : {}),
                ...(changedPickup && pickup.name ? { shortTimePickup: pickup.name } : {}),
              },
            }
          : undefined;
      return { value: delay.value, patch: patchFor(device, library) };
    }),
  )!;
  const delayS = found.chosen.value;
  const changes: OptionProposal['changes'] = [];
  if (Math.abs(delayS - st.delayS) > 1e-9)
    changes.push({ setting: 'Short-time delay', before: secs(st.delayS), after: secs(delayS) });
  if (changedPickup) {
    changes.push({
      setting: 'Short-time pickup',
      before: `${fmt(st.pickup)} × Ir (${amps(st.pickup * irA)})`,
      after: `${fmt(pickup.value)} × Ir (${amps(pickup.value * irA)})`,
    });
  }
  return [
    {
      kind: 'short-time-delay',
      variant: `${placed.id}@${fmt(delayS, 6)}s@${fmt(pickup.value, 6)}xIr`,
      title:
        `Shorten the short-time delay of ${name} from ${secs(st.delayS)} to ${secs(delayS)}` +
        (changedPickup ? ` and lower its short-time pickup to ${amps(pickup.value * irA)}` : ''),
      deviceId: placed.id,
      deviceName: name,
      changes,
      modelPatch: found.chosen.patch,
      notes: [
        ...pre,
        outcomeNote(ctx, found, `the shortest delay (${secs(delayS)})`),
        `Pickup tolerance ± ${d.pickupTolerancePct} %${d.timeTolerancePct ? `, time tolerance + ${d.timeTolerancePct} %` : ''}; breaker clearing ${secs(d.clearingS)} added.${st.i2t ? ' I²t is left in: at lower currents the delay follows the ramp.' : ''}`,
        `Searched: ${lib ? `the positions of the trip-unit type "${lib.tripType.name}"` : `the usual positions (delays ${ELECTRONIC_ST_DELAYS.join(', ')} s; pickups ${ELECTRONIC_ST_PICKUPS.join(', ')} × Ir — the unit's own positions are not known)`}.`,
        COORDINATION_NOTE,
      ],
      selectivity: 'check',
    },
  ];
}

// ---------------------------------------------------------------------------------------------
// Maintenance mode

/** The instantaneous (else short-time / definite-time) pickup of a device, amperes at its voltage; null for none. */
function fastPickupA(d: Device): { amps: number; element: string } | null {
  switch (d.kind) {
    case 'relay': {
      const s = relaySettings(d);
      if (s.instantaneousA !== null) return { amps: s.instantaneousA, element: 'instantaneous pickup' };
      if (s.definiteTime) return { amps: s.definiteTime.pickupA, element: 'definite-time pickup' };
      return null;
    }
    case 'electronic':
      if (d.instantaneous) return { amps: d.instantaneous.pickup * d.sensorA, element: 'instantaneous pickup' };
      if (d.shortTime)
        return { amps: d.shortTime.pickup * d.longTime.pickup * d.sensorA, element: 'short-time pickup' };
      return null;
    case 'thermal-magnetic': {
      const i = d.instantaneous;
      if (!i) return null;
      const m = i.pickupMultiple ?? i.highMultiple;
      return m === undefined ? null : { amps: m * d.ratingA, element: 'instantaneous pickup' };
    }
    default:
      return null;
  }
}

const busOfPlace = (model: Model, p: PlacedDevice): string | null => {
  if (p.branch) {
    const b =
      model.transformers.find((x) => x.id === p.branch) ??
      model.cables.find((x) => x.id === p.branch) ??
      model.ties.find((x) => x.id === p.branch);
    return b ? (p.end === 'from' ? b.fromBus : b.toBus) : null;
  }
  return (model.sources.find((s) => s.id === p.source) ?? model.motors.find((m) => m.id === p.source))?.bus ?? null;
};
const kvOf = (model: Model, busId: string | null) => model.buses.find((b) => b.id === busId)?.nominalKv ?? NaN;

function maintenanceOption(ctx: SearchContext, _opts: SettingGeneratorOptions): OptionProposal[] | { skipped: string } {
  const met = alreadyMet(ctx);
  if (met) return met;
  const t = governingDevice(ctx);
  if ('skipped' in t) return t;
  const { model, busId } = ctx;
  const { placed } = t;
  const d = placed.device;
  const name = nameOf(placed);
  const busName = busNameOf(model, busId);
  if (d.kind === 'fuse') return { skipped: `${name} is a fuse: it has no alternate setting to switch on.` };
  if (d.kind === 'band') return { skipped: `${name} is a digitized band: its trip unit is not known.` };
  if (d.kind === 'thermal-magnetic') {
    return {
      skipped: `${name} is a thermal-magnetic breaker: it has no maintenance setting (a trip unit or relay with one, or an arc-flash relay, would be needed).`,
    };
  }
  // The largest fast pickup among the devices directly below (every feeder leaving the bus below, or the device at
  // the far end of its own branch), referred to this device's voltage.
  const kvHere = kvOf(model, busOfPlace(model, placed));
  const firstLevel = directlyBelow(model, placed, new Set([placed.id])).map((x) => x.device);
  let largest: { amps: number; device: PlacedDevice; element: string; ownA: number } | null = null;
  for (const x of firstLevel) {
    const f = fastPickupA(x.device);
    if (!f) continue;
    const referred = (f.amps * kvOf(model, busOfPlace(model, x))) / kvHere;
    if (Number.isFinite(referred) && (!largest || referred > largest.amps))
      largest = { amps: referred, device: x, element: f.element, ownA: f.amps };
  }
  const relayS = d.kind === 'relay' ? relaySettings(d) : null;
  const stepped = (a: number) => (d.kind === 'relay' ? relayStep(d, a) : a);
  const elementFor = (a: number): Device =>
    d.kind === 'relay'
      ? withRelayInstantaneous(d, a)
      : { ...(d as ElectronicDevice), instantaneous: { pickup: a / (d as ElectronicDevice).sensorA } };
  const id = (() => {
    let k = 1;
    let candidate = `${placed.id}-MAINT`.slice(0, 60);
    while (model.devices.some((x) => x.id === candidate)) candidate = `${placed.id}-MAINT-${++k}`.slice(0, 60);
    return candidate;
  })();
  const note = `Maintenance switch of ${name}: on while working at ${busName}`.slice(0, 300);
  const patchFor = (a: number): ModelPatchOp[] => [
    {
      op: 'add-device',
      placed: {
        id,
        name: `${name} maintenance setting`.slice(0, 120),
        ...(placed.branch ? { branch: placed.branch, end: placed.end } : { source: placed.source }),
        device: elementFor(a),
        onlyAt: { busIds: [busId], purpose: 'maintenance-switch', note },
      },
    },
  ];
  let pickupA: number;
  let why: string;
  let found: Found<number> | null;
  if (largest) {
    pickupA = stepped(MAINTENANCE_PICKUP_MULTIPLE * largest.amps);
    found = search(ctx, [{ value: pickupA, patch: patchFor(pickupA) }]);
    const voltageWords =
      Math.abs(kvOf(model, busOfPlace(model, largest.device)) - kvHere) > 1e-9
        ? ` (${amps(largest.ownA)} at ${fmt(kvOf(model, busOfPlace(model, largest.device)))} kV)`
        : '';
    why = `Pickup ${amps(pickupA)}: ${MAINTENANCE_PICKUP_MULTIPLE} × the largest ${largest.element} directly below, ${nameOf(largest.device)}'s ${amps(largest.amps)}${voltageWords} — common practice, no source (1.5–2 ×), so the devices below still clear their own faults when no arc is being worked on.`;
  } else {
    // Nothing below with a fast pickup: the highest pickup that reaches the target, as for the instantaneous setting.
    const seen = currentsSeen(ctx.base, placed.id);
    const tol =
      d.kind === 'relay' ? (d.instantaneousTolerancePct ?? DEFAULT_INSTANTANEOUS_TOLERANCE_PCT) : d.pickupTolerancePct;
    const floor = d.kind === 'relay' ? relayS!.pickupA : d.longTime.pickup * d.sensorA;
    const values = relayLikeCandidates(
      seen.map((a) => a / (1 + tol / 100)),
      floor,
      Math.max(...seen, floor * 2),
      stepped,
    );
    found = search(
      ctx,
      values.map((v) => ({ value: v, patch: patchFor(v) })),
    );
    if (!found)
      return { skipped: `${name}: no maintenance pickup to search (no current seen above its continuous pickup).` };
    pickupA = found.chosen.value;
    why = `No device below ${name} with an instantaneous pickup: the highest pickup that brings the bus to the target was searched, from its continuous pickup ${amps(floor)} up.`;
  }
  if (!found) return { skipped: `${name}: no maintenance pickup to evaluate.` };
  const present = fastPickupA(d);
  const tolPct =
    d.kind === 'relay' ? (d.instantaneousTolerancePct ?? DEFAULT_INSTANTANEOUS_TOLERANCE_PCT) : d.pickupTolerancePct;
  const timing =
    d.kind === 'relay'
      ? `relay operating time ${secs(relayS!.instantaneousDelayS)} plus the breaker's ${fmt(d.breakerCycles)} cycles (${secs(relayS!.breakerS)})`
      : `breaker clearing ${secs((d as ElectronicDevice).clearingS)}`;
  return [
    {
      kind: 'maintenance-mode',
      variant: `${placed.id}@${fmt(pickupA, 6)}A`,
      title: `Maintenance switch on ${name}: instantaneous pickup ${amps(pickupA)} while working at ${busName}`,
      deviceId: placed.id,
      deviceName: name,
      changes: [
        {
          setting: `Maintenance switch (on while working at ${busName}): instantaneous pickup`,
          before:
            present && present.element === 'instantaneous pickup' ? `${amps(present.amps)} (normal setting)` : 'none',
          after: `${amps(pickupA)}${d.kind === 'relay' && d.ctRatio ? ` (${fmt(pickupA / d.ctRatio, 4)} A secondary)` : ''}`,
        },
      ],
      modelPatch: found.chosen.patch,
      notes: [
        ...(t.why ? [t.why] : []),
        `The lower energy holds only while the maintenance switch is on; the label must say so (the energy with the switch on, and that the switch must be on before the work starts).`,
        'The work procedure must require turning the switch on (and checking that it is on) before work at this equipment, and turning it off after; an indication that it is on should be visible at the equipment.',
        why,
        outcomeNote(ctx, found, `the maintenance pickup ${amps(pickupA)}`),
        `Pickup tolerance ± ${fmt(tolPct)} %: counted on only at and above ${amps(pickupA * (1 + tolPct / 100))}; ${timing}. Credited only for arcs at ${busName}.`,
        'While the switch is on, faults below may be cleared by this breaker instead of the device nearest them (wider outage): the selectivity below is with the switch on.',
      ],
      selectivity: 'while-on',
    },
  ];
}

/** Pickups between `floor` and `high`: the pick-up thresholds and a geometric grid, highest first. */
function relayLikeCandidates(thresholds: number[], floor: number, high: number, step: (a: number) => number): number[] {
  const set = new Set<number>();
  for (const t of thresholds) if (t >= floor && t <= high) set.add(step(t));
  for (let k = 0; k < RELAY_GRID_POINTS; k++) {
    const v = step(high * (floor / high) ** (k / (RELAY_GRID_POINTS - 1)));
    if (v >= floor && v <= high) set.add(v);
  }
  return [...set].filter((v) => v > 0).sort((a, b) => b - a);
}

// ---------------------------------------------------------------------------------------------

/** The three setting generators; `opts.tripTypeOf` gives the organization's library trip-unit types. */
export function settingGenerators(opts: SettingGeneratorOptions = {}): {
  instantaneousSetting: OptionGenerator;
  shortTimeDelay: OptionGenerator;
  maintenanceMode: OptionGenerator;
} {
  return {
    instantaneousSetting: (ctx) => instantaneousOption(ctx, opts),
    shortTimeDelay: (ctx) => shortTimeOption(ctx, opts),
    maintenanceMode: (ctx) => maintenanceOption(ctx, opts),
  };
}

/** The generators with the generic starter set's trip-unit types only (library types looked up by name). */
export const { instantaneousSetting, shortTimeDelay, maintenanceMode } = settingGenerators();
