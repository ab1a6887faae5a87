/**
 * X-capacitor discharge through a bleed resistance: the charge left on the capacitance C across
 * the plug pins decays as v(t) = V0·e^(−t/RC). V0 is the mains peak √2·V when the plug is pulled at
 * the worst moment. Formulas only; the check that applies them is checks/discharge-check.ts.
 */

function requirePositive(name: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be a positive finite number, got ${value}`);
}

/** The peak of a sine of `rmsV`: the voltage left on a capacitor disconnected at the crest. */
export function mainsPeakV(rmsV: number): number {
  requirePositive('voltage', rmsV);
  return Math.SQRT2 * rmsV;
}

/** The largest time constant for which v(after) = V0·e^(−after/τ) is at most maxV: τ = after / ln(V0/maxV). Infinity when V0 ≤ maxV. */
export function maxTimeConstantForResidualS(initialV: number, maxV: number, afterS: number): number {
  requirePositive('initial voltage', initialV);
  requirePositive('residual voltage', maxV);
  requirePositive('time', afterS);
  if (initialV <= maxV) return Number.POSITIVE_INFINITY;
  return afterS / Math.log(initialV / maxV);
}

/** R = τ / C: the largest bleed resistance that keeps the time constant of `capacitanceF` within `timeConstantS`. */
export function maxBleedResistanceOhm(timeConstantS: number, capacitanceF: number): number {
  requirePositive('capacitance', capacitanceF);
  if (!(timeConstantS > 0)) throw new RangeError(`time constant must be positive, got ${timeConstantS}`);
  return timeConstantS / capacitanceF;
}

/** v(t) = V0·e^(−t/τ). */
export function residualVoltageV(initialV: number, timeConstantS: number, afterS: number): number {
  requirePositive('time constant', timeConstantS);
  return initialV * Math.exp(-afterS / timeConstantS);
}

/** P = V²/R: what a bleeder across the lines dissipates at `rmsV`, all the time the product is plugged in. */
export function bleederPowerW(rmsV: number, resistanceOhm: number): number {
  requirePositive('resistance', resistanceOhm);
  return (rmsV * rmsV) / resistanceOhm;
}

/** Resistances in parallel; an empty list is an open circuit (Infinity). */
export function parallelResistanceOhm(resistancesOhm: readonly number[]): number {
  let conductance = 0;
  for (const r of resistancesOhm) conductance += r === 0 ? Number.POSITIVE_INFINITY : 1 / r;
  return conductance === 0 ? Number.POSITIVE_INFINITY : 1 / conductance;
}
