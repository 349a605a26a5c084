/**
 * POST /studies/:id/mitigate and /mitigate/apply (docs/ARCHITECTURE.md, Mitigation).
 *
 * Sources of the numeric checks: an option is defined by the study engine's own run on the patched model, so the
 * check of "applying it gives the energy it promised" is equality with the engine's run of the applied revision
 * through the API (the same engine, the same settings): any difference in how the service builds the model or the
 * run options shows up as a different number. The 8 cal/cm² target of the demo check is the figure (a PPE
 * step of NFPA 70E Table 130.7(C)(15)(c)).
 */
import request from 'supertest';
import type { MitigationOption, MitigationResponse } from '../../shared/schemas/mitigation';
import { ONLY_AT_CAUTIONS } from '../../shared/cautions';
import { AuditEvent } from '../../server/db/models';
import { seedDemo } from '../../server/seed/demo';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId: string;
let approvedId: string;
const DEMO_PASSWORD = 'demo-password-123';

const eng = () => bearer(t.orgA.users.engineer.token);

beforeAll(async () => {
  t = await makeTestApp();
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...eng())
      .send({ name: 'Mitigation site' })
  ).body.id;
  approvedId = await approveStudy(t, siteId, smallModel());
});
afterAll(async () => t.close());

async function mitigate(
  studyId: string,
  busId: string,
  targetCalPerCm2: number,
  auth = eng(),
): Promise<MitigationResponse> {
  const res = await request(t.app)
    .post(`/api/studies/${studyId}/mitigate`)
    .set(...auth)
    .send({ busId, targetCalPerCm2 });
  if (res.status !== 200) throw new Error(`mitigate ${res.status}: ${JSON.stringify(res.body)}`);
  return res.body as MitigationResponse;
}

/** Every bus's governing energy in a revision's results (as the results pages give them). */
async function energies(studyId: string, auth = eng()): Promise<Map<string, number>> {
  const res = await request(t.app)
    .get(`/api/studies/${studyId}/results?pageSize=500`)
    .set(...auth);
  expect(res.status).toBe(200);
  return new Map(
    (res.body.rows as { busId: string; incidentEnergyCalPerCm2: number }[]).map((r) => [
      r.busId,
      r.incidentEnergyCalPerCm2,
    ]),
  );
}

/** Runs a draft through the API and waits for the job, as the other API tests do. */
async function run(studyId: string, auth = eng()): Promise<void> {
  const res = await request(t.app)
    .post(`/api/studies/${studyId}/run`)
    .set(...auth);
  expect(res.status).toBe(202);
  await t.ctx.jobs.idle();
  const latest = await request(t.app)
    .get(`/api/studies/${studyId}/run`)
    .set(...auth);
  expect(latest.body.status).toBe('done');
}

async function busResult(studyId: string, busId: string, auth = eng()) {
  const res = await request(t.app)
    .get(`/api/studies/${studyId}/results/buses/${busId}`)
    .set(...auth);
  expect(res.status).toBe(200);
  return res.body.bus as {
    incidentEnergyCalPerCm2: number;
    arcDurationS: number;
    clearingDeviceId: string | null;
    governing: { arcCase: string; location: string };
    warnings: { code: string; message: string }[];
    labelValues: { cautions: string[]; signalWord: string; ppeLevel: { name: string } | null };
    cases: { devices: { deviceId: string }[] }[];
  };
}

/** Submits and approves a run draft, so the site has no open revision for the next apply. */
async function close(studyId: string, auth = eng()): Promise<void> {
  expect(
    (
      await request(t.app)
        .post(`/api/studies/${studyId}/submit`)
        .set(...auth)
    ).status,
  ).toBe(200);
  const ok = await request(t.app)
    .post(`/api/studies/${studyId}/approve`)
    .set(...auth)
    .send({ approverName: 'A. Engineer', licenceNumber: 'PE-000123', jurisdiction: 'Test State', confirm: true });
  expect(ok.status).toBe(200);
}

/**
 * Applies an option in a new revision, runs it and checks the run against the option: the bus's energy, arc duration
 * and clearing device, and every other bus — those the option lists at their promised energy, the rest unchanged.
 */
async function applyRunAndCompare(
  fromId: string,
  busId: string,
  target: number,
  option: MitigationOption,
  before: Map<string, number>,
  auth = eng(),
): Promise<string> {
  const applied = await request(t.app)
    .post(`/api/studies/${fromId}/mitigate/apply`)
    .set(...auth)
    .send({ busId, targetCalPerCm2: target, optionId: option.id });
  expect(applied.status).toBe(201);
  expect(applied.body.study.status).toBe('draft');
  expect(applied.body.study.parentStudyId).toBe(fromId);
  // Recomputed on the server: the same option as the one listed.
  expect(applied.body.option).toEqual(option);
  const draftId = applied.body.study.id as string;
  await run(draftId, auth);
  const bus = await busResult(draftId, busId, auth);
  // Engine equality (see the file comment): the option's numbers are the engine's run of the patched model.
  expect(bus.incidentEnergyCalPerCm2).toBe(option.result.incidentEnergyCalPerCm2);
  expect(bus.arcDurationS).toBe(option.result.arcDurationS);
  expect(bus.clearingDeviceId).toBe(option.result.clearingDeviceId);
  expect(bus.governing).toEqual(option.result.governing);
  expect(bus.labelValues.signalWord).toBe(option.result.signalWord);
  const after = await energies(draftId, auth);
  const listed = new Map(option.otherBuses.map((o) => [o.busId, o]));
  for (const [id, energy] of after) {
    if (id === busId) continue;
    const o = listed.get(id);
    if (o) {
      expect(o.beforeCalPerCm2).toBe(before.get(id));
      expect(energy).toBe(o.afterCalPerCm2);
    } else expect(energy).toBe(before.get(id));
  }
  return draftId;
}

describe('(a) an applied option, run, gives exactly the energy it promised', () => {
  it('every option the small model offers at SWBD (8 cal/cm²) and MCC (0.8 cal/cm²)', async () => {
    const before = await energies(approvedId);
    const kinds = new Set<string>();
    for (const [busId, target] of [
      ['SWBD', 8],
      ['MCC', 0.8],
    ] as const) {
      const r = await mitigate(approvedId, busId, target);
      // The present hazard is the approved run's (same engine, same organization settings).
      expect(r.before.incidentEnergyCalPerCm2).toBe(before.get(busId));
      expect(r.options.length).toBeGreaterThan(0);
      for (const option of r.options) {
        kinds.add(option.kind);
        const draftId = await applyRunAndCompare(approvedId, busId, target, option, before);
        await close(draftId);
        // The approved revision is now superseded; the next option is applied from it again.
      }
    }
    // The kinds this model offers (SWBD's line side governs under a 12.47 kV relay; MCC is fed by a 480 V breaker).
    for (const k of ['arc-flash-relay', 'line-side-isolation', 'current-limiting-fuse', 'instantaneous-setting'])
      expect(kinds).toContain(k);
    const audits = await AuditEvent.findAll({ where: { action: 'study.mitigation-applied' } });
    expect(audits.length).toBeGreaterThanOrEqual(kinds.size);
    const summary = JSON.parse(String(audits[0].summary)) as Record<string, unknown>;
    expect(summary).toMatchObject({ busId: 'SWBD', targetCalPerCm2: 8 });
    expect(typeof summary.promisedCalPerCm2).toBe('number');
  }, 600_000);
});

describe('(d) the arc-flash relay acts only at its bus', () => {
  it('other buses below the same breaker keep their energy, in the option and in the run', async () => {
    const original = await energies(approvedId);
    const r = await mitigate(approvedId, 'SWBD', 8);
    const relay = r.options.find((o) => o.kind === 'arc-flash-relay')!;
    expect(relay).toBeDefined();
    // The relay trips the transformer primary breaker R-TX, upstream of MCC and PNL as well.
    expect(relay.modelPatch[0]).toMatchObject({ op: 'add-device', placed: { branch: 'TX', end: 'from' } });
    expect(relay.otherBuses).toEqual([]);
    expect(relay.selectivity.verdict).toBe('not-affected');
    // From the first revision (approved, or superseded by (a)'s revisions): the model without any option.
    const draftId = await applyRunAndCompare(approvedId, 'SWBD', 8, relay, original);
    const after = await energies(draftId);
    for (const id of ['MCC', 'PNL']) expect(after.get(id)).toBe(original.get(id));
    const relayId = (relay.modelPatch[0] as { placed: { id: string } }).placed.id;
    const mcc = await busResult(draftId, 'MCC');
    for (const c of mcc.cases) expect(c.devices.map((d) => d.deviceId)).not.toContain(relayId);
    // At SWBD the relay ends the arc: the run warns and the label values carry the condition.
    const swbd = await busResult(draftId, 'SWBD');
    expect(swbd.clearingDeviceId).toBe(relayId);
    expect(swbd.warnings.map((w) => w.code)).toContain('ONLY_AT_DEVICE_CLEARS');
    expect(swbd.labelValues.cautions).toContain(ONLY_AT_CAUTIONS['arc-flash-relay']);
    // …and once approved, the label's caution line (what the PDF, the label screen and the public check print).
    await close(draftId);
    const labels = await request(t.app)
      .get(`/api/studies/${draftId}/labels`)
      .set(...eng());
    const label = (labels.body.labels as { equipmentTag: string; content: { caution: string } }[]).find(
      (l) => l.equipmentTag === 'SWBD',
    )!;
    expect(label.content.caution.startsWith(ONLY_AT_CAUTIONS['arc-flash-relay'])).toBe(true);
    const mccLabel = (labels.body.labels as { equipmentTag: string; content: { caution: string } }[]).find(
      (l) => l.equipmentTag === 'MCC',
    )!;
    expect(mccLabel.content.caution).not.toContain(ONLY_AT_CAUTIONS['arc-flash-relay']);
  }, 300_000);
});

describe('(c) refusals', () => {
  const post = (studyId: string, body: unknown, path = 'mitigate', auth = eng()) =>
    request(t.app)
      .post(`/api/studies/${studyId}/${path}`)
      .set(...auth)
      .send(body as object);

  it('400 naming the field: no bus, a bad target, an unknown bus, a bus without equipment', async () => {
    const noBus = await post(approvedId, { targetCalPerCm2: 8 });
    expect(noBus.status).toBe(400);
    expect(noBus.body.error.fields).toHaveProperty('busId');
    const badTarget = await post(approvedId, { busId: 'SWBD', targetCalPerCm2: -1 });
    expect(badTarget.status).toBe(400);
    expect(badTarget.body.error.fields).toHaveProperty('targetCalPerCm2');
    const unknown = await post(approvedId, { busId: 'NOPE', targetCalPerCm2: 8 });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.busId).toMatch(/NOPE/);
    // SWGR (the 12.47 kV service bus) has no equipment in the small model.
    const bare = await post(approvedId, { busId: 'SWGR', targetCalPerCm2: 8 });
    expect(bare.status).toBe(400);
    expect(bare.body.error.fields.busId).toMatch(/equipment/);
  });

  it('400 naming optionId for an option the bus does not have; nothing is written', async () => {
    const studies = async () =>
      (
        await request(t.app)
          .get(`/api/sites/${siteId}/studies`)
          .set(...eng())
      ).body.studies.length as number;
    const count = await studies();
    const from = (
      await request(t.app)
        .get(`/api/sites/${siteId}/studies`)
        .set(...eng())
    ).body.studies.find((s: { status: string }) => s.status === 'approved').id as string;
    const res = await post(from, { busId: 'SWBD', targetCalPerCm2: 8, optionId: 'no-such-option' }, 'mitigate/apply');
    expect(res.status).toBe(400);
    expect(res.body.error.fields.optionId).toMatch(/no-such-option/);
    expect(await studies()).toBe(count);
  });

  it('404 for another organization’s study; electrician and safety are refused', async () => {
    const other = await post(approvedId, { busId: 'SWBD', targetCalPerCm2: 8 }, 'mitigate', [
      'Authorization',
      `Bearer ${t.orgB.users.engineer.token}`,
    ]);
    expect(other.status).toBe(404);
    for (const role of ['electrician', 'safety'] as const) {
      const res = await post(approvedId, { busId: 'SWBD', targetCalPerCm2: 8 }, 'mitigate', [
        'Authorization',
        `Bearer ${t.orgA.users[role].token}`,
      ]);
      expect(res.status).toBe(403);
      const apply = await post(
        approvedId,
        { busId: 'SWBD', targetCalPerCm2: 8, optionId: 'x' },
        'mitigate/apply',
        bearer(t.orgA.users[role].token),
      );
      expect(apply.status).toBe(403);
    }
  });

  it('409 applying from a draft, and from an approved revision while a draft is open (naming it)', async () => {
    // The first revision (superseded by now): SWBD is above 8 cal/cm² there.
    const from = approvedId;
    const r = await mitigate(from, 'SWBD', 8);
    const optionId = r.options[0].id;
    const first = await post(from, { busId: 'SWBD', targetCalPerCm2: 8, optionId }, 'mitigate/apply');
    expect(first.status).toBe(201);
    const draft = first.body.study as { id: string; revision: number };
    // Mitigate answers on a draft too (any revision).
    expect((await mitigate(draft.id, 'SWBD', 8)).busId).toBe('SWBD');
    const fromDraft = await post(draft.id, { busId: 'SWBD', targetCalPerCm2: 8, optionId }, 'mitigate/apply');
    expect(fromDraft.status).toBe(409);
    expect(fromDraft.body.error.message).toContain(`Revision ${draft.revision}`);
    const again = await post(from, { busId: 'SWBD', targetCalPerCm2: 8, optionId }, 'mitigate/apply');
    expect(again.status).toBe(409);
    expect(again.body.error.message).toContain(`Revision ${draft.revision}`);
  });
});

describe('a device taken from the organization’s library', () => {
  it('is searched over its own trip-unit type’s named positions, and the applied revision runs to the promised energy', async () => {
    // A trip-unit type only this organization has (position names no generic type uses): the search can offer its
    // positions only if the service passed the organization's type to the engine.
    const tripType = {
      name: 'Test LSI unit, 400 A sensor',
      sensorA: 400,
      settings: {
        longTimePickup: { positions: { 'LT-1.0': 1 } },
        longTimeDelay: { positions: { 'LTD-10': 10 } },
        shortTimePickup: { positions: { 'ST-4': 4 } },
        shortTimeDelay: { positions: { 'STD-0.5': 0.5 } },
        shortTimeI2t: { positions: { OUT: 0 } },
        instantaneousPickup: { positions: { OFF: 0, 'INST-3': 3, 'INST-7': 7, 'INST-11': 11 } },
      },
      pickupTolerancePct: 10,
      clearingS: 0.05,
    };
    const positions = {
      longTimePickup: 'LT-1.0',
      longTimeDelay: 'LTD-10',
      shortTimePickup: 'ST-4',
      shortTimeDelay: 'STD-0.5',
      shortTimeI2t: 'OUT',
      instantaneousPickup: 'OFF',
    };
    const type = await request(t.app)
      .post('/api/device-types')
      .set(...eng())
      .send({ name: tripType.name, definition: { kind: 'electronic', tripType, positions } });
    expect(type.status).toBe(201);
    const model = smallModel() as ReturnType<typeof smallModel> & { devices: Record<string, unknown>[] };
    const at = model.devices.findIndex((d) => d.id === 'CB-MCC');
    model.devices[at] = {
      ...model.devices[at],
      device: type.body.device,
      library: { deviceTypeId: type.body.id, name: tripType.name, positions },
    };
    const site = (
      await request(t.app)
        .post('/api/sites')
        .set(...eng())
        .send({ name: 'Library trip unit site' })
    ).body.id as string;
    const studyId = await approveStudy(t, site, model);
    const before = await energies(studyId);
    const r = await mitigate(studyId, 'MCC', 0.5);
    const inst = r.options.find((o) => o.kind === 'instantaneous-setting');
    expect(inst).toBeDefined();
    const op = inst!.modelPatch[0];
    expect(op.op).toBe('replace-device');
    const chosen = op.op === 'replace-device' ? op.library?.positions?.instantaneousPickup : undefined;
    expect(['INST-3', 'INST-7', 'INST-11']).toContain(chosen);
    await applyRunAndCompare(studyId, 'MCC', 0.5, inst!, before);
  }, 300_000);
});

describe('(b) maintenance mode on the demo’s worst bus', () => {
  it('brings it under 8 cal/cm², with the selectivity given up while the switch is on said in words; the demo’s other kinds applied and run', async () => {
    const seeded = await seedDemo(t.ctx, DEMO_PASSWORD);
    const token = (
      await request(t.app)
        .post('/api/auth/sign-in')
        .send({ email: 'engineer@larkspur.example', password: DEMO_PASSWORD })
    ).body.token as string;
    const auth = bearer(token);
    // The demo facility's highest-energy bus of its approved revision (from its results, not written in here).
    const before = await energies(seeded.studyId, auth);
    const [worstId, worstEnergy] = [...before].sort((a, b) => b[1] - a[1])[0];
    expect(worstEnergy).toBeGreaterThan(8);
    const r = await mitigate(seeded.studyId, worstId, 8, auth);
    expect(r.before.incidentEnergyCalPerCm2).toBe(worstEnergy);
    const mm = r.options.find((o) => o.kind === 'maintenance-mode');
    expect(mm).toBeDefined();
    expect(mm!.reachesTarget).toBe(true);
    expect(mm!.result.incidentEnergyCalPerCm2).toBeLessThan(8);
    expect(mm!.selectivity.verdict).toBe('while-on');
    // The loss stated: at least one downstream pair overlaps while the switch is on, and the sentence says so.
    expect(mm!.selectivity.checks.some((c) => !c.selective)).toBe(true);
    expect(mm!.selectivity.sentence).toMatch(/maintenance switch is on/);
    expect(mm!.selectivity.sentence).toMatch(/may open before/);
    // The added element acts only for arcs at that bus.
    expect(mm!.modelPatch.some((p) => p.op === 'add-device' && p.placed.onlyAt?.busIds.includes(worstId))).toBe(true);
    // Applied and run, the demo revision gives the energy promised, with the switch's condition on the label values.
    const draftId = await applyRunAndCompare(seeded.studyId, worstId, 8, mm!, before, auth);
    const bus = await busResult(draftId, worstId, auth);
    expect(bus.labelValues.cautions).toContain(ONLY_AT_CAUTIONS['maintenance-switch']);
    await close(draftId, auth);

    // (a) for the kinds the small model does not offer: every option of every demo bus above 8 cal/cm² whose kind is
    // not yet checked (the short-time delay, at the demo's switchboard feeder) is applied, run and compared.
    const checked = new Set(['maintenance-mode', 'arc-flash-relay', 'instantaneous-setting', 'line-side-isolation']);
    checked.add('current-limiting-fuse');
    for (const [busId, energy] of before) {
      if (energy <= 8) continue;
      const options = (await mitigate(seeded.studyId, busId, 8, auth)).options;
      for (const option of options.filter((o) => !checked.has(o.kind))) {
        checked.add(option.kind);
        await close(await applyRunAndCompare(seeded.studyId, busId, 8, option, before, auth), auth);
      }
    }
    expect(checked).toContain('short-time-delay');
  }, 600_000);
});
