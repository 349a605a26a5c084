/**
 * Results of a study with operating scenarios, one bus at a time (GET /studies/:id/results/buses/:busId?scenario=…)
 * and in pages filtered by the governing scenario. The trace of each scenario served by the route is checked against
 * an independent path through the engine for the same numbers: the scenario applied to the run's model
 * (`applyScenario`) and the whole study run on that model (`runStudy`) with the run's settings. The governing
 * scenario's trace is the stored one. Every response is checked against its schema by the test app.
 */
import request from 'supertest';
import { BASE_SCENARIO_ID, type Model, type ModelInput } from '../../shared/schemas/model';
import type { BusResult } from '../../shared/schemas/studyResults';
import { StudyRun } from '../../server/db/models';
import { applyScenario, runStudy, type StudyOptions } from '../../server/engine/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { clearResultsCache } from '../../server/services/results';
import { clearScenarioRunners, scenarioBusResult } from '../../server/services/scenarioBus';
import { scenarioBusOffThread, studyWorkerCounts } from '../../server/services/studyWorker';
import { draftStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let studyId: string;
let model: Model;
let options: StudyOptions;

const SCENARIOS = [
  { id: 'util-min', name: 'Utility minimum', sources: { UTIL: { shortCircuitMva: 60 } } },
  { id: 'gen-only', name: 'Standby generator only', sources: { UTIL: { inService: false } } },
  { id: 'tie-open', name: 'Spare panel tie open', ties: { 'TIE-9': { closed: false } } },
];

/** The demo plant with a spare panel fed only through a tie (dead when the tie is open) and the scenarios above. */
function scenarioModel(): ModelInput {
  const m = larkspurModel();
  return {
    ...m,
    buses: [
      ...m.buses,
      { id: 'PP-9', name: 'Spare panel', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-shallow' } },
    ],
    ties: [...(m.ties ?? []), { id: 'TIE-9', name: 'Spare panel tie', fromBus: 'PP-1', toBus: 'PP-9', closed: true }],
    scenarios: SCENARIOS,
  };
}

beforeAll(async () => {
  t = await makeTestApp();
  const input = scenarioModel();
  studyId = await draftStudy(t, 'Scenario results site', 'Scenario study', input);
  const run = await request(t.app)
    .post(`/api/studies/${studyId}/run`)
    .set(...bearer(t.orgA.users.engineer.token));
  expect(run.status).toBe(202);
  await t.ctx.jobs.idle();
  const stored = (await StudyRun.findByPk(run.body.id as string))!;
  expect(stored.status).toBe('done');
  // The run's own inputs, as stored when it started: the model snapshot and the settings snapshot.
  model = JSON.parse(stored.modelSnapshot) as Model;
  options = JSON.parse(stored.settingsSnapshot) as StudyOptions;
}, 120_000);
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);

function getBus(busId: string, scenario?: string) {
  const q = scenario === undefined ? '' : `?scenario=${encodeURIComponent(scenario)}`;
  return request(t.app)
    .get(`/api/studies/${studyId}/results/buses/${encodeURIComponent(busId)}${q}`)
    .set(...eng());
}

/** Every labelled bus of the model in one scenario, through the engine directly (the independent path). */
function engineBuses(scenarioId: string): Map<string, BusResult> {
  const base: Model = { ...model };
  delete base.scenarios;
  const m =
    scenarioId === BASE_SCENARIO_ID
      ? base
      : applyScenario(
          model,
          model.scenarios!.find((s) => s.id === scenarioId)!,
        ).model;
  return new Map(runStudy(m, options).buses.map((b) => [b.busId, b]));
}

/**
 * A bus result without the scenario fields and the warnings the scenarios add: a governing non-base scenario's, and
 * the one saying a scenario shown is not the label's basis.
 */
function plain(b: BusResult) {
  const { scenarioId: _s, scenarios: _l, warnings, ...rest } = b;
  return {
    ...rest,
    warnings: warnings.filter((w) => w.code !== 'SCENARIO_GOVERNS' && w.code !== 'SCENARIO_NOT_GOVERNING'),
  };
}

describe('one bus in each scenario', () => {
  beforeEach(() => {
    clearResultsCache();
    clearScenarioRunners();
  });

  test('each scenario of each bus equals the engine run directly on that scenario’s model', async () => {
    const ids = [BASE_SCENARIO_ID, ...SCENARIOS.map((s) => s.id)];
    const direct = new Map(ids.map((id) => [id, engineBuses(id)]));
    const labelled = model.buses.filter((b) => b.equipment).map((b) => b.id);
    let compared = 0;
    let nonGoverning = 0;
    let deEnergized = 0;
    for (const busId of labelled) {
      const stored = await getBus(busId);
      expect(stored.status).toBe(200);
      const governing = stored.body.governingScenarioId as string;
      expect(stored.body.scenarioId).toBe(governing);
      expect(stored.body.bus.scenarioId).toBe(governing);
      for (const id of ids) {
        const res = await getBus(busId, id);
        const engine = direct.get(id)!.get(busId);
        const entry = (stored.body.bus.scenarios as { scenarioId: string; status: string }[]).find(
          (s) => s.scenarioId === id,
        )!;
        if (!engine) {
          // No source in service reaches the bus in this scenario: the engine's model has no such bus.
          expect(entry.status).toBe('de-energized');
          expect(res.status).toBe(409);
          expect(res.body.error.fields).toHaveProperty('scenario');
          deEnergized++;
          continue;
        }
        expect(res.status).toBe(200);
        expect(res.body.scenarioId).toBe(id);
        expect(res.body.governingScenarioId).toBe(governing);
        expect(res.body.bus.scenarioId).toBe(id);
        expect(res.body.bus.scenarios).toEqual(stored.body.bus.scenarios);
        expect(plain(res.body.bus as BusResult)).toEqual(plain(engine));
        // The run's own summary of this scenario gives the same energy as its trace.
        const summary = (stored.body.bus.scenarios as { scenarioId: string; incidentEnergyJPerCm2?: number }[]).find(
          (s) => s.scenarioId === id,
        )!;
        expect(summary.incidentEnergyJPerCm2).toBe(engine.incidentEnergyJPerCm2);
        // The model's devices its trace names, to draw their bands.
        const named = new Set(engine.cases.flatMap((c) => c.devices.map((d) => d.deviceId)));
        expect((res.body.devices as { id: string }[]).map((d) => d.id).sort()).toEqual(
          model.devices
            .filter((d) => named.has(d.id))
            .map((d) => d.id)
            .sort(),
        );
        const notLabel = (res.body.bus as BusResult).warnings.filter((w) => w.code === 'SCENARIO_NOT_GOVERNING');
        if (id === governing) {
          expect(res.body).toEqual(stored.body);
          expect(notLabel).toEqual([]);
        } else {
          // Another scenario's result says on itself that the label takes the governing one.
          expect(notLabel).toHaveLength(1);
          expect(notLabel[0].message).toContain(
            (stored.body.bus.scenarios as { scenarioId: string; name: string }[]).find(
              (s) => s.scenarioId === governing,
            )!.name,
          );
          nonGoverning++;
        }
        compared++;
      }
    }
    // The model has buses, scenarios that do not govern, and the generator-only scenario leaves part of it dead.
    expect(compared).toBeGreaterThan(labelled.length);
    expect(nonGoverning).toBeGreaterThan(0);
    expect(deEnergized).toBeGreaterThan(0);
    // Every bus in every scenario, twice through the engine (a time-stepped arc with a generator's decrement): give it
    // room on a loaded machine (a limit on waiting, not a timing check).
  }, 180_000);

  test('the governing scenario is the highest energy of the scenarios (the label takes it)', async () => {
    const page = await request(t.app)
      .get(`/api/studies/${studyId}/results?pageSize=500`)
      .set(...eng());
    expect(page.status).toBe(200);
    for (const row of page.body.rows as (BusResult & { scenarioId: string })[]) {
      const energies = row.scenarios!.filter((s) => s.status === 'ok').map((s) => s.incidentEnergyJPerCm2!);
      expect(row.incidentEnergyJPerCm2).toBe(Math.max(...energies));
      expect(row.scenarios!.find((s) => s.scenarioId === row.scenarioId)!.incidentEnergyJPerCm2).toBe(
        row.incidentEnergyJPerCm2,
      );
    }
  });

  test('the same trace twice (cached) and its entity tag per scenario', async () => {
    const busId = model.buses.find((b) => b.equipment)!.id;
    const a = await getBus(busId, 'util-min');
    const b = await getBus(busId, 'util-min');
    expect(b.body).toEqual(a.body);
    expect(b.headers.etag).toBe(a.headers.etag);
    const base = await getBus(busId, BASE_SCENARIO_ID);
    expect(base.headers.etag).not.toBe(a.headers.etag);
    const again = await request(t.app)
      .get(`/api/studies/${studyId}/results/buses/${busId}?scenario=util-min`)
      .set(...eng())
      .set('If-None-Match', a.headers.etag as string);
    expect(again.status).toBe(304);
  });

  test('an unknown scenario is 400 naming scenario; an unknown bus stays 404', async () => {
    const busId = model.buses.find((b) => b.equipment)!.id;
    const res = await getBus(busId, 'no-such-scenario');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('scenario');
    expect(res.body.error.message).toContain('no-such-scenario');
    const empty = await request(t.app)
      .get(`/api/studies/${studyId}/results/buses/${busId}?scenario=`)
      .set(...eng());
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields).toHaveProperty('scenario');
    expect((await getBus('NO-SUCH-BUS', 'util-min')).status).toBe(404);
  });
});

describe('results pages by governing scenario', () => {
  test('rows carry their governing scenario, and the filter keeps exactly those', async () => {
    const all = await request(t.app)
      .get(`/api/studies/${studyId}/results?pageSize=500`)
      .set(...eng());
    expect(all.status).toBe(200);
    expect(all.body.study.scenarios).toEqual([
      { id: BASE_SCENARIO_ID, name: expect.any(String) },
      ...SCENARIOS.map((s) => ({ id: s.id, name: s.name })),
    ]);
    const rows = all.body.rows as { busId: string; scenarioId: string }[];
    for (const r of rows) expect([BASE_SCENARIO_ID, ...SCENARIOS.map((s) => s.id)]).toContain(r.scenarioId);
    let seen = 0;
    for (const id of [BASE_SCENARIO_ID, ...SCENARIOS.map((s) => s.id)]) {
      const page = await request(t.app)
        .get(`/api/studies/${studyId}/results?pageSize=500&scenarioId=${id}`)
        .set(...eng());
      expect(page.status).toBe(200);
      const want = rows.filter((r) => r.scenarioId === id).map((r) => r.busId);
      expect((page.body.rows as { busId: string }[]).map((r) => r.busId)).toEqual(want);
      expect(page.body.total).toBe(want.length);
      seen += want.length;
    }
    expect(seen).toBe(rows.length);
    expect(all.body.summary.scenarioIds.length).toBeGreaterThan(0);
  });
});

describe('a study without scenarios', () => {
  test('the route says base, and base is the only scenario', async () => {
    const plainId = await draftStudy(t, 'No scenario site', 'Plain study', larkspurModel());
    await request(t.app)
      .post(`/api/studies/${plainId}/run`)
      .set(...eng());
    await t.ctx.jobs.idle();
    const busId = model.buses.find((b) => b.equipment)!.id;
    const res = await request(t.app)
      .get(`/api/studies/${plainId}/results/buses/${busId}`)
      .set(...eng());
    expect(res.status).toBe(200);
    expect(res.body.scenarioId).toBe(BASE_SCENARIO_ID);
    expect(res.body.bus.scenarios).toBeUndefined();
    const base = await request(t.app)
      .get(`/api/studies/${plainId}/results/buses/${busId}?scenario=base`)
      .set(...eng());
    expect(base.body).toEqual(res.body);
    const other = await request(t.app)
      .get(`/api/studies/${plainId}/results/buses/${busId}?scenario=util-min`)
      .set(...eng());
    expect(other.status).toBe(400);
    expect(other.body.error.fields).toHaveProperty('scenario');
  });
});

describe('a large model’s bus is computed in the study worker', () => {
  test('the worker gives what the main thread gives', async () => {
    const busId = 'MCC-1';
    const inWorker = await scenarioBusOffThread(JSON.stringify(model), options, 'util-min', busId, 'worker-test');
    const inMain = scenarioBusResult(model, options, 'util-min', busId);
    expect(inWorker.kind).toBe('result');
    // A worker started (the test app can start one): the outcome crossed the thread boundary.
    expect(studyWorkerCounts().live).toBeGreaterThan(0);
    expect(inWorker).toEqual(JSON.parse(JSON.stringify(inMain)));
    expect(await scenarioBusOffThread(JSON.stringify(model), options, 'tie-open', 'PP-9', 'worker-test-2')).toEqual({
      kind: 'de-energized',
    });
  });
});
