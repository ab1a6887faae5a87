import { describe, expect, it } from 'vitest';
import { IMPULSE_TEST_VOLTAGE_V, impulseTestVoltageV } from '../../src/safety/capacitor-classes.ts';

/**
 * IEC 60384-14 impulse test voltages (references.md §9): for C ≤ 1 µF X1 4 kV, X2 2.5 kV, Y1 8 kV,
 * Y2 5 kV, Y4 2.5 kV (UL 1414 §16 text for X1/Y1/Y2, a reproduction of the subclass table for all
 * five); above 1 µF X1, X2 and Y2 fall as U_p/√(C/1 µF) and Y1, Y4 do not (secondary source), with the
 * computed values at 2.2 µF: X1 2696.8 V, X2 1685.5 V, Y2 3371.0 V.
 */

describe('IEC 60384-14 impulse test voltage', () => {
  it.each([
    ['X1', 4000],
    ['X2', 2500],
    ['Y1', 8000],
    ['Y2', 5000],
    ['Y4', 2500],
  ] as const)('%s at 1 µF and below: %s V', (cls, volts) => {
    expect(IMPULSE_TEST_VOLTAGE_V[cls]).toBe(volts);
    expect(impulseTestVoltageV(cls, 1e-6)).toEqual({ voltageV: volts, derated: false });
    expect(impulseTestVoltageV(cls, 2.2e-9)).toEqual({ voltageV: volts, derated: false });
  });

  it.each([
    ['X1', 2696.8],
    ['X2', 1685.5],
    ['Y2', 3371.0],
  ] as const)('%s at 2.2 µF is derated to %s V (equal-energy rule, secondary source)', (cls, volts) => {
    const { voltageV, derated } = impulseTestVoltageV(cls, 2.2e-6);
    expect(derated).toBe(true);
    expect(Math.abs(voltageV - volts) / volts).toBeLessThan(5e-5);
  });

  it.each(['Y1', 'Y4'] as const)('%s is not derated above 1 µF', (cls) => {
    expect(impulseTestVoltageV(cls, 2.2e-6)).toEqual({ voltageV: IMPULSE_TEST_VOLTAGE_V[cls], derated: false });
  });
});
