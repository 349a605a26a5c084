import type { Device } from '../../../shared/schemas/device';
import { checkClearingInput, clearingFromBand, readBand, type ClearingTimeResult } from './clearingTime';
import { electronicBand, electronicSettings, type ElectronicSettings } from './electronic';
import type { BandReading } from './elements';
import { relayBand, relaySettings, type RelaySettings } from './relay';
import { thermalMagneticBand, thermalMagneticSettings, type ThermalMagneticSettings } from './thermalMagnetic';

/**
 * Band reads of a fixed set of devices (a study run: the model does not change while it runs), each device's
 * settings resolved once and each band read once per current: the same numbers, warnings and details as `readBand`
 * and `clearingTime` (a read returns the band read the first time at that device and current). Settings that do not
 * resolve (bad device data) are resolved again at the next read, so the error is thrown at every read, as before.
 * At most `maxReadings` bands are kept (then all are dropped): a study reads the same currents within one bus.
 */
export interface BandReader {
  /** `readBand(device, currentA)`. */
  read(device: Device, currentA: number): BandReading;
  /** `clearingTime(device, currentA)` without the trace (same checks, same warnings). */
  clearing(device: Device, currentA: number): Omit<ClearingTimeResult, 'trace'>;
}

type Settings = ElectronicSettings | ThermalMagneticSettings | RelaySettings;

export function createBandReader(maxReadings = 256): BandReader {
  return new MemoizedBandReader(maxReadings);
}

/** A class rather than closures: a study creates one per bus (cheaper to build). */
class MemoizedBandReader implements BandReader {
  private readonly settings = new Map<Device, Settings>();
  private readonly readings = new Map<Device, Map<number, BandReading>>();
  private count = 0;

  constructor(private readonly maxReadings: number) {}

  private bandOf(device: Device, currentA: number): BandReading {
    const { settings } = this;
    switch (device.kind) {
      case 'electronic': {
        let s = settings.get(device) as ElectronicSettings | undefined;
        if (!s) settings.set(device, (s = electronicSettings(device)));
        return electronicBand(device, currentA, s);
      }
      case 'thermal-magnetic': {
        let s = settings.get(device) as ThermalMagneticSettings | undefined;
        if (!s) settings.set(device, (s = thermalMagneticSettings(device)));
        return thermalMagneticBand(device, currentA, s);
      }
      case 'relay': {
        let s = settings.get(device) as RelaySettings | undefined;
        if (!s) settings.set(device, (s = relaySettings(device)));
        return relayBand(device, currentA, s);
      }
      default:
        return readBand(device, currentA);
    }
  }

  read(device: Device, currentA: number): BandReading {
    let byCurrent = this.readings.get(device);
    const hit = byCurrent?.get(currentA);
    if (hit) return hit;
    const band = this.bandOf(device, currentA);
    if (this.count >= this.maxReadings) {
      this.readings.clear();
      this.count = 0;
      byCurrent = undefined;
    }
    if (!byCurrent) this.readings.set(device, (byCurrent = new Map()));
    byCurrent.set(currentA, band);
    this.count += 1;
    return band;
  }

  clearing(device: Device, currentA: number): Omit<ClearingTimeResult, 'trace'> {
    checkClearingInput(device, currentA);
    return clearingFromBand(this.read(device, currentA), currentA);
  }
}
