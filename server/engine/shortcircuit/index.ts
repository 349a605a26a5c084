/** Short-circuit engine: public surface. */
export * from './complex';
export * from './impedance';
export { necTable9ImpedanceOhmPer1000Ft, TABLE9_FREQUENCY_HZ } from './necTable9';
export type { ConductorMaterial, ConduitKind, Table9Impedance } from './necTable9';
export { buildNetwork, buildAdmittanceMatrix, SYSTEM_BASE_MVA } from './network';
export type { Network, NetworkBranch, NetworkInjection, NetworkTie, BranchKind, InjectionKind } from './network';
export { ComplexSymmetricBuilder, LdltFactor, factorComplexSymmetric } from './sparse';
export { createShortCircuitSolver, InvalidModelError, markCheckedModel, shortCircuit } from './shortCircuit';
export type {
  BranchFaultCurrent,
  BusFault,
  BusShortCircuit,
  FaultOptions,
  FlowDirection,
  InjectionFaultCurrent,
  Phasor,
  ShortCircuitResult,
  ShortCircuitSolver,
} from './shortCircuit';
