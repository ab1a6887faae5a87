/**
 * Optimal R_f–C_b parallel damping of an L–C filter section: a branch R_f in series with C_b = n·C
 * across the filter capacitor C (R. W. Erickson, D. Maksimović, Fundamentals of Power Electronics,
 * 2nd ed., input filter design, optimal damping; references.md §8). With R0 = √(L/C) and
 * f0 = 1/(2π√(LC)):
 *
 *     Q_opt = R_f,opt / R0 = √( (2 + n)(4 + 3n) / (2n²(4 + n)) )
 *     ‖Z_o‖ peak = R0 · √(2(2 + n)) / n
 *     f_peak = f0 · √(2 / (2 + n))
 *
 * The peak is the largest output impedance the damped section shows (the quantity Middlebrook's
 * criterion compares with the converter's input impedance); the optimum R minimises it.
 */

export function optimalDampingQ(n: number): number {
  return Math.sqrt(((2 + n) * (4 + 3 * n)) / (2 * n * n * (4 + n)));
}

export function optimalDampingResistance(characteristicOhm: number, n: number): number {
  return characteristicOhm * optimalDampingQ(n);
}

export function dampedPeakImpedance(characteristicOhm: number, n: number): number {
  return (characteristicOhm * Math.sqrt(2 * (2 + n))) / n;
}

export function dampedPeakFrequency(resonanceHz: number, n: number): number {
  return resonanceHz * Math.sqrt(2 / (2 + n));
}

/** R0 = √(L/C) and f0 = 1/(2π√(LC)) of the undamped section. */
export function sectionOf(inductance: number, capacitance: number): { characteristicOhm: number; resonanceHz: number } {
  return { characteristicOhm: Math.sqrt(inductance / capacitance), resonanceHz: 1 / (2 * Math.PI * Math.sqrt(inductance * capacitance)) };
}
