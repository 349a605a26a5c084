import { findEquipmentClass, type ElectrodeConfig, type EnclosureSizeMm } from '../../../shared/equipmentClasses';
import type { Bus } from '../../../shared/schemas/model';
import { EngineError } from '../errors';

export interface ResolvedEquipment {
  class: string;
  electrodeConfig: ElectrodeConfig;
  gapMm: number;
  workingDistanceMm: number;
  enclosureMm: EnclosureSizeMm | null;
  /**
   * Whether the main device is isolated from the bus (an arc on its line side cannot occur in the same compartment).
   * Omitted on the bus: false, the conservative choice (the line side of the main is evaluated).
   */
  mainIsolated: boolean;
  /** Fields taken from the class's typical values (IEEE 1584-2018 typical gaps, enclosures, working distances). */
  typicalValuesUsed: string[];
}

/**
 * A bus's equipment with every value filled: what the engineer entered, else the typical value of its class.
 * A class without a typical value for a field (open air: gap, working distance) needs the engineer's value.
 */
export function resolveEquipment(bus: Bus): ResolvedEquipment {
  const eq = bus.equipment;
  if (!eq) throw new EngineError('invalid-input', 'NO_EQUIPMENT', `Bus ${bus.id} has no equipment`, 'equipment');
  const cls = findEquipmentClass(eq.class);
  if (!cls)
    throw new EngineError('invalid-input', 'UNKNOWN_CLASS', `Unknown equipment class ${eq.class}`, 'equipment.class');
  const typical: string[] = [];
  const pick = <T>(own: T | undefined, fallback: T | null, field: string): T => {
    if (own !== undefined) return own;
    if (fallback === null || fallback === undefined) {
      throw new EngineError(
        'invalid-input',
        'MISSING_EQUIPMENT_VALUE',
        `Bus ${bus.id}: the class "${cls.label}" has no typical ${field}; enter it`,
        `equipment.${field}`,
      );
    }
    typical.push(field);
    return fallback;
  };
  const electrodeConfig = pick(eq.electrodeConfig, cls.electrodeConfig, 'electrodeConfig');
  const openAir = electrodeConfig === 'VOA' || electrodeConfig === 'HOA';
  return {
    class: cls.id,
    electrodeConfig,
    gapMm: pick(eq.gapMm, cls.gapMm, 'gapMm'),
    workingDistanceMm: pick(eq.workingDistanceMm, cls.workingDistanceMm, 'workingDistanceMm'),
    enclosureMm: openAir
      ? null
      : (eq.enclosureMm ?? (cls.enclosureMm ? (typical.push('enclosureMm'), cls.enclosureMm) : null)),
    // Not stated: treated as NOT isolated (the line side is evaluated wherever a main device sits) — the higher
    // hazard; listed among the defaulted values so the result says so.
    mainIsolated: eq.mainIsolated ?? (typical.push('mainIsolated'), false),
    typicalValuesUsed: typical,
  };
}
