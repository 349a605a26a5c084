/**
 * Label truth: the printed label (PDF, read back with pdf-parse), the public check JSON and the shared display
 * function say exactly the same thing, field by field, over 1 000 generated label contents. The on-screen label
 * is checked against the same function in tests/web/labelView.test.tsx.
 *
 * Rules under test: hazard values (incident energy, arc-flash boundary, minimum arc rating) round UP at the shown
 * precision (conservative rounding, common practice, no source); shock approach boundaries print as the NFPA 70E
 * Table 130.4(E)(a) text; above 40 cal/cm² no arc-rated PPE is adequate (common practice, no source).
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { LABEL_DISPLAY_FIELDS, labelDisplay, type LabelDisplay } from '../../shared/labelDisplay';
import { groupLabelCode } from '../../shared/labelCode';
import type { LabelContent } from '../../shared/schemas/labels';
import { Label } from '../../server/db/models';
import { renderLabels } from '../../server/pdf/labels';
import { checkLabel, newLabelCode } from '../../server/services/labels';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { sampleLabelContents } from '../helpers/labelContentArb';
import { readPdf } from '../helpers/pdfText';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId = '';
let studyId = '';
beforeAll(async () => {
  t = await makeTestApp();
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'Label truth site' })
  ).body.id;
  studyId = await approveStudy(t, siteId, smallModel());
});
afterAll(async () => t.close());

/** Every string a field prints: its value with its unit, and the line under it. */
function printedStrings(d: LabelDisplay): { field: string; text: string }[] {
  const out: { field: string; text: string }[] = [];
  for (const f of LABEL_DISPLAY_FIELDS) {
    const v = d[f];
    out.push({ field: f, text: v.unit ? `${v.value} ${v.unit}` : v.value });
    if (v.secondary) out.push({ field: `${f}.secondary`, text: v.secondary });
  }
  return out;
}

/** pdf-parse folds whitespace and may split a word at a line break the layout made: compare without spaces. */
const squash = (s: string) => s.replace(/\s+/g, '');

describe('label truth', () => {
  const contents = sampleLabelContents(1000);
  const codes = contents.map(() => newLabelCode());

  it('covers the rules: below 1.2, the PPE levels, above 40, both unit orders, no clearing device', () => {
    expect(contents.length).toBe(1000);
    expect(contents.some((c) => c.incidentEnergyCalPerCm2 < 1.2)).toBe(true);
    expect(contents.some((c) => c.incidentEnergyCalPerCm2 > 40)).toBe(true);
    expect(contents.some((c) => c.unitOrder === 'us-first')).toBe(true);
    expect(contents.some((c) => c.clearingDevice === null)).toBe(true);
    expect(contents.some((c) => (c.otherSourcesClearedBy ?? []).length > 0)).toBe(true);
  });

  it('the PDF prints, page by page, exactly the display strings, none cut', async () => {
    const bytes = await renderLabels(
      contents.map((content, i) => ({ content, checkUrl: `https://emberline.example/l/${codes[i]}` })),
      '4x6',
    );
    const { text } = readPdf(bytes);
    const pages = text.split(/-- \d+ of \d+ --/).slice(0, contents.length);
    expect(pages.length).toBe(contents.length);
    const misses: string[] = [];
    pages.forEach((page, i) => {
      const d = labelDisplay(contents[i]);
      const flat = squash(page);
      for (const s of printedStrings(d)) {
        if (!flat.includes(squash(s.text))) misses.push(`label ${i} ${s.field}: "${s.text}" not in the PDF`);
      }
      if (page.includes('…')) misses.push(`label ${i}: text cut with an ellipsis`);
      if (!flat.includes(squash(groupLabelCode(codes[i])))) misses.push(`label ${i}: code missing`);
    });
    expect(misses.slice(0, 20)).toEqual([]);
  }, 600_000); // a safety net only: on a busy 2-core machine the 1 000 labels take minutes

  it('the public check JSON carries the same display, for the label and for its replacement', async () => {
    const rows = contents.map((content, i) => ({
      id: randomUUID(),
      organizationId: t.orgA.id,
      siteId,
      studyId,
      equipmentTag: `TRUTH-${i}`,
      code: codes[i],
      content: JSON.stringify(content),
      reviewBy: new Date('2031-03-14T00:00:00Z'),
      issuedAt: new Date('2026-03-14T00:00:00Z'),
    }));
    await Label.bulkCreate(rows);
    for (let i = 0; i < contents.length; i += 1) {
      const check = await checkLabel(t.ctx, codes[i]);
      expect(check.display).toEqual(labelDisplay(contents[i] as LabelContent));
    }
    // Over HTTP too, with the code typed as printed (groups, lower case).
    for (const i of [0, 1, 2, 499, 999]) {
      const res = await request(t.app).get(`/api/labels/${encodeURIComponent(groupLabelCode(codes[i]).toLowerCase())}`);
      expect(res.status).toBe(200);
      expect(res.body.display).toEqual(JSON.parse(JSON.stringify(labelDisplay(contents[i]))));
    }
  }, 600_000); // a safety net only: on a busy 2-core machine the 1 000 labels take minutes
});
