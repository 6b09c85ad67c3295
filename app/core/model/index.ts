/** Public surface of the respiratory and inhalant-uptake model. */
export {
  computePlan,
  modelVersion,
  resolveMac,
  vaporiserOffMin,
  planEndMin,
  buildBodyModel,
  buildSimulationSetup,
  defaultRoom,
  defaultRecoveryWindowMin,
  defaultUncertainty,
} from './compute-plan.js';
export type { PlanTables, ResolvedMac } from './compute-plan.js';
export {
  estimateRespiratory,
  tidalVolumeMl,
  breathsPerMin,
  fittedMinuteVentilationMlMin,
  trachealVolumeMl,
  heartRatePerMin,
  cardiacOutputMlMin,
  strokeVolumeMl,
} from './allometry.js';
export type { Estimate, MeasuredOverrides, RespiratoryEstimates } from './allometry.js';
export {
  crossCurrentArterialFraction,
  crossCurrentEndGasFraction,
  ventilatedPoolArterialFraction,
  counterCurrentArterialFraction,
  perfusionVentilationK,
} from './exchange.js';
export { gasSpaceWash } from './milestones.js';
export type { GasSpaceWash, GasSpaceWashInput } from './milestones.js';
export { simulate, dialPctAt } from './simulation.js';
export type {
  SimulationSetup,
  SimulationOutcome,
  SimulationTimeline,
  PhaseSnapshot,
  GasPath,
  DeliverySetup,
  VentilationSetup,
  ScheduleStep,
  AgentTotals,
} from './simulation.js';
export { runUncertainty, seededRandom, percentile } from './uncertainty.js';
export type * from './plan-types.js';
