import type { FuseDevice } from '../../../shared/schemas/device';
import { EngineError, type EngineWarning } from '../errors';
import { FUSE_MINIMUM_CLEARING_S, meltToClearS } from './equations';
import { combineElements, readPointCurve, requirePositive, type BandReading } from './elements';
import { fmt, validateCurvePoints, type TimeCurrentPoint } from './interpolate';

/** Relative slack when deciding that a curve's last point is "at 0.01 s" (digitizing noise). */
const BOTTOM_SLACK = 0.05;

/** Checks a fuse's inputs; throws EngineError 'invalid-input' naming the field. */
export function validateFuse(device: FuseDevice): void {
  requirePositive(device.ratingA, 'device.ratingA');
  if (device.totalClearing) validateCurvePoints(device.totalClearing, 'device.totalClearing');
  if (device.minimumMelt) validateCurvePoints(device.minimumMelt, 'device.minimumMelt');
  if (device.averageMelt) validateCurvePoints(device.averageMelt, 'device.averageMelt');
  if (!device.totalClearing && !device.averageMelt) {
    throw new EngineError(
      'invalid-input',
      'FUSE_NO_CLEARING_CURVE',
      'A fuse needs its total-clearing curve (or an average-melt curve to which the melt-to-clear allowance is added)',
      'device.totalClearing',
    );
  }
}

/**
 * Maximum (total clearing) time of a fuse at a current, with the rules of IEEE 1584-2002:
 * - read the total-clearing curve log-log; where only an average-melt curve is published, read it and add
 *   the melt-to-clear allowance (15 % at ≤ 0.03 s, 10 % above; §4.6 step 5);
 * - below the bottom of the curve (0.01 s) the clearing time is 0.01 s (half a cycle): the time is never
 *   taken below 0.01 s, and above the highest published current of a curve drawn down to 0.01 s it is 0.01 s;
 * - a curve that stops above 0.01 s is clamped at its last point with a BAND_BEYOND_DATA warning
 *   (conservative: the 0.01 s rule is not stretched beyond what the curve shows);
 * - below the lowest published current the fuse is taken not to clear.
 */
function fuseMaximum(device: FuseDevice, currentA: number) {
  const fromAverageMelt = !device.totalClearing;
  const points = (device.totalClearing ?? device.averageMelt) as TimeCurrentPoint[];
  const field = fromAverageMelt ? 'device.averageMelt' : 'device.totalClearing';
  const reading = readPointCurve(points, currentA, field, { warnBelow: true, unit: 'A' });
  const warnings: EngineWarning[] = [];
  const detail: Record<string, unknown> = {
    curve: fromAverageMelt ? 'average-melt + allowance' : 'total-clearing',
    segment: reading.segment,
  };
  if (reading.timeS === null) return { timeS: null, warnings: reading.warnings, detail };

  let timeS = reading.timeS;
  if (fromAverageMelt) {
    detail.meltS = timeS;
    timeS = meltToClearS(timeS);
    warnings.push({
      code: 'FUSE_MELT_TO_CLEAR_ALLOWANCE',
      message: `Only an average-melt curve is given: total clearing ${fmt(timeS)} s = melt ${fmt(reading.timeS)} s plus the IEEE 1584-2002 allowance (15 % at ≤ 0.03 s, 10 % above)`,
    });
  }
  const lastTimeS = fromAverageMelt ? meltToClearS(points[points.length - 1][1]) : points[points.length - 1][1];
  const curveReachesBottom = lastTimeS <= FUSE_MINIMUM_CLEARING_S * (1 + BOTTOM_SLACK);
  if (reading.clamped === 'above-data' && curveReachesBottom) {
    timeS = FUSE_MINIMUM_CLEARING_S;
    detail.rule = 'half-cycle';
    warnings.push({
      code: 'FUSE_BELOW_LOWEST_TIME',
      message: `${fmt(currentA)} A is above the bottom of the clearing curve: ${FUSE_MINIMUM_CLEARING_S} s used (IEEE 1584-2002; half a cycle)`,
    });
  } else {
    warnings.push(...reading.warnings);
    if (reading.clamped === 'above-data') {
      warnings.push({
        code: 'FUSE_CURVE_ENDS_ABOVE_HALF_CYCLE',
        message: `The clearing curve stops at ${fmt(lastTimeS)} s, above ${FUSE_MINIMUM_CLEARING_S} s; its last point is used. Extend the curve to ${FUSE_MINIMUM_CLEARING_S} s to apply the half-cycle rule`,
      });
    }
    if (timeS < FUSE_MINIMUM_CLEARING_S) {
      detail.curveTimeS = timeS;
      detail.rule = 'half-cycle';
      timeS = FUSE_MINIMUM_CLEARING_S;
      warnings.push({
        code: 'FUSE_BELOW_LOWEST_TIME',
        message: `The curve reads below ${FUSE_MINIMUM_CLEARING_S} s here; ${FUSE_MINIMUM_CLEARING_S} s used (IEEE 1584-2002; half a cycle)`,
      });
    }
  }
  return { timeS, warnings, detail };
}

function fuseMinimum(device: FuseDevice, currentA: number) {
  const [points, field, extra] = device.minimumMelt
    ? [device.minimumMelt, 'device.minimumMelt', null]
    : device.averageMelt
      ? [
          device.averageMelt,
          'device.averageMelt',
          {
            code: 'FUSE_NO_MINIMUM_MELT',
            message: 'No minimum-melting curve: the average-melt curve is shown as the minimum',
          },
        ]
      : [
          device.totalClearing as TimeCurrentPoint[],
          'device.totalClearing',
          {
            code: 'FUSE_NO_MINIMUM_MELT',
            message: 'No melting curve: the minimum time is taken equal to the total clearing time',
          },
        ];
  const reading = readPointCurve(points, currentA, field, { warnBelow: false, unit: 'A' });
  const warnings: EngineWarning[] = [...reading.warnings];
  if (extra) warnings.push(extra);
  return { timeS: reading.timeS, warnings, detail: { curve: field.replace('device.', ''), segment: reading.segment } };
}

/** Band of a fuse at one current: total clearing (maximum) and minimum melting (minimum). */
export function fuseBand(device: FuseDevice, currentA: number): BandReading {
  validateFuse(device);
  const max = fuseMaximum(device, currentA);
  const min = fuseMinimum(device, currentA);
  return combineElements([
    {
      element: 'fuse',
      region: 'curve-segment',
      maxS: max.timeS,
      minS: min.timeS,
      detail: {
        ratingA: device.ratingA,
        multipleOfRating: currentA / device.ratingA,
        maximum: max.detail,
        minimum: min.detail,
      },
      maxWarnings: max.warnings,
      minWarnings: min.warnings,
    },
  ]);
}
