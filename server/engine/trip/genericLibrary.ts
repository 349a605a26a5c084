import type {
  CurvePoint,
  ElectronicTripType,
  FuseDevice,
  RelayDevice,
  ThermalMagneticDevice,
} from '../../../shared/schemas/device';
import type { DeviceDefinition } from '../../../shared/schemas/deviceLibrary';
import facts from '../data/generic-library.json';
import tripFacts from '../data/trip-facts.json';
import { EXAMPLE_BAND, EXAMPLE_RELAY_IEC, EXAMPLE_RELAY_IEEE } from './exampleDevices';
import { ul489LimitAt200PctS } from './standardChecks';

/**
 * The generic starter set of every organization's device library: invented device types covering the usual range
 * (thermal-magnetic breakers 15–1200 A, electronic trip units with 400–4000 A sensors, low-voltage current-limiting
 * fuses, medium-voltage E-rated fuses, relays). No maker's data, names or catalogue numbers: each band is generated
 * from the published points copied into `data/generic-library.json` and `data/trip-facts.json` (with their status)
 * and, between them, from the rules below, marked "common practice, no source". Every entry carries the note
 * `GENERIC_DEVICE_NOTE`: generic — verify against the manufacturer's published curve.
 *
 * Where a rule leaves a choice open it takes the slower band (a longer clearing time gives the higher incident
 * energy): the wider tolerance, the high edge of an adjustable instantaneous range, the longer breaker time.
 */

export type GenericFamily = 'thermal-magnetic' | 'electronic' | 'lv-fuse' | 'mv-fuse' | 'relay' | 'band';

export interface GenericDeviceType {
  /** Stable key of the entry: an organization's library holds each key at most once. */
  key: string;
  family: GenericFamily;
  name: string;
  description: string;
  source: string;
  definition: DeviceDefinition;
}

/** Significant figures of generated curve points (common practice, no source: published curves are read to 2–3). */
const round = (v: number, digits = 4): number => Number(v.toPrecision(digits));

/** Points [multiple or amperes, seconds] of a falling curve t(m) on a grid, kept between the time bounds. */
function sample(
  grid: readonly number[],
  timeS: (m: number) => number,
  scale: number,
  bounds: { maxS: number; minS: number },
): CurvePoint[] {
  const points: CurvePoint[] = [];
  for (const m of grid) {
    const t = timeS(m);
    if (!(t <= bounds.maxS)) continue;
    points.push([round(m * scale), round(Math.max(t, bounds.minS))]);
    if (t <= bounds.minS) break;
  }
  return points;
}

// ---------------------------------------------------------------------------------------------
// Thermal-magnetic molded-case breakers

export const THERMAL_MAGNETIC_RATINGS_A = [15, 20, 30, 50, 70, 100, 150, 225, 400, 600, 800, 1200] as const;

/**
 * Thermal band of a generic molded-case breaker, multiples of rating (common practice, no source, except the UL 489
 * anchor): the maximum curve is an I²t-like overload curve t = T₂ · 3 / (M² − 1) through T₂ = 75 % of the UL 489
 * maximum trip time at 200 % for the rating (`trip-facts.json`: read ≤ 30 A, from memory above), so the band meets
 * the 135 % and 200 % calibration limits; the minimum curve is 0.3 × the maximum time and starts at 1.05 × rating
 * (the breaker carries its rating, UL 489 100 %).
 */
export function genericThermalBand(ratingA: number): { min: CurvePoint[]; max: CurvePoint[] } {
  const t2 = 0.75 * ul489LimitAt200PctS(ratingA).limitS;
  const maxS = (m: number) => (t2 * 3) / (m * m - 1);
  const grid = [1.05, 1.1, 1.25, 1.35, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10, 12, 15, 20, 25, 30];
  const bounds = { maxS: 1e4, minS: 0.01 };
  return {
    min: sample(
      grid.filter((m) => m >= 1.05),
      (m) => 0.3 * maxS(m),
      1,
      bounds,
    ),
    max: sample(
      grid.filter((m) => m >= 1.25),
      maxS,
      1,
      bounds,
    ),
  };
}

/** Frames up to this rating have a fixed instantaneous pickup; larger ones an adjustable one (from memory). */
const FIXED_INSTANTANEOUS_UP_TO_A = 100;

/**
 * Instantaneous element: fixed 10 × rating with ± 25 % (the upper end of the usual ± 20–25 %) up to 100 A; above,
 * the adjustable range 5 × (LO) to 10 × (HI) given as its whole range, so the maximum curve drops to the
 * instantaneous clearing time only above 10 × rating until the engineer sets the device's own position (from memory,
 * unverified: `generic-library.json`). Clearing in the instantaneous region: the engine's 1.5 cycles (IEEE 1584-2002
 * Table 1, LV molded case).
 */
export function genericThermalMagnetic(ratingA: number): ThermalMagneticDevice {
  const inst = facts.thermalMagneticInstantaneous;
  return {
    kind: 'thermal-magnetic',
    ratingA,
    thermal: genericThermalBand(ratingA),
    instantaneous:
      ratingA <= FIXED_INSTANTANEOUS_UP_TO_A
        ? { pickupMultiple: inst.fixed.pickupMultiple, tolerancePct: Math.max(...inst.fixed.tolerancePctRange) }
        : { lowMultiple: inst.adjustable.lowMultiple, highMultiple: inst.adjustable.highMultiple, setting: 'LO–HI' },
  };
}

// ---------------------------------------------------------------------------------------------
// Electronic trip units

export const ELECTRONIC_SENSORS_A = [400, 800, 1200, 1600, 2000, 3000, 4000] as const;

const positions = (values: readonly number[], name: (v: number) => string = String): Record<string, number> =>
  Object.fromEntries(values.map((v) => [name(v), v]));

/**
 * An electronic LSIG trip unit type for a sensor (common practice, from memory: `generic-library.json`): rating
 * plugs of the standard ratings from half the sensor to the sensor; long-time pickup 0.4–1.0 × In, delay 2–24 s at
 * 6 × Ir; short-time 1.5–10 × Ir, 0.1–0.5 s, I²t in or out; instantaneous 2–15 × In; ground fault 0.2–0.6 × In
 * but at most 1200 A (NEC 230.95, from memory), 0.1–0.5 s. Pickup tolerance ± 10 %; time tolerance ± 20 % (the upper
 * end of the usual 10–20 %); clearing 0.05 s, the LV power breaker time of IEEE 1584-2002 Table 1 (read; slower
 * than the 0.025 s of a molded case).
 */
export function genericElectronicTripType(sensorA: number): ElectronicTripType {
  const ranges = facts.electronicTripUnitRanges;
  const plugs = facts.standardAmpereRatings.values.filter((a) => a >= sensorA / 2 && a <= sensorA);
  const [ltLow] = ranges.longTimePickupMultipleOfIn;
  const gfMaxA = facts.groundFaultMaximumPickupA.value;
  const gf = [0.2, 0.3, 0.4, 0.5, 0.6].map((k) => round(k * sensorA, 3)).filter((a) => a <= gfMaxA);
  return {
    name: `Generic LSIG trip unit, ${sensorA} A sensor`,
    sensorA,
    settings: {
      ratingPlug: { positions: positions(plugs) },
      longTimePickup: {
        positions: positions(
          [0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 0.95, 1.0].filter((k) => k >= ltLow),
          (v) => v.toFixed(v === 0.95 ? 2 : 1),
        ),
      },
      longTimeDelay: { positions: positions([2, 4, 7, 10, 12, 15, 20, 24]) },
      shortTimePickup: { positions: { OFF: 0, ...positions([1.5, 2, 3, 4, 5, 6, 8, 10]) } },
      shortTimeDelay: { positions: positions([0.1, 0.2, 0.3, 0.4, 0.5]) },
      shortTimeI2t: { positions: { OUT: 0, IN: 1 } },
      instantaneousPickup: { positions: { OFF: 0, ...positions([2, 4, 6, 8, 10, 12, 15]) } },
      groundFaultPickup: { positions: { OFF: 0, ...positions(gf) } },
      groundFaultDelay: { positions: positions([0.1, 0.2, 0.3, 0.5]) },
    },
    longTimeDelayMultiple: tripFacts.electronicConventions.longTimeDelayMultiple,
    shortTimeI2tMultiple: tripFacts.electronicConventions.shortTimeI2tMultiple,
    pickupTolerancePct: ranges.pickupTolerancePct,
    timeTolerancePct: Math.max(...ranges.timeTolerancePctRange),
    clearingS: tripFacts.breakerInterruptingTimes.rows.find((r) => r.id === 'lv-power')!.seconds,
  };
}

/** The positions a generic unit starts at: In = sensor, Ir 1.0, LTD 10 s, ST 4 × 0.3 s I²t out, INST 10 ×, GF 0.2 s. */
export function genericElectronicPositions(type: ElectronicTripType) {
  const gf = Object.keys(type.settings.groundFaultPickup?.positions ?? {}).filter((k) => k !== 'OFF');
  return {
    ratingPlug: String(type.sensorA),
    longTimePickup: '1.0',
    longTimeDelay: '10',
    shortTimePickup: '4',
    shortTimeDelay: '0.3',
    shortTimeI2t: 'OUT',
    instantaneousPickup: '10',
    groundFaultPickup: gf.length > 0 ? gf[Math.min(2, gf.length - 1)] : 'OFF',
    groundFaultDelay: '0.2',
  };
}

// ---------------------------------------------------------------------------------------------
// Low-voltage current-limiting fuses

export const LV_FUSE_RATINGS_A = [30, 60, 100, 200, 400, 600, 800, 1200, 2000, 3000] as const;

/**
 * Band of a generic time-delay current-limiting fuse, multiples of rating (common practice, no source, except the
 * anchors): minimum melting t = 300 / (M² − 1) up to 8 × rating (the overload element; at 5 × it holds 12.5 s, above
 * the 10 s minimum of time-delay fuses at 500 %, from memory), then falling as M⁻⁶ (the short-circuit element); total
 * clearing is the melting curve at 1.25 × the current, drawn down to 0.01 s, the half cycle in which a
 * current-limiting fuse clears (UL 248-1, read) — above it the engine applies the half-cycle rule. At 135 % it clears
 * within 1 h (≤ 60 A) / 2 h (from memory).
 */
export function genericLvFuseMeltS(multiple: number): number {
  const knee = 8;
  const overload = (m: number) => 300 / (m * m - 1);
  return multiple <= knee ? overload(multiple) : overload(knee) * (knee / multiple) ** 6;
}

/** Multiple of the current at which the total clearing of a generic LV fuse is given by its melting curve. */
export const LV_FUSE_CLEARING_CURRENT_SHIFT = 1.25;

export function genericLvFuse(ratingA: number): FuseDevice {
  const halfCycleS = facts.currentLimitingClearing.halfCycleS;
  const grid = [1.1, 1.2, 1.35, 1.5, 1.75, 2, 2.5, 3, 4, 5, 6, 8, 10, 12, 15, 20, 25, 30, 40, 50];
  const melt = sample(grid, genericLvFuseMeltS, ratingA, { maxS: 1e4, minS: 0.005 });
  const clearing = (m: number) => genericLvFuseMeltS(m / LV_FUSE_CLEARING_CURRENT_SHIFT);
  // The multiple where total clearing reaches half a cycle: on the M⁻⁶ part, clearing(m) = halfCycle.
  const knee = 8 * LV_FUSE_CLEARING_CURRENT_SHIFT;
  const bottom = knee * (genericLvFuseMeltS(8) / halfCycleS) ** (1 / 6);
  const total = sample([...grid.filter((m) => m >= 1.35 && m < bottom), bottom], clearing, ratingA, {
    maxS: 1e4,
    minS: halfCycleS,
  });
  return { kind: 'fuse', ratingA, minimumMelt: melt, totalClearing: total };
}

// ---------------------------------------------------------------------------------------------
// Medium-voltage E-rated fuses

export const MV_FUSE_E_RATINGS = [25, 40, 65, 100, 150, 200] as const;

/**
 * Band of a generic E-rated medium-voltage fuse, multiples of the E rating. The E rating (ANSI/IEEE C37.46, from
 * memory, unverified): up to 100E the fuse melts in 300 s at 200–240 % of its rating, above 100E in 600 s at
 * 220–264 %. Minimum melting passes through (low multiple, melt time) with the shape
 * t = T · ((Mₗ² − c) / (M² − c))², c = (0.7 Mₗ)² (common practice, no source: an asymptote at 0.7 × the test
 * multiple, M⁻⁴ at high currents); the maximum melting curve is the same at 1.2 × the current (the high multiple
 * 240 % / 264 %), and total clearing adds the IEEE 1584-2002 §4.6 melt-to-clear allowance to it (10 % above 0.03 s,
 * 15 % at or below; read). An E-rated fuse need not be current-limiting: the total-clearing curve stops at one cycle
 * (0.0167 s at 60 Hz) instead of the half-cycle rule's 0.01 s (the slower choice).
 */
export function genericMvFuseMeltS(multiple: number, eRating: number): number {
  const r = eRating <= 100 ? facts.eRatedFuses.atOrBelow100E : facts.eRatedFuses.above100E;
  const c = (0.7 * r.lowMultiple) ** 2;
  if (multiple * multiple <= c) return Infinity;
  return r.meltTimeS * ((r.lowMultiple ** 2 - c) / (multiple * multiple - c)) ** 2;
}

export function genericMvFuse(eRating: number): FuseDevice {
  const r = eRating <= 100 ? facts.eRatedFuses.atOrBelow100E : facts.eRatedFuses.above100E;
  const shift = r.highMultiple / r.lowMultiple;
  const allowance = tripFacts.fuse.meltToClearAllowance;
  const oneCycleS = tripFacts.cycleSeconds['60Hz'];
  const clearingS = (m: number) => {
    const melt = genericMvFuseMeltS(m / shift, eRating);
    return melt * (melt <= allowance.thresholdS ? allowance.factorAtOrBelowThreshold : allowance.factorAboveThreshold);
  };
  const grid = [1.5, 1.6, 1.75, 2, 2.2, 2.5, 3, 3.5, 4, 5, 6, 8, 10, 12, 15, 20, 25, 30, 40, 50];
  // The E-rating test points themselves are points of the curves (so the band reads them exactly).
  const withAnchor = (anchor: number) => [...new Set([...grid, anchor])].sort((a, b) => a - b);
  return {
    kind: 'fuse',
    ratingA: eRating,
    minimumMelt: sample(withAnchor(r.lowMultiple), (m) => genericMvFuseMeltS(m, eRating), eRating, {
      maxS: 1e4,
      minS: 0.005,
    }),
    totalClearing: sample(withAnchor(r.highMultiple), clearingS, eRating, { maxS: 1e4, minS: oneCycleS }),
  };
}

// ---------------------------------------------------------------------------------------------
// Relays: the IEEE C37.112 and IEC 60255-151 curves at typical settings (invented)

const GENERIC_RELAYS: { key: string; name: string; description: string; device: RelayDevice }[] = [
  {
    key: 'relay-ieee-vi',
    name: 'Feeder relay, very inverse',
    description:
      'IEEE C37.112 very inverse, 600/5 CT, pickup 5 A secondary, time dial 2, instantaneous 6000 A, 5-cycle breaker.',
    device: EXAMPLE_RELAY_IEEE,
  },
  {
    key: 'relay-iec-si',
    name: 'Incomer relay, standard inverse',
    description:
      'IEC 60255-151 standard inverse, 800 A, TMS 0.2, definite time 4000 A at 0.3 s, 3-cycle breaker, 50 Hz.',
    device: EXAMPLE_RELAY_IEC,
  },
  {
    key: 'relay-ieee-mi',
    name: 'Generic main relay, IEEE moderately inverse',
    description:
      'IEEE C37.112 moderately inverse, 1200/5 CT, pickup 5 A secondary (1200 A), time dial 3, no instantaneous, 5-cycle breaker.',
    device: {
      kind: 'relay',
      curve: 'IEEE-MI',
      ctRatio: 1200 / 5,
      pickupSecondaryA: 5,
      timeDial: 3,
      breakerCycles: 5,
      frequencyHz: 60,
    },
  },
  {
    key: 'relay-ieee-ei',
    name: 'Generic feeder relay, IEEE extremely inverse',
    description:
      'IEEE C37.112 extremely inverse, 200/5 CT, pickup 4 A secondary (160 A), time dial 2, instantaneous 2400 A, 5-cycle breaker.',
    device: {
      kind: 'relay',
      curve: 'IEEE-EI',
      ctRatio: 200 / 5,
      pickupSecondaryA: 4,
      timeDial: 2,
      instantaneousA: 2400,
      breakerCycles: 5,
      frequencyHz: 60,
    },
  },
  {
    key: 'relay-iec-vi',
    name: 'Generic feeder relay, IEC very inverse',
    description: 'IEC 60255-151 very inverse, 400 A, TMS 0.3, 3-cycle breaker, 50 Hz.',
    device: { kind: 'relay', curve: 'IEC-VI', pickupA: 400, timeDial: 0.3, breakerCycles: 3, frequencyHz: 50 },
  },
  {
    key: 'relay-iec-ei',
    name: 'Generic feeder relay, IEC extremely inverse',
    description: 'IEC 60255-151 extremely inverse, 300 A, TMS 0.4, instantaneous 4500 A, 5-cycle breaker, 50 Hz.',
    device: {
      kind: 'relay',
      curve: 'IEC-EI',
      pickupA: 300,
      timeDial: 0.4,
      instantaneousA: 4500,
      breakerCycles: 5,
      frequencyHz: 50,
    },
  },
  {
    key: 'relay-iec-lti',
    name: 'Generic overload relay, IEC long-time inverse',
    description: 'IEC 60255-3 long-time inverse, 100 A, TMS 0.5, 5-cycle breaker, 50 Hz.',
    device: { kind: 'relay', curve: 'IEC-LTI', pickupA: 100, timeDial: 0.5, breakerCycles: 5, frequencyHz: 50 },
  },
];

// ---------------------------------------------------------------------------------------------
// The set

const SOURCE_RULES = 'Generic, invented: generated from published points and stated rules (see its description)';

export function genericLibrary(): GenericDeviceType[] {
  const set: GenericDeviceType[] = [];
  for (const ratingA of THERMAL_MAGNETIC_RATINGS_A) {
    const device = genericThermalMagnetic(ratingA);
    const inst = device.instantaneous!;
    set.push({
      key: `tm-${ratingA}`,
      family: 'thermal-magnetic',
      name: `Generic ${ratingA} A molded-case breaker`,
      description:
        `Thermal-magnetic. Thermal band built to meet the UL 489 calibration points for ${ratingA} A; ` +
        (inst.pickupMultiple !== undefined
          ? `fixed instantaneous ${inst.pickupMultiple} × rating ± ${inst.tolerancePct} %.`
          : `adjustable instantaneous ${inst.lowMultiple}–${inst.highMultiple} × rating, entered as the whole range (set the device's own position).`),
      source: SOURCE_RULES,
      definition: device,
    });
  }
  for (const sensorA of ELECTRONIC_SENSORS_A) {
    const tripType = genericElectronicTripType(sensorA);
    set.push({
      key: `etu-${sensorA}`,
      family: 'electronic',
      name: `Generic LSIG trip unit, ${sensorA} A frame`,
      description: `Electronic trip unit, ${sensorA} A sensor: long-time, short-time, instantaneous and ground-fault switches.`,
      source: SOURCE_RULES,
      definition: { kind: 'electronic', tripType, positions: genericElectronicPositions(tripType) },
    });
  }
  for (const ratingA of LV_FUSE_RATINGS_A) {
    set.push({
      key: `fuse-lv-${ratingA}`,
      family: 'lv-fuse',
      name: `Generic ${ratingA} A current-limiting fuse`,
      description: `Low-voltage time-delay current-limiting fuse (600 V). Minimum-melting and total-clearing curves; total clearing drawn down to 0.01 s.`,
      source: SOURCE_RULES,
      definition: genericLvFuse(ratingA),
    });
  }
  for (const e of MV_FUSE_E_RATINGS) {
    set.push({
      key: `fuse-mv-${e}e`,
      family: 'mv-fuse',
      name: `Generic ${e}E medium-voltage fuse`,
      description: `E-rated medium-voltage power fuse. Minimum-melting and total-clearing curves; total clearing stops at one cycle.`,
      source: SOURCE_RULES,
      definition: genericMvFuse(e),
    });
  }
  for (const r of GENERIC_RELAYS) {
    set.push({
      key: r.key,
      family: 'relay',
      name: r.name,
      description: r.description,
      source: 'Generic, invented settings on the published IEEE C37.112 / IEC 60255-151 curves',
      definition: r.device,
    });
  }
  set.push({
    key: 'band-example',
    family: 'band',
    name: 'Digitized band, multiples of rating',
    description: 'A band read off a published curve, as min/max points.',
    source: 'Invented example',
    definition: EXAMPLE_BAND,
  });
  return set;
}

/**
 * Names of the six types every organization was given before the starter set grew, with the key of the entry each
 * one became. A stored type of that name never edited since is that generic entry.
 */
export const EARLIER_GENERIC_NAMES: Record<string, string> = {
  'Generic 20 A molded-case breaker': 'tm-20',
  'Generic 200 A current-limiting fuse': 'fuse-lv-200',
  'Feeder relay, very inverse': 'relay-ieee-vi',
  'Incomer relay, standard inverse': 'relay-iec-si',
  'Digitized band, multiples of rating': 'band-example',
  'Generic LSIG trip unit, 1600 A frame': 'etu-1600',
};
