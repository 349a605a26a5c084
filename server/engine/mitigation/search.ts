/**
 * Mitigation search (docs/ARCHITECTURE.md, Mitigation): for one bus and a target incident energy, each option
 * generator proposes changes (a setting from the device's own range, a maintenance-switch element, an arc-flash relay,
 * a current-limiting fuse, an isolated main), every proposal is evaluated by the study engine itself on the patched
 * model (every operating scenario, the governing one kept), and each option is reported with the energy it gives at
 * the bus and at every other bus it changes, and with the selectivity it costs. Pure: no I/O, no clock.
 *
 * Because an option's numbers come from running the engine on `applyModelPatch(model, option.modelPatch)`, a
 * revision made from the patch and run with the same settings gives exactly those numbers.
 */
import { applyModelPatch } from '../../../shared/modelPatch';
import type {
  MitigationHazard,
  MitigationKind,
  MitigationOption,
  MitigationResponse,
  ModelPatchOp,
  Selectivity,
} from '../../../shared/schemas/mitigation';
import { validateModel, type Model, type PlacedDevice } from '../../../shared/schemas/model';
import type { BusResult } from '../../../shared/schemas/studyResults';
import { EngineError } from '../errors';
import { createShortCircuitSolver, InvalidModelError, type BusFault, type ShortCircuitSolver } from '../shortcircuit';
import {
  createScenarioRunner,
  scenariosOf,
  type AppliedScenario,
  type SharedNetwork,
  type StudyOptions,
  type StudyRunner,
} from '../study';

/** The hazard at a bus, from its (governing) result. Throws when the bus has no number. */
export function hazardOf(model: Model, r: BusResult): MitigationHazard {
  if (r.status !== 'ok' || r.incidentEnergyCalPerCm2 === undefined || !r.governing || !r.labelValues) {
    throw new EngineError(
      'invalid-input',
      'BUS_NOT_EVALUATED',
      `Bus ${r.busId} has no result to mitigate: ${r.error?.message ?? 'no incident energy'}`,
      'busId',
    );
  }
  const g = r.governing;
  const governingCase = r.cases.find((c) => c.arcCase === g.arcCase && c.location === g.location);
  const clearingDeviceId = governingCase?.clearingDeviceId ?? r.clearingDeviceId ?? null;
  const clearing = clearingDeviceId ? model.devices.find((d) => d.id === clearingDeviceId) : undefined;
  return {
    incidentEnergyCalPerCm2: r.incidentEnergyCalPerCm2,
    arcFlashBoundaryMm: r.arcFlashBoundaryMm ?? 0,
    arcDurationS: r.arcDurationS ?? governingCase?.arcDurationS ?? 0,
    arcDurationCapped: governingCase?.arcDurationCapped ?? false,
    governing: g,
    clearingDeviceId,
    clearingDeviceName: clearing ? (clearing.name ?? clearing.id) : null,
    clearingRegion: governingCase?.clearingRegion ?? null,
    ...(r.scenarioId !== undefined ? { scenarioId: r.scenarioId } : {}),
    ppeLevel: r.labelValues.ppeLevel?.name ?? null,
    signalWord: r.labelValues.signalWord,
  };
}

/**
 * Evaluates buses of one model and of patched copies of it (a patch replaces or adds protective devices or changes a
 * bus's equipment, never the network), for one search or for several on the same model (the report's appendix):
 * - the short-circuit solution of each operating scenario is built once (the factorization is the costly part of a
 *   runner) and shared by the runners of every patched model, and the fault at a bus is solved once for all of them;
 * - results are kept by patch and bus (the base bus is evaluated once for every option and every search);
 * - a patch is evaluated at another bus only where it can act (`busesActedOn`); everywhere else the engine's result
 *   is, by construction, the model's own (see there).
 */
export class BusEvaluator {
  private built: { scenarios: AppliedScenario[]; network: SharedNetwork; busIds: readonly string[] } | null = null;
  private readonly patched = new Map<string, Model>();
  private readonly runners = new Map<string, StudyRunner>();
  private readonly results = new Map<string, BusResult>();
  private readonly placesAt = new Map<string, ReadonlySet<string>>();

  constructor(
    readonly model: Model,
    readonly options: StudyOptions,
  ) {}

  /** Built on first use (the bus asked for is checked first): each scenario's model validated and factorized once. */
  private get net(): { scenarios: AppliedScenario[]; network: SharedNetwork; busIds: readonly string[] } {
    if (!this.built) {
      const scenarios = scenariosOf(this.model);
      const network = { solvers: scenarios.map((a) => solvedOnce(createShortCircuitSolver(a.model))) };
      this.built = { scenarios, network, busIds: [] };
      this.built.busIds = this.runnerOf('', this.model).busIds;
    }
    return this.built;
  }

  /** The labelled buses, in model order. */
  get busIds(): readonly string[] {
    return this.net.busIds;
  }

  /** The model with `patch` applied and its key (the patch's JSON; '' for the model as it is). Validated once. */
  modelFor(patch: readonly ModelPatchOp[]): [string, Model] {
    if (!patch.length) return ['', this.model];
    const key = JSON.stringify(patch);
    let m = this.patched.get(key);
    if (!m) {
      m = applyModelPatch(this.model, patch);
      const issues = validateModel(m);
      if (issues.length) throw new InvalidModelError(issues);
      this.patched.set(key, m);
    }
    return [key, m];
  }

  /** The governing result of `busId` with `patch` applied (every operating scenario, the governing one kept). */
  bus(patch: readonly ModelPatchOp[], busId: string): BusResult {
    const [key, m] = this.modelFor(patch);
    const k = `${key}\u0000${busId}`;
    let r = this.results.get(k);
    if (!r) {
      r = this.runnerOf(key, m).runBus(busId);
      this.results.set(k, r);
    }
    return r;
  }

  private runnerOf(key: string, m: Model): StudyRunner {
    let runner = this.runners.get(key);
    if (!runner) {
      runner = createScenarioRunner(m, this.options, this.net.network);
      this.runners.set(key, runner);
    }
    return runner;
  }

  /**
   * The labelled buses at which the patched model's result can differ from the model's: those where a device the
   * patch replaces or adds sits on an element carrying the fault's current in some operating scenario (a device
   * acting only for arcs at named buses: only at those), and the bus whose equipment it changes. At any other bus
   * the engine's result is the model's own: a bus's fault picture holds only the devices on the elements carrying
   * its fault current (an `onlyAt` device only at its buses), and a bus's equipment is read only for arcs at it
   * (runStudy.ts, faultPicture and runBus). tests/engine/mitigation-evaluator.test.ts checks it against evaluating
   * every bus.
   */
  busesActedOn(patch: readonly ModelPatchOp[]): string[] {
    const [, m] = this.modelFor(patch);
    const equipment = new Set<string>();
    const devices: PlacedDevice[] = [];
    for (const op of patch) {
      if (op.op === 'set-main-isolated') equipment.add(op.busId);
      else if (op.op === 'add-device') devices.push(op.placed);
      else devices.push(...m.devices.filter((d) => d.id === op.deviceId));
    }
    return this.busIds.filter(
      (id) =>
        equipment.has(id) ||
        devices.some((d) => (!d.onlyAt || d.onlyAt.busIds.includes(id)) && this.places(id).has(placeOf(d))),
    );
  }

  /** The places (branch or tie, source or motor) carrying current for a fault at the bus, in any scenario. */
  private places(busId: string): ReadonlySet<string> {
    const hit = this.placesAt.get(busId);
    if (hit) return hit;
    const out = new Set<string>();
    const { scenarios, network } = this.net;
    scenarios.forEach((a, k) => {
      if (a.deEnergizedBusIds.has(busId)) return;
      let fault: BusFault;
      try {
        fault = network.solvers[k].faultPath(busId);
      } catch (e) {
        // The bus fails whatever its devices (the same error with and without the patch).
        if (e instanceof EngineError) return;
        throw e;
      }
      for (const b of fault.branches) if (b.direction !== 'none') out.add(`branch:${b.id}`);
      for (const i of fault.injections) if (i.currentA > 0) out.add(`source:${i.id}`);
    });
    this.placesAt.set(busId, out);
    return out;
  }
}

/** Where a placed device sits, in the keys of `BusEvaluator.places`. */
const placeOf = (d: PlacedDevice) =>
  d.branch !== undefined ? `branch:${d.branch}` : d.source !== undefined ? `source:${d.source}` : '';

/** A solver that solves the fault at each bus once (the values are the solver's own, kept). */
function solvedOnce(solver: ShortCircuitSolver): ShortCircuitSolver {
  const faults = new Map<string, BusFault>();
  return {
    result: solver.result,
    busIds: solver.busIds,
    faultAt: (busId, options) => solver.faultAt(busId, options),
    faultPath: (busId) => {
      let f = faults.get(busId);
      if (!f) faults.set(busId, (f = solver.faultPath(busId)));
      return f;
    },
    get work() {
      return solver.work;
    },
  };
}

/** What a generator proposes; the search evaluates it and adds the numbers. */
export interface OptionProposal {
  kind: MitigationKind;
  /** Distinguishes proposals of one kind (e.g. the setting chosen); part of the option id. */
  variant: string;
  title: string;
  deviceId: string | null;
  deviceName: string | null;
  changes: { setting: string; before: string; after: string }[];
  modelPatch: ModelPatchOp[];
  notes: string[];
  /**
   * How selectivity is judged: 'check' compares the changed (or added) device `deviceId` with the devices downstream
   * of it; the others give the verdict without a comparison ('while-on': a maintenance switch, selectivity given up
   * only while it is on, still compared to state by how much).
   */
  selectivity: 'check' | 'while-on' | 'not-affected';
}

/** What a generator gets: the model, the bus, its present result, and an evaluator of candidate patches. */
export interface SearchContext {
  model: Model;
  busId: string;
  targetCalPerCm2: number;
  options: StudyOptions;
  /** The bus's present governing result. */
  base: BusResult;
  baseHazard: MitigationHazard;
  /** The bus's governing result with a patch applied (cached by the patch). */
  evaluate(patch: ModelPatchOp[]): BusResult;
}

/** A generator returns its proposals (usually one: the best setting it found), or why it has none. */
export type OptionGenerator = (ctx: SearchContext) => OptionProposal[] | { skipped: string };

/** Compares bands for a proposal (selectivity.ts). */
export type SelectivityCheck = (args: {
  model: Model;
  patched: Model;
  deviceId: string;
  busId: string;
  options: StudyOptions;
  mode: OptionProposal['selectivity'];
}) => Selectivity;

export interface MitigationInput {
  model: Model;
  busId: string;
  targetCalPerCm2: number;
  options: StudyOptions;
  generators: { kind: MitigationKind; generate: OptionGenerator }[];
  selectivity: SelectivityCheck;
  /** An evaluator of this model and these options to share with other searches (its results are kept); else a new one. */
  evaluator?: BusEvaluator;
}

/** Energies equal to this many cal/cm² count as unchanged at another bus (float noise of a re-run). */
const SAME_ENERGY_CAL = 1e-9;

export const MITIGATION_CAUTIONS = [
  'Each option is a model result: it must be reviewed, coordinated and sealed by a qualified (licensed) engineer before any setting or device is changed.',
  'Local codes and the facility’s electrical safety program govern. A maintenance switch or an arc-flash relay protects only when the work procedure requires it and it is in service.',
];

export function mitigateBus(input: MitigationInput): Omit<MitigationResponse, 'studyId'> {
  const { model, busId, targetCalPerCm2, options } = input;
  const busDef = model.buses.find((b) => b.id === busId);
  if (!busDef) throw new EngineError('invalid-input', 'UNKNOWN_BUS', `No bus ${busId}`, 'busId');
  if (!busDef.equipment) {
    throw new EngineError('invalid-input', 'NO_EQUIPMENT', `Bus ${busId} has no equipment: it has no label`, 'busId');
  }
  const evaluator = input.evaluator ?? new BusEvaluator(model, options);
  if (evaluator.model !== model || evaluator.options !== options)
    throw new Error('The evaluator given to mitigateBus is for another model or other options');
  const base = evaluator.bus([], busId);
  const baseHazard = hazardOf(model, base);
  const ctx: SearchContext = {
    model,
    busId,
    targetCalPerCm2,
    options,
    base,
    baseHazard,
    evaluate: (patch) => evaluator.bus(patch, busId),
  };

  const options_: MitigationOption[] = [];
  const skipped: MitigationResponse['skipped'] = [];
  for (const g of input.generators) {
    const out = g.generate(ctx);
    if (!Array.isArray(out)) {
      skipped.push({ kind: g.kind, reason: out.skipped });
      continue;
    }
    for (const p of out) {
      const [, m] = evaluator.modelFor(p.modelPatch);
      const after = evaluator.bus(p.modelPatch, busId);
      const result = hazardOf(m, after);
      options_.push({
        id: `${p.kind}:${p.variant}`,
        kind: p.kind,
        title: p.title,
        deviceId: p.deviceId,
        deviceName: p.deviceName,
        changes: p.changes,
        modelPatch: p.modelPatch,
        reachesTarget: result.incidentEnergyCalPerCm2 <= targetCalPerCm2,
        result,
        otherBuses: otherBuses(evaluator, p.modelPatch, busId),
        selectivity: input.selectivity({
          model,
          patched: m,
          deviceId: p.deviceId ?? '',
          busId,
          options,
          mode: p.selectivity,
        }),
        notes: p.notes,
      });
    }
  }
  const kept = (o: MitigationOption) =>
    ['kept', 'not-affected', 'no-downstream', 'already-lost'].includes(o.selectivity.verdict) ? 0 : 1;
  options_.sort(
    (a, b) =>
      Number(b.reachesTarget) - Number(a.reachesTarget) ||
      kept(a) - kept(b) ||
      a.result.incidentEnergyCalPerCm2 - b.result.incidentEnergyCalPerCm2,
  );
  return {
    busId,
    busName: busDef.name ?? busId,
    targetCalPerCm2,
    before: baseHazard,
    options: options_,
    skipped,
    cautions: MITIGATION_CAUTIONS,
  };
}

/**
 * Every other labelled bus whose governing energy the patched model changes, in model order. Only the buses the
 * patch can act at are evaluated (`BusEvaluator.busesActedOn`: at the others the result is the model's own); each in
 * both models (results are kept, so the base is evaluated once for all options).
 */
function otherBuses(evaluator: BusEvaluator, patch: ModelPatchOp[], busId: string) {
  const out: MitigationOption['otherBuses'] = [];
  for (const id of evaluator.busesActedOn(patch)) {
    if (id === busId) continue;
    const before = evaluator.bus([], id);
    const after = evaluator.bus(patch, id);
    const b = before.status === 'ok' ? (before.incidentEnergyCalPerCm2 ?? null) : null;
    const a = after.status === 'ok' ? (after.incidentEnergyCalPerCm2 ?? null) : null;
    if (b === a || (b !== null && a !== null && Math.abs(a - b) <= SAME_ENERGY_CAL)) continue;
    out.push({ busId: id, busName: before.busName, beforeCalPerCm2: b, afterCalPerCm2: a });
  }
  return out;
}
