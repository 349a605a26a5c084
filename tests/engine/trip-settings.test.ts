import { expectClose } from '../helpers/approx';
import { EngineError } from '../../server/engine/errors';
import { resolveElectronicSettings } from '../../server/engine/trip/resolveElectronicSettings';
import { clearingTime } from '../../server/engine/trip/clearingTime';
import { EXAMPLE_DEVICES, EXAMPLE_ELECTRONIC_TYPE } from '../../server/engine/trip/exampleDevices';
import {
  clearingTimeRequestSchema,
  clearingTimeResponseSchema,
  deviceSchema,
  electronicTripTypeSchema,
} from '../../shared/schemas/device';

// Settings as named switch positions mapped to numbers (docs/MODEL-FORMAT.md, Devices; docs/ARCHITECTURE.md, Clearing
// time from a trip band). The example type is invented.

describe('worked example: resolving switch positions into an electronic device', () => {
  it('turns the chosen positions into numbers, rating plug as In', () => {
    const device = resolveElectronicSettings(EXAMPLE_ELECTRONIC_TYPE, {
      ratingPlug: '1200',
      longTimePickup: '0.8',
      longTimeDelay: '10',
      shortTimePickup: '4',
      shortTimeDelay: '0.3',
      shortTimeI2t: 'IN',
      instantaneousPickup: '12',
      groundFaultPickup: 'OFF',
      groundFaultDelay: '0.1',
    });
    expect(device).toMatchObject({
      kind: 'electronic',
      sensorA: 1200,
      longTime: { pickup: 0.8, delayS: 10, delayMultiple: 6 },
      shortTime: { pickup: 4, delayS: 0.3, i2t: true, i2tMultiple: 10 },
      instantaneous: { pickup: 12 },
      pickupTolerancePct: 10,
      clearingS: 0.05,
    });
    expect(device.groundFault).toBeUndefined(); // OFF
    expect(deviceSchema.safeParse(device).success).toBe(true);
    // Ir = 0.8 × 1200 = 960 A; 6 × Ir = 5760 A is above the short-time pickup (4 × Ir = 3840 A, high edge 4224 A),
    // so the short-time I²t ramp governs: 0.3 s · (10 / 6)² × 1.1 (time band) + 0.05 s (clearing)
    const r = clearingTime(device, 6 * 960);
    expect(r.region).toBe('short-time');
    expectClose(r.clearingTimeS as number, 0.3 * Math.pow(10 / 6, 2) * 1.1 + 0.05, 1e-12);
  });

  it('OFF positions drop the short-time and instantaneous elements', () => {
    const device = resolveElectronicSettings(EXAMPLE_ELECTRONIC_TYPE, {
      ratingPlug: '800',
      longTimePickup: '1.0',
      longTimeDelay: '4',
      shortTimePickup: 'OFF',
      shortTimeDelay: '0.1',
      shortTimeI2t: 'OUT',
      instantaneousPickup: 'OFF',
      groundFaultPickup: '320',
      groundFaultDelay: '0.2',
    });
    expect(device.shortTime).toBeUndefined();
    expect(device.instantaneous).toBeUndefined();
    expect(device.groundFault).toEqual({ pickupA: 320, delayS: 0.2 });
  });
});

describe('resolveElectronicSettings errors', () => {
  const valid = {
    ratingPlug: '800',
    longTimePickup: '1.0',
    longTimeDelay: '4',
    shortTimePickup: '2',
    shortTimeDelay: '0.1',
    shortTimeI2t: 'OUT',
    instantaneousPickup: '6',
    groundFaultPickup: 'OFF',
    groundFaultDelay: '0.1',
  } as const;

  function errorOf(fn: () => unknown): EngineError {
    try {
      fn();
    } catch (e) {
      return e as EngineError;
    }
    throw new Error('expected an error');
  }

  it('an unknown position is named, with the valid positions listed', () => {
    const e = errorOf(() => resolveElectronicSettings(EXAMPLE_ELECTRONIC_TYPE, { ...valid, longTimePickup: '0.45' }));
    expect(e).toBeInstanceOf(EngineError);
    expect(e.kind).toBe('invalid-input');
    expect(e.code).toBe('UNKNOWN_POSITION');
    expect(e.field).toBe('positions.longTimePickup');
    expect(e.message).toContain('"0.45"');
    expect(e.message).toContain('0.5, 0.6');
  });

  it('a switch the type does not have, or a missing choice, is an error', () => {
    const noGf = {
      ...EXAMPLE_ELECTRONIC_TYPE,
      settings: { ...EXAMPLE_ELECTRONIC_TYPE.settings, groundFaultPickup: undefined, groundFaultDelay: undefined },
    };
    expect(errorOf(() => resolveElectronicSettings(noGf, valid)).field).toBe('positions.groundFaultPickup');
    const { longTimeDelay: _omit, ...missing } = valid;
    expect(errorOf(() => resolveElectronicSettings(EXAMPLE_ELECTRONIC_TYPE, missing)).field).toBe(
      'positions.longTimeDelay',
    );
  });

  it('an unknown position of a switch that is OFF in effect is still reported', () => {
    const e = errorOf(() =>
      resolveElectronicSettings(EXAMPLE_ELECTRONIC_TYPE, { ...valid, shortTimePickup: 'OFF', shortTimeDelay: '9' }),
    );
    expect(e.field).toBe('positions.shortTimeDelay');
  });
});

describe('schemas', () => {
  it('every example device and the example type pass the zod schemas', () => {
    for (const d of EXAMPLE_DEVICES) expect(deviceSchema.safeParse(d).success).toBe(true);
    expect(electronicTripTypeSchema.safeParse(EXAMPLE_ELECTRONIC_TYPE).success).toBe(true);
  });

  it('the request rejects an unsorted band and a relay without pickup, naming the path', () => {
    const bad = clearingTimeRequestSchema.safeParse({
      device: {
        kind: 'band',
        ratingA: 100,
        currentUnit: 'multiple',
        min: [[1, 10]],
        max: [
          [2, 10],
          [1, 5],
        ],
      },
      currentA: 500,
    });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0].path).toEqual(['device', 'max', 1, 0]);
    const noPickup = deviceSchema.safeParse({ kind: 'relay', curve: 'IEEE-VI', timeDial: 1, breakerCycles: 5 });
    expect(noPickup.success).toBe(false);
  });

  it('a clearing-time result (with null for no trip) matches the response schema', () => {
    for (const d of EXAMPLE_DEVICES) {
      for (const a of [1, 500, 5000, 50000]) {
        const r = clearingTime(d, a);
        expect(clearingTimeResponseSchema.safeParse(JSON.parse(JSON.stringify(r))).success).toBe(true);
      }
    }
  });
});
