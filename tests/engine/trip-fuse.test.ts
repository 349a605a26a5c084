import { expectClose } from '../helpers/approx';
import { clearingTime } from '../../server/engine/trip/clearingTime';
import { meltToClearS } from '../../server/engine/trip/equations';
import type { FuseDevice } from '../../shared/schemas/device';
import facts from '../../server/engine/data/trip-facts.json';

// Fuse points below are invented test curves (not a maker's data); the rules checked are published.
const FUSE: FuseDevice = {
  kind: 'fuse',
  ratingA: 100,
  minimumMelt: [
    [150, 500],
    [300, 20],
    [1000, 0.3],
    [3000, 0.006],
  ],
  totalClearing: [
    [180, 1000],
    [400, 30],
    [1500, 0.4],
    [4000, 0.01],
  ],
};

const codes = (r: { warnings: { code: string }[] }) => r.warnings.map((w) => w.code);

describe('worked example: a fuse band', () => {
  it('reads the total-clearing curve as the maximum and the minimum-melt curve as the minimum', () => {
    // IEEE 1584-2002 (read in a published reprint): use the total clearing curve for the arc duration
    const r = clearingTime(FUSE, 400);
    expect(r.clearingTimeS).toBe(30); // published point: exact
    expect(r.region).toBe('curve-segment');
    // minimum melt at 400 A: log-log between (300, 20) and (1000, 0.3)
    const slope = Math.log(0.3 / 20) / Math.log(1000 / 300);
    expectClose(r.minimumTimeS as number, 20 * Math.pow(400 / 300, slope), 1e-12);
  });
});

describe('the 0.01 s rule (IEEE 1584-2002, read in a published reprint; half a cycle: common practice, no source)', () => {
  it('above the current at the bottom of the total-clearing curve (0.01 s) the clearing time is 0.01 s', () => {
    expect(facts.fuse.halfCycleRule.seconds).toBe(0.01);
    const r = clearingTime(FUSE, 20000);
    expectClose(r.clearingTimeS as number, 0.01, 1e-12);
    expect(codes(r)).toContain('FUSE_BELOW_LOWEST_TIME');
  });

  it('a curve drawn below 0.01 s is never read below 0.01 s', () => {
    const lowCurve: FuseDevice = {
      kind: 'fuse',
      ratingA: 100,
      totalClearing: [
        [200, 100],
        [2000, 0.1],
        [6000, 0.004],
      ],
    };
    expectClose(clearingTime(lowCurve, 5000).clearingTimeS as number, 0.01, 1e-12);
    expectClose(clearingTime(lowCurve, 9000).clearingTimeS as number, 0.01, 1e-12);
    // still on the curve above 0.01 s
    expect(clearingTime(lowCurve, 2000).clearingTimeS).toBe(0.1);
  });

  it('a curve that stops above 0.01 s is clamped at its last point with a warning (our choice, conservative; no source)', () => {
    const shortCurve: FuseDevice = {
      kind: 'fuse',
      ratingA: 100,
      totalClearing: [
        [200, 100],
        [2000, 0.05],
      ],
    };
    const r = clearingTime(shortCurve, 10000);
    expect(r.clearingTimeS).toBe(0.05);
    expect(codes(r)).toEqual(expect.arrayContaining(['BAND_BEYOND_DATA', 'FUSE_CURVE_ENDS_ABOVE_HALF_CYCLE']));
  });
});

describe('melt-to-clear allowance (IEEE 1584-2002 §4.6 step 5, read via a published reprint)', () => {
  it('adds 15 % at or below 0.03 s and 10 % above 0.03 s', () => {
    expectClose(meltToClearS(0.02), 0.023, 1e-12); // 0.02 s × 1.15
    expectClose(meltToClearS(0.03), 0.0345, 1e-12); // 0.03 s × 1.15 (at the threshold: "≤ 0.03 s")
    expectClose(meltToClearS(0.25), 0.275, 1e-12); // 0.25 s × 1.10
    expectClose(meltToClearS(10), 11, 1e-12);
  });

  it('just above 0.03 s holds 0.0345 s so the curve never rises with current (our choice, no source)', () => {
    expectClose(meltToClearS(0.031), 0.0345, 1e-12); // 1.10 × 0.031 = 0.0341 < 0.0345
    expect(meltToClearS(0.0314)).toBeGreaterThanOrEqual(meltToClearS(0.03));
  });

  it('a fuse given only an average-melt curve clears at melt + allowance, and says so', () => {
    const meltOnly: FuseDevice = {
      kind: 'fuse',
      ratingA: 100,
      averageMelt: [
        [150, 800],
        [500, 3],
        [1000, 0.25],
        [2000, 0.02],
      ],
    };
    const r = clearingTime(meltOnly, 1000);
    expectClose(r.clearingTimeS as number, 0.25 * 1.1, 1e-12);
    expect(r.minimumTimeS).toBe(0.25);
    expect(codes(r)).toEqual(expect.arrayContaining(['FUSE_MELT_TO_CLEAR_ALLOWANCE', 'FUSE_NO_MINIMUM_MELT']));
    expectClose(clearingTime(meltOnly, 2000).clearingTimeS as number, 0.02 * 1.15, 1e-12);
  });
});

describe('fuse limits of the data', () => {
  it('below the lowest published current the fuse does not clear (no-trip, null, warned)', () => {
    const r = clearingTime(FUSE, 170);
    expect(r.region).toBe('no-trip');
    expect(r.clearingTimeS).toBeNull();
    expect(codes(r)).toEqual(expect.arrayContaining(['BAND_BELOW_DATA', 'NO_TRIP']));
    // the minimum-melt curve does melt there
    expect(r.minimumTimeS).not.toBeNull();
  });

  it('without a melting curve the minimum is the total clearing time, with a warning', () => {
    const tcOnly: FuseDevice = { kind: 'fuse', ratingA: 100, totalClearing: FUSE.totalClearing };
    const r = clearingTime(tcOnly, 1500);
    expect(r.minimumTimeS).toBe(r.clearingTimeS);
    expect(codes(r)).toContain('FUSE_NO_MINIMUM_MELT');
  });

  it('a fuse with neither clearing nor average-melt curve is rejected naming totalClearing', () => {
    const bad = { kind: 'fuse', ratingA: 100, minimumMelt: FUSE.minimumMelt } as FuseDevice;
    expect(() => clearingTime(bad, 500)).toThrow(
      expect.objectContaining({ kind: 'invalid-input', field: 'device.totalClearing' }),
    );
  });
});
