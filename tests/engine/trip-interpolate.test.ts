import * as fc from 'fast-check';
import { expectClose, isClose } from '../helpers/approx';
import { EngineError } from '../../server/engine/errors';
import { interpolateLogLog, validateCurvePoints, type TimeCurrentPoint } from '../../server/engine/trip/interpolate';
import { clearingTime } from '../../server/engine/trip/clearingTime';
import type { BandDevice } from '../../shared/schemas/device';

// Log-log interpolation, the product's rule (docs/ARCHITECTURE.md, Clearing time from a trip band): straight lines
// between points on log-log axes; beyond the data clamp and warn, never invent (common practice, no source).
// A straight line on log-log axes is t = t0·(x/x0)^s with s the slope between points.

const CURVE: [number, number][] = [
  [100, 1000],
  [200, 100],
  [1000, 1],
  [5000, 0.05],
];

describe('worked example: log-log interpolation', () => {
  it('halfway between two points on log axes is the geometric mean of their times', () => {
    // x = √(100·200) = 141.42 lies halfway in log between 100 and 200, so t = √(1000·100) = 316.23 s
    const r = interpolateLogLog(CURVE, Math.sqrt(100 * 200), 'curve');
    expectClose(r.timeS, Math.sqrt(1000 * 100), 1e-12);
    expect(r.segment).toEqual([0, 1]);
    expect(r.clamped).toBeNull();
  });

  it('follows the power law through the two neighbouring points (slope −2 between 200 A / 100 s and 1000 A / 1 s)', () => {
    // slope = log(1/100)/log(1000/200) = −2.861; t(400) = 100·(400/200)^slope
    const slope = Math.log(1 / 100) / Math.log(1000 / 200);
    expectClose(interpolateLogLog(CURVE, 400, 'curve').timeS, 100 * Math.pow(2, slope), 1e-12);
  });
});

describe('interpolateLogLog', () => {
  it('is exact at every point', () => {
    for (const [x, t] of CURVE) {
      const r = interpolateLogLog(CURVE, x, 'curve');
      expect(r.timeS).toBe(t); // exact by construction: the point's own value is returned, not recomputed
      expect(r.warnings).toEqual([]);
    }
  });

  it('is linear in log space between points (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), fc.integer({ min: 0, max: CURVE.length - 2 }), (f, i) => {
        const [x0, t0] = CURVE[i];
        const [x1, t1] = CURVE[i + 1];
        const x = Math.exp(Math.log(x0) + f * Math.log(x1 / x0));
        const logT = Math.log(interpolateLogLog(CURVE, x, 'curve').timeS);
        const expected = Math.log(t0) + f * Math.log(t1 / t0);
        return isClose(logT, expected, 1e-9, 1e-9);
      }),
    );
  });

  it('clamps beyond the data and warns BAND_BEYOND_DATA (never extrapolates)', () => {
    const above = interpolateLogLog(CURVE, 20000, 'device.max');
    expect(above.timeS).toBe(0.05);
    expect(above.clamped).toBe('above-data');
    expect(above.warnings).toEqual([expect.objectContaining({ code: 'BAND_BEYOND_DATA' })]);
    expect(above.warnings[0].message).toContain('device.max');
    const below = interpolateLogLog(CURVE, 50, 'device.max');
    expect(below.timeS).toBe(1000);
    expect(below.clamped).toBe('below-data');
    expect(below.warnings[0].code).toBe('BAND_BEYOND_DATA');
  });

  it('a digitized band read beyond its last point says so on the result', () => {
    const band: BandDevice = { kind: 'band', ratingA: 100, currentUnit: 'ampere', min: CURVE, max: CURVE };
    const r = clearingTime(band, 9000);
    expect(r.clearingTimeS).toBe(0.05);
    expect(r.warnings.map((w) => w.code)).toContain('BAND_BEYOND_DATA');
  });
});

describe('validateCurvePoints', () => {
  function errorOf(fn: () => void): EngineError {
    try {
      fn();
    } catch (e) {
      return e as EngineError;
    }
    throw new Error('expected an EngineError');
  }

  it('rejects unsorted currents naming the field and index', () => {
    const e = errorOf(() =>
      validateCurvePoints(
        [
          [100, 10],
          [300, 5],
          [200, 1],
        ],
        'device.max',
      ),
    );
    expect(e).toBeInstanceOf(EngineError);
    expect(e.kind).toBe('invalid-input');
    expect(e.field).toBe('device.max[2]');
  });

  it('rejects a repeated current', () => {
    expect(
      errorOf(() =>
        validateCurvePoints(
          [
            [100, 10],
            [100, 5],
          ],
          'device.min',
        ),
      ).field,
    ).toBe('device.min[1]');
  });

  it.each([
    [
      [
        [100, 10],
        [0, 5],
      ],
      'device.max[1]',
    ],
    [[[-1, 10]], 'device.max[0]'],
    [
      [
        [100, 10],
        [200, 0],
      ],
      'device.max[1]',
    ],
    [
      [
        [100, 10],
        [200, -3],
      ],
      'device.max[1]',
    ],
    [[[100, Number.NaN]], 'device.max[0]'],
  ] as [TimeCurrentPoint[], string][])('rejects non-positive or non-numeric points %j', (points, field) => {
    const e = errorOf(() => validateCurvePoints(points, 'device.max'));
    expect(e.kind).toBe('invalid-input');
    expect(e.field).toBe(field);
  });

  it('rejects a trip curve whose time rises with current, and an empty list', () => {
    expect(
      errorOf(() =>
        validateCurvePoints(
          [
            [100, 10],
            [200, 20],
          ],
          'device.max',
        ),
      ).field,
    ).toBe('device.max[1]');
    expect(errorOf(() => validateCurvePoints([], 'device.max')).field).toBe('device.max');
  });

  it('the device reader rejects bad points before reading (field names the device curve)', () => {
    const band = {
      kind: 'band',
      ratingA: 100,
      currentUnit: 'multiple',
      min: [[1, 10]],
      max: [
        [2, 10],
        [1, 5],
      ],
    } as BandDevice;
    expect(() => clearingTime(band, 150)).toThrow(
      expect.objectContaining({ kind: 'invalid-input', field: 'device.max[1]' }),
    );
  });
});
