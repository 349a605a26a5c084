import request from 'supertest';
import { AuditEvent } from '../../server/db/models';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { pdfText } from '../helpers/pdfText';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let studyId = '';
beforeAll(async () => {
  t = await makeTestApp();
  const siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'Print site' })
  ).body.id;
  studyId = await approveStudy(t, siteId, smallModel());
});
afterAll(async () => t.close());

const elec = () => bearer(t.orgA.users.electrician.token);
const binary = (res: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};

const text = async (pdf: Buffer): Promise<string> => pdfText(pdf);

describe('label PDFs through the API', () => {
  it('GET /studies/:id/labels.pdf gives every label of the revision, with its values and review-by date, and does not mark them printed', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${studyId}/labels.pdf?size=4x6`)
      .set(...elec())
      .buffer(true)
      .parse(binary);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const content = await text(res.body as Buffer);
    const labels = (
      await request(t.app)
        .get(`/api/studies/${studyId}/labels`)
        .set(...elec())
    ).body.labels as {
      equipmentTag: string;
      printedAt: string | null;
      content: { signalWord: string; reviewByDate: string; equipmentName: string };
    }[];
    for (const l of labels) {
      expect(content).toContain(l.content.equipmentName);
      expect(content).toContain(l.content.reviewByDate);
      expect(content).toContain(l.content.signalWord);
      // Opening the study's PDF is not printing: only downloading a print batch is.
      expect(l.printedAt).toBeNull();
    }
  });

  it('a label becomes printed when an electrician downloads a batch containing it, and the audit names the batch', async () => {
    const labels = (
      await request(t.app)
        .get(`/api/studies/${studyId}/labels`)
        .set(...elec())
    ).body.labels as { id: string; equipmentTag: string; printedAt: string | null }[];
    const [first, ...rest] = labels;
    const created = await request(t.app)
      .post('/api/label-batches')
      .set(...elec())
      .send({ labelIds: [first.id], size: '4x4' });
    await t.ctx.jobs.idle();
    const before = (
      await request(t.app)
        .get(`/api/studies/${studyId}/labels`)
        .set(...elec())
    ).body.labels as { id: string; printedAt: string | null }[];
    // Made but not yet downloaded: nothing is printed.
    for (const l of before) expect(l.printedAt).toBeNull();
    await request(t.app)
      .get(`/api/label-batches/${created.body.id}/file`)
      .set(...elec())
      .buffer(true)
      .parse(binary);
    const after = (
      await request(t.app)
        .get(`/api/studies/${studyId}/labels`)
        .set(...elec())
    ).body.labels as { id: string; printedAt: string | null }[];
    expect(after.find((l) => l.id === first.id)!.printedAt).not.toBeNull();
    for (const l of rest) expect(after.find((a) => a.id === l.id)!.printedAt).toBeNull();
    const audit = await AuditEvent.findAll({ where: { action: 'labels.printed', entityId: created.body.id } });
    expect(audit.length).toBe(1);
    expect(JSON.parse(audit[0].summary as unknown as string)).toMatchObject({ batchId: created.body.id, count: 1 });
  });

  it('a print batch runs in the background and gives one PDF', async () => {
    const labels = (
      await request(t.app)
        .get(`/api/studies/${studyId}/labels`)
        .set(...elec())
    ).body.labels as { id: string }[];
    const created = await request(t.app)
      .post('/api/label-batches')
      .set(...elec())
      .send({ labelIds: labels.map((l) => l.id), size: 'letter' });
    expect(created.status).toBe(202);
    await t.ctx.jobs.idle();
    const batch = await request(t.app)
      .get(`/api/label-batches/${created.body.id}`)
      .set(...elec());
    expect(batch.body).toMatchObject({ status: 'done', total: labels.length, progress: 1 });
    const file = await request(t.app)
      .get(`/api/label-batches/${created.body.id}/file`)
      .set(...elec())
      .buffer(true)
      .parse(binary);
    expect(file.status).toBe(200);
    expect((file.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
  });

  it('refuses labels of another organization and the safety officer (read-only)', async () => {
    const labels = (
      await request(t.app)
        .get(`/api/studies/${studyId}/labels`)
        .set(...elec())
    ).body.labels as { id: string }[];
    const other = await request(t.app)
      .post('/api/label-batches')
      .set(...bearer(t.orgB.users.electrician.token))
      .send({ labelIds: [labels[0].id], size: '4x4' });
    expect(other.status).toBe(404);
    const safety = await request(t.app)
      .post('/api/label-batches')
      .set(...bearer(t.orgA.users.safety.token))
      .send({ labelIds: [labels[0].id], size: '4x4' });
    expect(safety.status).toBe(403);
    const bad = await request(t.app)
      .post('/api/label-batches')
      .set(...elec())
      .send({ labelIds: [], size: '5x7' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['labelIds', 'size']));
  });
});

describe('study report', () => {
  it('gives a PDF with the method, every bus and the approval block', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${studyId}/report.pdf`)
      .set(...bearer(t.orgA.users.safety.token))
      .buffer(true)
      .parse(binary);
    expect(res.status).toBe(200);
    const content = await text(res.body as Buffer);
    expect(content).toContain('IEEE 1584-2018');
    for (const bus of ['SWBD', 'MCC', 'PNL']) expect(content).toContain(bus);
    expect(content).toContain('PE-000123');
    expect(
      (
        await request(t.app)
          .get(`/api/studies/${studyId}/report.pdf`)
          .set(...elec())
      ).status,
    ).toBe(403);
  });
});
