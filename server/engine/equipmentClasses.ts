/**
 * Equipment classes with typical gaps, enclosure sizes and working distances (IEEE Std 1584-2018 Tables 8 and 10,
 * from memory, unverified). The data lives in `shared/` because the client uses it for the spot-check presets.
 */
export {
  EQUIPMENT_CLASSES,
  ELECTRODE_CONFIGS,
  ELECTRODE_CONFIG_LABELS,
  findEquipmentClass,
} from '../../shared/equipmentClasses';
export type { EquipmentClass, ElectrodeConfig, EnclosureSizeMm, VoltageClass } from '../../shared/equipmentClasses';
