import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type MaskCsv, type MaskCsvOptions, maskToCsv, readMaskCsv } from '../../src/io/mask-csv.ts';
import { formatLineIssue, type LineIssue } from '../../src/io/text-issues.ts';
import type { LimitMask } from '../../src/model/design.ts';
import { DETECTORS, limitMaskSchema } from '../../src/model/emissions-schema.ts';
import { copyPreset, LIMIT_PRESETS } from '../../src/spectrum/limit-presets.ts';
import { propertySettings } from '../support/property-settings.ts';

/**
 * Mask files (docs/limits.md, "Mask files"). Limit values from standards used here are the class B
 * and class A lines of 47 CFR §15.107(a)/(b) (status V in references.md §1.1, CFR text
 * as revised October 2008), through the FCC presets; every other mask is INVENTED and says so.
 */

function read(text: string, options: MaskCsvOptions = {}): MaskCsv & { notes: readonly LineIssue[] } {
  const result = readMaskCsv(text, options);
  if (!result.ok) throw new Error(`expected the mask to read, got:\n${result.issues.map(formatLineIssue).join('\n')}`);
  return { ...result.value, notes: result.notes };
}

function problems(text: string, options: MaskCsvOptions = {}): LineIssue[] {
  const result = readMaskCsv(text, options);
  if (result.ok) throw new Error(`expected the mask to be refused, but it read ${result.value.mask.frequencyHz.length} points`);
  return [...result.issues];
}

const fixture = (name: string): string => readFileSync(new URL(`../../fixtures/masks/${name}`, import.meta.url), 'utf8');

// 47 CFR §15.107(a) class B quasi-peak (V), as the preset holds it.
const CLASS_B_QP = { frequencyHz: [150e3, 500e3, 5e6, 5e6, 30e6], levelDbuV: [66, 56, 56, 60, 60] };

describe('reading a mask file', () => {
  it('reads metadata comments, a header with MHz and dBuV, and a step as two lines at one frequency', () => {
    const got = read(
      '# id: fcc-b-qp\n# name: FCC class B QP\n# detector: quasi-peak\n# origin: 47 CFR §15.107(a), status V\nfrequency (MHz),level (dBuV)\n0.15,66\n0.5,56\n5,56\n5,60\n30,60\n',
    );
    expect(got.mask).toEqual({ id: 'fcc-b-qp', name: 'FCC class B QP', detector: 'quasi-peak', origin: '47 CFR §15.107(a), status V', ...CLASS_B_QP });
    expect(got).toMatchObject({ delimiter: ',', headerLine: 5, frequencyUnit: 'MHz', frequencyUnitFrom: 'header', decimalComma: false });
    expect(got.lines).toEqual([6, 7, 8, 9, 10]);
    expect(got.notes).toEqual([]);
  });

  it('reads semicolons with decimal commas and kHz from the header (INVENTED values)', () => {
    const got = read('Frequenz (kHz);Grenzwert (dBµV)\n150;59,5\n500;49,5\n30000;49,5\n', { detector: 'average', name: 'invented' });
    expect(got.mask.frequencyHz).toEqual([150e3, 500e3, 30e6]);
    expect(got.mask.levelDbuV).toEqual([59.5, 49.5, 49.5]);
    expect(got).toMatchObject({ delimiter: ';', decimalComma: true, frequencyUnit: 'kHz' });
  });

  it('reads tabs, columns in either order, and "dB(uV)" (INVENTED values)', () => {
    const got = read('Limit dB(uV)\tf [MHz]\n70\t0,15\n60\t30\n', { detector: 'peak', name: 'invented' });
    expect(got.mask.frequencyHz).toEqual([150e3, 30e6]);
    expect(got.mask.levelDbuV).toEqual([70, 60]);
    expect(got.delimiter).toBe('\t');
  });

  it('without a header: Hz by default, or the unit passed; says what it assumed (INVENTED values)', () => {
    const byDefault = read('150000,70\n30000000,60\n', { detector: 'peak', name: 'invented' });
    expect(byDefault.mask.frequencyHz).toEqual([150e3, 30e6]);
    expect(byDefault.frequencyUnitFrom).toBe('default');
    expect(byDefault.notes.map((n) => n.message)).toEqual([
      'no frequency unit in a header: frequencies read as Hz',
      'no dBµV in a header: levels read as dBµV',
      'no id in the file: "invented", made from the name',
    ]);
    const inMHz = read('0.15,70\n30,60\n', { detector: 'peak', name: 'invented', frequencyUnit: 'MHz' });
    expect(inMHz.mask.frequencyHz).toEqual([150e3, 30e6]);
    expect(inMHz.frequencyUnitFrom).toBe('option');
  });

  it('takes detector, name, id and origin from the options when the file has none, and makes an id from the name', () => {
    const got = read('0.15,70\n30,60\n', { frequencyUnit: 'MHz', detector: 'average', name: 'Bench line (invented)', origin: 'INVENTED' });
    expect(got.mask).toMatchObject({ id: 'Bench-line-invented', name: 'Bench line (invented)', detector: 'average', origin: 'INVENTED' });
    expect(got.notes.map((n) => n.message)).toContain('no id in the file: "Bench-line-invented", made from the name');
    const named = read('# name: From the file\n# detector: AVG\n0.15,70\n30,60\n', { frequencyUnit: 'MHz', name: 'from the option', id: 'opt-id' });
    expect(named.mask).toMatchObject({ name: 'From the file', id: 'opt-id', detector: 'average' });
    const unnamed = read('# detector: pk\n0.15,70\n30,60\n', { frequencyUnit: 'MHz' });
    expect(unnamed.mask).toMatchObject({ name: 'imported limit mask', id: 'imported-limit-mask', detector: 'peak' });
  });

  it('accepts the usual detector spellings', () => {
    for (const [written, detector] of [
      ['QP', 'quasi-peak'],
      ['Quasi Peak', 'quasi-peak'],
      ['quasi_peak', 'quasi-peak'],
      ['AV', 'average'],
      ['Average', 'average'],
      ['PK', 'peak'],
    ] as const) {
      expect(read(`# detector: ${written}\n# name: n\n1e5,1\n1e6,2\n`).mask.detector).toBe(detector);
    }
  });

  it('reads the example files in fixtures/masks', () => {
    const fcc = read(fixture('fcc-15.107-class-b-qp.csv'));
    expect(fcc.mask).toEqual(copyPreset('fcc-15.107-class-b-qp'));
    const inHouse = read(fixture('invented-in-house-class-b-qp-less-6.5db.csv'));
    expect(inHouse.mask).toMatchObject({ detector: 'quasi-peak', frequencyHz: CLASS_B_QP.frequencyHz, levelDbuV: CLASS_B_QP.levelDbuV.map((l) => l - 6.5) });
    expect(inHouse).toMatchObject({ delimiter: ';', decimalComma: true, frequencyUnit: 'kHz' });
    const dc = read(fixture('invented-dc-input-peak-tab.csv'));
    expect(dc.mask).toMatchObject({ id: 'invented-dc-input-peak', detector: 'peak', frequencyHz: [150e3, 530e3, 1.8e6, 1.8e6, 108e6] });
    expect(dc).toMatchObject({ delimiter: '\t', frequencyUnitFrom: 'default', headerLine: undefined });
  });
});

describe('every line that cannot be used is reported, with its number and why', () => {
  it('the example file with mistakes', () => {
    expect(problems(fixture('invented-with-errors.csv'))).toEqual([
      { line: 4, message: 'the detector is already given on line 3' },
      { line: 8, message: '3 values, expected 2 (frequency, level); with commas between the values, write decimals with a point (or separate with semicolons)' },
      { line: 9, message: 'frequency "abc" is not a number' },
      { line: 10, message: '1 value, expected 2 (frequency, level)' },
      { line: 12, message: 'frequency 2000000 Hz is below the 5000000 Hz of line 11: frequencies must not fall' },
      { line: 15, message: '30000000 Hz is already on lines 13 and 14: a step is two points at one frequency, not three' },
    ]);
  });

  it('empty, negative and unreadable values, an open quote, a stray text line', () => {
    const text = ['# detector: qp', '# name: invented', 'f (Hz),level (dBuV)', '1e5,60', '2e5,', '-3e5,50', '"4e5,50', 'see note', '5e5,"x"', '6e5,40'].join('\n');
    expect(problems(text)).toEqual([
      { line: 5, message: '1 value, expected 2 (frequency, level)' },
      { line: 6, message: 'frequency must be positive, got -300000' },
      { line: 7, message: 'a quoted field is not closed' },
      { line: 8, message: '1 value, expected 2 (frequency, level)' },
      { line: 9, message: 'level "x" is not a number' },
    ]);
  });

  it('text lines before the header, a header that names no columns, a level that is not dBµV', () => {
    expect(problems('title\nfrequency (Hz),level (dBuV)\n1e5,1\n1e6,2\n', { detector: 'peak' })).toEqual([
      { line: 1, message: 'the line "title" is neither a header nor data; start notes with #' },
    ]);
    expect(problems('a,b\n1e5,1\n1e6,2\n', { detector: 'peak' })[0]).toEqual({
      line: 1,
      message: 'the line "a b" is neither data nor a header naming two columns, frequency and level (such as "frequency (MHz)", "level (dBuV)"); start notes with #',
    });
    expect(problems('frequency (Hz),level (dBm)\n1e5,1\n1e6,2\n', { detector: 'peak' })).toEqual([
      { line: 1, message: 'the header "frequency (Hz)", "level (dBm)" gives levels in dBm; a limit mask is in dBµV' },
    ]);
    expect(problems('frequency (MHz),E (dBuV/m)\n1,1\n2,2\n', { detector: 'peak' })[0]!.message).toMatch(/gives levels in dBuV\/m; a limit mask is in dBµV/u);
  });

  it('a detector missing, unknown, or contradicting the one asked for; a unit contradicting the header', () => {
    expect(problems('1e5,1\n1e6,2\n')).toEqual([{ line: 0, message: 'no detector: add a line "# detector: quasi-peak" (or peak, average) or choose one when importing' }]);
    expect(problems('# detector: rms\n1e5,1\n1e6,2\n')).toEqual([{ line: 1, message: 'unknown detector "rms": expected peak, quasi-peak, average (or pk, qp, av)' }]);
    expect(problems('# detector: average\n1e5,1\n1e6,2\n', { detector: 'quasi-peak' })).toEqual([
      { line: 1, message: 'the file gives the detector average but quasi-peak was asked for; drop one of the two' },
    ]);
    expect(problems('f (kHz),level\n150,1\n500,2\n', { detector: 'peak', frequencyUnit: 'MHz' })).toEqual([
      { line: 1, message: 'the header gives frequencies in kHz but MHz was asked for; drop one of the two' },
    ]);
  });

  it('a file with no data, or one point; a value the schema refuses is traced to its line', () => {
    expect(problems('# just a comment\n\n')).toEqual([
      { line: 0, message: 'no data lines found: expected lines of two numbers (frequency, level in dBµV) separated by commas, semicolons or tabs' },
    ]);
    expect(problems('1e5;1\n', { detector: 'peak', delimiter: ',' })[0]!.message).toMatch(/separated by commas$/u);
    expect(problems('1e5,1\n', { detector: 'peak' })).toEqual([{ line: 0, message: 'a mask needs at least 2 points, found 1' }]);
    const badId = problems('# detector: peak\n# id: 9lives\n1e5,1\n1e6,2\n');
    expect(badId).toHaveLength(1);
    expect(badId[0]).toMatchObject({ line: 2 });
    expect(badId[0]!.message).toMatch(/^id: an id starts with a letter/u);
    expect(problems('# detector: peak\n# name: "unclosed\n1e5,1\n1e6,2\n')).toEqual([{ line: 2, message: 'the name "\\"unclosed" starts with a double quote but is not one JSON string' }]);
  });

  it('reports real line numbers across \\r\\n line ends and a byte-order mark', () => {
    expect(problems('\uFEFF# detector: peak\r\n1e5,1\r\nx,2\r\n1e6,3\r\n')).toEqual([{ line: 3, message: 'frequency "x" is not a number' }]);
  });
});

describe('writing a mask: maskToCsv reads back to the same mask', () => {
  it('every preset, in every frequency unit and separator', () => {
    for (const preset of LIMIT_PRESETS) {
      const mask = copyPreset(preset.id);
      for (const frequencyUnit of ['Hz', 'kHz', 'MHz', 'GHz'] as const) {
        for (const delimiter of [',', ';', '\t'] as const) {
          const back = read(maskToCsv(mask, { frequencyUnit, delimiter }));
          expect(back.mask).toEqual(mask);
          expect(back).toMatchObject({ frequencyUnit, delimiter, frequencyUnitFrom: 'header' });
          expect(back.notes).toEqual([]);
        }
      }
    }
  });

  it('writes the documented layout', () => {
    expect(maskToCsv(copyPreset('fcc-15.107-class-a-qp'), { frequencyUnit: 'MHz' }).split('\n').slice(1)).toEqual([
      '# id: fcc-15.107-class-a-qp',
      '# name: FCC Part 15 class A, quasi-peak',
      '# detector: quasi-peak',
      `# origin: ${copyPreset('fcc-15.107-class-a-qp').origin!}`,
      'frequency (MHz),level (dBuV)',
      '0.15,79',
      '0.5,79',
      '0.5,73',
      '30,73',
      '',
    ]);
  });

  it('quotes metadata that would not read back plain, and keeps -0 and awkward doubles (INVENTED mask)', () => {
    const mask: LimitMask = {
      id: 'a.b_c-1',
      name: '  leading and trailing blanks  ',
      detector: 'peak',
      frequencyHz: [5e-324 * 1e300, 0.1 + 0.2, 1 / 3, 1 / 3, Math.PI * 1e7],
      levelDbuV: [-0, 1e-7, -123.456789012345, 1.7976931348623157e308, 2 ** -30],
      origin: 'line one\nline two: "quoted", tab\there',
    };
    const text = maskToCsv(mask);
    expect(text).toContain('# name: "  leading and trailing blanks  "');
    expect(text).toContain('# origin: "line one\\nline two: \\"quoted\\", tab\\there"');
    const back = read(text).mask;
    expect(back).toEqual(mask);
    expect(Object.is(back.levelDbuV[0], -0)).toBe(true);
  });

  it('leaves out an absent origin, and reads back without one', () => {
    const { origin: _origin, ...mask } = copyPreset('cispr22-class-b-av');
    const text = maskToCsv(mask);
    expect(text).not.toContain('# origin');
    expect(read(text).mask).toEqual(mask);
    expect('origin' in read(text).mask).toBe(false);
  });

  it('any valid mask round-trips in Hz (property)', () => {
    const text = fc.string({ minLength: 1, maxLength: 60 });
    const mask = fc
      .record({
        id: fc.stringMatching(/^[A-Za-z][A-Za-z0-9_.-]{0,20}$/u),
        name: text,
        detector: fc.constantFrom(...DETECTORS),
        origin: fc.option(fc.string({ maxLength: 80 }), { nil: undefined }),
        points: fc.array(fc.record({ f: fc.double({ min: 1, max: 1e11, noNaN: true }), level: fc.double({ min: -1e3, max: 1e3, noNaN: true }) }), {
          minLength: 2,
          maxLength: 30,
        }),
      })
      .map(({ points, origin, ...rest }): LimitMask => {
        const sorted = [...points].sort((a, b) => a.f - b.f);
        return {
          ...rest,
          frequencyHz: sorted.map((p) => p.f),
          levelDbuV: sorted.map((p) => p.level),
          ...(origin === undefined ? {} : { origin }),
        };
      })
      .filter((m) => limitMaskSchema.safeParse(m).success);
    fc.assert(
      fc.property(mask, (m) => {
        const result = readMaskCsv(maskToCsv(m));
        expect(result.ok && result.value.mask).toEqual(m);
      }),
      propertySettings(300),
    );
  });
});

describe('the mask reader on arbitrary text (property)', () => {
  const pieces = fc
    .array(
      fc.oneof(
        fc.constantFrom('\n', '\r\n', ',', ';', '\t', ' ', '"', '#', '# detector: qp\n', '# name:', '# id: ', 'Hz', 'MHz', 'dBuV', 'dBm', 'freq', 'level', '-'),
        fc.double({ noNaN: true }).map(String),
        fc.integer({ min: -5, max: 1e8 }).map(String),
        fc.string({ maxLength: 4 }),
      ),
      { maxLength: 80 },
    )
    .map((parts) => parts.join(''));

  it('never throws; a mask it returns validates, a problem it reports has a real line', () => {
    fc.assert(
      fc.property(pieces, (text) => {
        const result = readMaskCsv(text, { detector: 'quasi-peak' });
        if (result.ok) expect(limitMaskSchema.safeParse(result.value.mask).success).toBe(true);
        else {
          expect(result.issues.length).toBeGreaterThan(0);
          const lines = text.split(/\r\n|\r|\n/u).length;
          for (const issue of result.issues) expect(issue.line).toBeLessThanOrEqual(lines);
        }
      }),
      propertySettings(1500),
    );
  });
});
