import request from 'supertest';
import type { ModelInput } from '../../shared/schemas/model';
import { bearer, type TestApp } from './testApp';

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
  const env = await request(t.app)
    .get(`/api/studies/${id}/model`)
    .set(...eng);
  const put = await request(t.app)
    .put(`/api/studies/${id}/model`)
    .set(...eng)
    .send({ model, version: env.body.version });
  if (put.status !== 200) throw new Error(JSON.stringify(put.body));
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
