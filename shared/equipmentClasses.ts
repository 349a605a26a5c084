/**
 * Equipment classes with typical bus gaps, enclosure sizes and working distances: the defaults an engineer starts
 * from (and may override) in the system model and in the spot check. Plain data, shared by server and client.
 *
 * Source: IEEE Std 1584-2018, Tables 8 and 10 (typical gaps, enclosure sizes and working distances by equipment
 * class) — values from memory, unverified. The default electrode configuration of each class (VCB for equipment in a
 * box, VOA in open air) is common practice, no source: choose the configuration that matches the equipment.
 */

/** The five electrode configurations of IEEE Std 1584-2018. */
export const ELECTRODE_CONFIGS = ['VCB', 'VCBB', 'HCB', 'VOA', 'HOA'] as const;
export type ElectrodeConfig = (typeof ELECTRODE_CONFIGS)[number];

/** Plain-language names of the electrode configurations (IEEE Std 1584-2018 definitions). */
export const ELECTRODE_CONFIG_LABELS: Record<ElectrodeConfig, string> = {
  VCB: 'Vertical conductors in a metal box',
  VCBB: 'Vertical conductors terminated in an insulating barrier, in a metal box',
  HCB: 'Horizontal conductors in a metal box',
  VOA: 'Vertical conductors in open air',
  HOA: 'Horizontal conductors in open air',
};

export type VoltageClass = 'low-voltage' | '5kv' | '15kv' | 'any';

export interface EnclosureSizeMm {
  height: number;
  width: number;
  depth: number;
}

export interface EquipmentClass {
  id: string;
  label: string;
  voltageClass: VoltageClass;
  /** Nominal voltages (phase to phase, V) the class is meant for. */
  nominalVoltageRangeV: { min: number; max: number };
  electrodeConfig: ElectrodeConfig;
  /** Typical bus gap, mm; null where no typical value is given (enter the measured gap). */
  gapMm: number | null;
  /** Typical enclosure, mm; null in open air (no enclosure, CF = 1). */
  enclosureMm: EnclosureSizeMm | null;
  /** Typical working distance, mm; null where no typical value is given. */
  workingDistanceMm: number | null;
  /** Where the values come from and how sure they are. */
  note: string;
}

const TABLE_NOTE = 'IEEE 1584-2018 Tables 8 and 10, from memory, unverified';
/** Depth chosen for the "deep" classes, whose table entry only says "more than 8 in (203.2 mm)" (our default). */
const DEEP_DEPTH_MM = 254;
/** Depth chosen for the "shallow" classes, whose table entry says "8 in (203.2 mm) or less". */
const SHALLOW_DEPTH_MM = 203.2;

export const EQUIPMENT_CLASSES: readonly EquipmentClass[] = [
  {
    id: 'switchgear-15kv',
    label: '15 kV switchgear',
    voltageClass: '15kv',
    nominalVoltageRangeV: { min: 5001, max: 15000 },
    electrodeConfig: 'VCB',
    gapMm: 152,
    enclosureMm: { height: 1143, width: 762, depth: 762 },
    workingDistanceMm: 914.4,
    note: `${TABLE_NOTE}: 45 × 30 × 30 in, 36 in working distance.`,
  },
  {
    id: 'mcc-15kv',
    label: '15 kV motor control centre',
    voltageClass: '15kv',
    nominalVoltageRangeV: { min: 5001, max: 15000 },
    electrodeConfig: 'VCB',
    gapMm: 152,
    enclosureMm: { height: 914.4, width: 914.4, depth: 914.4 },
    workingDistanceMm: 914.4,
    note: `${TABLE_NOTE}: 36 × 36 × 36 in, 36 in working distance.`,
  },
  {
    id: 'switchgear-5kv',
    label: '5 kV switchgear',
    voltageClass: '5kv',
    nominalVoltageRangeV: { min: 601, max: 5000 },
    electrodeConfig: 'VCB',
    gapMm: 104,
    enclosureMm: { height: 914.4, width: 914.4, depth: 914.4 },
    workingDistanceMm: 914.4,
    note: `${TABLE_NOTE}: 36 × 36 × 36 in, 36 in working distance.`,
  },
  {
    id: 'switchgear-5kv-large',
    label: '5 kV switchgear (45 × 30 in enclosure)',
    voltageClass: '5kv',
    nominalVoltageRangeV: { min: 601, max: 5000 },
    electrodeConfig: 'VCB',
    gapMm: 104,
    enclosureMm: { height: 1143, width: 762, depth: 762 },
    workingDistanceMm: 914.4,
    note: `${TABLE_NOTE}: alternative size 45 × 30 × 30 in, 36 in working distance.`,
  },
  {
    id: 'mcc-5kv',
    label: '5 kV motor control centre',
    voltageClass: '5kv',
    nominalVoltageRangeV: { min: 601, max: 5000 },
    electrodeConfig: 'VCB',
    gapMm: 104,
    enclosureMm: { height: 660.4, width: 660.4, depth: 660.4 },
    workingDistanceMm: 914.4,
    note: `${TABLE_NOTE}: 26 × 26 × 26 in, 36 in working distance.`,
  },
  {
    id: 'switchgear-lv',
    label: 'Low-voltage switchgear',
    voltageClass: 'low-voltage',
    nominalVoltageRangeV: { min: 208, max: 600 },
    electrodeConfig: 'VCB',
    gapMm: 32,
    enclosureMm: { height: 508, width: 508, depth: 508 },
    workingDistanceMm: 609.6,
    note: `${TABLE_NOTE}: 20 × 20 × 20 in, 24 in working distance.`,
  },
  {
    id: 'mcc-panelboard-lv-shallow',
    label: 'Low-voltage MCC or panelboard (shallow)',
    voltageClass: 'low-voltage',
    nominalVoltageRangeV: { min: 208, max: 600 },
    electrodeConfig: 'VCB',
    gapMm: 25,
    enclosureMm: { height: 355.6, width: 304.8, depth: SHALLOW_DEPTH_MM },
    workingDistanceMm: 457.2,
    note: `${TABLE_NOTE}: 14 × 12 × ≤ 8 in, 18 in working distance; depth set to the 8 in limit.`,
  },
  {
    id: 'mcc-panelboard-lv-deep',
    label: 'Low-voltage MCC or panelboard (deep)',
    voltageClass: 'low-voltage',
    nominalVoltageRangeV: { min: 208, max: 600 },
    electrodeConfig: 'VCB',
    gapMm: 25,
    enclosureMm: { height: 355.6, width: 304.8, depth: DEEP_DEPTH_MM },
    workingDistanceMm: 457.2,
    note: `${TABLE_NOTE}: 14 × 12 × > 8 in, 18 in working distance; depth 10 in is our default.`,
  },
  {
    id: 'junction-box-lv-shallow',
    label: 'Cable junction box (shallow)',
    voltageClass: 'low-voltage',
    nominalVoltageRangeV: { min: 208, max: 600 },
    electrodeConfig: 'VCB',
    gapMm: 13,
    enclosureMm: { height: 355.6, width: 304.8, depth: SHALLOW_DEPTH_MM },
    workingDistanceMm: 457.2,
    note: `${TABLE_NOTE}: 14 × 12 × ≤ 8 in, 18 in working distance; depth set to the 8 in limit.`,
  },
  {
    id: 'junction-box-lv-deep',
    label: 'Cable junction box (deep)',
    voltageClass: 'low-voltage',
    nominalVoltageRangeV: { min: 208, max: 600 },
    electrodeConfig: 'VCB',
    gapMm: 13,
    enclosureMm: { height: 355.6, width: 304.8, depth: DEEP_DEPTH_MM },
    workingDistanceMm: 457.2,
    note: `${TABLE_NOTE}: 14 × 12 × > 8 in, 18 in working distance; depth 10 in is our default.`,
  },
  {
    id: 'open-air',
    label: 'Open air',
    voltageClass: 'any',
    nominalVoltageRangeV: { min: 208, max: 15000 },
    electrodeConfig: 'VOA',
    gapMm: null,
    enclosureMm: null,
    workingDistanceMm: null,
    note: 'No enclosure (CF = 1). No typical gap or working distance is given here: enter the measured values.',
  },
];

/** The equipment class with this id, or undefined. */
export function findEquipmentClass(id: string): EquipmentClass | undefined {
  return EQUIPMENT_CLASSES.find((c) => c.id === id);
}
