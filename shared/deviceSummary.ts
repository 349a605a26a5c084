/**
 * A protective device's settings in words, the same in the model editor and the study report: the settings that
 * decide its trip band (and so the clearing time on a label), each as typed (up to 6 significant figures).
 */
import { formatSig, MISSING } from './numberFormat';
import type { Device } from './schemas/device';

const num = (v: number | undefined | null) => (v === undefined || v === null ? MISSING : formatSig(v, 6));

/** The settings of a device, one phrase each, in reading order. */
export function deviceSettingParts(device: Device): string[] {
  switch (device.kind) {
    case 'relay': {
      const pickup =
        device.pickupA !== undefined
          ? `${num(device.pickupA)} A`
          : `${num(device.pickupSecondaryA)} A sec. × CT ${num(device.ctRatio)}`;
      const parts = [`${device.curve}`, `pickup ${pickup}`, `time dial ${num(device.timeDial)}`];
      // Relays follow the inverse curve up to a limit (IEC 60255-151 lets the relay declare it); 20× when not set.
      parts.push(`curve to ${num(device.curveLimitMultiple ?? 20)}× pickup`);
      if (device.instantaneousA !== undefined) parts.push(`instantaneous ${num(device.instantaneousA)} A`);
      else if (device.instantaneousSecondaryA !== undefined)
        parts.push(`instantaneous ${num(device.instantaneousSecondaryA)} A sec.`);
      if (device.definiteTime)
        parts.push(
          `definite time ${num(device.definiteTime.pickupA ?? device.definiteTime.pickupSecondaryA)} A / ${num(device.definiteTime.delayS)} s`,
        );
      parts.push(`breaker ${num(device.breakerCycles)} cycles`);
      return parts;
    }
    case 'fuse': {
      const parts = [`${num(device.ratingA)} A`];
      if (device.totalClearing) parts.push(`total-clearing curve, ${device.totalClearing.length} points`);
      else if (device.averageMelt) parts.push(`average-melt curve, ${device.averageMelt.length} points`);
      else parts.push('no clearing curve');
      if (device.minimumMelt) parts.push(`minimum-melt curve, ${device.minimumMelt.length} points`);
      return parts;
    }
    case 'band':
      return [
        `${num(device.ratingA)} A`,
        `currents in ${device.currentUnit === 'multiple' ? 'multiples of rating' : 'amperes'}`,
        `min ${device.min.length} / max ${device.max.length} points`,
      ];
    case 'thermal-magnetic': {
      const parts = [`${num(device.ratingA)} A`, `thermal band ${device.thermal.max.length} points`];
      const i = device.instantaneous;
      if (i?.pickupMultiple !== undefined)
        parts.push(`instantaneous ${num(i.pickupMultiple)}× ±${num(i.tolerancePct)} %`);
      else if (i?.lowMultiple !== undefined) parts.push(`instantaneous ${num(i.lowMultiple)}–${num(i.highMultiple)}×`);
      else parts.push('thermal only');
      if (i?.setting) parts.push(`setting ${i.setting}`);
      if (device.instantaneousClearingS !== undefined) parts.push(`clearing ${num(device.instantaneousClearingS)} s`);
      else if (device.instantaneousClearingCycles !== undefined)
        parts.push(`clearing ${num(device.instantaneousClearingCycles)} cycles`);
      return parts;
    }
    case 'electronic': {
      const parts = [
        `In ${num(device.sensorA)} A`,
        `LT ${num(device.longTime.pickup)}× / ${num(device.longTime.delayS)} s`,
      ];
      if (device.shortTime)
        parts.push(
          `ST ${num(device.shortTime.pickup)}× / ${num(device.shortTime.delayS)} s ${device.shortTime.i2t ? 'I²t in' : 'flat'}`,
        );
      if (device.instantaneous) parts.push(`inst. ${num(device.instantaneous.pickup)}×`);
      if (device.groundFault) parts.push(`GF ${num(device.groundFault.pickupA)} A`);
      parts.push(`tolerance ±${num(device.pickupTolerancePct)} %`, `clearing ${num(device.clearingS)} s`);
      return parts;
    }
  }
}
