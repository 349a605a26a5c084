/**
 * Hold under abuse (medium and low): headers that depend on how the app is reached, bodies the parser cannot read,
 * tokens without an expiry, cross-organization e-mail addresses, per-account sign-in backoff, photo re-encoding,
 * the audit log's database triggers, external reminder addresses, and form-encoded field reports.
 */
import { randomUUID } from 'node:crypto';
import jpeg from 'jpeg-js';
import jwt from 'jsonwebtoken';
import { PNG } from 'pngjs';
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { AuditEvent, CapturedMail, User } from '../../server/db/models';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { makeTestApp, TEST_PASSWORD, TEST_SECRET, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('content security policy over plain HTTP and over TLS', () => {
  const csp = (res: request.Response) => String(res.headers['content-security-policy'] ?? '');

  it('plain HTTP (a LAN install reached by its IP address): no upgrade-insecure-requests', async () => {
    const res = await request(t.app).get('/api/health');
    expect(csp(res)).toContain("default-src 'self'");
    expect(csp(res)).not.toContain('upgrade-insecure-requests');
    const page = await request(t.app).get('/l/ABC123');
    expect(csp(page)).not.toContain('upgrade-insecure-requests');
  });

  it('behind a trusted proxy that terminated TLS (X-Forwarded-Proto: https): upgrade-insecure-requests', async () => {
    const res = await request(t.app).get('/api/health').set('X-Forwarded-Proto', 'https');
    expect(csp(res)).toContain('upgrade-insecure-requests');
  });

  it('PUBLIC_BASE_URL is https: upgrade-insecure-requests on every response', async () => {
    const config = loadConfig({ NODE_ENV: 'test' }, { ...t.config, publicBaseUrl: 'https://labels.example.net' });
    const { app } = createApp({ config, db: t.db, mail: t.ctx.mail });
    const res = await request(app).get('/api/health');
    expect(csp(res)).toContain('upgrade-insecure-requests');
  });
});

describe('bodies the parser cannot read answer 4xx naming the body', () => {
  const post = () =>
    request(t.app).post('/api/calc/incident-energy').set('Authorization', `Bearer ${t.orgA.users.engineer.token}`);
  const valid = JSON.stringify({ voltageV: 480 });

  it.each(['gzip', 'br', 'deflate'])('Content-Encoding: %s on a body that is not compressed → 400', async (enc) => {
    const res = await post().set('Content-Type', 'application/json').set('Content-Encoding', enc).send(valid);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
    expect(typeof res.body.error.fields.body).toBe('string');
  });

  it('an unknown Content-Encoding → 415 naming the body', async () => {
    const res = await post().set('Content-Type', 'application/json').set('Content-Encoding', 'x-squeeze').send(valid);
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
    expect(res.body.error.message).toMatch(/Content-Encoding/);
    expect(typeof res.body.error.fields.body).toBe('string');
  });

  it.each(['klingon-8', 'utf-99', 'latin1'])('charset=%s → 415 naming the body', async (charset) => {
    const res = await post().set('Content-Type', `application/json; charset=${charset}`).send(valid);
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/charset/);
    expect(typeof res.body.error.fields.body).toBe('string');
  });

  it('JSON nested 5 000 objects deep → 400 naming the body, on every kind of route', async () => {
    const deep = '{"a":'.repeat(5000) + '1' + '}'.repeat(5000);
    const deepArrays = '['.repeat(5000) + ']'.repeat(5000);
    for (const url of ['/api/calc/incident-energy', '/api/sites', '/api/auth/sign-in']) {
      for (const text of [deep, deepArrays]) {
        const res = await request(t.app)
          .post(url)
          .set('Authorization', `Bearer ${t.orgA.users.engineer.token}`)
          .set('Content-Type', 'application/json')
          .send(text);
        expect(res.status).toBe(400);
        expect(res.body.error.fields.body).toMatch(/deeper than 64/);
      }
    }
  });

  it('64 levels are accepted by the parser; brackets inside strings do not count', async () => {
    const at64 = '{"a":'.repeat(64) + '1' + '}'.repeat(64);
    const res = await post().set('Content-Type', 'application/json').send(at64);
    expect(res.status).toBe(400);
    expect(res.body.error.fields.body).toBeUndefined(); // refused by the schema (a field), not by the depth cap
    const inString = JSON.stringify({ voltageV: 480, note: '['.repeat(500) + '\\"{'.repeat(100) });
    const res2 = await post().set('Content-Type', 'application/json').send(inString);
    expect(res2.body.error?.fields?.body).toBeUndefined();
  });
});

describe('tokens must expire within the configured lifetime', () => {
  const claimsOf = (token: string) => {
    const d = jwt.decode(token) as Record<string, unknown>;
    return { org: d.org, role: d.role, ver: d.ver, sub: d.sub };
  };
  const me = (token: string) => request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`);

  it('a token signed with the secret but without exp is refused', async () => {
    const token = jwt.sign({ ...claimsOf(t.orgA.users.engineer.token), jti: randomUUID() }, TEST_SECRET);
    expect((jwt.decode(token) as Record<string, unknown>).exp).toBeUndefined();
    expect((await me(token)).status).toBe(401);
  });

  it('a token without iat is refused', async () => {
    const token = jwt.sign({ ...claimsOf(t.orgA.users.engineer.token), jti: randomUUID() }, TEST_SECRET, {
      expiresIn: 3600,
      noTimestamp: true,
    });
    expect((await me(token)).status).toBe(401);
  });

  it('a token living longer than JWT_TTL_HOURS is refused; one within it is accepted', async () => {
    const ttl = t.config.jwtTtlHours * 3600;
    const base = { ...claimsOf(t.orgA.users.engineer.token) };
    const long = jwt.sign({ ...base, jti: randomUUID() }, TEST_SECRET, { expiresIn: ttl + 3600 });
    expect((await me(long)).status).toBe(401);
    const year = jwt.sign({ ...base, jti: randomUUID() }, TEST_SECRET, { expiresIn: '365d' });
    expect((await me(year)).status).toBe(401);
    // Back-dated iat with a far exp: exp - iat within the limit but exp far beyond now + lifetime is refused too.
    const now = Math.floor(Date.now() / 1000);
    const future = jwt.sign(
      { ...base, jti: randomUUID(), iat: now + 30 * 86400, exp: now + 30 * 86400 + 60 },
      TEST_SECRET,
    );
    expect((await me(future)).status).toBe(401);
    const ok = jwt.sign({ ...base, jti: randomUUID() }, TEST_SECRET, { expiresIn: ttl });
    expect((await me(ok)).status).toBe(200);
  });
});

describe("another organization's people are not revealed by invitations or new users", () => {
  const adminA = () => ['Authorization', `Bearer ${t.orgA.users.admin.token}`] as [string, string];
  const invite = (email: string) =>
    request(t.app)
      .post('/api/invitations')
      .set(...adminA())
      .send({ email, name: 'Someone', role: 'electrician' });

  it('inviting an address of another organization answers like a new address; accepting tells the owner to sign in', async () => {
    const fresh = await invite('nobody.yet@org-a.example');
    const foreign = await invite(t.orgB.users.engineer.email);
    expect(foreign.status).toBe(fresh.status);
    expect(foreign.status).toBe(201);
    expect(Object.keys(foreign.body).sort()).toEqual(Object.keys(fresh.body).sort());
    expect(foreign.body.status).toBe(fresh.body.status);
    // The invitation mail goes to the address (its owner decides); the link then says to sign in, and changes nothing.
    const mails = (await CapturedMail.findAll({ where: { kind: 'invitation' } })).filter((r) =>
      (JSON.parse(r.to) as string[]).includes(t.orgB.users.engineer.email),
    );
    expect(mails).toHaveLength(1);
    const token = /\/welcome\/([A-Za-z0-9_-]+)/.exec(mails[0].text)![1];
    const accept = await request(t.app)
      .post('/api/auth/accept-invitation')
      .send({ token, password: 'a-brand-new-passphrase' });
    expect(accept.status).toBe(409);
    expect(accept.body.error.message).toMatch(/sign in/);
    const owner = await User.findOne({ where: { email: t.orgB.users.engineer.email } });
    expect(owner!.organizationId).toBe(t.orgB.id);
    expect(await User.count({ where: { email: t.orgB.users.engineer.email } })).toBe(1);
  });

  it('within the same organization a duplicate still says so', async () => {
    const dup = await invite(t.orgA.users.safety.email);
    expect(dup.status).toBe(409);
    expect(dup.body.error.message).toMatch(/already exists in your organization/);
    const user = await request(t.app)
      .post('/api/users')
      .set(...adminA())
      .send({ email: t.orgA.users.safety.email, name: 'Dup', role: 'engineer', password: 'a-long-password-1' });
    expect(user.status).toBe(409);
    expect(user.body.error.message).toMatch(/already exists in your organization/);
  });

  it("creating a user with another organization's address says neither that it exists nor where", async () => {
    const res = await request(t.app)
      .post('/api/users')
      .set(...adminA())
      .send({ email: t.orgB.users.admin.email, name: 'Probe', role: 'engineer', password: 'a-long-password-1' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).not.toMatch(/exist|organization B|another organization/i);
    expect(res.body.error.message).toMatch(/invite/i);
    expect(await User.count({ where: { email: t.orgB.users.admin.email } })).toBe(1);
  });
});

describe('per-account sign-in backoff and reset-mail limit', () => {
  // The limits are common practice, no source: 10 free failures, then 5 s doubling to at most 5 min; 3 reset mails/hour.
  const signIn = (email: string, password: string) =>
    request(t.app).post('/api/auth/sign-in').send({ email, password });
  let now = Date.now();
  const advance = (ms: number) => {
    now += ms;
    t.setNow(new Date(now));
  };
  afterEach(() => t.setNow(null));

  it('10 failures in 15 min delay the next attempt (even the right password), then the delay passes and a success resets', async () => {
    now = Date.now();
    t.setNow(new Date(now));
    const email = t.orgA.users.electrician.email;
    for (let i = 0; i < 10; i++) expect((await signIn(email, `wrong-${i}-password`)).status).toBe(401);
    const held = await signIn(email, TEST_PASSWORD);
    expect(held.status).toBe(429);
    expect(held.body.error.code).toBe('rate_limited');
    expect(Number(held.headers['retry-after'])).toBe(5);
    // Another account, from the same address, is not held.
    expect((await signIn(t.orgA.users.safety.email, TEST_PASSWORD)).status).toBe(200);
    advance(5_001);
    expect((await signIn(email, TEST_PASSWORD)).status).toBe(200);
    // Success forgot the failures: one wrong password is a plain 401 again, and the right one works at once.
    expect((await signIn(email, 'wrong-again-password')).status).toBe(401);
    expect((await signIn(email, TEST_PASSWORD)).status).toBe(200);
  }, 120_000);

  it('the delay grows with each failure but never exceeds 5 minutes; an unknown address is treated the same', async () => {
    now = Date.now();
    t.setNow(new Date(now));
    for (const email of [t.orgA.users.engineer.email, 'nobody-at-all@org-a.example']) {
      const waits: number[] = [];
      for (let i = 0; i < 20; i++) {
        let res = await signIn(email, `wrong-${i}-password`);
        if (res.status === 429) {
          waits.push(Number(res.headers['retry-after']));
          advance(Number(res.headers['retry-after']) * 1000 + 1);
          res = await signIn(email, `wrong-${i}-password`);
        }
        expect(res.status).toBe(401);
      }
      expect(waits.length).toBe(10);
      expect(waits.slice(0, 4)).toEqual([5, 10, 20, 40]);
      expect(Math.max(...waits)).toBe(300);
      for (let i = 1; i < waits.length; i++) expect(waits[i]).toBeGreaterThanOrEqual(waits[i - 1]);
      // 15 minutes of quiet forget the failures.
      advance(15 * 60_000 + 1);
      if (email === t.orgA.users.engineer.email) expect((await signIn(email, TEST_PASSWORD)).status).toBe(200);
      else expect((await signIn(email, 'still-wrong-password')).status).toBe(401);
    }
  }, 120_000);

  it('password-reset mails: 3 per account and hour, the answer always the same', async () => {
    const email = t.orgB.users.electrician.email;
    // Each reset link made is recorded (password.reset-requested) in the transaction before its mail is sent; the
    // mail sink files messages a moment after the send, so the audit events are the exact count.
    const countMails = () =>
      AuditEvent.count({ where: { action: 'password.reset-requested', entityId: t.orgB.users.electrician.id } });
    const before = await countMails();
    for (let i = 0; i < 6; i++) {
      const res = await request(t.app).post('/api/auth/password-reset').send({ email });
      expect(res.status).toBe(200);
      expect(res.body).toEqual({ ok: true });
    }
    await t.ctx.jobs.idle();
    expect((await countMails()) - before).toBe(3);
    t.setNow(new Date(Date.now() + 3600_000 + 1000));
    await request(t.app).post('/api/auth/password-reset').send({ email });
    await t.ctx.jobs.idle();
    expect((await countMails()) - before).toBe(4);
  });
});

describe('photos are decoded and encoded again', () => {
  let code = '';
  beforeAll(async () => {
    const siteId = (
      await request(t.app)
        .post('/api/sites')
        .set('Authorization', `Bearer ${t.orgA.users.engineer.token}`)
        .send({ name: 'Photo site' })
    ).body.id as string;
    await approveStudy(t, siteId, smallModel());
    const labels = await request(t.app)
      .get(`/api/sites/${siteId}/labels?current=1`)
      .set('Authorization', `Bearer ${t.orgA.users.engineer.token}`);
    code = labels.body.labels[0].code as string;
  }, 60_000);

  /** A 4 × 2 JPEG, left half red and right half blue, with an EXIF block (orientation `orientation`) and a comment. */
  function jpegWithMetadata(orientation: number): Buffer {
    const w = 4;
    const h = 2;
    const data = Buffer.alloc(w * h * 4);
    for (let y = 0; y < h; y++)
      for (let x = 0; x < w; x++) data.set(x < 2 ? [255, 0, 0, 255] : [0, 0, 255, 255], (y * w + x) * 4);
    const plain = jpeg.encode({ width: w, height: h, data }, 95).data;
    // EXIF (TIFF big-endian): one IFD0 entry, tag 0x0112 Orientation, type SHORT, count 1.
    const tiff = Buffer.from([
      0x4d,
      0x4d,
      0,
      0x2a,
      0,
      0,
      0,
      8,
      0,
      1,
      0x01,
      0x12,
      0,
      3,
      0,
      0,
      0,
      1,
      0,
      orientation,
      0,
      0,
      0,
      0,
      0,
      0,
    ]);
    const exifBody = Buffer.concat([Buffer.from('Exif\0\0', 'latin1'), tiff, Buffer.from('GPS 48.8584N 2.2945E')]);
    const app1 = Buffer.concat([Buffer.from([0xff, 0xe1]), u16(exifBody.length + 2), exifBody]);
    const comment = Buffer.from('SECRET-CAMERA-SERIAL-123');
    const com = Buffer.concat([Buffer.from([0xff, 0xfe]), u16(comment.length + 2), comment]);
    return Buffer.concat([plain.subarray(0, 2), app1, com, plain.subarray(2), Buffer.from('TRAILING-PAYLOAD')]);
  }
  const u16 = (n: number) => Buffer.from([n >> 8, n & 0xff]);

  async function report(photo: Buffer, name: string, type: string) {
    return request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set('Authorization', `Bearer ${t.orgA.users.electrician.token}`)
      .field('kind', 'device')
      .field('text', 'Photo check')
      .attach('photo', photo, { filename: name, contentType: type });
  }
  async function storedPhoto(reportId: string): Promise<Buffer> {
    const res = await request(t.app)
      .get(`/api/field-reports/${reportId}/photo`)
      .set('Authorization', `Bearer ${t.orgA.users.safety.token}`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    return res.body as Buffer;
  }

  it('strips EXIF, comments and trailing bytes, and applies the orientation to the pixels', async () => {
    const sent = jpegWithMetadata(6); // 6: rotate 90° clockwise to show upright (EXIF 2.3, Orientation tag)
    const res = await report(sent, 'p.jpg', 'image/jpeg');
    expect(res.status).toBe(201);
    const stored = await storedPhoto(res.body.id);
    const text = stored.toString('latin1');
    for (const secret of ['Exif', 'GPS 48.8584N', 'SECRET-CAMERA-SERIAL', 'TRAILING-PAYLOAD'])
      expect(text).not.toContain(secret);
    const img = jpeg.decode(stored, { useTArray: true });
    // Rotated clockwise: 2 wide and 4 tall, red (the left half) now on top.
    expect([img.width, img.height]).toEqual([2, 4]);
    expect(img.data[0]).toBeGreaterThan(200); // top-left red
    expect(img.data[2]).toBeLessThan(60);
    const last = (img.width * img.height - 1) * 4;
    expect(img.data[last + 2]).toBeGreaterThan(200); // bottom-right blue
    expect(img.data[last]).toBeLessThan(60);
  });

  it('a PNG keeps its pixels without its text chunks', async () => {
    const png = new PNG({ width: 3, height: 3 });
    png.data.fill(200);
    const withText = PNG.sync.write(png);
    // A tEXt chunk before IEND (its CRC is not checked by decoders that ignore ancillary chunks; pngjs checks it).
    const iend = withText.length - 12;
    const chunk = textChunk('Comment', 'SECRET-PNG-NOTE');
    const sent = Buffer.concat([withText.subarray(0, iend), chunk, withText.subarray(iend)]);
    const res = await report(sent, 'p.png', 'image/png');
    expect(res.status).toBe(201);
    const stored = await storedPhoto(res.body.id);
    expect(stored.toString('latin1')).not.toContain('SECRET-PNG-NOTE');
    const back = PNG.sync.read(stored);
    expect([back.width, back.height, back.data[0]]).toEqual([3, 3, 200]);
  });

  it('a file that only starts like an image is refused with 415 naming the photo; nothing is stored', async () => {
    const before = await request(t.app)
      .get('/api/field-reports')
      .set('Authorization', `Bearer ${t.orgA.users.safety.token}`);
    for (const [bytes, name, type] of [
      [
        Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.from('<script>alert(1)</script>')]),
        'x.jpg',
        'image/jpeg',
      ],
      [
        Buffer.concat([Buffer.from('89504e470d0a1a0a', 'hex'), Buffer.from('not really a png at all')]),
        'x.png',
        'image/png',
      ],
      [jpegWithMetadata(1).subarray(0, 200), 'cut.jpg', 'image/jpeg'],
    ] as const) {
      const res = await report(bytes, name, type);
      expect(res.status).toBe(415);
      expect(Object.keys(res.body.error.fields)).toEqual(['photo']);
    }
    const after = await request(t.app)
      .get('/api/field-reports')
      .set('Authorization', `Bearer ${t.orgA.users.safety.token}`);
    expect(after.body.reports.length).toBe(before.body.reports.length);
  });

  it('a PNG declaring 20 000 × 20 000 px is refused before it is decoded (413 naming the photo)', async () => {
    const png = new PNG({ width: 1, height: 1 });
    const small = PNG.sync.write(png);
    const huge = Buffer.from(small);
    huge.writeUInt32BE(20_000, 16);
    huge.writeUInt32BE(20_000, 20);
    const res = await report(huge, 'huge.png', 'image/png');
    expect(res.status).toBe(413);
    expect(res.body.error.fields.photo).toMatch(/20000 × 20000 px/);
    // Within 8 000 px a side but 30 megapixels: refused too (the cap is 25 MP).
    huge.writeUInt32BE(6000, 16);
    huge.writeUInt32BE(5000, 20);
    const wide = await report(huge, 'wide.png', 'image/png');
    expect(wide.status).toBe(413);
    expect(wide.body.error.fields.photo).toMatch(/6000 × 5000 px; at most 8000 px a side and 25 megapixels/);
  });
});

/** A PNG chunk with its CRC-32 (ISO 3309 / PNG specification, section 5.3). */
function textChunk(keyword: string, text: string): Buffer {
  const type = Buffer.from('tEXt', 'latin1');
  const data = Buffer.from(`${keyword}\0${text}`, 'latin1');
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(Buffer.concat([type, data])));
  return Buffer.concat([len, type, data, crc]);
}
function crc32(buf: Buffer): number {
  let c = 0xffffffff;
  for (const b of buf) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = c & 1 ? (c >>> 1) ^ 0xedb88320 : c >>> 1;
  }
  return (c ^ 0xffffffff) >>> 0;
}

describe('the audit log is append-only in the database', () => {
  /** The database's own message (Sequelize wraps SQLite's constraint errors as a "Validation error"). */
  async function refusal(p: Promise<unknown>): Promise<string> {
    try {
      await p;
    } catch (e) {
      const err = e as { message: string; original?: { message?: string } };
      return err.original?.message ?? err.message;
    }
    return 'not refused';
  }

  it('a raw UPDATE or DELETE of an audit event is refused by the database, and the event is unchanged', async () => {
    const row = await AuditEvent.findOne({ where: { organizationId: t.orgA.id }, order: [['createdAt', 'ASC']] });
    expect(row).not.toBeNull();
    const q = t.db.sequelize.getQueryInterface().quoteIdentifier.bind(t.db.sequelize.getQueryInterface());
    const table = q('audit_events');
    const id = row!.id;
    const bind = t.db.dialect === 'postgres' ? '$1' : '?';
    const opts = t.db.dialect === 'postgres' ? { bind: [id] } : { replacements: [id] };
    expect(
      await refusal(
        t.db.sequelize.query(`UPDATE ${table} SET ${q('action')} = 'tampered' WHERE ${q('id')} = ${bind}`, opts),
      ),
    ).toMatch(/append-only/);
    expect(await refusal(t.db.sequelize.query(`DELETE FROM ${table} WHERE ${q('id')} = ${bind}`, opts))).toMatch(
      /append-only/,
    );
    expect(await refusal(t.db.sequelize.query(`DELETE FROM ${table}`))).toMatch(/append-only/);
    if (t.db.dialect === 'postgres')
      expect(await refusal(t.db.sequelize.query(`TRUNCATE ${table}`))).toMatch(/append-only/);
    const again = await AuditEvent.findByPk(id);
    expect(again!.action).toBe(row!.action);
    // Appending still works.
    const before = await AuditEvent.count();
    await request(t.app)
      .post('/api/sites')
      .set('Authorization', `Bearer ${t.orgA.users.engineer.token}`)
      .send({ name: 'Audit trigger site' });
    expect(await AuditEvent.count()).toBe(before + 1);
  });
});

describe('reminder addresses outside the organization need an admin’s approval', () => {
  const safety = () => ['Authorization', `Bearer ${t.orgA.users.safety.token}`] as [string, string];
  const admin = () => ['Authorization', `Bearer ${t.orgA.users.admin.token}`] as [string, string];
  const mailsTo = async (address: string) =>
    (await CapturedMail.findAll({ where: { kind: 'reminder' } })).filter((r) =>
      (JSON.parse(r.to) as string[]).includes(address),
    ).length;

  it('a safety officer adds them pending; they are not mailed until an admin approves; members need no approval', async () => {
    const created = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safety())
      .send({
        name: 'Outside review',
        lists: ['open-reports'],
        roles: [],
        emails: ['auditor@outside-firm.example', t.orgA.users.engineer.email],
        onlyWhenSomething: false,
      });
    expect(created.status).toBe(201);
    expect(created.body.emailStates).toEqual([
      { email: 'auditor@outside-firm.example', state: 'pending' },
      { email: t.orgA.users.engineer.email, state: 'member' },
    ]);
    const id = created.body.id as string;

    const first = await request(t.app)
      .post('/api/reminders/send-now')
      .set(...safety())
      .send({ ruleId: id });
    expect(first.status).toBe(200);
    expect(first.body.deliveries[0].recipients).toEqual([t.orgA.users.engineer.email]);
    expect(first.body.deliveries[0].message).toMatch(/awaiting an admin's approval: auditor@outside-firm\.example/);
    expect(await mailsTo('auditor@outside-firm.example')).toBe(0);

    // The safety officer cannot approve; an admin can, and an address not on the rule is refused naming the field.
    const bySafety = await request(t.app)
      .post(`/api/reminder-rules/${id}/approve-emails`)
      .set(...safety())
      .send({ emails: ['auditor@outside-firm.example'] });
    expect(bySafety.status).toBe(403);
    const notOnRule = await request(t.app)
      .post(`/api/reminder-rules/${id}/approve-emails`)
      .set(...admin())
      .send({ emails: ['someone@else.example'] });
    expect(notOnRule.status).toBe(400);
    expect(notOnRule.body.error.fields).toHaveProperty('emails');
    const ok = await request(t.app)
      .post(`/api/reminder-rules/${id}/approve-emails`)
      .set(...admin())
      .send({ emails: ['auditor@outside-firm.example'] });
    expect(ok.status).toBe(200);
    expect(ok.body.emailStates[0]).toEqual({ email: 'auditor@outside-firm.example', state: 'approved' });

    const second = await request(t.app)
      .post('/api/reminders/send-now')
      .set(...safety())
      .send({ ruleId: id });
    expect(second.body.deliveries[0].recipients).toEqual(
      ['auditor@outside-firm.example', t.orgA.users.engineer.email].sort(),
    );
    // The sink files a message a moment after it is sent: wait for it (at most 5 s).
    for (let i = 0; i < 50 && (await mailsTo('auditor@outside-firm.example')) < 1; i++)
      await new Promise((r) => setTimeout(r, 100));
    expect(await mailsTo('auditor@outside-firm.example')).toBe(1);

    // A further address the safety officer adds later waits again; the approved one stays approved.
    const put = await request(t.app)
      .put(`/api/reminder-rules/${id}`)
      .set(...safety())
      .send({
        name: 'Outside review',
        lists: ['open-reports'],
        roles: [],
        emails: ['auditor@outside-firm.example', 'second@outside-firm.example'],
        onlyWhenSomething: false,
      });
    expect(put.body.emailStates).toEqual([
      { email: 'auditor@outside-firm.example', state: 'approved' },
      { email: 'second@outside-firm.example', state: 'pending' },
    ]);
    const audit = await AuditEvent.findOne({ where: { action: 'reminder-rule.emails-approved', entityId: id } });
    expect(audit).not.toBeNull();
  });

  it('an address an admin adds is approved by that act', async () => {
    const created = await request(t.app)
      .post('/api/reminder-rules')
      .set(...admin())
      .send({ name: 'Admin outside', lists: ['open-reports'], emails: ['partner@outside-firm.example'] });
    expect(created.status).toBe(201);
    expect(created.body.emailStates).toEqual([{ email: 'partner@outside-firm.example', state: 'approved' }]);
  });
});

describe('a body that is neither JSON nor multipart', () => {
  it('a form-encoded field report is a 415 naming the body, not a misleading "kind" error', async () => {
    const siteId = (
      await request(t.app)
        .post('/api/sites')
        .set('Authorization', `Bearer ${t.orgA.users.engineer.token}`)
        .send({ name: 'Form site' })
    ).body.id as string;
    await approveStudy(t, siteId, smallModel());
    const code = (
      await request(t.app)
        .get(`/api/sites/${siteId}/labels?current=1`)
        .set('Authorization', `Bearer ${t.orgA.users.engineer.token}`)
    ).body.labels[0].code as string;
    const res = await request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set('Authorization', `Bearer ${t.orgA.users.electrician.token}`)
      .type('form')
      .send('kind=device&text=Feeder+breaker+differs');
    expect(res.status).toBe(415);
    expect(Object.keys(res.body.error.fields)).toEqual(['body']);
    expect(res.body.error.message).toMatch(/JSON.*multipart/);
    expect(res.body.error.fields.kind).toBeUndefined();
    // The same report as JSON and as multipart is accepted.
    const json = await request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set('Authorization', `Bearer ${t.orgA.users.electrician.token}`)
      .send({ kind: 'device', text: 'Feeder breaker differs' });
    expect(json.status).toBe(201);
    const multipart = await request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set('Authorization', `Bearer ${t.orgA.users.electrician.token}`)
      .field('kind', 'device')
      .field('text', 'Feeder breaker differs');
    expect(multipart.status).toBe(201);
  }, 60_000);

  it('text/plain and XML bodies on any route are 415 naming the body', async () => {
    for (const type of ['text/plain', 'application/xml']) {
      const res = await request(t.app)
        .post('/api/sites')
        .set('Authorization', `Bearer ${t.orgA.users.engineer.token}`)
        .set('Content-Type', type)
        .send('{"name":"x"}');
      expect(res.status).toBe(415);
      expect(res.body.error.fields).toHaveProperty('body');
    }
  });
});
