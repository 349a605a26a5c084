import type { ThermalMagneticDevice } from '../../../shared/schemas/device';
import { EngineError } from '../errors';
import { cyclesToSeconds, ELECTRONIC_CONVENTIONS, MOLDED_CASE_CLEARING_CYCLES } from './equations';
import {
  above,
  atOrAbove,
  combineElements,
  pickupEdges,
  readPointCurve,
  requirePercent,
  requirePositive,
  type BandReading,
  type ElementReading,
  type PickupEdges,
} from './elements';
import { fmt, validateCurvePoints } from './interpolate';

export interface ThermalMagneticSettings {
  frequencyHz: number;
  /** Instantaneous pickup edges in multiples of rating, or null without an instantaneous element. */
  instantaneous: PickupEdges | null;
  instantaneousClearingS: number;
  instantaneousMinimumS: number;
}

/**
 * Resolved settings of a thermal-magnetic breaker. Instantaneous clearing defaults to 1.5 cycles
 * (IEEE 1584-2002 Table 1, LV molded case, 0.025 s at 60 Hz); the minimum (no-trip) time in the
 * instantaneous region defaults to 0.01 s (common practice, from memory), never above the clearing time.
 */
export function thermalMagneticSettings(device: ThermalMagneticDevice): ThermalMagneticSettings {
  requirePositive(device.ratingA, 'device.ratingA');
  validateCurvePoints(device.thermal.min, 'device.thermal.min');
  validateCurvePoints(device.thermal.max, 'device.thermal.max');
  const frequencyHz = device.frequencyHz === undefined ? 60 : requirePositive(device.frequencyHz, 'device.frequencyHz');
  if (device.instantaneousClearingS !== undefined && device.instantaneousClearingCycles !== undefined) {
    throw new EngineError(
      'invalid-input',
      'AMBIGUOUS_CLEARING',
      'Give the instantaneous clearing time in seconds or in cycles, not both',
      'device.instantaneousClearingCycles',
    );
  }
  const instantaneousClearingS =
    device.instantaneousClearingS !== undefined
      ? requirePositive(device.instantaneousClearingS, 'device.instantaneousClearingS')
      : cyclesToSeconds(
          device.instantaneousClearingCycles !== undefined
            ? requirePositive(device.instantaneousClearingCycles, 'device.instantaneousClearingCycles')
            : MOLDED_CASE_CLEARING_CYCLES,
          frequencyHz,
        );
  const instantaneousMinimumS = Math.min(
    device.instantaneousMinimumS !== undefined
      ? requirePositive(device.instantaneousMinimumS, 'device.instantaneousMinimumS')
      : ELECTRONIC_CONVENTIONS.instantaneousMinimumS,
    instantaneousClearingS,
  );
  let instantaneous: PickupEdges | null = null;
  const inst = device.instantaneous;
  if (inst) {
    if (inst.lowMultiple !== undefined || inst.highMultiple !== undefined) {
      if (inst.pickupMultiple !== undefined || inst.tolerancePct !== undefined) {
        throw new EngineError(
          'invalid-input',
          'AMBIGUOUS_PICKUP',
          'Give the instantaneous pickup as pickupMultiple with tolerancePct, or as lowMultiple with highMultiple, not both',
          'device.instantaneous',
        );
      }
      const lowA = requirePositive(inst.lowMultiple, 'device.instantaneous.lowMultiple');
      const highA = requirePositive(inst.highMultiple, 'device.instantaneous.highMultiple');
      if (highA < lowA) {
        throw new EngineError(
          'invalid-input',
          'EDGES_REVERSED',
          'highMultiple must not be below lowMultiple',
          'device.instantaneous.highMultiple',
        );
      }
      instantaneous = { nominalA: (lowA + highA) / 2, lowA, highA };
    } else {
      const pickup = requirePositive(inst.pickupMultiple, 'device.instantaneous.pickupMultiple');
      const tol = requirePercent(inst.tolerancePct, 'device.instantaneous.tolerancePct', 99);
      instantaneous = pickupEdges(pickup, tol);
    }
  }
  return { frequencyHz, instantaneous, instantaneousClearingS, instantaneousMinimumS };
}

/**
 * Band of a thermal-magnetic breaker at one current.
 * Thermal element: the min/max point lists in multiples of rating (region 'long-time').
 * Instantaneous element: the maximum curve drops to the instantaneous clearing time only at and above the HIGH
 * edge of the pickup tolerance (between the low and high edges it stays on the thermal band); the minimum
 * curve drops above the LOW edge (at the low edge itself the breaker must not trip, as in the IEC 60898-1
 * instantaneous test). The fastest element governs each edge.
 */
export function thermalMagneticBand(
  device: ThermalMagneticDevice,
  currentA: number,
  s: ThermalMagneticSettings = thermalMagneticSettings(device),
): BandReading {
  const multiple = currentA / device.ratingA;
  const elements: ElementReading[] = [];
  const withinTolerance =
    s.instantaneous !== null && above(multiple, s.instantaneous.lowA) && !atOrAbove(multiple, s.instantaneous.highA);
  if (s.instantaneous) {
    const aboveHigh = atOrAbove(multiple, s.instantaneous.highA);
    const aboveLow = above(multiple, s.instantaneous.lowA);
    elements.push({
      element: 'instantaneous',
      region: 'instantaneous',
      maxS: aboveHigh ? s.instantaneousClearingS : null,
      minS: aboveLow ? s.instantaneousMinimumS : null,
      detail: {
        pickupMultiple: s.instantaneous.nominalA,
        setting: device.instantaneous?.setting,
        lowEdgeMultiple: s.instantaneous.lowA,
        highEdgeMultiple: s.instantaneous.highA,
        multipleOfRating: multiple,
        maximumEdge: 'high pickup edge',
        minimumEdge: 'low pickup edge',
        withinTolerance,
      },
      maxWarnings: [],
      minWarnings: [],
    });
  }
  const max = readPointCurve(device.thermal.max, multiple, 'device.thermal.max', { warnBelow: true, unit: '× rating' });
  const min = readPointCurve(device.thermal.min, multiple, 'device.thermal.min', {
    warnBelow: false,
    unit: '× rating',
  });
  elements.push({
    element: 'thermal',
    region: 'long-time',
    maxS: max.timeS,
    minS: min.timeS,
    detail: {
      multipleOfRating: multiple,
      maximum: { segment: max.segment, clamped: max.clamped },
      minimum: { segment: min.segment, clamped: min.clamped },
    },
    maxWarnings: withinTolerance
      ? [
          ...max.warnings,
          {
            code: 'WITHIN_PICKUP_TOLERANCE',
            message: `${fmt(multiple)} × rating lies within the instantaneous pickup tolerance (${fmt(s.instantaneous!.lowA)}–${fmt(s.instantaneous!.highA)} × rating): the maximum curve stays on the thermal band`,
          },
        ]
      : max.warnings,
    minWarnings: min.warnings,
  });
  return combineElements(elements);
}
