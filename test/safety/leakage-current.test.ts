import { describe, expect, it } from 'vitest';
import { leakageCurrentA, maxCapacitanceForLeakageF } from '../../src/safety/leakage-current.ts';

/**
 * I = 2π·f·C·V and its inverse against the computed rows of references.md §9 and check case C13 of
 * domain.md §6 (the formula evaluated by hand; given to 3–6 significant figures). The limits fed to
 * the inverse (0.25 / 0.75 / 3.5 mA) are those of IEC 60335-1 cl. 13.2 (class II 0.25 mA, class I
 * portable 0.75 mA, class I stationary motor-operated 3.5 mA) and IEC 60950-1 Table 5A (not earthed
 * 0.25 mA, class I hand-held 0.75 mA, other class I pluggable type A 3.5 mA), values from secondary
 * sources (a forum reproduction of the clause list, mailing-list posts quoting the table).
 */

const nF = 1e-9;
const mA = 1e-3;

function expectRelative(actual: number, expected: number, relative = 1e-5): void {
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(relative);
}

describe('leakage current I = 2πfCV (references.md §9, computed rows)', () => {
  it.each([
    [4.7, 250, 50, 0.369137],
    [2.2, 250, 50, 0.172788],
    [4.7, 264, 60, 0.467771],
    [10, 230, 50, 0.722566],
  ])('%s nF at %s V, %s Hz carries %s mA', (capacitanceNf, voltageV, frequencyHz, expectedMa) => {
    expectRelative(leakageCurrentA(capacitanceNf * nF, voltageV, frequencyHz), expectedMa * mA);
  });

  it('raises the current by the capacitor tolerance', () => {
    expectRelative(leakageCurrentA(4.7 * nF, 250, 50, 0.2), 1.2 * 0.369137 * mA);
  });

  it('C13: 4.7 nF at 1.06 × 250 V, 50 Hz, +20 % carries 0.470 mA (test voltage 1.06 × rated, capacitor at its upper tolerance)', () => {
    expectRelative(leakageCurrentA(4.7 * nF, 1.06 * 250, 50, 0.2), 0.47 * mA, 1e-3);
  });

  it('is zero without capacitance and refuses nonsense', () => {
    expect(leakageCurrentA(0, 250, 50)).toBe(0);
    expect(() => leakageCurrentA(-1 * nF, 250, 50)).toThrow(RangeError);
    expect(() => leakageCurrentA(1 * nF, 0, 50)).toThrow(RangeError);
    expect(() => leakageCurrentA(1 * nF, 250, Number.NaN)).toThrow(RangeError);
    expect(() => leakageCurrentA(1 * nF, 250, 50, 1)).toThrow(RangeError);
  });
});

describe('largest Y capacitance for a limit, C = I/(2πfV(1+tol)) (references.md §9, computed rows)', () => {
  const CLASS_II = 'IEC 60335-1 cl. 13.2 class II, IEC 60950-1 Table 5A not earthed';
  const PORTABLE = 'IEC 60335-1 cl. 13.2 class I portable, IEC 60950-1 Table 5A hand-held';
  const PLUGGABLE = 'IEC 60950-1 Table 5A class I pluggable type A, IEC 60335-1 cl. 13.2 stationary motor-operated';
  it.each([
    [0.25, CLASS_II, 250, 50, 3.1831],
    [0.25, CLASS_II, 264, 60, 2.5119],
    [0.75, PORTABLE, 250, 50, 9.5493],
    [3.5, PLUGGABLE, 250, 50, 44.5634],
    [3.5, PLUGGABLE, 264, 60, 35.1668],
  ])('%s mA (%s) at %s V, %s Hz allows %s nF', (limitMa, _source, voltageV, frequencyHz, expectedNf) => {
    expectRelative(maxCapacitanceForLeakageF(limitMa * mA, voltageV, frequencyHz), expectedNf * nF);
  });

  it('C13: 0.25 mA (IEC 60335-1 cl. 13.2 class II; IEC 60950-1 Table 5A not earthed) at 264 V, 60 Hz with +20 % allows 2.09 nF', () => {
    expectRelative(maxCapacitanceForLeakageF(0.25 * mA, 264, 60, 0.2), 2.09 * nF, 2e-3);
  });

  it('shrinks by 1/(1 + tolerance) and round-trips through the current', () => {
    const c = maxCapacitanceForLeakageF(0.75 * mA, 250, 50, 0.2);
    expectRelative(c, 9.5493 * nF / 1.2);
    expectRelative(leakageCurrentA(c, 250, 50, 0.2), 0.75 * mA, 1e-12);
  });

  it('refuses a limit that is not a positive current', () => {
    expect(() => maxCapacitanceForLeakageF(0, 250, 50)).toThrow(RangeError);
    expect(() => maxCapacitanceForLeakageF(0.25 * mA, 250, 50, -0.1)).toThrow(RangeError);
  });
});
