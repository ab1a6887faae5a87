import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MAX_LISTED_REJECTIONS, readScanText, readScanTextWithProgress, type ScanCsvOptions, type ScanReadError } from '../../src/io/scan-csv.ts';
import type { Detector } from '../../src/model/emissions-schema.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { propertySettings } from '../support/property-settings.ts';

function read(text: string, options: ScanCsvOptions = {}): Scan {
  const result = readScanText(text, options);
  if (!result.ok) throw new Error(`expected the scan to read, got: ${result.error.message}\n${result.error.notes.join('\n')}`);
  return result.scan;
}

function refused(text: string, options: ScanCsvOptions = {}): ScanReadError {
  const result = readScanText(text, options);
  if (result.ok) throw new Error(`expected the scan to be refused, but it read ${result.scan.frequencyHz.length} points`);
  return result.error;
}

function levels(scan: Scan, detector: Detector): number[] {
  const trace = scan.traces.find((t) => t.detector === detector);
  if (!trace) throw new Error(`no ${detector} trace; the scan has ${scan.traces.map((t) => t.detector).join(', ')}`);
  return [...trace.levelDbuV];
}

function notes(scan: Scan): string {
  return scan.notes.join('\n');
}

const fixture = (name: string): string => readFileSync(new URL(`../../fixtures/scans/${name}`, import.meta.url), 'utf8');

describe('reading a scan: accepted formats', () => {
  it('reads a comma-separated file with a header naming the frequency unit, detectors and level unit', () => {
    const scan = read('Frequency [MHz],Peak [dBµV],QP [dBµV],AV [dBµV]\n0.15,70.5,65.25,55\n1,60,55,45.5\n30,50,44,40\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 1e6, 30e6]);
    expect(scan.traces.map((t) => t.detector)).toEqual(['peak', 'quasi-peak', 'average']);
    expect(levels(scan, 'peak')).toEqual([70.5, 60, 50]);
    expect(levels(scan, 'quasi-peak')).toEqual([65.25, 55, 44]);
    expect(levels(scan, 'average')).toEqual([55, 45.5, 40]);
    expect(scan.rejected).toEqual([]);
    expect(notes(scan)).toMatch(/separated by commas/u);
    expect(notes(scan)).toMatch(/line 1: read as the header/u);
    expect(notes(scan)).toMatch(/"Frequency \[MHz\]" in MHz \(from the header\)/u);
    expect(notes(scan)).toMatch(/quasi-peak: "QP \[dBµV\]" in dBµV \(from the header; detector from the header\)/u);
    expect(notes(scan)).toMatch(/3 points from 150 kHz to 30 MHz/u);
  });

  it('reads a bare two-column table: whitespace, Hz and dBµV assumed, peak assumed, all said in the notes', () => {
    const scan = read('  150000   61.2\n200000\t 58.4\n\n1e6 50   \n');
    expect([...scan.frequencyHz]).toEqual([150e3, 200e3, 1e6]);
    expect(levels(scan, 'peak')).toEqual([61.2, 58.4, 50]);
    const text = notes(scan);
    expect(text).toMatch(/separated by spaces/u);
    expect(text).toMatch(/no header: column 1 read as the frequency, column 2 as the level/u);
    expect(text).toMatch(/read as Hz \(assumed/u);
    expect(text).toMatch(/in dBµV \(assumed: no unit/u);
    expect(text).toMatch(/detector assumed: no detector named; peak/u);
  });

  it('takes units and detectors from the options when there is no header', () => {
    const scan = read('0.15,-40,-45\n0.5,-50,-55\n', { frequencyUnit: 'MHz', levelUnit: 'dBm', detectors: ['quasi-peak', 'average'] });
    expect([...scan.frequencyHz]).toEqual([150e3, 500e3]);
    expect(levels(scan, 'quasi-peak')[0]).toBeCloseTo(66.99, 2);
    expect(levels(scan, 'average')[1]).toBeCloseTo(51.99, 2);
    expect(notes(scan)).toMatch(/in MHz \(from the options\)/u);
    expect(notes(scan)).toMatch(/in dBm \(from the options; detector from the options\), converted to dBµV in 50 Ω: dBµV = dBm \+ 106\.99/u);
  });

  it('reads semicolons with a decimal comma and kHz from an "f/kHz" header', () => {
    const scan = read('f/kHz;QP/dBuV\n150;66,5\n162,5;65,25\n1000;56\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 162.5e3, 1e6]);
    expect(levels(scan, 'quasi-peak')).toEqual([66.5, 65.25, 56]);
    expect(scan.notes[0]).toBe('values separated by semicolons, numbers written with a decimal comma');
  });

  it('reads tabs, with a decimal comma, and names with spaces', () => {
    const scan = read('Frequency [MHz]\tMax Peak [dBµV]\tAverage [dBµV]\n0,15\t70,5\t60\n1\t60\t50\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 1e6]);
    expect(levels(scan, 'peak')).toEqual([70.5, 60]);
    expect(levels(scan, 'average')).toEqual([60, 50]);
    expect(scan.notes[0]).toMatch(/tabs, numbers written with a decimal comma/u);
  });

  it('reads a space-separated header whose names hold spaces', () => {
    const scan = read('Frequency [MHz]   Max Peak [dBuV]   Quasi-Peak [dBuV]   C-AV [dBuV]\n0.15  70  65  55\n30  50  45  40\n');
    expect(scan.traces.map((t) => t.detector)).toEqual(['peak', 'quasi-peak', 'average']);
    expect(levels(scan, 'average')).toEqual([55, 40]);
  });

  it('reads a space-separated header with "in" and bare units', () => {
    const scan = read('Frequency MHz   Level in dBm\n0.15 -40\n1 -50\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 1e6]);
    expect(levels(scan, 'peak')[0]).toBeCloseTo(66.99, 2);
  });

  it('reads a decimal comma in a space-separated table', () => {
    const scan = read('0,15 70,5\n1,5 60,25\n', { frequencyUnit: 'MHz' });
    expect([...scan.frequencyHz]).toEqual([150e3, 1.5e6]);
    expect(levels(scan, 'peak')).toEqual([70.5, 60.25]);
  });

  it('reads quoted fields, CRLF line ends and a byte-order mark', () => {
    const scan = read('\uFEFF"Frequency (Hz)","Peak (dBuV)"\r\n"150000","60.5"\r\n"300000","55"\r\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 300e3]);
    expect(levels(scan, 'peak')).toEqual([60.5, 55]);
  });

  it('takes the separator from the options', () => {
    const scan = read('0.15;70\n1;60\n', { delimiter: ';', frequencyUnit: 'MHz' });
    expect([...scan.frequencyHz]).toEqual([150e3, 1e6]);
  });

  it.each([
    ['Frequency [Hz]', '150000', 150e3],
    ['Freq (kHz)', '150', 150e3],
    ['f/MHz', '0.15', 150e3],
    ['MHz', '0.15', 150e3],
    ['Frequency [GHz]', '0.00015', 150e3],
    ['FREQUENCY/MHZ', '1.1', 1.1e6],
  ])('frequency unit from the header %s', (name, value, hz) => {
    const scan = read(`${name},Peak [dBµV]\n${value},60\n`);
    expect([...scan.frequencyHz]).toEqual([hz]);
  });

  it('scales frequencies exactly: 0.15 MHz is 150000 Hz, not 150000.00000000003', () => {
    const scan = read('f/MHz,PK/dBuV\n0.15,1\n0.3,1\n1.1,1\n1.5e1,1\n29.99,1\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 300e3, 1.1e6, 15e6, 29.99e6]);
  });
});

describe('reading a scan: level units', () => {
  it.each([
    ['dBµV', '60', 60],
    ['dBuV', '60', 60],
    ['dBμV', '60', 60], // Greek mu
    ['dB(µV)', '60', 60],
    ['dBm', '-46.99', 60],
    ['dBV', '-60', 60],
    ['V', '0.001', 60],
    ['Vrms', '1', 120],
  ])('header unit %s', (unit, reading, dBuV) => {
    const scan = read(`Frequency [MHz],Peak [${unit}]\n1,${reading}\n`);
    expect(levels(scan, 'peak')[0]).toBeCloseTo(dBuV, 2);
  });

  it.each([
    ['dBµV', '60', 60],
    ['dBuV', '60', 60],
    ['dBm', '0', 106.99],
    ['dBV', '0', 120],
    ['V', '1', 120],
  ] as const)('option unit %s', (unit, reading, dBuV) => {
    const scan = read(`1,${reading}\n`, { levelUnit: unit, frequencyUnit: 'MHz' });
    expect(levels(scan, 'peak')[0]).toBeCloseTo(dBuV, 2);
  });

  it('dBµA needs a transfer impedance and then adds 20·log10(Z_T)', () => {
    expect(refused('Frequency [MHz],Peak [dBµA]\n1,20\n').message).toMatch(/dBµA need transferImpedanceOhm/u);
    expect(refused('1,20\n', { levelUnit: 'dBuA' }).message).toMatch(/dBµA need transferImpedanceOhm/u);
    const scan = read('Frequency [MHz],Peak [dBµA]\n1,20\n', { transferImpedanceOhm: 50 });
    expect(levels(scan, 'peak')[0]).toBeCloseTo(53.98, 2);
    expect(notes(scan)).toMatch(/through 50 Ω: dBµV = dBµA \+ 33\.98/u);
    expect(refused('1,20\n', { levelUnit: 'dBµA', transferImpedanceOhm: 0 }).message).toMatch(/positive number of ohms/u);
  });

  it('the unit other level columns name is taken for a column that names none, with a note', () => {
    const scan = read('Frequency [MHz],Peak [dBm],QP\n1,-50,-55\n');
    expect(levels(scan, 'quasi-peak')[0]).toBeCloseTo(51.99, 2);
    expect(notes(scan)).toMatch(/quasi-peak: "QP" in dBm \(assumed: the unit the other level columns name/u);
  });

  it.each([
    ['Peak [dBµV/m]', /radiated/u],
    ['Peak [dBmV]', /dBmv is not one this reader converts/u],
    ['Peak [mV]', /linear millivolts/u],
    ['Peak [dBuV] [dBm]', /more than one level unit/u],
  ])('refuses the unit of %s', (name, message) => {
    expect(refused(`Frequency [MHz],${name}\n1,20\n`).message).toMatch(message);
  });

  it('refuses a header unit that contradicts the options, naming both', () => {
    expect(refused('Frequency [MHz],Peak [dBm]\n1,20\n', { levelUnit: 'dBµV' }).message).toMatch(/line 1: .*in dBm but levelUnit is dBµV/u);
    expect(refused('Frequency [MHz],Peak\n1,20\n', { frequencyUnit: 'kHz' }).message).toMatch(/in MHz but frequencyUnit is kHz/u);
    // The same unit under another spelling is no contradiction.
    expect(read('Frequency [MHz],Peak [dBµV]\n1,20\n', { levelUnit: 'dBuV', frequencyUnit: 'MHz' }).traces).toHaveLength(1);
  });

  it('notes levels that look like a wrong unit (dBm read as dBµV) and frequencies that look like a wrong unit', () => {
    const scan = read('150000,-60\n30000000,-70\n');
    expect(notes(scan)).toMatch(/check the level unit of peak: read as dBµV, its highest level is -60\.0 dBµV/u);
    const small = read('0.15,60\n30,50\n');
    expect(notes(small)).toMatch(/check the frequency unit: the highest frequency is 30 Hz/u);
  });
});

describe('reading a scan: detectors', () => {
  it.each([
    ['Peak', 'peak'],
    ['PK', 'peak'],
    ['pk+', 'peak'],
    ['Max Peak', 'peak'],
    ['MaxPeak', 'peak'],
    ['max_pk', 'peak'],
    ['QP', 'quasi-peak'],
    ['Quasi-Peak', 'quasi-peak'],
    ['quasi peak', 'quasi-peak'],
    ['QuasiPeak', 'quasi-peak'],
    ['AV', 'average'],
    ['AVG', 'average'],
    ['Average', 'average'],
    ['CAV', 'average'],
    ['C-AV', 'average'],
    ['Level_AV [dBuV]', 'average'],
  ] as const)('%s is the %s detector', (name, detector) => {
    const scan = read(`Frequency [MHz],${name}\n1,50\n`);
    expect(scan.traces.map((t) => t.detector)).toEqual([detector]);
  });

  it('takes detectors from the options where the header names none, in column order', () => {
    const scan = read('Frequency [MHz],Trace 1,Trace 2\n1,50,40\n', { detectors: ['quasi-peak', 'average'] });
    expect(levels(scan, 'quasi-peak')).toEqual([50]);
    expect(levels(scan, 'average')).toEqual([40]);
  });

  it.each([
    ['two unnamed level columns', '1,50,40\n', {}, /2 level columns and no header names their detectors/u],
    ['two unnamed columns under a header', 'Frequency [MHz],A,B\n1,50,40\n', {}, /"A" names no detector/u],
    ['a header detector contradicting the options', 'Frequency [MHz],Peak\n1,50\n', { detectors: ['average'] }, /names "Peak" peak but detectors gives average/u],
    ['too few detectors', '1,50,40\n', { detectors: ['peak'] }, /detectors lists 1 but the file has 2 level columns/u],
    ['one detector twice in the options', '1,50,40\n', { detectors: ['peak', 'peak'] }, /given twice/u],
    ['two columns of one detector', 'Frequency [MHz],Peak,Max Peak\n1,50,40\n', {}, /two columns read as peak/u],
    ['a column naming two detectors', 'Frequency [MHz],Peak-AV\n1,50\n', {}, /names more than one detector/u],
    ['two lines side by side', 'Frequency [MHz],Peak L1,Peak N\n1,50,40\n', {}, /two columns read as peak \("Peak L1" and "Peak N"\).*must be split/u],
  ] as const)('refuses %s', (_what, text, options: ScanCsvOptions, message) => {
    expect(refused(text, options).message).toMatch(message);
  });

  it('ignores limit, margin and correction columns, with a note', () => {
    const scan = read('Frequency [MHz],QP [dBuV],Limit QP [dBuV],Margin QP [dB],Correction [dB]\n1,50,56,6,10.2\n');
    expect(scan.traces.map((t) => t.detector)).toEqual(['quasi-peak']);
    expect(levels(scan, 'quasi-peak')).toEqual([50]);
    expect(notes(scan)).toMatch(/ignored the column "Limit QP \[dBuV\]"/u);
    expect(notes(scan)).toMatch(/ignored the column "Correction \[dB\]": levels are taken as they are/u);
  });
});

describe('reading a scan: comments, preamble and text', () => {
  it('skips comments and a text preamble before the header, naming the lines', () => {
    const text = ['# made up', '; also a comment', '! and this', 'Title: adapter', 'Operator,nobody', '', 'Frequency [kHz],Peak [dBµV]', '150,60', '200,58'].join('\n');
    const scan = read(text);
    expect([...scan.frequencyHz]).toEqual([150e3, 200e3]);
    expect(notes(scan)).toMatch(/skipped 5 lines from 1 to 5 before the data/u);
    expect(notes(scan)).toMatch(/line 7: read as the header/u);
  });

  it('reads a header written as a comment', () => {
    const scan = read('# Frequency [MHz]  Peak [dBuV]  AV [dBuV]\n0.15 60 50\n1 55 45\n');
    expect(scan.traces.map((t) => t.detector)).toEqual(['peak', 'average']);
    expect(notes(scan)).toMatch(/line 1: read as the header \(a comment line naming the columns\)/u);
  });

  it('finds the header above comment lines that sit between it and the data', () => {
    const scan = read('Frequency [MHz],Peak [dBm]\n# levels straight from the receiver\n0.15,-40\n1,-50\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 1e6]);
    expect(levels(scan, 'peak')[0]).toBeCloseTo(66.99, 2);
    expect(notes(scan)).toMatch(/line 1: read as the header/u);
    expect(notes(scan)).toMatch(/skipped line 2 before the data/u);
  });

  it('finds the frequency column wherever it is, ignoring an index column', () => {
    const scan = read('No.;Frequency [kHz];AV [dBµV]\n1;150;50\n2;200;48\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 200e3]);
    expect(levels(scan, 'average')).toEqual([50, 48]);
    expect(notes(scan)).toMatch(/ignored the column "No\."/u);
  });

  it('a title line that names no frequency is a preamble, not a header', () => {
    const scan = read('Peak scan\n150000 60\n200000 58\n');
    expect(levels(scan, 'peak')).toEqual([60, 58]);
    expect(notes(scan)).toMatch(/skipped line 1 before the data/u);
  });

  it('skips comments, a repeated header and text among the data, with a note; a quote in a comment opens nothing', () => {
    const text = ['f/MHz peak/dBuV', '0.15 60', '# a "comment', '0.2 59', 'Band two', 'f/MHz peak/dBuV', '1 50', '; the end'].join('\n');
    const scan = read(text);
    expect([...scan.frequencyHz]).toEqual([150e3, 200e3, 1e6]);
    expect(scan.rejected).toEqual([]);
    expect(notes(scan)).toMatch(/skipped lines 3, 5, 6 and 8 among the data: comments or text without numbers/u);
  });

  it('in a semicolon file a line starting with ";" is data with an empty frequency when it holds numbers', () => {
    const scan = read('f/kHz;Peak/dBuV\n150;60\n;58\n; note\n200;57\n');
    expect(scan.rejected).toEqual([{ line: 3, reason: 'frequency is empty' }]);
    expect(notes(scan)).toMatch(/skipped line 4 among the data/u);
  });
});

describe('reading a scan: rejected lines', () => {
  it('rejects each bad line with its 1-based line number and the reason, and reads the rest', () => {
    const text = [
      'Frequency [MHz],Peak [dBµV],AV [dBµV]', // 1
      '0.15,60,50', // 2
      '0.16,abc,50', // 3 not a number
      '0.17,60', // 4 missing column
      '0.18,60,50,1', // 5 extra column
      '0.19,,50', // 6 empty
      '0.20,NaN,50', // 7
      '0.21,60,-inf', // 8
      '-0.22,60,50', // 9
      'x,60,50', // 10
      '0.23,1e999,50', // 11 overflows
      '0.24,61,51', // 12
    ].join('\n');
    const scan = read(text);
    expect([...scan.frequencyHz]).toEqual([150e3, 240e3]);
    expect(scan.rejected).toEqual([
      { line: 3, reason: 'peak level "abc" is not a number' },
      { line: 4, reason: 'missing column: 2 values, expected 3 (frequency, peak, average)' },
      { line: 5, reason: '4 values, expected 3 (frequency, peak, average)' },
      { line: 6, reason: 'peak level is empty' },
      { line: 7, reason: 'peak level "NaN" is not finite (a dB of zero?)' },
      { line: 8, reason: 'average level "-inf" is not finite (a dB of zero?)' },
      { line: 9, reason: 'frequency must be positive, got -0.22' },
      { line: 10, reason: 'frequency "x" is not a number' },
      { line: 11, reason: 'peak level "1e999" is not a finite number here' },
    ]);
    expect(notes(scan)).toMatch(/rejected 9 lines: /u);
  });

  it('rejects a voltage of zero (it has no dB value)', () => {
    const scan = read('Frequency [MHz],Peak [V]\n1,0.001\n2,0\n');
    expect(scan.rejected).toEqual([{ line: 3, reason: 'peak level 0 V has no dB value (a voltage must be positive)' }]);
  });

  it('rejects a line with an unclosed quote, saying how far it ran', () => {
    const scan = read('f/MHz,pk/dBuV\n0.15,60\n0.2,"59\n0.3,58\n');
    expect(scan.rejected).toEqual([{ line: 3, reason: 'a quoted field is not closed: lines 3–4 were read as one field' }]);
    expect([...scan.frequencyHz]).toEqual([150e3]);
  });

  it('keeps line numbers right after a quoted field that spans lines', () => {
    const scan = read('f/MHz,pk/dBuV,note\n0.15,60,"two\nlines"\n0.2,x,y\n');
    expect(scan.rejected).toEqual([{ line: 4, reason: 'peak level "x" is not a number' }]);
  });
});

describe('reading a scan: frequency order', () => {
  it('reads a falling file in reverse and says so', () => {
    const scan = read('Frequency [MHz],Peak [dBµV]\n30,50\n1,60\n0.15,70\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 1e6, 30e6]);
    expect(levels(scan, 'peak')).toEqual([70, 60, 50]);
    expect(notes(scan)).toMatch(/fall through the file .*read in reverse/u);
    expect(scan.rejected).toEqual([]);
  });

  it('rejects repeated frequencies, keeping the first', () => {
    const scan = read('f/kHz,pk/dBuV\n150,60\n150,61\n200,58\n300,57\n300,56\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 200e3, 300e3]);
    expect(levels(scan, 'peak')).toEqual([60, 58, 57]);
    expect(scan.rejected).toEqual([
      { line: 3, reason: 'duplicate frequency: 150 kHz is already on line 2' },
      { line: 6, reason: 'duplicate frequency: 300 kHz is already on line 5' },
    ]);
  });

  it('rejects the fewest lines that make the axis rise: a mistyped frequency costs its own line only', () => {
    const scan = read('f/MHz,pk/dBuV\n0.15,60\n1500,99\n0.2,59\n0.3,58\n0.25,57\n0.4,56\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 200e3, 300e3, 400e3]);
    expect(scan.rejected).toEqual([
      { line: 3, reason: 'frequency not rising: 1.5 GHz does not fit between line 2 (150 kHz) and line 4 (200 kHz)' },
      { line: 6, reason: 'frequency not rising: 250 kHz does not fit between line 5 (300 kHz) and line 7 (400 kHz)' },
    ]);
  });

  it('reverses a mostly falling file and then rejects what still breaks the order', () => {
    const scan = read('f/MHz,pk/dBuV\n30,50\n10,52\n10,53\n1,60\n2,61\n0.15,70\n');
    expect([...scan.frequencyHz]).toEqual([150e3, 1e6, 10e6, 30e6]);
    expect(scan.rejected).toEqual([
      { line: 4, reason: 'duplicate frequency: 10 MHz is already on line 3' },
      { line: 6, reason: 'frequency not rising: 2 MHz does not fit between line 5 (1 MHz) and line 7 (150 kHz)' },
    ]);
  });
});

describe('reading a scan: nothing usable is an error result, not a throw', () => {
  it.each([
    ['empty text', '', /no data lines found/u],
    ['only a header', 'Frequency [MHz],Peak [dBµV]\n', /no data lines found/u],
    ['only text', 'hello\nworld\n', /no data lines found/u],
    ['one number per line', '1\n2\n3\n', /no data lines found/u],
  ])('%s', (_what, text, message) => {
    expect(refused(text).message).toMatch(message);
  });

  it('every data line rejected: the error names why and lists the lines', () => {
    const error = refused('Frequency [MHz],Peak [V]\n1,0\n2,-1\n3,0\n');
    expect(error.message).toBe('nothing usable in the file: all 3 data lines were rejected (3 no dB value)');
    expect(error.rejected.map((r) => r.line)).toEqual([2, 3, 4]);
  });

  it('a header that does not match the data is an error naming the line', () => {
    expect(refused('Frequency [MHz],Peak [dBµV],QP [dBµV]\n1,50\n2,40\n').message).toBe(
      'line 1: the header has 3 names ("Frequency [MHz]", "Peak [dBµV]", "QP [dBµV]") but the data lines have 2 values',
    );
  });

  it('two frequency columns are an error', () => {
    expect(refused('Frequency [MHz],Frequency [Hz],Peak\n1,1000000,50\n').message).toMatch(/more than one column looks like the frequency/u);
  });

  it('lists at most MAX_LISTED_REJECTIONS lines and counts the rest', () => {
    const lines = ['f/MHz,pk/dBuV', '1,50'];
    for (let i = 0; i < MAX_LISTED_REJECTIONS + 5; i += 1) lines.push(`${2 + i},x`);
    const scan = read(lines.join('\n'));
    expect(scan.rejected).toHaveLength(MAX_LISTED_REJECTIONS);
    expect(scan.rejected[0]).toEqual({ line: 3, reason: 'peak level "x" is not a number' });
    expect(notes(scan)).toMatch(new RegExp(`rejected ${MAX_LISTED_REJECTIONS + 5} lines`, 'u'));
    expect(notes(scan)).toMatch(/5 more are counted above/u);
  });
});

describe('reading a scan: name, tag, result shape', () => {
  it('takes name and tag from the options, and says when the tag is the default', () => {
    const tagged = read('1e6,50\n', { name: 'L1 before filter', tag: 'line1' });
    expect(tagged).toMatchObject({ name: 'L1 before filter', tag: 'line1' });
    expect(notes(tagged)).not.toMatch(/no tag given/u);
    const plain = read('1e6,50\n');
    expect(plain).toMatchObject({ name: 'scan', tag: 'total' });
    expect(notes(plain)).toMatch(/no tag given: read as "total"/u);
  });

  it('puts the axis and every trace in one ArrayBuffer, sized by the lines of the file (the reader never copies a column)', () => {
    const scan = read('Frequency [MHz],Peak,QP,AV\n0.15,70,65,55\n1,60,55,45\n');
    const buffer = scan.frequencyHz.buffer;
    for (const trace of scan.traces) expect(trace.levelDbuV.buffer).toBe(buffer);
    // Two data lines and the empty one after the last line end: room for three rows of four columns.
    expect(buffer.byteLength).toBe(8 * 3 * 4);
    expect(scan.frequencyHz.length).toBe(2);
  });
});

describe('reading a scan: progress', () => {
  function generated(rows: number): string {
    const lines = ['Frequency [Hz],Peak [dBµV]'];
    for (let i = 0; i < rows; i += 1) lines.push(`${150_000 + i * 10},${(60 + (i % 7) / 10).toFixed(1)}`);
    return lines.join('\n');
  }

  it('reports rising fractions, at most about a hundred times, ending at 1', () => {
    const reported: number[] = [];
    const result = readScanTextWithProgress(generated(50_000), {}, (fraction) => reported.push(fraction));
    expect(result.ok).toBe(true);
    expect(reported.length).toBeGreaterThan(10);
    expect(reported.length).toBeLessThanOrEqual(102);
    for (let i = 1; i < reported.length; i += 1) expect(reported[i]!).toBeGreaterThan(reported[i - 1]!);
    expect(reported[0]!).toBeGreaterThanOrEqual(0);
    expect(reported[reported.length - 1]).toBe(1);
  });

  it('a small file still ends at 1; a callback that throws stops being told and the reading goes on', () => {
    const reported: number[] = [];
    expect(readScanTextWithProgress('1e6,50\n', {}, (f) => reported.push(f)).ok).toBe(true);
    expect(reported[reported.length - 1]).toBe(1);
    let calls = 0;
    const result = readScanTextWithProgress(generated(20_000), {}, () => {
      calls += 1;
      throw new Error('not listening');
    });
    expect(result.ok).toBe(true);
    expect(calls).toBe(1);
  });
});

describe('reading a scan: a million rows', () => {
  it('imports 1,000,000 rows of peak, QP and AV (no timing asserted)', { timeout: 120_000 }, () => {
    const rows = 1_000_000;
    const parts: string[] = ['# generated for the test', 'Frequency [MHz],Peak [dBuV],QP [dBuV],AV [dBuV]'];
    // Frequencies 150 kHz + i·29.85 Hz written in MHz with 8 decimals: exact to the hertz.
    for (let i = 0; i < rows; i += 1) {
      const peak = 60 + (i % 100) / 10;
      parts.push(`${((150_000 + i * 29.85) / 1e6).toFixed(8)},${peak.toFixed(1)},${(peak - 5).toFixed(1)},${(peak - 10).toFixed(1)}`);
    }
    const text = parts.join('\n');
    const reported: number[] = [];
    const started = performance.now();
    const result = readScanTextWithProgress(text, { tag: 'line1' }, (f) => reported.push(f));
    const elapsedMs = performance.now() - started;
    if (!result.ok) throw new Error(result.error.message);
    const { scan } = result;
    expect(scan.frequencyHz).toHaveLength(rows);
    expect(scan.traces.map((t) => t.levelDbuV.length)).toEqual([rows, rows, rows]);
    expect(scan.rejected).toEqual([]);
    expect(scan.frequencyHz[0]).toBe(150_000);
    expect(scan.frequencyHz[1]).toBe(150_029.85);
    expect(scan.frequencyHz[rows - 1]).toBeCloseTo(150_000 + (rows - 1) * 29.85, 6);
    expect(levels(scan, 'peak')[123_456]).toBeCloseTo(60 + 56 / 10, 9);
    expect(levels(scan, 'quasi-peak')[999_999]).toBeCloseTo(60 + 9.9 - 5, 9);
    expect(levels(scan, 'average')[500_001]).toBeCloseTo(60 + 0.1 - 10, 9);
    expect(reported.length).toBeLessThanOrEqual(102);
    expect(reported[reported.length - 1]).toBe(1);
    // Informative only: the time goes to the test's name in verbose runs, never into an assertion.
    expect(elapsedMs).toBeGreaterThan(0);
  });
});

describe('reading a scan: the invented fixtures', () => {
  it('peak, QP and AV in MHz and dBµV with a header', () => {
    const scan = read(fixture('invented-peak-qp-av-mhz.csv'), { tag: 'line1', name: 'L1' });
    expect(scan.traces.map((t) => t.detector)).toEqual(['peak', 'quasi-peak', 'average']);
    expect(scan.frequencyHz).toHaveLength(36);
    expect(scan.frequencyHz[0]).toBe(150e3);
    expect(scan.frequencyHz[35]).toBe(30e6);
    expect(levels(scan, 'peak')[0]).toBe(78);
    expect(scan.rejected).toEqual([]);
    const peak = levels(scan, 'peak');
    const qp = levels(scan, 'quasi-peak');
    const av = levels(scan, 'average');
    for (let i = 0; i < peak.length; i += 1) expect(peak[i]! >= qp[i]! && qp[i]! >= av[i]!).toBe(true);
  });

  it('semicolons, decimal commas, kHz and dBm', () => {
    const scan = read(fixture('invented-semicolon-decimal-comma-khz-dbm.csv'));
    expect(scan.traces.map((t) => t.detector)).toEqual(['peak', 'average']);
    expect(scan.frequencyHz[0]).toBe(150e3);
    expect(levels(scan, 'peak')[0]).toBeCloseTo(-34.99 + 106.99, 2);
    expect(notes(scan)).toMatch(/decimal comma/u);
    expect(notes(scan)).toMatch(/skipped lines 1, 2 and 3 before the data/u);
  });

  it('a CM/DM separator pair, read with their tags, on one frequency axis', () => {
    const cm = read(fixture('invented-separator-cm.txt'), { tag: 'common-mode' });
    const dm = read(fixture('invented-separator-dm.txt'), { tag: 'differential-mode' });
    expect([...cm.frequencyHz]).toEqual([...dm.frequencyHz]);
    expect(cm.tag).toBe('common-mode');
    expect(dm.tag).toBe('differential-mode');
    // Invented so that DM dominates the bottom of the band and CM the top.
    expect(levels(dm, 'peak')[0]!).toBeGreaterThan(levels(cm, 'peak')[0]!);
    expect(levels(cm, 'peak').at(-1)!).toBeGreaterThan(levels(dm, 'peak').at(-1)!);
  });
});

describe('reading a scan: arbitrary text (property)', () => {
  const pieces = fc.constantFrom('\n', '\r\n', ',', ';', '\t', ' ', '"', '#', '!', 'MHz', 'kHz', 'Peak', 'QP', 'AV', 'dBuV', 'dBm', 'f', '[', ']', 'NaN', '-inf');
  const text = fc
    .array(fc.oneof(pieces, fc.double({ noNaN: true, min: -1e7, max: 1e9 }).map(String), fc.integer({ min: -5, max: 1e7 }).map(String), fc.string({ maxLength: 3 })), {
      maxLength: 120,
    })
    .map((parts) => parts.join(''));

  it('never throws; a scan it returns rises strictly with finite levels; rejected lines exist in the file', () => {
    fc.assert(
      fc.property(text, (input) => {
        const lineCount = input.split(/\r\n|\r|\n/u).length;
        const result = readScanText(input, { frequencyUnit: 'Hz' });
        const rejected = result.ok ? result.scan.rejected : result.error.rejected;
        for (const r of rejected) {
          expect(r.line).toBeGreaterThanOrEqual(1);
          expect(r.line).toBeLessThanOrEqual(lineCount);
        }
        if (!result.ok) {
          expect(result.error.message.length).toBeGreaterThan(0);
          return;
        }
        const { frequencyHz, traces } = result.scan;
        expect(frequencyHz.length).toBeGreaterThan(0);
        for (let i = 1; i < frequencyHz.length; i += 1) expect(frequencyHz[i]!).toBeGreaterThan(frequencyHz[i - 1]!);
        for (const trace of traces) {
          expect(trace.levelDbuV).toHaveLength(frequencyHz.length);
          for (const level of trace.levelDbuV) expect(Number.isFinite(level)).toBe(true);
        }
      }),
      propertySettings(1500),
    );
  });
});
