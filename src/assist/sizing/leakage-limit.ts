import { leakageCurrentA, maxCapacitanceForLeakageF } from '../../safety/leakage-current.ts';

/**
 * The largest line-to-earth (Y) capacitance a touch/leakage-current limit allows at mains frequency,
 * and the current a capacitance passes (references.md §9): C_Y,max = I / (2π·f·V·(1 + tol)) at the
 * highest line voltage and frequency and the capacitor's upper tolerance. One formula for the whole
 * program: the safety checks own it (src/safety/leakage-current.ts); these names keep the
 * assistants' call sites short. Throws a RangeError for a value that is not positive.
 */
export function maximumYCapacitance(leakageLimitA: number, lineVoltageV: number, lineFrequencyHz: number, tolerance: number): number {
  return maxCapacitanceForLeakageF(leakageLimitA, lineVoltageV, lineFrequencyHz, tolerance);
}

export function leakageCurrent(capacitance: number, lineVoltageV: number, lineFrequencyHz: number, tolerance: number): number {
  return leakageCurrentA(capacitance, lineVoltageV, lineFrequencyHz, tolerance);
}
