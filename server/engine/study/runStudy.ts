/**
 * The study run (docs/ARCHITECTURE.md, Data path of a study run): for a fault at each labelled bus — bolted fault current → both arcing currents →
 * the protective devices carrying fault current, each read at the current it sees during the arc → arc duration
 * (the first device to clear with one source; time-stepped energy as each source is cut off with several) → the
 * line-side case where the bus's main device is not isolated → the arc-duration cap → incident energy, arc-flash
 * boundary and label values. Pure: no clock, no I/O; the caller drives it bus by bus to report progress.
 *
 * Method notes (shown in the study report):
 * - Each device sees the bolted current through its branch (from the short-circuit solution, at its own voltage)
 *   scaled by I_arc / I_bf of the case: the arc current divides among the paths as the bolted current does.
 * - Several sources: each source's (and motor's) share of the fault is its bolted contribution referred to the bus
 *   voltage over their sum (magnitudes). A source stops feeding the arc when every path from it to the bus is opened
 *   by devices in order of their clearing times. Between those instants the remaining sources give a smaller
 *   bolted and arcing current; the energy of each interval is added (E is proportional to T for a given current,
 *   IEEE 1584-2018 Eqs. 3-6). Clearing times are read once at the initial currents (not re-read as the currents
 *   change after a source drops): a first-order approximation, stated on the result.
 * - Induction motors feed the arc for `motorDecayCycles` at most (common practice, no source).
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
import { clearingTime } from '../trip';
import { boundaryDistanceMm } from './boundary';
import { resolveEquipment, type ResolvedEquipment } from './equipment';

export interface StudyOptions {
  /** Cap of the arc duration, ms (IEEE 1584 2 s guidance; an organization setting). */
  maxArcDurationMs?: number;
  /** Cycles an induction motor keeps feeding the arc (common practice, no source). */
  motorDecayCycles?: number;
  labelSettings?: LabelSettings;
}

export const DEFAULT_MOTOR_DECAY_CYCLES = 5;
const J_PER_CAL = 4.184;
/** A share of the fault current below this counts as zero. */
const NEGLIGIBLE = 1e-9;

const fmt = (v: number, digits = 3) => Number(v.toPrecision(digits)).toString();

interface Contributor {
  id: string;
  kind: 'utility' | 'generator' | 'motor';
  bus: string;
  share: number;
}

interface PathDevice {
  placed: PlacedDevice;
  /** Branch id it sits on, or null on a source/motor. */
  branchId: string | null;
  sourceId: string | null;
  boltedCurrentA: number;
  kv: number;
  location: string;
}

interface Edge {
  id: string;
  from: string;
  to: string;
}

/** The flow of fault current for a fault at one bus: directed edges toward the fault, contributors, devices. */
interface FaultPicture {
  bus: Bus;
  fault: BusFault;
  edges: Edge[];
  contributors: Contributor[];
  devices: PathDevice[];
}

function kvOf(model: Model, busId: string): number {
  return model.buses.find((b) => b.id === busId)?.nominalKv ?? NaN;
}

function faultPicture(model: Model, solver: ShortCircuitSolver, bus: Bus): FaultPicture {
  const fault = solver.faultAt(bus.id);
  const edges: Edge[] = [];
  const branchById = new Map(fault.branches.map((b) => [b.id, b]));
  for (const b of fault.branches) {
    if (b.direction === 'none' || !b.towardBus) continue;
    edges.push({ id: b.id, from: b.towardBus === b.toBus ? b.fromBus : b.toBus, to: b.towardBus });
  }
  const kvFault = bus.nominalKv;
  const kindOf = (id: string): Contributor['kind'] =>
    model.motors.some((m) => m.id === id) ? 'motor' : (model.sources.find((s) => s.id === id)?.kind ?? 'utility');
  const referred = fault.injections.map((i) => ({ i, a: (i.currentA * kvOf(model, i.bus)) / kvFault }));
  const total = referred.reduce((s, r) => s + r.a, 0);
  const contributors: Contributor[] = referred
    .filter((r) => total > 0 && r.a / total > NEGLIGIBLE)
    .map((r) => ({ id: r.i.id, kind: kindOf(r.i.id), bus: r.i.bus, share: r.a / total }));

  const injectionById = new Map(fault.injections.map((i) => [i.id, i]));
  const devices: PathDevice[] = [];
  for (const placed of model.devices) {
    if (placed.branch) {
      const b = branchById.get(placed.branch);
      if (!b || b.direction === 'none') continue;
      const atBus = placed.end === 'from' ? b.fromBus : b.toBus;
      devices.push({
        placed,
        branchId: b.id,
        sourceId: null,
        boltedCurrentA: placed.end === 'from' ? b.fromCurrentA : b.toCurrentA,
        kv: kvOf(model, atBus),
        location: `${b.id} (${placed.end} end, at ${atBus})`,
      });
    } else if (placed.source) {
      const inj = injectionById.get(placed.source);
      if (!inj || !(inj.currentA > 0)) continue;
      devices.push({
        placed,
        branchId: null,
        sourceId: inj.id,
        boltedCurrentA: inj.currentA,
        kv: kvOf(model, inj.bus),
        location: `${inj.id} at ${inj.bus}`,
      });
    }
  }
  return { bus, fault, edges, contributors, devices };
}

/** Whether `from` still reaches `to` over the edges not opened. */
function reaches(from: string, to: string, edges: Edge[], opened: Set<string>): boolean {
  if (from === to) return true;
  const seen = new Set([from]);
  const stack = [from];
  while (stack.length) {
    const at = stack.pop() as string;
    for (const e of edges) {
      if (e.from !== at || opened.has(e.id) || seen.has(e.to)) continue;
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
  motorDecayS: number;
}

function readDevices(input: CaseInput, scale: number): DeviceReading[] {
  const boltedKa = input.picture.fault.boltedFaultKa;
  return input.picture.devices
    .filter((d) => !input.excluded.has(d.placed.id))
    .map((d) => {
      const currentA = d.boltedCurrentA * scale;
      const r = clearingTime(d.placed.device as Device, currentA);
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
      };
    });
}

/** One arcing case at one location: device readings, source cut-off times, intervals, energy and boundary. */
function evaluateCase(input: CaseInput, warnings: EngineWarning[]): ArcCaseTrace {
  const { picture, equipment, arcing, arcCase } = input;
  const iarcKa = arcing.arcingCurrentKa[arcCase];
  const readings = readDevices(input, iarcKa / picture.fault.boltedFaultKa);
  const byId = new Map(picture.devices.map((d) => [d.placed.id, d]));

  // Open devices in order of their (maximum-curve) clearing times; a source stops when it can no longer reach the bus.
  const order = readings
    .filter((r) => r.clearingTimeS !== null && r.clearingTimeS < input.maxArcDurationS)
    .sort((a, b) => (a.clearingTimeS as number) - (b.clearingTimeS as number));
  const openedEdges = new Set<string>();
  const openedSources = new Set<string>();
  const stop = new Map<string, { t: number; by: string | null; reason: 'device' | 'motor-decay' | 'cap' }>();
  const live = () => picture.contributors.filter((c) => !stop.has(c.id));
  for (const r of order) {
    const d = byId.get(r.deviceId) as PathDevice;
    if (d.branchId) openedEdges.add(d.branchId);
    if (d.sourceId) openedSources.add(d.sourceId);
    for (const c of live()) {
      if (openedSources.has(c.id) || !reaches(c.bus, picture.bus.id, picture.edges, openedEdges)) {
        stop.set(c.id, { t: r.clearingTimeS as number, by: r.deviceId, reason: 'device' });
      }
    }
    if (!live().length) break;
  }
  for (const c of picture.contributors) {
    const s = stop.get(c.id);
    if (c.kind === 'motor' && (!s || s.t > input.motorDecayS))
      stop.set(c.id, { t: input.motorDecayS, by: null, reason: 'motor-decay' });
    else if (!s) stop.set(c.id, { t: input.maxArcDurationS, by: null, reason: 'cap' });
  }

  // Intervals between successive stops; energy adds up (E ∝ T at a given current).
  const times = [...new Set([...stop.values()].map((s) => Math.min(s.t, input.maxArcDurationS)))].sort((a, b) => a - b);
  const intervals: ArcCaseTrace['intervals'] = [];
  const parts: { arcing: ArcingCurrents; durationMs: number }[] = [];
  let from = 0;
  for (const t of times) {
    const feeding = picture.contributors.filter((c) => (stop.get(c.id) as { t: number }).t >= t);
    const share = feeding.reduce((s, c) => s + c.share, 0);
    if (t > from && share > NEGLIGIBLE) {
      const ibf = picture.fault.boltedFaultKa * Math.min(1, share);
      const a =
        Math.abs(share - 1) < 1e-12
          ? arcing
          : computeArcingCurrents({
              voltageV: arcing.voltageV,
              boltedFaultKa: ibf,
              electrodeConfig: arcing.electrodeConfig,
              gapMm: arcing.gapMm,
            });
      const durationMs = (t - from) * 1000;
      const e = computeCaseEnergy(
        a,
        arcCase,
        input.enclosureCorrectionFactor,
        durationMs,
        equipment.workingDistanceMm,
      ).incidentEnergyJPerCm2;
      intervals.push({
        fromS: from,
        toS: t,
        sourceIds: feeding.map((c) => c.id),
        boltedFaultKa: ibf,
        arcingCurrentKa: a.arcingCurrentKa[arcCase],
        incidentEnergyJPerCm2: e,
      });
      parts.push({ arcing: a, durationMs });
    }
    from = t;
  }
  const energyAt = (dMm: number) =>
    parts.reduce(
      (s, p) =>
        s +
        computeCaseEnergy(p.arcing, arcCase, input.enclosureCorrectionFactor, p.durationMs, dMm).incidentEnergyJPerCm2,
      0,
    );
  const energyJ = intervals.reduce((s, i) => s + i.incidentEnergyJPerCm2, 0);
  // One interval: the published boundary equation (Eqs. 7-10, 22-24); several: the distance where the sum is 5.0 J/cm².
  const boundaryMm =
    parts.length === 1
      ? computeCaseEnergy(
          parts[0].arcing,
          arcCase,
          input.enclosureCorrectionFactor,
          parts[0].durationMs,
          equipment.workingDistanceMm,
        ).arcFlashBoundaryMm
      : parts.length === 0
        ? 0
        : boundaryDistanceMm(energyAt);

  const arcEnd = times.length ? Math.min(times[times.length - 1], input.maxArcDurationS) : 0;
  // The clearing device is the one that cuts off the last utility or generator source; motors on the faulted side
  // may keep feeding the arc until their contribution decays (stated in the sentence).
  const stopOf = (c: Contributor) =>
    stop.get(c.id) as { t: number; by: string | null; reason: 'device' | 'motor-decay' | 'cap' };
  const mains = picture.contributors.filter((c) => c.kind !== 'motor');
  const lastMain = mains.reduce<Contributor | null>((m, c) => (!m || stopOf(c).t > stopOf(m).t ? c : m), null);
  const ender = lastMain && stopOf(lastMain).reason === 'device' ? stopOf(lastMain).by : null;
  const capped = [...stop.values()].some((s) => s.reason === 'cap');
  const endReading = readings.find((r) => r.deviceId === ender);
  const motorTail = picture.contributors.filter(
    (c) => c.kind === 'motor' && stopOf(c).reason === 'motor-decay' && (!lastMain || stopOf(c).t > stopOf(lastMain).t),
  );
  const busLabel = picture.bus.id;
  const caseName = arcCase === 'full' ? 'arcing current' : 'reduced arcing current';
  const side = input.location === 'line-side' ? ' (line side of the main)' : '';
  let sentence: string;
  if (endReading && !capped) {
    const dev = byId.get(endReading.deviceId) as PathDevice;
    const many = mains.length > 1 ? `; it cuts off the last of ${mains.length} sources` : '';
    sentence =
      `At ${fmt(iarcKa)} kA ${caseName} at ${busLabel}${side}, ${dev.placed.id} clears in its ${REGION_LABELS[endReading.region]} ` +
      `at ${fmt(endReading.clearingTimeS as number)} s (it sees ${fmt(endReading.currentA / 1000)} kA${dev.kv !== picture.bus.nominalKv ? ` at ${fmt(dev.kv)} kV` : ''}${many}).`;
  } else if (capped) {
    const late = readings
      .filter((r) => r.clearingTimeS !== null && r.clearingTimeS >= input.maxArcDurationS)
      .sort((a, b) => (a.clearingTimeS as number) - (b.clearingTimeS as number))[0];
    sentence =
      `At ${fmt(iarcKa)} kA ${caseName} at ${busLabel}${side}, no protective device clears every source before the ${fmt(input.maxArcDurationS)} s cap; the arc duration is capped` +
      (late
        ? ` (${late.deviceId} would clear in its ${REGION_LABELS[late.region]} at ${fmt(late.clearingTimeS as number)} s).`
        : '.');
  } else {
    sentence = `At ${fmt(iarcKa)} kA ${caseName} at ${busLabel}${side}, only motors feed the arc; it ends at ${fmt(arcEnd)} s as their contribution decays.`;
  }
  if (motorTail.length && endReading && !capped) {
    sentence += ` Motor contribution (${motorTail.map((m) => m.id).join(', ')}) continues until ${fmt(Math.max(...motorTail.map((m) => stopOf(m).t)))} s.`;
  }
  if (capped) {
    warnings.push({
      code: 'ARC_DURATION_CAPPED',
      message: `${input.location === 'line-side' ? 'Line side: ' : ''}${arcCase} case: no device clears every source within ${fmt(input.maxArcDurationS)} s; the arc duration is capped there (IEEE 1584 2 s guidance; not valid where the worker cannot move away).`,
    });
  }
  // Warnings of the devices that decide the arc duration (the others are in the trace, e.g. a feeder that only
  // carries a little motor current and does not trip).
  const deciding = new Set([...stop.values()].map((s) => s.by).filter((x): x is string => !!x));
  for (const r of readings) {
    if (!deciding.has(r.deviceId)) continue;
    for (const w of r.warnings)
      warnings.push({
        code: w.code,
        message: `${r.deviceId} (${arcCase}${input.location === 'line-side' ? ', line side' : ''}): ${w.message}`,
      });
  }
  return {
    arcCase,
    location: input.location,
    arcingCurrentKa: iarcKa,
    devices: readings,
    sources: picture.contributors.map((c) => {
      const s = stop.get(c.id) as { t: number; by: string | null; reason: 'device' | 'motor-decay' | 'cap' };
      return {
        sourceId: c.id,
        kind: c.kind,
        share: c.share,
        stopsAtS: Math.min(s.t, input.maxArcDurationS),
        cutByDeviceId: s.by,
        reason: s.reason,
      };
    }),
    intervals,
    arcDurationS: arcEnd,
    arcDurationCapped: capped,
    clearingDeviceId: ender,
    clearingRegion: (endReading?.region ?? null) as TripRegion | null,
    incidentEnergyJPerCm2: energyJ,
    incidentEnergyCalPerCm2: energyJ / J_PER_CAL,
    arcFlashBoundaryMm: boundaryMm,
    sentence,
  };
}

/** The devices at this bus's end of the branches that feed it: its main device(s). */
function mainDevices(picture: FaultPicture): Set<string> {
  const out = new Set<string>();
  for (const d of picture.devices) {
    if (!d.branchId) continue;
    const b = picture.fault.branches.find((x) => x.id === d.branchId);
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
}

/** Builds the network once (short-circuit factorization), then evaluates bus by bus. Throws for an invalid model. */
export function createStudyRunner(model: Model, options: StudyOptions = {}): StudyRunner {
  const solver = createShortCircuitSolver(model);
  const maxArcDurationMs = options.maxArcDurationMs ?? 2000;
  const motorDecayCycles = options.motorDecayCycles ?? DEFAULT_MOTOR_DECAY_CYCLES;
  const motorDecayS = motorDecayCycles / (model.frequencyHz ?? 60);
  const scByBus = new Map(solver.result.buses.map((b) => [b.id, b]));
  const busIds = model.buses.filter((b) => b.equipment).map((b) => b.id);

  function runBus(busId: string): BusResult {
    const bus = model.buses.find((b) => b.id === busId);
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
      const picture = faultPicture(model, solver, bus);
      const common = {
        picture,
        equipment,
        arcing,
        enclosureCorrectionFactor: enclosure.enclosureCorrectionFactor,
        maxArcDurationS: maxArcDurationMs / 1000,
        motorDecayS,
      };
      const cases: ArcCaseTrace[] = [];
      for (const arcCase of ['full', 'reduced'] as const)
        cases.push(evaluateCase({ ...common, arcCase, location: 'load-side', excluded: new Set() }, warnings));
      const mainStated = bus.equipment?.mainIsolated !== undefined;
      if (!equipment.mainIsolated) {
        const mains = mainDevices(picture);
        if (mains.size) {
          for (const arcCase of ['full', 'reduced'] as const)
            cases.push(evaluateCase({ ...common, arcCase, location: 'line-side', excluded: mains }, warnings));
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
      return {
        ...base,
        status: 'ok',
        equipment: { ...equipment, enclosureMm: (enclosure.enclosure.enclosureMm as EnclosureSizeMm | null) ?? null },
        arcingCurrentKa: arcing.arcingCurrentKa,
        varCf: arcing.varCf,
        enclosureCorrectionFactor: enclosure.enclosureCorrectionFactor,
        cases,
        governing: { arcCase: governing.arcCase, location: governing.location },
        incidentEnergyCalPerCm2: governing.incidentEnergyCalPerCm2,
        incidentEnergyJPerCm2: governing.incidentEnergyJPerCm2,
        arcFlashBoundaryMm: governing.arcFlashBoundaryMm,
        arcDurationS: governing.arcDurationS,
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
    finish: (buses) => ({
      method: 'IEEE 1584-2018 with clearing times read from the trip bands of the devices carrying fault current',
      maxArcDurationMs,
      motorDecayS,
      buses,
      warnings: solver.result.warnings,
    }),
  };
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

/** All buses at once (tests, benchmarks). */
export function runStudy(model: Model, options: StudyOptions = {}): StudyResults {
  const runner = createStudyRunner(model, options);
  return runner.finish(runner.busIds.map((id) => runner.runBus(id)));
}
