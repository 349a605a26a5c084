import { performance } from 'node:perf_hooks';
import type { LabelContent } from '../../shared/schemas/labels';
import { renderLabels, type LabelPdfSize, type LabelToRender } from '../pdf/labels';

/** Invented label content, varied per index so that no two labels (or QR codes) are alike. */
export function benchLabel(i: number): LabelToRender {
  const energy = 0.6 + ((i * 7.31) % 60);
  const danger = energy > 40;
  const content: LabelContent = {
    signalWord: danger ? 'DANGER' : 'WARNING',
    equipmentTag: `MCC-${100 + (i % 900)}`,
    equipmentName:
      i % 5 === 0
        ? `Motor control centre ${i}, aeration blowers and return-activated-sludge pumps, north gallery`
        : `Panelboard ${i}`,
    siteName: 'Example treatment plant',
    nominalVoltageV: i % 3 === 0 ? 4160 : 480,
    incidentEnergyCalPerCm2: energy,
    incidentEnergyJPerCm2: energy * 4.184,
    workingDistanceMm: 457.2,
    arcFlashBoundaryMm: 400 + energy * 90,
    minimumArcRatingCalPerCm2: Math.ceil(energy),
    ppeLevel: danger ? null : `PPE level ${1 + (i % 4)}`,
    noAdequatePpe: danger,
    limitedApproachMovable: '3.0 m (10 ft 0 in)',
    limitedApproachFixed: '1.0 m (3 ft 6 in)',
    restrictedApproach: '0.3 m (1 ft 0 in)',
    gloveClass: 'Class 00',
    clearingDevice: `CB-${i} (feeder breaker)`,
    governingCase: i % 2 === 0 ? 'full arcing current' : 'reduced arcing current',
    studyTitle: 'Benchmark study',
    studyRevision: 1,
    studyDate: '2025-01-15',
    reviewByDate: '2030-01-15',
    approvedBy: 'A. Engineer, licence 00000 (Example State)',
    caution: 'Values from an engineering study (IEEE 1584-2018). De-energize where possible.',
  };
  return { content, checkUrl: `https://emberline.example/l/BENCH${String(i).padStart(11, '0')}` };
}

/**
 * 1 000 labels rendered into one 4×6 in PDF (one per page, each with its own QR code), and the same on letter
 * sheets. Reports seconds and labels per second; asserts nothing (target: under 15 s for 1 000 labels).
 */
export async function benchLabels(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const count = 1000;
  const labels = Array.from({ length: count }, (_, i) => benchLabel(i));
  await renderLabels(labels.slice(0, 5), '4x6'); // warm-up: fonts read and parsed, JIT settled a little
  const lines: string[] = [];
  let rate = 0;
  for (const size of ['4x6', 'letter'] as LabelPdfSize[]) {
    const start = performance.now();
    const pdf = await renderLabels(labels, size);
    const seconds = (performance.now() - start) / 1000;
    const perSecond = count / seconds;
    if (size === '4x6') rate = perSecond;
    lines.push(
      `${size}: ${count} labels in ${seconds.toFixed(2)} s (${perSecond.toFixed(0)} labels/s), ${(pdf.length / 1e6).toFixed(1)} MB`,
    );
  }
  return { name: 'label PDF', opsPerSecond: Math.round(rate), detail: lines.join('\n') };
}
