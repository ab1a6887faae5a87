/**
 * Leakage (touch) current through Y capacitance at mains frequency, and its inverse: the largest
 * capacitance that keeps the current within a limit.
 *
 * At 50/60 Hz a capacitor between a live conductor and protective earth carries I = 2π·f·C·V. The
 * measuring network of IEC 60990 weights mains frequency by about 1 (common practice, no separate
 * source), so the plain capacitive current is the touch current a tester reads there. The worst case
 * is the highest supply voltage and frequency with the capacitor at the top of its tolerance.
 */

const TWO_PI = 2 * Math.PI;

function requirePositive(name: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be a positive finite number, got ${value}`);
}

function requireTolerance(tolerance: number): void {
  if (!Number.isFinite(tolerance) || tolerance < 0 || tolerance >= 1) {
    throw new RangeError(`tolerance must be a fraction in [0, 1), got ${tolerance}`);
  }
}

/**
 * Current through `capacitanceF` at `voltageV` rms and `frequencyHz`: I = 2π·f·C·V (A rms).
 * `tolerance` (a fraction, 0.2 for ±20 %) raises C to its upper limit C·(1 + tolerance).
 */
export function leakageCurrentA(capacitanceF: number, voltageV: number, frequencyHz: number, tolerance = 0): number {
  if (!Number.isFinite(capacitanceF) || capacitanceF < 0) {
    throw new RangeError(`capacitance must be a finite number ≥ 0, got ${capacitanceF}`);
  }
  requirePositive('voltage', voltageV);
  requirePositive('frequency', frequencyHz);
  requireTolerance(tolerance);
  return TWO_PI * frequencyHz * capacitanceF * (1 + tolerance) * voltageV;
}

/**
 * The largest nominal capacitance whose current stays within `limitA` at `voltageV` rms and `frequencyHz`
 * when the part may be `tolerance` above nominal: C_max = I / (2π·f·V·(1 + tolerance)).
 */
export function maxCapacitanceForLeakageF(limitA: number, voltageV: number, frequencyHz: number, tolerance = 0): number {
  requirePositive('current limit', limitA);
  requirePositive('voltage', voltageV);
  requirePositive('frequency', frequencyHz);
  requireTolerance(tolerance);
  return limitA / (TWO_PI * frequencyHz * voltageV * (1 + tolerance));
}
