/** Small wordings and number formats shared by the sections of the study report. */
import type { ArcCaseTrace, BusResult } from '../../../shared/schemas/studyResults';
import { formatSig } from '../format';

/** "2025-03-01T09:00:02Z" → "2025-03-01 09:00 UTC" (the text as given when it is not an ISO timestamp). */
export function formatTimestamp(iso: string): string {
  const m = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2})(?::\d{2}(?:\.\d+)?)?(?:Z|\+00:?00)$/.exec(iso);
  return m ? `${m[1]} ${m[2]} UTC` : iso;
}

export const num = (v: number | undefined | null, sig = 3) => (v === undefined || v === null ? '—' : formatSig(v, sig));
export const ka = (v: number | undefined) => (v === undefined ? '—' : formatSig(v, 3));

export function caseName(c: { arcCase: 'full' | 'reduced'; location: 'load-side' | 'line-side' }): string {
  return `${c.arcCase === 'full' ? 'Full' : 'Reduced'} arcing current${c.location === 'line-side' ? ', line side of the main' : ''}`;
}

export function governingCase(b: BusResult): ArcCaseTrace | undefined {
  return b.cases.find((c) => c.arcCase === b.governing?.arcCase && c.location === b.governing?.location);
}
