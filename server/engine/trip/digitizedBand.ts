import type { BandDevice } from '../../../shared/schemas/device';
import { EngineError } from '../errors';
import { combineElements, readPointCurve, requirePositive, type BandReading } from './elements';
import { validateCurvePoints } from './interpolate';

export function validateDigitizedBand(device: BandDevice): void {
  requirePositive(device.ratingA, 'device.ratingA');
  if (device.currentUnit !== 'multiple' && device.currentUnit !== 'ampere') {
    throw new EngineError(
      'invalid-input',
      'UNKNOWN_UNIT',
      'currentUnit must be "multiple" or "ampere"',
      'device.currentUnit',
    );
  }
  validateCurvePoints(device.min, 'device.min');
  validateCurvePoints(device.max, 'device.max');
}

/**
 * Band of a digitized device (min/max point lists in amperes or multiples of ratingA) at one current.
 * Each curve is read log-log; above the highest published current the last point is used with a
 * BAND_BEYOND_DATA warning; below the lowest current of the maximum curve the band shows no trip.
 */
export function digitizedBand(device: BandDevice, currentA: number): BandReading {
  validateDigitizedBand(device);
  const multiple = currentA / device.ratingA;
  const x = device.currentUnit === 'multiple' ? multiple : currentA;
  const unit = device.currentUnit === 'multiple' ? '× rating' : 'A';
  const max = readPointCurve(device.max, x, 'device.max', { warnBelow: true, unit });
  const min = readPointCurve(device.min, x, 'device.min', { warnBelow: false, unit });
  return combineElements([
    {
      element: 'band',
      region: 'curve-segment',
      maxS: max.timeS,
      minS: min.timeS,
      detail: {
        ratingA: device.ratingA,
        currentUnit: device.currentUnit,
        multipleOfRating: multiple,
        maximum: { segment: max.segment, clamped: max.clamped },
        minimum: { segment: min.segment, clamped: min.clamped },
      },
      maxWarnings: max.warnings,
      minWarnings: min.warnings,
    },
  ]);
}
