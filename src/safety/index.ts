/**
 * The safety checks' public surface (docs/safety.md). DOM-free: runs unchanged in Node, a worker
 * and the tests. The page imports types from here only; the numbers come from a worker.
 */
export { largestYCapacitanceForDesign, runSafetyChecks, safetyCheckOptionsSchema, type SafetyCheckOptions, type SafetyOutcome, type SafetyReport, type SafetySupplySummary } from './run-safety-checks.ts';
export {
  CHECK_TITLES,
  SAFETY_CHECK_IDS,
  STATUS_WORDS,
  type CheckStatus,
  type FigureUnit,
  type FindingStatus,
  type InapplicableFinding,
  type JudgedFinding,
  type JudgedStatus,
  type SafetyCheckId,
  type SafetyCheckResult,
  type SafetyFigure,
  type SafetyFinding,
  type UncheckedFinding,
} from './safety-finding.ts';
export { CONFIRMATION_WORDS, describeSource, type Confirmation, type SourceNote } from './source-confirmation.ts';
export { LEAKAGE_LIMITS, findLeakageLimit, type LeakageLimit } from './leakage-limits.ts';
export { DISCHARGE_REQUIREMENTS, DISCHARGE_EXEMPTION_F, findDischargeRequirement, type DischargeRequirement, type DischargeRule } from './discharge-requirements.ts';
export { leakageCurrentA, maxCapacitanceForLeakageF } from './leakage-current.ts';
export { largestYCapacitance, leakageCases, type LargestYCapacitance, type LeakageCases, type LineCapacitances } from './leakage-cases.ts';
export { bleederPowerW, mainsPeakV, maxBleedResistanceOhm, maxTimeConstantForResidualS, residualVoltageV } from './discharge.ts';
export { IMPULSE_TEST_VOLTAGE_V, impulseTestVoltageV } from './capacitor-classes.ts';
export { DEFAULT_CAPACITOR_TOLERANCE, DEFAULT_SATURATION_MARGIN, type ChosenValue, type ResolvedChoices, type ResolvedLeakageLimit } from './safety-choices.ts';
export { cautionsFor, type Caution } from './cautions.ts';
export { formatFigure } from './figure-format.ts';
