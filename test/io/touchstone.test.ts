import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type Complex, complex, magnitude, phaseDeg } from '../../src/io/complex.ts';
import { formatLineIssue, type LineIssue } from '../../src/io/text-issues.ts';
import {
  impedanceFromThru,
  impedanceToS21SeriesThru,
  impedanceToS21ShuntThru,
  measuredPartFromThru,
  readTouchstoneTwoPort,
  s21ToImpedanceSeriesThru,
  s21ToImpedanceShuntThru,
  type ThruFixture,
  thruFixtureSParameters,
  type TouchstoneFormat,
  type TouchstoneTwoPort,
  writeTouchstoneTwoPort,
} from '../../src/io/touchstone.ts';
import { readDesign } from '../../src/model/index.ts';
import { buildDesign, element } from '../support/design-builders.ts';
import { propertySettings } from '../support/property-settings.ts';

function read(text: string, fileName?: string): TouchstoneTwoPort & { notes: readonly LineIssue[] } {
  const result = readTouchstoneTwoPort(text, fileName === undefined ? {} : { fileName });
  if (!result.ok) throw new Error(`expected the file to read, got:\n${result.issues.map(formatLineIssue).join('\n')}`);
  return { ...result.value, notes: result.notes };
}

function problems(text: string, fileName?: string): string[] {
  const result = readTouchstoneTwoPort(text, fileName === undefined ? {} : { fileName });
  if (result.ok) throw new Error('expected the file to be refused');
  return result.issues.map(formatLineIssue);
}

function expectClose(actual: Complex, wanted: Complex, relative = 1e-12): void {
  const scale = Math.max(magnitude(wanted), 1e-300);
  expect(magnitude(complex(actual.re - wanted.re, actual.im - wanted.im)) / scale).toBeLessThan(relative);
}

describe('textbook two-port arithmetic', () => {
  it('a 100 Ω series element between 50 Ω ports passes half the voltage: S21 = 0.5, −6.02 dB', () => {
    const s21 = impedanceToS21SeriesThru(complex(100), 50);
    expect(s21.re).toBeCloseTo(0.5, 15);
    expect(s21.im).toBe(0);
    expect(20 * Math.log10(magnitude(s21))).toBeCloseTo(-6.0206, 4);
    expectClose(s21ToImpedanceSeriesThru(complex(0.5), 50), complex(100));
  });

  it('a 25 Ω shunt element in 50 Ω passes half the voltage too: S21 = 2Z/(2Z + Z0) = 0.5', () => {
    expectClose(impedanceToS21ShuntThru(complex(25), 50), complex(0.5));
    expectClose(s21ToImpedanceShuntThru(complex(0.5), 50), complex(25));
  });

  it('a matched series element reflects Z/(Z + 2·Z0) and the S-matrix is symmetric', () => {
    const s = thruFixtureSParameters('series-thru', complex(100), 50);
    expectClose(s.s11, complex(0.5));
    expect(s.s12).toEqual(s.s21);
    expect(s.s22).toEqual(s.s11);
    // Lossless check for a pure reactance: |S11|² + |S21|² = 1.
    const reactive = thruFixtureSParameters('shunt-thru', complex(0, 37), 50);
    expect(magnitude(reactive.s11) ** 2 + magnitude(reactive.s21) ** 2).toBeCloseTo(1, 12);
  });

  const impedance = fc
    .record({ size: fc.double({ min: -3, max: 5, noNaN: true }), angle: fc.double({ min: -89.9, max: 89.9, noNaN: true }) })
    .map(({ size, angle }) => {
      const radians = (angle * Math.PI) / 180;
      return complex(10 ** size * Math.cos(radians), 10 ** size * Math.sin(radians));
    });

  it('series-thru: Z → S21 → Z round-trips (property)', () => {
    fc.assert(
      fc.property(impedance, fc.constantFrom(50, 75, 100), (z, z0) => {
        expectClose(s21ToImpedanceSeriesThru(impedanceToS21SeriesThru(z, z0), z0), z, 1e-8);
      }),
      propertySettings(300),
    );
  });

  it('shunt-thru: Z → S21 → Z round-trips (property)', () => {
    fc.assert(
      fc.property(impedance, fc.constantFrom(50, 75, 100), (z, z0) => {
        expectClose(s21ToImpedanceShuntThru(impedanceToS21ShuntThru(z, z0), z0), z, 1e-8);
      }),
      propertySettings(300),
    );
  });
});

/** An RLC impedance to make files from: 1 µH with 2 Ω and 5 pF across. */
function part(frequencyHz: number): Complex {
  const w = 2 * Math.PI * frequencyHz;
  const series = complex(2, w * 1e-6);
  const across = complex(0, -1 / (w * 5e-12));
  const sum = complex(series.re + across.re, series.im + across.im);
  const product = complex(series.re * across.re - series.im * across.im, series.re * across.im + series.im * across.re);
  const d = sum.re * sum.re + sum.im * sum.im;
  return complex((product.re * sum.re + product.im * sum.im) / d, (product.im * sum.re - product.re * sum.im) / d);
}

const frequencies = [1e5, 1e6, 1e7, 5e7, 7.1e7, 1e8, 3e8];

function fileOf(fixture: ThruFixture, format: TouchstoneFormat, unit: 'Hz' | 'kHz' | 'MHz' | 'GHz'): string {
  const records = frequencies.map((frequencyHz) => ({ frequencyHz, ...thruFixtureSParameters(fixture, part(frequencyHz), 50) }));
  return writeTouchstoneTwoPort(records, { format, frequencyUnit: unit, referenceOhm: 50, comments: ['invented test data'] });
}

describe('reading Touchstone v1 two-port files', () => {
  for (const fixture of ['series-thru', 'shunt-thru'] as const) {
    for (const format of ['RI', 'MA', 'DB'] as const) {
      for (const unit of ['Hz', 'kHz', 'MHz', 'GHz'] as const) {
        it(`${fixture}, ${format}, ${unit}: written, read and converted back to the same impedance`, () => {
          const data = read(fileOf(fixture, format, unit));
          expect(data.options).toEqual({ frequencyUnit: unit, format, referenceOhm: 50 });
          expect(data.records.map((r) => r.frequencyHz)).toEqual(frequencies);
          const converted = impedanceFromThru(data, fixture);
          if (!converted.ok) throw new Error(converted.issues.map(formatLineIssue).join('\n'));
          const { table } = converted.value;
          table.frequencyHz.forEach((f, i) => {
            const z = part(f);
            expect(table.magnitudeOhm[i]! / magnitude(z)).toBeCloseTo(1, 9);
            expect(table.phaseDeg[i]!).toBeCloseTo(phaseDeg(z), 7);
          });
        });
      }
    }
  }

  it('reads the option line in any order and case, and a comment after it', () => {
    const data = read('#ri r 75 mhz s ! measured in 75 ohm\n1 0.5 0 0.5 0 0.5 0 0.5 0\n');
    expect(data.options).toEqual({ frequencyUnit: 'MHz', format: 'RI', referenceOhm: 75 });
    expect(data.records[0]).toMatchObject({ line: 2, frequencyHz: 1e6 });
  });

  it('applies the Touchstone defaults (GHz, MA, 50 Ω) without an option line, and says so', () => {
    const data = read('1 0.5 0 0.5 0 0.5 0 0.5 0\n');
    expect(data.options).toEqual({ frequencyUnit: 'GHz', format: 'MA', referenceOhm: 50 });
    expect(data.records[0]!.frequencyHz).toBe(1e9);
    expect(data.notes[0]!.message).toMatch(/defaults apply/u);
  });

  it('reads records wrapped over several lines, with comments between', () => {
    const text = [
      '! invented',
      '# Hz S RI R 50',
      '1000 0.1 0.2 ! S11',
      '  0.3 0.4     ! S21',
      '! a full-line comment inside a record',
      '  0.5 0.6 0.7 0.8',
      '2000 0.1 0.2 0.3 0.4',
      '  0.5 0.6 0.7 0.8',
    ].join('\n');
    const data = read(text);
    expect(data.records).toHaveLength(2);
    expect(data.records[0]).toEqual({
      line: 3,
      frequencyHz: 1000,
      s11: complex(0.1, 0.2),
      s21: complex(0.3, 0.4),
      s12: complex(0.5, 0.6),
      s22: complex(0.7, 0.8),
    });
    expect(data.records[1]!.line).toBe(7);
  });

  it('reads DB as 20·log10 |S| and angles in degrees', () => {
    const data = read('# MHz S DB R 50\n1 0 0 -6.020599913279624 90 0 0 0 0\n');
    const s21 = data.records[0]!.s21;
    expect(s21.re).toBeCloseTo(0, 12);
    expect(s21.im).toBeCloseTo(0.5, 12);
  });

  it('skips a noise-parameter block after the S-parameters', () => {
    const data = read('# GHz S MA R 50\n1 0 0 1 0 1 0 0 0\n2 0 0 1 0 1 0 0 0\n1 1.5 0.3 45 0.2\n2 1.6 0.3 50 0.2\n');
    expect(data.records).toHaveLength(2);
    expect(data.notes.map((n) => n.message).join(' ')).toMatch(/noise parameters/u);
  });

  it('keeps the first option line and notes any later one', () => {
    const data = read('# MHz S RI R 50\n# GHz S MA R 75\n1 0 0 1 0 1 0 0 0\n');
    expect(data.options.frequencyUnit).toBe('MHz');
    expect(data.notes.map((n) => n.message).join(' ')).toMatch(/ignored line 2/u);
  });
});

describe('refusing bad Touchstone files with line numbers', () => {
  it('a one-port file', () => {
    expect(problems('# MHz S RI R 50\n1 0.1 0.2\n2 0.1 0.2\n3 0.1 0.2\n')[0]).toMatch(/^line 3: .*one-port file/u);
    expect(problems('1 0.1 0.2\n', 'probe.s1p')[0]).toMatch(/\.s1p file holds 1-port data/u);
  });

  it('a record cut short at the end', () => {
    expect(problems('# MHz S RI R 50\n1 0 0 1 0 1 0 0 0\n2 0 0 1 0\n')).toEqual([
      'line 3: the record starting here has 5 of 9 values (frequency and S11, S21, S12, S22 as pairs)',
    ]);
  });

  it('a pair split over two lines', () => {
    expect(problems('# MHz S RI R 50\n1 0 0 1\n0 1 0 0 0\n')[0]).toMatch(/^line 2: 4 values; a record starts with a frequency followed by whole pairs/u);
  });

  it('a line with more values than a two-port record', () => {
    expect(problems('# MHz S RI R 50\n1 0 0 1 0 1 0 0 0 1 0 0 0\n')[0]).toMatch(/^line 2: 13 values; .*more ports/u);
  });

  it('text where a number belongs', () => {
    expect(problems('# MHz S RI R 50\n1 0 0 1 0 1 0 x 0\n')).toEqual(['line 2: "x" is not a number']);
  });

  it('frequencies that do not rise', () => {
    expect(problems('# MHz S RI R 50\n2 0 0 1 0 1 0 0 0\n2 0 0 1 0 1 0 0 0\n')[0]).toMatch(
      /^line 3: frequency 2000000 Hz is not above the 2000000 Hz of line 2/u,
    );
  });

  it('an option line with other parameters, an unknown token or no reference value', () => {
    expect(problems('# MHz Y RI R 50\n1 0 0 1 0 1 0 0 0\n')[0]).toMatch(/^line 1: option line: Y-parameters are not read/u);
    expect(problems('# MHz S XY R 50\n1 0 0 1 0 1 0 0 0\n')[0]).toMatch(/^line 1: option line: unknown option "XY"/u);
    expect(problems('# MHz S RI R\n1 0 0 1 0 1 0 0 0\n')[0]).toMatch(/^line 1: option line: R must be followed by the reference impedance/u);
  });

  it('an option line after the data', () => {
    expect(problems('1 0 0 1 0 1 0 0 0\n# MHz S RI R 50\n')[0]).toBe('line 2: the option line must come before the data');
  });

  it('a Touchstone 2 keyword file', () => {
    expect(problems('[Version] 2.0\n# MHz S RI R 50\n')[0]).toMatch(/^line 1: "\[Version\]" is a Touchstone 2 keyword/u);
  });

  it('a file without data', () => {
    expect(problems('! nothing here\n# MHz S RI R 50\n')[0]).toMatch(/no data/u);
  });
});

describe('impedance from a thru fixture', () => {
  it('refuses a series-thru point where S21 = 0 (an open part) with its line', () => {
    const data = read('# MHz S RI R 50\n1 1 0 0 0 0 0 1 0\n2 0 0 0.5 0 0.5 0 0 0\n');
    const result = impedanceFromThru(data, 'series-thru');
    expect(result.ok).toBe(false);
    if (!result.ok) expect(formatLineIssue(result.issues[0]!)).toMatch(/^line 2: S21 = .* makes the series-thru impedance unbounded/u);
  });

  it('refuses a shunt-thru point where S21 = 1 (no part) with its line', () => {
    const data = read('# MHz S RI R 50\n1 0 0 0.5 0 0.5 0 0 0\n2 0 0 1 0 1 0 0 0\n');
    const result = impedanceFromThru(data, 'shunt-thru');
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.issues[0]!.line).toBe(3);
  });

  it('leaves out a 0 Hz point and notes it', () => {
    const data = read('# MHz S RI R 50\n0 0 0 1 0 1 0 0 0\n1 0 0 0.5 0 0.5 0 0 0\n2 0 0 0.5 0 0.5 0 0 0\n');
    const result = impedanceFromThru(data, 'series-thru');
    if (!result.ok) throw new Error('expected a table');
    expect(result.value.table.frequencyHz).toEqual([1e6, 2e6]);
    expect(result.value.table.magnitudeOhm[0]).toBeCloseTo(100, 12);
    expect(result.notes[0]).toMatchObject({ line: 2 });
  });

  it('uses a reference impedance given by the caller over the file’s', () => {
    const data = read('# MHz S RI R 50\n1 0 0 0.5 0 0.5 0 0 0\n2 0 0 0.5 0 0.5 0 0 0\n');
    const result = impedanceFromThru(data, 'series-thru', { referenceOhm: 75 });
    if (!result.ok) throw new Error('expected a table');
    expect(result.value.table.magnitudeOhm[0]).toBeCloseTo(150, 12);
    expect(result.notes[0]!.message).toMatch(/75 Ω used instead of the file's 50 Ω/u);
  });

  it('notes a non-passive result (|S21| above 1 in series)', () => {
    const data = read('# MHz S RI R 50\n1 0 0 1.01 0 1.01 0 0 0\n2 0 0 0.5 0 0.5 0 0 0\n');
    const result = impedanceFromThru(data, 'series-thru');
    if (!result.ok) throw new Error('expected a table');
    expect(result.notes.map((n) => n.message).join(' ')).toMatch(/negative real part on line 2/u);
  });
});

describe('the invented series-thru example file', () => {
  const text = readFileSync(new URL('../../fixtures/measured/invented-winding-series-thru.s2p', import.meta.url), 'utf8');

  it('is labelled invented and reads as a 10 µH winding resonating near 28 MHz', () => {
    expect(text.split('\n')[0]).toMatch(/INVENTED/u);
    const data = read(text, 'invented-winding-series-thru.s2p');
    expect(data.options).toEqual({ frequencyUnit: 'MHz', format: 'DB', referenceOhm: 50 });
    const result = impedanceFromThru(data, 'series-thru');
    if (!result.ok) throw new Error(result.issues.map(formatLineIssue).join('\n'));
    const { table } = result.value;
    // Well below resonance the winding is 10 µH: |Z| = 2π·f·L.
    const at1MHz = table.frequencyHz.indexOf(1e6);
    expect(table.magnitudeOhm[at1MHz]! / (2 * Math.PI * 1e6 * 10e-6)).toBeCloseTo(1, 2);
    expect(table.phaseDeg[at1MHz]!).toBeGreaterThan(85);
    // Above the self-resonance at 1/(2π√(LC)) ≈ 27.7 MHz it turns capacitive.
    expect(table.phaseDeg[table.phaseDeg.length - 1]!).toBeLessThan(-80);
  });

  it('becomes a measured part with its origin, which a design accepts', () => {
    const data = read(text);
    const result = impedanceFromThru(data, 'series-thru');
    if (!result.ok) throw new Error('expected a table');
    const measured = measuredPartFromThru(result.value, 'invented-winding-series-thru.s2p');
    expect(measured.origin).toEqual({ format: 'touchstone-series-thru', referenceImpedance: 50, fileName: 'invented-winding-series-thru.s2p' });
    const design = buildDesign({ elements: [element('series-line1', measured), element('series-line2', measured)] });
    expect(readDesign(design).ok).toBe(true);
  });
});
