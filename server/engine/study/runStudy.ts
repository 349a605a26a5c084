/**
 * The study run (docs/ARCHITECTURE.md, Data path of a study run): for a fault at each labelled bus — bolted fault
 * current → both arcing currents → the protective devices carrying fault current, each read at the current it sees
 * during the arc → arc duration (the first device to clear with one source; time-stepped energy as each source is cut
 * off with several) → the line-side case where the bus's main device is not isolated → the arc-duration cap → incident
 * energy, arc-flash boundary and label values. Pure: no clock, no I/O; the caller drives it bus by bus to report
 * progress.
 *
 * Method notes (shown in the study report):
 * - Each device sees the bolted current through its branch (from the short-circuit solution, at its own voltage)
 *   scaled by I_arc / I_bf of the case: the arc current divides among the paths as the bolted current does.
 * - Several sources: each source's (and motor's) share of the fault is its bolted contribution referred to the bus
 *   voltage over their sum (magnitudes). Each device's current is split among the sources by proportional sharing
 *   along the fault-current flow (each bus passes on the mix of the currents that enter it).
 * - Time-varying currents: a generator's contribution follows its decrement (subtransient → transient →
 *   sustained, `decrement.ts`), a motor's stops after `motorDecayCycles` (step model) or decays exponentially with
 *   that time constant; by default both are evaluated and the higher energy is kept (neither model is always the
 *   higher), and a source stops when every path from it to the bus is opened. The arc is followed in steps (one step between events while every current is constant; fractions of
 *   the fastest active time constant while a current decays): in each step the bolted current is the sum of the
 *   contributions still feeding, the arcing current follows from it (IEEE 1584-2018 Eqs. 1, 25), and each device
 *   advances its operation by dt / t(I) at the current it then sees (IEEE C37.112 integral for time-varying
 *   current, `tripIntegration.ts`); a device opens when that integral reaches 1. A step is an eighth of the fastest
 *   time constant still acting, lengthened while the bolted current changes by at most 1 % over it. Within a step
 *   the device is read at the lower and the energy at the higher of the step's end currents (the higher hazard
 *   either way).
 * - Energy: IEEE 1584-2018 energy is proportional to the arc duration at a constant arcing current (Eqs. 3-6), so
 *   with a varying current the energy of each step is computed with that step's arcing current and duration and
 *   the steps are added.
 */
import type { EnclosureSizeMm } from '../../../shared/equipmentClasses';
import type { Device, TripRegion } from '../../../shared/schemas/device';
import type { Bus, Model, PlacedDevice } from '../../../shared/schemas/model';
import type { ArcCaseTrace, BusResult, DeviceReading, StudyResults } from '../../../shared/schemas/studyResults';
import { REGION_LABELS } from '../../../shared/tripRegions';
import { EngineError, type EngineWarning } from '../errors';
import {
  computeArcingCurrents,
  computeCaseEnergy,
  resolveEnclosure,
  type ArcCase,
  type ArcingCurrents,
} from '../ieee1584/compute';
import { computeLabelValues, type LabelSettings } from '../labelValues';
import { createShortCircuitSolver, type BusFault, type ShortCircuitSolver } from '../shortcircuit';
import { createBandReader, type BandReader } from '../trip';
import { boundaryDistanceMm } from './boundary';
import {
  CONSTANT_PROFILE,
  generatorDecrementProfile,
  motorExponentialProfile,
  motorStepProfile,
  resolveGenerator,
  type ContributionProfile,
} from './decrement';
import { resolveEquipment, type ResolvedEquipment } from './equipment';
import { createTripIntegrator, type TripIntegrator } from './tripIntegration';
import { formatSig } from '../../../shared/numberFormat';
import { ONLY_AT_CAUTIONS } from '../../../shared/cautions';

export interface StudyOptions {
  /** Cap of the arc duration, ms (IEEE 1584 2 s guidance; an organization setting). */
  maxArcDurationMs?: number;
  /** Cycles an induction motor keeps feeding the arc (common practice, no source). */
  motorDecayCycles?: number;
  /**
   * 'step': a motor feeds its full first-cycle contribution for `motorDecayCycles`, then stops.
   * 'exponential': it decays as e^(−t/τ) with τ = `motorDecayCycles` cycles, dropped after 5 τ (both common
   * practice, no source). Both give the same ampere-seconds, but neither always gives the higher energy.
   * 'higher' (default): a case with motor contribution is evaluated with both and the higher energy is kept (the
   * higher hazard; the case's sentence and `motorDecayModel` say which governed).
   */
  motorDecayModel?: MotorDecayModel;
  labelSettings?: LabelSettings;
}

export type MotorDecayModel = 'step' | 'exponential' | 'higher';
export const DEFAULT_MOTOR_DECAY_CYCLES = 5;
/** How far an arc is followed at a bus without a cap (`arcDurationCapS: null`), s. */
export const NO_CAP_HORIZON_S = 3600;
export const DEFAULT_MOTOR_DECAY_MODEL: MotorDecayModel = 'higher';
const J_PER_CAL = 4.184;
/** A share of the fault current below this counts as zero. */
const NEGLIGIBLE = 1e-9;
/** While a current decays, a step is this fraction of the fastest active time constant. */
const STEP_FRACTION_OF_TIME_CONSTANT = 0.125;
/** A step is lengthened while the bolted current changes by at most this fraction over it. */
const MAX_STEP_CHANGE = 0.01;
/** Shortest step, s. */
const MIN_STEP_S = 1e-4;
/** Two instants closer than this are one event, s. */
const EVENT_SLACK_S = 1e-12;
/** Guard against a run-away loop (never reached with the steps above below a 10 s cap). */
const MAX_STEPS = 20000;

const fmt = (v: number, digits = 3) => formatSig(v, digits);

interface Contributor {
  id: string;
  kind: 'utility' | 'generator' | 'motor';
  bus: string;
  share: number;
  /** Its contribution over time as a ratio to the first-cycle contribution. */
  profile: ContributionProfile;
}

interface PathDevice {
  placed: PlacedDevice;
  /** Branch id it sits on, or null on a source/motor. */
  branchId: string | null;
  sourceId: string | null;
  boltedCurrentA: number;
  kv: number;
  location: string;
  /** The mix of sources in its current (contributor id → fraction, summing to 1). */
  mix: Map<string, number>;
}

interface Edge {
  id: string;
  from: string;
  to: string;
  /** Its current referred to the fault bus voltage, as a share of the bolted fault current. */
  share: number;
}

/** The flow of fault current for a fault at one bus: directed edges toward the fault, contributors, devices. */
interface FaultPicture {
  bus: Bus;
  fault: BusFault;
  edges: Edge[];
  contributors: Contributor[];
  devices: PathDevice[];
  /**
   * The contributors again with each generator whose sustained current is not given at the typical supported
   * sustained current instead (second case; the higher energy is kept), or null when there is none.
   */
  alternateContributors: Contributor[] | null;
  /** Generator data taken from typical values (`<id>.<field>`), with their warnings. */
  typicalValuesUsed: string[];
  warnings: EngineWarning[];
}

interface PictureContext {
  model: Model;
  solver: ShortCircuitSolver;
  kvByBus: Map<string, number>;
  motorIds: Set<string>;
  sourceById: Map<string, Model['sources'][number]>;
  motorProfile: ContributionProfile;
  /** Indices in `model.devices` of the devices on each branch (or tie) and on each source or motor. */
  devicesByBranch: Map<string, number[]>;
  devicesBySource: Map<string, number[]>;
}

/**
 * Proportional sharing along the fault-current flow: every bus passes on, to each branch leaving it toward the
 * fault, the mix of the currents entering it (injections and incoming branches, weighted by their shares). One pass
 * in topological order over the directed edges; a bus on a circulating loop (no order) gets the mix of the whole
 * fault. Returns the mix leaving each bus.
 */
function traceMixes(edges: Edge[], contributors: Contributor[]): Map<string, Map<string, number>> {
  const incoming = new Map<string, Edge[]>();
  const outgoing = new Map<string, Edge[]>();
  const indegree = new Map<string, number>();
  for (const e of edges) {
    (incoming.get(e.to) ?? incoming.set(e.to, []).get(e.to)!).push(e);
    (outgoing.get(e.from) ?? outgoing.set(e.from, []).get(e.from)!).push(e);
    indegree.set(e.to, (indegree.get(e.to) ?? 0) + 1);
    if (!indegree.has(e.from)) indegree.set(e.from, 0);
  }
  const injections = new Map<string, Contributor[]>();
  for (const c of contributors) (injections.get(c.bus) ?? injections.set(c.bus, []).get(c.bus)!).push(c);
  const mixes = new Map<string, Map<string, number>>();
  const queue = [...indegree].filter(([, n]) => n === 0).map(([b]) => b);
  while (queue.length) {
    const bus = queue.pop() as string;
    const sum = new Map<string, number>();
    for (const c of injections.get(bus) ?? []) sum.set(c.id, (sum.get(c.id) ?? 0) + c.share);
    for (const e of incoming.get(bus) ?? []) {
      for (const [id, f] of mixes.get(e.from) ?? []) sum.set(id, (sum.get(id) ?? 0) + f * e.share);
    }
    const total = [...sum.values()].reduce((a, b) => a + b, 0);
    if (total > 0) for (const [id, v] of sum) sum.set(id, v / total);
    mixes.set(bus, sum);
    for (const e of outgoing.get(bus) ?? []) {
      const n = (indegree.get(e.to) as number) - 1;
      indegree.set(e.to, n);
      if (n === 0) queue.push(e.to);
    }
  }
  return mixes;
}

function faultPicture(ctx: PictureContext, bus: Bus): FaultPicture {
  const { model, solver, kvByBus } = ctx;
  const kvOf = (id: string) => kvByBus.get(id) ?? NaN;
  // Only the elements that can carry this fault's current (the others carry none and would be skipped below).
  const fault = solver.faultPath(bus.id);
  const kvFault = bus.nominalKv;
  const ibfA = fault.boltedFaultKa * 1000;
  const edges: Edge[] = [];
  const branchById = new Map(fault.branches.map((b) => [b.id, b]));
  for (const b of fault.branches) {
    if (b.direction === 'none' || !b.towardBus) continue;
    const atFaultSide = b.towardBus === b.toBus ? b.toCurrentA : b.fromCurrentA;
    edges.push({
      id: b.id,
      from: b.towardBus === b.toBus ? b.fromBus : b.toBus,
      to: b.towardBus,
      share: ibfA > 0 ? (atFaultSide * kvOf(b.towardBus)) / kvFault / ibfA : 0,
    });
  }
  const referred = fault.injections.map((i) => ({ i, a: (i.currentA * kvOf(i.bus)) / kvFault }));
  const total = referred.reduce((s, r) => s + r.a, 0);
  const typicalValuesUsed: string[] = [];
  const warnings: EngineWarning[] = [];
  const alternates = new Map<string, ContributionProfile>();
  const contributors: Contributor[] = referred
    .filter((r) => total > 0 && r.a / total > NEGLIGIBLE)
    .map((r) => {
      const source = ctx.sourceById.get(r.i.id);
      const kind: Contributor['kind'] = ctx.motorIds.has(r.i.id) ? 'motor' : (source?.kind ?? 'utility');
      let profile = CONSTANT_PROFILE;
      if (kind === 'motor') profile = ctx.motorProfile;
      else if (source?.kind === 'generator') {
        const g = resolveGenerator(source);
        typicalValuesUsed.push(...g.typicalValuesUsed);
        warnings.push(...g.warnings);
        // Reactance between the terminals and the fault from the first-cycle contribution: X"d + Xe = E / I(0).
        const ratedA = (source.kva * 1000) / (Math.sqrt(3) * kvOf(r.i.bus) * 1000);
        const i0Pu = r.i.currentA / ratedA;
        const externalPu = (model.prefaultPu ?? 1) / i0Pu - g.subtransientPu;
        profile = generatorDecrementProfile({ ...g, externalPu });
        if (g.alternateSynchronousPu !== null)
          alternates.set(
            r.i.id,
            generatorDecrementProfile({ ...g, synchronousPu: g.alternateSynchronousPu, externalPu }),
          );
      }
      return { id: r.i.id, kind, bus: r.i.bus, share: r.a / total, profile };
    });

  const mixes = traceMixes(edges, contributors);
  const wholeFault = new Map(contributors.map((c) => [c.id, c.share]));
  const edgeById = new Map(edges.map((e) => [e.id, e]));
  const injectionById = new Map(fault.injections.map((i) => [i.id, i]));
  const devices: PathDevice[] = [];
  // The devices on the elements carrying current, in model order.
  const deviceIndices: number[] = [];
  for (const b of fault.branches)
    if (b.direction !== 'none') deviceIndices.push(...(ctx.devicesByBranch.get(b.id) ?? []));
  for (const i of fault.injections) deviceIndices.push(...(ctx.devicesBySource.get(i.id) ?? []));
  deviceIndices.sort((x, y) => x - y);
  for (const placed of deviceIndices.map((k) => model.devices[k])) {
    // An arc-flash relay or a maintenance-switch element acts only for arcs at the buses it names.
    if (placed.onlyAt && !placed.onlyAt.busIds.includes(bus.id)) continue;
    if (placed.branch) {
      const b = branchById.get(placed.branch);
      if (!b || b.direction === 'none') continue;
      const atBus = placed.end === 'from' ? b.fromBus : b.toBus;
      const e = edgeById.get(b.id);
      devices.push({
        placed,
        branchId: b.id,
        sourceId: null,
        boltedCurrentA: placed.end === 'from' ? b.fromCurrentA : b.toCurrentA,
        kv: kvOf(atBus),
        location: `${b.id} (${placed.end} end, at ${atBus})`,
        mix: (e && mixes.get(e.from)) ?? wholeFault,
      });
    } else if (placed.source) {
      const inj = injectionById.get(placed.source);
      if (!inj || !(inj.currentA > 0)) continue;
      devices.push({
        placed,
        branchId: null,
        sourceId: inj.id,
        boltedCurrentA: inj.currentA,
        kv: kvOf(inj.bus),
        location: `${inj.id} at ${inj.bus}`,
        mix: new Map([[inj.id, 1]]),
      });
    }
  }
  const alternateContributors = alternates.size
    ? contributors.map((c) =>
        alternates.has(c.id) ? { ...c, profile: alternates.get(c.id) as ContributionProfile } : c,
      )
    : null;
  return { bus, fault, edges, contributors, devices, alternateContributors, typicalValuesUsed, warnings };
}

/** Whether `from` still reaches `to` over the edges not opened (`outgoing`: the edges by their from bus). */
function reaches(from: string, to: string, outgoing: Map<string, Edge[]>, opened: Set<string>): boolean {
  if (from === to) return true;
  const seen = new Set([from]);
  const stack = [from];
  while (stack.length) {
    const at = stack.pop() as string;
    for (const e of outgoing.get(at) ?? []) {
      if (opened.has(e.id) || seen.has(e.to)) continue;
      if (e.to === to) return true;
      seen.add(e.to);
      stack.push(e.to);
    }
  }
  return false;
}

interface CaseInput {
  picture: FaultPicture;
  equipment: ResolvedEquipment;
  arcing: ArcingCurrents;
  enclosureCorrectionFactor: number;
  arcCase: ArcCase;
  location: 'load-side' | 'line-side';
  excluded: Set<string>;
  maxArcDurationS: number;
  /**
   * The motor decay model of the run; with 'higher' the picture's motors carry the step profile and `motorExponential`
   * is the profile of the second evaluation.
   */
  motorDecayModel: MotorDecayModel;
  motorExponential: ContributionProfile;
}

/** One band reader per fault: a device's band is read once per current over all the cases of a bus. */
const bandReaders = new WeakMap<BusFault, BandReader>();
function bandReaderOf(picture: FaultPicture): BandReader {
  let reader = bandReaders.get(picture.fault);
  if (!reader) bandReaders.set(picture.fault, (reader = createBandReader()));
  return reader;
}

function readDevices(input: CaseInput, scale: number): DeviceReading[] {
  const boltedKa = input.picture.fault.boltedFaultKa;
  const bands = bandReaderOf(input.picture);
  return mapped(
    kept(input.picture.devices, (d) => !input.excluded.has(d.placed.id)),
    (d) => {
      const currentA = d.boltedCurrentA * scale;
      const r = bands.clearing(d.placed.device as Device, currentA);
      return {
        deviceId: d.placed.id,
        name: d.placed.name ?? d.placed.id,
        location: d.location,
        kv: d.kv,
        currentA,
        share: (d.boltedCurrentA * d.kv) / (input.picture.bus.nominalKv * boltedKa * 1000),
        clearingTimeS: r.clearingTimeS,
        minimumTimeS: r.minimumTimeS,
        region: r.region,
        warnings: r.warnings,
        operatedAtS: null,
        operatingElement: null,
        operatingRegion: null,
        dropouts: [],
      };
    },
  );
}

type StopReason = 'device' | 'motor-decay' | 'cap';
interface Stop {
  t: number;
  by: string | null;
  reason: StopReason;
}

/** The state of the arc at one instant with a given set of live contributors. */
interface ArcState {
  /** Live contributors' current ratios (id → I(t)/I(0)); missing = not feeding. */
  ratio: Map<string, number>;
  /** Bolted fault current of the live contributors, as a share of the first-cycle bolted current. */
  share: number;
  arcing: ArcingCurrents | null;
  /** I_arc / I_bf of this instant (the factor on each device's bolted current). */
  arcOverBolted: number;
}

/** One arcing case at one location: the arc followed in time, devices operating, energy and boundary. */
/**
 * `xs.filter(keep)` and `xs.map(f)` as array literals filled in a loop. In the case evaluation, arrays made by the
 * array builtins are empty on some buses and hold objects or strings on others, each with a map of its own, and V8
 * deoptimized the whole function on them thousands of times in one run; an array literal is made by its allocation
 * site already holding any element, so it keeps one map.
 */
function kept<T>(xs: readonly T[], keep: (x: T) => boolean): T[] {
  const out: T[] = [];
  for (let i = 0; i < xs.length; i++) if (keep(xs[i])) out.push(xs[i]);
  return out;
}

/** The ids of `xs` joined by `sep` (a loop, for the same reason as `kept`). */
function idsText(xs: readonly { id: string }[], sep = ', '): string {
  let text = '';
  for (let i = 0; i < xs.length; i++) text += i ? sep + xs[i].id : xs[i].id;
  return text;
}

function mapped<T, U>(xs: readonly T[], f: (x: T) => U): U[] {
  const out: U[] = [];
  for (let i = 0; i < xs.length; i++) out.push(f(xs[i]));
  return out;
}

/**
 * The same ids in the same order. Compared in a loop rather than by joined text: the arrays are empty in some cases
 * and hold strings in others, and V8 deoptimized the whole case evaluation on such a join thousands of times a run.
 */
function sameIds(a: readonly string[], b: readonly string[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

function evaluateCase(input: CaseInput, warnings: EngineWarning[]): ArcCaseTrace {
  const { picture, equipment, arcing, arcCase } = input;
  const iarcKa = arcing.arcingCurrentKa[arcCase];
  const ibfKa = picture.fault.boltedFaultKa;
  const readings = readDevices(input, iarcKa / ibfKa);
  const readingById = new Map(readings.map((r) => [r.deviceId, r]));
  const byId = new Map(picture.devices.map((d) => [d.placed.id, d]));
  const active = kept(picture.devices, (d) => !input.excluded.has(d.placed.id));
  const bands = bandReaderOf(picture);
  const integrators = new Map(
    active.map((d) => {
      const device = d.placed.device as Device;
      return [d.placed.id, createTripIntegrator(device, (currentA) => bands.read(device, currentA))];
    }),
  );
  const capS = input.maxArcDurationS;
  const outgoing = new Map<string, Edge[]>();
  for (const e of picture.edges) (outgoing.get(e.from) ?? outgoing.set(e.from, []).get(e.from)!).push(e);

  const stop = new Map<string, Stop>();
  const live = () => kept(picture.contributors, (c) => !stop.has(c.id));
  const arcingCache = new Map<number, ArcingCurrents>();
  const stateAt = (t: number, feeding: Contributor[]): ArcState => {
    const ratio = new Map<string, number>();
    let share = 0;
    let untouched = feeding.length === picture.contributors.length;
    for (const c of feeding) {
      const r = c.profile.ratioAt(t);
      if (r !== 1) untouched = false;
      ratio.set(c.id, r);
      share += c.share * r;
    }
    if (untouched) return { ratio, share: 1, arcing, arcOverBolted: iarcKa / ibfKa };
    if (!(share > NEGLIGIBLE)) return { ratio, share: 0, arcing: null, arcOverBolted: 0 };
    const ibf = ibfKa * Math.min(1, share);
    let a = arcingCache.get(ibf);
    if (!a) {
      a = computeArcingCurrents({
        voltageV: arcing.voltageV,
        boltedFaultKa: ibf,
        electrodeConfig: arcing.electrodeConfig,
        gapMm: arcing.gapMm,
      });
      arcingCache.set(ibf, a);
    }
    return { ratio, share, arcing: a, arcOverBolted: a.arcingCurrentKa[arcCase] / ibf };
  };
  const deviceCurrentA = (d: PathDevice, s: ArcState): number => {
    if (s.share === 1 && s.ratio.size === picture.contributors.length) return d.boltedCurrentA * s.arcOverBolted;
    let w = 0;
    for (const [id, f] of d.mix) w += f * (s.ratio.get(id) ?? 0);
    return d.boltedCurrentA * w * s.arcOverBolted;
  };

  interface Step {
    fromS: number;
    toS: number;
    sourceIds: string[];
    boltedFaultKa: number;
    arcingCurrentKa: number;
    arcing: ArcingCurrents;
    incidentEnergyJPerCm2: number;
    /** The boundary of this step's energy alone (the case's boundary when it is the only step). */
    arcFlashBoundaryMm: number;
    opened: string[];
  }
  const steps: Step[] = [];
  const stepWarningCodes = new Set(arcing.warnings.map((w) => w.code));
  const openedEdges = new Set<string>();
  const openedSources = new Set<string>();
  const opened = new Set<string>();
  let t = 0;
  for (let guard = 0; guard < MAX_STEPS; guard++) {
    const feeding = live();
    if (!feeding.length) break;
    if (t >= capS - EVENT_SLACK_S) {
      for (const c of feeding) stop.set(c.id, { t: capS, by: null, reason: 'cap' });
      break;
    }
    // The step: to the next scheduled event, or a fraction of the fastest time constant still acting.
    let next = capS;
    let scale = Infinity;
    for (const c of feeding) {
      if (c.profile.endS > t + EVENT_SLACK_S) next = Math.min(next, c.profile.endS);
      scale = Math.min(scale, c.profile.scaleS(t));
    }
    let tEnd = next;
    if (Number.isFinite(scale)) {
      // A fraction of the time constant, lengthened while the bolted current changes by at most 1 % over the step.
      const shareAt = (x: number) => feeding.reduce((sum, c) => sum + c.share * c.profile.ratioAt(x), 0);
      const s0 = shareAt(t);
      let dt = Math.max(MIN_STEP_S, STEP_FRACTION_OF_TIME_CONSTANT * scale);
      for (let k = 0; k < 8 && t + 2 * dt < next && Math.abs(shareAt(t + 2 * dt) - s0) <= MAX_STEP_CHANGE * s0; k++)
        dt *= 2;
      tEnd = Math.min(next, t + dt);
    }
    const start = stateAt(t, feeding);
    const end0 = stateAt(tEnd, feeding);
    // Each device is read at the lower of its currents at the two ends of the step (the slower operation).
    const tripCurrent = new Map<string, number>();
    let firstOp = Infinity;
    for (const d of active) {
      if (opened.has(d.placed.id)) continue;
      const i = Math.min(deviceCurrentA(d, start), deviceCurrentA(d, end0));
      tripCurrent.set(d.placed.id, i);
      firstOp = Math.min(firstOp, (integrators.get(d.placed.id) as TripIntegrator).timeToOperateS(i));
    }
    const truncated = t + firstOp < tEnd;
    if (truncated) tEnd = t + firstOp;
    const dt = tEnd - t;
    const justOpened: string[] = [];
    for (const [id, i] of tripCurrent) {
      if ((integrators.get(id) as TripIntegrator).advance(i, t, dt)) justOpened.push(id);
    }
    // Energy of the step at the higher of its end currents (the higher hazard).
    const end = truncated && dt > 0 ? stateAt(tEnd, feeding) : end0;
    if (dt > 0 && start.arcing) {
      const candidates = [start, end].filter((s): s is ArcState & { arcing: ArcingCurrents } => s.arcing !== null);
      let best: { s: ArcState & { arcing: ArcingCurrents }; e: number; afb: number } | null = null;
      for (const s of candidates) {
        // The same arcing currents give the same energy (constant currents: both ends alike), which never replaces.
        if (best && s.arcing === best.s.arcing) continue;
        const energy = computeCaseEnergy(
          s.arcing,
          arcCase,
          input.enclosureCorrectionFactor,
          dt * 1000,
          equipment.workingDistanceMm,
        );
        const e = energy.incidentEnergyJPerCm2;
        if (!best || e > best.e) best = { s, e, afb: energy.arcFlashBoundaryMm };
      }
      if (best) {
        // Model-range notes that first appear as the current falls (e.g. a bolted current below the model range).
        for (const w of best.s.arcing.warnings) {
          if (stepWarningCodes.has(w.code)) continue;
          stepWarningCodes.add(w.code);
          warnings.push({ code: w.code, message: `${arcCase} case, from ${fmt(t)} s into the arc: ${w.message}` });
        }
        steps.push({
          fromS: t,
          toS: tEnd,
          sourceIds: mapped(feeding, (c) => c.id),
          boltedFaultKa: ibfKa * Math.min(1, best.s.share),
          arcingCurrentKa: best.s.arcing.arcingCurrentKa[arcCase],
          arcing: best.s.arcing,
          incidentEnergyJPerCm2: best.e,
          arcFlashBoundaryMm: best.afb,
          opened: [],
        });
      }
    }
    t = tEnd;
    // Devices that operated open their branch or source; a source stops when it no longer reaches the bus.
    for (const id of justOpened) {
      opened.add(id);
      const d = byId.get(id) as PathDevice;
      const op = (integrators.get(id) as TripIntegrator).operated;
      const r = readingById.get(id) as DeviceReading;
      r.operatedAtS = t;
      r.operatingElement = op?.element ?? null;
      r.operatingRegion = op?.region ?? null;
      if (d.branchId) openedEdges.add(d.branchId);
      if (d.sourceId) openedSources.add(d.sourceId);
      if (steps.length && steps[steps.length - 1].toS === t) steps[steps.length - 1].opened.push(id);
      for (const c of live()) {
        if (openedSources.has(c.id) || !reaches(c.bus, picture.bus.id, outgoing, openedEdges))
          stop.set(c.id, { t, by: id, reason: 'device' });
      }
    }
    for (const c of live()) {
      if (c.profile.endS <= t + EVENT_SLACK_S) stop.set(c.id, { t: c.profile.endS, by: null, reason: 'motor-decay' });
    }
  }
  if (live().length && t < capS - EVENT_SLACK_S) {
    // Never a silently short arc: a run that did not reach its end is an error of this bus.
    throw new EngineError(
      'invalid-input',
      'ARC_STEP_LIMIT',
      `The arc could not be followed to its end within ${MAX_STEPS} steps (stopped at ${fmt(t)} s)`,
      'model',
    );
  }
  for (const c of live()) stop.set(c.id, { t: capS, by: null, reason: 'cap' });
  for (const r of readings)
    r.dropouts = mapped(integrators.get(r.deviceId)?.dropouts ?? [], (x) => ({ element: x.element, atS: x.atS }));

  // Intervals: the steps grouped while the same sources feed the arc.
  const intervals: ArcCaseTrace['intervals'] = [];
  for (const s of steps) {
    const last = intervals[intervals.length - 1];
    const stepOut = {
      fromS: s.fromS,
      toS: s.toS,
      boltedFaultKa: s.boltedFaultKa,
      arcingCurrentKa: s.arcingCurrentKa,
      incidentEnergyJPerCm2: s.incidentEnergyJPerCm2,
      openedDeviceIds: s.opened,
    };
    if (last && sameIds(last.sourceIds, s.sourceIds)) {
      last.toS = s.toS;
      last.incidentEnergyJPerCm2 += s.incidentEnergyJPerCm2;
      last.openedDeviceIds = [...(last.openedDeviceIds ?? []), ...s.opened];
      last.steps = [...(last.steps ?? []), stepOut];
    } else {
      intervals.push({
        fromS: s.fromS,
        toS: s.toS,
        sourceIds: s.sourceIds,
        boltedFaultKa: s.boltedFaultKa,
        arcingCurrentKa: s.arcingCurrentKa,
        incidentEnergyJPerCm2: s.incidentEnergyJPerCm2,
        openedDeviceIds: [...s.opened],
        steps: [stepOut],
      });
    }
  }
  // A stretch of one step is its own step: not repeated (keeps the stored trace small).
  for (const i of intervals) if (i.steps.length === 1) i.steps = [];
  const parts = mapped(steps, (s) => ({ arcing: s.arcing, durationMs: (s.toS - s.fromS) * 1000 }));
  const energyAt = (dMm: number) =>
    parts.reduce(
      (sum, p) =>
        sum +
        computeCaseEnergy(p.arcing, arcCase, input.enclosureCorrectionFactor, p.durationMs, dMm).incidentEnergyJPerCm2,
      0,
    );
  const energyJ = steps.reduce((s, i) => s + i.incidentEnergyJPerCm2, 0);
  // One step: the published boundary equation (Eqs. 7-10, 22-24); several: the distance where the sum is 5.0 J/cm².
  // (One step: its duration is toS − fromS, the dt its energy was computed with, so its boundary is that computation's.)
  const boundaryMm =
    parts.length === 1 ? steps[0].arcFlashBoundaryMm : parts.length === 0 ? 0 : boundaryDistanceMm(energyAt);

  // The latest stop (0 when nothing stopped). A loop, not an array of the times: such an array holds small integers
  // or doubles from one case to the next, and V8 kept deoptimizing this whole function on it (a study ran 2× slower).
  let arcEnd = -Infinity;
  for (const s of stop.values()) arcEnd = Math.max(arcEnd, Math.min(s.t, capS));
  if (arcEnd === -Infinity) arcEnd = 0;
  // The clearing device is the one that cuts off the last utility or generator source; motors on the faulted side
  // may keep feeding the arc until their contribution decays (stated in the sentence).
  const stopOf = (c: Contributor) => stop.get(c.id) as Stop;
  const mains = kept(picture.contributors, (c) => c.kind !== 'motor');
  const lastMain = mains.reduce<Contributor | null>((m, c) => (!m || stopOf(c).t > stopOf(m).t ? c : m), null);
  const ender = lastMain && stopOf(lastMain).reason === 'device' ? stopOf(lastMain).by : null;
  const capped = [...stop.values()].some((s) => s.reason === 'cap');
  const endReading = readings.find((r) => r.deviceId === ender);
  const motorTail = kept(
    picture.contributors,
    (c) => c.kind === 'motor' && stopOf(c).reason === 'motor-decay' && (!lastMain || stopOf(c).t > stopOf(lastMain).t),
  );
  const varying = kept(picture.contributors, (c) => c.kind === 'generator');
  const busLabel = picture.bus.id;
  const caseName = arcCase === 'full' ? 'arcing current' : 'reduced arcing current';
  const side = input.location === 'line-side' ? ' (line side of the main)' : '';
  // Elements that stopped because the current fell (not because a device cut their source off: that is said apart).
  const cutTimes: number[] = [];
  for (const x of stop.values()) if (x.reason === 'device') cutTimes.push(x.t);
  const fell = (r: DeviceReading) =>
    kept(r.dropouts, (x) => !cutTimes.some((tc) => Math.abs(tc - x.atS) <= EVENT_SLACK_S * Math.max(1, tc)));
  const dropoutText = (r: DeviceReading) =>
    fell(r).length
      ? ` ${r.deviceId}'s ${fell(r)
          .map((x) => `${x.element} element stopped timing at ${fmt(x.atS)} s`)
          .join(', ')} as the current it sees fell below the pickup.`
      : '';
  let sentence: string;
  if (endReading && !capped) {
    const dev = byId.get(endReading.deviceId) as PathDevice;
    const many = mains.length > 1 ? `; it cuts off the last of ${mains.length} sources` : '';
    const at = endReading.operatedAtS as number;
    const region = endReading.operatingRegion ?? endReading.region;
    const initial =
      endReading.clearingTimeS === null || Math.abs(endReading.clearingTimeS - at) > 1e-9 * Math.max(1, at)
        ? ` At the first-cycle current its band gives ${endReading.clearingTimeS === null ? 'no trip' : `${fmt(endReading.clearingTimeS)} s`}; the current it sees changes during the arc${varying.length ? ` (generator decrement: ${idsText(varying)})` : ''} and its operation is integrated over time (IEEE C37.112).`
        : '';
    sentence =
      `At ${fmt(iarcKa)} kA ${caseName} at ${busLabel}${side}, ${endReading.deviceId} clears in its ${REGION_LABELS[region]} ` +
      `at ${fmt(at)} s (it sees ${fmt(endReading.currentA / 1000)} kA at first${dev.kv !== picture.bus.nominalKv ? ` at ${fmt(dev.kv)} kV` : ''}${many}).` +
      initial +
      dropoutText(endReading);
  } else if (capped) {
    // The earliest to clear of the devices that never operated (the first of equals, as a stable sort gives).
    let late: DeviceReading | undefined;
    for (const r of readings) {
      if (r.clearingTimeS === null || r.operatedAtS !== null) continue;
      if (!late || r.clearingTimeS < (late.clearingTimeS as number)) late = r;
    }
    const dropped = kept(readings, (r) => fell(r).length > 0).slice(0, 2);
    // A loop, not map and join: the mapped array is empty on most buses and holds strings on others, and V8 kept
    // deoptimizing this whole function on the join (dozens of times in a large run).
    const dropoutsText = (rs: DeviceReading[]) => {
      let text = '';
      for (const r of rs) text += dropoutText(r);
      return text;
    };
    // Which devices did cut sources off before the cap, and which sources still feed the arc there.
    const cuts = new Map<string, { t: number; ids: string[] }>();
    for (const c of picture.contributors) {
      const st = stopOf(c);
      if (st.reason !== 'device' || !st.by) continue;
      const e = cuts.get(st.by) ?? { t: st.t, ids: [] };
      e.ids.push(c.id);
      cuts.set(st.by, e);
    }
    const still = kept(picture.contributors, (c) => stopOf(c).reason === 'cap');
    let cutsText = '';
    for (const [dev, e] of cuts)
      cutsText += `${cutsText ? '; ' : ''}${dev} cuts off ${e.ids.join(', ')} at ${fmt(e.t)} s`;
    const cutText = cuts.size
      ? ` ${cutsText}; ${idsText(still)} still ${still.length === 1 ? 'feeds' : 'feed'} the arc.`
      : '';
    sentence =
      `At ${fmt(iarcKa)} kA ${caseName} at ${busLabel}${side}, no protective device clears every source before the ${fmt(capS)} s cap; the arc duration is capped` +
      (late
        ? ` (at the first-cycle current ${late.deviceId} would clear in its ${REGION_LABELS[late.region]} at ${fmt(late.clearingTimeS as number)} s${varying.length ? `; the generator current decays (${idsText(varying)})` : ''}).`
        : '.') +
      cutText +
      dropoutsText(dropped);
  } else {
    sentence = `At ${fmt(iarcKa)} kA ${caseName} at ${busLabel}${side}, only motors feed the arc; it ends at ${fmt(arcEnd)} s as their contribution decays.`;
  }
  if (motorTail.length && endReading && !capped) {
    sentence += ` Motor contribution (${idsText(motorTail)}) continues until ${fmt(Math.max(...motorTail.map((m) => stopOf(m).t)))} s.`;
  }
  if (capped) {
    warnings.push({
      code: 'ARC_DURATION_CAPPED',
      message: `${input.location === 'line-side' ? 'Line side: ' : ''}${arcCase} case: no device clears every source within ${fmt(capS)} s; the arc duration is capped there (IEEE 1584 2 s guidance; not valid where the worker cannot move away).`,
    });
  }
  // Warnings of the devices that decide the arc duration (the others are in the trace, e.g. a feeder that only
  // carries a little motor current and does not trip).
  // Loops, not chained array methods, in this function: see `sameIds`.
  const deciding = new Set<string>();
  for (const s of stop.values()) if (s.by) deciding.add(s.by);
  for (const r of readings) {
    if (!deciding.has(r.deviceId)) continue;
    for (const w of r.warnings) {
      // NO_TRIP at the first-cycle current does not hold for a device that operated later at another current.
      if (w.code === 'NO_TRIP' && r.operatedAtS !== null) continue;
      warnings.push({
        code: w.code,
        message: `${r.deviceId} (${arcCase}${input.location === 'line-side' ? ', line side' : ''}): ${w.message}`,
      });
    }
  }
  return {
    arcCase,
    location: input.location,
    arcingCurrentKa: iarcKa,
    devices: readings,
    sources: picture.contributors.map((c) => {
      const s = stopOf(c);
      return {
        sourceId: c.id,
        kind: c.kind,
        share: c.share,
        stopsAtS: Math.min(s.t, capS),
        cutByDeviceId: s.by,
        reason: s.reason,
      };
    }),
    intervals,
    arcDurationS: arcEnd,
    arcDurationCapped: capped,
    clearingDeviceId: ender,
    clearingRegion: (endReading ? (endReading.operatingRegion ?? endReading.region) : null) as TripRegion | null,
    incidentEnergyJPerCm2: energyJ,
    incidentEnergyCalPerCm2: energyJ / J_PER_CAL,
    arcFlashBoundaryMm: boundaryMm,
    sentence,
  };
}

/**
 * The case, and where a generator's sustained current is not given, the case again with the typical supported
 * sustained current: the higher energy is kept (the higher hazard), and the sentence says so.
 */
function evaluateCaseBracketed(input: CaseInput, warnings: EngineWarning[]): ArcCaseTrace {
  const alt = input.picture.alternateContributors;
  if (!alt) return evaluateCase(input, warnings);
  const wA: EngineWarning[] = [];
  const wB: EngineWarning[] = [];
  const a = evaluateCase(input, wA);
  const b = evaluateCase({ ...input, picture: { ...input.picture, contributors: alt } }, wB);
  const keepB = b.incidentEnergyJPerCm2 > a.incidentEnergyJPerCm2;
  const kept = keepB ? b : a;
  const other = keepB ? a : b;
  warnings.push(...(keepB ? wB : wA));
  const ids = input.picture.contributors.filter((c) => alt.find((x) => x.id === c.id)?.profile !== c.profile);
  kept.sentence +=
    ` Sustained current of ${ids.map((c) => c.id).join(', ')} not entered: evaluated ${keepB ? 'with excitation support (typical sustained multiple)' : 'without excitation support (typical Xd)'}, ` +
    `the higher of two energies (${fmt(kept.incidentEnergyCalPerCm2)} against ${fmt(other.incidentEnergyCalPerCm2)} cal/cm² ${keepB ? 'without' : 'with'} it).`;
  return kept;
}

/** The picture with every motor (in the contributors and the generator alternates) carrying `profile`. */
function withMotorProfile(picture: FaultPicture, profile: ContributionProfile): FaultPicture {
  const swap = (cs: Contributor[]) => cs.map((c) => (c.kind === 'motor' ? { ...c, profile } : c));
  return {
    ...picture,
    contributors: swap(picture.contributors),
    alternateContributors: picture.alternateContributors && swap(picture.alternateContributors),
  };
}

/**
 * The case with the run's motor decay model. With 'higher' and motor contribution at the bus, the case is evaluated
 * with the step and with the exponential model and the higher energy is kept (ties: step), the sentence saying which
 * governed and both energies; only the kept evaluation's warnings are reported. A bus without motor contribution is
 * evaluated once.
 */
function evaluateCaseMotorModels(input: CaseInput, warnings: EngineWarning[]): ArcCaseTrace {
  const motors = input.picture.contributors.filter((c) => c.kind === 'motor');
  if (!motors.length) return evaluateCaseBracketed(input, warnings);
  if (input.motorDecayModel !== 'higher') {
    return { ...evaluateCaseBracketed(input, warnings), motorDecayModel: input.motorDecayModel };
  }
  const wStep: EngineWarning[] = [];
  const wExp: EngineWarning[] = [];
  // The picture's motors already carry the step profile (see createStudyRunner).
  const step = evaluateCaseBracketed(input, wStep);
  const exp = evaluateCaseBracketed(
    { ...input, picture: withMotorProfile(input.picture, input.motorExponential) },
    wExp,
  );
  const keepExp = exp.incidentEnergyJPerCm2 > step.incidentEnergyJPerCm2;
  const kept = keepExp ? exp : step;
  const other = keepExp ? step : exp;
  warnings.push(...(keepExp ? wExp : wStep));
  // Enough digits that two close energies read apart (up to 7).
  let digits = 4;
  while (digits < 7 && fmt(kept.incidentEnergyCalPerCm2, digits) === fmt(other.incidentEnergyCalPerCm2, digits))
    digits += 1;
  kept.sentence +=
    ` Motor contribution (${motors.map((m) => m.id).join(', ')}) evaluated with both decay models: ` +
    `${keepExp ? 'the exponential model (e^(−t/τ))' : 'the step model (full, then stop)'} governs, ` +
    `the higher of two energies (${fmt(kept.incidentEnergyCalPerCm2, digits)} against ${fmt(other.incidentEnergyCalPerCm2, digits)} cal/cm² with the ${keepExp ? 'step' : 'exponential'} model).`;
  return { ...kept, motorDecayModel: keepExp ? 'exponential' : 'step' };
}

/** The devices at this bus's end of the branches that feed it: its main device(s). */
function mainDevices(picture: FaultPicture): Set<string> {
  const out = new Set<string>();
  const branchById = new Map(picture.fault.branches.map((b) => [b.id, b]));
  for (const d of picture.devices) {
    if (!d.branchId) continue;
    const b = branchById.get(d.branchId);
    if (!b || b.towardBus !== picture.bus.id) continue;
    const atBus = d.placed.end === 'from' ? b.fromBus : b.toBus;
    if (atBus === picture.bus.id) out.add(d.placed.id);
  }
  return out;
}

export interface StudyRunner {
  /** The buses that carry equipment (the ones labelled), in model order. */
  readonly busIds: string[];
  readonly shortCircuitWarnings: EngineWarning[];
  /** Evaluates one bus; never throws for a problem of that bus alone (it is reported on the result). */
  runBus(busId: string): BusResult;
  finish(buses: BusResult[]): StudyResults;
  /**
   * Work counters (tests of how the run scales): the short-circuit solver's (faults solved, nodes solved, elements
   * visited) and the edges and devices of the fault pictures built.
   */
  readonly work: { faults: number; nodeVisits: number; elementVisits: number; pictureVisits: number };
}

/**
 * Builds the network once (short-circuit factorization), then evaluates bus by bus. Throws for an invalid model.
 * `reuse.solver`: the short-circuit solver of a model with the same network (buses, sources, branches, ties, motors)
 * — a copy that differs only by its protective devices or bus equipment, which change no impedance (the mitigation
 * search); the caller has validated the model.
 */
export function createStudyRunner(
  model: Model,
  options: StudyOptions = {},
  reuse: { solver?: ShortCircuitSolver } = {},
): StudyRunner {
  const solver = reuse.solver ?? createShortCircuitSolver(model);
  const maxArcDurationMs = options.maxArcDurationMs ?? 2000;
  const motorDecayCycles = options.motorDecayCycles ?? DEFAULT_MOTOR_DECAY_CYCLES;
  const motorDecayS = motorDecayCycles / (model.frequencyHz ?? 60);
  const motorDecayModel = options.motorDecayModel ?? DEFAULT_MOTOR_DECAY_MODEL;
  const motorExponential = motorExponentialProfile(motorDecayS);
  const scByBus = new Map(solver.result.buses.map((b) => [b.id, b]));
  const pictureContext: PictureContext = {
    model,
    solver,
    kvByBus: new Map(model.buses.map((b) => [b.id, b.nominalKv])),
    motorIds: new Set(model.motors.map((m) => m.id)),
    sourceById: new Map(model.sources.map((s) => [s.id, s])),
    // With 'higher' the picture is built with the step profile; the exponential one is swapped in for the second case.
    motorProfile: motorDecayModel === 'exponential' ? motorExponential : motorStepProfile(motorDecayS),
    devicesByBranch: new Map(),
    devicesBySource: new Map(),
  };
  model.devices.forEach((d, k) => {
    const [map, key] = d.branch
      ? [pictureContext.devicesByBranch, d.branch]
      : [pictureContext.devicesBySource, d.source];
    if (!key) return;
    (map.get(key) ?? map.set(key, []).get(key)!).push(k);
  });
  const busById = new Map(model.buses.map((b) => [b.id, b]));
  const busIds = model.buses.filter((b) => b.equipment).map((b) => b.id);
  const onlyAtDevices = new Map(model.devices.filter((d) => d.onlyAt).map((d) => [d.id, d]));
  let pictureVisits = 0;

  function runBus(busId: string): BusResult {
    const bus = busById.get(busId);
    if (!bus) throw new EngineError('invalid-input', 'UNKNOWN_BUS', `No bus ${busId}`, 'busId');
    const sc = scByBus.get(busId);
    const base = {
      busId,
      busName: bus.name ?? bus.id,
      nominalKv: bus.nominalKv,
      boltedFaultKa: sc?.boltedFaultKa ?? 0,
      xr: sc?.xr ?? 0,
      cases: [] as ArcCaseTrace[],
    };
    const warnings: EngineWarning[] = [];
    try {
      const equipment = resolveEquipment(bus);
      const voltageV = bus.nominalKv * 1000;
      const arcing = computeArcingCurrents({
        voltageV,
        boltedFaultKa: base.boltedFaultKa,
        electrodeConfig: equipment.electrodeConfig,
        gapMm: equipment.gapMm,
      });
      warnings.push(...arcing.warnings);
      const enclosure = resolveEnclosure(arcing, equipment.enclosureMm ?? undefined);
      warnings.push(...enclosure.warnings);
      if (equipment.workingDistanceMm < 305) {
        warnings.push({
          code: 'WORKING_DISTANCE_BELOW_MODEL',
          message: `Working distance ${fmt(equipment.workingDistanceMm)} mm is below the IEEE 1584-2018 model range (305 mm).`,
        });
      }
      const picture = faultPicture(pictureContext, bus);
      pictureVisits += picture.edges.length + picture.devices.length + picture.contributors.length;
      warnings.push(...picture.warnings);
      equipment.typicalValuesUsed = [...equipment.typicalValuesUsed, ...picture.typicalValuesUsed];
      // The bus's own arc-duration cap (with its reason) replaces the study's; null: no cap, the clearing time stands
      // (followed up to NO_CAP_HORIZON_S; a case no device clears by then is an error for the bus, not a number).
      const busCap = bus.equipment?.arcDurationCapS;
      const capReason = bus.equipment?.arcDurationCapReason?.trim() || null;
      const arcDurationCap =
        busCap === undefined
          ? { capS: maxArcDurationMs / 1000, source: 'study' as const, reason: null }
          : { capS: busCap, source: 'bus' as const, reason: capReason };
      if (arcDurationCap.source === 'bus') {
        warnings.push({
          code: 'BUS_ARC_DURATION_CAP',
          message:
            arcDurationCap.capS === null
              ? `No arc-duration cap at ${bus.id}: the clearing time stands (${capReason ?? 'no reason given'}).`
              : `Arc-duration cap at ${bus.id}: ${fmt(arcDurationCap.capS)} s instead of the study's ${fmt(maxArcDurationMs / 1000)} s (${capReason ?? 'no reason given'}).`,
        });
      }
      // Written out rather than spread from a common part: a spread followed by more keys makes a slow object.
      const caseInput = (arcCase: ArcCase, location: CaseInput['location'], excluded: Set<string>): CaseInput => ({
        picture,
        equipment,
        arcing,
        enclosureCorrectionFactor: enclosure.enclosureCorrectionFactor,
        maxArcDurationS: arcDurationCap.capS ?? NO_CAP_HORIZON_S,
        motorDecayModel,
        motorExponential,
        arcCase,
        location,
        excluded,
      });
      const cases: ArcCaseTrace[] = [];
      for (const arcCase of ['full', 'reduced'] as const)
        cases.push(evaluateCaseMotorModels(caseInput(arcCase, 'load-side', new Set()), warnings));
      const mainStated = bus.equipment?.mainIsolated !== undefined;
      if (!equipment.mainIsolated) {
        const mains = mainDevices(picture);
        if (mains.size) {
          for (const arcCase of ['full', 'reduced'] as const)
            cases.push(evaluateCaseMotorModels(caseInput(arcCase, 'line-side', mains), warnings));
          if (!mainStated) {
            warnings.push({
              code: 'MAIN_ISOLATION_NOT_STATED',
              message: `Whether the main (${[...mains].join(', ')}) is isolated from ${bus.id} is not stated: it is treated as not isolated and the line side is evaluated (the higher hazard). State it on the bus.`,
            });
          }
        } else if (mainStated) {
          warnings.push({
            code: 'NO_MAIN_DEVICE',
            message: `The main is marked not isolated, but no device sits at ${bus.id}'s end of a feeding branch; the line side equals the load side.`,
          });
        } else {
          // No main at this bus: the unstated isolation changes nothing, so it is not listed as a defaulted value.
          equipment.typicalValuesUsed = equipment.typicalValuesUsed.filter((f) => f !== 'mainIsolated');
        }
      }
      if (arcDurationCap.capS === null && cases.some((c) => c.arcDurationCapped)) {
        throw new EngineError(
          'invalid-input',
          'NO_CLEARING_WITHOUT_CAP',
          `${bus.id} has no arc-duration cap, and no protective device clears every source within ${fmt(NO_CAP_HORIZON_S)} s: set a cap on the bus or check the protection`,
          'equipment.arcDurationCapS',
        );
      }
      const governing = cases.reduce((g, c) => (c.incidentEnergyJPerCm2 > g.incidentEnergyJPerCm2 ? c : g));
      const labelValues = computeLabelValues(
        {
          incidentEnergyCalPerCm2: governing.incidentEnergyCalPerCm2,
          incidentEnergyJPerCm2: governing.incidentEnergyJPerCm2,
          arcFlashBoundaryMm: governing.arcFlashBoundaryMm,
          workingDistanceMm: equipment.workingDistanceMm,
          governingCase: governing.arcCase,
        },
        voltageV,
        options.labelSettings,
      );
      // A device that acts only for arcs here (an arc-flash relay, a maintenance switch) ends the governing arc or
      // cuts one of its sources off: the energy holds only while it is in service, said on the label and the run.
      if (onlyAtDevices.size) onlyAtConditions(governing, onlyAtDevices, bus, labelValues.cautions, warnings);
      // The keys of `base` written out (in its order, `cases` in its place): a spread followed by more keys makes a slow
      // object.
      return {
        busId: base.busId,
        busName: base.busName,
        nominalKv: base.nominalKv,
        boltedFaultKa: base.boltedFaultKa,
        xr: base.xr,
        cases,
        status: 'ok',
        equipment: { ...equipment, enclosureMm: (enclosure.enclosure.enclosureMm as EnclosureSizeMm | null) ?? null },
        arcingCurrentKa: arcing.arcingCurrentKa,
        varCf: arcing.varCf,
        enclosureCorrectionFactor: enclosure.enclosureCorrectionFactor,
        governing: { arcCase: governing.arcCase, location: governing.location },
        incidentEnergyCalPerCm2: governing.incidentEnergyCalPerCm2,
        incidentEnergyJPerCm2: governing.incidentEnergyJPerCm2,
        arcFlashBoundaryMm: governing.arcFlashBoundaryMm,
        arcDurationS: governing.arcDurationS,
        arcDurationCap,
        clearingDeviceId: governing.clearingDeviceId,
        labelValues,
        warnings: dedupe(warnings),
      };
    } catch (e) {
      if (!(e instanceof EngineError)) throw e;
      return { ...base, status: 'error', error: { code: e.code, message: e.message }, warnings: dedupe(warnings) };
    }
  }

  return {
    busIds,
    shortCircuitWarnings: solver.result.warnings,
    runBus,
    get work() {
      return { ...solver.work, pictureVisits };
    },
    finish: (buses) => ({
      method:
        'IEEE 1584-2018 with the arc followed in time: generator decrement and motor decay, each device operating when the integral of dt / t(I) of its trip band reaches 1 (IEEE C37.112), energy added step by step',
      maxArcDurationMs,
      motorDecayS,
      motorDecayModel,
      buses,
      warnings: solver.result.warnings,
    }),
  };
}

/**
 * The conditions of a governing arc cleared (or cut off in part) by devices that act only for arcs at this bus: the
 * label caution of each purpose (ONLY_AT_CAUTIONS) and one run warning (ONLY_AT_DEVICE_CLEARS) naming the devices.
 */
function onlyAtConditions(
  governing: ArcCaseTrace,
  onlyAtDevices: Map<string, PlacedDevice>,
  bus: Bus,
  cautions: string[],
  warnings: EngineWarning[],
): void {
  const ids = new Set<string>();
  if (governing.clearingDeviceId) ids.add(governing.clearingDeviceId);
  for (const src of governing.sources) if (src.cutByDeviceId) ids.add(src.cutByDeviceId);
  const acting = [...ids].flatMap((id) => {
    const d = onlyAtDevices.get(id);
    return d?.onlyAt ? [{ d, purpose: d.onlyAt.purpose }] : [];
  });
  if (!acting.length) return;
  for (const purpose of ['maintenance-switch', 'arc-flash-relay'] as const) {
    if (acting.some((a) => a.purpose === purpose) && !cautions.includes(ONLY_AT_CAUTIONS[purpose])) {
      cautions.push(ONLY_AT_CAUTIONS[purpose]);
    }
  }
  const words = acting.map(({ d, purpose }) => {
    const named = d.name ? `${d.id} (${d.name})` : d.id;
    return purpose === 'maintenance-switch'
      ? `${named}, a maintenance switch: the energy holds only with it ON`
      : `${named}, an arc-flash relay: the energy holds only with it in service`;
  });
  warnings.push({
    code: 'ONLY_AT_DEVICE_CLEARS',
    message: `At ${bus.id} the governing arc is cleared by a device that acts only for arcs here: ${words.join('; ')}. Without it the energy is higher: when it is off or out of service, the energy of a study without it applies.`,
  });
}

function dedupe(ws: EngineWarning[]): EngineWarning[] {
  const seen = new Set<string>();
  return ws.filter((w) => {
    const k = `${w.code}|${w.message}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}
