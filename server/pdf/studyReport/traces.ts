/**
 * Section 5, clearing traces: per bus the governing sentence, every evaluated case and the time-current plot of the
 * devices that carry fault current in the governing case (currents referred to the bus voltage).
 */
import type { Model } from '../../../shared/schemas/model';
import type { BusResult, StudyResults } from '../../../shared/schemas/studyResults';
import { noDeviceClearsText } from '../../../shared/labelDisplay';
import { bandCurves } from '../../engine/trip';
import { relaySettings } from '../../engine/trip/relay';
import { formatBoundary, formatCalPerCm2, formatSig } from '../format';
import { drawTimeCurrentPlot, type PlotCurve, type PlotMarker, type PlotPoint } from '../tccPlot';
import { caseName, governingCase, ka, num } from './texts';
import { CONTENT_W, MARGIN_X, type ReportWriter } from './writer';

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

export function renderTraces(w: ReportWriter, results: StudyResults, model: Model): void {
  const { fonts } = w;
  const capS = results.maxArcDurationMs / 1000;
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
}
