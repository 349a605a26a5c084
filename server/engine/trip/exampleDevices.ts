import type {
  BandDevice,
  Device,
  ElectronicDevice,
  ElectronicTripType,
  FuseDevice,
  RelayDevice,
  ThermalMagneticDevice,
} from '../../../shared/schemas/device';

/**
 * Generic example devices for the device library, tests and the benchmark. The point lists are invented
 * for illustration (shaped like typical published bands); they are not any maker's data.
 */

/** Thermal band of a generic molded-case breaker, multiples of rating (invented; built to meet UL 489 at ≤ 30 A). */
export const GENERIC_THERMAL_BAND = {
  min: [
    [1.05, 3600],
    [1.35, 300],
    [2, 30],
    [3, 10],
    [5, 3],
    [10, 0.8],
    [20, 0.3],
  ] as [number, number][],
  max: [
    [1.2, 3400],
    [1.35, 1500],
    [2, 100],
    [3, 40],
    [5, 12],
    [10, 4],
    [20, 1.5],
  ] as [number, number][],
};

export const EXAMPLE_THERMAL_MAGNETIC: ThermalMagneticDevice = {
  kind: 'thermal-magnetic',
  name: 'Generic 20 A molded-case breaker',
  ratingA: 20,
  thermal: GENERIC_THERMAL_BAND,
  instantaneous: { pickupMultiple: 10, tolerancePct: 20 },
  instantaneousClearingCycles: 1.5,
};

export const EXAMPLE_RELAY_IEEE: RelayDevice = {
  kind: 'relay',
  name: 'Feeder relay, very inverse',
  curve: 'IEEE-VI',
  ctRatio: 600 / 5,
  pickupSecondaryA: 5,
  timeDial: 2,
  instantaneousA: 6000,
  breakerCycles: 5,
  frequencyHz: 60,
};

export const EXAMPLE_RELAY_IEC: RelayDevice = {
  kind: 'relay',
  name: 'Incomer relay, standard inverse',
  curve: 'IEC-SI',
  pickupA: 800,
  timeDial: 0.2,
  definiteTime: { pickupA: 4000, delayS: 0.3 },
  breakerCycles: 3,
  frequencyHz: 50,
};

/** Generic 200 A current-limiting fuse (invented points), total clearing drawn down to 0.01 s. */
export const EXAMPLE_FUSE: FuseDevice = {
  kind: 'fuse',
  name: 'Generic 200 A fuse',
  ratingA: 200,
  minimumMelt: [
    [300, 600],
    [400, 100],
    [600, 20],
    [1000, 3],
    [2000, 0.2],
    [4000, 0.02],
    [6000, 0.005],
  ],
  totalClearing: [
    [350, 1000],
    [450, 200],
    [700, 30],
    [1200, 4],
    [2500, 0.3],
    [5000, 0.03],
    [8000, 0.01],
  ],
};

/** The same kind of fuse where only an average-melt curve is published (invented points). */
export const EXAMPLE_FUSE_MELT_ONLY: FuseDevice = {
  kind: 'fuse',
  name: 'Generic 100 A fuse, average melt only',
  ratingA: 100,
  averageMelt: [
    [150, 800],
    [200, 150],
    [300, 25],
    [500, 3],
    [1000, 0.25],
    [2000, 0.025],
    [3000, 0.008],
  ],
};

export const EXAMPLE_BAND: BandDevice = {
  kind: 'band',
  name: 'Digitized band, multiples of rating',
  ratingA: 400,
  currentUnit: 'multiple',
  min: [
    [1.1, 2000],
    [2, 60],
    [6, 5],
    [10, 0.02],
    [50, 0.01],
  ],
  max: [
    [1.25, 5000],
    [2, 200],
    [6, 15],
    [12, 0.05],
    [50, 0.05],
  ],
};

/** Electronic trip unit, settings resolved: In 800 A, Ir 1.0 × In, LTD 10 s at 6 × Ir, ST 4 × Ir 0.3 s I²t in, INST 12 × In. */
export const EXAMPLE_ELECTRONIC: ElectronicDevice = {
  kind: 'electronic',
  name: 'Electronic trip unit, 800 A sensor',
  sensorA: 800,
  longTime: { pickup: 1.0, delayS: 10, delayMultiple: 6 },
  shortTime: { pickup: 4, delayS: 0.3, i2t: true, i2tMultiple: 10 },
  instantaneous: { pickup: 12 },
  groundFault: { pickupA: 400, delayS: 0.2 },
  pickupTolerancePct: 10,
  timeTolerancePct: 10,
  clearingS: 0.05,
};

/** A generic electronic trip unit type: switches with named positions mapped to numbers (invented). */
export const EXAMPLE_ELECTRONIC_TYPE: ElectronicTripType = {
  name: 'Generic LSIG trip unit',
  sensorA: 1600,
  settings: {
    ratingPlug: { positions: { '800': 800, '1000': 1000, '1200': 1200, '1600': 1600 } },
    longTimePickup: {
      positions: { '0.5': 0.5, '0.6': 0.6, '0.7': 0.7, '0.8': 0.8, '0.9': 0.9, '0.95': 0.95, '1.0': 1.0 },
    },
    longTimeDelay: { positions: { '2': 2, '4': 4, '7': 7, '10': 10, '12': 12, '15': 15, '20': 20, '24': 24 } },
    shortTimePickup: { positions: { OFF: 0, '1.5': 1.5, '2': 2, '3': 3, '4': 4, '5': 5, '6': 6, '8': 8, '10': 10 } },
    shortTimeDelay: { positions: { '0.1': 0.1, '0.2': 0.2, '0.3': 0.3, '0.4': 0.4, '0.5': 0.5 } },
    shortTimeI2t: { positions: { OUT: 0, IN: 1 } },
    instantaneousPickup: { positions: { OFF: 0, '2': 2, '4': 4, '6': 6, '8': 8, '10': 10, '12': 12, '15': 15 } },
    groundFaultPickup: { positions: { OFF: 0, '320': 320, '640': 640, '960': 960 } },
    groundFaultDelay: { positions: { '0.1': 0.1, '0.2': 0.2, '0.3': 0.3, '0.5': 0.5 } },
  },
  longTimeDelayMultiple: 6,
  shortTimeI2tMultiple: 10,
  pickupTolerancePct: 10,
  timeTolerancePct: 10,
  clearingS: 0.05,
};

export const EXAMPLE_DEVICES: Device[] = [
  EXAMPLE_RELAY_IEEE,
  EXAMPLE_RELAY_IEC,
  EXAMPLE_FUSE,
  EXAMPLE_FUSE_MELT_ONLY,
  EXAMPLE_BAND,
  EXAMPLE_THERMAL_MAGNETIC,
  EXAMPLE_ELECTRONIC,
];
