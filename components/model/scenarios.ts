/**
 * Pure edits of the model's operating scenarios (docs/MODEL-FORMAT.md, Operating scenarios). The model as written is
 * the base; a scenario overrides only what it names, so every setter here writes an override only where the value
 * differs from the base and removes it when set back (an emptied override, map or list is dropped). Every function
 * returns a new value and leaves its input untouched. No React here, so all of it can be unit-tested.
 */
import { BASE_SCENARIO_ID, type ModelInput } from '../../shared/schemas/model';
import { num, uniqueId, type SourceInput, type TieInput } from './summaries';

export type ScenarioInput = NonNullable<ModelInput['scenarios']>[number];
export type SourceOverride = NonNullable<ScenarioInput['sources']>[string];
export type OverrideKind = 'sources' | 'ties' | 'motors';

export function scenariosOf(model: ModelInput): readonly ScenarioInput[] {
  return model.scenarios ?? [];
}

function withScenarios(model: ModelInput, scenarios: ScenarioInput[]): ModelInput {
  const next = { ...model };
  // A model without scenarios runs exactly as before: no empty list is left behind.
  if (scenarios.length === 0) delete next.scenarios;
  else next.scenarios = scenarios;
  return next;
}

/** A scenario id free among the model's scenarios ("base" is the model as written, never a scenario's). */
export function uniqueScenarioId(model: ModelInput, wanted = 'SC-1'): string {
  const taken = new Set(scenariosOf(model).map((s) => s.id));
  taken.add(BASE_SCENARIO_ID);
  return uniqueId(wanted, taken);
}

/** A new scenario that changes nothing yet (the engineer names it and picks what it changes). */
export function newScenario(model: ModelInput): ScenarioInput {
  return { id: uniqueScenarioId(model) };
}

export function addScenario(model: ModelInput, scenario: ScenarioInput): { model: ModelInput; index: number } {
  const list = [...scenariosOf(model), scenario];
  return { model: withScenarios(model, list), index: list.length - 1 };
}

/** A copy with a free id and "(copy)" after its name, placed right after the original. */
export function duplicateScenario(model: ModelInput, index: number): { model: ModelInput; index: number } {
  const list = [...scenariosOf(model)];
  const original = list[index];
  if (!original) return { model, index };
  const copy: ScenarioInput = {
    ...(JSON.parse(JSON.stringify(original)) as ScenarioInput),
    id: uniqueScenarioId(model, original.id || 'SC-1'),
    ...(original.name ? { name: `${original.name} (copy)` } : {}),
  };
  list.splice(index + 1, 0, copy);
  return { model: withScenarios(model, list), index: index + 1 };
}

export function deleteScenario(model: ModelInput, index: number): ModelInput {
  const list = scenariosOf(model);
  if (!list[index]) return model;
  return withScenarios(
    model,
    list.filter((_, i) => i !== index),
  );
}

export function updateScenario(
  model: ModelInput,
  index: number,
  update: (s: ScenarioInput) => ScenarioInput,
): ModelInput {
  const list = scenariosOf(model);
  const current = list[index];
  if (!current) return model;
  const next = update(current);
  if (next === current) return model;
  const copy = [...list];
  copy[index] = next;
  return withScenarios(model, copy);
}

/** The scenario's map of one kind with `id`'s override replaced (or removed when undefined); empty maps dropped. */
function withOverride<K extends OverrideKind>(
  s: ScenarioInput,
  kind: K,
  id: string,
  value: NonNullable<ScenarioInput[K]>[string] | undefined,
): ScenarioInput {
  const map = { ...(s[kind] ?? {}) } as Record<string, unknown>;
  if (value === undefined) delete map[id];
  else map[id] = value;
  const next = { ...s };
  if (Object.keys(map).length === 0) delete next[kind];
  else (next as Record<string, unknown>)[kind] = map;
  return next;
}

// ---------------------------------------------------------------------------------------------
// Sources

/** The fault level's unit of an override: the one it holds, else the base source's, else MVA. */
export function faultUnit(source: SourceInput | undefined, o: SourceOverride | undefined): 'mva' | 'ka' {
  if (o?.shortCircuitKa !== undefined && o.shortCircuitMva === undefined) return 'ka';
  if (o?.shortCircuitMva !== undefined) return 'mva';
  if (source?.kind === 'utility' && source.shortCircuitKa !== undefined && source.shortCircuitMva === undefined) {
    return 'ka';
  }
  return 'mva';
}

/** "base: 250 MVA" — a source's fault level as written, for the placeholder of its override. */
export function baseFaultText(source: SourceInput | undefined): string {
  if (source?.kind !== 'utility') return '';
  if (source.shortCircuitMva !== undefined) return `base: ${num(source.shortCircuitMva)} MVA`;
  if (source.shortCircuitKa !== undefined) return `base: ${num(source.shortCircuitKa)} kA`;
  return 'base: —';
}

function cleanSourceOverride(o: SourceOverride): SourceOverride | undefined {
  const out: SourceOverride = {};
  // In service is the base state of every source: only "out of service" is an override.
  if (o.inService === false) out.inService = false;
  if (o.shortCircuitMva !== undefined) out.shortCircuitMva = o.shortCircuitMva;
  if (o.shortCircuitKa !== undefined) out.shortCircuitKa = o.shortCircuitKa;
  if (o.xr !== undefined) out.xr = o.xr;
  return Object.keys(out).length ? out : undefined;
}

export function setSourceInService(s: ScenarioInput, sourceId: string, inService: boolean): ScenarioInput {
  const o = { ...(s.sources?.[sourceId] ?? {}) };
  if (inService) delete o.inService;
  else o.inService = false;
  return withOverride(s, 'sources', sourceId, cleanSourceOverride(o));
}

/** The scenario's fault level in `unit` (undefined: back to the base's); the other unit's value is dropped. */
export function setSourceFault(
  s: ScenarioInput,
  sourceId: string,
  unit: 'mva' | 'ka',
  value: number | undefined,
): ScenarioInput {
  const { shortCircuitMva: _m, shortCircuitKa: _k, ...rest } = s.sources?.[sourceId] ?? {};
  const o: SourceOverride = {
    ...rest,
    ...(value !== undefined ? { [unit === 'ka' ? 'shortCircuitKa' : 'shortCircuitMva']: value } : {}),
  };
  return withOverride(s, 'sources', sourceId, cleanSourceOverride(o));
}

export function setSourceXr(s: ScenarioInput, sourceId: string, xr: number | undefined): ScenarioInput {
  const { xr: _x, ...rest } = s.sources?.[sourceId] ?? {};
  return withOverride(s, 'sources', sourceId, cleanSourceOverride(xr !== undefined ? { ...rest, xr } : rest));
}

// ---------------------------------------------------------------------------------------------
// Ties and motors

export const tieBaseClosed = (t: TieInput | undefined) => t?.closed !== false;

/** The tie's state in the scenario; the base state removes the override. */
export function setTieClosed(s: ScenarioInput, tie: TieInput, closed: boolean): ScenarioInput {
  return withOverride(s, 'ties', tie.id, closed === tieBaseClosed(tie) ? undefined : { closed });
}

export function tieClosedIn(s: ScenarioInput, tie: TieInput): boolean {
  return s.ties?.[tie.id]?.closed ?? tieBaseClosed(tie);
}

/** A motor runs unless the scenario stops it; its own override wins over "all motors stopped" (as in the run). */
export function motorRunsIn(s: ScenarioInput, motorId: string): boolean {
  const o = s.motors?.[motorId];
  return o ? o.inService : s.allMotorsOff !== true;
}

/** The motor's state in the scenario; the scenario's default (running, or stopped with all motors stopped) removes the override. */
export function setMotorRunning(s: ScenarioInput, motorId: string, running: boolean): ScenarioInput {
  const byDefault = s.allMotorsOff !== true;
  return withOverride(s, 'motors', motorId, running === byDefault ? undefined : { inService: running });
}

export function setAllMotorsOff(s: ScenarioInput, off: boolean): ScenarioInput {
  const next = { ...s };
  if (off) next.allMotorsOff = true;
  else delete next.allMotorsOff;
  return next;
}

/** Removes everything the scenario says about one element (back to the base). */
export function clearOverride(s: ScenarioInput, kind: OverrideKind, id: string): ScenarioInput {
  return s[kind]?.[id] === undefined ? s : withOverride(s, kind, id, undefined);
}

// ---------------------------------------------------------------------------------------------
// References: an element renamed or deleted elsewhere in the editor

const OVERRIDE_KIND: Partial<Record<string, OverrideKind>> = { sources: 'sources', ties: 'ties', motors: 'motors' };

/** The scenarios with the overrides of `kind` id `oldId` moved to `newId` (order of the map kept). */
export function renameInScenarios(model: ModelInput, collection: string, oldId: string, newId: string): ModelInput {
  const kind = OVERRIDE_KIND[collection];
  const list = model.scenarios;
  if (!kind || !list || oldId === newId) return model;
  let changed = false;
  const next = list.map((s) => {
    const map = s[kind];
    if (!map || !(oldId in map) || newId in map) return s;
    changed = true;
    const renamed = Object.fromEntries(Object.entries(map).map(([k, v]) => [k === oldId ? newId : k, v]));
    return { ...s, [kind]: renamed };
  });
  return changed ? { ...model, scenarios: next } : model;
}

/** The scenarios without the overrides of element `id` of `kind`. */
export function removeFromScenarios(model: ModelInput, collection: string, id: string): ModelInput {
  const kind = OVERRIDE_KIND[collection];
  const list = model.scenarios;
  if (!kind || !list) return model;
  let changed = false;
  const next = list.map((s) => {
    if (s[kind]?.[id] === undefined) return s;
    changed = true;
    return withOverride(s, kind, id, undefined);
  });
  return changed ? { ...model, scenarios: next } : model;
}

/** How many scenarios say something about element `id` of `kind`. */
export function scenariosNaming(model: ModelInput, collection: string, id: string): number {
  const kind = OVERRIDE_KIND[collection];
  if (!kind) return 0;
  return scenariosOf(model).filter((s) => s[kind]?.[id] !== undefined).length;
}

// ---------------------------------------------------------------------------------------------
// In words

/**
 * What a scenario changes, in one line: "UTIL-1 150 MVA, X/R 8 · GEN-1 out of service · TIE-1 closed · all motors
 * stopped". Overrides that change nothing against the base are left out; "Same as the base" when nothing is left.
 */
export function scenarioChanges(model: ModelInput, s: ScenarioInput): string[] {
  const parts: string[] = [];
  const sources = new Map((model.sources ?? []).map((x) => [x.id, x] as const));
  for (const [id, o] of Object.entries(s.sources ?? {})) {
    if (o.inService === false) {
      parts.push(`${id} out of service`);
      continue;
    }
    const bits: string[] = [];
    if (o.shortCircuitMva !== undefined) bits.push(`${num(o.shortCircuitMva)} MVA`);
    if (o.shortCircuitKa !== undefined) bits.push(`${num(o.shortCircuitKa)} kA`);
    if (o.xr !== undefined) bits.push(`X/R ${num(o.xr)}`);
    if (bits.length) parts.push(`${id} ${bits.join(', ')}`);
    if (!sources.has(id) && !bits.length) parts.push(`${id} in service`);
  }
  const ties = new Map((model.ties ?? []).map((t) => [t.id, t] as const));
  for (const [id, o] of Object.entries(s.ties ?? {})) {
    const t = ties.get(id);
    if (t && o.closed === tieBaseClosed(t)) continue;
    parts.push(`${id} ${o.closed ? 'closed' : 'open'}`);
  }
  const byDefault = s.allMotorsOff !== true;
  const running: string[] = [];
  const stopped: string[] = [];
  for (const [id, o] of Object.entries(s.motors ?? {})) {
    if (o.inService === byDefault) continue;
    (o.inService ? running : stopped).push(id);
  }
  if (stopped.length) parts.push(`${stopped.join(', ')} stopped`);
  if (s.allMotorsOff) parts.push('all motors stopped');
  if (running.length) parts.push(`${running.join(', ')} running`);
  return parts;
}

export function scenarioSummary(model: ModelInput, s: ScenarioInput): string {
  const parts = scenarioChanges(model, s);
  return parts.length ? parts.join(' · ') : 'Same as the base (changes nothing yet)';
}

/** The ids a scenario names that are not (or no longer) elements of their kind in the model. */
export function unknownOverrides(model: ModelInput, s: ScenarioInput): { kind: OverrideKind; id: string }[] {
  const known: Record<OverrideKind, Set<string>> = {
    sources: new Set((model.sources ?? []).map((x) => x.id)),
    ties: new Set((model.ties ?? []).map((x) => x.id)),
    motors: new Set((model.motors ?? []).map((x) => x.id)),
  };
  const out: { kind: OverrideKind; id: string }[] = [];
  for (const kind of ['sources', 'ties', 'motors'] as const) {
    for (const id of Object.keys(s[kind] ?? {})) if (!known[kind].has(id)) out.push({ kind, id });
  }
  return out;
}
