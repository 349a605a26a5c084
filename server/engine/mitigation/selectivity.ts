/**
 * Selectivity of a mitigation option (docs/ARCHITECTURE.md, Mitigation): does the changed (or added) device still
 * wait for the devices below it? Pure: no I/O, no clock.
 *
 * - Which devices: those downstream of the changed device on the path to the largest load. From the changed
 *   device's load side, at each bus the walk follows the branch (transformer, cable, closed tie) leading away from
 *   the sources whose subtree carries the largest load (transformer kVA plus motor ratings; a motor in hp counts
 *   1 hp ≈ 1 kVA, common practice, no source), nearest first, to a leaf. Devices that act only for arcs at named
 *   buses (arc-flash relays, maintenance-switch elements of the model) are not part of coordination and are skipped.
 * - Where: a bolted fault at the bus on the downstream device's load side (the far bus of its branch), and arcs
 *   there at the full and the reduced arcing current (IEEE 1584-2018 Eqs. 1, 25 / 16-18, 2, through the engine's
 *   `computeArcingCurrents`). Each device sees the bolted current of its branch end (the short-circuit solution, at
 *   its own voltage) scaled by I_arc / I_bf of the case — the study's own reading (runStudy.ts).
 * - What: the changed device's MINIMUM (no-trip) time against the downstream device's CLEARING (maximum) time, each
 *   read off its band at the current it sees; margin = upstream minimum − downstream clearing; selective when the
 *   margin is above zero (the downstream device has cleared before the upstream one can start to open). An
 *   upstream device that does not operate at that current is selective; a downstream device that does not clear a
 *   current at which the upstream one operates is not.
 * - Before and after: the same comparison with the device as it is in the model. Verdict 'lost' when a pair that
 *   was selective overlaps after the change, 'already-lost' when the pairs that overlap overlapped before as well,
 *   'kept' otherwise.
 * - Currents of the model as written (base operating scenario); the arc followed in time (decrement, ∫dt/t) is not
 *   used here: bands are compared at constant currents, as coordination is drawn.
 * - The upstream side is the changed device and any device the option adds at the same place (a maintenance-switch
 *   element, a fuse): the first of them to operate counts (its minimum time is the lowest).
 */
import type { Device } from '../../../shared/schemas/device';
import type { SelectivityCheck as PairCheck, Selectivity } from '../../../shared/schemas/mitigation';
import type { Model, PlacedDevice } from '../../../shared/schemas/model';
import { formatSig } from '../../../shared/numberFormat';
import { computeArcingCurrents } from '../ieee1584/compute';
import { createShortCircuitSolver, type BusFault, type ShortCircuitSolver } from '../shortcircuit';
import { resolveEquipment } from '../study/equipment';
import { readBand } from '../trip';
import type { SelectivityCheck } from './search';

/** At most this many downstream devices are compared (a long radial path; nearest first). */
const MAX_DOWNSTREAM = 40;

const fmtS = (s: number) => `${formatSig(s, 2)} s`;

/** Amperes in plain words: three significant figures, thousands grouped by a space ("28 400 A", "509 A"). */
export function formatAmperes(a: number, digits = 3): string {
  if (!Number.isFinite(a)) return `${formatSig(a)} A`;
  const magnitude = Math.floor(Math.log10(Math.abs(a) || 1));
  const step = 10 ** Math.max(0, magnitude - digits + 1);
  const rounded = Math.abs(a) >= 1000 ? Math.round(a / step) * step : a;
  const text = formatSig(rounded, Math.max(digits, magnitude + 1));
  const [int, frac] = text.split('.');
  const grouped = int.replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
  return `${frac ? `${grouped}.${frac}` : grouped} A`;
}
const fmtA = (a: number) => formatAmperes(a);

interface Link {
  id: string;
  fromBus: string;
  toBus: string;
  /** Transformer kVA (the load it can pass on), 0 for cables and ties. */
  kva: number;
}

interface Topology {
  links: Map<string, Link>;
  /** Links at each bus. */
  byBus: Map<string, Link[]>;
  /** Hops from the nearest source bus (Infinity: no source reaches it). */
  dist: (busId: string) => number;
  /** Load below a bus in the direction away from the sources, kVA. */
  loadBelow: (busId: string) => number;
}

function topologyOf(model: Model): Topology {
  const links = new Map<string, Link>();
  for (const t of model.transformers) links.set(t.id, { id: t.id, fromBus: t.fromBus, toBus: t.toBus, kva: t.kva });
  for (const c of model.cables) links.set(c.id, { id: c.id, fromBus: c.fromBus, toBus: c.toBus, kva: 0 });
  for (const t of model.ties)
    if (t.closed !== false) links.set(t.id, { id: t.id, fromBus: t.fromBus, toBus: t.toBus, kva: 0 });
  const byBus = new Map<string, Link[]>();
  for (const l of links.values()) {
    (byBus.get(l.fromBus) ?? byBus.set(l.fromBus, []).get(l.fromBus)!).push(l);
    (byBus.get(l.toBus) ?? byBus.set(l.toBus, []).get(l.toBus)!).push(l);
  }
  const hops = new Map<string, number>();
  let frontier = [...new Set(model.sources.map((s) => s.bus))];
  for (const b of frontier) hops.set(b, 0);
  for (let d = 1; frontier.length; d++) {
    const next: string[] = [];
    for (const b of frontier) {
      for (const l of byBus.get(b) ?? []) {
        const o = l.fromBus === b ? l.toBus : l.fromBus;
        if (hops.has(o)) continue;
        hops.set(o, d);
        next.push(o);
      }
    }
    frontier = next;
  }
  const dist = (b: string) => hops.get(b) ?? Infinity;
  const motorKva = new Map<string, number>();
  for (const m of model.motors) motorKva.set(m.bus, (motorKva.get(m.bus) ?? 0) + (m.kva ?? m.hp ?? 0));
  const memo = new Map<string, number>();
  const loadBelow = (b: string): number => {
    const hit = memo.get(b);
    if (hit !== undefined) return hit;
    memo.set(b, 0); // guards a loop (cannot happen: distances strictly increase)
    let sum = motorKva.get(b) ?? 0;
    for (const l of children(b)) sum += l.kva + loadBelow(other(l, b));
    memo.set(b, sum);
    return sum;
  };
  const children = (b: string) => (byBus.get(b) ?? []).filter((l) => dist(other(l, b)) > dist(b));
  return { links, byBus, dist, loadBelow };
}

const other = (l: Link, b: string) => (l.fromBus === b ? l.toBus : l.fromBus);

/** Where a placed device sits, as one key: its branch end, or its source / motor. */
const placeOf = (d: PlacedDevice) => (d.branch ? `${d.branch}:${d.end}` : `source:${d.source}`);

/** Devices that take part in coordination (not those that act only for arcs at named buses). */
const coordinates = (d: PlacedDevice) => !d.onlyAt;

/**
 * The devices downstream of the place `at` (a placed device) on the path to the largest load, nearest first, each
 * with the bus faulted for its comparison (its load side). `skip`: devices of the upstream side.
 */
export function downstreamOnLargestLoadPath(
  model: Model,
  at: PlacedDevice,
  skip: ReadonlySet<string> = new Set(),
): { device: PlacedDevice; faultBusId: string }[] {
  const topo = topologyOf(model);
  const out: { device: PlacedDevice; faultBusId: string }[] = [];
  const onLink = (linkId: string, end: 'from' | 'to') =>
    model.devices.filter((d) => d.branch === linkId && d.end === end && coordinates(d) && !skip.has(d.id));
  let start: string | null = null;
  const visited = new Set<string>();
  if (at.branch) {
    const l = topo.links.get(at.branch);
    if (!l) return [];
    const near = at.end === 'from' ? l.fromBus : l.toBus;
    const far = at.end === 'from' ? l.toBus : l.fromBus;
    const looksDown = topo.dist(far) > topo.dist(near) || (topo.dist(far) === topo.dist(near) && at.end === 'from');
    visited.add(near);
    if (looksDown) {
      for (const d of onLink(l.id, at.end === 'from' ? 'to' : 'from')) out.push({ device: d, faultBusId: far });
      start = far;
    } else {
      start = near;
    }
  } else if (at.source) {
    const source = model.sources.find((s) => s.id === at.source);
    start = source ? source.bus : null; // a motor's device has nothing below it
  }
  let bus = start;
  while (bus !== null && out.length < MAX_DOWNSTREAM) {
    visited.add(bus);
    const here = bus;
    const children = (topo.byBus.get(here) ?? []).filter(
      (l) => !visited.has(other(l, here)) && topo.dist(other(l, here)) > topo.dist(here),
    );
    if (!children.length) break;
    // The largest load; on a tie the first in model order (transformers, cables, ties).
    let best = children[0];
    let bestLoad = best.kva + topo.loadBelow(other(best, here));
    for (const l of children.slice(1)) {
      const load = l.kva + topo.loadBelow(other(l, here));
      if (load > bestLoad) {
        best = l;
        bestLoad = load;
      }
    }
    const next = other(best, here);
    const nearEnd = best.fromBus === here ? 'from' : 'to';
    const farEnd = nearEnd === 'from' ? 'to' : 'from';
    for (const d of [...onLink(best.id, nearEnd), ...onLink(best.id, farEnd)])
      out.push({ device: d, faultBusId: next });
    bus = next;
  }
  return out.slice(0, MAX_DOWNSTREAM);
}

/**
 * The devices directly below a placed device, each with the bus on its load side: the devices at the far end of its
 * own branch when it looks down into that branch; otherwise (or when there are none) the devices at the near end of
 * every branch leaving its load-side bus away from the sources (all the feeders, not only the largest).
 */
export function directlyBelow(
  model: Model,
  at: PlacedDevice,
  skip: ReadonlySet<string> = new Set(),
): { device: PlacedDevice; faultBusId: string }[] {
  const topo = topologyOf(model);
  const onLink = (linkId: string, end: 'from' | 'to') =>
    model.devices.filter((d) => d.branch === linkId && d.end === end && coordinates(d) && !skip.has(d.id));
  let start: string | null = null;
  if (at.branch) {
    const l = topo.links.get(at.branch);
    if (!l) return [];
    const near = at.end === 'from' ? l.fromBus : l.toBus;
    const far = at.end === 'from' ? l.toBus : l.fromBus;
    const looksDown = topo.dist(far) > topo.dist(near) || (topo.dist(far) === topo.dist(near) && at.end === 'from');
    if (looksDown) {
      const farDevices = onLink(l.id, at.end === 'from' ? 'to' : 'from');
      if (farDevices.length) return farDevices.map((device) => ({ device, faultBusId: far }));
    }
    start = looksDown ? far : near;
  } else if (at.source) {
    start = model.sources.find((s) => s.id === at.source)?.bus ?? null;
  }
  if (start === null) return [];
  const here = start;
  const out: { device: PlacedDevice; faultBusId: string }[] = [];
  for (const l of topo.byBus.get(here) ?? []) {
    if (l.id === at.branch || !(topo.dist(other(l, here)) > topo.dist(here))) continue;
    for (const device of onLink(l.id, l.fromBus === here ? 'from' : 'to'))
      out.push({ device, faultBusId: other(l, here) });
  }
  return out;
}

/** Bolted currents of a fault at a bus by device place, and the arcing currents as ratios to the bolted one. */
interface FaultCurrents {
  boltedAt(d: PlacedDevice): number;
  /** I_arc / I_bf for the full and reduced arcing current; null when the bus has no arc model (no equipment). */
  arcRatio: { full: number; reduced: number } | null;
}

/** One short-circuit solution per model network (a patch changes devices only, never the network). */
const solvers = new WeakMap<Model, { solver: ShortCircuitSolver; faults: Map<string, FaultCurrents> }>();

function faultCurrents(model: Model, busId: string): FaultCurrents {
  let entry = solvers.get(model);
  if (!entry) {
    entry = { solver: createShortCircuitSolver(model), faults: new Map() };
    solvers.set(model, entry);
  }
  const hit = entry.faults.get(busId);
  if (hit) return hit;
  const fault: BusFault = entry.solver.faultPath(busId);
  const branch = new Map(fault.branches.map((b) => [b.id, b]));
  const injection = new Map(fault.injections.map((i) => [i.id, i]));
  const bus = model.buses.find((b) => b.id === busId);
  let arcRatio: FaultCurrents['arcRatio'] = null;
  if (bus?.equipment && fault.boltedFaultKa > 0) {
    try {
      const eq = resolveEquipment(bus);
      const arcing = computeArcingCurrents({
        voltageV: bus.nominalKv * 1000,
        boltedFaultKa: fault.boltedFaultKa,
        electrodeConfig: eq.electrodeConfig,
        gapMm: eq.gapMm,
      });
      arcRatio = {
        full: arcing.arcingCurrentKa.full / fault.boltedFaultKa,
        reduced: arcing.arcingCurrentKa.reduced / fault.boltedFaultKa,
      };
    } catch {
      arcRatio = null; // outside the arc model (e.g. voltage): the bolted fault alone is compared
    }
  }
  const out: FaultCurrents = {
    boltedAt: (d) => {
      if (d.branch) {
        const b = branch.get(d.branch);
        if (!b || b.direction === 'none') return 0;
        return d.end === 'from' ? b.fromCurrentA : b.toCurrentA;
      }
      return injection.get(d.source ?? '')?.currentA ?? 0;
    },
    arcRatio,
  };
  entry.faults.set(busId, out);
  return out;
}

/** The lowest minimum (no-trip) time of a group of devices at one current, or null when none operates. */
function minimumTimeS(devices: readonly Device[], currentA: number): number | null {
  let best: number | null = null;
  for (const d of devices) {
    const t = readBand(d, currentA).minS;
    if (t !== null && (best === null || t < best)) best = t;
  }
  return best;
}

type Point = PairCheck['points'][number];

function comparePoints(
  base: Model,
  upstream: readonly PlacedDevice[],
  downstream: PlacedDevice,
  faultBusId: string,
): Point[] {
  if (!upstream.length) return [];
  const fc = faultCurrents(base, faultBusId);
  // Every device of the upstream side sits at one place: one current.
  const upBolted = fc.boltedAt(upstream[0]);
  const downBolted = fc.boltedAt(downstream);
  if (!(upBolted > 0) || !(downBolted > 0)) return [];
  const cases: { current: Point['current']; ratio: number }[] = [{ current: 'bolted', ratio: 1 }];
  if (fc.arcRatio) {
    cases.push({ current: 'arcing-full', ratio: fc.arcRatio.full });
    cases.push({ current: 'arcing-reduced', ratio: fc.arcRatio.reduced });
  }
  return cases.map(({ current, ratio }) => {
    const upstreamA = upBolted * ratio;
    const downstreamA = downBolted * ratio;
    const upstreamMinimumS = minimumTimeS(
      upstream.map((u) => u.device),
      upstreamA,
    );
    const downstreamClearingS = readBand(downstream.device, downstreamA).maxS;
    const marginS =
      upstreamMinimumS !== null && downstreamClearingS !== null ? upstreamMinimumS - downstreamClearingS : null;
    const selective = upstreamMinimumS === null ? true : marginS !== null && marginS > 0;
    return { current, upstreamA, downstreamA, upstreamMinimumS, downstreamClearingS, marginS, selective };
  });
}

const smallestMargin = (points: readonly Point[]): number | null =>
  points.reduce<number | null>(
    (m, p) => (p.marginS === null ? m : m === null ? p.marginS : Math.min(m, p.marginS)),
    null,
  );

const CURRENT_WORDS: Record<Point['current'], string> = {
  bolted: 'the bolted fault',
  'arcing-full': 'the full arcing current',
  'arcing-reduced': 'the reduced arcing current',
};

/** The point of a check that overlaps most (the smallest margin, or one where the downstream device does not clear). */
function worstPoint(c: PairCheck): Point | undefined {
  const bad = c.points.filter((p) => !p.selective);
  return bad.find((p) => p.marginS === null) ?? bad.sort((a, b) => (a.marginS ?? 0) - (b.marginS ?? 0))[0];
}

function overlapWords(c: PairCheck, busName: (id: string) => string): string {
  const p = worstPoint(c);
  if (!p) return c.downstreamDeviceName;
  const at = `${CURRENT_WORDS[p.current]} at ${busName(c.faultBusId)}, ${fmtA(p.downstreamA)} through it`;
  if (p.downstreamClearingS === null) return `${c.downstreamDeviceName} (it does not clear ${at})`;
  return `${c.downstreamDeviceName} (overlap ${fmtS(-(p.marginS ?? 0))} at ${at})`;
}

function sentenceOf(
  verdict: Selectivity['verdict'],
  checks: PairCheck[],
  upName: string,
  busName: (id: string) => string = (id) => id,
): string {
  const words = (c: PairCheck) => overlapWords(c, busName);
  const overlapping = checks.filter((c) => !c.selective);
  const lost = overlapping.filter((c) => c.selectiveBefore);
  const margin = checks.reduce<number | null>(
    (m, c) => (c.marginS === null ? m : m === null ? c.marginS : Math.min(m, c.marginS)),
    null,
  );
  switch (verdict) {
    case 'no-downstream':
      return `No device below ${upName} on the path to the largest load: nothing to coordinate with.`;
    case 'kept':
      return `${upName} stays selective with the ${checks.length} downstream device${checks.length === 1 ? '' : 's'} checked${margin !== null ? ` (smallest margin ${fmtS(margin)})` : ''}.`;
    case 'lost':
      return `Selectivity lost: ${upName} may now open before ${lost.map(words).join('; ')}; it was selective before the change.`;
    case 'already-lost':
      return `${upName} already overlapped ${overlapping.map(words).join('; ')} before the change: no selectivity is lost that was there.`;
    case 'while-on':
      return overlapping.length
        ? `While the maintenance switch is on, ${upName} may open before ${overlapping.map(words).join('; ')}. With the switch off the settings are as before.`
        : checks.length
          ? `Even while the maintenance switch is on, ${upName} stays selective with the ${checks.length} downstream device${checks.length === 1 ? '' : 's'} checked${margin !== null ? ` (smallest margin ${fmtS(margin)})` : ''}.`
          : `No device below ${upName} on the path to the largest load: nothing to coordinate with, switch on or off.`;
    default:
      return 'The change acts only for arcs at this bus or moves no band: coordination with the devices below is not affected.';
  }
}

/** The selectivity check of the mitigation search (see the file comment). */
export const checkSelectivity: SelectivityCheck = ({ model, patched, deviceId, mode }) => {
  if (mode === 'not-affected') {
    return { verdict: 'not-affected', sentence: sentenceOf('not-affected', [], ''), checks: [] };
  }
  const after = patched.devices.find((d) => d.id === deviceId);
  const before = model.devices.find((d) => d.id === deviceId);
  const anchor = after ?? before;
  if (!anchor) {
    return {
      verdict: 'no-downstream',
      sentence: `No device ${deviceId || '(none)'} in the model: nothing to compare.`,
      checks: [],
    };
  }
  const place = placeOf(anchor);
  const baseIds = new Set(model.devices.map((d) => d.id));
  // The upstream side after the change: the device and what the option adds beside it (a maintenance-switch
  // element counts only in 'while-on', where the switch is taken as on).
  const added = patched.devices.filter(
    (d) =>
      !baseIds.has(d.id) &&
      d.id !== deviceId &&
      placeOf(d) === place &&
      (coordinates(d) || (mode === 'while-on' && d.onlyAt?.purpose === 'maintenance-switch')),
  );
  const upAfter = [...(after && (coordinates(after) || mode === 'while-on') ? [after] : []), ...added];
  // Before: the device as it was; for a device the option adds, the devices already at that place.
  const upBefore = before
    ? coordinates(before)
      ? [before]
      : []
    : model.devices.filter((d) => placeOf(d) === place && coordinates(d));
  const skip = new Set([...upAfter, ...upBefore].map((d) => d.id));
  const path = downstreamOnLargestLoadPath(patched, anchor, skip);
  const checks: PairCheck[] = [];
  for (const { device, faultBusId } of path) {
    const points = comparePoints(model, upAfter, device, faultBusId);
    if (!points.length) continue; // the fault there does not pass through both
    const pointsBefore = upBefore.length ? comparePoints(model, upBefore, device, faultBusId) : [];
    checks.push({
      upstreamDeviceId: deviceId,
      downstreamDeviceId: device.id,
      downstreamDeviceName: device.name ?? device.id,
      faultBusId,
      points,
      marginS: smallestMargin(points),
      selective: points.every((p) => p.selective),
      selectiveBefore: pointsBefore.every((p) => p.selective),
      marginBeforeS: smallestMargin(pointsBefore),
    });
  }
  const upName = anchor.name ?? anchor.id;
  let verdict: Selectivity['verdict'];
  if (mode === 'while-on') verdict = 'while-on';
  else if (!checks.length) verdict = 'no-downstream';
  else if (checks.some((c) => c.selectiveBefore && !c.selective)) verdict = 'lost';
  else if (checks.some((c) => !c.selective)) verdict = 'already-lost';
  else verdict = 'kept';
  const busName = (id: string) => model.buses.find((b) => b.id === id)?.name ?? id;
  return { verdict, sentence: sentenceOf(verdict, checks, upName, busName), checks };
};
