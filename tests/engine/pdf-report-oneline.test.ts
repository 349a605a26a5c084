/**
 * Study report PDF, one-line diagram (issue 21): the drawing of shared/oneLine printed after the inputs, every element
 * id on it and each labelled bus's energy as on its label; a large plant split into sheets ("sheet i of n"), at most
 * MAX_SHEETS printed and the rest named. Layout choices are conventions: common practice, no source.
 */
import { CAUTIONS } from '../../shared/cautions';
import { formatCalPerCm2 } from '../../shared/labelDisplay';
import { layoutOneLine } from '../../shared/oneLine/layout';
import { modelSchema, type Model } from '../../shared/schemas/model';
import type { StudyDto } from '../../shared/schemas/studies';
import type { StudyResults } from '../../shared/schemas/studyResults';
import { runStudy } from '../../server/engine/study';
import { renderStudyReport } from '../../server/pdf/studyReport';
import { MAX_SHEETS, oneLineSheets } from '../../server/pdf/studyReport/oneLine';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { radialPlant } from '../../server/bench/scaling';
import { readPdf } from '../helpers/pdfText';

const study: StudyDto = {
  id: 'st-1',
  siteId: 'site-1',
  siteName: 'Larkspur Valley Water Reclamation Facility',
  revision: 1,
  title: 'Incident energy study',
  status: 'draft',
  modelVersion: 1,
  modelUpdatedAt: '2026-01-01T10:00:00Z',
  lastEditedBy: null,
  parentStudyId: null,
  submittedAt: null,
  approval: null,
  supersededAt: null,
  pastReview: false,
  stale: false,
  latestRun: null,
  resultsCurrent: true,
  createdAt: '2026-01-01T08:00:00Z',
} as StudyDto;

const report = (model: Model, results: StudyResults) =>
  renderStudyReport({
    organizationName: 'Larkspur Valley Utility District',
    site: { name: 'Larkspur Valley Water Reclamation Facility', address: '1 Reclamation Way' },
    study,
    results,
    model,
    cautions: CAUTIONS,
  });

const squash = (s: string) => s.replace(/\s+/g, '');

describe('study report: one-line diagram', () => {
  it('the demo facility: every element id on the drawing, and each labelled bus’s energy and signal word', async () => {
    const model = modelSchema.parse(larkspurModel());
    const results = runStudy(model, {});
    const { text } = readPdf(await report(model, results));
    expect(text).toContain('One-line diagram');
    const flat = squash(text);
    for (const id of [
      ...model.buses,
      ...model.sources,
      ...model.transformers,
      ...model.cables,
      ...model.motors,
      ...model.devices,
    ].map((x) => x.id)) {
      expect([id, flat.includes(squash(id))]).toEqual([id, true]);
    }
    for (const b of results.buses) {
      if (!b.labelValues) continue;
      const shown = `${formatCalPerCm2(b.labelValues.incidentEnergyCalPerCm2)}cal/cm²·${b.labelValues.signalWord}`;
      expect([b.busId, flat.includes(squash(shown))]).toEqual([b.busId, true]);
    }
  }, 60_000);

  it('a large plant is split into sheets, at most MAX_SHEETS printed and the rest named', async () => {
    const model = modelSchema.parse(radialPlant(600));
    const sheets = oneLineSheets(layoutOneLine(model));
    expect(sheets.length).toBeGreaterThan(MAX_SHEETS);
    // The results are not needed for the split: an empty run keeps the test fast.
    const results = { ...runStudy(modelSchema.parse(larkspurModel()), {}), buses: [] } as StudyResults;
    const { text } = readPdf(await report(model, results));
    expect(text).toContain(`One-line diagram (sheet 1 of ${sheets.length})`);
    expect(text).toContain(`sheet ${MAX_SHEETS} of ${sheets.length}`);
    expect(text).not.toContain(`sheet ${MAX_SHEETS + 1} of`);
    expect(text).toContain(
      `${sheets.length - MAX_SHEETS} further sheet(s) of the one-line diagram are not printed here`,
    );
  }, 120_000);
});
