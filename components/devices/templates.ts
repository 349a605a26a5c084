import type { DeviceDefinition } from '../../shared/schemas/deviceLibrary';
import type { DeviceKind } from '../../shared/schemas/device';

/** A sensible starting point for a new device type of each kind (the engineer edits every value). */
export function newDefinition(kind: DeviceKind): DeviceDefinition {
  switch (kind) {
    case 'thermal-magnetic':
      return {
        kind,
        ratingA: 100,
        thermal: {
          min: [
            [1.35, 600],
            [2, 60],
            [5, 8],
            [10, 2],
          ],
          max: [
            [1.35, 3600],
            [2, 360],
            [5, 40],
            [10, 8],
          ],
        },
        instantaneous: { pickupMultiple: 10, tolerancePct: 20 },
        instantaneousClearingCycles: 1.5,
      };
    case 'electronic':
      return {
        kind,
        tripType: {
          name: 'Trip unit',
          sensorA: 800,
          settings: {
            longTimePickup: { positions: { '0.5': 0.5, '0.6': 0.6, '0.7': 0.7, '0.8': 0.8, '0.9': 0.9, '1.0': 1.0 } },
            longTimeDelay: { positions: { '4': 4, '10': 10, '20': 20 } },
            shortTimePickup: { positions: { OFF: 0, '2': 2, '4': 4, '6': 6, '8': 8, '10': 10 } },
            shortTimeDelay: { positions: { '0.1': 0.1, '0.2': 0.2, '0.3': 0.3, '0.4': 0.4 } },
            shortTimeI2t: { positions: { OUT: 0, IN: 1 } },
            instantaneousPickup: { positions: { OFF: 0, '4': 4, '8': 8, '12': 12 } },
          },
          longTimeDelayMultiple: 6,
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
        positions: {
          longTimePickup: '1.0',
          longTimeDelay: '10',
          shortTimePickup: '4',
          shortTimeDelay: '0.2',
          shortTimeI2t: 'OUT',
          instantaneousPickup: '12',
        },
      };
    case 'fuse':
      return {
        kind,
        ratingA: 200,
        totalClearing: [
          [400, 300],
          [800, 20],
          [2000, 0.5],
          [4000, 0.02],
        ],
        minimumMelt: [
          [350, 300],
          [700, 15],
          [1800, 0.3],
          [3500, 0.012],
        ],
      };
    case 'relay':
      return {
        kind,
        curve: 'IEEE-VI',
        pickupA: 400,
        timeDial: 2,
        instantaneousA: 6000,
        breakerCycles: 5,
        frequencyHz: 60,
      };
    case 'band':
      return {
        kind,
        ratingA: 100,
        currentUnit: 'multiple',
        min: [
          [1.5, 500],
          [5, 10],
          [10, 1],
        ],
        max: [
          [1.5, 2000],
          [5, 40],
          [10, 4],
        ],
      };
  }
}
