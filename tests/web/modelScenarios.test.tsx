/**
 * The model editor's operating scenarios: the pure edits (components/model/scenarios.ts, and the id renames and
 * deletes of components/model/edit.ts that the scenarios follow), and what the Scenarios section says when rendered
 * to HTML. The rules checked are those of the model format for scenarios (issue 19, "Operating scenarios": a scenario
 * overrides only what it names — a source's inService, shortCircuitMva or shortCircuitKa, xr; a tie's closed; a
 * motor's inService; allMotorsOff — and unknown ids are model issues with their path), and the run's reading of them
 * in server/engine/study/scenarios.ts (a motor's own override wins over allMotorsOff). Every model here is invented.
 */
import React from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { parseModel, type ModelInput } from '../../shared/schemas/model';
import { deleteElement, renameElement } from '../../components/model/edit';
import {
  addScenario,
  clearOverride,
  deleteScenario,
  duplicateScenario,
  motorRunsIn,
  newScenario,
  scenarioSummary,
  setAllMotorsOff,
  setMotorRunning,
  setSourceFault,
  setSourceInService,
  setSourceXr,
  setTieClosed,
  tieClosedIn,
  unknownOverrides,
  updateScenario,
  type ScenarioInput,
} from '../../components/model/scenarios';
import { groupIssues, issuePlace } from '../../components/model/summaries';
import { ScenariosSection } from '../../components/model/editor/ScenariosSection';

/** A double-ended substation (invented): two utilities, a normally open tie, a generator and two motors. */
function plant(): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    buses: [
      { id: 'SWGR-A', nominalKv: 0.48, equipment: { class: 'switchgear-lv' } },
      { id: 'SWGR-B', nominalKv: 0.48, equipment: { class: 'switchgear-lv' } },
    ],
    sources: [
      { id: 'UTIL-1', kind: 'utility', bus: 'SWGR-A', shortCircuitMva: 250, xr: 15 },
      { id: 'UTIL-2', kind: 'utility', bus: 'SWGR-B', shortCircuitKa: 30, xr: 12 },
      { id: 'GEN-1', kind: 'generator', bus: 'SWGR-B', kva: 500, kv: 0.48, subtransientPct: 15, xr: 20 },
    ],
    motors: [
      { id: 'M-1', bus: 'SWGR-A', hp: 100, kv: 0.46 },
      { id: 'M-2', bus: 'SWGR-B', hp: 75, kv: 0.46 },
    ],
    ties: [{ id: 'TIE-1', fromBus: 'SWGR-A', toBus: 'SWGR-B', closed: false }],
  };
}

const tie = (m: ModelInput) => m.ties![0];
const sc = (m: ModelInput, i = 0) => m.scenarios![i];
const empty: ScenarioInput = { id: 'util-min', name: 'Utility minimum' };

describe('scenario list', () => {
  it('adds scenarios with free ids, never "base"; the model stays valid and the base untouched', () => {
    const m0 = plant();
    const a = addScenario(m0, newScenario(m0));
    const b = addScenario(a.model, newScenario(a.model));
    expect(b.index).toBe(1);
    expect(b.model.scenarios!.map((s) => s.id)).toEqual(['SC-1', 'SC-2']);
    expect(m0.scenarios).toBeUndefined(); // the input is left as it was
    expect(parseModel(b.model).success).toBe(true);
    // "base" is the model as written (the schema refuses it as a scenario id): a new id steps past it.
    const withBase = { ...m0, scenarios: [{ id: 'base' }] } as ModelInput;
    expect(newScenario(withBase).id).not.toBe('base');
  });

  it('duplicates after the original with a free id and "(copy)", overrides deep-copied', () => {
    const m = { ...plant(), scenarios: [{ ...empty, sources: { 'UTIL-1': { xr: 8 } } }, { id: 'other' }] };
    const r = duplicateScenario(m, 0);
    expect(r.index).toBe(1);
    expect(r.model.scenarios!.map((s) => s.id)).toEqual(['util-min', 'util-min-2', 'other']);
    expect(sc(r.model, 1).name).toBe('Utility minimum (copy)');
    expect(sc(r.model, 1).sources).toEqual({ 'UTIL-1': { xr: 8 } });
    expect(sc(r.model, 1).sources).not.toBe(sc(r.model, 0).sources);
  });

  it('deleting the last scenario drops the list (a model without scenarios runs as before)', () => {
    const m = { ...plant(), scenarios: [empty] };
    const after = deleteScenario(m, 0);
    expect('scenarios' in after).toBe(false);
    expect(deleteScenario(m, 5)).toBe(m);
  });
});

describe('overrides: written only where they differ from the base, cleared back to it', () => {
  const edit = (update: (s: ScenarioInput) => ScenarioInput, s: ScenarioInput = empty) => update(s);

  it('a source out of service, then back in service, leaves nothing', () => {
    const out = edit((s) => setSourceInService(s, 'UTIL-1', false));
    expect(out.sources).toEqual({ 'UTIL-1': { inService: false } });
    expect(edit((s) => setSourceInService(s, 'UTIL-1', true), out)).toEqual(empty);
  });

  it('the fault level in one unit replaces the other (the schema accepts one of them); cleared: back to base', () => {
    const mva = edit((s) => setSourceFault(s, 'UTIL-1', 'mva', 150));
    expect(mva.sources).toEqual({ 'UTIL-1': { shortCircuitMva: 150 } });
    const ka = edit((s) => setSourceFault(s, 'UTIL-1', 'ka', 18), mva);
    expect(ka.sources).toEqual({ 'UTIL-1': { shortCircuitKa: 18 } });
    const both = edit((s) => setSourceXr(s, 'UTIL-1', 8), ka);
    expect(both.sources).toEqual({ 'UTIL-1': { shortCircuitKa: 18, xr: 8 } });
    const noFault = edit((s) => setSourceFault(s, 'UTIL-1', 'ka', undefined), both);
    expect(noFault.sources).toEqual({ 'UTIL-1': { xr: 8 } });
    expect(edit((s) => setSourceXr(s, 'UTIL-1', undefined), noFault)).toEqual(empty);
  });

  it('a tie set to its own base state writes nothing; the other state is the override', () => {
    const m = plant(); // TIE-1 is open as written
    const closed = setTieClosed(empty, tie(m), true);
    expect(closed.ties).toEqual({ 'TIE-1': { closed: true } });
    expect(tieClosedIn(closed, tie(m))).toBe(true);
    expect(setTieClosed(closed, tie(m), false)).toEqual(empty);
    expect(tieClosedIn(empty, tie(m))).toBe(false);
  });

  it('motors: stopped is the override while motors run; with all motors stopped, running is', () => {
    const stopped = setMotorRunning(empty, 'M-1', false);
    expect(stopped.motors).toEqual({ 'M-1': { inService: false } });
    expect(setMotorRunning(stopped, 'M-1', true)).toEqual(empty);
    const allOff = setAllMotorsOff(empty, true);
    expect(allOff.allMotorsOff).toBe(true);
    expect(motorRunsIn(allOff, 'M-2')).toBe(false);
    // A motor's own override wins over allMotorsOff (server/engine/study/scenarios.ts, applyScenario).
    const oneRuns = setMotorRunning(allOff, 'M-2', true);
    expect(oneRuns.motors).toEqual({ 'M-2': { inService: true } });
    expect(motorRunsIn(oneRuns, 'M-2')).toBe(true);
    expect(setMotorRunning(oneRuns, 'M-2', false)).toEqual(allOff);
    expect('allMotorsOff' in setAllMotorsOff(allOff, false)).toBe(false);
  });

  it('clearOverride takes one element back to the base and keeps the rest', () => {
    const s: ScenarioInput = { ...empty, sources: { 'UTIL-1': { xr: 8 }, 'GEN-1': { inService: false } } };
    expect(clearOverride(s, 'sources', 'UTIL-1').sources).toEqual({ 'GEN-1': { inService: false } });
    expect(clearOverride(clearOverride(s, 'sources', 'UTIL-1'), 'sources', 'GEN-1')).toEqual(empty);
  });

  it('an edited scenario stays valid against the model schema and checks', () => {
    let m: ModelInput = { ...plant(), scenarios: [empty] };
    m = updateScenario(m, 0, (s) => setSourceInService(s, 'UTIL-1', false));
    m = updateScenario(m, 0, (s) => setSourceFault(s, 'UTIL-2', 'mva', 150));
    m = updateScenario(m, 0, (s) => setTieClosed(s, tie(m), true));
    m = updateScenario(m, 0, (s) => setMotorRunning(s, 'M-1', false));
    const r = parseModel(m);
    expect(r.issues).toEqual([]);
  });
});

describe('renames and deletes elsewhere in the editor', () => {
  const withOverrides = (): ModelInput => ({
    ...plant(),
    scenarios: [
      {
        id: 'gen-only',
        sources: { 'UTIL-1': { inService: false }, 'UTIL-2': { inService: false } },
        ties: { 'TIE-1': { closed: true } },
        motors: { 'M-1': { inService: false } },
      },
      { id: 'min', sources: { 'UTIL-1': { shortCircuitMva: 150 } } },
    ],
  });

  it('a renamed source, tie or motor keeps its overrides under the new id, in map order', () => {
    let m = withOverrides();
    m = renameElement(m, 'sources', 0, 'UTIL-N');
    m = renameElement(m, 'ties', 0, 'TIE-N');
    m = renameElement(m, 'motors', 0, 'M-N');
    expect(Object.keys(sc(m).sources!)).toEqual(['UTIL-N', 'UTIL-2']);
    expect(sc(m).ties).toEqual({ 'TIE-N': { closed: true } });
    expect(sc(m).motors).toEqual({ 'M-N': { inService: false } });
    expect(sc(m, 1).sources).toEqual({ 'UTIL-N': { shortCircuitMva: 150 } });
    expect(parseModel(m).issues).toEqual([]);
  });

  it('a rename onto an id already taken moves nothing (as for the other references)', () => {
    const m = renameElement(withOverrides(), 'sources', 0, 'UTIL-2');
    expect(Object.keys(sc(m).sources!)).toEqual(['UTIL-1', 'UTIL-2']);
  });

  it('a deleted source, tie or motor takes its overrides with it; other scenarios and elements keep theirs', () => {
    let m = deleteElement(withOverrides(), 'sources', 0);
    expect(sc(m).sources).toEqual({ 'UTIL-2': { inService: false } });
    expect('sources' in sc(m, 1)).toBe(false);
    m = deleteElement(m, 'ties', 0);
    expect('ties' in sc(m)).toBe(false);
    m = deleteElement(m, 'motors', 0);
    expect('motors' in sc(m)).toBe(false);
    expect(unknownOverrides(m, sc(m))).toEqual([]);
  });

  it('overrides of an id no element has any more are found, and their issue lands on the scenario', () => {
    const m = withOverrides();
    const stale: ModelInput = { ...m, sources: m.sources!.filter((s) => s.id !== 'UTIL-1') };
    expect(unknownOverrides(stale, sc(stale))).toEqual([{ kind: 'sources', id: 'UTIL-1' }]);
    const r = parseModel(stale);
    expect(r.success).toBe(false);
    const g = groupIssues(r.issues, stale);
    const li = g.byElement.get('scenarios[0]')!.find((x) => x.field === 'sources.UTIL-1')!;
    expect(li).toBeDefined();
    expect(g.byCollection.scenarios).toBeGreaterThanOrEqual(2); // both scenarios name UTIL-1
    expect(issuePlace(li, stale)).toBe('Scenarios · gen-only · UTIL-1');
  });
});

describe('in words', () => {
  it('one line of what a scenario changes; "same as the base" when nothing', () => {
    const m = plant();
    const s: ScenarioInput = {
      id: 'x',
      sources: { 'UTIL-1': { inService: false }, 'UTIL-2': { shortCircuitMva: 150, xr: 8 } },
      ties: { 'TIE-1': { closed: true } },
      motors: { 'M-1': { inService: false } },
      allMotorsOff: false,
    };
    expect(scenarioSummary(m, s)).toBe('UTIL-1 out of service · UTIL-2 150 MVA, X/R 8 · TIE-1 closed · M-1 stopped');
    expect(scenarioSummary(m, { id: 'y', allMotorsOff: true })).toBe('all motors stopped');
    expect(scenarioSummary(m, { id: 'z' })).toMatch(/^Same as the base/);
    // An override equal to the base (e.g. imported) is no change.
    expect(scenarioSummary(m, { id: 'w', ties: { 'TIE-1': { closed: false } } })).toMatch(/^Same as the base/);
  });
});

describe('the Scenarios section', () => {
  const decode = (s: string) =>
    s
      .replace(/&lt;/g, '<')
      .replace(/&gt;/g, '>')
      .replace(/&quot;/g, '"')
      .replace(/&#x27;|&#39;/g, "'")
      .replace(/&amp;/g, '&');
  const render = (model: ModelInput, wide: boolean) => {
    const r = parseModel(model);
    const grouped = groupIssues(r.success ? [] : r.issues, model);
    return decode(
      renderToStaticMarkup(
        <ScenariosSection
          model={model}
          grouped={grouped}
          editable
          wide={wide}
          commit={() => undefined}
          latest={() => model}
          focus={null}
          onDeleted={() => undefined}
        />,
      ),
    );
  };

  it('wide: the chosen scenario shows every source, tie and motor with its base value as placeholder', () => {
    const m: ModelInput = {
      ...plant(),
      scenarios: [{ id: 'util-min', name: 'Utility minimum', sources: { 'UTIL-1': { shortCircuitMva: 150 } } }],
    };
    const html = render(m, true);
    expect(html).toContain('Utility minimum');
    expect(html).toContain('UTIL-1 150 MVA');
    expect(html).toContain('placeholder="base: 250 MVA"');
    expect(html).toContain('placeholder="base: 30 kA"'); // UTIL-2 is written in kA
    expect(html).toContain('placeholder="base: 15"');
    expect(html).toContain('value="150"');
    expect(html).toContain('base: open'); // TIE-1 as written
    expect(html).toContain('data-testid="scenario-motor-M-2-state"');
  });

  it('an override of a deleted element is listed with its issue and a Remove button', () => {
    const m: ModelInput = { ...plant(), scenarios: [{ id: 'old', sources: { 'UTIL-9': { inService: false } } }] };
    const html = render(m, true);
    expect(html).toContain('Not in the model');
    expect(html).toContain('unknown source "UTIL-9"');
    expect(html).toContain('data-testid="scenario-orphan-sources-UTIL-9-remove"');
  });

  it('a generator given a fault level shows the issue at that field', () => {
    const m: ModelInput = { ...plant(), scenarios: [{ id: 'bad', sources: { 'GEN-1': { shortCircuitMva: 10 } } }] };
    const html = render(m, true);
    expect(html).toContain('A fault level applies to a utility only: generator "GEN-1"');
  });

  it('a long motor list gets a search box; a short one does not', () => {
    const few: ModelInput = { ...plant(), scenarios: [{ id: 'a' }] };
    expect(render(few, true)).not.toContain('placeholder="Find motors"');
    const motors = Array.from({ length: 9 }, (_, i) => ({ id: `P-${i + 1}`, bus: 'SWGR-A', hp: 50, kv: 0.46 }));
    const many: ModelInput = { ...plant(), motors, scenarios: [{ id: 'a' }] };
    expect(render(many, true)).toContain('placeholder="Find motors"');
  });

  it('phone: cards closed until one is chosen, each with its summary', () => {
    const m: ModelInput = { ...plant(), scenarios: [{ id: 'gen', sources: { 'UTIL-1': { inService: false } } }] };
    const html = render(m, false);
    expect(html).toContain('data-testid="card-scenarios-0"');
    expect(html).toContain('UTIL-1 out of service');
    expect(html).not.toContain('data-testid="scenario-detail-0"');
  });
});
