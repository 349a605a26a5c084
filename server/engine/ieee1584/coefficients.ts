/**
 * Typed access to the IEEE Std 1584-2018 coefficient tables copied into `server/engine/data/ieee1584-2018.json`
 * (its `_provenance` says which rows are confirmed by a published source and which are from memory).
 */
import data from '../data/ieee1584-2018.json';
import type { ElectrodeConfig } from '../../../shared/equipmentClasses';

/** The three test voltages of the model, V: the intermediate values of Eqs. (1), (3)-(5), (7)-(9) are taken here. */
export const MODEL_LEVELS_V = [600, 2700, 14300] as const;
export type ModelLevelV = (typeof MODEL_LEVELS_V)[number];

/** Enclosure-using configurations (Table 6 / Table 7); VOA and HOA have CF = 1. */
export type BoxConfig = 'VCB' | 'VCBB' | 'HCB';
export type EnclosureType = 'typical' | 'shallow';

/** k1..k10 of Table 1 (Eq. 1). */
export type Table1Row = readonly [number, number, number, number, number, number, number, number, number, number];
/** k1..k7 of Table 2 (Eq. 2). */
export type Table2Row = readonly [number, number, number, number, number, number, number];
/** k1..k13 of Tables 3, 4, 5 (Eqs. 3-10). */
export type EnergyRow = readonly [
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
];
/** b1..b3 of Table 7 (Eqs. 14, 15). */
export type Table7Row = readonly [number, number, number];

function checked<T extends readonly number[]>(row: readonly number[], length: number, what: string): T {
  if (row.length !== length || !row.every(Number.isFinite)) {
    throw new Error(`IEEE 1584-2018 coefficient table is malformed: ${what}`);
  }
  return row as unknown as T;
}

/** Table 1 row for Eq. (1): k1..k10 for the configuration at 600, 2700 or 14300 V. */
export function table1Row(config: ElectrodeConfig, levelV: ModelLevelV): Table1Row {
  return checked<Table1Row>(
    data.table1ArcingCurrent.rows[config][String(levelV) as '600' | '2700' | '14300'],
    10,
    `Table 1 ${config}/${levelV}`,
  );
}

/** Table 2 row for Eq. (2): k1..k7 of the arcing-current variation factor. */
export function table2Row(config: ElectrodeConfig): Table2Row {
  return checked<Table2Row>(data.table2VariationFactor.rows[config], 7, `Table 2 ${config}`);
}

/** Table 3 (600 V), 4 (2700 V) or 5 (14300 V) row for Eqs. (3)-(10): k1..k13. */
export function energyRow(config: ElectrodeConfig, levelV: ModelLevelV): EnergyRow {
  const tables = data.incidentEnergyTables;
  const table = levelV === 600 ? tables.table3_600V : levelV === 2700 ? tables.table4_2700V : tables.table5_14300V;
  return checked<EnergyRow>(table[config], 13, `Table ${levelV === 600 ? 3 : levelV === 2700 ? 4 : 5} ${config}`);
}

/** Table 7 row for Eq. (14) (typical) or Eq. (15) (shallow): b1..b3. */
export function table7Row(config: BoxConfig, type: EnclosureType): Table7Row {
  return checked<Table7Row>(data.table7EnclosureCorrection[type][config], 3, `Table 7 ${type} ${config}`);
}

/** Constants A and B of Eqs. (11) and (12) (Table 6). */
export function enclosureConstantsAB(config: BoxConfig): { a: number; b: number } {
  const t = data.table6EquivalentEnclosure;
  return { a: t.A[config], b: t.B[config] };
}

export const TABLE6 = {
  inchFactor: data.table6EquivalentEnclosure.inchFactor,
  referenceSizeIn: data.table6EquivalentEnclosure.referenceSizeIn,
  vcbHeightAboveLimitIn: data.table6EquivalentEnclosure.vcbHeightAboveLimitIn,
  lowerMm: data.table6EquivalentEnclosure.limitsMm.lower,
  midMm: data.table6EquivalentEnclosure.limitsMm.mid,
  upperMm: data.table6EquivalentEnclosure.limitsMm.upper,
  shallowDepthMaxMm: data.table6EquivalentEnclosure.limitsMm.shallow_depth_max,
} as const;

export const RANGE_OF_MODEL = data.rangeOfModel;

export const CONSTANTS = {
  calToJ: data.constants.calToJ,
  /** 12.552/50 of Eqs. (3)-(6). */
  energyScale: 12.552 / 50,
  arcFlashBoundaryJPerCm2: data.constants.arcFlashBoundaryJPerCm2,
  /** The 20 of lg(20/T) in Eqs. (7)-(10). */
  afbLogConstant: data.constants.afbLogConstant,
} as const;

/** Status of the coefficient rows (confirmed by a published source, or from memory), for traces and docs. */
export const COEFFICIENT_PROVENANCE = data._provenance;
export const TABLE1_STATUS = data.table1ArcingCurrent.status;
