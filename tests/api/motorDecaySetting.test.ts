/**
 * The organization's motor-decay setting: 'higher' by default (each case with motor contribution evaluated with the
 * step and the exponential model, the higher energy kept: the product's conservative rule, where a choice is open the
 * higher hazard), 'step' (the motor feeds its full first-cycle current until the decay time, then stops) or
 * 'exponential' on choice (both models common practice, no source); the run records which model it used and the
 * trace follows it.
 */
import request from 'supertest';
import { StudyRun } from '../../server/db/models';
import { studyResultsSchema, type StudyResults } from '../../shared/schemas/studyResults';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';
import { parseStoredResults } from '../../server/engine/study/storedResults';

let t: TestApp;
let studyId = '';
beforeAll(async () => {
  t = await makeTestApp();
  const eng = bearer(t.orgA.users.engineer.token);
  const site = await request(t.app)
    .post('/api/sites')
    .set(...eng)
    .send({ name: 'Motor decay site' });
  const study = await request(t.app)
    .post(`/api/sites/${site.body.id}/studies`)
    .set(...eng)
    .send({ title: 'Motor decay study' });
  studyId = study.body.id;
  const put = await request(t.app)
    .put(`/api/studies/${studyId}/model`)
    .set(...eng)
    .send({ model: smallModel(), version: 1 });
  expect(put.status).toBe(200);
});
afterAll(async () => t.close());

const admin = () => bearer(t.orgA.users.admin.token);

async function settings(): Promise<Record<string, unknown>> {
  const org = await request(t.app)
    .get('/api/organization')
    .set(...admin());
  return org.body.settings;
}

/** Runs the study and returns the stored results and the MCC bus (the bus with the motor) from the API. */
/** Starts a run, waits for it, and returns its row (done). */
async function runRow(): Promise<StudyRun> {
  const res = await request(t.app)
    .post(`/api/studies/${studyId}/run`)
    .set(...bearer(t.orgA.users.engineer.token));
  expect(res.status).toBe(202);
  await t.ctx.jobs.idle();
  const row = await StudyRun.findByPk(res.body.id);
  expect(row?.status).toBe('done');
  return row!;
}

async function run(): Promise<{ results: StudyResults; mcc: StudyResults['buses'][number] }> {
  const eng = bearer(t.orgA.users.engineer.token);
  const results = parseStoredResults((await runRow()).results!);
  const bus = await request(t.app)
    .get(`/api/studies/${studyId}/results/buses/MCC`)
    .set(...eng);
  expect(bus.status).toBe(200);
  return { results, mcc: bus.body.bus ?? bus.body };
}

describe('motor contribution decay model (organization setting)', () => {
  it('defaults to higher (both models, the higher energy kept) when the stored settings do not have it', async () => {
    expect((await settings()).motorDecayModel).toBe('higher');
  });

  it('rejects an unknown value with a 400 naming the field, and keeps the stored settings', async () => {
    const before = await settings();
    const res = await request(t.app)
      .put('/api/organization/settings')
      .set(...admin())
      .send({ ...before, motorDecayModel: 'linear' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('motorDecayModel');
    expect(await settings()).toEqual(before);
  });

  it('a run records the chosen model and the motor contribution follows it in the trace', async () => {
    const higher = await run();
    expect(higher.results.motorDecayModel).toBe('higher');

    let put = await request(t.app)
      .put('/api/organization/settings')
      .set(...admin())
      .send({ ...(await settings()), motorDecayModel: 'step' });
    expect(put.status).toBe(200);
    expect(put.body.settings.motorDecayModel).toBe('step');
    const step = await run();
    expect(step.results.motorDecayModel).toBe('step');

    put = await request(t.app)
      .put('/api/organization/settings')
      .set(...admin())
      .send({ ...(await settings()), motorDecayModel: 'exponential' });
    expect(put.status).toBe(200);
    expect(put.body.settings.motorDecayModel).toBe('exponential');

    const exp = await run();
    expect(exp.results.motorDecayModel).toBe('exponential');
    // Same decay time in both: τ of the exponential is the step's decay time.
    expect(exp.results.motorDecayS).toBe(step.results.motorDecayS);

    // At the MCC the feeder breaker cuts the utility within a few cycles and the motor alone keeps the arc going: in
    // the step model until its decay time τ, in the exponential model until it is dropped at 5 τ (both: common
    // practice, no source). So the arc lasts τ in one and 5 τ in the other, and the energies differ.
    const tau = step.results.motorDecayS;
    const motorOf = (bus: StudyResults['buses'][number]) =>
      bus.cases.find((c) => c.arcCase === 'full')!.sources.find((x) => x.sourceId === 'P-1')!;
    expect(motorOf(step.mcc).reason).toBe('motor-decay');
    expect(motorOf(step.mcc).stopsAtS).toBeCloseTo(tau, 9);
    expect(motorOf(exp.mcc).reason).toBe('motor-decay');
    expect(motorOf(exp.mcc).stopsAtS).toBeCloseTo(5 * tau, 9);
    expect(step.mcc.arcDurationS).toBeCloseTo(tau, 9);
    expect(exp.mcc.arcDurationS).toBeCloseTo(5 * tau, 9);
    expect(exp.mcc.incidentEnergyCalPerCm2).not.toBeCloseTo(step.mcc.incidentEnergyCalPerCm2!, 6);

    // 'higher': every case at the MCC has the energy of the higher of the two runs, names the model that governed
    // and says so in its sentence.
    expect(higher.mcc.cases.length).toBe(step.mcc.cases.length);
    higher.mcc.cases.forEach((c, k) => {
      const s = step.mcc.cases[k];
      const e = exp.mcc.cases[k];
      expect([s.arcCase, s.location, e.arcCase, e.location]).toEqual([c.arcCase, c.location, c.arcCase, c.location]);
      const expHigher = e.incidentEnergyJPerCm2 > s.incidentEnergyJPerCm2;
      expect(c.incidentEnergyJPerCm2).toBeCloseTo(Math.max(s.incidentEnergyJPerCm2, e.incidentEnergyJPerCm2), 9);
      expect(c.motorDecayModel).toBe(expHigher ? 'exponential' : 'step');
      expect(c.sentence).toContain(`evaluated with both decay models: the ${expHigher ? 'exponential' : 'step'} model`);
      // The fixed models are recorded on their cases too.
      expect(s.motorDecayModel).toBe('step');
      expect(e.motorDecayModel).toBe('exponential');
    });
    expect(higher.mcc.incidentEnergyCalPerCm2).toBeCloseTo(
      Math.max(step.mcc.incidentEnergyCalPerCm2!, exp.mcc.incidentEnergyCalPerCm2!),
      9,
    );

    await request(t.app)
      .put('/api/organization/settings')
      .set(...admin())
      .send({ ...(await settings()), motorDecayModel: 'higher' });
  });

  it('results stored before the setting existed read as the step model (they were computed with it)', async () => {
    const stored = parseStoredResults((await runRow()).results!) as unknown as Record<string, unknown> & {
      buses: { cases: object[] }[];
    };
    delete stored.motorDecayModel;
    for (const b of stored.buses) for (const c of b.cases) delete (c as { motorDecayModel?: string }).motorDecayModel;
    const parsed = studyResultsSchema.parse(stored);
    expect(parsed.motorDecayModel).toBe('step');
    expect(parsed.buses.flatMap((b) => b.cases).every((c) => c.motorDecayModel === undefined)).toBe(true);
  });
});
