import Papa from 'papaparse';
import type { ImpedanceTable, MeasuredImpedance } from '../model/design.ts';
import { impedanceTableSchema } from '../model/design-schema.ts';
import { formatPath } from '../model/validation-error.ts';
import { parseDecimal, quoteField } from './decimal-number.ts';
import { type FrequencyUnit, parseFrequencyUnit, toHertz } from './frequency-unit.ts';
import { describeLines, type LineIssue, splitLines, stripByteOrderMark, type TextReadResult } from './text-issues.ts';

/**
 * A measured two-terminal impedance as a table of text: one line per frequency with frequency,
 * |Z| in ohms and phase in degrees, as impedance analysers and spreadsheets export it.
 *
 * - Separators: comma, semicolon, tab or runs of spaces, found from the data unless given.
 * - A decimal comma ("12,5") is read when the separator is not a comma.
 * - A header line is optional. When present it may name the columns in any order and give units:
 *   frequency in Hz, kHz, MHz or GHz; |Z| in Ω, mΩ, kΩ or MΩ; phase in degrees or radians.
 * - Lines starting with #, !, % or // are comments; text lines before the first data line are
 *   a preamble (the last of them is taken as the header).
 * - Frequencies must rise strictly; a table that falls throughout (a downward sweep) is reversed.
 * Every rejected line is reported with its number and the reason.
 */

export type TableDelimiter = ',' | ';' | '\t' | 'whitespace';
const DELIMITERS: readonly TableDelimiter[] = [',', ';', '\t', 'whitespace'];

export interface ImpedanceTableCsvOptions {
  /** Unit of the frequency column when the header does not name one (default Hz). */
  readonly frequencyUnit?: FrequencyUnit;
  /** The separator; found from the data when absent. */
  readonly delimiter?: TableDelimiter;
}

export interface ImpedanceTableCsv {
  readonly table: ImpedanceTable;
  readonly frequencyUnit: FrequencyUnit;
  /** Where the frequency unit came from. */
  readonly frequencyUnitFrom: 'header' | 'option' | 'default';
  readonly delimiter: TableDelimiter;
  /** True when at least one number was written with a decimal comma. */
  readonly decimalComma: boolean;
  /** Line of the header, if the file has one. */
  readonly headerLine: number | undefined;
  /** The file line of each table point, in table order. */
  readonly lines: readonly number[];
}

/** The most points a table may hold (the design schema's limit). */
export const MAX_TABLE_POINTS = 100_000;
/** Problems listed before a reader gives up on a file that is clearly not a table. */
const MAX_ISSUES = 200;

const COMMENT = /^\s*(?:#|!|%|\/\/)/u;

interface Row {
  readonly line: number;
  readonly fields: readonly string[];
  readonly quoteProblem: boolean;
}

type Role = 'frequency' | 'magnitude' | 'phase';
const ROLE_NAMES: Readonly<Record<Role, string>> = { frequency: 'frequency', magnitude: '|Z|', phase: 'phase' };

interface Columns {
  readonly frequency: number;
  readonly magnitude: number;
  readonly phase: number;
  /** Fields a data line must have: exactly this many without a per-column header, at least with one. */
  readonly width: number;
  readonly exact: boolean;
}

interface HeaderUnits {
  readonly frequencyUnit: FrequencyUnit | undefined;
  readonly magnitudeFactor: number;
  readonly magnitudeProblem: string | undefined;
  readonly phaseInRadians: boolean;
}

export function readImpedanceTableCsv(text: string, options: ImpedanceTableCsvOptions = {}): TextReadResult<ImpedanceTableCsv> {
  const lines = splitLines(stripByteOrderMark(text));
  // Comments become empty lines so that line numbers stay those of the file.
  const cleaned = lines.map((line) => (COMMENT.test(line) ? '' : line)).join('\n');
  const lineStarts = lineStartOffsets(cleaned);

  const candidates = options.delimiter ? [options.delimiter] : DELIMITERS;
  let best: { delimiter: TableDelimiter; rows: Row[]; score: number } | undefined;
  for (const delimiter of candidates) {
    const rows = parseRows(cleaned, delimiter, lineStarts);
    const score = rows.filter((row) => looksLikeData(row, delimiter)).length;
    if (!best || score > best.score) best = { delimiter, rows, score };
  }
  if (!best || best.score === 0) {
    const how = options.delimiter ? ` separated by ${delimiterName(options.delimiter)}` : '';
    return fail([{ line: 0, message: `no data lines found: expected lines of three numbers${how} (frequency, |Z| in Ω, phase in °)` }]);
  }
  const { delimiter, rows } = best;
  const decimalCommaAllowed = delimiter !== ',';
  const firstData = rows.findIndex((row) => looksLikeData(row, delimiter));
  const preamble = rows.slice(0, firstData).filter((row) => row.fields.length > 0);
  const headerRow = preamble[preamble.length - 1];
  const dataRows = rows.slice(firstData).filter((row) => row.fields.length > 0 || row.quoteProblem);
  const dataWidth = dataRows[0]!.fields.length;

  const issues: LineIssue[] = [];
  const notes: LineIssue[] = [];
  if (preamble.length > 1) {
    notes.push({ line: 0, message: `skipped ${describeLines(preamble.slice(0, -1).map((r) => r.line))} before the header as a preamble` });
  }

  // Columns and units from the header, if it names them.
  let columns: Columns = { frequency: 0, magnitude: 1, phase: 2, width: 3, exact: true };
  let units: HeaderUnits = { frequencyUnit: undefined, magnitudeFactor: 1, magnitudeProblem: undefined, phaseInRadians: false };
  let headerLine: number | undefined;
  if (headerRow) {
    const header = readHeader(headerRow, dataWidth);
    if (header.kind === 'problem') return fail([{ line: headerRow.line, message: header.message }]);
    if (header.kind === 'columns') {
      columns = header.columns;
      units = header.units;
      headerLine = headerRow.line;
    } else {
      notes.push({ line: headerRow.line, message: 'skipped a text line that names no columns; reading frequency, |Z|, phase in that order' });
    }
  }
  if (units.magnitudeProblem) return fail([{ line: headerLine ?? 0, message: units.magnitudeProblem }]);

  // The frequency unit: the header's, the caller's, or hertz.
  let frequencyUnit: FrequencyUnit = 'Hz';
  let frequencyUnitFrom: ImpedanceTableCsv['frequencyUnitFrom'] = 'default';
  if (units.frequencyUnit) {
    if (options.frequencyUnit && options.frequencyUnit !== units.frequencyUnit) {
      return fail([
        {
          line: headerLine ?? 0,
          message: `the header gives frequencies in ${units.frequencyUnit} but ${options.frequencyUnit} was asked for; drop one of the two`,
        },
      ]);
    }
    frequencyUnit = units.frequencyUnit;
    frequencyUnitFrom = 'header';
  } else if (options.frequencyUnit) {
    frequencyUnit = options.frequencyUnit;
    frequencyUnitFrom = 'option';
  } else {
    notes.push({ line: 0, message: 'no frequency unit in a header: frequencies read as Hz' });
  }

  // Data lines.
  const points: { line: number; frequencyHz: number; magnitudeOhm: number; phaseDeg: number }[] = [];
  const wrappedPhase: number[] = [];
  let decimalComma = false;
  for (const row of dataRows) {
    if (issues.length >= MAX_ISSUES) break;
    if (row.quoteProblem) {
      issues.push({ line: row.line, message: 'a quoted field is not closed' });
      continue;
    }
    const count = row.fields.length;
    if (columns.exact ? count !== columns.width : count < columns.width) {
      const expected = columns.exact
        ? `${columns.width} (frequency, |Z|, phase)`
        : `at least ${columns.width} (the header on line ${headerLine ?? 0} has ${columns.width} columns)`;
      const hint = columns.exact && count > columns.width ? '; a header line naming the columns lets the reader pick them from a wider table' : '';
      issues.push({ line: row.line, message: `${count} value${count === 1 ? '' : 's'}, expected ${expected}${hint}` });
      continue;
    }
    const problems: string[] = [];
    const read = (role: Role, index: number): number | undefined => {
      const field = row.fields[index] ?? '';
      const value = parseDecimal(field, decimalCommaAllowed);
      if (value === undefined) {
        problems.push(field === '' ? `${ROLE_NAMES[role]} is empty` : `${ROLE_NAMES[role]} ${quoteField(field)} is not a number`);
      } else if (decimalCommaAllowed && field.includes(',')) {
        decimalComma = true;
      }
      return value;
    };
    const frequency = read('frequency', columns.frequency);
    const magnitude = read('magnitude', columns.magnitude);
    const phase = read('phase', columns.phase);
    if (frequency !== undefined && !(frequency > 0)) problems.push(`frequency must be positive, got ${frequency}`);
    if (magnitude !== undefined && !(magnitude > 0)) problems.push(`|Z| must be positive, got ${magnitude} Ω`);
    if (frequency === undefined || magnitude === undefined || phase === undefined || problems.length > 0) {
      issues.push({ line: row.line, message: problems.join('; ') });
      continue;
    }
    let phaseDeg = units.phaseInRadians ? (phase * 180) / Math.PI : phase;
    if (Math.abs(phaseDeg) > 180) {
      phaseDeg = wrapDegrees(phaseDeg);
      wrappedPhase.push(row.line);
    }
    points.push({ line: row.line, frequencyHz: toHertz(frequency, frequencyUnit), magnitudeOhm: magnitude * units.magnitudeFactor, phaseDeg });
  }
  if (wrappedPhase.length > 0) notes.push({ line: 0, message: `phase outside ±180° wrapped into range on ${describeLines(wrappedPhase)}` });
  if (issues.length > 0) return fail(issues);
  if (points.length > MAX_TABLE_POINTS) {
    return fail([{ line: 0, message: `${points.length} data lines; a table holds at most ${MAX_TABLE_POINTS}` }]);
  }
  if (points.length < 2) {
    return fail([{ line: 0, message: `a table needs at least 2 data lines, found ${points.length}` }]);
  }

  // Order: rising strictly; a table that falls throughout is a downward sweep and is reversed.
  if (points.every((p, i) => i === 0 || p.frequencyHz < points[i - 1]!.frequencyHz)) {
    points.reverse();
    notes.push({ line: 0, message: 'frequencies fall throughout the file: the table was reversed' });
  }
  for (let i = 1; i < points.length && issues.length < MAX_ISSUES; i += 1) {
    const here = points[i]!;
    const before = points[i - 1]!;
    if (here.frequencyHz === before.frequencyHz) {
      issues.push({ line: here.line, message: `frequency ${here.frequencyHz} Hz repeats line ${before.line}` });
    } else if (here.frequencyHz < before.frequencyHz) {
      issues.push({
        line: here.line,
        message: `frequency ${here.frequencyHz} Hz is below the ${before.frequencyHz} Hz of line ${before.line}: sort the table by rising frequency`,
      });
    }
  }
  if (issues.length > 0) return fail(issues);

  const table: ImpedanceTable = {
    frequencyHz: points.map((p) => p.frequencyHz),
    magnitudeOhm: points.map((p) => p.magnitudeOhm),
    phaseDeg: points.map((p) => p.phaseDeg),
  };
  const checked = checkTable(table, points.map((p) => p.line));
  if (!checked.ok) return checked;
  return {
    ok: true,
    value: { table: checked.value, frequencyUnit, frequencyUnitFrom, delimiter, decimalComma, headerLine, lines: points.map((p) => p.line) },
    notes,
  };
}

/** A measured part for a design, from a table read from a file. */
export function measuredPartFromTable(table: ImpedanceTable, fileName?: string): MeasuredImpedance {
  return { kind: 'measured', table, origin: { format: 'impedance-table', ...(fileName === undefined ? {} : { fileName }) } };
}

/** Hold the result to the design schema's own rule for tables, so a read table always loads. */
export function checkTable(table: ImpedanceTable, lines: readonly number[]): TextReadResult<ImpedanceTable> {
  const parsed = impedanceTableSchema.safeParse(table);
  if (parsed.success) return { ok: true, value: parsed.data, notes: [] };
  return fail(
    parsed.error.issues.map((issue) => {
      const index = issue.path[1];
      const line = typeof index === 'number' ? (lines[index] ?? 0) : 0;
      return { line, message: `${formatPath(issue.path)}: ${issue.message}` };
    }),
  );
}

function fail<T>(issues: readonly LineIssue[]): TextReadResult<T> {
  return { ok: false, issues };
}

function delimiterName(delimiter: TableDelimiter): string {
  switch (delimiter) {
    case ',':
      return 'commas';
    case ';':
      return 'semicolons';
    case '\t':
      return 'tabs';
    case 'whitespace':
      return 'spaces';
  }
}

function wrapDegrees(degrees: number): number {
  const wrapped = degrees - 360 * Math.round(degrees / 360);
  return wrapped === -180 ? 180 : wrapped;
}

function lineStartOffsets(text: string): number[] {
  const starts = [0];
  for (let i = 0; i < text.length; i += 1) if (text.charCodeAt(i) === 10) starts.push(i + 1);
  return starts;
}

/** 1-based line of a character offset. */
function lineAt(starts: readonly number[], offset: number): number {
  let lo = 0;
  let hi = starts.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (starts[mid]! <= offset) lo = mid;
    else hi = mid - 1;
  }
  return lo + 1;
}

/** Rows as papaparse splits them, each with the file line it starts on. */
function parseRows(cleaned: string, delimiter: TableDelimiter, lineStarts: readonly number[]): Row[] {
  const rows: Row[] = [];
  let start = 0;
  // Runs of blanks separate fields in a whitespace table: papaparse splits on single spaces, and
  // the empty fields between repeated spaces are dropped below. Tabs count as spaces there.
  const source = delimiter === 'whitespace' ? cleaned.replace(/\t/gu, ' ') : cleaned;
  Papa.parse<string[]>(source, {
    delimiter: delimiter === 'whitespace' ? ' ' : delimiter,
    newline: '\n',
    quoteChar: '"',
    header: false,
    skipEmptyLines: false,
    step: (result) => {
      const line = lineAt(lineStarts, start);
      start = result.meta.cursor;
      const raw = result.data.map((field) => field.trim());
      const fields = delimiter === 'whitespace' ? raw.filter((field) => field !== '') : dropTrailingEmpty(raw);
      rows.push({ line, fields, quoteProblem: result.errors.some((e) => e.type === 'Quotes') });
    },
  });
  return rows;
}

function dropTrailingEmpty(fields: string[]): string[] {
  let end = fields.length;
  while (end > 0 && fields[end - 1] === '') end -= 1;
  return fields.slice(0, end);
}

/** A data line: it starts with a number and holds at least three (a header or a preamble line does not). */
function looksLikeData(row: Row, delimiter: TableDelimiter): boolean {
  const comma = delimiter !== ',';
  if (row.fields.length < 3 || parseDecimal(row.fields[0]!, comma) === undefined) return false;
  return row.fields.filter((field) => parseDecimal(field, comma) !== undefined).length >= 3;
}

const PHASE_NAME = /phase|deg|°|angle|\barg\b|θ/u;
const FREQUENCY_NAME = /freq|(?:^|[^a-z])[kmg]?hz(?:$|[^a-z])|^f$|^f[^a-z]/u;
const MAGNITUDE_NAME = /\|z\||mag|imped|ohm|ω|^z$|^z[^a-z]/u;

function roleOf(name: string): Role | undefined {
  const lower = name.toLowerCase();
  if (PHASE_NAME.test(lower)) return 'phase';
  if (FREQUENCY_NAME.test(lower)) return 'frequency';
  if (MAGNITUDE_NAME.test(lower)) return 'magnitude';
  return undefined;
}

type HeaderReading =
  | { kind: 'columns'; columns: Columns; units: HeaderUnits }
  | { kind: 'not-a-header' }
  | { kind: 'problem'; message: string };

/**
 * Read the header: per field when it has as many fields as the data (a spreadsheet export), or as
 * a whole line of names for a three-column table whose names contain spaces ("Frequency (Hz) |Z| (Ohm) Phase (deg)").
 */
function readHeader(row: Row, dataWidth: number): HeaderReading {
  const perField = row.fields.length === dataWidth ? readHeaderFields(row.fields) : undefined;
  if (perField?.kind === 'columns') return perField;
  const whole = dataWidth === 3 ? readHeaderLine(row.fields.join(' ')) : undefined;
  if (whole?.kind === 'columns') return whole;
  // A title or preamble line names one column at most ("Impedance of the bead"); a header, two or more.
  const named = new Set([...row.fields.map(roleOf), ...rolesInLine(row.fields.join(' '))].filter((r) => r !== undefined));
  if (named.size < 2) return { kind: 'not-a-header' };
  return (
    perField ??
    whole ?? {
      kind: 'problem',
      message: `the header has ${row.fields.length} names but the first data line has ${dataWidth} values; give one name per column`,
    }
  );
}

/** One name per column: find each role's column. */
function readHeaderFields(fields: readonly string[]): HeaderReading {
  const roles = fields.map(roleOf);
  const index = (role: Role): number[] => roles.flatMap((r, i) => (r === role ? [i] : []));
  const at: Record<Role, number[]> = { frequency: index('frequency'), magnitude: index('magnitude'), phase: index('phase') };
  const all: readonly Role[] = ['frequency', 'magnitude', 'phase'];
  const names = fields.map((f) => quoteField(f)).join(', ');
  const doubled = all.find((role) => at[role].length > 1);
  if (doubled) return { kind: 'problem', message: `more than one column of the header ${names} looks like ${ROLE_NAMES[doubled]}; keep one` };
  const missing = all.filter((role) => at[role].length === 0);
  if (missing.length > 0) {
    return {
      kind: 'problem',
      message: `the header ${names} has no ${missing.map((r) => ROLE_NAMES[r]).join(' or ')} column; expected frequency, |Z| in Ω and phase in °`,
    };
  }
  const frequency = at.frequency[0]!;
  const magnitude = at.magnitude[0]!;
  const phase = at.phase[0]!;
  return {
    kind: 'columns',
    columns: { frequency, magnitude, phase, width: Math.max(frequency, magnitude, phase) + 1, exact: false },
    units: headerUnits(fields[frequency]!, fields[magnitude]!, fields[phase]!),
  };
}

/**
 * A header whose names hold spaces ("Frequency (Hz) |Z| (Ohm) Phase (deg)") over a table of three
 * columns, split on blanks: the names in the order they appear, each with the text up to the next.
 */
function readHeaderLine(text: string): HeaderReading {
  const found = rolesInLine(text);
  if (found.length < 3) {
    return { kind: 'problem', message: `the header ${quoteField(text)} does not name frequency, |Z| and phase; name all three or drop the header` };
  }
  const at = (role: Role): number => text.toLowerCase().search(LINE_PATTERNS[role]);
  const ordered = [...found].sort((a, b) => at(a) - at(b));
  const column = (role: Role): number => ordered.indexOf(role);
  const segment = (role: Role): string => {
    const i = column(role);
    const next = ordered[i + 1];
    return text.slice(at(role), next === undefined ? text.length : at(next));
  };
  return {
    kind: 'columns',
    columns: { frequency: column('frequency'), magnitude: column('magnitude'), phase: column('phase'), width: 3, exact: true },
    units: headerUnits(segment('frequency'), segment('magnitude'), segment('phase')),
  };
}

/** Where each column's name starts in a header read as one line. */
const LINE_PATTERNS: Readonly<Record<Role, RegExp>> = {
  frequency: /freq|(?:^|[^a-z])[kmg]?hz(?:$|[^a-z])|^f(?:$|[^a-z])/u,
  magnitude: /\|z\||mag|imped|^z(?:$|[^a-z])|\sz(?:$|[^a-z|])/u,
  phase: /phase|angle|\barg\b|θ/u,
};

function rolesInLine(text: string): Role[] {
  const lower = text.toLowerCase();
  return (['frequency', 'magnitude', 'phase'] as const).filter((role) => lower.search(LINE_PATTERNS[role]) >= 0);
}

function headerUnits(frequencyName: string, magnitudeName: string, phaseName: string): HeaderUnits {
  const unitMatch = /(?:^|[^a-z])([kmg]?hz)(?:$|[^a-z])/iu.exec(frequencyName);
  const frequencyUnit = unitMatch ? parseFrequencyUnit(unitMatch[1]!) : undefined;
  let magnitudeFactor = 1;
  let magnitudeProblem: string | undefined;
  if (/db/iu.test(magnitudeName)) {
    magnitudeProblem = `the |Z| column ${quoteField(magnitudeName)} is in dB; export |Z| in ohms`;
  } else if (/kΩ|kohm/iu.test(magnitudeName)) {
    magnitudeFactor = 1e3;
  } else if (/MΩ|Mohm|MOhm|MOHM/u.test(magnitudeName)) {
    magnitudeFactor = 1e6;
  } else if (/mΩ|mohm|mOhm/u.test(magnitudeName)) {
    magnitudeFactor = 1e-3;
  }
  const phaseInRadians = /rad/iu.test(phaseName) && !/deg|°/iu.test(phaseName);
  return { frequencyUnit, magnitudeFactor, magnitudeProblem, phaseInRadians };
}
