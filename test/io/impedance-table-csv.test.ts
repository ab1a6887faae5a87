import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { sweepDesign } from '../../src/engine/index.ts';
import { type ImpedanceTableCsv, type ImpedanceTableCsvOptions, measuredPartFromTable, readImpedanceTableCsv } from '../../src/io/impedance-table-csv.ts';
import { formatLineIssue, type LineIssue } from '../../src/io/text-issues.ts';
import { readDesign } from '../../src/model/index.ts';
import { buildDesign, element } from '../support/design-builders.ts';

function read(text: string, options: ImpedanceTableCsvOptions = {}): ImpedanceTableCsv & { notes: readonly LineIssue[] } {
  const result = readImpedanceTableCsv(text, options);
  if (!result.ok) throw new Error(`expected the table to read, got:\n${result.issues.map(formatLineIssue).join('\n')}`);
  return { ...result.value, notes: result.notes };
}

function problems(text: string, options: ImpedanceTableCsvOptions = {}): LineIssue[] {
  const result = readImpedanceTableCsv(text, options);
  if (result.ok) throw new Error(`expected the table to be refused, but it read ${result.value.table.frequencyHz.length} points`);
  return [...result.issues];
}

const expected = { frequencyHz: [1e6, 2e6, 5e6], magnitudeOhm: [10, 22.5, 60], phaseDeg: [85, 80.5, -12] };

describe('reading a measured |Z| table', () => {
  it('reads a comma-separated file with a header naming units', () => {
    const got = read('Frequency (Hz),|Z| (Ohm),Phase (deg)\n1e6,10,85\n2e6,22.5,80.5\n5e6,60,-12\n');
    expect(got.table).toEqual(expected);
    expect(got).toMatchObject({ delimiter: ',', headerLine: 1, frequencyUnit: 'Hz', frequencyUnitFrom: 'header', decimalComma: false });
    expect(got.lines).toEqual([2, 3, 4]);
  });

  it('reads a table without a header, whitespace separated, frequencies in Hz by default (and says so)', () => {
    const got = read('   1000000    10   85\n2000000\t 22.5  80.5\n\n5e6 60 -12   \n');
    expect(got.table).toEqual(expected);
    expect(got.delimiter).toBe('whitespace');
    expect(got.headerLine).toBeUndefined();
    expect(got.frequencyUnitFrom).toBe('default');
    expect(got.notes.map((n) => n.message).join(' ')).toMatch(/read as Hz/u);
  });

  it('reads semicolons with a decimal comma and kHz from the header', () => {
    const got = read('f/kHz;Z/Ohm;phase/deg\n1000;10;85\n2000;22,5;80,5\n5000;60;-12\n');
    expect(got.table).toEqual(expected);
    expect(got).toMatchObject({ delimiter: ';', decimalComma: true, frequencyUnit: 'kHz' });
  });

  it('reads tabs with a decimal comma and MHz from the header', () => {
    const got = read('Frequency [MHz]\tImpedance [Ω]\tPhase [°]\n1\t10\t85\n2\t22,5\t80,5\n5\t60\t-12\n');
    expect(got.table).toEqual(expected);
    expect(got).toMatchObject({ delimiter: '\t', decimalComma: true, frequencyUnit: 'MHz' });
  });

  it('reads a decimal comma in a whitespace-separated table', () => {
    const got = read('1 10 85\n2 22,5 80,5\n5 60 -12\n', { frequencyUnit: 'MHz' });
    expect(got.table).toEqual(expected);
    expect(got).toMatchObject({ delimiter: 'whitespace', decimalComma: true, frequencyUnitFrom: 'option' });
  });

  it('takes the frequency unit from a parameter when the file has no header', () => {
    const got = read('1,10,85\n2,22.5,80.5\n5,60,-12\n', { frequencyUnit: 'MHz' });
    expect(got.table.frequencyHz).toEqual([1e6, 2e6, 5e6]);
    expect(got.frequencyUnitFrom).toBe('option');
  });

  it('refuses a parameter unit that contradicts the header', () => {
    const [issue] = problems('Frequency (kHz),|Z|,Phase\n1,10,85\n2,20,80\n', { frequencyUnit: 'MHz' });
    expect(issue).toMatchObject({ line: 1 });
    expect(issue!.message).toMatch(/header gives frequencies in kHz but MHz was asked for/u);
  });

  it('finds the columns by name in any order and ignores extra columns', () => {
    const got = read('Phase (deg),Trace,Frequency (MHz),|Z| (Ohm)\n85,a,1,10\n80.5,a,2,22.5\n-12,a,5,60\n');
    expect(got.table).toEqual(expected);
  });

  it('reads a whitespace header whose names hold spaces', () => {
    const got = read('Frequency (MHz)   |Z| (Ohm)   Phase (deg)\n1 10 85\n2 22.5 80.5\n5 60 -12\n');
    expect(got.table).toEqual(expected);
    expect(got.frequencyUnit).toBe('MHz');
  });

  it('scales |Z| in kΩ and converts phase in radians', () => {
    const got = read('freq_Hz,Zmag_kohm,phase_rad\n1e6,0.01,0\n2e6,0.0225,1.5707963267948966\n');
    expect(got.table.magnitudeOhm).toEqual([10, 22.5]);
    expect(got.table.phaseDeg[1]).toBeCloseTo(90, 12);
  });

  it('refuses |Z| in dB with a message that says so', () => {
    const [issue] = problems('Frequency (Hz),|Z| (dBOhm),Phase (deg)\n1e6,20,85\n2e6,27,80\n');
    expect(issue!.message).toMatch(/in dB; export \|Z\| in ohms/u);
  });

  it('skips comments and preamble lines and keeps the file’s line numbers', () => {
    const text = [
      '! INVENTED example',
      'Analyser export',
      '% another comment',
      'Frequency (Hz),|Z| (Ohm),Phase (deg)',
      '// yet another',
      '1e6,10,85',
      '2e6,22.5,80.5',
      '5e6,60,-12',
    ].join('\r\n');
    const got = read(text);
    expect(got.headerLine).toBe(4);
    expect(got.lines).toEqual([6, 7, 8]);
    expect(got.table).toEqual(expected);
  });

  it('skips a title line that names one column at most, and says so', () => {
    const got = read('Impedance of an invented bead\n1e6,10,85\n2e6,22.5,80.5\n5e6,60,-12\n');
    expect(got.table).toEqual(expected);
    expect(got.headerLine).toBeUndefined();
    expect(got.notes.map(formatLineIssue).join(' ')).toMatch(/line 1: skipped a text line that names no columns/u);
  });

  it('reads quoted header names and drops a byte-order mark', () => {
    const got = read('\uFEFF"Frequency (Hz)","|Z| (Ohm)","Phase (deg)"\n1e6,10,85\n2e6,22.5,80.5\n5e6,60,-12\n');
    expect(got.table).toEqual(expected);
  });

  it('reverses a table swept downwards, and says so', () => {
    const got = read('5e6,60,-12\n2e6,22.5,80.5\n1e6,10,85\n');
    expect(got.table).toEqual(expected);
    expect(got.lines).toEqual([3, 2, 1]);
    expect(got.notes.map((n) => n.message).join(' ')).toMatch(/reversed/u);
  });

  it('wraps a phase outside ±180° and notes the lines', () => {
    const got = read('1e6,10,270\n2e6,10,-190\n3e6,10,10\n');
    expect(got.table.phaseDeg).toEqual([-90, 170, 10]);
    expect(got.notes.map((n) => n.message).join(' ')).toMatch(/wrapped into range on lines 1 and 2/u);
  });

  it('reports every rejected line with its number and reason', () => {
    const text = [
      '# invented',
      'Frequency (Hz),|Z| (Ohm),Phase (deg)',
      '1e6,10,85',
      'abc,10,85',
      '3e6,-4,20',
      '4e6,10',
      '5e6,10,20,30',
      '6e6,,20',
      '7e6,10,20',
    ].join('\n');
    const issues = problems(text);
    expect(issues.map((i) => i.line)).toEqual([4, 5, 6, 8]);
    expect(issues.map(formatLineIssue)).toEqual([
      'line 4: frequency "abc" is not a number',
      'line 5: |Z| must be positive, got -4 Ω',
      'line 6: 2 values, expected at least 3 (the header on line 2 has 3 columns)',
      'line 8: |Z| is empty',
    ]);
  });

  it('without a header, asks for exactly three values and explains how to pick from a wider table', () => {
    const issues = problems('1e6,10,85\n2e6,10,85,7\n');
    expect(issues).toHaveLength(1);
    expect(formatLineIssue(issues[0]!)).toMatch(/^line 2: 4 values, expected 3 \(frequency, \|Z\|, phase\); a header line naming the columns/u);
  });

  it('refuses a decimal comma when the comma separates the fields', () => {
    const issues = problems('Frequency (Hz),|Z| (Ohm),Phase (deg)\n1e6,10,85\n"2e6","22,5","80"\n');
    expect(formatLineIssue(issues[0]!)).toBe('line 3: |Z| "22,5" is not a number');
  });

  it('reports a repeated and a falling frequency by line', () => {
    const issues = problems('1e6,10,85\n2e6,10,85\n2e6,11,85\n1.5e6,12,85\n3e6,13,85\n');
    expect(issues.map(formatLineIssue)).toEqual([
      'line 3: frequency 2000000 Hz repeats line 2',
      'line 4: frequency 1500000 Hz is below the 2000000 Hz of line 3: sort the table by rising frequency',
    ]);
  });

  it('reports a zero frequency', () => {
    const issues = problems('0,10,85\n1e6,10,85\n2e6,10,85\n');
    expect(formatLineIssue(issues[0]!)).toBe('line 1: frequency must be positive, got 0');
  });

  it('needs two points and some data at all', () => {
    expect(problems('Frequency (Hz),|Z| (Ohm),Phase (deg)\n1e6,10,85\n')[0]!.message).toMatch(/at least 2 data lines, found 1/u);
    expect(problems('just some text\nand more\n')[0]!.message).toMatch(/no data lines found/u);
    expect(problems('')[0]!.message).toMatch(/no data lines found/u);
  });

  it('reports a header that does not name the three columns', () => {
    const [issue] = problems('Frequency (Hz),|Z| (Ohm),Trace\n1e6,10,85\n2e6,10,85\n');
    expect(formatLineIssue(issue!)).toMatch(/^line 1: the header .* has no phase column/u);
  });

  it('reports an unterminated quote on its line', () => {
    const issues = problems('1e6,10,85\n2e6,"10,85\n3e6,10,85\n');
    expect(issues[0]).toMatchObject({ line: 2, message: 'a quoted field is not closed' });
  });

  it('honours a separator given by the caller', () => {
    const issues = problems('1e6;10;85\n2e6;10;85\n', { delimiter: ',' });
    expect(issues[0]!.message).toMatch(/separated by commas/u);
  });
});

describe('the invented bead example file', () => {
  const text = readFileSync(new URL('../../fixtures/measured/invented-bead.csv', import.meta.url), 'utf8');

  it('is labelled invented and reads as a table in MHz', () => {
    expect(text.split('\n')[0]).toMatch(/INVENTED/u);
    const got = read(text);
    expect(got.frequencyUnit).toBe('MHz');
    expect(got.table.frequencyHz[0]).toBe(1e6);
    expect(got.table.frequencyHz[got.table.frequencyHz.length - 1]).toBe(1e9);
  });

  it('becomes a measured part that a design accepts and the engine sweeps', () => {
    const part = measuredPartFromTable(read(text).table, 'invented-bead.csv');
    const design = buildDesign({
      elements: [element('series-line1', part, 'FB1'), element('series-line2', part, 'FB2')],
      frequencyPlan: { startHz: 1e6, stopHz: 1e8, pointsPerDecade: 10 },
    });
    expect(readDesign(design).ok).toBe(true);
    const result = sweepDesign(design, { refine: false });
    expect(result.warnings.filter((w) => w.code === 'outside-measured-range')).toEqual([]);
    // Two ~450 Ω beads in parallel (225 Ω) between 50 Ω and 50 Ω: about 10 dB at their peak.
    expect(Math.max(...result.columns.insertionLoss50Cm)).toBeGreaterThan(8);
  });
});
