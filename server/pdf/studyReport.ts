/**
 * The engineer's study report (docs/ARCHITECTURE.md, Data path of a study run, step 13): cover, scope, method and
 * assumptions, inputs, results, a clearing trace per bus with a time-current plot drawn as vectors, warnings, cautions
 * and the approval block (or the preliminary notice). US letter pages, page numbers and a footer on every page; tables
 * continue on the next page with their header repeated. Layout is a convention (common practice, no source).
 */
import { PDFDocument, rgb, type PDFFont, type PDFPage } from 'pdf-lib';
import { STUDY_STATUS_LABELS, type StudyDto } from '../../shared/schemas/studies';
import type { Device } from '../../shared/schemas/device';
import { DEVICE_KIND_LABELS } from '../../shared/schemas/deviceLibrary';
import { deviceSettingParts } from '../../shared/deviceSummary';
import type { Model, PlacedDevice } from '../../shared/schemas/model';
import type { ArcCaseTrace, BusResult, StudyResults } from '../../shared/schemas/studyResults';
import { UNREVIEWED_CAUTION } from '../../shared/cautions';
import { bandCurves } from '../engine/trip';
import { relaySettings } from '../engine/trip/relay';
import { BLACK, Canvas, LINE_HEIGHT, type Align } from './canvas';
import { embedFonts, type PdfFonts } from './fonts';
import { formatBoundary, formatCalPerCm2, formatSeconds, formatSig, formatVoltage } from './format';
import { noDeviceClearsText } from '../../shared/labelDisplay';
import { drawTimeCurrentPlot, type PlotCurve, type PlotMarker, type PlotPoint } from './tccPlot';

export interface StudyReportInput {
  organizationName: string;
  site: { name: string; address: string };
  study: StudyDto;
  results: StudyResults;
  model: Model;
  cautions: readonly string[];
}

const PAGE_W = 612;
const PAGE_H = 792;
const MARGIN_X = 54;
const MARGIN_TOP = 54;
const FOOTER_H = 40;
const CONTENT_W = PAGE_W - 2 * MARGIN_X;
const BOTTOM = PAGE_H - FOOTER_H - 14;
const HEADER_FILL = rgb(0.92, 0.92, 0.92);
const RULE = rgb(0.6, 0.6, 0.6);

export const METHOD_HEADING = 'Method and assumptions';
export const PRELIMINARY_BANNER = 'PRELIMINARY — NOT APPROVED';

export interface Column {
  header: string;
  /** Relative width. */
  weight: number;
  align?: Align;
  mono?: boolean;
}

/** Lays out flowing content on pages: headings, paragraphs, lists, tables that break across pages, plots. */
class ReportWriter {
  readonly pages: PDFPage[] = [];
  private page!: PDFPage;
  cv!: Canvas;
  y = MARGIN_TOP;

  constructor(
    readonly doc: PDFDocument,
    readonly fonts: PdfFonts,
  ) {}

  newPage(): void {
    this.page = this.doc.addPage([PAGE_W, PAGE_H]);
    this.pages.push(this.page);
    this.cv = new Canvas(this.page, PAGE_H);
    this.y = MARGIN_TOP;
  }

  /** Starts a new page unless `h` more points fit on this one. */
  ensure(h: number): void {
    if (this.y + h > BOTTOM) this.newPage();
  }

  space(h: number): void {
    this.y += h;
  }

  heading(text: string, level: 1 | 2 = 1): void {
    const size = level === 1 ? 14 : 11;
    this.ensure(size * 1.4 + 60); // keep with what follows
    if (level === 1 && this.y > MARGIN_TOP) this.y += 8;
    const fitted = this.cv.text(text, MARGIN_X, this.y, CONTENT_W, {
      font: this.fonts.textBold,
      size,
      minSize: size * 0.7,
      maxLines: 2,
    });
    this.y += fitted.height + 1;
    if (level === 1) {
      this.cv.line(MARGIN_X, this.y, MARGIN_X + CONTENT_W, this.y, { width: 0.8 });
      this.y += 6;
    } else {
      this.y += 3;
    }
  }

  /** A paragraph; long paragraphs continue on the next page line by line. */
  paragraph(text: string, opts: { font?: PDFFont; size?: number; indent?: number; after?: number } = {}): void {
    const font = opts.font ?? this.fonts.text;
    const size = opts.size ?? 9;
    const indent = opts.indent ?? 0;
    const w = CONTENT_W - indent;
    const fitted = this.cv.fit(text, w, { font, size, maxLines: 1000, minSize: size });
    const lh = size * LINE_HEIGHT;
    for (const line of fitted.lines) {
      this.ensure(lh);
      this.cv.drawFitted({ lines: [line], size, truncated: false, font: fitted.font }, MARGIN_X + indent, this.y, w, {
        font,
        size,
      });
      this.y += lh;
    }
    this.y += opts.after ?? 4;
  }

  bullets(items: string[], size = 9): void {
    for (const item of items) {
      this.ensure(size * LINE_HEIGHT);
      this.cv.text('•', MARGIN_X + 2, this.y, 8, { font: this.fonts.text, size });
      this.paragraph(item, { size, indent: 12, after: 2.5 });
    }
    this.y += 2;
  }

  /** Label/value pairs in two columns. */
  keyValues(pairs: [string, string][], opts: { labelW?: number; size?: number } = {}): void {
    const labelW = opts.labelW ?? 150;
    const size = opts.size ?? 9.5;
    for (const [k, v] of pairs) {
      const opt = { font: this.fonts.text, size, minSize: size * 0.8, maxLines: 4 };
      const value = this.cv.fit(v, CONTENT_W - labelW, opt);
      this.ensure(value.height + 3);
      this.cv.text(k, MARGIN_X, this.y, labelW - 8, {
        font: this.fonts.textBold,
        size,
        minSize: size * 0.8,
        maxLines: 2,
      });
      this.cv.drawFitted(value, MARGIN_X + labelW, this.y, CONTENT_W - labelW, opt);
      this.y += Math.max(value.height, size * LINE_HEIGHT) + 3;
    }
  }

  /** A table; rows that do not fit go to the next page under a repeated header. */
  table(columns: Column[], rows: string[][], opts: { size?: number; note?: string; pad?: number } = {}): void {
    const size = opts.size ?? 7.5;
    const pad = opts.pad ?? 3.5;
    const total = columns.reduce((s, c) => s + c.weight, 0);
    const widths = columns.map((c) => (c.weight / total) * CONTENT_W);
    const xs = widths.map((_, i) => MARGIN_X + widths.slice(0, i).reduce((s, w) => s + w, 0));
    const cellFont = (c: Column) => (c.mono ? this.fonts.mono : this.fonts.text);
    const fitRow = (cells: string[], header: boolean) =>
      cells.map((cell, i) => {
        const font = header ? this.fonts.textBold : cellFont(columns[i]);
        const cellSize = header ? size - 0.5 : size;
        // Numbers read best on one line: shrink a little first, wrap only if that is not enough.
        if (!header && columns[i].mono) {
          const one = this.cv.fit(cell, widths[i] - 2 * pad, {
            font,
            size: cellSize,
            minSize: size * 0.85,
            maxLines: 1,
          });
          if (!one.truncated) return one;
        }
        return this.cv.fit(cell, widths[i] - 2 * pad, {
          font,
          size: cellSize,
          minSize: size * 0.8,
          maxLines: header ? 3 : 6,
        });
      });
    const rowHeight = (fitted: { height: number }[]) =>
      Math.max(...fitted.map((f) => f.height), size * LINE_HEIGHT) + 2 * pad;
    const drawRow = (cells: string[], header: boolean) => {
      const fitted = fitRow(cells, header);
      const h = rowHeight(fitted);
      if (header) this.cv.rect(MARGIN_X, this.y, CONTENT_W, h, { fill: HEADER_FILL });
      fitted.forEach((f, i) => {
        const font = header ? this.fonts.textBold : cellFont(columns[i]);
        this.cv.drawFitted(f, xs[i] + pad, this.y + pad, widths[i] - 2 * pad, {
          font,
          size: f.size,
          align: columns[i].align ?? 'left',
        });
      });
      this.y += h;
      this.cv.line(MARGIN_X, this.y, MARGIN_X + CONTENT_W, this.y, {
        width: header ? 0.7 : 0.3,
        color: header ? BLACK : RULE,
      });
    };
    const headerCells = columns.map((c) => c.header);
    const headerH = rowHeight(fitRow(headerCells, true));
    const firstH = rows.length > 0 ? rowHeight(fitRow(rows[0], false)) : 0;
    this.ensure(headerH + firstH);
    drawRow(headerCells, true);
    for (const row of rows) {
      const h = rowHeight(fitRow(row, false));
      if (this.y + h > BOTTOM) {
        this.newPage();
        this.cv.text('(continued)', MARGIN_X, this.y, CONTENT_W, { font: this.fonts.text, size: 7 });
        this.y += 10;
        drawRow(headerCells, true);
      }
      drawRow(row, false);
    }
    if (rows.length === 0) {
      this.cv.text('None.', MARGIN_X + pad, this.y + pad, CONTENT_W, { font: this.fonts.text, size });
      this.y += size * LINE_HEIGHT + 2 * pad;
    }
    if (opts.note) {
      this.y += 3;
      this.paragraph(opts.note, { size: 7 });
    }
    this.y += 8;
  }

  /** Page numbers and footer on every page (drawn last, when the page count is known). */
  footers(left: string, right: string | null): void {
    const n = this.pages.length;
    this.pages.forEach((page, i) => {
      const cv = new Canvas(page, PAGE_H);
      const top = PAGE_H - FOOTER_H;
      cv.line(MARGIN_X, top, MARGIN_X + CONTENT_W, top, { width: 0.5, color: RULE });
      cv.text(left, MARGIN_X, top + 5, CONTENT_W * 0.7, { font: this.fonts.text, size: 7, minSize: 5.5, maxLines: 2 });
      cv.text(`Page ${i + 1} of ${n}`, MARGIN_X + CONTENT_W * 0.7, top + 5, CONTENT_W * 0.3, {
        font: this.fonts.text,
        size: 7,
        align: 'right',
      });
      if (right)
        cv.text(right, MARGIN_X + CONTENT_W * 0.5, top + 15, CONTENT_W * 0.5, {
          font: this.fonts.textBold,
          size: 7,
          align: 'right',
        });
    });
  }
}

// ---------------------------------------------------------------------------------------------
// Texts

/** "2025-03-01T09:00:02Z" → "2025-03-01 09:00 UTC" (the text as given when it is not an ISO timestamp). */
function formatTimestamp(iso: string): string {
  const m = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2})(?::\d{2}(?:\.\d+)?)?(?:Z|\+00:?00)$/.exec(iso);
  return m ? `${m[1]} ${m[2]} UTC` : iso;
}

const num = (v: number | undefined | null, sig = 3) => (v === undefined || v === null ? '—' : formatSig(v, sig));
const ka = (v: number | undefined) => (v === undefined ? '—' : formatSig(v, 3));

function caseName(c: { arcCase: 'full' | 'reduced'; location: 'load-side' | 'line-side' }): string {
  return `${c.arcCase === 'full' ? 'Full' : 'Reduced'} arcing current${c.location === 'line-side' ? ', line side of the main' : ''}`;
}

function governingCase(b: BusResult): ArcCaseTrace | undefined {
  return b.cases.find((c) => c.arcCase === b.governing?.arcCase && c.location === b.governing?.location);
}

/** Where a placed device sits, in words. */
export function deviceLocation(model: Model, d: PlacedDevice): string {
  if (d.source) return `${d.source} (source)`;
  const branch =
    model.transformers.find((t) => t.id === d.branch) ??
    model.cables.find((c) => c.id === d.branch) ??
    model.ties.find((t) => t.id === d.branch);
  if (!branch) return d.branch ?? '—';
  const bus = d.end === 'from' ? branch.fromBus : branch.toBus;
  return `${d.branch}, ${d.end} end (at ${bus})`;
}

/** The key settings of a device, in one line. */
export function deviceSettings(device: Device): string {
  return deviceSettingParts(device).join(', ');
}

function methodItems(results: StudyResults, model: Model): string[] {
  const capS = results.maxArcDurationMs / 1000;
  const firstLv = results.buses.find((b) => b.labelValues)?.labelValues;
  const items = [
    `Short circuit: three-phase symmetrical rms bolted fault current at each bus from the complex impedances of the network (sources, transformers, cables, motors), pre-fault voltage ${num(model.prefaultPu ?? 1)} pu. The same solution gives the current through every branch, so each protective device is read at the current it sees.`,
    'Arcing current and incident energy: the IEEE 1584-2018 empirical model (208 V to 15 kV) with the electrode configuration, gap, working distance and enclosure size of each bus; values not entered are the typical values of the equipment class and are marked in the inputs.',
    'Both the full arcing current and the reduced arcing current (IEEE 1584-2018 arcing-current variation factor) are evaluated, each with its own clearing time; the case with the larger incident energy governs and is named in the results.',
    'Clearing time: read on the maximum (total clearing) curve of each device’s trip band at the current that device sees during the arc (its share of the arcing current, referred across transformers by the voltage ratio). Between published points the band is interpolated log-log; beyond its data it is not extrapolated and a warning is shown.',
    'Currents that change during the arc: each source’s contribution is followed in time — a generator’s by its decrement from the subtransient through the transient to the sustained current (X″d, X′d, Xd or a sustained-current multiple, T″d, T′d; typical values where not entered, marked in the warnings; without Xd or a sustained multiple both a low and a supported sustained current are evaluated and the higher energy kept), a source’s until a device opens every path from it. Each device operates when the integral of dt / t(I) over the current it sees reaches 1 (IEEE C37.112, the integral form of the inverse-time characteristic); a definite-time or instantaneous element when its current has stayed above its pickup for its delay; an element whose current falls below its pickup stops and starts over (the conservative reading).',
    'Energy added step by step (time-stepped energy): IEEE 1584-2018 energy is proportional to the arc duration at a constant arcing current, so the arc is divided into steps (one per stretch of constant current; fractions of the fastest time constant while a current decays) and the energy of each step, at the arcing current of its higher end, is added. Devices are read at the lower end of each step, the energy at the higher: the higher hazard either way.',
    results.motorDecayModel === 'higher'
      ? `Motor contribution: each case with induction motors feeding the arc is evaluated twice — with their full first-cycle contribution for ${formatSeconds(results.motorDecayS)}, then stopping, and with a contribution decaying as e^(−t/τ), τ = ${formatSeconds(results.motorDecayS)}, dropped after 5 τ (both common practice, no source) — and the higher energy is kept, since neither model always gives the higher; each bus's trace names the model that governed.`
      : results.motorDecayModel === 'exponential'
        ? `Motor contribution: induction motors feed the arc with a contribution decaying as e^(−t/τ), τ = ${formatSeconds(results.motorDecayS)}, dropped after 5 τ (common practice, no source).`
        : `Motor contribution: induction motors feed their full first-cycle contribution for ${formatSeconds(results.motorDecayS)}, then stop (common practice, no source).`,
    `Arc duration cap: ${formatSig(capS, 3)} s (${results.maxArcDurationMs} ms), after IEEE 1584 guidance that a worker can move away from the arc within 2 s; not valid where the worker cannot move away. Cases cut off at the cap are marked. A bus may carry its own cap, or none, with the engineer's reason (e.g. a confined space where escape is not possible); it is stated with the bus's trace.`,
    'Line side of the main: where a bus’s main device shares the enclosure without isolation, an arc on its line side is cleared by the next device upstream; both sides are evaluated and the worse governs the label. Where the isolation of the main is not stated it is taken as not isolated (the conservative choice) and listed among the defaulted values.',
    'Arc-flash boundary: the distance at which the incident energy falls to 5.0 J/cm² (1.2 cal/cm²).',
  ];
  if (firstLv) {
    items.push(firstLv.minimumArcRatingBasis, firstLv.ppeLevelBasis, firstLv.signalWordBasis);
    if (firstLv.shockApproach) items.push(`Shock approach boundaries: ${firstLv.shockApproach.source}`);
  }
  items.push(`Engine: ${results.method}.`);
  return items;
}

// ---------------------------------------------------------------------------------------------
// Plot data

/** Curves, markers and points of one bus's clearing trace (currents referred to the bus voltage). */
export function tracePlotData(
  bus: BusResult,
  model: Model,
  capS: number,
): { curves: PlotCurve[]; markers: PlotMarker[]; points: PlotPoint[]; fromA: number; toA: number } | null {
  const gov = governingCase(bus);
  if (!gov) return null;
  const sameSide = bus.cases.filter((c) => c.location === gov.location);
  const busKv = bus.nominalKv;
  const arcA = sameSide.map((c) => c.arcingCurrentKa * 1000);
  const lo = Math.max(1e-3, Math.min(...arcA) / 30);
  const hi = Math.max(bus.boltedFaultKa * 1000 * 2, Math.max(...arcA) * 2);
  const fromA = 10 ** Math.floor(Math.log10(lo));
  const toA = 10 ** Math.ceil(Math.log10(hi));
  const curves: PlotCurve[] = [];
  for (const reading of gov.devices) {
    const placed = model.devices.find((d) => d.id === reading.deviceId);
    if (!placed) continue;
    const ratio = reading.kv / busKv; // amperes at the device's voltage × ratio = amperes at the bus voltage
    try {
      const band = bandCurves(placed.device, { fromA: fromA / ratio, toA: toA / ratio, pointsPerDecade: 24 });
      const refer = (pts: [number, number][]) => pts.map(([a, s]) => [a * ratio, s] as [number, number]);
      curves.push({
        label: `${reading.deviceId} — ${reading.name}${Math.abs(ratio - 1) > 1e-9 ? ` (at ${formatSig(reading.kv, 4)} kV, × ${formatSig(ratio, 4)})` : ''}`,
        min: refer(band.min),
        max: refer(band.max),
      });
    } catch {
      // A device whose band cannot be sampled is left off the plot (its reading stays in the table).
    }
  }
  const markers: PlotMarker[] = sameSide.map((c) => ({
    currentA: c.arcingCurrentKa * 1000,
    label: `${c.arcCase === 'full' ? 'Iarc' : 'Iarc reduced'} ${formatSig(c.arcingCurrentKa, 3)} kA`,
    dash: c.arcCase === 'reduced',
  }));
  // Where a relay's inverse-time curve stops (its time is held above this current): a dashed line and a note.
  for (const reading of gov.devices) {
    const placed = model.devices.find((d) => d.id === reading.deviceId);
    if (placed?.device.kind !== 'relay') continue;
    try {
      const s = relaySettings(placed.device);
      const limitA = s.pickupA * s.curveLimitMultiple * (reading.kv / busKv);
      if (limitA >= fromA && limitA <= toA) {
        markers.push({
          currentA: limitA,
          label: `${reading.deviceId} curve limit ${formatSig(s.curveLimitMultiple, 3)} × pickup`,
          dash: true,
        });
      }
    } catch {
      // Settings that do not resolve are reported on the reading.
    }
  }
  const points: PlotPoint[] = [];
  for (const c of sameSide) {
    const r = c.devices.find((d) => d.deviceId === c.clearingDeviceId);
    if (r && r.clearingTimeS !== null) {
      points.push({ currentA: r.currentA * (r.kv / busKv), timeS: Math.min(r.clearingTimeS, capS), filled: c === gov });
    }
  }
  return { curves, markers, points, fromA, toA };
}

// ---------------------------------------------------------------------------------------------

/** Renders the study report (see the module comment). */
export async function renderStudyReport(input: StudyReportInput): Promise<Uint8Array> {
  const { study, results, model, site } = input;
  const doc = await PDFDocument.create();
  doc.setTitle(`Arc-flash study report — ${study.title}, revision ${study.revision}`);
  doc.setSubject(`${site.name}`);
  doc.setCreator('Emberline');
  doc.setProducer('Emberline');
  const fonts = await embedFonts(doc);
  const w = new ReportWriter(doc, fonts);
  const approved = study.approval !== null && (study.status === 'approved' || study.status === 'superseded');
  const capS = results.maxArcDurationMs / 1000;
  const okBuses = results.buses.filter((b) => b.status === 'ok');

  // Cover.
  w.newPage();
  w.cv.text(input.organizationName, MARGIN_X, w.y, CONTENT_W, {
    font: fonts.textBold,
    size: 11,
    minSize: 8,
    maxLines: 2,
  });
  w.y += 40;
  w.cv.text('ARC-FLASH STUDY REPORT', MARGIN_X, w.y, CONTENT_W, { font: fonts.textBold, size: 11 });
  w.y += 18;
  w.y +=
    w.cv.text(study.title, MARGIN_X, w.y, CONTENT_W, { font: fonts.textBold, size: 24, minSize: 14, maxLines: 3 })
      .height + 8;
  w.y += w.cv.text(site.name, MARGIN_X, w.y, CONTENT_W, {
    font: fonts.text,
    size: 14,
    minSize: 10,
    maxLines: 2,
  }).height;
  w.y +=
    w.cv.text(site.address, MARGIN_X, w.y, CONTENT_W, { font: fonts.text, size: 10, minSize: 8, maxLines: 3 }).height +
    20;
  const maxBus = okBuses.reduce<BusResult | null>(
    (m, b) => ((b.incidentEnergyCalPerCm2 ?? -1) > (m?.incidentEnergyCalPerCm2 ?? -1) ? b : m),
    null,
  );
  const dangerCount = okBuses.filter((b) => b.labelValues?.signalWord === 'DANGER').length;
  w.keyValues([
    ['Revision', String(study.revision)],
    ['Status', STUDY_STATUS_LABELS[study.status]],
    ['Model version', String(study.modelVersion)],
    ['Results computed', study.latestRun?.finishedAt ? formatTimestamp(study.latestRun.finishedAt) : '—'],
    [
      'Buses studied',
      `${okBuses.length}${results.buses.length > okBuses.length ? ` (${results.buses.length - okBuses.length} with errors)` : ''}`,
    ],
    [
      'Highest incident energy',
      maxBus
        ? `${formatCalPerCm2(maxBus.incidentEnergyCalPerCm2 ?? NaN)} cal/cm² at ${maxBus.busId} (${maxBus.busName})`
        : '—',
    ],
    ['DANGER labels', `${dangerCount} of ${okBuses.length}`],
    ['Arc duration cap', `${formatSig(capS, 3)} s`],
  ]);
  w.y += 16;
  if (approved && study.approval) {
    const a = study.approval;
    const top = w.y;
    w.y += 10;
    w.cv.text('APPROVAL', MARGIN_X + 12, w.y, CONTENT_W - 24, { font: fonts.textBold, size: 10 });
    w.y += 16;
    const pairs: [string, string][] = [
      ['Approved by', a.approverName],
      ['Licence number', a.licenceNumber],
      ['Jurisdiction', a.jurisdiction],
      ['Approved on', a.approvedAt.slice(0, 10)],
      ['Review by', a.reviewDueAt.slice(0, 10)],
    ];
    for (const [k, v] of pairs) {
      w.cv.text(k, MARGIN_X + 12, w.y, 130, { font: fonts.textBold, size: 10 });
      w.y +=
        w.cv.text(v, MARGIN_X + 150, w.y, CONTENT_W - 162, { font: fonts.text, size: 10, minSize: 7, maxLines: 2 })
          .height + 3;
    }
    w.y += 8;
    w.cv.rect(MARGIN_X, top, CONTENT_W, w.y - top, { stroke: BLACK, lineWidth: 1.2 });
    w.y += 12;
  } else {
    const top = w.y;
    const h = 78;
    w.cv.rect(MARGIN_X, top, CONTENT_W, h, { stroke: BLACK, lineWidth: 3 });
    w.cv.text(PRELIMINARY_BANNER, MARGIN_X + 10, top + 12, CONTENT_W - 20, {
      font: fonts.textBold,
      size: 28,
      minSize: 14,
      align: 'center',
    });
    w.cv.text(UNREVIEWED_CAUTION, MARGIN_X + 10, top + 50, CONTENT_W - 20, {
      font: fonts.text,
      size: 9.5,
      minSize: 7,
      maxLines: 2,
      align: 'center',
    });
    w.y += h + 12;
  }
  w.cv.text('Cautions', MARGIN_X, w.y, CONTENT_W, { font: fonts.textBold, size: 9.5 });
  w.y += 14;
  w.bullets([...input.cautions], 8.5);

  // Scope.
  w.newPage();
  w.heading('1. Scope');
  const studied = new Set(results.buses.map((b) => b.busId));
  const notStudied = model.buses.filter((b) => !studied.has(b.id));
  w.paragraph(
    `This report covers the arc-flash study of ${site.name} for ${input.organizationName}: ${results.buses.length} bus${results.buses.length === 1 ? '' : 'es'} of the system model “${model.name}” (model version ${study.modelVersion}), ${model.sources.length} source${model.sources.length === 1 ? '' : 's'}, ${model.transformers.length} transformer${model.transformers.length === 1 ? '' : 's'}, ${model.cables.length} cable${model.cables.length === 1 ? '' : 's'}, ${model.motors.length} motor${model.motors.length === 1 ? '' : 's'} and ${model.devices.length} protective device${model.devices.length === 1 ? '' : 's'}.` +
      (notStudied.length > 0
        ? ` Buses without equipment data are part of the network but not labelled: ${notStudied.map((b) => b.id).join(', ')}.`
        : ''),
  );
  w.heading('Buses studied', 2);
  w.table(
    [
      { header: 'Bus', weight: 1.2, mono: true },
      { header: 'Name', weight: 2.4 },
      { header: 'Nominal voltage', weight: 1, align: 'right', mono: true },
      { header: 'Equipment class', weight: 2 },
      { header: 'Status', weight: 0.8 },
    ],
    results.buses.map((b) => [
      b.busId,
      b.busName,
      formatVoltage(b.nominalKv * 1000),
      b.equipment?.class ?? '—',
      b.status === 'ok' ? 'Studied' : 'Error',
    ]),
  );
  w.heading('Sources', 2);
  w.table(
    [
      { header: 'Source', weight: 1.2, mono: true },
      { header: 'Name', weight: 2 },
      { header: 'Kind', weight: 1 },
      { header: 'Bus', weight: 1.1, mono: true },
      { header: 'Rating', weight: 2.2, mono: true },
      { header: 'X/R', weight: 0.6, align: 'right', mono: true },
    ],
    model.sources.map((s) => [
      s.id,
      s.name ?? '',
      s.kind === 'utility' ? 'Utility' : 'Generator',
      s.bus,
      s.kind === 'utility'
        ? s.shortCircuitMva !== undefined
          ? `${num(s.shortCircuitMva)} MVA short circuit`
          : `${num(s.shortCircuitKa)} kA short circuit`
        : `${num(s.kva)} kVA, ${num(s.kv)} kV, X"d ${num(s.subtransientPct)} %` +
          `, X'd ${s.transientPct !== undefined ? `${num(s.transientPct)} %` : 'typical *'}` +
          (s.sustainedCurrentMultiple !== undefined
            ? `, sustained ${num(s.sustainedCurrentMultiple)} × rated`
            : `, Xd ${s.synchronousPct !== undefined ? `${num(s.synchronousPct)} %` : 'typical *'}`) +
          `, T"d ${s.subtransientTimeConstantS !== undefined ? `${num(s.subtransientTimeConstantS)} s` : 'typical *'}` +
          `, T'd ${s.transientTimeConstantS !== undefined ? `${num(s.transientTimeConstantS)} s` : 'typical *'}`,
      num(s.xr),
    ]),
    model.sources.some((s) => s.kind === 'generator')
      ? {
          note: '* typical generator value, from memory (not entered): the study warnings list each; without Xd or a sustained multiple the higher energy of a low and a supported sustained current is kept.',
        }
      : undefined,
  );

  // Method.
  w.heading(`2. ${METHOD_HEADING}`);
  w.bullets(methodItems(results, model));
  if (results.warnings.length > 0) {
    w.heading('Study warnings', 2);
    w.bullets(
      results.warnings.map((x) => `${x.message} [${x.code}]`),
      8,
    );
  }

  // Inputs.
  w.heading('3. Inputs');
  w.heading('Buses and equipment', 2);
  w.table(
    [
      { header: 'Bus', weight: 1.1, mono: true },
      { header: 'kV', weight: 0.6, align: 'right', mono: true },
      { header: 'Class', weight: 1.6 },
      { header: 'Electrode config.', weight: 0.8 },
      { header: 'Gap, mm', weight: 0.7, align: 'right', mono: true },
      { header: 'Working distance, mm', weight: 0.9, align: 'right', mono: true },
      { header: 'Enclosure H × W × D, mm', weight: 1.8, mono: true },
      { header: 'Main isolated', weight: 0.7 },
    ],
    results.buses.map((b) => {
      const e = b.equipment;
      const t = (field: string, text: string) => (e?.typicalValuesUsed.includes(field) ? `${text} *` : text);
      return [
        b.busId,
        num(b.nominalKv, 4),
        e?.class ?? '—',
        e ? t('electrodeConfig', e.electrodeConfig) : '—',
        e ? t('gapMm', num(e.gapMm)) : '—',
        e ? t('workingDistanceMm', num(e.workingDistanceMm, 4)) : '—',
        e?.enclosureMm
          ? t(
              'enclosureMm',
              `${num(e.enclosureMm.height, 4)} × ${num(e.enclosureMm.width, 4)} × ${num(e.enclosureMm.depth, 4)}`,
            )
          : '—',
        e ? t('mainIsolated', e.mainIsolated ? 'Yes' : 'No') : '—',
      ];
    }),
    {
      note: '* typical value of the equipment class (IEEE 1584-2018 typical gaps, enclosure sizes and working distances), not entered for this bus.',
    },
  );
  w.heading('Transformers', 2);
  w.table(
    [
      { header: 'Transformer', weight: 1.2, mono: true },
      { header: 'From → to', weight: 1.8, mono: true },
      { header: 'kVA', weight: 0.8, align: 'right', mono: true },
      { header: 'kV', weight: 1.2, mono: true },
      { header: '%Z', weight: 0.6, align: 'right', mono: true },
      { header: 'X/R', weight: 0.6, align: 'right', mono: true },
    ],
    model.transformers.map((t) => [
      t.id,
      `${t.fromBus} → ${t.toBus}`,
      num(t.kva, 4),
      `${num(t.primaryKv, 4)} / ${num(t.secondaryKv, 4)}`,
      num(t.impedancePct),
      t.xr === undefined ? 'typical' : num(t.xr),
    ]),
  );
  w.heading('Cables', 2);
  w.table(
    [
      { header: 'Cable', weight: 1.2, mono: true },
      { header: 'From → to', weight: 1.8, mono: true },
      { header: 'Length, m', weight: 0.8, align: 'right', mono: true },
      { header: 'Sets', weight: 0.5, align: 'right', mono: true },
      { header: 'Conductor', weight: 2.2 },
    ],
    model.cables.map((c) => [
      c.id,
      `${c.fromBus} → ${c.toBus}`,
      num(c.lengthM, 4),
      String(c.sets),
      c.size !== undefined
        ? `${c.size} ${c.material ?? ''}, ${c.conduit ?? ''} conduit (NEC Chapter 9 Table 9)`
        : `R ${num(c.rOhmPerKm)} Ω/km, X ${num(c.xOhmPerKm)} Ω/km`,
    ]),
  );
  if (model.motors.length > 0) {
    w.heading('Motors', 2);
    w.table(
      [
        { header: 'Motor', weight: 1.2, mono: true },
        { header: 'Name', weight: 2 },
        { header: 'Bus', weight: 1.1, mono: true },
        { header: 'Rating', weight: 1.2, mono: true },
        { header: 'kV', weight: 0.7, align: 'right', mono: true },
      ],
      model.motors.map((m) => [
        m.id,
        m.name ?? '',
        m.bus,
        m.hp !== undefined ? `${num(m.hp, 4)} hp` : `${num(m.kva, 4)} kVA`,
        num(m.kv, 4),
      ]),
    );
  }
  if (model.ties.length > 0) {
    w.heading('Ties', 2);
    w.table(
      [
        { header: 'Tie', weight: 1.2, mono: true },
        { header: 'From → to', weight: 2, mono: true },
        { header: 'State', weight: 1 },
      ],
      model.ties.map((t) => [t.id, `${t.fromBus} → ${t.toBus}`, t.closed ? 'Closed' : 'Open']),
    );
  }
  w.heading('Protective devices', 2);
  w.table(
    [
      { header: 'Device', weight: 1.1, mono: true },
      { header: 'Name', weight: 1.5 },
      { header: 'Location', weight: 1.5 },
      { header: 'Kind', weight: 1.4 },
      { header: 'Key settings', weight: 3.2 },
    ],
    model.devices.map((d) => [
      d.id,
      d.name ?? '',
      deviceLocation(model, d),
      DEVICE_KIND_LABELS[d.device.kind],
      deviceSettings(d.device),
    ]),
  );

  // Results.
  w.heading('4. Results');
  w.table(
    [
      { header: 'Bus', weight: 0.9, mono: true },
      { header: 'kV', weight: 0.55, align: 'right', mono: true },
      { header: 'Ibf, kA', weight: 0.6, align: 'right', mono: true },
      { header: 'Iarc full / reduced, kA', weight: 1, align: 'right', mono: true },
      { header: 'Clearing device (case)', weight: 1.9 },
      { header: 'Arc duration, s', weight: 0.75, align: 'right', mono: true },
      { header: 'Energy, cal/cm²', weight: 0.75, align: 'right', mono: true },
      { header: 'Boundary', weight: 1.65, mono: true },
      { header: 'PPE', weight: 0.95 },
      { header: 'Signal word', weight: 0.85 },
    ],
    results.buses.map((b) => {
      if (b.status !== 'ok')
        return [
          b.busId,
          num(b.nominalKv, 4),
          ka(b.boltedFaultKa),
          '—',
          `Error: ${b.error?.message ?? 'not computed'}`,
          '—',
          '—',
          '—',
          '—',
          '—',
        ];
      const g = governingCase(b);
      const lv = b.labelValues;
      return [
        b.busId,
        num(b.nominalKv, 4),
        ka(b.boltedFaultKa),
        b.arcingCurrentKa ? `${ka(b.arcingCurrentKa.full)} / ${ka(b.arcingCurrentKa.reduced)}` : '—',
        `${b.clearingDeviceId ?? noDeviceClearsText(results.maxArcDurationMs / 1000)} (${g ? caseName(g).toLowerCase() : '—'})`,
        `${num(b.arcDurationS)}${g?.arcDurationCapped ? ' (cap)' : ''}`,
        formatCalPerCm2(b.incidentEnergyCalPerCm2 ?? NaN),
        formatBoundary(b.arcFlashBoundaryMm ?? NaN),
        lv ? (lv.noAdequatePpe ? 'No adequate PPE' : (lv.ppeLevel?.name ?? '—')) : '—',
        lv?.signalWord ?? '—',
      ];
    }),
    {
      size: 7,
      pad: 2.5,
      note: 'Ibf: bolted fault current. Iarc: arcing current. Energy at the working distance of each bus; energies and boundaries rounded up.',
    },
  );

  // Clearing traces.
  w.heading('5. Clearing traces');
  w.paragraph(
    'For each bus: the sentence of the governing case, every evaluated case, and the time-current plot of the devices that carry fault current in the governing case. Currents on the plot are referred to the bus voltage (a device at another voltage is shifted by the ratio of the voltages). Solid lines: maximum (total clearing) curves; dashed: minimum curves; vertical lines: arcing currents (dashed: reduced); dots: clearing points (filled: governing case).',
    { size: 8.5 },
  );
  for (const b of results.buses) {
    w.ensure(360);
    w.heading(`${b.busId} — ${b.busName}`, 2);
    if (b.status !== 'ok') {
      w.paragraph(`Not computed: ${b.error?.message ?? 'error'}`, { font: fonts.textBold });
      continue;
    }
    const g = governingCase(b);
    if (g) w.paragraph(g.sentence, { font: fonts.textBold, size: 9 });
    // The bus's own arc-duration cap (or none), with the engineer's reason.
    const busCap = b.arcDurationCap?.source === 'bus' ? b.arcDurationCap : null;
    if (busCap) {
      w.paragraph(
        `Arc-duration cap at this bus: ${busCap.capS === null ? 'none (the clearing time stands)' : `${formatSig(busCap.capS, 3)} s`} instead of the study's ${formatSig(capS, 3)} s. Reason: ${busCap.reason ?? 'not given'}.`,
        { size: 8.5 },
      );
    }
    const traceCapS = busCap ? busCap.capS : capS;
    w.table(
      [
        { header: 'Case', weight: 1.8 },
        { header: 'Iarc, kA', weight: 0.7, align: 'right', mono: true },
        { header: 'Clearing device', weight: 1.1, mono: true },
        { header: 'Region', weight: 1 },
        { header: 'Arc duration, s', weight: 0.7, align: 'right', mono: true },
        { header: 'Energy, cal/cm²', weight: 0.8, align: 'right', mono: true },
        { header: 'Boundary', weight: 1.6, mono: true },
      ],
      b.cases.map((c) => [
        `${caseName(c)}${c === g ? ' (governs)' : ''}`,
        ka(c.arcingCurrentKa),
        c.clearingDeviceId ?? noDeviceClearsText(results.maxArcDurationMs / 1000),
        c.clearingRegion ?? '—',
        `${num(c.arcDurationS)}${c.arcDurationCapped ? ' (cap)' : ''}`,
        formatCalPerCm2(c.incidentEnergyCalPerCm2),
        formatBoundary(c.arcFlashBoundaryMm),
      ]),
      { size: 7 },
    );
    const plot = tracePlotData(b, model, traceCapS ?? Infinity);
    if (plot) {
      const plotH = 240;
      const legendH = plot.curves.length * 9 + 4;
      w.ensure(plotH + legendH + 6);
      // Fuses and instantaneous regions clear at 0.01 s and below: extend the time axis down a decade then.
      const fromS = plot.points.some((p) => p.timeS <= 0.0101) ? 0.001 : 0.01;
      const colors = drawTimeCurrentPlot(
        w.cv,
        fonts,
        { x: MARGIN_X, y: w.y, w: 380, h: plotH },
        { ...plot, capS: traceCapS, fromS },
      );
      w.y += plotH + 2;
      plot.curves.forEach((c, i) => {
        w.cv.line(MARGIN_X + 36, w.y + 4, MARGIN_X + 52, w.y + 4, { width: 1.2, color: colors[i] });
        w.cv.text(c.label, MARGIN_X + 56, w.y, CONTENT_W - 56, { font: fonts.text, size: 7, minSize: 5.5 });
        w.y += 9;
      });
      w.y += 6;
    }
    const seen = new Set<string>();
    const warnings = b.warnings.filter((x) => {
      const k = `${x.code}|${x.message}`;
      if (seen.has(k)) return false;
      seen.add(k);
      return true;
    });
    if (warnings.length > 0) {
      w.ensure(24);
      w.cv.text('Warnings', MARGIN_X, w.y, CONTENT_W, { font: fonts.textBold, size: 8.5 });
      w.y += 11;
      w.bullets(
        warnings.map((x) => `${x.message} [${x.code}]`),
        7.5,
      );
    }
    w.y += 6;
  }

  // Cautions and approval.
  w.heading('6. Cautions');
  w.bullets([...input.cautions]);
  w.ensure(150); // keep the approval block on one page
  w.heading('7. Approval');
  if (approved && study.approval) {
    const a = study.approval;
    w.keyValues([
      ['Approved by', a.approverName],
      ['Licence number', a.licenceNumber],
      ['Jurisdiction', a.jurisdiction],
      ['Approved on', a.approvedAt.slice(0, 10)],
      ['Review by', a.reviewDueAt.slice(0, 10)],
    ]);
    if (study.status === 'superseded')
      w.paragraph('This revision has been superseded by a later revision of the study.', { font: fonts.textBold });
  } else {
    w.ensure(60);
    const top = w.y;
    w.cv.rect(MARGIN_X, top, CONTENT_W, 52, { stroke: BLACK, lineWidth: 2 });
    w.cv.text(PRELIMINARY_BANNER, MARGIN_X + 8, top + 8, CONTENT_W - 16, {
      font: fonts.textBold,
      size: 16,
      align: 'center',
    });
    w.cv.text(UNREVIEWED_CAUTION, MARGIN_X + 8, top + 30, CONTENT_W - 16, {
      font: fonts.text,
      size: 8.5,
      maxLines: 2,
      align: 'center',
    });
    w.y += 60;
  }

  w.footers(
    `Emberline · ${input.organizationName} · ${site.name} · ${study.title}, revision ${study.revision}`,
    approved ? null : PRELIMINARY_BANNER,
  );
  return doc.save();
}
