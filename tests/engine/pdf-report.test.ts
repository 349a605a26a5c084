/**
 * Study report PDF: the method text, every bus (results table and clearing trace with its governing sentence),
 * inputs, cautions, the approval block or the preliminary notice, page numbers, tables continued across pages,
 * and the plot data (device curves referred to the bus voltage).
 *
 * The study results come from the engine (runStudy on the small invented plant of tests/fixtures); values in the
 * PDF are checked against those results, not against numbers typed here. Referring a current across a
 * transformer by the voltage ratio (I·V conserved, ideal transformer) is circuit theory; layout choices are
 * conventions: "common practice, no source".
 */
import { PDFDocument } from 'pdf-lib';
import { CAUTIONS, UNREVIEWED_CAUTION } from '../../shared/cautions';
import { modelSchema, type Model } from '../../shared/schemas/model';
import type { StudyDto } from '../../shared/schemas/studies';
import type { StudyResults } from '../../shared/schemas/studyResults';
import { runStudy } from '../../server/engine/study';
import { bandCurves } from '../../server/engine/trip';
import { formatBoundary, formatCalPerCm2 } from '../../server/pdf/format';
import {
  METHOD_HEADING,
  PRELIMINARY_BANNER,
  deviceSettings,
  renderStudyReport,
  tracePlotData,
  type StudyReportInput,
} from '../../server/pdf/studyReport';
import { clippedPath, decadeRange } from '../../server/pdf/tccPlot';
import { deviceSettingParts } from '../../shared/deviceSummary';
import { deviceSettingsSummary } from '../../components/model/summaries';
import { smallModel } from '../fixtures/smallModel';
import { expectClose } from '../helpers/approx';
import { readPdf } from '../helpers/pdfText';

function pdfText(bytes: Uint8Array): { text: string; pages: number } {
  const { text, pages } = readPdf(bytes);
  return { text, pages };
}

const norm = (s: string) => s.replace(/\s+/g, ' ').trim();

const approvedStudy: StudyDto = {
  id: 'st-1',
  siteId: 'site-1',
  siteName: 'Cedar Hollow Pumping Station',
  revision: 3,
  title: 'Incident energy study, main service and motor control',
  status: 'approved',
  modelVersion: 7,
  modelUpdatedAt: '2025-02-01T10:00:00Z',
  lastEditedBy: null,
  parentStudyId: null,
  submittedAt: '2025-02-10T10:00:00Z',
  approval: {
    approvedAt: '2025-03-14T15:20:00Z',
    approvedById: 'u-9',
    approverName: 'Dana Okafor',
    licenceNumber: 'PE-40921',
    jurisdiction: 'Oregon',
    reviewDueAt: '2030-03-14T00:00:00Z',
  },
  supersededAt: null,
  pastReview: false,
  stale: false,
  latestRun: {
    id: 'run-1',
    status: 'done',
    progress: 1,
    message: '',
    modelVersion: 7,
    startedAt: '2025-03-01T09:00:00Z',
    finishedAt: '2025-03-01T09:00:02Z',
  },
  resultsCurrent: true,
  createdAt: '2025-01-20T08:00:00Z',
};

const draftStudy: StudyDto = { ...approvedStudy, status: 'draft', approval: null, revision: 4 };

function input(
  study: StudyDto,
  opts: { maxArcDurationMs?: number } = {},
): StudyReportInput & { model: Model; results: StudyResults } {
  const model = modelSchema.parse(smallModel());
  const results = runStudy(model, opts);
  return {
    organizationName: 'Cedar Hollow Water Authority',
    site: { name: 'Cedar Hollow Pumping Station', address: '1200 Riverbend Road, Cedar Hollow' },
    study,
    results,
    model,
    cautions: CAUTIONS,
  };
}

describe('renderStudyReport', () => {
  it('approved: cover, method, inputs, results and a clearing trace for every bus, approval block, page numbers', async () => {
    const inp = input(approvedStudy);
    const bytes = await renderStudyReport(inp);
    const doc = await PDFDocument.load(bytes);
    const n = doc.getPageCount();
    expect(n).toBeGreaterThanOrEqual(4);
    for (let i = 0; i < n; i += 1) {
      expectClose(doc.getPage(i).getWidth(), 612); // US letter
      expectClose(doc.getPage(i).getHeight(), 792);
    }
    const { text, pages } = pdfText(bytes);
    expect(pages).toBe(n);
    for (let i = 1; i <= n; i += 1) expect(text).toContain(`Page ${i} of ${n}`);
    expect(text.split('Emberline · Cedar Hollow Water Authority').length - 1).toBe(n); // footer on every page

    // Cover.
    expect(text).toContain('ARC-FLASH STUDY REPORT');
    expect(text).toContain('Incident energy study, main service and motor control');
    expect(text).toContain('1200 Riverbend Road, Cedar Hollow');
    expect(text).toContain('Approved');

    // Method and assumptions.
    expect(text).toContain(METHOD_HEADING);
    expect(text).toContain('IEEE 1584-2018');
    expect(text).toContain('maximum (total clearing) curve');
    expect(text).toContain('full arcing current and the reduced arcing current');
    expect(text).toContain('time-stepped energy');
    expect(text).toContain(`Arc duration cap: 2 s (${inp.results.maxArcDurationMs} ms)`);
    expect(text).toContain('Line side of the main');
    expect(text).toContain('Motor contribution');
    // The default motor decay ('higher'): both models evaluated, the higher kept — the report says so.
    expect(inp.results.motorDecayModel).toBe('higher');
    expect(text).toMatch(/evaluated\s+twice/);
    expect(text).toMatch(/the\s+higher\s+energy\s+is\s+kept/);

    // Inputs: every device, with its kind.
    for (const d of inp.model.devices) expect(text).toContain(d.id);
    expect(text).toContain('Relay with breaker');
    expect(text).toContain('Electronic trip unit');
    expect(text).toMatch(/Thermal-\s?magnetic breaker/); // may break after the hyphen
    expect(text).toContain('Fuse');
    expect(text).toContain('TX');
    expect(text).toContain('SWGR → SWBD');

    // Results and traces: every bus, its energy and boundary as computed, its governing sentence.
    for (const b of inp.results.buses) {
      expect(b.status).toBe('ok');
      expect(text).toContain(`${b.busId} — ${b.busName}`);
      expect(text).toContain(formatCalPerCm2(b.incidentEnergyCalPerCm2 as number));
      expect(text).toContain(formatBoundary(b.arcFlashBoundaryMm as number));
      const gov = b.cases.find((c) => c.arcCase === b.governing?.arcCase && c.location === b.governing?.location);
      expect(gov).toBeDefined();
      expect(text).toContain(norm(gov?.sentence ?? ''));
      expect(text).toContain(b.labelValues?.signalWord as string);
    }
    // Warnings of the fuse-cleared panel are listed under its trace.
    expect(text).toContain('FUSE_BELOW_LOWEST_TIME');

    // Cautions and approval.
    for (const c of CAUTIONS) expect(text).toContain(norm(c));
    expect(text).toContain('Dana Okafor');
    expect(text).toContain('PE-40921');
    expect(text).toContain('Oregon');
    expect(text).toContain('2025-03-14');
    expect(text).toContain('2030-03-14');
    expect(text).not.toContain('PRELIMINARY');
  });

  it('not approved: the preliminary banner and notice instead of an approval', async () => {
    const bytes = await renderStudyReport(input(draftStudy));
    const { text, pages } = pdfText(bytes);
    expect(text).toContain(PRELIMINARY_BANNER);
    expect(text).toContain(norm(UNREVIEWED_CAUTION));
    expect(text).toContain('Draft');
    expect(text).not.toContain('Dana Okafor');
    // On every page's footer as well as on the cover and at the end.
    expect(text.split(PRELIMINARY_BANNER).length - 1).toBeGreaterThanOrEqual(pages + 2);
  });

  it('states the arc-duration cap the study used', async () => {
    const inp = input(approvedStudy, { maxArcDurationMs: 1500 });
    expect(inp.results.maxArcDurationMs).toBe(1500);
    const { text } = pdfText(await renderStudyReport(inp));
    expect(text).toContain('Arc duration cap: 1.5 s (1500 ms)');
  });

  it('continues long tables on the next page with the header repeated, and reports buses in error', async () => {
    const inp = input(approvedStudy);
    const [first] = inp.results.buses;
    const many = Array.from({ length: 70 }, (_, i) => ({
      ...first,
      busId: `BUS-${String(i + 1).padStart(3, '0')}`,
      busName: `Bus ${i + 1}`,
    }));
    many.push({
      ...first,
      busId: 'BUS-ERR',
      busName: 'Broken bus',
      status: 'error',
      error: { code: 'OUT_OF_RANGE', message: 'Gap outside the model range' },
      cases: [],
    });
    const bytes = await renderStudyReport({ ...inp, results: { ...inp.results, buses: many } });
    const { text } = pdfText(bytes);
    expect(text).toContain('(continued)');
    for (const b of many) expect(text).toContain(b.busId);
    expect(text).toContain('Error: Gap outside the model range');
    expect(text).toContain('Not computed: Gap outside the model range');
    // The results table's header appears again on the page where it continues.
    expect(text.split('Energy, cal/cm²').length - 1).toBeGreaterThan(many.length);
  });
});

describe('clearing-trace plot data', () => {
  it('refers a device curve across the transformer by the voltage ratio, and puts the clearing point at the current the device sees', () => {
    const inp = input(approvedStudy);
    const bus = inp.results.buses.find((b) => b.busId === 'SWBD');
    expect(bus?.governing).toEqual({ arcCase: 'full', location: 'line-side' });
    const plot = tracePlotData(bus!, inp.model, inp.results.maxArcDurationMs / 1000);
    expect(plot).not.toBeNull();
    const gov = bus!.cases.find((c) => c.arcCase === 'full' && c.location === 'line-side')!;
    const relay = gov.devices.find((d) => d.deviceId === 'R-TX')!;
    const ratio = relay.kv / bus!.nominalKv; // 12.47 / 0.48
    expectClose(ratio, 12.47 / 0.48, 1e-12);
    // The same samples as bandCurves at the device's own amperes, shifted by the ratio.
    const placed = inp.model.devices.find((d) => d.id === 'R-TX')!;
    const band = bandCurves(placed.device, { fromA: plot!.fromA / ratio, toA: plot!.toA / ratio, pointsPerDecade: 24 });
    const curve = plot!.curves.find((c) => c.label.startsWith('R-TX'))!;
    expect(curve.max).toHaveLength(band.max.length);
    const k = Math.floor(band.max.length / 2);
    expectClose(curve.max[k][0], band.max[k][0] * ratio, 1e-12);
    expectClose(curve.max[k][1], band.max[k][1], 1e-12);
    // Clearing point: the relay's current referred to the bus (I·V conserved) = arcing current × the relay's share.
    const point = plot!.points.find((p) => p.filled)!;
    expectClose(point.currentA, relay.currentA * ratio, 1e-12);
    expectClose(point.currentA, gov.arcingCurrentKa * 1000 * relay.share, 1e-6);
    expectClose(point.timeS, relay.clearingTimeS as number, 1e-12);
    // Vertical lines at the full and reduced arcing currents of the governing side.
    const currents = plot!.markers
      .filter((m) => m.label.startsWith('Iarc'))
      .map((m) => m.currentA)
      .sort((a, b) => a - b);
    // A dashed line where the relay's inverse curve stops (default 20 × pickup, common practice, no source),
    // referred to the bus voltage like its curve.
    const limit = plot!.markers.find((m) => m.label.startsWith('R-TX curve limit'));
    if (placed.device.kind !== 'relay' || placed.device.pickupA === undefined) throw new Error('R-TX is a relay');
    const limitA = placed.device.pickupA * (placed.device.curveLimitMultiple ?? 20) * ratio;
    if (limitA <= plot!.toA) expectClose(limit!.currentA, limitA, 1e-12);
    else expect(limit).toBeUndefined();
    const expected = bus!.cases
      .filter((c) => c.location === 'line-side')
      .map((c) => c.arcingCurrentKa * 1000)
      .sort((a, b) => a - b);
    expect(currents).toHaveLength(2);
    currents.forEach((c, i) => expectClose(c, expected[i], 1e-12));
    // The plotted range holds both arcing currents and the bolted fault current.
    expect(plot!.fromA).toBeLessThan(expected[0]);
    expect(plot!.toA).toBeGreaterThan(bus!.boltedFaultKa * 1000);
  });

  it('decade ranges, segment clipping and clipped paths (plot geometry)', () => {
    expect(decadeRange(513, 58117)).toEqual([100, 100000]);
    expect(decadeRange(100, 1000)).toEqual([100, 1000]);
    const [lo, hi] = decadeRange(0.01, 0.01);
    expect(hi).toBeGreaterThan(lo);
    // A segment crossing the right edge of [0,10]×[0,10] is cut there.
    expect(
      clippedPath(
        [
          [5, 5],
          [15, 5],
        ],
        0,
        0,
        10,
        10,
      ),
    ).toBe('M 5.00 5.00 L 10.00 5.00');
    // A segment wholly outside draws nothing.
    expect(
      clippedPath(
        [
          [11, 11],
          [20, 20],
        ],
        0,
        0,
        10,
        10,
      ),
    ).toBe('');
    // A polyline leaving and re-entering the box is drawn as two runs.
    const d = clippedPath(
      [
        [1, 1],
        [5, 5],
        [5, 20],
        [8, 8],
      ],
      0,
      0,
      10,
      10,
    );
    expect(d.match(/M /g)).toHaveLength(2);
  });

  it('names the key settings of each device kind', () => {
    const m = modelSchema.parse(smallModel());
    const byId = (id: string) => m.devices.find((d) => d.id === id)!.device;
    expect(deviceSettings(byId('R-TX'))).toBe(
      'IEEE-VI, pickup 100 A, time dial 1, curve to 20× pickup, instantaneous 3000 A, breaker 5 cycles',
    );
    expect(deviceSettings(byId('CB-MAIN'))).toContain('ST 4× / 0.3 s flat');
    expect(deviceSettings(byId('CB-MCC'))).toContain('instantaneous 10× ±20 %');
    expect(deviceSettings(byId('F-PNL-FU'))).toBe('200 A, total-clearing curve, 4 points');
  });

  it('the model editor and the report say the same settings of every device (one wording, shared/deviceSummary.ts)', () => {
    const m = modelSchema.parse(smallModel());
    for (const d of m.devices) {
      const parts = deviceSettingParts(d.device);
      expect(parts.length).toBeGreaterThan(1);
      expect(deviceSettings(d.device)).toBe(parts.join(', '));
      expect(deviceSettingsSummary(d.device)).toBe(parts.join(' · '));
    }
  });
});
