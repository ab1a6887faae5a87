import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type Complex, complex, magnitude, phaseDeg } from '../../src/io/complex.ts';
import { formatLineIssue, type LineIssue } from '../../src/io/text-issues.ts';
import {
  impedanceFromNetwork,
  impedanceToS11,
  impedanceToS21SeriesThru,
  impedanceToS21ShuntThru,
  type MeasurementFixture,
  measuredPartFromNetwork,
  s11ToImpedance,
  s21ToImpedanceSeriesThru,
  s21ToImpedanceShuntThru,
  type ThruFixture,
  thruFixtureSParameters,
  writeTouchstoneTwoPort,
} from '../../src/io/touchstone.ts';
import { networkEntry, networkReference, readTouchstone, type TouchstoneFormat, type TouchstoneNetwork } from '../../src/io/touchstone-network.ts';
import { readDesign } from '../../src/model/index.ts';
import { buildDesign, element } from '../support/design-builders.ts';
import { propertySettings } from '../support/property-settings.ts';

function read(text: string, fileName?: string): TouchstoneNetwork & { notes: readonly LineIssue[] } {
  const result = readTouchstone(text, fileName === undefined ? {} : { fileName });
  if (!result.ok) throw new Error(`expected the file to read, got:\n${result.issues.map(formatLineIssue).join('\n')}`);
  return { ...result.value, notes: result.notes };
}

function problems(text: string, fileName?: string): string[] {
  const result = readTouchstone(text, fileName === undefined ? {} : { fileName });
  if (result.ok) throw new Error('expected the file to be refused');
  return result.issues.map(formatLineIssue);
}

function notesOf(text: string, fileName?: string): string {
  return read(text, fileName)
    .notes.map((n) => n.message)
    .join(' | ');
}

function partOf(text: string, fixture: MeasurementFixture, fileName?: string): ReturnType<typeof impedanceFromNetwork> {
  return impedanceFromNetwork(read(text, fileName), fixture);
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
          expect({ frequencyUnit: data.frequencyUnit, format: data.format, parameter: data.parameter, referenceFrom: data.referenceFrom }).toEqual({
            frequencyUnit: unit,
            format,
            parameter: 'S',
            referenceFrom: 'option-line',
          });
          expect(Array.from(data.frequencyHz)).toEqual(frequencies);
          const converted = impedanceFromNetwork(data, fixture);
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
    expect([data.frequencyUnit, data.format, data.parameter, data.ports]).toEqual(['MHz', 'RI', 'S', 2]);
    expect(networkReference(data, 0, 1)).toEqual(complex(75));
    expect(data.lines[0]).toBe(2);
    expect(data.frequencyHz[0]).toBe(1e6);
  });

  it('applies the Touchstone defaults (GHz, MA, 50 Ω) without an option line, and says so', () => {
    const data = read('1 0.5 0 0.5 0 0.5 0 0.5 0\n');
    expect([data.frequencyUnit, data.format, data.referenceFrom]).toEqual(['GHz', 'MA', 'default']);
    expect(data.frequencyHz[0]).toBe(1e9);
    expect(data.notes.map((n) => n.message).join(' ')).toMatch(/no option line: the Touchstone defaults apply \(GHz, S, MA\).*default R 50 Ω applies/u);
  });

  it('gives an option line that is "#" alone the same "defaults apply" notes as a missing one', () => {
    const notes = notesOf('#\n1 0.5 0 0.5 0 0.5 0 0.5 0\n');
    expect(notes).toMatch(/the option line gives no values for GHz, S, MA: the Touchstone defaults apply/u);
    expect(notes).toMatch(/no reference impedance \(R\) on its option line: the Touchstone default R 50 Ω applies/u);
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
    const data = read(text, 'wrapped.s2p');
    expect(Array.from(data.lines)).toEqual([3, 7]);
    // Version 1 two-port order: S11, S21, S12, S22.
    expect(networkEntry(data, 0, 0, 0)).toEqual(complex(0.1, 0.2));
    expect(networkEntry(data, 0, 1, 0)).toEqual(complex(0.3, 0.4));
    expect(networkEntry(data, 0, 0, 1)).toEqual(complex(0.5, 0.6));
    expect(networkEntry(data, 0, 1, 1)).toEqual(complex(0.7, 0.8));
  });

  it('reads DB as 20·log10 |S| and angles in degrees', () => {
    const s21 = networkEntry(read('# MHz S DB R 50\n1 0 0 -6.020599913279624 90 0 0 0 0\n'), 0, 1, 0);
    expect(s21.re).toBeCloseTo(0, 12);
    expect(s21.im).toBeCloseTo(0.5, 12);
  });

  it('skips a noise-parameter block after two-port S-parameters', () => {
    const data = read('# GHz S MA R 50\n1 0 0 1 0 1 0 0 0\n2 0 0 1 0 1 0 0 0\n1 1.5 0.3 45 0.2\n2 1.6 0.3 50 0.2\n');
    expect(data.frequencyHz.length).toBe(2);
    expect(data.notes.map((n) => n.message).join(' ')).toMatch(/noise parameters/u);
  });

  it('keeps the first option line and notes any later one', () => {
    const data = read('# MHz S RI R 50\n# GHz S MA R 75\n1 0 0 1 0 1 0 0 0\n');
    expect(data.frequencyUnit).toBe('MHz');
    expect(data.notes.map((n) => n.message).join(' ')).toMatch(/ignored line 2/u);
  });

  it('tells the number of ports from the first record when the name does not (1, 2, 3 and 4 ports)', () => {
    expect(read('# MHz S RI R 50\n1 0.1 0.2\n2 0.1 0.2\n').ports).toBe(1);
    expect(read('# MHz S RI R 50\n1 0 0 1 0 1 0 0 0\n').ports).toBe(2);
    const row = '0.1 0 0.2 0 0.3 0';
    expect(read(`# MHz S RI R 50\n1 ${row}\n${row}\n${row}\n2 ${row}\n${row}\n${row}\n`).ports).toBe(3);
    const wide = '0.1 0 0.2 0 0.3 0 0.4 0';
    const four = read(`# MHz S RI R 50\n1 ${wide}\n${wide}\n${wide}\n${wide}\n`);
    expect(four.ports).toBe(4);
    // Version 1 files of three and more ports are written row by row.
    expect(networkEntry(four, 0, 0, 3)).toEqual(complex(0.4));
    expect(networkEntry(four, 0, 3, 0)).toEqual(complex(0.1));
  });

  it('reads version 1.1 per-port reference impedances on the option line', () => {
    const data = read('# MHz S RI R 50 75\n1 0 0 1 0 1 0 0 0\n', 'p.s2p');
    expect([networkReference(data, 0, 0).re, networkReference(data, 0, 1).re]).toEqual([50, 75]);
  });

  it('de-normalises version 1 Z data by R (Z/R is written) and reads version 2 Z data in ohms', () => {
    expect(networkEntry(read('# Hz Z RI R 50\n1000 2 1\n2000 2 1\n', 'z.s1p'), 0, 0, 0)).toEqual(complex(100, 50));
    expect(networkEntry(read('# Hz Y RI R 50\n1000 2 1\n2000 2 1\n', 'y.s1p'), 0, 0, 0)).toEqual(complex(0.04, 0.02));
    const v2 = '[Version] 2.0\n# Hz Z RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 2\n[Network Data]\n1000 2 1\n2000 2 1\n[End]\n';
    expect(networkEntry(read(v2), 0, 0, 0)).toEqual(complex(2, 1));
  });
});

describe('Touchstone 2.0 keyword files', () => {
  const header = (extra: string[], ports = 2, frequencies = 1): string =>
    ['[Version] 2.0', '# MHz S RI R 50', `[Number of Ports] ${ports}`, ...extra, `[Number of Frequencies] ${frequencies}`].join('\n');

  it('reads [Two-Port Data Order] 12_21 as S11 S12 S21 S22 and 21_12 as S11 S21 S12 S22', () => {
    const data = (order: string): TouchstoneNetwork => read(`${header([`[Two-Port Data Order] ${order}`])}\n[Network Data]\n1 1 0 2 0 3 0 4 0\n[End]\n`);
    expect(networkEntry(data('12_21'), 0, 0, 1)).toEqual(complex(2));
    expect(networkEntry(data('21_12'), 0, 0, 1)).toEqual(complex(3));
  });

  it('fills the other triangle of a Lower or Upper matrix', () => {
    const lower = read(`${header(['[Matrix Format] Lower'], 3)}\n[Network Data]\n1 1 0 2 0 3 0 4 0 5 0 6 0\n[End]\n`);
    // Lower: S11; S21 S22; S31 S32 S33.
    expect([networkEntry(lower, 0, 1, 0).re, networkEntry(lower, 0, 0, 1).re, networkEntry(lower, 0, 0, 2).re, networkEntry(lower, 0, 2, 1).re]).toEqual([2, 2, 4, 5]);
    const upper = read(`${header(['[Matrix Format] Upper'], 3)}\n[Network Data]\n1 1 0 2 0 3 0 4 0 5 0 6 0\n[End]\n`);
    // Upper: S11 S12 S13; S22 S23; S33.
    expect([networkEntry(upper, 0, 0, 2).re, networkEntry(upper, 0, 2, 0).re, networkEntry(upper, 0, 1, 1).re, networkEntry(upper, 0, 2, 1).re]).toEqual([3, 3, 4, 5]);
  });

  it('takes per-port [Reference] values, also from the next line, over the option line R', () => {
    const data = read(`${header(['[Two-Port Data Order] 12_21', '[Reference]', '25 100'])}\n[Network Data]\n1 0 0 1 0 1 0 0 0\n[End]\n`);
    expect(data.referenceFrom).toBe('reference-keyword');
    expect([networkReference(data, 0, 0).re, networkReference(data, 0, 1).re]).toEqual([25, 100]);
  });

  it('skips [Noise Data] and [Begin Information] blocks', () => {
    const text = `${header(['[Two-Port Data Order] 12_21', '[Begin Information]', 'anything here', '[End Information]'], 2, 1)}\n[Network Data]\n1 0 0 1 0 1 0 0 0\n[Noise Data]\n1 1.5 0.3 45 0.2\n[End]\n`;
    const data = read(text);
    expect(data.frequencyHz.length).toBe(1);
    expect(data.notes.map((n) => n.message).join(' ')).toMatch(/noise parameters/u);
  });

  it('refuses what it cannot read, each with its line', () => {
    expect(problems(`${header([])}\n[Network Data]\n1 0 0 1 0 1 0 0 0\n`)[0]).toMatch(/^line 5: a 2-port Touchstone 2 file must give \[Two-Port Data Order\]/u);
    expect(problems(`${header(['[Two-Port Data Order] 12_21'], 2, 3)}\n[Network Data]\n1 0 0 1 0 1 0 0 0\n[End]\n`)[0]).toMatch(/^line 5: \[Number of Frequencies\] says 3, the file holds 1 \(cut short\?\)/u);
    expect(problems('# MHz S RI R 50\n[Version] 2.0\n')[0]).toMatch(/^line 2: \[Version\] must be the first line/u);
    expect(problems('[Version] 3.0\n')[0]).toMatch(/^line 1: \[Version\] "3\.0" is not read/u);
    expect(problems('# MHz S RI R 50\n[Number of Ports] 2\n')[0]).toMatch(/^line 2: "\[Number of Ports\]" is a Touchstone 2 keyword, but the file does not start with/u);
    expect(problems(`${header(['[Mixed-Mode Order] D2,1 C2,1'])}\n`)[0]).toMatch(/mixed-mode data/u);
    expect(problems(`${header(['[Bogus] 1'])}\n`)[0]).toMatch(/^line 4: unknown keyword "\[Bogus\]"/u);
    expect(problems('[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n1 0 0\n')[0]).toMatch(/^line 5: numbers before \[Network Data\]/u);
    expect(problems(`${header(['[Reference] 50'])}\n[Network Data]\n`)[0]).toMatch(/\[Reference\] gives 1 of 2/u);
  });
});

describe('port impedances stated in comments', () => {
  const record = (f: number): string => `${f} 0.2 0 0.5 0 0.5 0 0.2 0`;

  it('uses per-frequency "! Port Impedance" comments when the option line gives no R, and says so', () => {
    const text = ['# GHZ S RI', record(1), '! Port Impedance 25 0 30 0', record(2), '! Port Impedance 26 0 31 0'].join('\n');
    const data = read(text, 'p.s2p');
    expect(data.referenceFrom).toBe('comments');
    expect([networkReference(data, 0, 1).re, networkReference(data, 1, 0).re]).toEqual([30, 26]);
    expect(data.notes.map((n) => n.message).join(' ')).toMatch(/no reference impedance \(R\) on its option line: the port impedances stated in its comments were used \("Port Impedance" on each frequency; port 1: 25 Ω/u);
  });

  it('reads a list written without a blank and over several comment lines', () => {
    const text = ['# GHZ S RI', record(1), '! Port Impedance25 0', '! 30 0'].join('\n');
    expect(networkReference(read(text, 'p.s2p'), 0, 1)).toEqual(complex(30));
  });

  it('reads "! Port[n] = 50+j0" and "! PortZ Port1:100+j0" but not port names', () => {
    const named = read(['! Port[1] = 50+j0', '! Port[2] = 75 Ohm', '# GHz S RI', record(1)].join('\n'), 'p.s2p');
    expect([named.referenceFrom, networkReference(named, 0, 1).re]).toEqual(['comments', 75]);
    const portz = read(['! PortZ Port1:100+j0 Port2:50-j1.5', '# GHz S RI', record(1)].join('\n'), 'p.s2p');
    expect(networkReference(portz, 0, 1)).toEqual(complex(50, -1.5));
    // HFSS names its ports "1", "WavePort1:1": names, not impedances.
    const names = read(['# GHz S RI', '! Port[1] = 1', '! Port[2] = WavePort1:1', record(1)].join('\n'), 'p.s2p');
    expect(names.referenceFrom).toBe('default');
  });

  it('keeps the option line R when the comments disagree, and says so', () => {
    const notes = notesOf(['# GHz S RI R 50', record(1), '! Port Impedance 30 0 30 0'].join('\n'), 'p.s2p');
    expect(notes).toMatch(/the comments state port impedances .* port 1: 30 Ω\) other than the option line's R; those were used/u);
  });

  it('refuses a "Port Impedance" list of the wrong length or on only some frequencies', () => {
    expect(problems(['# GHz S RI', record(1), '! Port Impedance 30 0 30 0 30 0'].join('\n'), 'p.s2p')[0]).toMatch(/gives 6 numbers; a 2-port file takes 4/u);
    expect(problems(['# GHz S RI', record(1), '! Port Impedance 30 0 30 0', record(2), record(3), '! Port Impedance 30 0 30 0'].join('\n'), 'p.s2p')[0]).toMatch(
      /given for 2 of the file's 3 frequencies/u,
    );
  });
});

describe('one-port files: a part measured by reflection, or Z data', () => {
  it('Z = Z0·(1 + S11)/(1 − S11): S11 = 1/3 in 50 Ω is 100 Ω (reflection coefficient of 100 Ω on 50 Ω, Pozar eq. 2.35)', () => {
    expectClose(impedanceToS11(complex(100), 50), complex(1 / 3));
    expectClose(s11ToImpedance(complex(1 / 3), 50), complex(100));
    const result = partOf('# MHz S RI R 50\n1 0.3333333333333333 0\n2 0 0\n', 'reflection', 'r.s1p');
    if (!result.ok) throw new Error(result.issues.map(formatLineIssue).join('\n'));
    expect(result.value.table.magnitudeOhm[0]).toBeCloseTo(100, 9);
    expect(result.value.table.magnitudeOhm[1]).toBeCloseTo(50, 12);
  });

  it('impedance-analyser data "# Hz Z MA R 1" is the impedance itself', () => {
    const result = partOf('# Hz Z MA R 1\n1000 12.5 45\n2000 25 89\n', 'reflection', 'bead.s1p');
    if (!result.ok) throw new Error('expected a table');
    expect(result.value.table.frequencyHz).toEqual([1000, 2000]);
    result.value.table.magnitudeOhm.forEach((m, i) => expect(m).toBeCloseTo([12.5, 25][i]!, 12));
    result.value.table.phaseDeg.forEach((p, i) => expect(p).toBeCloseTo([45, 89][i]!, 12));
    expect(measuredPartFromNetwork(result.value, 'bead.s1p').origin).toEqual({ format: 'touchstone-one-port-impedance', fileName: 'bead.s1p' });
  });

  it('refuses a thru fixture on a one-port and reflection on a two-port', () => {
    const one = partOf('# MHz S RI R 50\n1 0.3 0\n2 0.3 0\n', 'series-thru', 'r.s1p');
    expect(one.ok ? '' : one.issues[0]!.message).toMatch(/a 1-port file holds one reflection/u);
    const two = partOf('# MHz S RI R 50\n1 0 0 0.5 0 0.5 0 0 0\n2 0 0 0.5 0 0.5 0 0 0\n', 'reflection');
    expect(two.ok).toBe(false);
  });

  it('refuses S data referred to a complex impedance, naming the port and line', () => {
    const result = partOf('# GHz S RI R (50+50j)\n1 0.2 0\n2 0.2 0\n', 'reflection', 'c.s1p');
    expect(result.ok ? '' : formatLineIssue(result.issues[0]!)).toMatch(/^line 2: the reference impedance of port 1 is complex here \(50 \+ j50 Ω\): .*more than one definition/u);
  });

  it('refuses an open (S11 = 1) and a short (S11 = −1) with their lines', () => {
    const open = partOf('# MHz S RI R 50\n1 1 0\n2 0 0\n', 'reflection', 'o.s1p');
    expect(open.ok ? '' : formatLineIssue(open.issues[0]!)).toMatch(/^line 2: S11 = 1\.00000 \+ j0\.00000 makes the reflection impedance unbounded/u);
    const short = partOf('# MHz S RI R 50\n1 -1 0\n2 0 0\n', 'reflection', 's.s1p');
    expect(short.ok ? '' : formatLineIssue(short.issues[0]!)).toMatch(/makes the reflection impedance zero/u);
  });
});

describe('refusing bad Touchstone files with line numbers', () => {
  it('a file whose name says another number of ports than its data', () => {
    expect(problems('# MHz S RI R 50\n1 0.1 0.2\n2 0.1 0.2\n3 0.1 0.2\n', 'x.s2p')[0]).toMatch(
      /^line 3: 3 values continue the record of line 2, which needs 6 more in whole pairs \(this looks like a 1-port file: name it \.s1p\)/u,
    );
  });

  it('a record cut short at the end', () => {
    expect(problems('# MHz S RI R 50\n1 0 0 1 0 1 0 0 0\n2 0 0 1 0\n')).toEqual(['line 3: the record starting here has 5 of 9 values before the end']);
  });

  it('a pair split over two lines', () => {
    expect(problems('# MHz S RI R 50\n1 0 0 1\n0 1 0 0 0\n', 'x.s2p')[0]).toMatch(/^line 2: 4 values; .*a record starts with a frequency followed by whole pairs/u);
  });

  it('a line with more values than a two-port record', () => {
    expect(problems('# MHz S RI R 50\n1 0 0 1 0 1 0 0 0 1 0 0 0\n', 'x.s2p')[0]).toMatch(/^line 2: 13 values; a 2-port record is a frequency and 4 pairs \(9 values\)/u);
  });

  it('text where a number belongs', () => {
    expect(problems('# MHz S RI R 50\n1 0 0 1 0 1 0 x 0\n')).toEqual(['line 2: "x" is not a number']);
  });

  it('frequencies that do not rise', () => {
    expect(problems('# MHz S RI R 50\n2 0 0 1 0 1 0 0 0\n2 0 0 1 0 1 0 0 0\n')[0]).toMatch(
      /^line 3: frequency 2000000 Hz is not above the 2000000 Hz of line 2/u,
    );
  });

  it('an option line with H-parameters, an unknown token or no reference value', () => {
    expect(problems('# MHz H RI R 50\n1 0 0 1 0 1 0 0 0\n')[0]).toMatch(/^line 1: option line: H-parameters are not read/u);
    expect(problems('# MHz S XY R 50\n1 0 0 1 0 1 0 0 0\n')[0]).toMatch(/^line 1: option line: unknown option "XY"/u);
    expect(problems('# MHz S RI R\n1 0 0 1 0 1 0 0 0\n')[0]).toMatch(/^line 1: option line: R must be followed by the reference impedance/u);
  });

  it('an option line after the data', () => {
    expect(problems('1 0 0 1 0 1 0 0 0\n# MHz S RI R 50\n')[0]).toBe('line 2: the option line must come before the data');
  });

  it('a file without data', () => {
    expect(problems('! nothing here\n# MHz S RI R 50\n')[0]).toMatch(/no data/u);
  });
});

describe('impedance from a thru fixture', () => {
  it('refuses a series-thru point where S21 = 0 (an open part) with its line', () => {
    const result = partOf('# MHz S RI R 50\n1 1 0 0 0 0 0 1 0\n2 0 0 0.5 0 0.5 0 0 0\n', 'series-thru');
    expect(result.ok).toBe(false);
    if (!result.ok) expect(formatLineIssue(result.issues[0]!)).toMatch(/^line 2: S21 = .* makes the series-thru impedance unbounded/u);
  });

  it('refuses a shunt-thru point where S21 = 1 (no part) with its line', () => {
    const result = partOf('# MHz S RI R 50\n1 0 0 0.5 0 0.5 0 0 0\n2 0 0 1 0 1 0 0 0\n', 'shunt-thru');
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.issues[0]!.line).toBe(3);
  });

  it('leaves out a 0 Hz point and notes it', () => {
    const result = partOf('# MHz S RI R 50\n0 0 0 1 0 1 0 0 0\n1 0 0 0.5 0 0.5 0 0 0\n2 0 0 0.5 0 0.5 0 0 0\n', 'series-thru');
    if (!result.ok) throw new Error('expected a table');
    expect(result.value.table.frequencyHz).toEqual([1e6, 2e6]);
    expect(result.value.table.magnitudeOhm[0]).toBeCloseTo(100, 12);
    expect(result.notes[0]).toMatchObject({ line: 2 });
  });

  it('uses a reference impedance given by the caller over the file’s', () => {
    const result = impedanceFromNetwork(read('# MHz S RI R 50\n1 0 0 0.5 0 0.5 0 0 0\n2 0 0 0.5 0 0.5 0 0 0\n'), 'series-thru', { referenceOhm: 75 });
    if (!result.ok) throw new Error('expected a table');
    expect(result.value.table.magnitudeOhm[0]).toBeCloseTo(150, 12);
    expect(result.notes[0]!.message).toMatch(/75 Ω used instead of the file's 50 Ω/u);
  });

  it('series-thru with unequal port references: Z = 2·√(R1·R2)/S21 − R1 − R2 (100 Ω between 50 Ω and 200 Ω)', () => {
    // A series Z between R1 and R2 passes S21 = 2·√(R1·R2)/(R1 + R2 + Z) (power-wave definition, real references).
    const s21 = (2 * Math.sqrt(50 * 200)) / (50 + 200 + 100);
    const result = partOf(`# MHz S RI R 50 200\n1 0 0 ${s21} 0 ${s21} 0 0 0\n2 0 0 ${s21} 0 ${s21} 0 0 0\n`, 'series-thru', 'p.s2p');
    if (!result.ok) throw new Error('expected a table');
    expect(result.value.table.magnitudeOhm[0]).toBeCloseTo(100, 9);
    expect(result.value.referenceOhm).toBeUndefined();
  });

  it('notes a non-passive result (|S21| above 1 in series)', () => {
    const result = partOf('# MHz S RI R 50\n1 0 0 1.01 0 1.01 0 0 0\n2 0 0 0.5 0 0.5 0 0 0\n', 'series-thru');
    if (!result.ok) throw new Error('expected a table');
    expect(result.notes.map((n) => n.message).join(' ')).toMatch(/negative real part on line 2/u);
  });
});

describe('the invented series-thru example file', () => {
  const text = readFileSync(new URL('../../fixtures/measured/invented-winding-series-thru.s2p', import.meta.url), 'utf8');

  it('is labelled invented and reads as a 10 µH winding resonating near 28 MHz', () => {
    expect(text.split('\n')[0]).toMatch(/INVENTED/u);
    const data = read(text, 'invented-winding-series-thru.s2p');
    expect([data.frequencyUnit, data.format, networkReference(data, 0, 0).re]).toEqual(['MHz', 'DB', 50]);
    const result = impedanceFromNetwork(data, 'series-thru');
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
    const result = impedanceFromNetwork(read(text), 'series-thru');
    if (!result.ok) throw new Error('expected a table');
    const measured = measuredPartFromNetwork(result.value, 'invented-winding-series-thru.s2p');
    expect(measured.origin).toEqual({ format: 'touchstone-series-thru', referenceImpedance: 50, fileName: 'invented-winding-series-thru.s2p' });
    const design = buildDesign({ elements: [element('series-line1', measured), element('series-line2', measured)] });
    expect(readDesign(design).ok).toBe(true);
  });
});
