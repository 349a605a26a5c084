/** Section 4, results: one row per bus, from the bolted fault current to the signal word. */
import type { StudyResults } from '../../../shared/schemas/studyResults';
import { noDeviceClearsText } from '../../../shared/labelDisplay';
import { formatBoundary, formatCalPerCm2 } from '../format';
import { caseName, governingCase, ka, num } from './texts';
import type { ReportWriter } from './writer';

export function renderResults(w: ReportWriter, results: StudyResults): void {
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
}
