import type { RelayDevice } from '../../../shared/schemas/device';
import { EngineError } from '../errors';
import {
  cyclesToSeconds,
  iecInverseTimeS,
  ieeeInverseTimeS,
  RELAY_INSTANTANEOUS_ALLOWANCE_S,
  type IecCurveName,
  type IeeeCurveName,
} from './equations';
import {
  above,
  atOrAbove,
  combineElements,
  pickupEdges,
  requireNonNegative,
  requirePercent,
  requirePositive,
  type BandReading,
  type ElementReading,
  type PickupEdges,
} from './elements';
import { fmt } from './interpolate';

const DEFAULT_FREQUENCY_HZ = 60;
/**
 * Multiple of pickup above which the inverse-time element keeps its time (IEC 60255-151 lets the relay declare
 * where its dependent-time characteristic ends; 20 × the setting is common practice, no source).
 */
export const DEFAULT_CURVE_LIMIT_MULTIPLE = 20;
/** Instantaneous pickup tolerance, ± percent (common practice, no source). */
export const DEFAULT_INSTANTANEOUS_TOLERANCE_PCT = 10;
const IEEE_NAMES = ['MI', 'VI', 'EI'] as const;
const IEC_NAMES = ['SI', 'VI', 'EI', 'LTI'] as const;

/**
 * Primary amperes of a relay setting: given directly, or secondary amperes × CT ratio.
 * Where both are given they must agree (within 0.1 %).
 */
export function relayPrimaryA(
  primaryA: number | undefined,
  secondaryA: number | undefined,
  ctRatio: number | undefined,
  field: string,
): number | undefined {
  const fromSecondary =
    secondaryA !== undefined && ctRatio !== undefined
      ? requirePositive(secondaryA, `${field}Secondary`) * requirePositive(ctRatio, 'device.ctRatio')
      : undefined;
  if (primaryA === undefined) return fromSecondary;
  requirePositive(primaryA, field);
  if (fromSecondary !== undefined && Math.abs(fromSecondary - primaryA) > 1e-3 * primaryA) {
    throw new EngineError(
      'invalid-input',
      'PICKUP_MISMATCH',
      `${field} = ${fmt(primaryA)} A does not match the secondary setting × CT ratio = ${fmt(fromSecondary)} A`,
      field,
    );
  }
  return primaryA;
}

/** Relay operating time of the inverse-time element at M = I / pickup (> 1), seconds, by curve family. */
export function relayInverseTimeS(curve: RelayDevice['curve'], multipleOfPickup: number, timeDial: number): number {
  const [family, name] = String(curve).split('-');
  if (family === 'IEEE' && (IEEE_NAMES as readonly string[]).includes(name)) {
    return ieeeInverseTimeS(name as IeeeCurveName, multipleOfPickup, timeDial);
  }
  if (family === 'IEC' && (IEC_NAMES as readonly string[]).includes(name)) {
    return iecInverseTimeS(name as IecCurveName, multipleOfPickup, timeDial);
  }
  throw new EngineError(
    'invalid-input',
    'UNKNOWN_CURVE',
    `Unknown relay curve ${String(curve)}: use IEEE-MI, IEEE-VI, IEEE-EI, IEC-SI, IEC-VI, IEC-EI or IEC-LTI`,
    'device.curve',
  );
}

/** Resolved settings of a relay in primary amperes and seconds. */
export interface RelaySettings {
  pickupA: number;
  instantaneousA: number | null;
  instantaneousDelayS: number;
  definiteTime: { pickupA: number; delayS: number } | null;
  breakerS: number;
  frequencyHz: number;
  /** Multiple of pickup above which the inverse-time element keeps the time read at that multiple. */
  curveLimitMultiple: number;
  /** Instantaneous pickup edges (± instantaneousTolerancePct), or null without an instantaneous element. */
  instantaneousEdges: PickupEdges | null;
}

export function relaySettings(device: RelayDevice): RelaySettings {
  const frequencyHz =
    device.frequencyHz === undefined ? DEFAULT_FREQUENCY_HZ : requirePositive(device.frequencyHz, 'device.frequencyHz');
  const pickupA = relayPrimaryA(device.pickupA, device.pickupSecondaryA, device.ctRatio, 'device.pickupA');
  if (pickupA === undefined) {
    throw new EngineError(
      'invalid-input',
      'PICKUP_MISSING',
      'Give pickupA, or ctRatio with pickupSecondaryA',
      'device.pickupA',
    );
  }
  requirePositive(device.timeDial, 'device.timeDial');
  relayInverseTimeS(device.curve, 2, 1); // checks the curve name up front
  const instantaneousA =
    relayPrimaryA(device.instantaneousA, device.instantaneousSecondaryA, device.ctRatio, 'device.instantaneousA') ??
    null;
  let definiteTime: RelaySettings['definiteTime'] = null;
  if (device.definiteTime) {
    const dtPickup = relayPrimaryA(
      device.definiteTime.pickupA,
      device.definiteTime.pickupSecondaryA,
      device.ctRatio,
      'device.definiteTime.pickupA',
    );
    if (dtPickup === undefined) {
      throw new EngineError(
        'invalid-input',
        'PICKUP_MISSING',
        'Give definiteTime.pickupA, or ctRatio with definiteTime.pickupSecondaryA',
        'device.definiteTime.pickupA',
      );
    }
    definiteTime = {
      pickupA: dtPickup,
      delayS: requireNonNegative(device.definiteTime.delayS, 'device.definiteTime.delayS'),
    };
  }
  // IEEE 1584-2002: allow 16 ms relay time in the instantaneous region at 60 Hz. At another frequency we
  // allow one cycle (16 ms is about one 60 Hz cycle) — common practice, no source.
  const instantaneousDelayS =
    device.instantaneousDelayS !== undefined
      ? requireNonNegative(device.instantaneousDelayS, 'device.instantaneousDelayS')
      : frequencyHz === DEFAULT_FREQUENCY_HZ
        ? RELAY_INSTANTANEOUS_ALLOWANCE_S
        : cyclesToSeconds(1, frequencyHz);
  const breakerS = cyclesToSeconds(requirePositive(device.breakerCycles, 'device.breakerCycles'), frequencyHz);
  const curveLimitMultiple =
    device.curveLimitMultiple === undefined
      ? DEFAULT_CURVE_LIMIT_MULTIPLE
      : requirePositive(device.curveLimitMultiple, 'device.curveLimitMultiple');
  if (!(curveLimitMultiple > 1)) {
    throw new EngineError(
      'invalid-input',
      'CURVE_LIMIT_AT_PICKUP',
      `device.curveLimitMultiple must be above 1 (the curve starts at pickup), got ${curveLimitMultiple}`,
      'device.curveLimitMultiple',
    );
  }
  const tolerancePct =
    device.instantaneousTolerancePct === undefined
      ? DEFAULT_INSTANTANEOUS_TOLERANCE_PCT
      : requirePercent(device.instantaneousTolerancePct, 'device.instantaneousTolerancePct', 99);
  const instantaneousEdges = instantaneousA === null ? null : pickupEdges(instantaneousA, tolerancePct);
  return {
    pickupA,
    instantaneousA,
    instantaneousDelayS,
    definiteTime,
    breakerS,
    frequencyHz,
    curveLimitMultiple,
    instantaneousEdges,
  };
}

/**
 * Band of an overcurrent relay with its breaker at one current.
 * Minimum curve = relay operating time; maximum curve = relay operating time + breaker interrupting time
 * (breakerCycles at frequencyHz). Elements: inverse-time (IEEE C37.112 / IEC 60255-151), definite-time,
 * instantaneous; the fastest governs. Definite-time elements operate at and above pickup; the inverse-time element
 * above pickup (M > 1) and, above `curveLimitMultiple` × pickup, keeps the time read at that multiple (IEC 60255-151:
 * the dependent-time characteristic ends where the relay declares; default 20 ×). The instantaneous element has a
 * pickup tolerance (± `instantaneousTolerancePct`, default 10 %): the maximum curve drops to it only at and above the
 * HIGH edge (within the band it stays on the slower element, with a warning), the minimum curve above the LOW edge —
 * as for thermal-magnetic and electronic trip units.
 */
export function relayBand(
  device: RelayDevice,
  currentA: number,
  s: RelaySettings = relaySettings(device),
): BandReading {
  const elements: ElementReading[] = [];
  const breakerDetail = { breakerCycles: device.breakerCycles, breakerS: s.breakerS, frequencyHz: s.frequencyHz };
  const inst = s.instantaneousEdges;
  const withinTolerance = inst !== null && above(currentA, inst.lowA) && !atOrAbove(currentA, inst.highA);
  const toleranceWarning = withinTolerance
    ? [
        {
          code: 'WITHIN_PICKUP_TOLERANCE',
          message: `${fmt(currentA)} A lies within the instantaneous pickup tolerance (${fmt(inst.lowA)}–${fmt(inst.highA)} A): the maximum curve stays on the slower element`,
        },
      ]
    : [];

  if (inst !== null) {
    const tripsMax = atOrAbove(currentA, inst.highA);
    const tripsMin = above(currentA, inst.lowA) || atOrAbove(currentA, inst.highA);
    elements.push({
      element: 'instantaneous',
      region: 'instantaneous',
      maxS: tripsMax ? s.instantaneousDelayS + s.breakerS : null,
      minS: tripsMin ? s.instantaneousDelayS : null,
      detail: {
        pickupA: inst.nominalA,
        lowEdgeA: inst.lowA,
        highEdgeA: inst.highA,
        maximumEdge: 'high pickup edge',
        minimumEdge: 'low pickup edge',
        withinTolerance,
        multipleOfPickup: currentA / inst.nominalA,
        relayTimeS: s.instantaneousDelayS,
        ...breakerDetail,
      },
      maxWarnings: [],
      minWarnings: [],
    });
  }
  if (s.definiteTime) {
    const trips = atOrAbove(currentA, s.definiteTime.pickupA);
    elements.push({
      element: 'definite-time',
      region: 'definite-time',
      maxS: trips ? s.definiteTime.delayS + s.breakerS : null,
      minS: trips ? s.definiteTime.delayS : null,
      detail: {
        pickupA: s.definiteTime.pickupA,
        multipleOfPickup: currentA / s.definiteTime.pickupA,
        relayTimeS: s.definiteTime.delayS,
        ...breakerDetail,
      },
      maxWarnings: trips ? toleranceWarning : [],
      minWarnings: [],
    });
  }
  const multipleOfPickup = currentA / s.pickupA;
  const limited = multipleOfPickup > s.curveLimitMultiple;
  const readAtMultiple = Math.min(multipleOfPickup, s.curveLimitMultiple);
  const relayTimeS = multipleOfPickup > 1 ? relayInverseTimeS(device.curve, readAtMultiple, device.timeDial) : null;
  elements.push({
    element: 'inverse-time',
    region: 'inverse-time',
    maxS: relayTimeS === null ? null : relayTimeS + s.breakerS,
    minS: relayTimeS,
    detail: {
      curve: device.curve,
      timeDial: device.timeDial,
      pickupA: s.pickupA,
      multipleOfPickup,
      curveLimitMultiple: s.curveLimitMultiple,
      readAtMultiple: relayTimeS === null ? null : readAtMultiple,
      curveLimited: relayTimeS !== null && limited,
      relayTimeS,
      ...breakerDetail,
    },
    maxWarnings:
      relayTimeS === null
        ? [{ code: 'BELOW_PICKUP', message: `${fmt(currentA)} A is at or below the relay pickup ${fmt(s.pickupA)} A` }]
        : [
            ...(limited
              ? [
                  {
                    code: 'RELAY_CURVE_LIMIT',
                    message: `${fmt(multipleOfPickup)} × pickup is above the curve limit (${fmt(s.curveLimitMultiple)} × pickup): the inverse-time element keeps its time at ${fmt(s.curveLimitMultiple)} ×, ${fmt(relayTimeS)} s`,
                  },
                ]
              : []),
            ...toleranceWarning,
          ],
    minWarnings: [],
  });
  return combineElements(elements);
}
