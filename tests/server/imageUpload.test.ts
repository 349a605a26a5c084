import express from 'express';
import { PNG } from 'pngjs';
import request from 'supertest';
import { errorMiddleware } from '../../server/http/errors';
import { detectImage, imageExtension, imageUpload } from '../../server/storage/imageUpload';

/** A real 4×3 PNG, encoded here. */
function smallPng(): Buffer {
  const png = new PNG({ width: 4, height: 3 });
  png.data.fill(0x80);
  return PNG.sync.write(png);
}
/** A real 2×2 baseline JPEG (632 bytes), encoded once and kept inline. */
const SMALL_JPEG = Buffer.from(
  '/9j/4AAQSkZJRgABAQAAAQABAAD/2wBDABALDA4MChAODQ4SERATGCgaGBYWGDEjJR0oOjM9PDkzODdASFxOQERXRTc4UG1RV19iZ2hnPk1xeXBkeFxlZ2P/2wBDARESEhgVGC8aGi9jQjhCY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2P/wAARCAACAAIDASIAAhEBAxEB/8QAHwAAAQUBAQEBAQEAAAAAAAAAAAECAwQFBgcICQoL/8QAtRAAAgEDAwIEAwUFBAQAAAF9AQIDAAQRBRIhMUEGE1FhByJxFDKBkaEII0KxwRVS0fAkM2JyggkKFhcYGRolJicoKSo0NTY3ODk6Q0RFRkdISUpTVFVWV1hZWmNkZWZnaGlqc3R1dnd4eXqDhIWGh4iJipKTlJWWl5iZmqKjpKWmp6ipqrKztLW2t7i5usLDxMXGx8jJytLT1NXW19jZ2uHi4+Tl5ufo6erx8vP09fb3+Pn6/8QAHwEAAwEBAQEBAQEBAQAAAAAAAAECAwQFBgcICQoL/8QAtREAAgECBAQDBAcFBAQAAQJ3AAECAxEEBSExBhJBUQdhcRMiMoEIFEKRobHBCSMzUvAVYnLRChYkNOEl8RcYGRomJygpKjU2Nzg5OkNERUZHSElKU1RVVldYWVpjZGVmZ2hpanN0dXZ3eHl6goOEhYaHiImKkpOUlZaXmJmaoqOkpaanqKmqsrO0tba3uLm6wsPExcbHyMnK0tPU1dbX2Nna4uPk5ebn6Onq8vP09fb3+Pn6/9oADAMBAAIRAxEAPwDPoooryj6I/9k=',
  'base64',
);
/** The first bytes of a WebP and a HEIC file: enough for the type check, which only reads the header. */
const WEBP_HEAD = Buffer.concat([
  Buffer.from('RIFF'),
  Buffer.from([0x24, 0, 0, 0]),
  Buffer.from('WEBPVP8 '),
  Buffer.alloc(32),
]);
const heifHead = (brand: string) =>
  Buffer.concat([Buffer.from([0, 0, 0, 0x18]), Buffer.from(`ftyp${brand}`), Buffer.alloc(32)]);

/** An app with the middleware on two routes; the handler reports what it received. */
function makeApp() {
  const app = express();
  const echo: express.RequestHandler = (req, res) => {
    res.json({
      received: req.file
        ? { size: req.file.size, mimetype: req.file.mimetype, ext: imageExtension(req.file.buffer) }
        : null,
    });
  };
  app.post('/photo', imageUpload('photo'), echo);
  app.post('/optional', imageUpload('photo', { required: false, maxBytes: 1024 }), echo);
  app.use(errorMiddleware);
  return app;
}

describe('imageUpload', () => {
  const app = makeApp();

  it('accepts a small PNG and a small JPEG, reporting the detected type', async () => {
    const png = smallPng();
    const a = await request(app)
      .post('/photo')
      .attach('photo', png, { filename: 'label.png', contentType: 'image/png' });
    expect(a.status).toBe(200);
    // Re-encoded from its pixels (server/storage/imageReencode.ts): the type is kept, the bytes are new.
    expect(a.body.received).toMatchObject({ mimetype: 'image/png', ext: 'png' });
    const b = await request(app)
      .post('/photo')
      .attach('photo', SMALL_JPEG, { filename: 'mismatch.jpg', contentType: 'image/jpeg' });
    expect(b.status).toBe(200);
    expect(b.body.received).toMatchObject({ mimetype: 'image/jpeg', ext: 'jpg' });
  });

  it('refuses WebP and HEIC with 415 asking for JPEG or PNG (no decoder: they could not be checked nor cleaned)', async () => {
    for (const [body, name, type] of [
      [WEBP_HEAD, 'a.webp', 'image/webp'],
      [heifHead('heic'), 'a.heic', 'image/heic'],
    ] as const) {
      const res = await request(app).post('/photo').attach('photo', body, { filename: name, contentType: type });
      expect(res.status).toBe(415);
      expect(res.body.error.message).toMatch(/JPEG or PNG/);
      expect(Object.keys(res.body.error.fields)).toEqual(['photo']);
    }
  });

  it('reports the type the bytes show when the declared image type is another image type', async () => {
    const res = await request(app)
      .post('/photo')
      .attach('photo', smallPng(), { filename: 'renamed.jpg', contentType: 'image/jpeg' });
    expect(res.status).toBe(200);
    expect(res.body.received.mimetype).toBe('image/png');
  });

  it('refuses an 11 MB file with 413 naming the field', async () => {
    const big = Buffer.concat([smallPng(), Buffer.alloc(11 * 1024 * 1024)]);
    const res = await request(app)
      .post('/photo')
      .attach('photo', big, { filename: 'big.png', contentType: 'image/png' });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(res.body.error.message).toContain('"photo"');
    expect(res.body.error.message).toContain('10 MB');
    expect(Object.keys(res.body.error.fields)).toEqual(['photo']);
  });

  it('honours a smaller maxBytes', async () => {
    const res = await request(app)
      .post('/optional')
      .attach('photo', Buffer.concat([smallPng(), Buffer.alloc(2048)]), {
        filename: 'a.png',
        contentType: 'image/png',
      });
    expect(res.status).toBe(413);
    expect(res.body.error.message).toContain('1 KB');
  });

  it('refuses a text file named photo.png declared as image/png with 415 (magic bytes)', async () => {
    const res = await request(app).post('/photo').attach('photo', Buffer.from('this is not a picture, only text\n'), {
      filename: 'photo.png',
      contentType: 'image/png',
    });
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
    expect(res.body.error.message).toContain('"photo"');
    expect(Object.keys(res.body.error.fields)).toEqual(['photo']);
  });

  it('refuses real image bytes declared as a non-image type with 415', async () => {
    const res = await request(app)
      .post('/photo')
      .attach('photo', smallPng(), { filename: 'a.pdf', contentType: 'application/pdf' });
    expect(res.status).toBe(415);
    expect(res.body.error.fields).toHaveProperty('photo');
  });

  it('refuses an empty file with 415', async () => {
    const res = await request(app)
      .post('/photo')
      .attach('photo', Buffer.alloc(0), { filename: 'empty.png', contentType: 'image/png' });
    expect(res.status).toBe(415);
  });

  it('answers 400 naming the field when a required photo is missing', async () => {
    const multipart = await request(app).post('/photo').field('note', 'no photo attached');
    expect(multipart.status).toBe(400);
    expect(multipart.body.error).toMatchObject({ code: 'bad_request', fields: { photo: 'Required' } });
    const json = await request(app).post('/photo').send({ note: 'not even multipart' });
    expect(json.status).toBe(400);
    expect(json.body.error.fields).toEqual({ photo: 'Required' });
  });

  it('lets an optional photo be absent', async () => {
    const res = await request(app).post('/optional').field('note', 'no photo');
    expect(res.status).toBe(200);
    expect(res.body.received).toBeNull();
  });

  it('answers 400 for a file in another field', async () => {
    const res = await request(app)
      .post('/photo')
      .attach('picture', smallPng(), { filename: 'a.png', contentType: 'image/png' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('picture');
  });
});

describe('detectImage / imageExtension', () => {
  it('knows each accepted signature', () => {
    expect(imageExtension(smallPng())).toBe('png');
    expect(imageExtension(SMALL_JPEG)).toBe('jpg');
    expect(imageExtension(WEBP_HEAD)).toBe('webp');
    expect(imageExtension(heifHead('heic'))).toBe('heic');
    expect(imageExtension(heifHead('heix'))).toBe('heic');
    expect(detectImage(heifHead('mif1'))).toEqual({ type: 'image/heif', extension: 'heif' });
  });

  it('refuses look-alikes and short buffers', () => {
    expect(imageExtension(Buffer.alloc(0))).toBeNull();
    expect(imageExtension(Buffer.from([0xff, 0xd8]))).toBeNull();
    expect(imageExtension(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0, 0, 0, 0]))).toBeNull();
    expect(imageExtension(Buffer.concat([Buffer.from('RIFF'), Buffer.alloc(4), Buffer.from('WAVE')]))).toBeNull();
    expect(imageExtension(heifHead('isom'))).toBeNull();
    expect(imageExtension(Buffer.from('%PDF-1.7\n'))).toBeNull();
  });
});
