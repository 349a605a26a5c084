/**
 * Label truth on screen: the web label (components/labels/LabelView, rendered with react-dom/server through
 * react-native-web) shows, field by field, exactly the strings of the shared display function — the strings the
 * PDF prints and the public check JSON carries (tests/api/labelTruth.slow.test.ts checks those against the same
 * function over the same 1 000 generated contents).
 */
import React from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { LabelView } from '../../components/labels/LabelView';
import { LABEL_DISPLAY_FIELDS, clearedByText, displayText, labelDisplay } from '../../shared/labelDisplay';
import { sampleLabelContents } from '../helpers/labelContentArb';

const decode = (s: string) =>
  s
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/&amp;/g, '&');

/** The text of the element with a test id (its inner text, tags removed). */
function byTestId(html: string, id: string): string | null {
  const start = html.indexOf(`data-testid="${id}"`);
  if (start < 0) return null;
  const open = html.indexOf('>', start) + 1;
  const close = html.indexOf('</div>', open);
  return decode(html.slice(open, close).replace(/<[^>]*>/g, ''));
}

const squash = (s: string) => s.replace(/\s+/g, '');

describe('LabelView', () => {
  const contents = sampleLabelContents(1000);

  it('shows exactly the display strings, field by field, for 1 000 generated labels', () => {
    const misses: string[] = [];
    contents.forEach((c, i) => {
      const d = labelDisplay(c);
      const html = renderToStaticMarkup(<LabelView content={c} code="7K3M9QXW2R4TBH6N" />);
      const exact: [string, string | undefined][] = [
        ['label-signal-word', d.signalWord.value],
        ['label-hazard-caution', d.hazardCaution.value],
        ['label-energy', d.incidentEnergy.value],
        ['label-energy-unit', d.incidentEnergy.unit],
        ['label-energy-secondary', d.incidentEnergy.secondary],
        ['label-boundary', displayText(d.arcFlashBoundary)],
        ['label-boundary-secondary', d.arcFlashBoundary.secondary],
        ['label-arc-rating', displayText(d.minimumArcRating)],
        ['label-ppe', d.ppeLevel.value],
        ['label-cleared-by', clearedByText(d.clearedBy)],
      ];
      for (const [id, want] of exact) {
        const got = byTestId(html, id);
        if (got !== (want ?? '')) misses.push(`label ${i} ${id}: screen "${got}" ≠ display "${want}"`);
      }
      if (d.ppeLevel.secondary && byTestId(html, 'label-ppe-description') !== d.ppeLevel.secondary)
        misses.push(`label ${i}: PPE description missing`);
      const text = squash(decode(html.replace(/<[^>]*>/g, ' ')));
      for (const f of LABEL_DISPLAY_FIELDS) {
        const v = d[f];
        for (const s of [displayText(v), v.secondary].filter((x): x is string => !!x))
          if (!text.includes(squash(s))) misses.push(`label ${i} ${f}: "${s}" not on screen`);
      }
    });
    expect(misses.slice(0, 20)).toEqual([]);
  });
});
