import { expectClose } from '../helpers/approx';
import { EngineError } from '../../server/engine/errors';
import { cyclesToSeconds, iecInverseTimeS, ieeeInverseTimeS } from '../../server/engine/trip/equations';
import { clearingTime } from '../../server/engine/trip/clearingTime';
import type { RelayDevice } from '../../shared/schemas/device';
import facts from '../../server/engine/data/trip-facts.json';

/*
 * Check values copied from the project reference (relay_curves.check_values_TD1). Their status, as the
 * reference states it: COMPUTED from the IEEE C37.112-2018 / IEC 60255-151:2009 equations (not read), and they
 * agree with published commissioning tables at M = 2 and a published IEC table at M = 10 (read, printed
 * precision). Both are checked below.
 */

describe('worked examples: relay with breaker', () => {
  it('IEEE very inverse, CT 600/5, pickup 5 A secondary, TD 2, 5-cycle breaker at 6000 A (M = 10)', () => {
    // IEEE C37.112-2018: t = TD·(A/(M^p − 1) + B); VI check value at M = 10, TD = 1 is 0.6891 s (computed, reference).
    // Breaker: 5 cycles at 60 Hz = 0.0833 s (IEEE 1584-2002 Table 1 lists 5 cycles / 0.08 s for 1–35 kV breakers).
    const relay: RelayDevice = {
      kind: 'relay',
      curve: 'IEEE-VI',
      ctRatio: 120,
      pickupSecondaryA: 5,
      timeDial: 2,
      breakerCycles: 5,
    };
    const r = clearingTime(relay, 6000);
    expect(r.region).toBe('inverse-time');
    expectClose(r.minimumTimeS as number, 2 * 0.6891, 2e-4); // relay time alone: TD scales linearly (C37.112)
    expectClose(r.clearingTimeS as number, 2 * 0.6891 + 5 / 60, 2e-4); // plus breaker interrupting time
    expect(r.trace.multipleOfRating).toBeCloseTo(10, 9);
  });

  it('IEC standard inverse, TMS 0.1, pickup 400 A, 3-cycle breaker at 50 Hz, at 800 A (M = 2)', () => {
    // IEC 60255-151: t = TMS·k/(M^α − 1) = 0.1 × 10.03 s (published commissioning table value at M = 2, TMS = 1)
    const relay: RelayDevice = {
      kind: 'relay',
      curve: 'IEC-SI',
      pickupA: 400,
      timeDial: 0.1,
      breakerCycles: 3,
      frequencyHz: 50,
    };
    const r = clearingTime(relay, 800);
    expectClose(r.clearingTimeS as number, 0.1 * 10.03 + 3 * 0.02, 1e-3); // 3 cycles at 50 Hz = 60 ms (1 cycle = 20 ms)
  });
});

describe('IEEE C37.112-2018 and IEC 60255-151 operating times at TD / TMS = 1', () => {
  const checks = facts.relayCheckValues;
  // The reference's computed values at M = 2, 5 and 10 (status: computed from the published equations).
  const computed: [string, number, number][] = [
    ['IEEE-MI', 2, 3.8032],
    ['IEEE-MI', 5, 1.6883],
    ['IEEE-MI', 10, 1.2068],
    ['IEEE-VI', 2, 7.0277],
    ['IEEE-VI', 5, 1.3081],
    ['IEEE-VI', 10, 0.6891],
    ['IEEE-EI', 2, 9.5217],
    ['IEEE-EI', 5, 1.2967],
    ['IEEE-EI', 10, 0.4065],
    ['IEC-SI', 2, 10.029],
    ['IEC-SI', 5, 4.2797],
    ['IEC-SI', 10, 2.9706],
    ['IEC-VI', 2, 13.5],
    ['IEC-VI', 5, 3.375],
    ['IEC-VI', 10, 1.5],
    ['IEC-EI', 2, 26.6667],
    ['IEC-EI', 5, 3.3333],
    ['IEC-EI', 10, 0.8081],
    ['IEC-LTI', 2, 120.0],
    ['IEC-LTI', 5, 30.0],
    ['IEC-LTI', 10, 13.3333],
  ];

  function timeAt(curve: string, m: number, td: number): number {
    const [family, name] = curve.split('-');
    return family === 'IEEE' ? ieeeInverseTimeS(name as 'MI', m, td) : iecInverseTimeS(name as 'SI', m, td);
  }

  it.each(computed)(
    '%s at M = %d: %d s (reference check value, computed; printed to 4–5 figures)',
    (curve, m, expected) => {
      // IEEE C37.112-2018 / IEC 60255-151:2009 equations; the reference prints 4 decimals, so allow 1e-4 relative
      expectClose(timeAt(curve, m, 1), expected, 1e-4, 6e-5);
    },
  );

  // Published commissioning tables at M = 2 (IEC SI 10.03, VI 13.50, EI 26.67, LTI 120.0; IEEE MI 3.80, VI 7.03, EI 9.50),
  // printed to 3–4 figures: allow half a unit in the last printed digit.
  const publishedM2 = Object.entries(checks.publishedAtM2.values);
  it.each(publishedM2.filter(([curve]) => curve !== 'IEEE-EI'))(
    '%s at M = 2 matches the published commissioning table (%d s, read)',
    (curve, expected) => {
      expectClose(timeAt(curve, 2, 1), expected, 0, 0.0051);
    },
  );
  // KNOWN DISCREPANCY (reported): the equation with the published C37.112 EI constants gives
  // 28.2/(2² − 1) + 0.1217 = 9.5217 s at M = 2, which does not round to the table's printed 9.50 s. The
  // reference's own computed value is 9.5217. Kept as a failing check so that it is seen, not hidden.
  it.failing(
    'IEEE-EI at M = 2 matches the published commissioning table 9.50 s to its printed precision (read)',
    () => {
      expectClose(timeAt('IEEE-EI', 2, 1), checks.publishedAtM2.values['IEEE-EI'], 0, 0.0051);
    },
  );

  it.each(Object.entries(checks.publishedIecAtM10.values))(
    '%s at M = 10 matches the published IEC table (%d s, read)',
    (curve, expected) => {
      // Published IEC 60255-151 table at TMS = 1, M = 10: SI 2.971, VI 1.500, EI 0.808, LTI 13.333 (3 decimals)
      expectClose(timeAt(curve, 10, 1), expected, 0, 0.0006);
    },
  );

  it('uses the published constants (IEEE C37.112-2018 Table; IEC 60255-151 Table)', () => {
    // IEEE C37.112-2018: MI A 0.0515 B 0.114 p 0.02; VI A 19.61 B 0.491 p 2; EI A 28.2 B 0.1217 p 2
    expect(facts.ieeeC37112.curves.MI).toMatchObject({ A: 0.0515, B: 0.114, p: 0.02 });
    expect(facts.ieeeC37112.curves.VI).toMatchObject({ A: 19.61, B: 0.491, p: 2 });
    expect(facts.ieeeC37112.curves.EI).toMatchObject({ A: 28.2, B: 0.1217, p: 2 });
    // IEC 60255-151: SI k 0.14 α 0.02; VI 13.5 / 1; EI 80 / 2; LTI (IEC 60255-3) 120 / 1
    expect(facts.iec60255151.curves.SI).toMatchObject({ k: 0.14, alpha: 0.02 });
    expect(facts.iec60255151.curves.LTI).toMatchObject({ k: 120, alpha: 1 });
  });

  it('refuses M ≤ 1 (the equations apply above pickup only)', () => {
    expect(() => ieeeInverseTimeS('VI', 1, 1)).toThrow(EngineError);
    expect(() => iecInverseTimeS('SI', 0.5, 1)).toThrow(EngineError);
  });
});

describe('time dial and time multiplier scaling (C37.112 / IEC 60255-151: t scales linearly with TD / TMS)', () => {
  it.each([0.5, 2, 7.5, 15])('IEEE EI at M = 5 with TD %d is TD × 1.2967 s', (td) => {
    // Reference check value IEEE EI, M = 5, TD = 1: 1.2967 s (computed)
    expectClose(ieeeInverseTimeS('EI', 5, td), td * 1.2967, 1e-4);
  });
  it.each([0.05, 0.1, 0.5, 1])('IEC VI at M = 10 with TMS %d is TMS × 1.5 s', (tms) => {
    // Published IEC table, M = 10, TMS = 1: VI 1.500 s (read)
    expectClose(iecInverseTimeS('VI', 10, tms), tms * 1.5, 1e-9);
  });
});

describe('cycles to seconds and breaker interrupting times', () => {
  it('1 cycle is 16.7 ms at 60 Hz and 20 ms at 50 Hz', () => {
    // Definition 1 cycle = 1/f; IEEE 1584-2002 Table 1 reprint prints 0.01667 s (60 Hz) and 0.02 s (50 Hz)
    expectClose(cyclesToSeconds(1, 60), 0.01667, 0, 0.000005);
    expectClose(cyclesToSeconds(1, 50), 0.02, 1e-12);
  });

  it.each([
    ['LV molded case (<1000 V), integral trip', 1.5, 0.025],
    ['LV insulated case / LV power circuit breaker', 3.0, 0.05],
    ['Medium voltage (1-35 kV)', 5.0, 0.08],
    ['Some high voltage (>35 kV)', 8.0, 0.13],
  ])('%s: %d cycles ≈ %d s at 60 Hz (IEEE 1584-2002 Table 1, read)', (_type, cycles, seconds) => {
    // The table prints seconds to 2 significant figures: allow 0.005 s.
    expectClose(cyclesToSeconds(cycles, 60), seconds, 0, 0.005);
  });

  it('the project data carries the same table', () => {
    // IEEE 1584-2002 Table 1 (read): 1.5 / 3 / 5 / 8 cycles
    expect(facts.breakerInterruptingTimes.rows.map((r) => r.cycles60Hz)).toEqual([1.5, 3, 5, 8]);
  });
});

describe('relay elements', () => {
  const base: RelayDevice = {
    kind: 'relay',
    curve: 'IEEE-MI',
    pickupA: 1000,
    timeDial: 1,
    instantaneousA: 10000,
    definiteTime: { pickupA: 5000, delayS: 0.5 },
    breakerCycles: 5,
  };
  const breakerS = 5 / 60;

  it('below pickup the relay does not clear (no-trip, null, NO_TRIP warning)', () => {
    const r = clearingTime(base, 999);
    expect(r.region).toBe('no-trip');
    expect(r.clearingTimeS).toBeNull();
    expect(r.minimumTimeS).toBeNull();
    expect(r.warnings.map((w) => w.code)).toContain('NO_TRIP');
  });

  it('just above pickup the inverse-time element runs (MI at M = 2: 3.8032 s, reference computed value)', () => {
    expect(clearingTime(base, 1000 * 1.0001).region).toBe('inverse-time');
    expectClose(clearingTime(base, 2000).clearingTimeS as number, 3.8032 + breakerS, 1e-4);
  });

  it('the fastest element governs: definite-time above its pickup, instantaneous above its own', () => {
    // IEEE MI at M = 4.99 is about 1.9 s > 0.5 s definite time
    expect(clearingTime(base, 4990).region).toBe('inverse-time');
    const dt = clearingTime(base, 5000);
    expect(dt.region).toBe('definite-time');
    expectClose(dt.clearingTimeS as number, 0.5 + breakerS, 1e-12);
    expect(clearingTime(base, 9990).region).toBe('definite-time');
    // With no instantaneous pickup tolerance the element operates at its pickup; with the default ±10 % the maximum
    // curve stays on the slower element up to 11 000 A (see tests/engine/conservative-defaults.test.ts).
    const inst = clearingTime({ ...base, instantaneousTolerancePct: 0 }, 10000);
    expect(inst.region).toBe('instantaneous');
    expect(clearingTime(base, 10000).region).toBe('definite-time');
    // IEEE 1584-2002: relay in its instantaneous region: allow 16 ms relay time, then add the breaker opening time
    expectClose(inst.clearingTimeS as number, 0.016 + breakerS, 1e-12);
    expectClose(inst.minimumTimeS as number, 0.016, 1e-12);
  });

  it('a definite-time element slower than the inverse curve does not govern', () => {
    const slowDt: RelayDevice = { ...base, instantaneousA: undefined, definiteTime: { pickupA: 1500, delayS: 30 } };
    expect(clearingTime(slowDt, 3000).region).toBe('inverse-time');
  });

  it('pickups through the CT ratio; primary and secondary settings must agree', () => {
    const viaCt: RelayDevice = {
      kind: 'relay',
      curve: 'IEC-EI',
      ctRatio: 400 / 5,
      pickupSecondaryA: 2.5,
      timeDial: 1,
      breakerCycles: 3,
    };
    // pickup = 2.5 A × 80 = 200 A; at 400 A, M = 2: IEC EI 26.6667 s (reference computed value)
    expectClose(clearingTime(viaCt, 400).minimumTimeS as number, 26.6667, 1e-5);
    expect(() => clearingTime({ ...viaCt, pickupA: 300 }, 400)).toThrow(
      expect.objectContaining({ kind: 'invalid-input', field: 'device.pickupA' }),
    );
  });

  it('a breaker time in cycles at 50 Hz: 3 cycles = 0.06 s', () => {
    const r = clearingTime({ ...base, breakerCycles: 3, frequencyHz: 50 }, 2000);
    expectClose((r.clearingTimeS as number) - (r.minimumTimeS as number), 0.06, 1e-9);
  });
});

describe('relay input errors', () => {
  it('an unknown curve, a zero time dial or a zero breaker time is rejected naming the field', () => {
    const relay: RelayDevice = { kind: 'relay', curve: 'IEEE-VI', pickupA: 100, timeDial: 1, breakerCycles: 5 };
    expect(() => clearingTime({ ...relay, curve: 'IEEE-XX' as RelayDevice['curve'] }, 500)).toThrow(
      expect.objectContaining({ kind: 'invalid-input', field: 'device.curve' }),
    );
    expect(() => clearingTime({ ...relay, timeDial: 0 }, 500)).toThrow(
      expect.objectContaining({ field: 'device.timeDial' }),
    );
    expect(() => clearingTime({ ...relay, breakerCycles: 0 }, 500)).toThrow(
      expect.objectContaining({ field: 'device.breakerCycles' }),
    );
    expect(() => clearingTime(relay, 0)).toThrow(expect.objectContaining({ kind: 'invalid-input', field: 'currentA' }));
  });
});
