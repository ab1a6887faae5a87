import type { ImpedanceTable, MeasuredImpedance } from '../model/design.ts';
import { type Complex, add, complex, divide, fromPolarDeg, magnitude, phaseDeg, scale, subtract } from './complex.ts';
import { parseDecimal, quoteField } from './decimal-number.ts';
import { type FrequencyUnit, frequencyUnitFactor, parseFrequencyUnit, toHertz } from './frequency-unit.ts';
import { checkTable } from './impedance-table-csv.ts';
import { describeLines, type LineIssue, splitLines, stripByteOrderMark, type TextReadResult } from './text-issues.ts';

/**
 * Touchstone version 1 two-port files (.s2p) and the two fixtures that measure a two-terminal part
 * with a network analyser: the part in series between port 1 and port 2 ("series-thru"), or from
 * the through line to ground ("shunt-thru").
 *
 * File rules read here: "!" starts a comment anywhere on a line; one option line
 * "# <Hz|kHz|MHz|GHz> S <RI|MA|DB> R <z0>" (any order, any case, defaults GHz S MA R 50) before the
 * data; then per frequency 9 numbers: f, S11, S21, S12, S22 as pairs, possibly wrapped over lines
 * with pairs kept whole; frequencies rising. A noise-parameter block after the S-parameters
 * (its first frequency not above the last) is skipped. Version 2 keyword files are refused by name.
 */

export type TouchstoneFormat = 'RI' | 'MA' | 'DB';

export interface TouchstoneOptions {
  readonly frequencyUnit: FrequencyUnit;
  readonly format: TouchstoneFormat;
  /** Reference impedance of both ports, in ohms. */
  readonly referenceOhm: number;
}

export interface TwoPortRecord {
  /** The file line where this frequency's record starts. */
  readonly line: number;
  readonly frequencyHz: number;
  readonly s11: Complex;
  readonly s21: Complex;
  readonly s12: Complex;
  readonly s22: Complex;
}

export interface TouchstoneTwoPort {
  readonly options: TouchstoneOptions;
  /** Line of the option line, undefined when the file has none and the defaults apply. */
  readonly optionLine: number | undefined;
  readonly records: readonly TwoPortRecord[];
}

export const TOUCHSTONE_DEFAULTS: TouchstoneOptions = { frequencyUnit: 'GHz', format: 'MA', referenceOhm: 50 };

const VALUES_PER_RECORD = 9;
const MAX_RECORDS = 100_000;
const MAX_ISSUES = 200;

export interface TouchstoneReadOptions {
  /** Used to refuse a file whose extension says it has another number of ports (.s1p, .s3p). */
  readonly fileName?: string;
}

export function readTouchstoneTwoPort(text: string, readOptions: TouchstoneReadOptions = {}): TextReadResult<TouchstoneTwoPort> {
  const ports = /\.s(\d+)p$/iu.exec(readOptions.fileName ?? '');
  if (ports && ports[1] !== '2') {
    return fail([{ line: 0, message: `a .s${ports[1]!}p file holds ${ports[1]!}-port data; a two-terminal part is read from a 2-port (.s2p) file` }]);
  }
  const issues: LineIssue[] = [];
  const notes: LineIssue[] = [];
  let options = TOUCHSTONE_DEFAULTS;
  let optionLine: number | undefined;
  const ignoredOptionLines: number[] = [];
  const records: TwoPortRecord[] = [];
  let pending: { line: number; values: number[] } | undefined;
  let structureBroken = false;

  const lines = splitLines(stripByteOrderMark(text));
  for (let index = 0; index < lines.length; index += 1) {
    const line = index + 1;
    const content = (lines[index] ?? '').replace(/!.*$/u, '').trim();
    if (content === '') continue;
    if (issues.length >= MAX_ISSUES) break;

    if (content.startsWith('[')) {
      return fail([
        { line, message: `${quoteField(content.split(/\s/u)[0] ?? content)} is a Touchstone 2 keyword; save the file as Touchstone version 1` },
      ]);
    }
    if (content.startsWith('#')) {
      if (optionLine !== undefined) {
        ignoredOptionLines.push(line);
        continue;
      }
      if (records.length > 0 || pending) {
        issues.push({ line, message: 'the option line must come before the data' });
        continue;
      }
      const parsed = parseOptionLine(content.slice(1));
      if (typeof parsed === 'string') {
        issues.push({ line, message: parsed });
        structureBroken = true;
      } else {
        options = parsed;
      }
      optionLine = line;
      continue;
    }

    const tokens = content.split(/\s+/u);
    const values: number[] = [];
    const bad = tokens.filter((token) => {
      const value = parseDecimal(token);
      if (value !== undefined) values.push(value);
      return value === undefined;
    });
    if (bad.length > 0) {
      issues.push({ line, message: `${bad.map(quoteField).join(', ')} ${bad.length === 1 ? 'is not a number' : 'are not numbers'}` });
      structureBroken = true;
      continue;
    }
    if (structureBroken) continue;

    if (!pending) {
      const last = records[records.length - 1];
      const lastFrequency = last ? last.frequencyHz / frequencyUnitFactor(options.frequencyUnit) : undefined;
      if (values.length === 5 && lastFrequency !== undefined && values[0]! <= lastFrequency) {
        notes.push({ line, message: 'noise parameters from here on were skipped' });
        break;
      }
      if (values.length % 2 === 0 || values.length > VALUES_PER_RECORD) {
        issues.push({ line, message: `${values.length} values; ${recordShapeHint(values.length)}` });
        structureBroken = true;
        continue;
      }
      pending = { line, values };
    } else {
      const needed = VALUES_PER_RECORD - pending.values.length;
      if (values.length % 2 === 1 || values.length > needed) {
        const hint = pending.values.length === 3 && values.length === 3 ? ' (this looks like a one-port file: 3 values per line)' : '';
        issues.push({
          line,
          message: `${values.length} value${values.length === 1 ? '' : 's'} continue the record of line ${pending.line}, which needs ${needed} more in whole pairs${hint}`,
        });
        structureBroken = true;
        continue;
      }
      pending.values.push(...values);
    }
    if (pending.values.length === VALUES_PER_RECORD) {
      const record = toRecord(pending.line, pending.values, options);
      if (typeof record === 'string') issues.push({ line: pending.line, message: record });
      else {
        const previous = records[records.length - 1];
        if (previous && !(record.frequencyHz > previous.frequencyHz)) {
          issues.push({
            line: pending.line,
            message: `frequency ${record.frequencyHz} Hz is not above the ${previous.frequencyHz} Hz of line ${previous.line}: Touchstone frequencies rise`,
          });
        } else if (records.length >= MAX_RECORDS) {
          return fail([{ line: pending.line, message: `more than ${MAX_RECORDS} frequencies` }]);
        } else {
          records.push(record);
        }
      }
      pending = undefined;
    }
  }
  if (pending && !structureBroken && issues.length === 0) {
    issues.push({ line: pending.line, message: `the record starting here has ${pending.values.length} of ${VALUES_PER_RECORD} values (frequency and S11, S21, S12, S22 as pairs)` });
  }
  if (issues.length > 0) return fail(issues);
  if (records.length === 0) return fail([{ line: 0, message: 'no data: expected lines of a frequency and S11, S21, S12, S22 as pairs' }]);
  if (optionLine === undefined) {
    notes.push({ line: 0, message: 'no option line: the Touchstone defaults apply (GHz, S, MA, R 50)' });
  }
  if (ignoredOptionLines.length > 0) {
    notes.push({ line: 0, message: `only the first option line counts; ignored ${describeLines(ignoredOptionLines)}` });
  }
  return { ok: true, value: { options, optionLine, records }, notes };
}

function recordShapeHint(count: number): string {
  if (count === 3) return 'a 2-port record is a frequency and four pairs (9 values); this looks like a one-port (.s1p) file';
  if (count > VALUES_PER_RECORD) return 'a 2-port record is a frequency and four pairs (9 values); this looks like a file with more ports';
  return 'a record starts with a frequency followed by whole pairs (9 values for a 2-port)';
}

function parseOptionLine(text: string): TouchstoneOptions | string {
  const tokens = text.trim().split(/\s+/u).filter((token) => token !== '');
  let frequencyUnit: FrequencyUnit | undefined;
  let format: TouchstoneFormat | undefined;
  let referenceOhm: number | undefined;
  for (let i = 0; i < tokens.length; i += 1) {
    const token = tokens[i]!;
    const upper = token.toUpperCase();
    const unit = parseFrequencyUnit(token);
    if (unit) {
      if (frequencyUnit) return `option line: frequency unit given twice (${frequencyUnit} and ${token})`;
      frequencyUnit = unit;
    } else if (upper === 'S') {
      // The one parameter type read here.
    } else if (upper === 'Y' || upper === 'Z' || upper === 'H' || upper === 'G') {
      return `option line: ${upper}-parameters are not read; export S-parameters`;
    } else if (upper === 'RI' || upper === 'MA' || upper === 'DB') {
      if (format) return `option line: data format given twice (${format} and ${upper})`;
      format = upper;
    } else if (upper === 'R') {
      const value = parseDecimal(tokens[i + 1] ?? '');
      if (value === undefined || !(value > 0)) {
        return `option line: R must be followed by the reference impedance in ohms, got ${tokens[i + 1] === undefined ? 'nothing' : quoteField(tokens[i + 1]!)}`;
      }
      referenceOhm = value;
      i += 1;
    } else {
      return `option line: unknown option ${quoteField(token)} (expected a unit Hz/kHz/MHz/GHz, S, a format RI/MA/DB and R <ohms>)`;
    }
  }
  return {
    frequencyUnit: frequencyUnit ?? TOUCHSTONE_DEFAULTS.frequencyUnit,
    format: format ?? TOUCHSTONE_DEFAULTS.format,
    referenceOhm: referenceOhm ?? TOUCHSTONE_DEFAULTS.referenceOhm,
  };
}

function toRecord(line: number, values: readonly number[], options: TouchstoneOptions): TwoPortRecord | string {
  const frequency = values[0]!;
  if (frequency < 0) return `frequency ${frequency} ${options.frequencyUnit} is negative`;
  const names = ['S11', 'S21', 'S12', 'S22'] as const;
  const pairs: Complex[] = [];
  for (let k = 0; k < 4; k += 1) {
    const a = values[1 + 2 * k]!;
    const b = values[2 + 2 * k]!;
    if (options.format === 'RI') pairs.push(complex(a, b));
    else if (options.format === 'MA') {
      if (a < 0) return `${names[k]} magnitude ${a} is negative`;
      pairs.push(fromPolarDeg(a, b));
    } else pairs.push(fromPolarDeg(10 ** (a / 20), b));
  }
  return { line, frequencyHz: toHertz(frequency, options.frequencyUnit), s11: pairs[0]!, s21: pairs[1]!, s12: pairs[2]!, s22: pairs[3]! };
}

function fail<T>(issues: readonly LineIssue[]): TextReadResult<T> {
  return { ok: false, issues };
}

// ---- Thru fixtures -------------------------------------------------------------------------

/** How the part sat between the two ports. */
export type ThruFixture = 'series-thru' | 'shunt-thru';
export const THRU_FIXTURES: readonly ThruFixture[] = ['series-thru', 'shunt-thru'];

/**
 * Series-thru: Z in series between two ports of reference Z0 sees 2·Z0 around it, so
 * S21 = 2·Z0 / (2·Z0 + Z). (Z = 100 Ω in 50 Ω: S21 = 0.5, −6.02 dB.)
 */
export function impedanceToS21SeriesThru(z: Complex, z0: number): Complex {
  return divide(complex(2 * z0), add(complex(2 * z0), z));
}

/** Z = 2·Z0·(1 − S21) / S21. */
export function s21ToImpedanceSeriesThru(s21: Complex, z0: number): Complex {
  return scale(divide(subtract(complex(1), s21), s21), 2 * z0);
}

/** Shunt-thru: Z from the through line to ground in a Z0 system: S21 = 2·Z / (2·Z + Z0). */
export function impedanceToS21ShuntThru(z: Complex, z0: number): Complex {
  return divide(scale(z, 2), add(scale(z, 2), complex(z0)));
}

/** Z = Z0·S21 / (2·(1 − S21)). */
export function s21ToImpedanceShuntThru(s21: Complex, z0: number): Complex {
  return divide(scale(s21, z0), scale(subtract(complex(1), s21), 2));
}

/** The full S-matrix of a thru fixture holding impedance Z (symmetric and reciprocal). */
export function thruFixtureSParameters(fixture: ThruFixture, z: Complex, z0: number): Omit<TwoPortRecord, 'line' | 'frequencyHz'> {
  if (fixture === 'series-thru') {
    const denominator = add(z, complex(2 * z0));
    const s11 = divide(z, denominator);
    const s21 = impedanceToS21SeriesThru(z, z0);
    return { s11, s21, s12: s21, s22: s11 };
  }
  const denominator = add(scale(z, 2), complex(z0));
  const s11 = divide(complex(-z0), denominator);
  const s21 = impedanceToS21ShuntThru(z, z0);
  return { s11, s21, s12: s21, s22: s11 };
}

export interface ThruImpedance {
  readonly table: ImpedanceTable;
  readonly fixture: ThruFixture;
  readonly referenceOhm: number;
  /** The file line of each table point. */
  readonly lines: readonly number[];
}

/**
 * The part's impedance from S21 of a thru fixture. `referenceOhm` overrides the file's R (a
 * fixture measured in another system than the file states). A 0 Hz point is left out (a table
 * holds positive frequencies); a point where the impedance is zero or unbounded is an error.
 */
export function impedanceFromThru(
  data: TouchstoneTwoPort,
  fixture: ThruFixture,
  options: { readonly referenceOhm?: number } = {},
): TextReadResult<ThruImpedance> {
  const z0 = options.referenceOhm ?? data.options.referenceOhm;
  const notes: LineIssue[] = [];
  if (options.referenceOhm !== undefined && options.referenceOhm !== data.options.referenceOhm) {
    notes.push({ line: data.optionLine ?? 0, message: `reference impedance ${z0} Ω used instead of the file's ${data.options.referenceOhm} Ω` });
  }
  const issues: LineIssue[] = [];
  const skippedDc: number[] = [];
  const nonPassive: number[] = [];
  const frequencyHz: number[] = [];
  const magnitudeOhm: number[] = [];
  const phase: number[] = [];
  const lines: number[] = [];
  for (const record of data.records) {
    if (record.frequencyHz === 0) {
      skippedDc.push(record.line);
      continue;
    }
    const z = fixture === 'series-thru' ? s21ToImpedanceSeriesThru(record.s21, z0) : s21ToImpedanceShuntThru(record.s21, z0);
    const size = magnitude(z);
    if (!Number.isFinite(size)) {
      issues.push({
        line: record.line,
        message: `S21 = ${formatComplex(record.s21)} makes the ${fixture} impedance unbounded (S21 = ${fixture === 'series-thru' ? '0' : '1'})`,
      });
      continue;
    }
    if (!(size > 0)) {
      issues.push({ line: record.line, message: `S21 = ${formatComplex(record.s21)} makes the ${fixture} impedance zero` });
      continue;
    }
    if (z.re < 0) nonPassive.push(record.line);
    frequencyHz.push(record.frequencyHz);
    magnitudeOhm.push(size);
    phase.push(phaseDeg(z));
    lines.push(record.line);
    if (issues.length >= MAX_ISSUES) break;
  }
  if (issues.length > 0) return fail(issues);
  if (skippedDc.length > 0) notes.push({ line: skippedDc[0]!, message: 'the 0 Hz point was left out: an impedance table holds positive frequencies' });
  if (nonPassive.length > 0) {
    notes.push({
      line: 0,
      message: `the impedance has a negative real part on ${describeLines(nonPassive)} (|S21| above what a passive part allows): check the calibration`,
    });
  }
  if (frequencyHz.length < 2) return fail([{ line: 0, message: `an impedance table needs at least 2 frequencies, the file gives ${frequencyHz.length}` }]);
  const checked = checkTable({ frequencyHz, magnitudeOhm, phaseDeg: phase }, lines);
  if (!checked.ok) return checked;
  return { ok: true, value: { table: checked.value, fixture, referenceOhm: z0, lines }, notes };
}

/** A measured part for a design, with where it came from. */
export function measuredPartFromThru(result: ThruImpedance, fileName?: string): MeasuredImpedance {
  return {
    kind: 'measured',
    table: result.table,
    origin: {
      format: result.fixture === 'series-thru' ? 'touchstone-series-thru' : 'touchstone-shunt-thru',
      referenceImpedance: result.referenceOhm,
      ...(fileName === undefined ? {} : { fileName }),
    },
  };
}

function formatComplex(value: Complex): string {
  const sign = value.im < 0 ? '−' : '+';
  return `${value.re.toPrecision(6)} ${sign} j${Math.abs(value.im).toPrecision(6)}`;
}

// ---- Writing -------------------------------------------------------------------------------

export interface TouchstoneWriteOptions {
  readonly frequencyUnit?: FrequencyUnit;
  readonly format?: TouchstoneFormat;
  readonly referenceOhm?: number;
  /** Written as "!" comment lines before the option line. */
  readonly comments?: readonly string[];
}

/**
 * A Touchstone v1 two-port file: comments, option line, one line of 9 numbers per frequency.
 * Numbers are written with full precision so that a file read back gives the same values.
 */
export function writeTouchstoneTwoPort(
  records: readonly Omit<TwoPortRecord, 'line'>[],
  options: TouchstoneWriteOptions = {},
): string {
  const unit = options.frequencyUnit ?? 'Hz';
  const format = options.format ?? 'RI';
  const referenceOhm = options.referenceOhm ?? 50;
  const factor = frequencyUnitFactor(unit);
  const pair = (value: Complex): string => {
    if (format === 'RI') return `${value.re} ${value.im}`;
    const size = magnitude(value);
    const angle = phaseDeg(value);
    return format === 'MA' ? `${size} ${angle}` : `${20 * Math.log10(size)} ${angle}`;
  };
  const out: string[] = (options.comments ?? []).map((comment) => `! ${comment}`);
  out.push(`# ${unit} S ${format} R ${referenceOhm}`);
  for (const record of records) {
    const frequency = Number((record.frequencyHz / factor).toPrecision(15));
    out.push([String(frequency), pair(record.s11), pair(record.s21), pair(record.s12), pair(record.s22)].join(' '));
  }
  return `${out.join('\n')}\n`;
}
