import type { Capacitor } from '../model/design.ts';
import { type SourceNote, sourceNote } from './source-confirmation.ts';

/**
 * IEC 60384-14 subclasses of capacitors for mains EMI suppression: where each may sit and the peak
 * impulse voltage it is tested with. The impulse values for C ≤ 1 µF are those of the subclass
 * table (UL 1414 §16 text and a reproduction of the table); the equal-energy derating above 1 µF
 * comes from a secondary source.
 */

export type SafetyClass = Capacitor['safetyClass'];
export type RatedClass = Exclude<SafetyClass, 'none'>;

/** Peak impulse test voltage for C ≤ 1 µF, V. */
export const IMPULSE_TEST_VOLTAGE_V: Readonly<Record<RatedClass, number>> = {
  X1: 4000,
  X2: 2500,
  Y1: 8000,
  Y2: 5000,
  Y4: 2500,
};

/** Subclasses whose impulse test voltage is lowered above 1 µF. */
const DERATED_ABOVE_1UF: ReadonlySet<RatedClass> = new Set(['X1', 'X2', 'Y2']);

export const IMPULSE_SOURCE: SourceNote = sourceNote('IEC 60384-14', 'subclass table, impulse test voltage (C ≤ 1 µF)', 'published-text');
export const DERATING_SOURCE: SourceNote = sourceNote('IEC 60384-14', 'impulse voltage above 1 µF, U_p/√(C/1 µF)', 'secondary-source');

export function isYClass(c: SafetyClass): c is 'Y1' | 'Y2' | 'Y4' {
  return c === 'Y1' || c === 'Y2' || c === 'Y4';
}

export function isXClass(c: SafetyClass): c is 'X1' | 'X2' {
  return c === 'X1' || c === 'X2';
}

/**
 * The peak impulse test voltage of a subclass at `capacitanceF`: the table value up to 1 µF; above it
 * X1, X2 and Y2 fall as U_p/√(C/1 µF) (equal impulse energy), Y1 and Y4 keep the table value.
 */
export function impulseTestVoltageV(safetyClass: RatedClass, capacitanceF: number): { voltageV: number; derated: boolean } {
  const table = IMPULSE_TEST_VOLTAGE_V[safetyClass];
  const ratio = capacitanceF / 1e-6;
  if (ratio > 1 && DERATED_ABOVE_1UF.has(safetyClass)) return { voltageV: table / Math.sqrt(ratio), derated: true };
  return { voltageV: table, derated: false };
}

/**
 * What an X subclass is for, for the result text (secondary source: a component maker's page
 * reproducing the subclass table). Nothing is said of the Y subclasses beyond their position: their
 * rated voltage ranges and insulation grades are not confirmed.
 */
export const X_SUBCLASS_USE: Readonly<Record<'X1' | 'X2', string>> = {
  X1: 'peak impulses in service above 2.5 kV, up to 4 kV (overvoltage category III)',
  X2: 'peak impulses in service up to 2.5 kV (overvoltage category II)',
};

export const SUBCLASS_USE_SOURCE: SourceNote = sourceNote('IEC 60384-14', 'X subclasses and overvoltage categories', 'secondary-source');
