import * as fc from 'fast-check';
import { expectClose, isClose } from '../helpers/approx';
import {
  bandOutline,
  cleanCurve,
  clipPolygon,
  clipPolyline,
  decadeTicks,
  extendToDecades,
  formatCompact,
  formatCurrent,
  formatCurrentTick,
  formatPlain,
  formatSig,
  formatTime,
  formatTimeTick,
  labelEvery,
  logScale,
  pathData,
  positiveExtent,
  readCurveLogLog,
  type CurvePoint,
  type Px,
} from '../../shared/logPlot';
import {
  boxesOverlap,
  densify,
  monoTextWidth,
  nearestPointOfBox,
  placeLabel,
  stackLineLabels,
  type Box,
} from '../../components/plot/labels';

// Math of the log-log time-current plot (client side). These are geometry and formatting checks; the log mapping
// and log-log interpolation are plain algebra (a straight line on log-log axes is t = t0·(x/x0)^s). Choices of
// presentation (label forms, decade extension, placement scores) are conventions: "common practice, no source".

/** Area of a simple polygon (shoelace formula). */
function area(poly: readonly Px[]): number {
  let a = 0;
  for (let i = 0; i < poly.length; i += 1) {
    const [x0, y0] = poly[i];
    const [x1, y1] = poly[(i + 1) % poly.length];
    a += x0 * y1 - x1 * y0;
  }
  return Math.abs(a) / 2;
}

describe('worked examples: log scale', () => {
  // Current axis 10 A … 100 kA over 400 px: 4 decades, 100 px per decade (plain algebra).
  const xs = logScale([10, 100_000], [0, 400]);
  // Time axis 0.01 … 1000 s over 500 px, growing upwards (pixel 500 at 0.01 s).
  const ys = logScale([0.01, 1000], [500, 0]);

  it('puts each decade an equal distance apart', () => {
    expectClose(xs.toPx(10), 0, 0, 1e-9);
    expectClose(xs.toPx(100), 100);
    expectClose(xs.toPx(1000), 200);
    expectClose(xs.toPx(100_000), 400);
    expectClose(xs.pxPerDecade, 100);
  });

  it('puts 2, 5 and √10 at log10 of their value inside a decade', () => {
    expectClose(xs.toPx(20), 100 * Math.log10(2)); // 30.103 px
    expectClose(xs.toPx(50), 100 * Math.log10(5)); // 69.897 px
    expectClose(xs.toPx(10 * Math.sqrt(10)), 50); // halfway in log
  });

  it('runs a reversed range (time grows upwards)', () => {
    expectClose(ys.toPx(0.01), 500);
    expectClose(ys.toPx(1), 300);
    expectClose(ys.toPx(1000), 0, 0, 1e-9);
    expectClose(ys.pxPerDecade, 100);
  });

  it('inverts: 0.083 s and 12.3 kA come back from their pixels', () => {
    expectClose(ys.fromPx(ys.toPx(0.083)), 0.083, 1e-12);
    expectClose(xs.fromPx(xs.toPx(12_300)), 12_300, 1e-12);
    expectClose(xs.fromPx(250), 10 * Math.pow(10, 2.5)); // 3162.3 A
  });

  it('gives NaN for non-positive values and rejects a bad domain', () => {
    expect(Number.isNaN(xs.toPx(0))).toBe(true);
    expect(Number.isNaN(xs.toPx(-5))).toBe(true);
    expect(() => logScale([0, 10], [0, 100])).toThrow(RangeError);
    expect(() => logScale([100, 10], [0, 100])).toThrow(RangeError);
    expect(() => logScale([10, 10], [0, 100])).toThrow(RangeError);
  });

  it('round-trips any positive value (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-6, max: 1e9, noNaN: true }),
        fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
        fc.integer({ min: 1, max: 8 }),
        fc.integer({ min: 50, max: 2000 }),
        (v, lo, decades, px) => {
          const s = logScale([lo, lo * Math.pow(10, decades)], [px, 0]);
          return isClose(s.fromPx(s.toPx(v)), v, 1e-9);
        },
      ),
    );
  });

  it('is monotonic: a larger value never maps left of a smaller one (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-4, max: 1e7, noNaN: true }),
        fc.double({ min: 1e-4, max: 1e7, noNaN: true }),
        (a, b) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          return xs.toPx(lo) <= xs.toPx(hi);
        },
      ),
    );
  });
});

describe('ranges and ticks', () => {
  it('takes the extent of positive finite values only', () => {
    expect(positiveExtent([37, -4, 0, Number.NaN, Infinity, 18_200, 600])).toEqual([37, 18_200]);
    expect(positiveExtent([0, -1, Number.NaN])).toBeNull();
    expect(positiveExtent([])).toBeNull();
  });

  it('extends a data range to whole decades (common practice, no source)', () => {
    expect(extendToDecades(37, 18_200)).toEqual([10, 100_000]);
    expect(extendToDecades(300, 40_000)).toEqual([100, 100_000]);
    // Values already on decades stay (float noise of log10 is allowed for).
    expect(extendToDecades(100, 10_000)).toEqual([100, 10_000]);
    expect(extendToDecades(0.01, 1000)).toEqual([0.01, 1000]);
  });

  it('widens a narrow range to the minimum number of decades, high side first', () => {
    expect(extendToDecades(150, 150)).toEqual([100, 10_000]);
    expect(extendToDecades(2, 8, 3)).toEqual([0.1, 100]);
    expect(extendToDecades(2, 8, 1)).toEqual([1, 10]);
    expect(() => extendToDecades(0, 10)).toThrow(RangeError);
  });

  it('lists decades as majors and 2…9 × decade as minors', () => {
    const t = decadeTicks(10, 1000);
    expect(t.major).toEqual([10, 100, 1000]);
    expect(t.minor).toHaveLength(16); // 20…90 and 200…900
    expectClose(t.minor[0], 20);
    expectClose(t.minor[15], 900);
  });

  it('gives exact decade values below one second (no 0.010000000000000002)', () => {
    const t = decadeTicks(0.01, 1000);
    expect(t.major.map(formatTimeTick)).toEqual(['0.01', '0.1', '1', '10', '100', '1000']);
    expect(t.minor).toHaveLength(40);
  });

  it('keeps ticks inside a range that does not start on a decade', () => {
    const t = decadeTicks(250, 4000);
    expect(t.major).toEqual([1000]);
    expect(t.minor.map((v) => Math.round(v))).toEqual([300, 400, 500, 600, 700, 800, 900, 2000, 3000, 4000]);
    expect(decadeTicks(10, 10)).toEqual({ major: [], minor: [] });
  });

  it('labels every decade when there is room, fewer when narrow (common practice, no source)', () => {
    expect(labelEvery(100, 30)).toBe(1);
    expect(labelEvery(30, 30)).toBe(2); // 30 px < 30 + 8 px gap
    expect(labelEvery(14, 30)).toBe(3);
    expect(labelEvery(8, 30)).toBe(5);
    expect(labelEvery(1, 30)).toBe(10);
  });
});

describe('labels and readout text', () => {
  it('formats significant figures without exponent form', () => {
    expect(formatSig(0.08312)).toBe('0.0831');
    expect(formatSig(12.34)).toBe('12.3');
    expect(formatSig(1234)).toBe('1234');
    expect(formatSig(0.1)).toBe('0.1');
    expect(formatSig(0.3, 3, false)).toBe('0.300');
    expect(formatSig(-2.5)).toBe('-2.5');
    expect(formatSig(0)).toBe('0');
    expect(formatSig(Number.NaN)).toBe('—'); // one mark for a missing value everywhere (shared/numberFormat.ts)
  });

  it('keeps three figures when rounding carries into a new digit', () => {
    expect(formatSig(9.996, 3, false)).toBe('10.0');
    expect(formatSig(0.09996, 3, false)).toBe('0.100');
    expect(formatSig(99.96, 3, false)).toBe('100');
  });

  it('labels the time axis 0.01 … 1000 and the ampere axis 10 … 100k', () => {
    expect([0.001, 0.01, 0.1, 1, 10, 100, 1000].map(formatPlain)).toEqual([
      '0.001',
      '0.01',
      '0.1',
      '1',
      '10',
      '100',
      '1000',
    ]);
    expect([10, 100, 1000, 10_000, 100_000, 1e6].map((v) => formatCurrentTick(v, 'A'))).toEqual([
      '10',
      '100',
      '1k',
      '10k',
      '100k',
      '1M',
    ]);
    expect([0.1, 1, 10, 100, 1000].map((v) => formatCurrentTick(v, '×In'))).toEqual(['0.1', '1', '10', '100', '1000']);
    expect(formatCompact(2500)).toBe('2.5k');
    expect(formatCompact(0)).toBe('');
  });

  it('reads currents in A or kA and times in seconds, three figures', () => {
    expect(formatCurrent(850, 'A')).toBe('850 A');
    expect(formatCurrent(12_300, 'A')).toBe('12.3 kA');
    expect(formatCurrent(20_000, 'A')).toBe('20.0 kA');
    expect(formatCurrent(999.8, 'A')).toBe('1.00 kA');
    expect(formatCurrent(7.5, '×In')).toBe('7.50 × In');
    expect(formatCurrent(-3, 'A')).toBe('—');
    expect(formatTime(0.0831)).toBe('0.0831 s');
    expect(formatTime(0.3)).toBe('0.300 s');
    expect(formatTime(1500)).toBe('1500 s');
    expect(formatTime(0)).toBe('—');
    expect(formatTime(0.01, true)).toBe('0.01 s');
    expect(formatCurrent(100_000, 'A', true)).toBe('100 kA');
    expect(formatCurrent(10, 'A', true)).toBe('10 A');
    expect(formatCurrent(1, '×In', true)).toBe('1 × In');
  });
});

describe('worked examples: reading a curve (log-log interpolation)', () => {
  // An invented maximum curve; t ∝ I^-2 between the first two points (a straight line of slope −2 on log-log axes).
  const CURVE: CurvePoint[] = [
    [100, 1000],
    [1000, 10],
    [2000, 0.1],
    [10_000, 0.1],
  ];

  it('halfway in log between two points is the geometric mean of their times', () => {
    // x = √(100 · 1000) = 316.23 A → t = √(1000 · 10) = 100 s
    const r = readCurveLogLog(CURVE, Math.sqrt(100 * 1000));
    expect(r.status).toBe('value');
    if (r.status === 'value') expectClose(r.timeS, 100, 1e-12);
  });

  it('follows a power law exactly: t = 1000 · (I/100)^-2', () => {
    for (const current of [150, 200, 500, 800]) {
      const r = readCurveLogLog(CURVE, current);
      if (r.status !== 'value') throw new Error(`no value at ${current}`);
      expectClose(r.timeS, 1000 * Math.pow(current / 100, -2), 1e-12);
    }
  });

  it('gives a point itself at its current, and the flat part its time', () => {
    const r = readCurveLogLog(CURVE, 1000);
    expect(r).toEqual({ status: 'value', timeS: 10 });
    const flat = readCurveLogLog(CURVE, 5000);
    if (flat.status !== 'value') throw new Error('no value');
    expectClose(flat.timeS, 0.1, 1e-12);
  });

  it('takes the lower time at a vertical step (two points at one current: the later one)', () => {
    const step: CurvePoint[] = [
      [100, 10],
      [6000, 1.4],
      [6000, 0.1],
      [40_000, 0.1],
    ];
    expect(readCurveLogLog(step, 6000)).toEqual({ status: 'value', timeS: 0.1 });
    const before = readCurveLogLog(step, 5999);
    if (before.status !== 'value') throw new Error('no value');
    expect(before.timeS).toBeGreaterThan(1.39);
  });

  it('says below / above outside the data instead of extrapolating', () => {
    expect(readCurveLogLog(CURVE, 50)).toEqual({ status: 'below', firstCurrent: 100 });
    expect(readCurveLogLog(CURVE, 20_000)).toEqual({ status: 'above', lastCurrent: 10_000 });
    expect(readCurveLogLog(CURVE, 0)).toEqual({ status: 'below', firstCurrent: 100 });
    expect(readCurveLogLog([], 500)).toEqual({ status: 'empty' });
  });

  it('stays between the times of the neighbouring points (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 100, max: 10_000, noNaN: true }), (current) => {
        const r = readCurveLogLog(CURVE, current);
        if (r.status !== 'value') return false;
        const i = CURVE.findIndex((p) => p[0] >= current);
        const hiT = CURVE[Math.max(0, i - 1)][1];
        const loT = CURVE[i][1];
        return r.timeS <= hiT * (1 + 1e-9) && r.timeS >= loT * (1 - 1e-9);
      }),
    );
  });
});

describe('cleaning curves', () => {
  it('drops non-positive and non-finite points and sorts by current (stable)', () => {
    const raw = [
      [1000, 1],
      [0, 5],
      [-10, 3],
      [200, Number.NaN],
      [100, 100],
      [6000, 1.4],
      [6000, 0.1],
      [300, Infinity],
    ];
    expect(cleanCurve(raw)).toEqual([
      [100, 100],
      [1000, 1],
      [6000, 1.4],
      [6000, 0.1],
    ]);
    expect(cleanCurve(undefined)).toEqual([]);
    expect(cleanCurve([[1] as unknown as number[], 'x' as unknown as number[]])).toEqual([]);
  });

  it('outlines a band: maximum forward, minimum backward; none without a minimum', () => {
    const max: CurvePoint[] = [
      [2, 100],
      [10, 1],
    ];
    const min: CurvePoint[] = [
      [1.5, 50],
      [10, 0.1],
    ];
    expect(bandOutline(max, min)).toEqual([
      [2, 100],
      [10, 1],
      [10, 0.1],
      [1.5, 50],
    ]);
    expect(bandOutline(max, [])).toBeNull();
    expect(bandOutline([], min)).toBeNull();
  });

  it('writes SVG path data rounded to 0.1 px', () => {
    expect(
      pathData([
        [0, 0],
        [10.04, 20.06],
      ]),
    ).toBe('M0 0L10 20.1');
    expect(
      pathData(
        [
          [1, 2],
          [3, 4],
          [5, 2],
        ],
        true,
      ),
    ).toBe('M1 2L3 4L5 2Z');
    expect(pathData([])).toBe('');
  });
});

describe('clipping in log space', () => {
  const RECT = { x0: 0, x1: 10, y0: 0, y1: 10 };

  it('keeps a polyline inside the rectangle as it is', () => {
    const pts: Px[] = [
      [1, 1],
      [5, 5],
      [9, 2],
    ];
    expect(clipPolyline(pts, RECT)).toEqual([pts]);
  });

  it('cuts a segment that leaves the rectangle at the edge', () => {
    const pieces = clipPolyline(
      [
        [5, 5],
        [15, 5],
      ],
      RECT,
    );
    expect(pieces).toHaveLength(1);
    expect(pieces[0][0]).toEqual([5, 5]);
    expectClose(pieces[0][1][0], 10);
    expectClose(pieces[0][1][1], 5);
  });

  it('splits a polyline that goes out and comes back into two pieces', () => {
    const pieces = clipPolyline(
      [
        [2, 5],
        [2, 20],
        [8, 20],
        [8, 5],
      ],
      RECT,
    );
    expect(pieces).toHaveLength(2);
    expectClose(pieces[0][1][1], 10);
    expectClose(pieces[1][0][1], 10);
    expect(pieces[1][1]).toEqual([8, 5]);
  });

  it('drops what lies wholly outside, and keeps far points (1e-300 s) out of the result', () => {
    expect(
      clipPolyline(
        [
          [20, 20],
          [30, 25],
        ],
        RECT,
      ),
    ).toEqual([]);
    // log10(1e-300) = −300: the segment from (5, 5) down to (5, −300) ends at the bottom edge y = 0.
    const [piece] = clipPolyline(
      [
        [5, 5],
        [5, Math.log10(1e-300)],
      ],
      RECT,
    );
    expect(piece[1]).toEqual([5, 0]);
  });

  it('clips a polygon to the rectangle (area check)', () => {
    // A 10 × 10 square shifted half out on the right: 5 × 10 = 50 inside.
    const poly = clipPolygon(
      [
        [5, 0],
        [15, 0],
        [15, 10],
        [5, 10],
      ],
      RECT,
    );
    expectClose(area(poly), 50);
    // A triangle with one corner far outside: area inside = square's part under the line.
    const tri = clipPolygon(
      [
        [0, 0],
        [20, 0],
        [0, 20],
      ],
      RECT,
    );
    expectClose(area(tri), 100); // x + y ≤ 20 covers the whole 10 × 10 square
    expect(
      clipPolygon(
        [
          [20, 20],
          [30, 20],
          [30, 30],
        ],
        RECT,
      ),
    ).toEqual([]);
  });

  it('never returns a point outside the rectangle (property)', () => {
    const coord = fc.double({ min: -400, max: 400, noNaN: true });
    fc.assert(
      fc.property(fc.array(fc.tuple(coord, coord), { minLength: 1, maxLength: 12 }), (raw) => {
        const pts = raw as Px[];
        const inRect = (p: Px) => p[0] >= -1e-9 && p[0] <= 10 + 1e-9 && p[1] >= -1e-9 && p[1] <= 10 + 1e-9;
        return clipPolyline(pts, RECT).every((piece) => piece.every(inRect)) && clipPolygon(pts, RECT).every(inRect);
      }),
    );
  });
});

describe('label layout', () => {
  const BOUNDS: Box = { x: 0, y: 0, width: 400, height: 300 };

  it('measures monospaced text at 0.6 em per character', () => {
    expectClose(monoTextWidth('F-3 0.164 s', 12), 11 * 7.2);
  });

  it('puts a label right-above its point when nothing is in the way', () => {
    const b = placeLabel([200, 150], 80, 16, BOUNDS, { boxes: [], linesX: [], points: [] }, 10);
    expect(b.x).toBeGreaterThan(200);
    expect(b.y + b.height).toBeLessThan(150);
  });

  it('moves a label off another label, off a vertical line and inside the bounds', () => {
    const other: Box = { x: 205, y: 110, width: 100, height: 30 };
    const b = placeLabel([200, 150], 80, 16, BOUNDS, { boxes: [other], linesX: [], points: [] }, 10);
    expect(boxesOverlap(b, other)).toBe(false);
    const nearEdge = placeLabel([395, 5], 80, 16, BOUNDS, { boxes: [], linesX: [], points: [] }, 10);
    expect(nearEdge.x + nearEdge.width).toBeLessThanOrEqual(400);
    expect(nearEdge.y).toBeGreaterThanOrEqual(0);
    const crossing = placeLabel([200, 150], 80, 16, BOUNDS, { boxes: [], linesX: [250], points: [] }, 10);
    expect(250 > crossing.x && 250 < crossing.x + crossing.width).toBe(false);
  });

  it('prefers the side the curve does not pass through', () => {
    // A curve running up-right through the point (as a rising line would): right-above is covered.
    const curve = densify(
      [
        [150, 200],
        [300, 50],
      ],
      5,
    );
    const b = placeLabel([200, 150], 80, 16, BOUNDS, { boxes: [], linesX: [], points: curve }, 10);
    const covered = curve.filter(([x, y]) => x >= b.x && x <= b.x + b.width && y >= b.y && y <= b.y + b.height);
    expect(covered).toHaveLength(0);
  });

  it('densifies a polyline to the given spacing', () => {
    const d = densify(
      [
        [0, 0],
        [20, 0],
      ],
      5,
    );
    expect(d).toHaveLength(5);
    expectClose(d[1][0], 5);
    expect(densify([])).toEqual([]);
  });

  it('stacks the labels of two close lines on opposite sides rather than crossing (full / reduced arcing)', () => {
    // Lines 30 px apart with 120 px labels: the higher current's label goes right of its line, the lower one's
    // left of its line, both in the first row and neither crossing the other line (common practice, no source).
    const placed = stackLineLabels(
      [
        { x: 230, width: 120 },
        { x: 200, width: 120 },
      ],
      0,
      400,
    );
    expect(placed[0]).toEqual({ x: 234, row: 0, leftOfLine: false });
    expect(placed[1]).toEqual({ x: 76, row: 0, leftOfLine: true });
  });

  it('takes a second row when both sides are blocked, and crosses a line only when nothing else fits', () => {
    const placed = stackLineLabels(
      [
        { x: 40, width: 120 },
        { x: 60, width: 120 },
      ],
      0,
      300,
    );
    expect(placed[0].row).toBe(0);
    expect(placed[1].row).toBe(1);
    expect(placed[1].x).toBe(64);
    const p = nearestPointOfBox([0, 0], { x: 10, y: 20, width: 5, height: 5 });
    expect(p).toEqual([10, 20]);
  });
});
