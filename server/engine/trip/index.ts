/** Clearing time from trip bands (docs/ARCHITECTURE.md, Clearing time from a trip band): pure functions. */
export { clearingTime, readBand, type ClearingTimeResult, type ClearingTrace } from './clearingTime';
export { createBandReader, type BandReader } from './bandReader';
export { interpolateLogLog, validateCurvePoints, type TimeCurrentPoint, type CurveReading } from './interpolate';
export {
  cyclesToSeconds,
  iecInverseTimeS,
  ieeeInverseTimeS,
  longTimeI2tS,
  meltToClearS,
  shortTimeDelayS,
  FUSE_MINIMUM_CLEARING_S,
} from './equations';
export { relayBand, relayInverseTimeS } from './relay';
export { fuseBand } from './fuse';
export { digitizedBand } from './digitizedBand';
export { thermalMagneticBand } from './thermalMagnetic';
export { electronicBand } from './electronic';
export { resolveElectronicSettings } from './resolveElectronicSettings';
export { parseBandCsv, formatBandCsv, type BandCsvError, type BandCsvResult } from './bandCsv';
export { bandCurves, bandFeatureCurrentsA, type BandCurves, type BandCurvesOptions } from './curvePoints';
export {
  checkIec60898Instantaneous,
  checkUl489Calibration,
  iec60898InstantaneousRange,
  iec60898InstantaneousSetting,
  ul489LimitAt135PctS,
  ul489LimitAt200PctS,
} from './standardChecks';
export type { BandReading, ElementReading } from './elements';
