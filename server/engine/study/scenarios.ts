import { plausibilityWarnings } from '../../../shared/modelPlausibility';
import { BASE_SCENARIO_ID, type Model, type Scenario, type Source } from '../../../shared/schemas/model';
import type { BusResult, BusScenario, StudyResults } from '../../../shared/schemas/studyResults';
import type { ShortCircuitSolver } from '../shortcircuit';
import { createStudyRunner, type StudyOptions, type StudyRunner } from './runStudy';

/**
 * Operating scenarios (docs/MODEL-FORMAT.md, Operating scenarios). The model as written is the base; each scenario
 * overrides only what it names (sources in or out of service and their fault level and X/R, ties open or closed,
 * motors running or stopped). A run evaluates the base and every scenario at every labelled bus, and the bus's result
 * — the label — is the scenario with the highest incident energy: a lower fault current often means a slower device
 * and more energy, so no single state may be assumed to be the worst.
 */

export const BASE_SCENARIO_NAME = 'Model as written';

/** A scenario applied to the model: the model the engine runs, and the buses no source reaches in it. */
export interface AppliedScenario {
  id: string;
  name: string;
  model: Model;
  /** Buses left without any in-service source (their elements are removed from `model`). */
  deEnergizedBusIds: Set<string>;
}

function withSourceOverride(source: Source, o: NonNullable<Scenario['sources']>[string] | undefined): Source {
  if (!o) return source;
  if (source.kind === 'generator') return o.xr === undefined ? source : { ...source, xr: o.xr };
  const out = { ...source };
  if (o.shortCircuitMva !== undefined) {
    out.shortCircuitMva = o.shortCircuitMva;
    delete out.shortCircuitKa;
  } else if (o.shortCircuitKa !== undefined) {
    out.shortCircuitKa = o.shortCircuitKa;
    delete out.shortCircuitMva;
  }
  if (o.xr !== undefined) out.xr = o.xr;
  return out;
}

/**
 * The model of one scenario: overrides applied, sources and motors out of service removed with the devices placed on
 * them, and the buses no in-service source reaches removed with everything connected to them (they are skipped, with
 * a note, for this scenario). The model must be valid (`parseModel`); the result carries no scenarios.
 */
export function applyScenario(model: Model, scenario: Scenario): AppliedScenario {
  const sourceOff = (id: string) => scenario.sources?.[id]?.inService === false;
  const motorOff = (id: string) => {
    const o = scenario.motors?.[id];
    // A motor's own override wins over allMotorsOff.
    return o ? !o.inService : scenario.allMotorsOff === true;
  };
  const tieClosed = (t: Model['ties'][number]) => scenario.ties?.[t.id]?.closed ?? t.closed !== false;

  const sources = model.sources
    .filter((s) => !sourceOff(s.id))
    .map((s) => withSourceOverride(s, scenario.sources?.[s.id]));
  const motors = model.motors.filter((m) => !motorOff(m.id));
  const ties = model.ties.map((t) => (tieClosed(t) === (t.closed !== false) ? t : { ...t, closed: tieClosed(t) }));

  // Buses reached from an in-service source through transformers, cables and closed ties.
  const adjacent = new Map<string, string[]>();
  const link = (a: string, b: string) => {
    (adjacent.get(a) ?? adjacent.set(a, []).get(a)!).push(b);
    (adjacent.get(b) ?? adjacent.set(b, []).get(b)!).push(a);
  };
  for (const t of model.transformers) link(t.fromBus, t.toBus);
  for (const c of model.cables) link(c.fromBus, c.toBus);
  for (const t of ties) if (t.closed !== false) link(t.fromBus, t.toBus);
  const energized = new Set<string>();
  const stack = sources.map((s) => s.bus);
  while (stack.length) {
    const bus = stack.pop()!;
    if (energized.has(bus)) continue;
    energized.add(bus);
    for (const next of adjacent.get(bus) ?? []) if (!energized.has(next)) stack.push(next);
  }
  const deEnergizedBusIds = new Set(model.buses.filter((b) => !energized.has(b.id)).map((b) => b.id));
  const live = (bus: string) => !deEnergizedBusIds.has(bus);
  const liveBranch = (b: { fromBus: string; toBus: string }) => live(b.fromBus) && live(b.toBus);

  const transformers = model.transformers.filter(liveBranch);
  const cables = model.cables.filter(liveBranch);
  const liveTies = ties.filter(liveBranch);
  const liveMotors = motors.filter((m) => live(m.bus));
  const keptBranches = new Set([...transformers, ...cables, ...liveTies].map((b) => b.id));
  const keptInjections = new Set([...sources.map((s) => s.id), ...liveMotors.map((m) => m.id)]);
  const devices = model.devices.filter((d) =>
    d.branch !== undefined ? keptBranches.has(d.branch) : d.source !== undefined && keptInjections.has(d.source),
  );

  const out: Model = {
    ...model,
    buses: model.buses.filter((b) => live(b.id)),
    sources,
    transformers,
    cables,
    motors: liveMotors,
    ties: liveTies,
    devices,
  };
  delete out.scenarios;
  return { id: scenario.id, name: scenario.name ?? scenario.id, model: out, deEnergizedBusIds };
}

/** The base and every scenario of the model, base first. */
export function scenariosOf(model: Model): AppliedScenario[] {
  const base: Model = { ...model };
  delete base.scenarios;
  return [
    { id: BASE_SCENARIO_ID, name: BASE_SCENARIO_NAME, model: base, deEnergizedBusIds: new Set() },
    ...(model.scenarios ?? []).map((s) => applyScenario(model, s)),
  ];
}

function summarize(id: string, name: string, r: BusResult): BusScenario {
  if (r.status === 'error') {
    return { scenarioId: id, name, status: 'error', note: r.error?.message, boltedFaultKa: r.boltedFaultKa };
  }
  const g = r.cases.find((c) => c.arcCase === r.governing?.arcCase && c.location === r.governing?.location);
  return {
    scenarioId: id,
    name,
    status: 'ok',
    boltedFaultKa: r.boltedFaultKa,
    arcingCurrentKa: r.arcingCurrentKa,
    governing: r.governing,
    arcDurationS: r.arcDurationS,
    clearingDeviceId: r.clearingDeviceId ?? null,
    clearingRegion: g?.clearingRegion ?? null,
    incidentEnergyJPerCm2: r.incidentEnergyJPerCm2,
    incidentEnergyCalPerCm2: r.incidentEnergyCalPerCm2,
    arcFlashBoundaryMm: r.arcFlashBoundaryMm,
  };
}

const DE_ENERGIZED_NOTE = 'De-energized in this scenario: no source in service reaches the bus (skipped)';

const fmt = (x: number | undefined) => (x === undefined ? '—' : x.toPrecision(3));

/**
 * Short-circuit solvers shared by the runners of models with one network: `solvers[k]` is the solver of scenario k of
 * `scenariosOf(model)` (base first). For copies of a model that differ only by protective devices or bus equipment
 * (the mitigation search's patched models), already validated: the network, and so the factorization, is the same.
 */
export interface SharedNetwork {
  solvers: readonly ShortCircuitSolver[];
}

/**
 * The study runner over every scenario (the same interface as one scenario's): `runBus` evaluates the bus in the base
 * and in each scenario and returns the governing one — the highest incident energy, or, when any scenario fails at the
 * bus, that failure (the worst case is then unknown, so no number is given). A model without scenarios gets the plain
 * runner, and its results are exactly as before scenarios existed.
 */
export function createScenarioRunner(
  model: Model,
  options: StudyOptions = {},
  network?: SharedNetwork,
): StudyRunner & { evaluations: number } {
  // Plausibility warnings of the model (a wrong unit, a slipped decimal point) go with the run's own warnings.
  const implausible = plausibilityWarnings(model).map((w) => ({
    code: 'IMPLAUSIBLE_VALUE',
    message: `${w.path}: ${w.message}`,
  }));
  const withImplausible = (r: StudyResults): StudyResults =>
    implausible.length ? { ...r, warnings: [...r.warnings, ...implausible] } : r;
  if (!model.scenarios?.length) {
    const plain = createStudyRunner(model, options, { solver: network?.solvers[0] });
    return {
      busIds: plain.busIds,
      shortCircuitWarnings: plain.shortCircuitWarnings,
      evaluations: 1,
      runBus: plain.runBus,
      get work() {
        return plain.work;
      },
      finish: (buses) => withImplausible(plain.finish(buses)),
    };
  }
  const applied = scenariosOf(model);
  const runners = applied.map((a, k) => createStudyRunner(a.model, options, { solver: network?.solvers[k] }));
  const base = runners[0];

  function runBus(busId: string): BusResult {
    const results: { a: AppliedScenario; r: BusResult | null }[] = applied.map((a, k) => ({
      a,
      r: a.deEnergizedBusIds.has(busId) ? null : runners[k].runBus(busId),
    }));
    const scenarios: BusScenario[] = results.map(({ a, r }) =>
      r
        ? summarize(a.id, a.name, r)
        : { scenarioId: a.id, name: a.name, status: 'de-energized', note: DE_ENERGIZED_NOTE },
    );
    const failed = results.find(({ r }) => r?.status === 'error');
    if (failed) {
      const r = failed.r!;
      const error = r.error && {
        code: r.error.code,
        message: failed.a.id === BASE_SCENARIO_ID ? r.error.message : `Scenario "${failed.a.name}": ${r.error.message}`,
      };
      return { ...r, error, scenarioId: failed.a.id, scenarios };
    }
    let governing = results[0];
    for (const x of results) {
      if (x.r && (x.r.incidentEnergyJPerCm2 ?? 0) > (governing.r?.incidentEnergyJPerCm2 ?? 0)) governing = x;
    }
    const r = governing.r!;
    const warnings = [...r.warnings];
    if (governing.a.id !== BASE_SCENARIO_ID) {
      warnings.push({
        code: 'SCENARIO_GOVERNS',
        message: `Scenario "${governing.a.name}" gives the highest incident energy at ${busId}: ${fmt(r.incidentEnergyCalPerCm2)} cal/cm² against ${fmt(results[0].r?.incidentEnergyCalPerCm2)} cal/cm² with the model as written. The label takes it.`,
      });
    }
    return { ...r, warnings, scenarioId: governing.a.id, scenarios };
  }

  return {
    busIds: base.busIds,
    shortCircuitWarnings: base.shortCircuitWarnings,
    evaluations: applied.length,
    runBus,
    get work() {
      const w = { faults: 0, nodeVisits: 0, elementVisits: 0, pictureVisits: 0 };
      for (const r of runners) for (const k of Object.keys(w) as (keyof typeof w)[]) w[k] += r.work[k];
      return w;
    },
    finish: (buses): StudyResults => {
      const seen = new Set<string>();
      const warnings = runners.flatMap((r, k) =>
        r.shortCircuitWarnings
          .map((w) => (k === 0 ? w : { code: w.code, message: `Scenario "${applied[k].name}": ${w.message}` }))
          .filter((w) => !seen.has(w.code + w.message) && seen.add(w.code + w.message)),
      );
      return withImplausible({
        ...base.finish(buses),
        warnings,
        scenarios: applied.map((a) => ({ id: a.id, name: a.name })),
      });
    },
  };
}

/** All buses at once, in the base and every scenario (tests, benchmarks). */
export function runStudy(model: Model, options: StudyOptions = {}): StudyResults {
  const runner = createScenarioRunner(model, options);
  return runner.finish(runner.busIds.map((id) => runner.runBus(id)));
}
