import request from 'supertest';
import type { ModelInput } from '../../shared/schemas/model';
import { bearer, type TestApp } from './testApp';

/** Saves `model` over the draft study's current model version, as the organization's engineer. */
export async function saveModel(t: TestApp, studyId: string, model: unknown): Promise<void> {
  const eng = bearer(t.orgA.users.engineer.token);
  const env = await request(t.app)
    .get(`/api/studies/${studyId}/model`)
    .set(...eng);
  const put = await request(t.app)
    .put(`/api/studies/${studyId}/model`)
    .set(...eng)
    .send({ model, version: env.body.version });
  expect(put.status).toBe(200);
}

/** A new site with one draft study holding `model`, as the organization's engineer; returns the study's id. */
export async function draftStudy(t: TestApp, siteName: string, title: string, model: unknown): Promise<string> {
  const eng = bearer(t.orgA.users.engineer.token);
  const site = await request(t.app)
    .post('/api/sites')
    .set(...eng)
    .send({ name: siteName });
  const study = await request(t.app)
    .post(`/api/sites/${site.body.id}/studies`)
    .set(...eng)
    .send({ title });
  await saveModel(t, study.body.id, model);
  return study.body.id as string;
}

/** Creates (or revises) a study, saves the model, runs, submits and approves it as the organization's engineer. */
export async function approveStudy(
  t: TestApp,
  siteId: string,
  model: ModelInput,
  reviseFrom?: string,
): Promise<string> {
  const eng = bearer(t.orgA.users.engineer.token);
  const created = reviseFrom
    ? await request(t.app)
        .post(`/api/studies/${reviseFrom}/revise`)
        .set(...eng)
    : await request(t.app)
        .post(`/api/sites/${siteId}/studies`)
        .set(...eng)
        .send({ title: 'Label test study' });
  const id = created.body.id as string;
  await saveModel(t, id, model);
  await request(t.app)
    .post(`/api/studies/${id}/run`)
    .set(...eng);
  await t.ctx.jobs.idle();
  await request(t.app)
    .post(`/api/studies/${id}/submit`)
    .set(...eng);
  const ok = await request(t.app)
    .post(`/api/studies/${id}/approve`)
    .set(...eng)
    .send({ approverName: 'A. Engineer', licenceNumber: 'PE-000123', jurisdiction: 'Test State', confirm: true });
  if (ok.status !== 200) throw new Error(JSON.stringify(ok.body));
  return id;
}
