import request from 'supertest';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

describe('sites', () => {
  it('engineer creates and edits a site; everyone in the organization reads it', async () => {
    const created = await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'North pump station', address: '2 Test Road' });
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    const edited = await request(t.app)
      .put(`/api/sites/${id}`)
      .set(...bearer(t.orgA.users.admin.token))
      .send({ name: 'North pump station (rebuilt)', address: '2 Test Road' });
    expect(edited.status).toBe(200);
    expect(edited.body.name).toBe('North pump station (rebuilt)');
    for (const role of ['electrician', 'safety'] as const) {
      const res = await request(t.app)
        .get(`/api/sites/${id}`)
        .set(...bearer(t.orgA.users[role].token));
      expect(res.status).toBe(200);
    }
  });

  it('electrician and safety officer may not create sites', async () => {
    for (const role of ['electrician', 'safety'] as const) {
      const res = await request(t.app)
        .post('/api/sites')
        .set(...bearer(t.orgA.users[role].token))
        .send({ name: 'X' });
      expect(res.status).toBe(403);
    }
  });

  it('names the field of a bad site', async () => {
    const res = await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: '' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('name');
  });

  it('never shows another organization its sites: list, read and edit', async () => {
    const created = await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgB.users.engineer.token))
      .send({ name: 'B only' });
    const id = created.body.id as string;
    const list = await request(t.app)
      .get('/api/sites')
      .set(...bearer(t.orgA.users.admin.token));
    expect((list.body.sites as { id: string }[]).map((s) => s.id)).not.toContain(id);
    const read = await request(t.app)
      .get(`/api/sites/${id}`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(read.status).toBe(404);
    expect(read.body).toEqual({ error: expect.objectContaining({ code: 'not_found' }) });
    const edit = await request(t.app)
      .put(`/api/sites/${id}`)
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'hijack' });
    expect(edit.status).toBe(404);
    const still = await request(t.app)
      .get(`/api/sites/${id}`)
      .set(...bearer(t.orgB.users.engineer.token));
    expect(still.body.name).toBe('B only');
  });
});

describe('system', () => {
  it('health answers', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.body).toEqual({ ok: true, database: expect.any(String) });
  });

  it('serves an OpenAPI document generated from the schemas', async () => {
    const res = await request(t.app).get('/api/openapi.json');
    expect(res.status).toBe(200);
    expect(res.body.openapi).toBe('3.0.3');
    const ref = res.body.paths['/api/auth/sign-in'].post.requestBody.content['application/json'].schema.$ref as string;
    const name = ref.split('/').pop() as string;
    expect(res.body.components.schemas[name].properties).toHaveProperty('email');
    expect(res.body.paths['/api/sites/{siteId}'].get).toBeDefined();
  });

  it('answers an unknown API route with the error shape', async () => {
    const res = await request(t.app).get('/api/nothing-here');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});
