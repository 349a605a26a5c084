/**
 * The one-line drawing (`geometry.ts`) as a standalone SVG document. Every element is a group with its id as the
 * group's `data-id` and in its label text, so the file can be searched and each element found.
 */
import type { OneLineDrawing, Shape, Tone } from './geometry';

/** The product's palette (the app's theme colours; hazard tones only on hazard text). */
export const ONE_LINE_PALETTE: Record<Tone, string> = {
  ink: '#0E2230',
  muted: '#5B6B78',
  accent: '#0B6E78',
  danger: '#9B1C1C',
  caution: '#7A4B00',
  problem: '#9B1C1C',
  surface: '#FFFFFF',
};

export function escapeXml(s: string): string {
  return s.replace(/[<>&"']/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', "'": '&apos;' })[c]!);
}

const n = (v: number) => (Number.isInteger(v) ? String(v) : v.toFixed(1));

function shapeSvg(s: Shape, p: Record<Tone, string>): string {
  const dash = 'dashed' in s && s.dashed ? ' stroke-dasharray="5 4"' : '';
  switch (s.t) {
    case 'line': {
      const pts: string[] = [];
      for (let i = 0; i < s.pts.length; i += 2) pts.push(`${n(s.pts[i])},${n(s.pts[i + 1])}`);
      return `<polyline points="${pts.join(' ')}" fill="none" stroke="${p[s.tone]}" stroke-width="${s.width}"${dash}/>`;
    }
    case 'rect':
      if (s.halo)
        return `<rect class="halo" x="${n(s.x)}" y="${n(s.y)}" width="${n(s.w)}" height="${n(s.h)}" fill="${s.fill ? p[s.fill] : p.surface}"/>`;
      return `<rect x="${n(s.x)}" y="${n(s.y)}" width="${n(s.w)}" height="${n(s.h)}" fill="${s.fill ? p[s.fill] : 'none'}" stroke="${p[s.tone]}" stroke-width="1.5"${dash}/>`;
    case 'circle':
      return `<circle cx="${n(s.cx)}" cy="${n(s.cy)}" r="${n(s.r)}" fill="${s.fill ? p[s.fill] : 'none'}" stroke="${p[s.tone]}" stroke-width="1.5"${dash}/>`;
    case 'text':
      return `<text x="${n(s.x)}" y="${n(s.y)}" font-size="${s.size}" text-anchor="${s.anchor}" fill="${p[s.tone]}"${s.bold ? ' font-weight="600"' : ''}>${escapeXml(s.text)}</text>`;
  }
}

export function oneLineSvg(d: OneLineDrawing, opts: { title?: string; palette?: Record<Tone, string> } = {}): string {
  const p = opts.palette ?? ONE_LINE_PALETTE;
  const notesH = d.notes.length * 16 + 8;
  const h = d.height + notesH;
  const parts: string[] = [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" width="${d.width}" height="${h}" viewBox="0 0 ${d.width} ${h}" font-family="Inter, 'Helvetica Neue', Arial, sans-serif">`,
  ];
  if (opts.title) parts.push(`<title>${escapeXml(opts.title)}</title>`);
  parts.push(`<rect x="0" y="0" width="${d.width}" height="${h}" fill="${p.surface}"/>`);
  parts.push('<g class="connections">');
  for (const c of d.connections) {
    parts.push(
      shapeSvg({ t: 'line', pts: c.pts, tone: 'ink', width: 1.5, dashed: c.dashed }, p).replace(
        '<polyline ',
        `<polyline data-from="${escapeXml(c.a)}" data-to="${escapeXml(c.b)}" `,
      ),
    );
  }
  parts.push('</g>');
  for (const e of d.elements) {
    parts.push(`<g data-id="${escapeXml(e.id)}" data-kind="${e.kind}">`);
    for (const s of e.shapes) parts.push(shapeSvg(s, p));
    parts.push('</g>');
  }
  d.notes.forEach((t, i) =>
    parts.push(
      shapeSvg({ t: 'text', x: 16, y: d.height + 16 + i * 16, text: t, size: 11, anchor: 'start', tone: 'muted' }, p),
    ),
  );
  parts.push('</svg>');
  return parts.join('\n');
}
