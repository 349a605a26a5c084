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
import type { Model } from '../../../shared/schemas/model';
import type { BusResult } from '../../../shared/schemas/studyResults';
import { EngineError } from '../errors';
import { createScenarioRunner, type StudyOptions } from '../study';

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

/** Evaluates buses of a model, runner built once per model (the short-circuit factorization is the costly part). */
export class BusEvaluator {
  private readonly runners = new Map<string, ReturnType<typeof createScenarioRunner>>();
  private readonly results = new Map<string, BusResult>();

  constructor(private readonly options: StudyOptions) {}

  /** The governing result of `busId` in `model` (`key` names the model: the patch's JSON; '' for the base). */
  bus(key: string, model: Model, busId: string): BusResult {
    const k = `${key}\u0000${busId}`;
    const hit = this.results.get(k);
    if (hit) return hit;
    let runner = this.runners.get(key);
    if (!runner) {
      runner = createScenarioRunner(model, this.options);
      this.runners.set(key, runner);
    }
    const r = runner.runBus(busId);
    this.results.set(k, r);
    return r;
  }

  labelledBusIds(key: string, model: Model): string[] {
    let runner = this.runners.get(key);
    if (!runner) {
      runner = createScenarioRunner(model, this.options);
      this.runners.set(key, runner);
    }
    return runner.busIds;
  }
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
  const evaluator = new BusEvaluator(options);
  const base = evaluator.bus('', model, busId);
  const baseHazard = hazardOf(model, base);
  const patched = new Map<string, Model>();
  const modelFor = (patch: ModelPatchOp[]): [string, Model] => {
    const key = JSON.stringify(patch);
    let m = patched.get(key);
    if (!m) {
      m = applyModelPatch(model, patch);
      patched.set(key, m);
    }
    return [key, m];
  };
  const ctx: SearchContext = {
    model,
    busId,
    targetCalPerCm2,
    options,
    base,
    baseHazard,
    evaluate: (patch) => {
      const [key, m] = modelFor(patch);
      return evaluator.bus(key, m, busId);
    },
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
      const [key, m] = modelFor(p.modelPatch);
      const after = evaluator.bus(key, m, busId);
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
        otherBuses: otherBuses(evaluator, model, key, m, busId),
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
 * Every other labelled bus whose governing energy the patched model changes. Each is evaluated in both models
 * (results are cached, so the base is evaluated once for all options).
 */
function otherBuses(evaluator: BusEvaluator, model: Model, key: string, patched: Model, busId: string) {
  const out: MitigationOption['otherBuses'] = [];
  for (const id of evaluator.labelledBusIds('', model)) {
    if (id === busId) continue;
    const before = evaluator.bus('', model, id);
    const after = evaluator.bus(key, patched, id);
    const b = before.status === 'ok' ? (before.incidentEnergyCalPerCm2 ?? null) : null;
    const a = after.status === 'ok' ? (after.incidentEnergyCalPerCm2 ?? null) : null;
    if (b === a || (b !== null && a !== null && Math.abs(a - b) <= SAME_ENERGY_CAL)) continue;
    out.push({ busId: id, busName: before.busName, beforeCalPerCm2: b, afterCalPerCm2: a });
  }
  return out;
}
