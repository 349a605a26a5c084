import table from '../data/nec-ch9-table9.json';
import { EngineError } from '../errors';
import { normalizeConductorSize } from '../../../shared/schemas/model';

/**
 * NEC (NFPA 70) Chapter 9 Table 9: AC resistance and reactance of 600 V cables, three single conductors in
 * conduit, 60 Hz, 75 °C, in ohms to neutral per 1000 ft of one conductor. Data and source note:
 * server/engine/data/nec-ch9-table9.json.
 */
export type ConductorMaterial = 'Cu' | 'Al';
export type ConduitKind = 'steel' | 'pvc' | 'aluminum';

export interface Table9Impedance {
  /** Resistance, ohm per 1000 ft of one conductor. */
  rOhmPer1000Ft: number;
  /** Reactance XL at 60 Hz, ohm per 1000 ft of one conductor. */
  xOhmPer1000Ft: number;
}

interface Table9Row {
  size: string;
  xOhmPer1000Ft: Record<ConduitKind, number | null>;
  rCopperOhmPer1000Ft: Record<ConduitKind, number | null>;
  rAluminumOhmPer1000Ft: Record<ConduitKind, number | null>;
}

const rows = new Map<string, Table9Row>((table.rows as Table9Row[]).map((row) => [row.size, row]));

/** Frequency of the table's reactances, Hz. */
export const TABLE9_FREQUENCY_HZ = 60;

/**
 * R and X per 1000 ft of one conductor from NEC Chapter 9 Table 9 (size, material, conduit).
 * Throws EngineError ('invalid-input') naming `field` when the size is unknown or the table has no value.
 */
export function necTable9ImpedanceOhmPer1000Ft(
  size: string,
  material: ConductorMaterial,
  conduit: ConduitKind,
  field = 'size',
): Table9Impedance {
  const canonical = normalizeConductorSize(size);
  const row = canonical === null ? undefined : rows.get(canonical);
  if (!row) {
    throw new EngineError(
      'invalid-input',
      'unknown-conductor-size',
      `conductor size "${size}" is not in NEC Chapter 9 Table 9`,
      field,
    );
  }
  const r = (material === 'Cu' ? row.rCopperOhmPer1000Ft : row.rAluminumOhmPer1000Ft)[conduit];
  const x = row.xOhmPer1000Ft[conduit];
  if (r === null || x === null || r === undefined || x === undefined) {
    throw new EngineError(
      'invalid-input',
      'missing-table-value',
      `NEC Chapter 9 Table 9 has no value for ${size} ${material} in ${conduit} conduit`,
      field,
    );
  }
  return { rOhmPer1000Ft: r, xOhmPer1000Ft: x };
}
