/**
 * Mitigation options that add a device or isolate the main (docs/ARCHITECTURE.md, Mitigation): an arc-flash relay at
 * the clearing breaker, a current-limiting fuse beside the clearing device, the bus's main moved into an isolated
 * compartment. Each proposal is evaluated by the search with the study engine on the patched model; nothing here
 * computes an energy.
 *
 * Where a choice is open it takes the higher hazard: a relay is credited only for arcs at the bus whose equipment
 * holds its light sensors (`onlyAt`), and a fuse only by its total-clearing time (its current limitation is not
 * credited).
 */
import type { Device } from '../../../shared/schemas/device';
import type { ModelPatchOp } from '../../../shared/schemas/mitigation';
import type { Model, PlacedDevice } from '../../../shared/schemas/model';
import type { BusResult } from '../../../shared/schemas/studyResults';
import { formatSig } from '../../../shared/numberFormat';
import { genericLvFuse, LV_FUSE_RATINGS_A } from '../trip/genericLibrary';
import type { OptionGenerator, OptionProposal, SearchContext } from './search';

const fmt = (v: number, digits = 3) => formatSig(v, digits);

/** Overcurrent supervision of an arc-flash relay: this share of the lowest arcing current (common practice, no source). */
export const ARC_FLASH_RELAY_SUPERVISION_SHARE = 0.5;
/** …but not below this multiple of the protected device's continuous rating, so it never trips on load (common practice, no source). */
export const ARC_FLASH_RELAY_MIN_LOAD_MULTIPLE = 1.25;
/** Operating time of a light-and-current arc-flash relay, s (from memory: a few milliseconds; verify with the relay chosen). */
export const ARC_FLASH_RELAY_OPERATING_S = 0.0025;
/** Interrupting time of a thermal-magnetic breaker's instantaneous region when the device does not say (IEEE 1584-2002 Table 1, as the trip engine's default). */
const DEFAULT_MOLDED_CASE_CYCLES = 1.5;
/** At most this many relays in one option (the next clearing device after each, e.g. the main's line side). */
const MAX_RELAYS = 3;

/**
 * The continuous (load) current a device is set or rated to carry, amperes at its own voltage: a relay's inverse-time
 * pickup, an electronic trip unit's long-time pickup Ir, a breaker's, fuse's or band's rating.
 */
export function continuousRatingA(device: Device): number {
  switch (device.kind) {
    case 'relay':
      return device.pickupA ?? (device.ctRatio ?? 0) * (device.pickupSecondaryA ?? 0);
    case 'electronic':
      return device.sensorA * device.longTime.pickup;
    default:
      return device.ratingA;
  }
}

/**
 * The interrupting time of the breaker a device trips, cycles at `frequencyHz`; null when the device has no breaker of
 * its own (a fuse) or its breaker time is not known (a digitized band).
 */
export function breakerCyclesOf(device: Device, frequencyHz: number): number | null {
  switch (device.kind) {
    case 'relay':
      return device.breakerCycles;
    case 'electronic':
      return device.clearingS * frequencyHz;
    case 'thermal-magnetic':
      if (device.instantaneousClearingCycles !== undefined) return device.instantaneousClearingCycles;
      if (device.instantaneousClearingS !== undefined) return device.instantaneousClearingS * frequencyHz;
      return DEFAULT_MOLDED_CASE_CYCLES;
    default:
      return null;
  }
}

/** Where a placed device sits, copied onto a device added beside it (same branch end, or the same source). */
function placeOf(p: PlacedDevice): Pick<PlacedDevice, 'branch' | 'end' | 'source'> {
  return p.branch !== undefined ? { branch: p.branch, end: p.end } : { source: p.source };
}

/** An id the model (with what the option already adds) does not use. */
function freshId(model: Model, taken: Set<string>, base: string): string {
  const used = (id: string) => taken.has(id) || model.devices.some((d) => d.id === id);
  let id = base.slice(0, 60);
  for (let k = 2; used(id); k++) id = `${base.slice(0, 56)}-${k}`;
  taken.add(id);
  return id;
}

/**
 * The device a change should act with: the one that ends the governing arc; when none ends it (another source, a
 * motor or a generator, still feeds it until it decays or the cap), the device that cuts off the source feeding the
 * most (share × time until cut). Null when no device cuts anything off.
 */
function actingDevice(model: Model, r: BusResult): { placed: PlacedDevice; why: string | null } | null {
  const g = r.governing;
  const c = g && r.cases.find((x) => x.arcCase === g.arcCase && x.location === g.location);
  const byId = (id: string | null | undefined) => (id ? model.devices.find((d) => d.id === id) : undefined);
  const direct = byId(c?.clearingDeviceId ?? r.clearingDeviceId);
  if (direct) return { placed: direct, why: null };
  if (!c) return null;
  const cut = c.sources.filter((x) => x.cutByDeviceId).sort((a, b) => b.share * b.stopsAtS - a.share * a.stopsAtS)[0];
  const placed = byId(cut?.cutByDeviceId);
  if (!placed) return null;
  return {
    placed,
    why: `No single device ends the arc (${cut!.sourceId} is cut off by ${nameOf(placed)}; another source feeds it until it decays or the ${fmt(c.arcDurationS)} s cap).`,
  };
}

/** The lowest current a device sees at the start of an arc at the bus, over the cases in which it carries current. */
function lowestArcingCurrentA(r: BusResult, deviceId: string): number | null {
  let low: number | null = null;
  for (const c of r.cases)
    for (const d of c.devices)
      if (d.deviceId === deviceId && d.currentA > 0) low = Math.min(low ?? Infinity, d.currentA);
  return low;
}

const nameOf = (p: PlacedDevice) => p.name ?? p.id;
const busNameOf = (model: Model, busId: string) => model.buses.find((b) => b.id === busId)?.name ?? busId;

/**
 * Arc-flash relay (light sensors in the bus's equipment, with overcurrent supervision) tripping the breaker of the
 * device that clears the governing arc: a placed relay at the same branch end, acting only for arcs at this bus.
 * When the arc is then cleared by another device (the main's line side, cleared upstream), a relay is added there too,
 * up to three, so the option says what relays it takes.
 */
export const arcFlashRelay: OptionGenerator = (ctx) => {
  const { model, busId } = ctx;
  const acting = actingDevice(model, ctx.base);
  if (!acting) {
    return {
      skipped:
        'No device cuts off a source of the arc before the arc-duration cap: there is no breaker for a relay to trip.',
    };
  }
  const first = acting.placed.id;
  const frequencyHz = model.frequencyHz ?? 60;
  const busName = busNameOf(model, busId);
  const patch: ModelPatchOp[] = [];
  const taken = new Set<string>();
  const changes: OptionProposal['changes'] = [];
  const notes: string[] = [];
  const withRelay = new Set<string>();
  let result = ctx.base;
  let clearingId: string | null = first;
  let why: string | null = null;
  for (let k = 0; k < MAX_RELAYS && clearingId && !withRelay.has(clearingId); k++) {
    const placed = model.devices.find((d) => d.id === clearingId);
    if (!placed) break;
    const cycles = breakerCyclesOf(placed.device, frequencyHz);
    if (cycles === null) {
      why =
        placed.device.kind === 'fuse'
          ? `${nameOf(placed)} is a fuse: there is no breaker for an arc-flash relay to trip.`
          : `${nameOf(placed)} is given as a digitized band: the interrupting time of its breaker is not known.`;
      break;
    }
    const lowA = lowestArcingCurrentA(result, placed.id);
    if (lowA === null) break;
    const loadA = ARC_FLASH_RELAY_MIN_LOAD_MULTIPLE * continuousRatingA(placed.device);
    const pickupA = Math.max(ARC_FLASH_RELAY_SUPERVISION_SHARE * lowA, loadA);
    const pickup = Number(pickupA.toPrecision(3));
    const id = freshId(model, taken, `${placed.id}-AFR`);
    const relayName = `Arc-flash relay (${busName}) on ${nameOf(placed)}`.slice(0, 160);
    patch.push({
      op: 'add-device',
      placed: {
        id,
        name: relayName,
        ...placeOf(placed),
        device: {
          kind: 'relay',
          // The inverse-time element is only the supervision's form (its pickup is the instantaneous one): the
          // relay acts by its instantaneous element, light and current together.
          curve: 'IEEE-EI',
          pickupA: pickup,
          timeDial: 1,
          instantaneousA: pickup,
          instantaneousDelayS: ARC_FLASH_RELAY_OPERATING_S,
          breakerCycles: Number(cycles.toPrecision(4)),
          frequencyHz,
        },
        onlyAt: {
          busIds: [busId],
          purpose: 'arc-flash-relay',
          note: `Light sensors in ${busName}; overcurrent supervision ${fmt(pickup)} A; trips the breaker of ${nameOf(placed)}.`,
        },
      },
    });
    withRelay.add(placed.id);
    changes.push(
      { setting: `Arc-flash relay on ${nameOf(placed)}`, before: 'None', after: `Light sensors in ${busName}` },
      { setting: 'Overcurrent supervision', before: '—', after: `${fmt(pickup)} A` },
      {
        setting: 'Clearing time (relay + breaker)',
        before: '—',
        after: `${fmt(ARC_FLASH_RELAY_OPERATING_S * 1000, 2)} ms + ${fmt(cycles)} cycles`,
      },
    );
    notes.push(
      loadA > ARC_FLASH_RELAY_SUPERVISION_SHARE * lowA
        ? `Supervision at ${fmt(pickup)} A: ${ARC_FLASH_RELAY_MIN_LOAD_MULTIPLE} × the ${fmt(continuousRatingA(placed.device))} A continuous rating of ${nameOf(placed)}, so it never trips on load (common practice, no source); that is above half the lowest arcing current it sees (${fmt(lowA)} A), so check the relay still picks up for a reduced arc.`
        : `Supervision at ${fmt(pickup)} A: 50 % of the lowest arcing current ${nameOf(placed)} sees for an arc at ${busName} (${fmt(lowA)} A; common practice, no source), above ${ARC_FLASH_RELAY_MIN_LOAD_MULTIPLE} × its continuous rating (no trip on load).`,
    );
    result = ctx.evaluate(patch);
    if ((result.incidentEnergyCalPerCm2 ?? Infinity) <= ctx.targetCalPerCm2) break;
    clearingId = actingDevice(model, result)?.placed.id ?? null;
  }
  if (!patch.length)
    return { skipped: why ?? `No arcing current through the clearing device was found at ${busName}.` };
  notes.push(
    `Relay operating time ${fmt(ARC_FLASH_RELAY_OPERATING_S * 1000, 2)} ms (from memory: a light-and-current relay acts within a few milliseconds; use the time the chosen relay states), plus the breaker's own interrupting time.`,
    `Credited only for arcs in ${busName}, where the light sensors are: every other bus keeps its energy. The label's energy holds only with the relay in service (tested, not bypassed); the energy without it is the present one.`,
  );
  if (acting.why) notes.unshift(acting.why);
  if (why) notes.push(`Not every clearing device can take a relay: ${why}`);
  const before = ctx.base.incidentEnergyCalPerCm2 ?? Infinity;
  if (!((result.incidentEnergyCalPerCm2 ?? Infinity) < before)) {
    return {
      skipped: `An arc-flash relay would not lower the energy at ${busName}: the arc already ends (after ${fmt(ctx.baseHazard.arcDurationS)} s) no later than with relay and breaker together.`,
    };
  }
  const firstPlaced = model.devices.find((d) => d.id === first);
  return [
    {
      kind: 'arc-flash-relay',
      variant: patch.map((p) => (p.op === 'add-device' ? p.placed.id : '')).join('+'),
      title: `Add an arc-flash relay (light sensors in ${busName}) tripping ${patch.length > 1 ? `${patch.length} breakers` : `the breaker of ${firstPlaced ? nameOf(firstPlaced) : first}`}`,
      deviceId: first,
      deviceName: firstPlaced ? nameOf(firstPlaced) : null,
      changes,
      modelPatch: patch,
      notes,
      selectivity: 'not-affected',
    },
  ];
};

/**
 * A generic low-voltage current-limiting fuse added at the clearing device's place, the smallest rating of the
 * library at or above that device's continuous rating (so it carries the load). The engine evaluates it by its
 * total-clearing time at the arcing current it sees; the reduction of the let-through by current limitation is not
 * credited (the higher hazard).
 */
export const currentLimitingFuse: OptionGenerator = (ctx: SearchContext) => {
  const { model } = ctx;
  const acting = actingDevice(model, ctx.base);
  if (!acting) {
    return {
      skipped:
        'No device cuts off a source of the arc before the arc-duration cap: there is no place to add a fuse beside.',
    };
  }
  const placed = acting.placed;
  const clearingId = placed.id;
  if (placed.device.kind === 'fuse') return { skipped: `${nameOf(placed)} is already a fuse.` };
  let kv: number | null = null;
  for (const c of ctx.base.cases) for (const d of c.devices) if (d.deviceId === clearingId) kv = d.kv;
  if (kv === null) return { skipped: `${nameOf(placed)} carries no current for an arc at this bus.` };
  if (kv > 1) {
    return {
      skipped: `${nameOf(placed)} is at ${fmt(kv)} kV: the library's current-limiting fuses are low-voltage (600 V) fuses.`,
    };
  }
  const ratingA = continuousRatingA(placed.device);
  const rating = LV_FUSE_RATINGS_A.find((r) => r >= ratingA);
  if (rating === undefined) {
    return {
      skipped: `${nameOf(placed)} carries ${fmt(ratingA)} A: above the largest current-limiting fuse of the library (${LV_FUSE_RATINGS_A[LV_FUSE_RATINGS_A.length - 1]} A).`,
    };
  }
  const id = freshId(model, new Set(), `${placed.id}-CLF`);
  const name = `Generic ${rating} A current-limiting fuse`;
  const patch: ModelPatchOp[] = [
    { op: 'add-device', placed: { id, name, ...placeOf(placed), device: { ...genericLvFuse(rating), name } } },
  ];
  if (!((ctx.evaluate(patch).incidentEnergyCalPerCm2 ?? Infinity) < (ctx.base.incidentEnergyCalPerCm2 ?? Infinity))) {
    return {
      skipped: `A ${rating} A current-limiting fuse (the smallest that carries the ${fmt(ratingA)} A of ${nameOf(placed)}) would not lower the energy: by its total-clearing time it clears no sooner (its current limitation is not credited).`,
    };
  }
  return [
    {
      kind: 'current-limiting-fuse',
      variant: `${id}-${rating}`,
      title: `Add a ${rating} A current-limiting fuse with ${nameOf(placed)}`,
      deviceId: placed.id,
      deviceName: nameOf(placed),
      changes: [{ setting: `Fuse with ${nameOf(placed)}`, before: 'None', after: name }],
      modelPatch: patch,
      notes: [
        ...(acting.why ? [acting.why] : []),
        `The smallest generic rating at or above the ${fmt(ratingA)} A continuous rating of ${nameOf(placed)}, so it carries the load.`,
        'The fuse is credited only by its total-clearing time at the arcing current it sees; the lower let-through of current limitation is not credited (the higher hazard).',
        `A generic band: verify against the manufacturer's published curve, and that the fuse's interrupting rating covers the ${fmt(ctx.base.boltedFaultKa)} kA bolted fault at this bus.`,
      ],
      selectivity: 'check',
    },
  ];
};

/** The bus's main moved into an isolated compartment: only when the governing arc is on the main's line side. */
export const lineSideIsolation: OptionGenerator = (ctx) => {
  const { model, busId } = ctx;
  if (ctx.baseHazard.governing.location !== 'line-side') {
    return {
      skipped: 'The governing arc is on the load side of the main: isolating the main does not change it.',
    };
  }
  const bus = model.buses.find((b) => b.id === busId);
  const stated = bus?.equipment?.mainIsolated;
  const busName = busNameOf(model, busId);
  return [
    {
      kind: 'line-side-isolation',
      variant: busId,
      title: `Move the main of ${busName} into an isolated compartment`,
      deviceId: null,
      deviceName: null,
      changes: [
        {
          setting: 'Main isolated from the bus',
          before: stated === false ? 'No' : 'Not stated (taken as not isolated)',
          after: 'Yes',
        },
      ],
      modelPatch: [{ op: 'set-main-isolated', busId }],
      notes: [
        `The main's line-side conductors and terminals are separated from the bus compartment (barriers, a separate compartment), so an arc on the bus cannot reach the line side: the line-side case is no longer evaluated at ${busName}. Confirm the construction with the manufacturer.`,
        'Work on the main itself (its line-side terminals) is still cleared by the device upstream: it keeps the hazard of the line side.',
      ],
      selectivity: 'not-affected',
    },
  ];
};
