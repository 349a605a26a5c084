/**
 * Study report PDF of a model with operating scenarios: a section lists the scenarios (name, id, what each changes, in
 * words) and, per bus, the incident energy in each scenario with the one the label takes marked; a model without
 * scenarios has no such section. The results come from the engine (runStudy on the small invented plant of
 * tests/fixtures with two scenarios); the PDF is checked against those results, not against numbers typed here.
 * Table layout is a convention (common practice, no source).
 */
import { CAUTIONS } from '../../shared/cautions';
import { modelSchema, type ModelInput } from '../../shared/schemas/model';
import type { StudyDto } from '../../shared/schemas/studies';
import { runStudy } from '../../server/engine/study';
import { formatCalPerCm2 } from '../../server/pdf/format';
import { renderStudyReport } from '../../server/pdf/studyReport';
import { smallModel } from '../fixtures/smallModel';
import { readPdf } from '../helpers/pdfText';

const norm = (s: string) => s.replace(/\s+/g, ' ').trim();

const study: StudyDto = {
  id: 'st-1',
  siteId: 'site-1',
  siteName: 'Cedar Hollow Pumping Station',
  revision: 1,
  title: 'Incident energy study in operating scenarios',
  status: 'draft',
  modelVersion: 2,
  modelUpdatedAt: '2025-02-01T10:00:00Z',
  lastEditedBy: null,
  parentStudyId: null,
  submittedAt: null,
  approval: null,
  supersededAt: null,
  pastReview: false,
  stale: false,
  latestRun: null,
  resultsCurrent: true,
  createdAt: '2025-01-20T08:00:00Z',
};

async function report(input: ModelInput) {
  const model = modelSchema.parse(input);
  const results = runStudy(model, {});
  const bytes = await renderStudyReport({
    organizationName: 'Cedar Hollow Water Authority',
    site: { name: 'Cedar Hollow Pumping Station', address: '1200 Riverbend Road, Cedar Hollow' },
    study,
    results,
    model,
    cautions: CAUTIONS,
  });
  return { results, text: norm(readPdf(bytes).text) };
}

describe('study report with operating scenarios', () => {
  it('lists the scenarios and what each changes, and every bus’s energy in each with the governing one marked', async () => {
    const { results, text } = await report({
      ...smallModel(),
      scenarios: [
        { id: 'util-min', name: 'Utility minimum', sources: { UTIL: { shortCircuitMva: 40, xr: 6 } } },
        { id: 'no-motors', name: 'Motors stopped', allMotorsOff: true },
      ],
    });
    expect(results.scenarios?.map((s) => s.id)).toEqual(['base', 'util-min', 'no-motors']);
    const at = text.indexOf('Operating scenarios');
    expect(at).toBeGreaterThan(0);
    const section = text.slice(at);
    // The scenarios, their ids and what they change, in words.
    expect(section).toContain('Utility minimum');
    expect(section).toContain('util-min');
    expect(section).toContain('UTIL 40 MVA short circuit, X/R 6');
    expect(section).toContain('Motors stopped');
    expect(section).toContain('all motors stopped');
    expect(section).toContain('Nothing: the model as written');

    // Per bus: its energy in each scenario (rounded up as on the label), the governing one marked with an asterisk,
    // in one row, and the scenario the label takes.
    const energies = section.slice(section.indexOf('Incident energy in each scenario'));
    let marked = 0;
    for (const b of results.buses) {
      const cells = results.scenarios!.map((s) => {
        const e = b.scenarios!.find((x) => x.scenarioId === s.id)!;
        expect(e.status).toBe('ok');
        const v = formatCalPerCm2(e.incidentEnergyCalPerCm2!);
        return s.id === b.scenarioId ? `${v} *` : v;
      });
      const takes = results.scenarios!.find((s) => s.id === b.scenarioId)!.name;
      expect(energies).toContain(`${b.busId} ${cells.join(' ')} ${takes}`);
      // The label's energy is the highest of the scenarios' (the governing one).
      expect(b.incidentEnergyCalPerCm2).toBe(Math.max(...b.scenarios!.map((s) => s.incidentEnergyCalPerCm2!)));
      marked++;
    }
    expect(marked).toBe(results.buses.length);
  });

  it('a model without scenarios has no scenario section', async () => {
    const { results, text } = await report(smallModel());
    expect(results.scenarios).toBeUndefined();
    expect(text).not.toContain('Operating scenarios');
    expect(text).not.toContain('Incident energy in each scenario');
  });
});
