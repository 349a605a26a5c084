import request from 'supertest';
import { labelContentSchema } from '../../shared/schemas/labels';
import { Label } from '../../server/db/models';
import { decodeQrPng } from '../helpers/qr';
import { newLabelCode, normalizeCode } from '../../server/services/labels';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId = '';
beforeAll(async () => {
  t = await makeTestApp();
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'Label site' })
  ).body.id;
});
afterAll(async () => t.close());

const elec = () => bearer(t.orgA.users.electrician.token);

describe('labels', () => {
  let firstStudy = '';
  let oldCode = '';

  it('are issued on approval, one per labelled equipment, with unguessable codes', async () => {
    firstStudy = await approveStudy(t, siteId, smallModel());
    const res = await request(t.app)
      .get(`/api/studies/${firstStudy}/labels`)
      .set(...elec());
    expect(res.status).toBe(200);
    const labels = res.body.labels as {
      equipmentTag: string;
      code: string;
      status: string;
      content: { incidentEnergyCalPerCm2: number };
    }[];
    expect(labels.map((l) => l.equipmentTag).sort()).toEqual(['MCC', 'PNL', 'SWBD']);
    for (const l of labels) {
      expect(l.status).toBe('current');
      // 16 base32 characters = 80 random bits (docs/ARCHITECTURE.md, Labels and field checks: at least 64 bits).
      expect(l.code).toMatch(/^[0-9A-HJKMNP-TV-Z]{16}$/);
    }
    const results = await request(t.app)
      .get(`/api/studies/${firstStudy}/results/buses/SWBD`)
      .set(...elec());
    const swbd = results.body.bus;
    expect(labels.find((l) => l.equipmentTag === 'SWBD')!.content.incidentEnergyCalPerCm2).toBe(
      swbd.incidentEnergyCalPerCm2,
    );
    oldCode = labels.find((l) => l.equipmentTag === 'MCC')!.code;
  });

  it('the public check needs no sign-in and shows only what the label says', async () => {
    const res = await request(t.app).get(`/api/labels/${oldCode}`);
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('current');
    expect(Object.keys(res.body).sort()).toEqual([
      'checkedAt',
      'code',
      'content',
      'current',
      'currentDisplay',
      'display',
      'status',
      'statusNotice',
    ]);
    // Exactly the label's fields, nothing more (strict parse fails on any extra key).
    expect(labelContentSchema.strict().safeParse(res.body.content).success).toBe(true);
    // Lower case and dashes as people type them.
    const typed = oldCode
      .toLowerCase()
      .replace(/(.{4})/g, '$1-')
      .replace(/-$/, '');
    expect((await request(t.app).get(`/api/labels/${typed}`)).status).toBe(200);
  });

  it('the QR image of a label decodes to its public check address', async () => {
    const res = await request(t.app)
      .get(`/api/labels/${oldCode}/qr.png`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(decodeQrPng(res.body as Buffer)).toBe(`${t.config.publicBaseUrl}/l/${oldCode}`);
  });

  it('an unknown code is 404 with the error shape', async () => {
    const res = await request(t.app).get(`/api/labels/${newLabelCode()}`);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
    expect((await request(t.app).get('/api/labels/not-a-code')).status).toBe(404);
  });

  it('a new approved revision supersedes the old labels, and the public check gives the current values', async () => {
    const changed = smallModel();
    (changed.cables as { lengthM: number }[])[0].lengthM = 120; // a longer feeder: different values at MCC
    await approveStudy(t, siteId, changed, firstStudy);
    const res = await request(t.app).get(`/api/labels/${oldCode}`);
    expect(res.body.status).toBe('superseded');
    expect(res.body.current).not.toBeNull();
    expect(res.body.current.studyRevision).toBe(2);
    expect(res.body.current.incidentEnergyCalPerCm2).not.toBe(res.body.content.incidentEnergyCalPerCm2);
    const current = await request(t.app)
      .get(`/api/sites/${siteId}/labels?current=1`)
      .set(...elec());
    expect(current.body.labels).toHaveLength(3);
  });

  it('past review comes from the organization interval', async () => {
    const list = await request(t.app)
      .get(`/api/sites/${siteId}/labels?current=1`)
      .set(...elec());
    const code = list.body.labels[0].code;
    const settings = await request(t.app)
      .put('/api/organization/settings')
      .set(...bearer(t.orgA.users.admin.token))
      .send({ reviewIntervalMonths: 12 });
    expect(settings.status).toBe(200);
    // The label's review-by date was fixed when it was issued (60 months); 61 months later it is past review.
    t.setNow(new Date(Date.now() + 61 * 31 * 24 * 3600 * 1000));
    expect((await request(t.app).get(`/api/labels/${code}`)).body.status).toBe('past-review');
    t.setNow(null);
  });

  it('another organization cannot read the label detail', async () => {
    expect(
      (
        await request(t.app)
          .get(`/api/labels/${oldCode}/detail`)
          .set(...bearer(t.orgB.users.electrician.token))
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .get(`/api/labels/${oldCode}/detail`)
          .set(...elec())
      ).status,
    ).toBe(200);
  });
});

describe('label codes', () => {
  it('normalizes what people type', () => {
    expect(normalizeCode('abcd-efgh ijk0 o1l9')).toBe('ABCDEFGH1JK00119');
  });
  it('are random: 1000 codes, no repeat', () => {
    const codes = new Set(Array.from({ length: 1000 }, () => newLabelCode()));
    expect(codes.size).toBe(1000);
  });
});

describe('field actions', () => {
  // A 1×1 PNG (PNG signature and IHDR, IDAT, IEND chunks).
  const png = Buffer.from(
    'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
    'base64',
  );

  async function currentCode(): Promise<string> {
    const list = await request(t.app)
      .get(`/api/sites/${siteId}/labels?current=1`)
      .set(...elec());
    return list.body.labels.find((l: { equipmentTag: string }) => l.equipmentTag === 'PNL').code;
  }

  it('an electrician marks a label installed with a photo; the photo is stored', async () => {
    const code = await currentCode();
    const res = await request(t.app)
      .post(`/api/labels/${code}/installed`)
      .set(...elec())
      .attach('photo', png, { filename: 'label.png', contentType: 'image/png' });
    expect(res.status).toBe(200);
    expect(res.body.installedAt).not.toBeNull();
    const row = await Label.findOne({ where: { code } });
    expect(await t.ctx.storage.exists(row!.installPhotoKey!)).toBe(true);
  });

  it('refuses a missing photo, a wrong type and an oversize file', async () => {
    const code = await currentCode();
    expect(
      (
        await request(t.app)
          .post(`/api/labels/${code}/installed`)
          .set(...elec())
      ).status,
    ).toBe(400);
    const text = await request(t.app)
      .post(`/api/labels/${code}/installed`)
      .set(...elec())
      .attach('photo', Buffer.from('not an image'), { filename: 'x.png', contentType: 'image/png' });
    expect(text.status).toBe(415);
    const big = await request(t.app)
      .post(`/api/labels/${code}/installed`)
      .set(...elec())
      .attach('photo', Buffer.concat([png, Buffer.alloc(11 * 1024 * 1024)]), {
        filename: 'big.png',
        contentType: 'image/png',
      });
    expect(big.status).toBe(413);
  });

  it('an electrician reports a mismatch; bad kinds are refused naming the field', async () => {
    const code = await currentCode();
    const ok = await request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set(...elec())
      .field('kind', 'device')
      .field('text', 'Feeder breaker is a 400 A frame, not 225 A');
    expect(ok.status).toBe(201);
    expect(ok.body.status).toBe('open');
    const bad = await request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set(...elec())
      .field('kind', 'weather')
      .field('text', 'x');
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['kind', 'text']));
    // Another organization cannot act on this label.
    const other = await request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set(...bearer(t.orgB.users.electrician.token))
      .field('kind', 'device')
      .field('text', 'hello there');
    expect(other.status).toBe(404);
  });
});
