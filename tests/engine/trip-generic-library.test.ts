import type { Device } from '../../shared/schemas/device';
import { RELAY_CURVES } from '../../shared/schemas/device';
import { deviceDefinitionSchema } from '../../shared/schemas/deviceLibrary';
import { readBand, resolveElectronicSettings } from '../../server/engine/trip';
import { genericLibrary, type GenericDeviceType } from '../../server/engine/trip/genericLibrary';
import { checkUl489Calibration } from '../../server/engine/trip/standardChecks';
import { expectClose } from '../helpers/approx';

/**
 * The generic starter set of the device library (server/engine/trip/genericLibrary.ts): every band well formed, the
 * ranges issue 20 names covered, and per family a spot value checked against its source (status beside each).
 */

const set = genericLibrary();
const deviceOf = (e: GenericDeviceType): Device => {
  const def = deviceDefinitionSchema.parse(e.definition);
  return def.kind === 'electronic' ? resolveElectronicSettings(def.tripType, def.positions) : def;
};
const family = (f: GenericDeviceType['family']) => set.filter((e) => e.family === f);
/** Amperes a device's multiples refer to. */
const ratingOf = (d: Device): number =>
  d.kind === 'electronic'
    ? d.sensorA * d.longTime.pickup
    : d.kind === 'relay'
      ? (d.pickupA ?? d.pickupSecondaryA! * d.ctRatio!)
      : d.ratingA;
/** Currents from 0.5 × to 200 × the rating, 40 per decade. */
const sweep = (ratingA: number): number[] =>
  Array.from({ length: 105 }, (_, i) => ratingA * 0.5 * 10 ** (i / 40)).filter((a) => a <= 1e7);

describe('the generic starter set is well formed', () => {
  it('every entry passes the library schema, with a unique key and name', () => {
    for (const e of set) expect(() => deviceOf(e)).not.toThrow();
    expect(new Set(set.map((e) => e.key)).size).toBe(set.length);
    expect(new Set(set.map((e) => e.name)).size).toBe(set.length);
  });

  it('point lists: current strictly increasing, time not increasing, within the curve limits', () => {
    for (const e of set) {
      const d = e.definition;
      const lists =
        d.kind === 'thermal-magnetic'
          ? [d.thermal.min, d.thermal.max]
          : d.kind === 'fuse'
            ? [d.minimumMelt ?? [], d.totalClearing ?? []]
            : d.kind === 'band'
              ? [d.min, d.max]
              : [];
      for (const points of lists) {
        expect(points.length).toBeGreaterThan(3);
        for (let i = 1; i < points.length; i += 1) {
          expect(points[i][0]).toBeGreaterThan(points[i - 1][0]);
          expect(points[i][1]).toBeLessThanOrEqual(points[i - 1][1]);
        }
      }
    }
  });

  it('read as a band: the minimum curve never above the maximum, both falling with current', () => {
    for (const e of set) {
      const device = deviceOf(e);
      let lastMax = Infinity;
      let lastMin = Infinity;
      for (const currentA of sweep(ratingOf(device))) {
        const b = readBand(device, currentA);
        if (b.minS !== null && b.maxS !== null) {
          if (!(b.minS <= b.maxS * (1 + 1e-9)))
            throw new Error(`${e.name} at ${currentA} A: min ${b.minS} > max ${b.maxS}`);
        }
        if (b.maxS !== null) {
          if (!(b.maxS <= lastMax * (1 + 1e-9))) throw new Error(`${e.name} at ${currentA} A: max rises to ${b.maxS}`);
          lastMax = b.maxS;
        } else expect(lastMax).toBe(Infinity); // once it trips, it trips at every higher current
        if (b.minS !== null) {
          expect(b.minS).toBeLessThanOrEqual(lastMin * (1 + 1e-9));
          lastMin = b.minS;
        }
      }
      expect(lastMax).toBeLessThan(Infinity); // every device clears at 200 × its rating
    }
  });
});

describe('the set covers the ranges of issue 20', () => {
  it('thermal-magnetic breakers 15–1200 A, at the standard ratings', () => {
    const ratings = family('thermal-magnetic').map((e) => (e.definition as { ratingA: number }).ratingA);
    expect(Math.min(...ratings)).toBe(15);
    expect(Math.max(...ratings)).toBe(1200);
    expect(ratings.length).toBeGreaterThanOrEqual(10);
    // NEC 240.6(A) standard ampere ratings (from memory, unverified).
    for (const r of ratings) expect([15, 20, 30, 50, 70, 100, 150, 225, 400, 600, 800, 1000, 1200]).toContain(r);
  });

  it('electronic trip units with 400–4000 A sensors, every switch with a position', () => {
    const sensors = family('electronic').map(
      (e) => (e.definition as { tripType: { sensorA: number } }).tripType.sensorA,
    );
    expect(Math.min(...sensors)).toBe(400);
    expect(Math.max(...sensors)).toBe(4000);
    expect(sensors.length).toBeGreaterThanOrEqual(5);
  });

  it('low-voltage current-limiting fuses and medium-voltage E-rated fuses', () => {
    const lv = family('lv-fuse').map((e) => (e.definition as { ratingA: number }).ratingA);
    expect(Math.min(...lv)).toBeLessThanOrEqual(30);
    expect(Math.max(...lv)).toBeGreaterThanOrEqual(2000);
    const mv = family('mv-fuse');
    expect(mv.length).toBeGreaterThanOrEqual(5);
    for (const e of mv) expect(e.name).toMatch(/^Generic \d+E medium-voltage fuse$/);
  });

  it('relays on every curve the engine has (IEEE C37.112 MI/VI/EI, IEC 60255-151 SI/VI/EI, IEC 60255-3 LTI)', () => {
    const curves = family('relay').map((e) => (e.definition as { curve: string }).curve);
    expect([...new Set(curves)].sort()).toEqual([...RELAY_CURVES].sort());
  });

  it('names are invented and generic: no maker, no catalogue number', () => {
    for (const e of set) {
      expect(e.name).toMatch(/^(Generic |Feeder relay|Incomer relay|Digitized band)/);
      expect(e.source).toMatch(/^(Generic|Invented)/);
    }
  });
});

describe('spot values against their sources', () => {
  it('thermal-magnetic: the UL 489 calibration points (read ≤ 30 A at 200 %, ≤ 50 A at 135 %; from memory above)', () => {
    for (const e of family('thermal-magnetic')) {
      const d = deviceOf(e);
      const r = checkUl489Calibration(d as Parameters<typeof checkUl489Calibration>[0]);
      if (!r.pass) throw new Error(`${e.name}: ${JSON.stringify(r.checks)}`);
    }
    // UL 489, 200 % of a 20 A breaker: trips within 2 min (read). The rule puts the maximum curve at 75 % of it.
    const tm20 = deviceOf(set.find((e) => e.key === 'tm-20')!);
    expectClose(readBand(tm20, 40).maxS!, 0.75 * 120, 1e-3);
  });

  it('thermal-magnetic: 0.025 s above the instantaneous pickup (IEEE 1584-2002 Table 1: 1.5 cycles, LV molded case; read)', () => {
    for (const e of family('thermal-magnetic')) {
      const d = deviceOf(e);
      expectClose(readBand(d, 20 * ratingOf(d)).maxS!, 0.025, 0.01);
    }
  });

  it('electronic: 0.05 s above the instantaneous pickup (IEEE 1584-2002 Table 1: 3 cycles, LV power breaker; read)', () => {
    for (const e of family('electronic')) {
      const d = deviceOf(e);
      expectClose(readBand(d, 20 * (d as { sensorA: number }).sensorA).maxS!, 0.05, 0.01);
    }
  });

  it('electronic: long-time I²t, t = LTD · (6 / M)² (common practice, from memory), within the ± 20 % time band', () => {
    const d = deviceOf(set.find((e) => e.key === 'etu-1600')!);
    // LTD position 10 s (at 6 × Ir); at 3 × Ir = 4800 A, below the short-time pickup 4 × Ir: 10 · (6 / 3)² = 40 s.
    const b = readBand(d, 3 * 1600);
    expect(b.maxS!).toBeGreaterThanOrEqual(40);
    expect(b.maxS!).toBeLessThanOrEqual(40 * 1.2 * 1.25); // ± 20 % time, ± 10 % pickup (1 / 0.9² < 1.25)
    expect(b.minS!).toBeLessThanOrEqual(40);
  });

  it('LV fuse: 0.01 s at high current — the half cycle of a current-limiting fuse (UL 248-1; IEEE 1584-2002; read)', () => {
    for (const e of family('lv-fuse')) {
      const d = deviceOf(e);
      expectClose(readBand(d, 100 * ratingOf(d)).maxS!, 0.01, 1e-9);
    }
  });

  it('LV fuse: opens within 1 h (≤ 60 A) / 2 h at 135 %, holds ≥ 10 s at 500 % (UL 248; from memory, unverified)', () => {
    for (const e of family('lv-fuse')) {
      const d = deviceOf(e);
      const r = ratingOf(d);
      expect(readBand(d, 1.35 * r).maxS!).toBeLessThanOrEqual(r <= 60 ? 3600 : 7200);
      expect(readBand(d, 5 * r).minS!).toBeGreaterThanOrEqual(10);
      expect(readBand(d, r).maxS).toBeNull(); // carries its rating
    }
  });

  it('MV fuse: melts in 300 s at 200–240 % up to 100E, 600 s at 220–264 % above (ANSI/IEEE C37.46; from memory)', () => {
    for (const e of family('mv-fuse')) {
      const d = deviceOf(e);
      const r = ratingOf(d);
      const [low, high, melt] = r <= 100 ? [2.0, 2.4, 300] : [2.2, 2.64, 600];
      expectClose(readBand(d, low * r).minS!, melt, 0.01);
      // Total clearing at the high edge: the melting time plus 10 % (IEEE 1584-2002 §4.6 allowance above 0.03 s; read).
      expectClose(readBand(d, high * r).maxS!, melt * 1.1, 0.01);
    }
  });

  it('relays: the published curve times at M = 2, TD/TMS = 1, times the dial (IEEE C37.112 / IEC 60255-151; read)', () => {
    // Published at M = 2 (trip-facts.json relayCheckValues, read at the printed precision).
    const atM2: Record<string, number> = {
      'IEEE-MI': 3.8,
      'IEEE-VI': 7.03,
      'IEEE-EI': 9.5,
      'IEC-SI': 10.03,
      'IEC-VI': 13.5,
      'IEC-EI': 26.67,
      'IEC-LTI': 120.0,
    };
    for (const e of family('relay')) {
      const d = deviceOf(e);
      if (d.kind !== 'relay') throw new Error('not a relay');
      const pickupA = d.pickupA ?? d.pickupSecondaryA! * d.ctRatio!;
      const b = readBand(d, 2 * pickupA);
      expectClose(b.minS! / d.timeDial, atM2[d.curve], 0.005);
      // Plus the breaker's interrupting time, in cycles of the system frequency (IEEE 1584-2002 Table 1; read).
      expectClose(b.maxS! - b.minS!, d.breakerCycles / (d.frequencyHz ?? 60), 0.01);
    }
  });
});
