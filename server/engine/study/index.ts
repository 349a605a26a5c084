export {
  createStudyRunner,
  DEFAULT_MOTOR_DECAY_CYCLES,
  DEFAULT_MOTOR_DECAY_MODEL,
  type MotorDecayModel,
  type StudyOptions,
  type StudyRunner,
} from './runStudy';
export { runAllBuses, runBusRange, type StudyRunOutcome, type StudyRunPiece } from './runAll';
export {
  COMPRESSED_PREFIX,
  parseStoredResults,
  storedJsonText,
  storedResultsFromPieces,
  storedResultsText,
  StoredResultsWriter,
  STORED_RESULTS_FORMAT,
  STORED_RESULTS_PARTS_FORMAT,
  type StoredResultsPiece,
} from './storedResults';
export { resolveEquipment, type ResolvedEquipment } from './equipment';
export { boundaryDistanceMm, BOUNDARY_ENERGY_J_PER_CM2 } from './boundary';
export {
  generatorDecrementProfile,
  motorExponentialProfile,
  motorStepProfile,
  resolveGenerator,
  TYPICAL_GENERATOR,
  type ContributionProfile,
} from './decrement';
export { createTripIntegrator, operatingTimeS, type TripIntegrator } from './tripIntegration';
export {
  applyScenario,
  createScenarioRunner,
  runStudy,
  scenariosOf,
  BASE_SCENARIO_NAME,
  type AppliedScenario,
  type SharedNetwork,
} from './scenarios';
