import {
  ELECTRONIC_SETTING_NAMES,
  type ElectronicDevice,
  type ElectronicPositions,
  type ElectronicSettingName,
  type ElectronicTripType,
} from '../../../shared/schemas/device';
import { EngineError } from '../errors';

/**
 * Turns an electronic trip unit type (its switches: named positions mapped to numbers) and the chosen
 * position of each switch into a plain electronic device.
 * - Every switch the type has must be given a position, and only those; an unknown position is an
 *   EngineError 'invalid-input' naming the switch (`positions.<switch>`) and listing the valid positions.
 * - A value of 0 on shortTimePickup, instantaneousPickup or groundFaultPickup means OFF.
 * - shortTimeI2t: 1 = I²t in, 0 = out.
 * - The rating plug, if the type has one, sets In (sensorA of the device); otherwise the type's sensorA.
 */
export function resolveElectronicSettings(type: ElectronicTripType, chosen: ElectronicPositions): ElectronicDevice {
  const settings = type.settings as Partial<Record<ElectronicSettingName, { positions: Record<string, number> }>>;
  for (const name of Object.keys(chosen)) {
    if (!(ELECTRONIC_SETTING_NAMES as readonly string[]).includes(name) || !settings[name as ElectronicSettingName]) {
      throw new EngineError(
        'invalid-input',
        'UNKNOWN_SETTING',
        `The trip unit type "${type.name}" has no ${name} switch`,
        `positions.${name}`,
      );
    }
  }
  const value = (name: ElectronicSettingName): number | undefined => {
    const setting = settings[name];
    if (!setting) return undefined;
    const position = chosen[name];
    const field = `positions.${name}`;
    if (position === undefined) {
      throw new EngineError('invalid-input', 'POSITION_MISSING', `Choose a position for ${name}`, field);
    }
    if (!Object.prototype.hasOwnProperty.call(setting.positions, position)) {
      throw new EngineError(
        'invalid-input',
        'UNKNOWN_POSITION',
        `${name} has no position "${position}"; its positions are ${Object.keys(setting.positions).join(', ')}`,
        field,
      );
    }
    return setting.positions[position];
  };
  const positive = (name: ElectronicSettingName, v: number | undefined): number => {
    if (v === undefined || !(v > 0)) {
      throw new EngineError(
        'invalid-input',
        'POSITION_NOT_POSITIVE',
        `${name} must be a positive value, got ${String(v)}`,
        `positions.${name}`,
      );
    }
    return v;
  };

  const plugA = value('ratingPlug');
  const sensorA = plugA !== undefined ? positive('ratingPlug', plugA) : type.sensorA;
  const device: ElectronicDevice = {
    kind: 'electronic',
    name: type.name,
    sensorA,
    longTime: {
      pickup: positive('longTimePickup', value('longTimePickup')),
      delayS: positive('longTimeDelay', value('longTimeDelay')),
      ...(type.longTimeDelayMultiple !== undefined ? { delayMultiple: type.longTimeDelayMultiple } : {}),
    },
    pickupTolerancePct: type.pickupTolerancePct,
    clearingS: type.clearingS,
    ...(type.timeTolerancePct !== undefined ? { timeTolerancePct: type.timeTolerancePct } : {}),
    ...(type.instantaneousMinimumS !== undefined ? { instantaneousMinimumS: type.instantaneousMinimumS } : {}),
  };

  const stPickup = value('shortTimePickup');
  if (stPickup !== undefined && stPickup > 0) {
    const stDelay = value('shortTimeDelay');
    if (stDelay === undefined) {
      throw new EngineError(
        'invalid-input',
        'SETTING_MISSING',
        `The type "${type.name}" has a short-time pickup but no shortTimeDelay switch`,
        'settings.shortTimeDelay',
      );
    }
    const i2t = value('shortTimeI2t');
    if (i2t !== undefined && i2t !== 0 && i2t !== 1) {
      throw new EngineError(
        'invalid-input',
        'POSITION_NOT_SWITCH',
        'shortTimeI2t positions must map to 1 (in) or 0 (out)',
        'positions.shortTimeI2t',
      );
    }
    device.shortTime = {
      pickup: stPickup,
      delayS: positive('shortTimeDelay', stDelay),
      i2t: i2t === 1,
      ...(type.shortTimeI2tMultiple !== undefined ? { i2tMultiple: type.shortTimeI2tMultiple } : {}),
    };
  } else {
    // Read the dependent switches anyway so that an unknown position is still reported.
    value('shortTimeDelay');
    value('shortTimeI2t');
  }

  const instPickup = value('instantaneousPickup');
  if (instPickup !== undefined && instPickup > 0) device.instantaneous = { pickup: instPickup };

  const gfPickup = value('groundFaultPickup');
  const gfDelay = value('groundFaultDelay');
  if (gfPickup !== undefined && gfPickup > 0) {
    if (gfDelay === undefined) {
      throw new EngineError(
        'invalid-input',
        'SETTING_MISSING',
        `The type "${type.name}" has a ground-fault pickup but no groundFaultDelay switch`,
        'settings.groundFaultDelay',
      );
    }
    device.groundFault = { pickupA: gfPickup, delayS: gfDelay };
  }
  return device;
}
