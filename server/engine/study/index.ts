export {
  createStudyRunner,
  runStudy,
  DEFAULT_MOTOR_DECAY_CYCLES,
  type StudyOptions,
  type StudyRunner,
} from './runStudy';
export { resolveEquipment, type ResolvedEquipment } from './equipment';
export { boundaryDistanceMm, BOUNDARY_ENERGY_J_PER_CM2 } from './boundary';
