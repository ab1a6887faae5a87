/**
 * The largest line-to-earth (Y) capacitance a touch/leakage-current limit allows at mains frequency,
 * references.md §9: I = 2π·f·C·V, taken at the highest line voltage and frequency and the capacitor's
 * upper tolerance, so C_Y,max = I / (2π·f·V·(1 + tol)).
 *
 * Written here for the sizing assistant until the safety checks (src/safety/leakage-current.ts)
 * provide the same formula; the two are to be reconciled into one.
 */
export function maximumYCapacitance(leakageLimitA: number, lineVoltageV: number, lineFrequencyHz: number, tolerance: number): number {
  return leakageLimitA / (2 * Math.PI * lineFrequencyHz * lineVoltageV * (1 + tolerance));
}

/** I = 2π·f·C·V·(1 + tol): the leakage current a capacitance to earth passes at mains frequency. */
export function leakageCurrent(capacitance: number, lineVoltageV: number, lineFrequencyHz: number, tolerance: number): number {
  return 2 * Math.PI * lineFrequencyHz * capacitance * lineVoltageV * (1 + tolerance);
}
