/**
 * Section 4, results, continued: what changed from another revision of the site (by default the approved one), for
 * the reviewer — the hazard bus by bus with the largest rise first, then the model's changes field by field. The
 * words are those of the study overview (shared/revisionCompare.ts). Drawn only when there is a revision to compare.
 */
import {
  comparisonSummary,
  elementHeading,
  fieldChangeText,
  hazardEnergyText,
  labelChangeTexts,
  riseText,
} from '../../../shared/revisionCompare';
import type { RevisionComparison } from '../../../shared/schemas/compare';
import type { ReportWriter } from './writer';

/** Model changes listed in the report before "and N more". */
const MAX_ELEMENTS = 60;

export function renderChanges(w: ReportWriter, c: RevisionComparison | undefined): void {
  if (!c) return;
  w.heading(`Changes from revision ${c.baseline.revision} (${c.baseline.status})`, 2);
  w.paragraph(comparisonSummary(c));
  for (const n of c.notes) w.paragraph(n, { size: 8.5 });
  const changed = c.buses.filter((b) => b.change !== 'unchanged');
  if (c.buses.length) {
    if (changed.length) {
      w.table(
        [
          { header: 'Bus', weight: 0.9, mono: true },
          { header: 'Before', weight: 1, align: 'right' },
          { header: 'Now', weight: 1, align: 'right' },
          { header: 'Change', weight: 1.6 },
          { header: 'Label', weight: 2 },
        ],
        changed.map((b) => [
          b.busId,
          hazardEnergyText(b.before),
          hazardEnergyText(b.after),
          riseText(b),
          labelChangeTexts(b).join('; ') || '—',
        ]),
        { size: 7.5, note: 'Largest rise in incident energy first; energies as the labels print them (rounded up).' },
      );
    }
    const same = c.buses.length - changed.length;
    if (same) w.paragraph(`${same} ${same === 1 ? 'bus' : 'buses'} unchanged.`, { size: 8.5 });
  }
  if (c.model.elements.length) {
    const shown = c.model.elements.slice(0, MAX_ELEMENTS);
    w.bullets(
      shown.map((e) => [elementHeading(e), ...e.fields.map(fieldChangeText)].join(' — ')),
      8.5,
    );
    if (c.model.elements.length > shown.length) {
      w.paragraph(`… and ${c.model.elements.length - shown.length} more model changes.`, { size: 8.5 });
    }
  }
}
