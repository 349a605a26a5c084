/**
 * Pure label layout of the time-current plot: where to put the names of vertical lines and marked points so
 * they stay readable (inside the plot, clear of one another, of the lines and, where possible, of the curves).
 * No React / React Native imports (tested in the server project).
 */
import type { Px } from '../../shared/logPlot';

export interface Box {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** Width of a label in a monospaced face whose advance is 0.6 em (IBM Plex Mono). */
export function monoTextWidth(text: string, fontSize: number): number {
  return text.length * fontSize * 0.6;
}

export function boxesOverlap(a: Box, b: Box, gap = 0): boolean {
  return (
    a.x < b.x + b.width + gap && b.x < a.x + a.width + gap && a.y < b.y + b.height + gap && b.y < a.y + a.height + gap
  );
}

export function boxInside(b: Box, bounds: Box): boolean {
  return (
    b.x >= bounds.x &&
    b.y >= bounds.y &&
    b.x + b.width <= bounds.x + bounds.width &&
    b.y + b.height <= bounds.y + bounds.height
  );
}

/** How many of the points lie in the box. */
export function pointsInBox(points: readonly Px[], b: Box): number {
  let n = 0;
  for (const [x, y] of points) if (x >= b.x && x <= b.x + b.width && y >= b.y && y <= b.y + b.height) n += 1;
  return n;
}

/**
 * Points along a polyline no further apart than `stepPx`, so a label box that a drawn line crosses holds at least
 * one of them (for boxes taller and wider than the step).
 */
export function densify(points: readonly Px[], stepPx = 5): Px[] {
  if (points.length === 0) return [];
  const out: Px[] = [[points[0][0], points[0][1]]];
  for (let i = 1; i < points.length; i += 1) {
    const [x0, y0] = points[i - 1];
    const [x1, y1] = points[i];
    const n = Math.max(1, Math.ceil(Math.hypot(x1 - x0, y1 - y0) / stepPx));
    for (let k = 1; k <= n; k += 1) out.push([x0 + ((x1 - x0) * k) / n, y0 + ((y1 - y0) * k) / n]);
  }
  return out;
}

export interface Obstacles {
  /** Labels already placed (never overlapped when avoidable). */
  boxes: readonly Box[];
  /** x of vertical lines across the plot (crossed only when unavoidable). */
  linesX: readonly number[];
  /** Points of the drawn curves (covered as little as possible). */
  points: readonly Px[];
}

/**
 * Places a label of the given size near an anchor point. Candidates at growing distances on the four diagonals
 * and beside the point are scored: leaving the bounds 1000, overlapping a placed label 100, crossing a vertical
 * line 20, each curve point covered 1, plus the distance from the anchor / 20 (nearer first) and 0.05 per place in the list (right-above
 * first). The lowest wins.
 */
export function placeLabel(
  anchor: Px,
  width: number,
  height: number,
  bounds: Box,
  obstacles: Obstacles,
  offset = 10,
): Box {
  const [x, y] = anchor;
  const candidates: Box[] = [];
  for (const k of [1, 2, 3.5, 5.5]) {
    const d = offset * k;
    candidates.push(
      { x: x + offset, y: y - d - height + offset * 0.3, width, height },
      { x: x + offset, y: y + d - offset * 0.3, width, height },
      { x: x - offset - width, y: y - d - height + offset * 0.3, width, height },
      { x: x - offset - width, y: y + d - offset * 0.3, width, height },
    );
  }
  candidates.push(
    { x: x + offset + 2, y: y - height / 2, width, height },
    { x: x - offset - 2 - width, y: y - height / 2, width, height },
  );
  let best = candidates[0];
  let bestScore = Infinity;
  candidates.forEach((c, index) => {
    let score = boxInside(c, bounds) ? 0 : 1000;
    for (const b of obstacles.boxes) if (boxesOverlap(c, b, 2)) score += 100;
    for (const lx of obstacles.linesX) if (lx > c.x - 2 && lx < c.x + c.width + 2) score += 20;
    score += pointsInBox(obstacles.points, c);
    score += Math.hypot(c.x + c.width / 2 - x, c.y + c.height / 2 - y) / 20 + index * 0.05;
    if (score < bestScore) {
      bestScore = score;
      best = c;
    }
  });
  if (boxInside(best, bounds)) return best;
  return {
    x: Math.min(Math.max(best.x, bounds.x), bounds.x + bounds.width - width),
    y: Math.min(Math.max(best.y, bounds.y), bounds.y + bounds.height - height),
    width,
    height,
  };
}

/**
 * Stacks the labels of vertical lines into rows at the top of the plot. Each label sits beside its line, right
 * or left, in the first row where it fits between `left` and `right`, overlaps no label placed before and crosses
 * no other line; when no row up to `maxRows` avoids the other lines, the first row where it merely fits is taken.
 */
export function stackLineLabels(
  lines: readonly { x: number; width: number }[],
  left: number,
  right: number,
  options: { pad?: number; gap?: number; maxRows?: number } = {},
): { x: number; row: number; leftOfLine: boolean }[] {
  const pad = options.pad ?? 4;
  const gap = options.gap ?? 6;
  const maxRows = options.maxRows ?? 4;
  const rows: { x0: number; x1: number }[][] = [];
  const allX = lines.map((l) => l.x);
  const fits = (x0: number, x1: number, row: number) =>
    x0 >= left && x1 <= right && !(rows[row] ?? []).some((s) => x0 < s.x1 + gap && s.x0 < x1 + gap);
  const crosses = (x0: number, x1: number, own: number) =>
    allX.some((lx, j) => j !== own && lx > x0 - 2 && lx < x1 + 2);
  return lines.map(({ x, width }, i) => {
    const sides = [
      { leftOfLine: false, x0: x + pad },
      { leftOfLine: true, x0: x - pad - width },
    ];
    const choose = (avoidLines: boolean) => {
      for (let row = 0; row < (avoidLines ? maxRows : 1000); row += 1) {
        for (const s of sides) {
          if (fits(s.x0, s.x0 + width, row) && (!avoidLines || !crosses(s.x0, s.x0 + width, i))) return { ...s, row };
        }
        // Wider than the plot: pin it to the left edge of a free row.
        if (!avoidLines && width > right - left && !(rows[row] ?? []).length)
          return { leftOfLine: false, x0: left, row };
      }
      return null;
    };
    const pick = choose(true) ?? choose(false) ?? { leftOfLine: false, x0: left, row: rows.length };
    (rows[pick.row] ??= []).push({ x0: pick.x0, x1: pick.x0 + width });
    return { x: pick.x0, row: pick.row, leftOfLine: pick.leftOfLine };
  });
}

/** The point of a box nearest to p (p itself when inside). */
export function nearestPointOfBox(p: Px, b: Box): Px {
  return [Math.min(Math.max(p[0], b.x), b.x + b.width), Math.min(Math.max(p[1], b.y), b.y + b.height)];
}
