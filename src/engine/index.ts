/**
 * The engine's public surface. Everything here is DOM-free and runs unchanged in Node, in the
 * sweep worker and in tests. Callers outside src/engine import from this file only.
 */
export { sweepDesign, type SweepOptions } from './sweep/sweep-design.ts';
export { SweepScratch } from './sweep/sweep-scratch.ts';
export {
  SWEEP_COLUMNS,
  TRANSFER_IDS,
  transferables,
  type ColumnInfo,
  type ElementSweep,
  type ImpedanceView,
  type ResonanceMark,
  type SelfResonance,
  type SweepColumnId,
  type SweepResult,
  type SweepWarning,
  type TransferId,
} from './sweep/sweep-result.ts';
export { compileNetwork, CISPR17_SYSTEMS, type Network, type NetworkElement, type ResistiveSystem } from './network.ts';
export { createWorkspace, evaluateNetwork, evaluateNetworkOnce, type Workspace } from './kernel/evaluate-network.ts';
export { allocateResponse, responseHead, type NetworkResponse } from './kernel/network-response.ts';
export { referenceEvaluate } from './reference/reference-evaluator.ts';
export { logSpace, mergeIntoGrid, PointOrigin } from './grid.ts';
export { PointFlag, magnitudeToDb, powerRatioToDb, DB_FLOOR } from './point-flags.ts';
export type { ComplexColumns } from './complex-columns.ts';
export { CISPR16_MAINS_NETWORK, VEHICLE_NETWORK } from './parts/receiver-impedance.ts';
