/** IEEE Std 1584-2018 arc-flash incident-energy engine: equations (one function each) and the top-level calculation. */
export * from './arcingCurrent';
export * from './interpolation';
export * from './variationFactor';
export * from './enclosure';
export * from './energyTerms';
export * from './incidentEnergy';
export * from './arcFlashBoundary';
export * from './compute';
export {
  MODEL_LEVELS_V,
  RANGE_OF_MODEL,
  CONSTANTS,
  COEFFICIENT_PROVENANCE,
  type ModelLevelV,
  type BoxConfig,
  type EnclosureType,
} from './coefficients';
