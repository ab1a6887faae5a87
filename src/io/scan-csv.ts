import Papa from 'papaparse';
import { DETECTORS, type Detector } from '../model/emissions-schema.ts';
import { formatQuantity } from '../model/units.ts';
import {
  canonicalLevelUnit,
  dbOffsetToDbuV,
  DBM_REFERENCE_OHM,
  DBUV_MINUS_DBM_50_OHM,
  type LevelUnit,
  type LevelUnitName,
  ohmToDbOhm,
  voltsToDbuV,
} from '../spectrum/level-units.ts';
import { DEFAULT_SCAN_TAG, type RejectedLine, type Scan, type ScanTag, type ScanTrace } from '../spectrum/spectrum-types.ts';
import { parseDecimal, quoteField } from './decimal-number.ts';
import { type FrequencyUnit, frequencyUnitFactor, parseFrequencyUnit } from './frequency-unit.ts';
import type { TableDelimiter } from './impedance-table-csv.ts';
import { MAX_SCAN_FILE_BYTES, MAX_SCAN_LINES, scanFileTooLarge, tooManyLines } from './scan-limits.ts';
import { describeLines, stripByteOrderMark } from './text-issues.ts';

/**
 * A receiver scan as a table of text: one line per frequency, the frequency first or in a named
 * column, then one level column per detector. docs/scan-import.md is the user's description.
 *
 * - Separators: comma, semicolon, tab or runs of spaces, found from the first lines unless given.
 * - A decimal comma ("45,2") is read when the separator is not a comma.
 * - A header is optional. It may name the frequency unit ("Frequency [MHz]", "f/kHz"), each
 *   column's detector ("Peak", "QP", "AV" …) and level unit ("[dBµV]", "(dBm)"); the options fill
 *   what it does not name, and a unit that is named nowhere is assumed and said so in the notes.
 * - Lines starting with #, !, %, // or ; (the last not in a semicolon file) are comments; text lines
 *   before the data are a preamble; text lines among the data are skipped. All with a note.
 * - A line that cannot be used is rejected with its 1-based line number and the reason; the rest of
 *   the file still reads. Only a file with nothing usable is an error.
 * - The frequency axis comes out strictly rising: a file that descends is read in reverse; lines
 *   that break the order or repeat a frequency are rejected (the fewest lines that make it rising).
 *
 * Large files: one streaming pass of papaparse over the text (step mode: one row at a time, nothing
 * kept per row but numbers in preallocated typed arrays), then O(n log n) at worst for the order.
 * The scan's arrays share one ArrayBuffer, so it crosses a worker boundary with one transfer.
 */

export interface ScanCsvOptions {
  /** The scan's name (default "scan"). */
  readonly name?: string;
  /** What the scan measured (default "total": a line's level, mode unknown). */
  readonly tag?: ScanTag;
  /** The frequency unit when the header does not name one (default Hz, with a note). */
  readonly frequencyUnit?: FrequencyUnit;
  /** The level unit of columns whose header does not name one (default dBµV, with a note). */
  readonly levelUnit?: LevelUnitName;
  /** Needed for levels in dBµA: dBµV = dBµA + 20·log10(Z_T / 1 Ω). */
  readonly transferImpedanceOhm?: number;
  /** The detector of each level column, in column order, where the header does not name them. */
  readonly detectors?: readonly Detector[];
  /** The separator; found from the data when absent. */
  readonly delimiter?: TableDelimiter;
}

export interface ScanReadError {
  readonly message: string;
  /** Lines rejected before the reader gave up (it may give up before reading any). */
  readonly rejected: readonly RejectedLine[];
  readonly notes: readonly string[];
}

export type ScanReadResult = { readonly ok: true; readonly scan: Scan } | { readonly ok: false; readonly error: ScanReadError };

/** Told the fraction of the work done, rising, at most about a hundred times, last with 1. */
export type ScanReadProgress = (fractionDone: number) => void;

/**
 * Rejected lines listed one by one; beyond this many a file is not a scan with a few bad lines, and
 * the rest are counted in a note instead of building a million messages.
 */
export const MAX_LISTED_REJECTIONS = 10_000;
/** Lines of the text; a line end after the last line does not start another. */
function countLines(text: string): number {
  let lines = text.length === 0 || text.endsWith('\n') ? 0 : 1;
  for (let at = text.indexOf('\n'); at !== -1; at = text.indexOf('\n', at + 1)) lines += 1;
  return lines;
}

/** Lines looked at to find the separator, the header and the first data line. */
const HEAD_MAX_LINES = 20_000;
/** Data-looking lines that are enough to judge the separator and the number of columns. */
const HEAD_DATA_LINES = 200;
/** Line numbers kept for each kind of skipped line, for the notes. */
const LISTED_SKIPS = 50;

const DELIMITERS: readonly TableDelimiter[] = [',', ';', '\t', 'whitespace'];
const DEFAULT_NAME = 'scan';

/** Read a scan from text. See readScanTextWithProgress for the same with progress reports. */
export function readScanText(text: string, options: ScanCsvOptions = {}): ScanReadResult {
  return readScanTextWithProgress(text, options, undefined);
}

/**
 * Read a scan from text, streaming through it and telling `onProgress` how far it has got: rising
 * fractions, at most about a hundred calls, the last one 1 when the reading succeeded. A throwing
 * callback is not the file's fault: progress stops being reported and the reading carries on.
 */
export function readScanTextWithProgress(text: string, options: ScanCsvOptions, onProgress: ScanReadProgress | undefined): ScanReadResult {
  const progress = new Progress(onProgress);
  const problem = checkOptions(options);
  if (problem) return fail(problem, [], []);

  if (text.length > MAX_SCAN_FILE_BYTES) return fail(scanFileTooLarge(text.length), [], []);
  const normal = normaliseNewlines(stripByteOrderMark(text));
  const lineCount = countLines(normal);
  if (lineCount > MAX_SCAN_LINES) return fail(tooManyLines(lineCount), [], []);
  const head = readHead(normal, options.delimiter);
  if (head.kind === 'problem') return fail(head.message, [], []);
  const { firstData } = head;

  const layoutNotes: string[] = [];
  const layout = readLayout(head, options, layoutNotes);
  if (layout.kind === 'problem') return fail(layout.message, [], [formatNote(head.delimiter, false), ...layoutNotes]);
  const { columns } = layout;

  const table = readBody(normal, head, columns, progress);
  progress.report(0.96);
  const order = orderRows(table);
  const rejections = mergeRejections(table.rejections, order.rejections);
  const notes = [formatNote(head.delimiter, table.decimalCommaSeen), ...layoutNotes, ...table.notes, ...order.notes, ...rejections.notes];
  const n = order.count;
  if (n === 0) {
    const why =
      rejections.total === 0
        ? `no data lines after line ${firstData.line - 1}`
        : `all ${rejections.total} data line${rejections.total === 1 ? ' was' : 's were'} rejected (${rejections.summary})`;
    return fail(`nothing usable in the file: ${why}`, rejections.listed, notes);
  }

  const scan = packScan(options, table, n, columns, rejections.listed, notes);
  progress.report(1);
  return { ok: true, scan };
}

// ---------------------------------------------------------------------------------------------
// Options

function checkOptions(options: ScanCsvOptions): string | undefined {
  const unit = options.levelUnit === undefined ? undefined : canonicalLevelUnit(options.levelUnit);
  const z = options.transferImpedanceOhm;
  if (z !== undefined && !(z > 0 && Number.isFinite(z))) {
    return `transferImpedanceOhm must be a positive number of ohms, got ${String(z)}`;
  }
  if (unit === 'dBµA' && z === undefined) return DBUA_NEEDS_IMPEDANCE;
  if (options.detectors) {
    const seen = new Set<Detector>();
    for (const detector of options.detectors) {
      if (!DETECTORS.includes(detector)) return `unknown detector "${String(detector)}"; expected ${DETECTORS.join(', ')}`;
      if (seen.has(detector)) return `the detector ${detector} is given twice in detectors; a scan holds one trace per detector`;
      seen.add(detector);
    }
  }
  return undefined;
}

const DBUA_NEEDS_IMPEDANCE =
  'levels in dBµA need transferImpedanceOhm (in Ω) to become a voltage: dBµV = dBµA + 20·log10(Z_T / 1 Ω)';

// ---------------------------------------------------------------------------------------------
// The head of the file: separator, first data line, width, header

interface HeadLine {
  readonly line: number;
  readonly start: number;
  readonly text: string;
}

interface HeadRow {
  readonly head: HeadLine;
  readonly fields: readonly string[];
  readonly comment: boolean;
}

interface Head {
  readonly kind: 'head';
  readonly delimiter: TableDelimiter;
  readonly rows: readonly HeadRow[];
  /** The first line that looks like data. */
  readonly firstData: HeadLine;
  /** The usual number of values on a data line. */
  readonly width: number;
  readonly firstDataIndex: number;
}

type HeadReading = Head | { readonly kind: 'problem'; readonly message: string };

/** A line whose first non-blank characters mark a comment in any scan file. */
const COMMENT_START = /^\s*(?:#|!|%|\/\/)/u;
/** A line that could be data: it starts with something like a number. */
const STARTS_LIKE_NUMBER = /^\s*"?[+-]?(?:\d|[.,]\d)/u;

function isCommentLine(text: string, delimiter: TableDelimiter | undefined): boolean {
  return COMMENT_START.test(text) || (delimiter !== ';' && /^\s*;/u.test(text));
}

function readHead(text: string, given: TableDelimiter | undefined): HeadReading {
  const lines: HeadLine[] = [];
  let dataLike = 0;
  for (let start = 0, line = 1; lines.length < HEAD_MAX_LINES; line += 1) {
    const newline = text.indexOf('\n', start);
    const end = newline === -1 ? text.length : newline;
    const lineText = text.slice(start, end);
    lines.push({ line, start, text: lineText });
    if (STARTS_LIKE_NUMBER.test(lineText)) dataLike += 1;
    if (dataLike >= HEAD_DATA_LINES || newline === -1) break;
    start = newline + 1;
  }

  const candidates = given ? [given] : DELIMITERS;
  let best: { delimiter: TableDelimiter; rows: HeadRow[]; strict: number; loose: number } | undefined;
  for (const delimiter of candidates) {
    const rows = splitHead(lines, delimiter);
    let strict = 0;
    let loose = 0;
    for (const row of rows) {
      if (row.comment) continue;
      if (looksLikeData(row.fields, delimiter)) loose += 1;
      if (allNumbers(row.fields, delimiter)) strict += 1;
    }
    if (!best || strict > best.strict || (strict === best.strict && loose > best.loose)) best = { delimiter, rows, strict, loose };
  }
  if (!best || best.loose === 0) {
    const how = given ? ` separated by ${delimiterName(given)}` : ' separated by commas, semicolons, tabs or spaces';
    const where = lines.length >= HEAD_MAX_LINES ? ` in the first ${HEAD_MAX_LINES} lines` : '';
    return {
      kind: 'problem',
      message: `no data lines found${where}: expected lines of a frequency followed by one or more levels${how}`,
    };
  }
  const { delimiter, rows } = best;
  const firstDataIndex = rows.findIndex((row) => !row.comment && looksLikeData(row.fields, delimiter));
  const counts = new Map<number, number>();
  for (const row of rows.slice(firstDataIndex)) {
    if (!row.comment && looksLikeData(row.fields, delimiter)) counts.set(row.fields.length, (counts.get(row.fields.length) ?? 0) + 1);
  }
  let width = 0;
  let most = 0;
  for (const [count, times] of counts) {
    if (times > most || (times === most && count > width)) {
      width = count;
      most = times;
    }
  }
  return { kind: 'head', delimiter, rows, firstData: rows[firstDataIndex]!.head, width, firstDataIndex };
}

/**
 * The head lines' fields under one separator: the lines parsed as one text, comments blanked to "#"
 * first (a quote in a comment must not open a field). A line inside a multi-line quoted field has
 * no fields of its own.
 */
function splitHead(lines: readonly HeadLine[], delimiter: TableDelimiter): HeadRow[] {
  const fields: string[][] = lines.map(() => []);
  const text = lines.map((head) => (isCommentLine(head.text, delimiter) ? '#' : head.text)).join('\n');
  let line = 0;
  let rowStart = 0;
  parseRows(text, delimiter, (row, rowEnd) => {
    fields[line] = row;
    for (let at = text.indexOf('\n', rowStart); at !== -1 && at < rowEnd; at = text.indexOf('\n', at + 1)) line += 1;
    rowStart = rowEnd;
  });
  return lines.map((head, i) => ({ head, fields: fields[i]!, comment: isCommentLine(head.text, delimiter) }));
}

/** One line's fields as papaparse splits them. */
function splitLine(text: string, delimiter: TableDelimiter): string[] {
  let fields: string[] = [];
  parseRows(text.split('\n', 1)[0]!, delimiter, (row) => {
    fields = row;
  });
  return fields;
}

/**
 * Every papaparse call of this reader, in step mode with the same options: mixing step and
 * whole-text calls made V8 deoptimise papaparse's parser, and the body of a large file then read
 * several times slower. Fields are trimmed; blanks between spaces and trailing empties are dropped.
 */
function parseRows(
  text: string,
  delimiter: TableDelimiter,
  onRow: (fields: string[], rowEnd: number, quoteProblem: boolean) => void,
): void {
  const source = delimiter === 'whitespace' && text.includes('\t') ? text.replace(/\t/gu, ' ') : text;
  Papa.parse<string[]>(source, {
    delimiter: delimiter === 'whitespace' ? ' ' : delimiter,
    newline: '\n',
    quoteChar: '"',
    header: false,
    skipEmptyLines: false,
    step: (result) => {
      const quoteProblem = result.errors.length > 0 && result.errors.some((e) => e.type === 'Quotes');
      onRow(cleanFields(result.data, delimiter), result.meta.cursor, quoteProblem);
    },
  });
}

/**
 * The rows of the body. A body without a quote character, nearly every receiver export, is split
 * here, line by line into one reused array: papaparse's per-row objects and arrays were most of the
 * time and the garbage of a million-row file (DEVELOPERS.md, decision 36). Anything quoted goes to
 * papaparse, which knows quoted separators and fields over several lines; both give the same fields
 * (test/io/scan-csv-large.test.ts checks it).
 */
function forEachBodyRow(
  body: string,
  delimiter: TableDelimiter,
  onRow: (fields: string[], rowEnd: number, quoteProblem: boolean) => void,
): void {
  if (body.includes('"')) {
    parseRows(body, delimiter, onRow);
    return;
  }
  const fields: string[] = [];
  const separator = delimiter === 'whitespace' ? ' ' : delimiter;
  const tabs = delimiter === 'whitespace' && body.includes('\t');
  const length = body.length;
  for (let start = 0; start < length || start === 0; ) {
    const newline = body.indexOf('\n', start);
    const end = newline === -1 ? length : newline;
    fields.length = 0;
    if (tabs) {
      const line = body.slice(start, end).replace(/\t/gu, ' ');
      for (let from = 0; ; ) {
        const at = line.indexOf(separator, from);
        fields.push(at === -1 ? line.slice(from) : line.slice(from, at));
        if (at === -1) break;
        from = at + 1;
      }
    } else {
      // Fields cut straight from the body: no string per line.
      for (let from = start; ; ) {
        const found = body.indexOf(separator, from);
        const at = found === -1 || found > end ? end : found;
        fields.push(body.slice(from, at));
        if (at === end) break;
        from = at + 1;
      }
    }
    onRow(cleanFields(fields, delimiter), newline === -1 ? length : newline + 1, false);
    if (newline === -1) break;
    start = newline + 1;
  }
}

/**
 * Trim the fields in place (papaparse hands over a fresh array per row); drop blanks between
 * spaces, or trailing empties. In place on purpose: a new array per row made V8 keep every row's
 * garbage through a young-generation collection, which tripled the time of a million-row file.
 */
function cleanFields(raw: string[], delimiter: TableDelimiter): string[] {
  let kept = 0;
  for (let i = 0; i < raw.length; i += 1) {
    const trimmed = raw[i]!.trim();
    if (delimiter !== 'whitespace' || trimmed !== '') raw[kept++] = trimmed;
  }
  if (delimiter !== 'whitespace') while (kept > 0 && raw[kept - 1] === '') kept -= 1;
  raw.length = kept;
  return raw;
}

/** A data line: a number first and at least two numbers (a header or a preamble line is not). */
function looksLikeData(fields: readonly string[], delimiter: TableDelimiter): boolean {
  const comma = delimiter !== ',';
  if (fields.length < 2 || parseDecimal(fields[0]!, comma) === undefined) return false;
  let numbers = 0;
  for (const field of fields) if (parseDecimal(field, comma) !== undefined) numbers += 1;
  return numbers >= 2;
}

function allNumbers(fields: readonly string[], delimiter: TableDelimiter): boolean {
  const comma = delimiter !== ',';
  return fields.length >= 2 && fields.every((field) => parseDecimal(field, comma) !== undefined);
}

// ---------------------------------------------------------------------------------------------
// Columns: which is the frequency, which are levels (detector, unit), which are ignored

interface LevelColumn {
  readonly index: number;
  readonly name: string;
  readonly detector: Detector;
  readonly unit: LevelUnit;
  /** dB added to make dBµV; undefined for volts (a logarithm, not an offset). */
  readonly offsetDb: number | undefined;
}

interface Columns {
  readonly frequency: number;
  readonly frequencyFactorExponent: number;
  readonly levels: readonly LevelColumn[];
  readonly width: number;
}

type LayoutReading = { readonly kind: 'layout'; readonly columns: Columns } | { readonly kind: 'problem'; readonly message: string };

type ColumnRole =
  | { readonly kind: 'frequency'; readonly unit: FrequencyUnit | undefined; readonly problem: string | undefined }
  | { readonly kind: 'level'; readonly detector: Detector | undefined; readonly unit: LevelUnit | undefined; readonly problem: string | undefined }
  | { readonly kind: 'ignored' };

interface NamedColumn {
  readonly index: number;
  readonly name: string;
  readonly role: ColumnRole;
}

function readLayout(head: Head, options: ScanCsvOptions, notes: string[]): LayoutReading {
  const { delimiter, rows, firstDataIndex, width } = head;

  // Header: the last non-blank, non-comment line before the data, or a comment after it that
  // names the columns ("# f/MHz  peak/dBuV"); the other lines before the data are a preamble.
  let named: NamedColumn[] | undefined;
  let headerLine: number | undefined;
  let headerIndex = -1;
  for (let i = firstDataIndex - 1; i >= 0 && headerIndex === -1; i -= 1) {
    const row = rows[i]!;
    if (row.head.text.trim() === '') continue;
    const header = readHeader(row, delimiter, width);
    if (header.kind === 'problem') return { kind: 'problem', message: `line ${row.head.line}: ${header.message}` };
    if (header.kind === 'columns') {
      named = header.columns;
      headerLine = row.head.line;
      headerIndex = i;
      notes.push(`line ${row.head.line}: read as the header${row.comment ? ' (a comment line naming the columns)' : ''}`);
    } else if (!row.comment) {
      break;
    }
  }
  const preamble = rows
    .slice(0, firstDataIndex)
    .filter((row, i) => i !== headerIndex && row.head.text.trim() !== '')
    .map((row) => row.head.line);
  if (preamble.length > 0) notes.push(`skipped ${describeLines(preamble)} before the data (comments and preamble)`);

  if (!named) {
    if (width - 1 > 1 && !options.detectors) {
      return {
        kind: 'problem',
        message:
          `the data lines hold ${width - 1} level columns and no header names their detectors: ` +
          `add a header ("Frequency [MHz], Peak [dBµV], QP [dBµV]", …) or give detectors`,
      };
    }
    named = [];
    for (let index = 0; index < width; index += 1) {
      named.push({
        index,
        name: `column ${index + 1}`,
        role: index === 0 ? { kind: 'frequency', unit: undefined, problem: undefined } : { kind: 'level', detector: undefined, unit: undefined, problem: undefined },
      });
    }
    notes.push(`no header: column 1 read as the frequency, ${width === 2 ? 'column 2 as the level' : `columns 2–${width} as levels`}`);
  }
  return resolveColumns(named, headerLine, width, options, notes);
}

type HeaderReading =
  | { readonly kind: 'columns'; readonly columns: NamedColumn[] }
  | { readonly kind: 'not-a-header' }
  | { readonly kind: 'problem'; readonly message: string };

function readHeader(row: HeadRow, delimiter: TableDelimiter, width: number): HeaderReading {
  const text = row.comment ? row.head.text.replace(/^\s*(?:#|!|%|\/\/|;)+\s*/u, '') : row.head.text;
  let names = splitLine(text, delimiter);
  if (delimiter === 'whitespace') names = glueNames(names);
  const columns = names.map((name, index) => ({ index, name, role: classifyColumn(name) }));
  // A header names the frequency column; a title line ("Peak scan of the adapter") does not.
  const namesFrequency = columns.some((c) => c.role.kind === 'frequency');
  const namesLevel = columns.some((c) => c.role.kind === 'level' && (c.role.detector !== undefined || c.role.unit !== undefined || c.role.problem !== undefined));
  if (!namesFrequency) return { kind: 'not-a-header' };
  if (names.length !== width) {
    // Not a header after all unless it also names a level: a comment or a preamble line.
    if (row.comment || !namesLevel) return { kind: 'not-a-header' };
    const list = names.map((name) => quoteField(name)).join(', ');
    const hint = delimiter === 'whitespace' ? '; separate the names with tabs or the data with commas' : '';
    return { kind: 'problem', message: `the header has ${names.length} names (${list}) but the data lines have ${width} values${hint}` };
  }
  return { kind: 'columns', columns };
}

/**
 * Names in a space-separated header hold spaces themselves ("Max Peak [dBµV]"): put a unit, a
 * bracket or "in …" back with the name before it, and a qualifier ("Max", "Quasi", "Limit") with
 * the word after it.
 */
function glueNames(tokens: readonly string[]): string[] {
  const names: string[] = [];
  let joinNext = false;
  for (const token of tokens) {
    const lower = token.toLowerCase();
    const previous = names[names.length - 1];
    const isUnit = /^[[({/]/u.test(token) || (UNIT_TOKEN.test(lower) && previous !== undefined && !hasUnit(previous));
    if (previous !== undefined && (joinNext || isUnit || lower === 'in')) {
      names[names.length - 1] = `${previous} ${token}`;
      joinNext = lower === 'in';
    } else {
      names.push(token);
      joinNext = QUALIFIERS.has(lower);
    }
  }
  return names;
}

const UNIT_TOKEN = /^(?:[kmg]?hz|db[a-zµμ()]*|v|vrms)$/u;
const QUALIFIERS = new Set(['max', 'max.', 'min', 'quasi', 'c', 'cispr', 'lin', 'limit', 'margin', 'delta', 'corr', 'corr.']);

function hasUnit(name: string): boolean {
  const lower = normaliseName(name);
  return HZ_UNIT.test(lower) || /(?<![a-z])db[a-z]*(?![a-z])|[[(/]\s*v/u.test(lower);
}

/** Lower case, "µ" and "μ" as "u", "dB(µV)" as "dbuv". */
function normaliseName(name: string): string {
  return name
    .toLowerCase()
    .replace(/[µμ]/gu, 'u')
    .replace(/db\s*\(\s*([a-z/]+)\s*\)/gu, 'db$1');
}

const IGNORED_NAME =
  /limit|margin|delta|correct|(?<![a-z])corr(?![a-z])|transducer|factor|(?<![a-z])(?:index|idx|no|nr)(?![a-z])|^#$|comment|remark|(?<![a-z])notes?(?![a-z])|status|flag|rbw|ifbw|bandwidth|(?<![a-z])time(?![a-z])|polari[sz]|height|azimuth|angle|phase/u;
const FREQUENCY_NAME = /fr[eé]q|(?<![a-z])f(?![a-z])|(?<![a-z])[kmg]?hz(?![a-z])/u;
const HZ_UNIT = /(?<![a-z])([kmg]?hz)(?![a-z])/u;
const QUASI_PEAK_NAME = /quasi[\s_-]*peak|(?<![a-z])qpk?(?![a-z])/gu;
const AVERAGE_NAME = /average|(?<![a-z])c?[\s_-]?avg?(?![a-z])|(?<![a-z])cav(?![a-z])/gu;
const PEAK_NAME = /(?<![a-z])(?:max[\s_.-]*)?(?:peak|pk)(?![a-z])|maxpeak|maxpk/gu;

function classifyColumn(name: string): ColumnRole {
  const lower = normaliseName(name);
  if (IGNORED_NAME.test(lower)) return { kind: 'ignored' };
  if (FREQUENCY_NAME.test(lower) && !/(?<![a-z])db/u.test(lower)) {
    const units = new Set([...lower.matchAll(new RegExp(HZ_UNIT.source, 'gu'))].map((m) => parseFrequencyUnit(m[1]!)));
    if (units.size > 1) return { kind: 'frequency', unit: undefined, problem: `the frequency column ${quoteField(name)} names more than one unit` };
    const [unit] = [...units];
    return { kind: 'frequency', unit, problem: undefined };
  }
  const detectors: Detector[] = [];
  let rest = lower;
  for (const [detector, pattern] of [
    ['quasi-peak', QUASI_PEAK_NAME],
    ['average', AVERAGE_NAME],
    ['peak', PEAK_NAME],
  ] as const) {
    const stripped = rest.replace(pattern, ' ');
    if (stripped !== rest) detectors.push(detector);
    rest = stripped;
  }
  const unit = levelUnitInName(rest);
  if (detectors.length > 1) {
    return { kind: 'level', detector: undefined, unit: unit.unit, problem: `the column ${quoteField(name)} names more than one detector (${detectors.join(', ')})` };
  }
  return { kind: 'level', detector: detectors[0], unit: unit.unit, problem: unit.problem && `the column ${quoteField(name)}: ${unit.problem}` };
}

/** The level unit a column name gives, if any: "Peak [dBµV]", "QP/dBuV", "Level (dBm)", "Amplitude [V]". */
function levelUnitInName(lower: string): { unit: LevelUnit | undefined; problem: string | undefined } {
  if (/(?<![a-z])db[a-z]*\s*\/\s*m(?![a-z])/u.test(lower)) {
    return { unit: undefined, problem: 'a field strength (per metre) is a radiated quantity, not comparable with conducted limits' };
  }
  const tokens = [...lower.matchAll(/(?<![a-z])db([a-z]*)(?![a-z])/gu)].map((m) => m[1]!);
  const units = new Set<LevelUnit>();
  for (const token of tokens) {
    const unit = DB_UNITS[token];
    if (unit) units.add(unit);
    else if (token !== '') return { unit: undefined, problem: `the unit dB${token} is not one this reader converts (dBµV, dBm, dBµA, dBV or V)` };
  }
  if (/(?:[[(/]|(?<![a-z])in\s)\s*(?:v|vrms|volts?)\s*(?:rms\s*)?[\])]?\s*$|(?<![a-z])(?:vrms|volts?)(?![a-z])/u.test(lower)) units.add('V');
  if (/(?:[[(/]|(?<![a-z])in\s)\s*(?:mv|uv|nv)\s*[\])]?/u.test(lower)) {
    return { unit: undefined, problem: 'linear millivolts or microvolts are not read; export dBµV or volts' };
  }
  if (units.size > 1) return { unit: undefined, problem: `more than one level unit (${[...units].join(', ')})` };
  return { unit: [...units][0], problem: undefined };
}

const DB_UNITS: Readonly<Record<string, LevelUnit>> = { uv: 'dBµV', m: 'dBm', ua: 'dBµA', v: 'dBV' };

/** Frequency unit, level units and detectors from the header and the options, with notes on every assumption. */
function resolveColumns(named: readonly NamedColumn[], headerLine: number | undefined, width: number, options: ScanCsvOptions, notes: string[]): LayoutReading {
  const problem = (message: string): LayoutReading => ({ kind: 'problem', message: headerLine === undefined ? message : `line ${headerLine}: ${message}` });
  for (const column of named) if (column.role.kind !== 'ignored' && column.role.problem) return problem(column.role.problem);

  const frequencyColumns = named.filter((c) => c.role.kind === 'frequency');
  const levelColumns = named.filter((c) => c.role.kind === 'level');
  if (frequencyColumns.length > 1) {
    return problem(`more than one column looks like the frequency (${frequencyColumns.map((c) => quoteField(c.name)).join(', ')}); keep one`);
  }
  // readHeader and the positional reading both name exactly one.
  const frequencyColumn = frequencyColumns[0]!;
  for (const column of named) if (column.role.kind === 'ignored') notes.push(`ignored the column ${quoteField(column.name)}${ignoredHint(column.name)}`);
  if (levelColumns.length === 0) return problem('no level column: expected one or more columns of levels after the frequency');

  // Frequency unit: the header's, the option's, or hertz.
  const headerFrequencyUnit = frequencyColumn.role.kind === 'frequency' ? frequencyColumn.role.unit : undefined;
  let frequencyUnit: FrequencyUnit;
  if (headerFrequencyUnit) {
    if (options.frequencyUnit && options.frequencyUnit !== headerFrequencyUnit) {
      return problem(`the header gives frequencies in ${headerFrequencyUnit} but frequencyUnit is ${options.frequencyUnit}; drop one of the two`);
    }
    frequencyUnit = headerFrequencyUnit;
    notes.push(`frequency: ${quoteField(frequencyColumn.name)} in ${frequencyUnit} (from the header)`);
  } else if (options.frequencyUnit) {
    frequencyUnit = options.frequencyUnit;
    notes.push(`frequency: ${quoteField(frequencyColumn.name)} in ${frequencyUnit} (from the options)`);
  } else {
    frequencyUnit = 'Hz';
    notes.push(`frequency: ${quoteField(frequencyColumn.name)} read as Hz (assumed: no unit in a header or the options)`);
  }

  // Detectors: the header's, else the options', else peak for a single column.
  if (options.detectors && options.detectors.length !== levelColumns.length) {
    return problem(`detectors lists ${options.detectors.length} but the file has ${levelColumns.length} level column${levelColumns.length === 1 ? '' : 's'}`);
  }
  const headerUnits = new Set<LevelUnit>();
  for (const column of levelColumns) if (column.role.kind === 'level' && column.role.unit) headerUnits.add(column.role.unit);
  const optionUnit = options.levelUnit === undefined ? undefined : canonicalLevelUnit(options.levelUnit);

  const levels: LevelColumn[] = [];
  const seen = new Map<Detector, string>();
  for (const [i, column] of levelColumns.entries()) {
    const role = column.role.kind === 'level' ? column.role : undefined;
    const fromOptions = options.detectors?.[i];
    let detector = role?.detector;
    if (detector && fromOptions && detector !== fromOptions) {
      return problem(`the header names ${quoteField(column.name)} ${detector} but detectors gives ${fromOptions}; drop one of the two`);
    }
    let detectorFrom = 'from the header';
    if (!detector && fromOptions) {
      detector = fromOptions;
      detectorFrom = 'from the options';
    }
    if (!detector) {
      if (levelColumns.length > 1) {
        return problem(`the column ${quoteField(column.name)} names no detector (peak, QP or AV) and there are ${levelColumns.length} level columns; name it or give detectors`);
      }
      detector = 'peak';
      detectorFrom = 'assumed: no detector named; peak is the usual scanning detector, give detectors if it is not';
    }
    const twin = seen.get(detector);
    if (twin !== undefined) return problem(`two columns read as ${detector} (${quoteField(twin)} and ${quoteField(column.name)}); a scan holds one trace per detector, so a file with several lines or modes side by side must be split`);
    seen.set(detector, column.name);

    // Level unit: the column's, the option's, the other columns' single unit, or dBµV.
    let unit = role?.unit;
    let unitFrom = 'from the header';
    if (unit) {
      if (optionUnit && optionUnit !== unit) return problem(`the header gives ${quoteField(column.name)} in ${unit} but levelUnit is ${optionUnit}; drop one of the two`);
    } else if (optionUnit) {
      unit = optionUnit;
      unitFrom = 'from the options';
    } else if (headerUnits.size === 1) {
      unit = [...headerUnits][0]!;
      unitFrom = 'assumed: the unit the other level columns name';
    } else {
      unit = 'dBµV';
      unitFrom = 'assumed: no unit in a header or the options';
    }
    if (unit === 'dBµA' && options.transferImpedanceOhm === undefined) return problem(DBUA_NEEDS_IMPEDANCE);
    levels.push({ index: column.index, name: column.name, detector, unit, offsetDb: dbOffsetToDbuV(unit, options.transferImpedanceOhm) });
    notes.push(`${detector}: ${quoteField(column.name)} in ${unit} (${unitFrom}; detector ${detectorFrom})${conversionNote(unit, options.transferImpedanceOhm)}`);
  }
  return {
    kind: 'layout',
    columns: { frequency: frequencyColumn.index, frequencyFactorExponent: Math.round(Math.log10(frequencyUnitFactor(frequencyUnit))), levels, width },
  };
}

function conversionNote(unit: LevelUnit, transferImpedanceOhm: number | undefined): string {
  switch (unit) {
    case 'dBµV':
      return '';
    case 'dBm':
      return `, converted to dBµV in ${DBM_REFERENCE_OHM} Ω: dBµV = dBm + ${DBUV_MINUS_DBM_50_OHM.toFixed(2)}`;
    case 'dBµA':
      return `, converted to dBµV through ${transferImpedanceOhm ?? 0} Ω: dBµV = dBµA + ${ohmToDbOhm(transferImpedanceOhm ?? 1).toFixed(2)}`;
    case 'V':
      return ', rms volts converted to dBµV: 20·log10(V / 1 µV)';
    case 'dBV':
      return ', converted to dBµV: dBµV = dBV + 120';
  }
}

function ignoredHint(name: string): string {
  return /correct|corr|transducer|factor/u.test(normaliseName(name))
    ? ': levels are taken as they are; if they still need this correction, apply it before importing'
    : '';
}

// ---------------------------------------------------------------------------------------------
// The body: one streaming pass into typed arrays

interface Table {
  readonly count: number;
  readonly frequencyHz: Float64Array;
  readonly levels: readonly Float64Array[];
  readonly lines: Uint32Array;
  readonly rejections: Rejections;
  readonly decimalCommaSeen: boolean;
  readonly notes: readonly string[];
}

/** Rejected lines: the first MAX_LISTED_REJECTIONS listed, all counted by kind. */
class Rejections {
  readonly listed: RejectedLine[] = [];
  total = 0;
  readonly kinds = new Map<string, number>();

  add(line: number, kind: string, reason: string): void {
    this.total += 1;
    this.kinds.set(kind, (this.kinds.get(kind) ?? 0) + 1);
    if (this.listed.length < MAX_LISTED_REJECTIONS) this.listed.push({ line, reason });
  }
}

/**
 * Comment lines among the data become a bare "#": a quote in a comment must not open a field that
 * swallows the lines after it. Without the u flag: this runs over the whole file, and the unicode
 * mode of the regex engine is several times slower here (nothing in the pattern needs it).
 */
const COMMENT_LINES = /^[ \t]*(?:#|!|%|\/\/)[^\n]*/gm;
const COMMENT_LINES_WITH_SEMICOLON = /^[ \t]*(?:#|!|%|\/\/|;)[^\n]*/gm;

function readBody(text: string, head: Head, columns: Columns, progress: Progress): Table {
  const { delimiter, firstData, width } = head;
  const decimalComma = delimiter !== ',';
  const body = text.slice(firstData.start).replace(delimiter === ';' ? COMMENT_LINES : COMMENT_LINES_WITH_SEMICOLON, '#');

  let capacity = 1;
  for (let at = body.indexOf('\n'); at !== -1; at = body.indexOf('\n', at + 1)) capacity += 1;
  // The scan's own buffer from the start (axis, then each trace, `capacity` apart): the rows are
  // ordered in place and the scan's arrays are views of it, so no column is ever copied.
  const buffer = new ArrayBuffer(8 * capacity * (1 + columns.levels.length));
  const frequencyHz = new Float64Array(buffer, 0, capacity);
  const levels = columns.levels.map((_, c) => new Float64Array(buffer, 8 * capacity * (1 + c), capacity));
  const lines = new Uint32Array(capacity);
  const rejections = new Rejections();
  const skipped: number[] = [];
  let skippedCount = 0;
  let decimalCommaSeen = false;
  let count = 0;

  const { frequency: frequencyIndex, frequencyFactorExponent: exponent } = columns;
  const levelColumns = columns.levels;
  const expected = describeColumns(columns);
  const length = body.length;
  let line = firstData.line;
  let rowStart = 0;

  forEachBodyRow(body, delimiter, (fields, rowEnd, quoteProblem) => {
    const rowLine = line;
    for (let at = body.indexOf('\n', rowStart); at !== -1 && at < rowEnd; at = body.indexOf('\n', at + 1)) line += 1;
    rowStart = rowEnd;
    if ((rowLine & 0xfff) === 0) progress.report((0.95 * rowEnd) / Math.max(length, 1));

    if (fields.length === 0) return;
    if (quoteProblem) {
      const last = body.charCodeAt(rowEnd - 1) === 10 ? line - 1 : line;
      const extent = last > rowLine ? `: lines ${rowLine}–${last} were read as one field` : '';
      rejections.add(rowLine, 'quote', `a quoted field is not closed${extent}`);
      return;
    }
    // Most rows start with a number; the pattern test is for the rest.
    if (readNumberField(fields[0]!, true) === undefined && !fields.some(isNumberLike)) {
      // A comment, a repeated header or a text line between parts of a scan.
      skippedCount += 1;
      if (skipped.length < LISTED_SKIPS) skipped.push(rowLine);
      return;
    }
    if (fields.length !== width) {
      if (fields.length < width) rejections.add(rowLine, 'missing column', `missing column: ${fields.length} value${fields.length === 1 ? '' : 's'}, expected ${width} (${expected})`);
      else rejections.add(rowLine, 'extra column', `${fields.length} values, expected ${width} (${expected})`);
      return;
    }

    let reasons: string[] | undefined;
    let kind = '';
    const frequencyField = fields[frequencyIndex]!;
    const frequency = readNumberField(frequencyField, decimalComma, exponent);
    let hz = Number.NaN;
    if (frequency === undefined) {
      kind = numberProblemKind(frequencyField);
      (reasons ??= []).push(numberProblem('frequency', frequencyField));
    } else if (!(frequency > 0)) {
      kind = 'frequency not positive';
      (reasons ??= []).push(`frequency must be positive, got ${frequencyField}`);
    } else {
      hz = frequency;
      if (decimalComma && !decimalCommaSeen && frequencyField.includes(',')) decimalCommaSeen = true;
    }
    for (let c = 0; c < levelColumns.length; c += 1) {
      const column = levelColumns[c]!;
      const field = fields[column.index]!;
      const value = readNumberField(field, decimalComma);
      let dBuV: number;
      if (value === undefined) {
        if (kind === '') kind = numberProblemKind(field);
        (reasons ??= []).push(numberProblem(`${column.detector} level`, field));
        continue;
      } else if (column.offsetDb === undefined) {
        if (!(value > 0)) {
          if (kind === '') kind = 'no dB value';
          (reasons ??= []).push(`${column.detector} level ${field} V has no dB value (a voltage must be positive)`);
          continue;
        }
        dBuV = voltsToDbuV(value);
      } else {
        dBuV = value + column.offsetDb;
      }
      if (decimalComma && !decimalCommaSeen && field.includes(',')) decimalCommaSeen = true;
      levels[c]![count] = dBuV;
    }
    if (reasons) {
      rejections.add(rowLine, kind, reasons.join('; '));
      return;
    }
    frequencyHz[count] = hz;
    lines[count] = rowLine;
    count += 1;
  });

  const notes: string[] = [];
  if (skippedCount > 0) {
    const listed = skippedCount > skipped.length ? `${skippedCount} lines, the first on ${describeLines(skipped.slice(0, 4))}` : describeLines(skipped);
    notes.push(`skipped ${listed} among the data: comments or text without numbers`);
  }
  return { count, frequencyHz, levels, lines, rejections, decimalCommaSeen, notes };
}

/**
 * parseDecimal for a field that is already trimmed, without a regular expression and, for the
 * usual field, without Number(): a million-row scan reads millions of fields, and the pattern test
 * and the string conversion were most of the reading time. The grammar is parseDecimal's (sign,
 * digits, one point (or comma when allowed), exponent). A field of at most 15 significant digits
 * with a decimal exponent of at most 22 is converted exactly as Number() would: digits ≤ 10^15 and
 * powers of ten ≤ 10^22 are exact doubles, so one correctly rounded multiplication or division
 * gives the correctly rounded value (Clinger's fast path); any other field goes to Number(). With
 * `power`, the value times 10^power, rounded once from the decimal text (MHz to Hz: "0.15" is 150000).
 * test/io/scan-csv-large.test.ts compares it with parseDecimal and Number() on random fields.
 */
export function readNumberField(field: string, decimalComma: boolean, power = 0): number | undefined {
  const n = field.length;
  let i = 0;
  let c = n > 0 ? field.charCodeAt(0) : 0;
  const negative = c === 45;
  if (c === 43 || c === 45) i += 1; // + -
  let digits = 0;
  let significant = 0;
  let mantissa = 0;
  let scale = 0;
  let comma = -1;
  while (i < n) {
    c = field.charCodeAt(i);
    if (c < 48 || c > 57) break;
    digits += 1;
    if (significant > 0 || c !== 48) {
      significant += 1;
      if (significant <= 15) mantissa = mantissa * 10 + (c - 48);
    }
    i += 1;
  }
  if (i < n && (c === 46 || (decimalComma && c === 44))) {
    if (c === 44) comma = i;
    i += 1;
    while (i < n) {
      c = field.charCodeAt(i);
      if (c < 48 || c > 57) break;
      digits += 1;
      if (significant > 0 || c !== 48) {
        significant += 1;
        if (significant <= 15) mantissa = mantissa * 10 + (c - 48);
      }
      scale -= 1;
      i += 1;
    }
  }
  if (digits === 0) return undefined;
  let exponent = 0;
  if (i < n && (c === 101 || c === 69)) {
    // e E, then an optional sign and at least one digit
    i += 1;
    c = i < n ? field.charCodeAt(i) : 0;
    const exponentNegative = c === 45;
    if (c === 43 || c === 45) i += 1;
    let exponentDigits = 0;
    while (i < n) {
      c = field.charCodeAt(i);
      if (c < 48 || c > 57) break;
      if (exponent < 100_000) exponent = exponent * 10 + (c - 48);
      exponentDigits += 1;
      i += 1;
    }
    if (exponentDigits === 0) return undefined;
    if (exponentNegative) exponent = -exponent;
  }
  if (i !== n) return undefined;
  if (significant <= 15) {
    const total = scale + exponent + power;
    if (total >= 0 && total <= 22) return signed(mantissa * POWERS_OF_TEN[total]!, negative);
    if (total < 0 && total >= -22) return signed(mantissa / POWERS_OF_TEN[-total]!, negative);
    if (mantissa === 0) return negative ? -0 : 0;
  }
  const value = power === 0 ? Number(comma === -1 ? field : `${field.slice(0, comma)}.${field.slice(comma + 1)}`) : scaleDecimal(field, decimalComma, power);
  return Number.isFinite(value) ? value : undefined;
}

/** 10^0 … 10^22: every one an exact double. */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

function signed(value: number, negative: boolean): number {
  return negative ? -value : value;
}

function describeColumns(columns: Columns): string {
  const names: string[] = [];
  for (let index = 0; index < columns.width; index += 1) {
    const level = columns.levels.find((c) => c.index === index);
    names.push(index === columns.frequency ? 'frequency' : level ? level.detector : 'ignored');
  }
  return names.join(', ');
}

const NON_FINITE = /^[+-]?(?:nan|inf|infinity|∞|1\.#inf|1\.#qnan)$/iu;
const NUMBER_SHAPE = /^[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:e[+-]?\d+)?$/iu;

function isNumberLike(field: string): boolean {
  return NUMBER_SHAPE.test(field) || NON_FINITE.test(field);
}

function numberProblemKind(field: string): string {
  if (field === '') return 'missing value';
  if (NON_FINITE.test(field) || NUMBER_SHAPE.test(field)) return 'not finite';
  return 'not a number';
}

function numberProblem(what: string, field: string): string {
  if (field === '') return `${what} is empty`;
  if (NON_FINITE.test(field)) return `${what} ${quoteField(field)} is not finite (a dB of zero?)`;
  if (NUMBER_SHAPE.test(field)) return `${what} ${quoteField(field)} is not a finite number here`;
  return `${what} ${quoteField(field)} is not a number`;
}

/**
 * A decimal text times 10^exponent, exact to the last digit: "0.15" MHz is 150000 Hz, not
 * 150000.00000000003 (the product 0.15 · 1e6 in binary). The text already passed parseDecimal.
 */
function scaleDecimal(field: string, decimalComma: boolean, exponent: number): number {
  const text = decimalComma ? field.replace(',', '.') : field;
  const e = text.search(/[eE]/u);
  return e === -1 ? Number(`${text}e${exponent}`) : Number(`${text.slice(0, e)}e${Number(text.slice(e + 1)) + exponent}`);
}

// ---------------------------------------------------------------------------------------------
// Order: strictly rising frequency

interface Ordered {
  readonly count: number;
  readonly rejections: Rejections;
  readonly notes: readonly string[];
}

/**
 * Make the rows strictly rising, in place. A file that mostly falls is a downward sweep and is
 * read in reverse. Lines that still break the order are found as the complement of the longest
 * strictly monotone run of rows (O(n log n)), so one mistyped frequency costs its own line and not
 * every line after it. Among equally long runs the one with the earlier lines is kept, so of a
 * repeated frequency the first in reading order stays. Every other row is rejected, as a duplicate
 * or as out of order, naming the kept lines around it.
 */
function orderRows(table: Table): Ordered {
  const { frequencyHz: f, levels, lines } = table;
  const n = table.count;
  const notes: string[] = [];
  const rejections = new Rejections();
  let rising = 0;
  let falling = 0;
  for (let i = 1; i < n; i += 1) {
    if (f[i]! > f[i - 1]!) rising += 1;
    else if (f[i]! < f[i - 1]!) falling += 1;
  }
  // Work in reading order along the file's own direction: key(i) = sign · f[i] must rise.
  const sign = falling > rising ? -1 : 1;
  if (sign === -1) notes.push('the frequencies fall through the file (a downward sweep): read in reverse, rising');
  let length = n;
  if (rising + falling !== n - 1 || Math.min(rising, falling) > 0) {
    const kept = longestRisingRun(f, n, sign);
    length = kept.length;
    explainRejections(f, lines, n, kept, sign, rejections);
    // Keep the rows of the run, in place (kept is in reading order, so j ≤ kept[j]).
    for (let j = 0; j < length; j += 1) {
      const i = kept[j]!;
      f[j] = f[i]!;
      lines[j] = lines[i]!;
      for (const level of levels) level[j] = level[i]!;
    }
  }
  if (sign === -1) {
    reverse(f, length);
    for (const level of levels) reverse(level, length);
    reverse(lines, length);
  }
  return { count: length, rejections, notes };
}

/**
 * Indices (rising) of a longest run whose keys sign·f rise strictly, preferring earlier rows.
 * Scanning from the end, heads[k] is the row that starts the best run of k + 1 rows so far: the one
 * with the largest key (the easiest to put something in front of), the earliest on a tie.
 */
function longestRisingRun(f: Float64Array, n: number, sign: number): Int32Array {
  const heads = new Int32Array(n);
  const next = new Int32Array(n).fill(-1);
  let length = 0;
  for (let i = n - 1; i >= 0; i -= 1) {
    const key = sign * f[i]!;
    // Keys of heads fall as k grows: find the first head this row cannot go in front of.
    let lo = 0;
    let hi = length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (sign * f[heads[mid]!]! > key) lo = mid + 1;
      else hi = mid;
    }
    next[i] = lo > 0 ? heads[lo - 1]! : -1;
    heads[lo] = i;
    if (lo === length) length += 1;
  }
  const kept = new Int32Array(length);
  for (let i = length > 0 ? heads[length - 1]! : -1, j = 0; i !== -1; i = next[i]!, j += 1) kept[j] = i;
  return kept;
}

function explainRejections(f: Float64Array, lines: Uint32Array, n: number, kept: Int32Array, sign: number, rejections: Rejections): void {
  let k = 0;
  for (let i = 0; i < n; i += 1) {
    if (k < kept.length && kept[k] === i) {
      k += 1;
      continue;
    }
    const here = f[i]!;
    const same = findEqual(f, kept, here, sign);
    if (same !== -1) {
      rejections.add(lines[i]!, 'duplicate frequency', `duplicate frequency: ${hzText(here)} is already on line ${lines[same]!}`);
      continue;
    }
    const named = [k > 0 ? kept[k - 1]! : -1, k < kept.length ? kept[k]! : -1].filter((j) => j !== -1).map((j) => `line ${lines[j]!} (${hzText(f[j]!)})`);
    const where = named.length === 2 ? `does not fit between ${named[0]!} and ${named[1]!}` : `is out of order with ${named[0] ?? 'the other lines'}`;
    rejections.add(lines[i]!, 'frequency not rising', `frequency not rising: ${hzText(here)} ${where}`);
  }
}

function reverse(array: Float64Array | Uint32Array, n: number): void {
  array.subarray(0, n).reverse();
}

/** The row in `kept` (keys sign·f rising) whose frequency is `x`, or −1. */
function findEqual(f: Float64Array, kept: Int32Array, x: number, sign: number): number {
  let lo = 0;
  let hi = kept.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sign * f[kept[mid]!]! < sign * x) lo = mid + 1;
    else hi = mid;
  }
  return lo < kept.length && f[kept[lo]!]! === x ? kept[lo]! : -1;
}

function hzText(hz: number): string {
  return formatQuantity(hz, 'Hz', 7);
}

// ---------------------------------------------------------------------------------------------
// Result

interface MergedRejections {
  readonly listed: RejectedLine[];
  readonly total: number;
  readonly summary: string;
  readonly notes: readonly string[];
}

function mergeRejections(parsed: Rejections, ordered: Rejections): MergedRejections {
  const total = parsed.total + ordered.total;
  const kinds = new Map(parsed.kinds);
  for (const [kind, times] of ordered.kinds) kinds.set(kind, (kinds.get(kind) ?? 0) + times);
  const summary = [...kinds].sort((a, b) => b[1] - a[1]).map(([kind, times]) => `${times} ${kind}`).join(', ');
  const listed = [...parsed.listed, ...ordered.listed].sort((a, b) => a.line - b.line).slice(0, MAX_LISTED_REJECTIONS);
  const notes: string[] = [];
  if (total > 0) {
    notes.push(`rejected ${total} line${total === 1 ? '' : 's'}: ${summary}`);
    if (total > listed.length) notes.push(`only the first ${listed.length} rejected lines are listed; ${total - listed.length} more are counted above`);
  }
  return { listed, total, summary, notes };
}

function packScan(
  options: ScanCsvOptions,
  table: Table,
  n: number,
  columns: Columns,
  rejected: readonly RejectedLine[],
  notes: string[],
): Scan {
  // Views of the reader's one buffer (axis, then each trace): one transfer moves the whole scan.
  const frequencyHz = table.frequencyHz.subarray(0, n);
  const scanTraces: ScanTrace[] = columns.levels.map((column, c) => ({ detector: column.detector, levelDbuV: table.levels[c]!.subarray(0, n) }));

  const first = frequencyHz[0]!;
  const last = frequencyHz[n - 1]!;
  notes.push(`${n} point${n === 1 ? '' : 's'} from ${hzText(first)} to ${hzText(last)}`);
  const warnings: string[] = [];
  plausibility(frequencyHz, scanTraces, columns, warnings);
  notes.push(...warnings);
  if (options.tag === undefined) notes.push(`no tag given: read as "${DEFAULT_SCAN_TAG}" (a line's level, mode unknown)`);
  return {
    name: options.name ?? DEFAULT_NAME,
    tag: options.tag ?? DEFAULT_SCAN_TAG,
    frequencyHz,
    traces: scanTraces,
    rejected,
    notes,
    warnings,
  };
}

/** Notes for numbers that are possible but unlikely in a conducted scan: a unit may be wrong (trap: kHz vs MHz, dBm vs dBµV). */
function plausibility(frequencyHz: Float64Array, traces: readonly ScanTrace[], columns: Columns, notes: string[]): void {
  const top = frequencyHz[frequencyHz.length - 1]!;
  const bottom = frequencyHz[0]!;
  if (top < 1e3) notes.push(`check the frequency unit: the highest frequency is ${hzText(top)}, below any conducted-emission band`);
  else if (bottom > 1e9) notes.push(`check the frequency unit: the lowest frequency is ${hzText(bottom)}, above any conducted-emission band`);
  for (const [c, trace] of traces.entries()) {
    let max = -Infinity;
    const levels = trace.levelDbuV;
    for (let i = 0; i < levels.length; i += 1) if (levels[i]! > max) max = levels[i]!;
    if (max < -20) {
      const unit = columns.levels[c]!.unit;
      notes.push(`check the level unit of ${trace.detector}: read as ${unit}, its highest level is ${max.toFixed(1)} dBµV, below any receiver's noise floor`);
    }
  }
}

function fail(message: string, rejected: readonly RejectedLine[], notes: readonly string[]): ScanReadResult {
  return { ok: false, error: { message, rejected, notes } };
}

function formatNote(delimiter: TableDelimiter, decimalComma: boolean): string {
  return `values separated by ${delimiterName(delimiter)}${decimalComma ? ', numbers written with a decimal comma' : ''}`;
}

function normaliseNewlines(text: string): string {
  return text.includes('\r') ? text.replace(/\r\n?/gu, '\n') : text;
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

/** Progress in rising fractions, about a hundredth apart at least, ending with 1. */
class Progress {
  private next = 0;
  private done = false;

  constructor(private callback: ScanReadProgress | undefined) {}

  report(fraction: number): void {
    if (!this.callback || this.done) return;
    const clamped = Math.min(1, Math.max(0, fraction));
    if (clamped < this.next && clamped < 1) return;
    this.next = clamped + 0.01;
    if (clamped === 1) this.done = true;
    try {
      this.callback(clamped);
    } catch {
      // Progress is advisory: a callback that throws is not told again, the reading goes on.
      this.callback = undefined;
    }
  }
}
