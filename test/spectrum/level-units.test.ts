import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  canonicalLevelUnit,
  dbmToDbuV,
  dbOffsetToDbuV,
  dbuAToDbuV,
  dbuVToDbm,
  dbuVToDbuA,
  dbuVToDbV,
  dbuVToVolts,
  DBUV_MINUS_DBM_50_OHM,
  dbVToDbuV,
  LEVEL_UNIT_NAMES,
  levelFromDbuV,
  levelToDbuV,
  needsTransferImpedance,
  ohmToDbOhm,
  voltsToDbuV,
} from '../../src/spectrum/level-units.ts';
import { propertySettings } from '../support/property-settings.ts';

describe('level units: fixed points (textbook arithmetic)', () => {
  it('0 dBm in 50 Ω is 106.99 dBµV: 10·log10(50 Ω · 1 mW / (1 µV)²) = 10·log10(50·1000) + 60', () => {
    // 10·log10(50·1000) = 46.9897; + 60 = 106.9897.
    expect(DBUV_MINUS_DBM_50_OHM).toBeCloseTo(106.99, 2);
    expect(dbmToDbuV(0)).toBeCloseTo(106.99, 2);
    expect(dbuVToDbm(106.99)).toBeCloseTo(0, 2);
    // The same from P = V²/R: 1 mW in 50 Ω is √0.05 V = 0.2236 V, and 20·log10(0.2236 / 1e-6) = 106.99.
    expect(voltsToDbuV(Math.sqrt(50 * 1e-3))).toBeCloseTo(106.99, 2);
    expect(dbmToDbuV(-40)).toBeCloseTo(66.99, 2);
  });

  it('1 V is 120 dBµV (dBµV = 20·log10(V / 1 µV)); 1 µV is 0 dBµV; 0 dBV is 120 dBµV', () => {
    expect(voltsToDbuV(1)).toBe(120);
    expect(voltsToDbuV(1e-6)).toBeCloseTo(0, 12);
    expect(voltsToDbuV(1e-3)).toBeCloseTo(60, 12);
    expect(dbuVToVolts(120)).toBe(1);
    expect(dbVToDbuV(0)).toBe(120);
    expect(dbVToDbuV(-60)).toBe(60);
    expect(dbuVToDbV(66)).toBe(-54);
  });

  it('dBµA through a transfer impedance: dBµV = dBµA + 20·log10(Z_T / 1 Ω); 50 Ω adds 33.98 dB', () => {
    expect(ohmToDbOhm(50)).toBeCloseTo(33.98, 2);
    expect(dbuAToDbuV(0, 50)).toBeCloseTo(33.98, 2);
    expect(dbuAToDbuV(20, 1)).toBe(20);
    expect(dbuAToDbuV(20, 10)).toBeCloseTo(40, 12);
    expect(dbuAToDbuV(20, 0.1)).toBeCloseTo(0, 12);
    expect(dbuVToDbuA(53.98, 50)).toBeCloseTo(20, 2);
  });

  it('a voltage of zero or less has no dB value', () => {
    expect(voltsToDbuV(0)).toBe(-Infinity);
    expect(voltsToDbuV(-1)).toBeNaN();
  });

  it('refuses dBµA without a usable transfer impedance', () => {
    expect(() => levelToDbuV(10, 'dBµA')).toThrow(RangeError);
    expect(() => levelToDbuV(10, 'dBuA', 0)).toThrow(/positive/u);
    expect(() => levelFromDbuV(10, 'dBµA', Number.NaN)).toThrow(/positive/u);
    expect(() => dbuAToDbuV(10, -5)).toThrow(/positive/u);
  });

  it('names: ASCII spellings stand for the µ units; only dBµA needs an impedance; offsets for the dB units', () => {
    expect(canonicalLevelUnit('dBuV')).toBe('dBµV');
    expect(canonicalLevelUnit('dBuA')).toBe('dBµA');
    expect(canonicalLevelUnit('dBm')).toBe('dBm');
    expect(LEVEL_UNIT_NAMES.filter((unit) => needsTransferImpedance(unit))).toEqual(['dBµA', 'dBuA']);
    expect(dbOffsetToDbuV('dBµV')).toBe(0);
    expect(dbOffsetToDbuV('dBV')).toBe(120);
    expect(dbOffsetToDbuV('dBm')).toBeCloseTo(106.99, 2);
    expect(dbOffsetToDbuV('dBuA', 5)).toBeCloseTo(13.98, 2);
    expect(dbOffsetToDbuV('V')).toBeUndefined();
  });
});

describe('level units: round trips (property)', () => {
  const level = fc.double({ min: -200, max: 250, noNaN: true });
  const impedance = fc.double({ min: 1e-3, max: 1e4, noNaN: true });

  it.each(LEVEL_UNIT_NAMES)('dBµV → %s → dBµV returns the level (the impedance matters to dBµA only)', (unit) => {
    fc.assert(
      fc.property(level, impedance, (dBuV, z) => {
        expect(levelToDbuV(levelFromDbuV(dBuV, unit, z), unit, z)).toBeCloseTo(dBuV, 9);
      }),
      propertySettings(300),
    );
  });

  it.each(LEVEL_UNIT_NAMES.filter((unit) => unit !== 'V'))('%s → dBµV → the same unit returns the reading', (unit) => {
    fc.assert(
      fc.property(level, impedance, (reading, z) => {
        expect(levelFromDbuV(levelToDbuV(reading, unit, z), unit, z)).toBeCloseTo(reading, 9);
      }),
      propertySettings(300),
    );
  });

  it('rms volts → dBµV → volts, relative to 1e-12', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-9, max: 1e3, noNaN: true }), (volts) => {
        expect(dbuVToVolts(voltsToDbuV(volts)) / volts).toBeCloseTo(1, 12);
      }),
      propertySettings(300),
    );
  });

  it('a level in each unit lands on the same dBµV as the named functions', () => {
    expect(levelToDbuV(-36.99, 'dBm')).toBeCloseTo(70, 2);
    expect(levelToDbuV(70, 'dBuV')).toBe(70);
    expect(levelToDbuV(-50, 'dBV')).toBe(70);
    expect(levelToDbuV(3.1623e-3, 'V')).toBeCloseTo(70, 3);
    expect(levelToDbuV(36.02, 'dBµA', 50)).toBeCloseTo(70, 2);
  });
});
