import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatQuantity, parseQuantity, type UnitSymbol } from '../../src/model/units.ts';
import { propertySettings } from '../support/property-settings.ts';

function value(text: string, unit: UnitSymbol): number {
  const parsed = parseQuantity(text, unit);
  if (!parsed.ok) throw new Error(`"${text}" did not parse: ${parsed.reason}`);
  return parsed.value;
}

function reason(text: string, unit: UnitSymbol): string {
  const parsed = parseQuantity(text, unit);
  if (parsed.ok) throw new Error(`"${text}" parsed as ${parsed.value} but should be rejected`);
  return parsed.reason;
}

describe('engineering notation as people type it', () => {
  it.each([
    ['4.7 mH', 'H', 4.7e-3],
    ['4m7', 'H', 4.7e-3],
    ['100n', 'F', 100e-9],
    ['2u2', 'F', 2.2e-6],
    ['10 pF', 'F', 10e-12],
    ['2.2µF', 'F', 2.2e-6],
    ['47 nF', 'F', 47e-9],
    ['150 kHz', 'Hz', 150e3],
    ['1 MHz', 'Hz', 1e6],
    ['30MHz', 'Hz', 30e6],
    ['1meg', 'Hz', 1e6],
    ['4R7', 'Ω', 4.7],
    ['100R', 'Ω', 100],
    ['30 mOhm', 'Ω', 0.03],
    ['1k5', 'Ω', 1500],
    ['2.2 MΩ', 'Ω', 2.2e6],
    ['1e-6', 'H', 1e-6],
    ['  12.5  ', '', 12.5],
    ['250 V', 'V', 250],
    ['100f', 'F', 100e-15],
  ] as const)('"%s" in %s is %d', (text, unit, expected) => {
    expect(value(text, unit)).toBeCloseTo(expected, 20);
    expect(Math.abs(value(text, unit) / expected - 1)).toBeLessThan(1e-14);
  });

  it('rejects an unknown unit', () => {
    expect(reason('4.7 q', 'H')).toMatch(/unknown unit/);
  });

  it('rejects a unit that does not belong to the field', () => {
    expect(reason('10 pF', 'H')).toMatch(/expected H, got F/);
    expect(reason('4.7 mH', 'F')).toMatch(/expected F, got H/);
  });

  it('rejects a bare M, which SPICE reads as milli and SI as mega', () => {
    expect(reason('1M', 'Ω')).toMatch(/ambiguous/);
    expect(reason('4M7', 'Ω')).toMatch(/ambiguous/);
  });

  it.each(['', 'abc', '1..2', '--1', '1 2', 'NaN', 'Infinity', '4R7'])('rejects "%s" for an inductance', (text) => {
    expect(parseQuantity(text, 'H').ok).toBe(false);
  });
});

describe('formatting', () => {
  it.each([
    [0.0047, 'H', '4.7 mH'],
    [100e-9, 'F', '100 nF'],
    [2.2e-6, 'F', '2.2 µF'],
    [150e3, 'Hz', '150 kHz'],
    [30e6, 'Hz', '30 MHz'],
    [0.03, 'Ω', '30 mΩ'],
    [0, 'F', '0 F'],
    [999.96, 'Ω', '1 kΩ'],
    [1e6, '', '1 meg'],
  ] as const)('%d %s prints as "%s"', (input, unit, text) => {
    expect(formatQuantity(input, unit)).toBe(text);
  });

  it('round-trips every value through format and parse (fast-check)', () => {
    const units: UnitSymbol[] = ['H', 'F', 'Ω', 'Hz', 'V', 'A', ''];
    fc.assert(
      fc.property(
        fc.double({ min: 1e-14, max: 1e13, noNaN: true }),
        fc.constantFrom(...units),
        fc.integer({ min: 3, max: 15 }),
        (x, unit, digits) => {
          const text = formatQuantity(x, unit, digits);
          const back = value(text, unit);
          // Formatting keeps `digits` significant figures, so the round trip is exact to that precision.
          expect(Math.abs(back / x - 1)).toBeLessThanOrEqual(5 * 10 ** -(digits - 1));
        },
      ),
      propertySettings(500),
    );
  });
});
