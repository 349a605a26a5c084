import type { Device, TripRegion } from '../../../shared/schemas/device';
import { EngineError, type EngineWarning } from '../errors';
import { digitizedBand } from './digitizedBand';
import { electronicBand } from './electronic';
import type { BandReading } from './elements';
import { fuseBand } from './fuse';
import { fmt } from './interpolate';
import { relayBand } from './relay';
import { thermalMagneticBand } from './thermalMagnetic';

/**
 * The chain behind a clearing time: shown on the clearing trace (docs/ARCHITECTURE.md, Principles: traceable numbers).
 * Plain JSON.
 */
export interface ClearingTrace {
  kind: Device['kind'];
  currentA: number;
  /** Rating the multiple refers to: ratingA, the electronic unit's Ir, or the relay pickup. */
  ratingA: number | null;
  multipleOfRating: number | null;
  /** Element on the maximum (total clearing) curve, e.g. 'instantaneous', 'inverse-time', 'fuse'. */
  governingElement: string | null;
  /** Element on the minimum curve. */
  minimumElement: string | null;
  /** Which tolerance edge each curve uses. */
  toleranceEdge: { maximum: string; minimum: string };
  elements: ({ element: string; region: TripRegion; maxS: number | null; minS: number | null } & Record<
    string,
    unknown
  >)[];
}

export interface ClearingTimeResult {
  /** Maximum-curve (total clearing) time = arc duration, seconds, incl. breaker time; null when the device does not clear. */
  clearingTimeS: number | null;
  /** Minimum-curve time, seconds; null when even the minimum curve does not trip. */
  minimumTimeS: number | null;
  region: TripRegion;
  warnings: EngineWarning[];
  trace: ClearingTrace;
}

/** Reads the band of any device kind at one current (no final warnings; see clearingTime). */
export function readBand(device: Device, currentA: number): BandReading {
  switch (device.kind) {
    case 'relay':
      return relayBand(device, currentA);
    case 'fuse':
      return fuseBand(device, currentA);
    case 'band':
      return digitizedBand(device, currentA);
    case 'thermal-magnetic':
      return thermalMagneticBand(device, currentA);
    case 'electronic':
      return electronicBand(device, currentA);
    default: {
      const kind = (device as { kind?: unknown }).kind;
      throw new EngineError(
        'invalid-input',
        'UNKNOWN_DEVICE_KIND',
        `Unknown device kind ${String(kind)}`,
        'device.kind',
      );
    }
  }
}

function ratingOf(device: Device): number | null {
  switch (device.kind) {
    case 'fuse':
    case 'band':
    case 'thermal-magnetic':
      return device.ratingA;
    case 'electronic':
      return device.longTime.pickup * device.sensorA;
    case 'relay':
      return (
        device.pickupA ??
        (device.ctRatio !== undefined && device.pickupSecondaryA !== undefined
          ? device.ctRatio * device.pickupSecondaryA
          : null)
      );
    default:
      return null;
  }
}

const TOLERANCE_EDGES: Record<Device['kind'], { maximum: string; minimum: string }> = {
  relay: { maximum: 'relay operating time + breaker interrupting time', minimum: 'relay operating time' },
  fuse: { maximum: 'total-clearing curve', minimum: 'minimum-melting curve' },
  band: { maximum: 'maximum curve', minimum: 'minimum curve' },
  'thermal-magnetic': {
    maximum: 'thermal maximum curve; instantaneous above the high pickup edge',
    minimum: 'thermal minimum curve; instantaneous above the low pickup edge',
  },
  electronic: {
    maximum: 'high pickup edges, upper time band, plus breaker clearing',
    minimum: 'low pickup edges, lower time band',
  },
};

/**
 * Clearing time of a protective device at the current it sees (docs/ARCHITECTURE.md, Clearing time from a trip band):
 * the device's MAXIMUM (total clearing) curve read at `currentA` — for relays including the breaker interrupting time.
 * This is the arc duration. Below pickup the result is region 'no-trip' with clearingTimeS null and a NO_TRIP warning:
 * the device does not clear that current. Throws EngineError 'invalid-input' (field named) for bad device data or a
 * non-positive current.
 */
export function clearingTime(device: Device, currentA: number): ClearingTimeResult {
  checkClearingInput(device, currentA);
  const band = readBand(device, currentA);
  const ratingA = ratingOf(device);
  return {
    ...clearingFromBand(band, currentA),
    trace: {
      kind: device.kind,
      currentA,
      ratingA,
      multipleOfRating: ratingA ? currentA / ratingA : null,
      governingElement: band.governingElement,
      minimumElement: band.minimumElement,
      toleranceEdge: TOLERANCE_EDGES[device.kind],
      elements: band.elements.map((el) => ({
        element: el.element,
        region: el.region,
        maxS: el.maxS,
        minS: el.minS,
        ...el.detail,
      })),
    },
  };
}

/** The input checks of `clearingTime`: throws EngineError 'invalid-input' for a non-positive current or no device. */
export function checkClearingInput(device: Device, currentA: number): void {
  if (typeof currentA !== 'number' || !Number.isFinite(currentA) || currentA <= 0) {
    throw new EngineError(
      'invalid-input',
      'NOT_POSITIVE',
      `currentA must be a positive number, got ${String(currentA)}`,
      'currentA',
    );
  }
  if (!device || typeof device !== 'object') {
    throw new EngineError('invalid-input', 'DEVICE_MISSING', 'Give the device', 'device');
  }
}

/** The result of `clearingTime` without its trace, from the band read at `currentA`. */
export function clearingFromBand(band: BandReading, currentA: number): Omit<ClearingTimeResult, 'trace'> {
  const warnings = [...band.warnings];
  if (band.maxS === null) {
    warnings.push({
      code: 'NO_TRIP',
      message: `At ${fmt(currentA)} A the device's maximum curve shows no trip: this device does not clear this current`,
    });
  }
  return { clearingTimeS: band.maxS, minimumTimeS: band.minS, region: band.region, warnings };
}
