import { parseDecimal } from './decimal-number.ts';
import type { FrequencyUnit } from './frequency-unit.ts';
import { measuredPartFromTable, readImpedanceTableCsv } from './impedance-table-csv.ts';
import { type LineIssue, splitLines, type TextReadResult } from './text-issues.ts';
import { impedanceFromNetwork, type MeasurementFixture, measuredPartFromNetwork } from './touchstone.ts';
import { readTouchstone } from './touchstone-network.ts';
import type { MeasuredImpedance } from '../model/index.ts';

/**
 * A measurement file on its way into a design: a |Z|/phase table or a Touchstone file, read
 * by the io readers. The readers refuse a whole file for one bad line; here a bad data line is left
 * out and reported instead, and the file is refused only when no usable table remains (docs/cli.md,
 * `measured-part`). The command line and the page (through its file-reading worker) both read
 * measured parts here, so a file reads the same way in either.
 */

export type MeasurementKind = 'impedance-table' | 'touchstone';

/** The most lines left out before a file is taken as not a table at all (the readers stop listing at 200). */
export const MAX_REJECTED_LINES = 199;

const TOUCHSTONE_EXTENSION = /\.(?:[syz]\d+p|ts)$/iu;
const OPTION_WORDS = new Set(['hz', 'khz', 'mhz', 'ghz', 's', 'y', 'z', 'h', 'g', 'ri', 'ma', 'db', 'r']);

/**
 * Touchstone when the name ends in .s<n>p (.y<n>p, .z<n>p) or .ts, or when the first line that is not a comment or blank is a
 * Touchstone option line ("# MHz S DB R 50") or a Touchstone 2 keyword ("[Version] 2.0"); a |Z| table
 * otherwise. Table files use "#" for comments too, so a "#" line counts only when it holds option words.
 */
export function detectMeasurementKind(path: string, text: string): MeasurementKind {
  if (TOUCHSTONE_EXTENSION.test(path)) return 'touchstone';
  for (const raw of splitLines(text)) {
    const line = raw.replace(/^\uFEFF/u, '').trim();
    if (line === '' || line.startsWith('!') || line.startsWith('%') || line.startsWith('//')) continue;
    if (line.startsWith('[')) return 'touchstone';
    if (line.startsWith('#')) {
      if (isOptionLine(line)) return 'touchstone';
      continue;
    }
    return 'impedance-table';
  }
  return 'impedance-table';
}

function isOptionLine(line: string): boolean {
  const tokens = line.slice(1).replace(/!.*$/u, '').trim().split(/\s+/u).filter((token) => token !== '');
  if (tokens.length === 0) return false;
  return tokens.every((token, i) => OPTION_WORDS.has(token.toLowerCase()) || (tokens[i - 1]?.toLowerCase() === 'r' && parseDecimal(token) !== undefined));
}

export interface MeasurementReadOptions {
  readonly kind: MeasurementKind;
  /** The file's name as given: Touchstone uses its extension; the origin keeps its last part. */
  readonly path: string;
  /** Tables only: the frequency unit when the header names none. */
  readonly frequencyUnit?: FrequencyUnit;
  /** Touchstone only: how the part was connected; a one-port file needs none (it is a reflection). */
  readonly fixture?: MeasurementFixture;
  /** Refuse the file for any rejected line instead of leaving the line out. */
  readonly strict?: boolean;
}

export type MeasurementReading =
  | {
      readonly ok: true;
      readonly part: MeasuredImpedance;
      /** Data lines left out, each with why. */
      readonly rejected: readonly LineIssue[];
      /** What the reader assumed or did (a unit taken as Hz, a table reversed, a 0 Hz point left out). */
      readonly notes: readonly LineIssue[];
    }
  | { readonly ok: false; readonly issues: readonly LineIssue[] };

/**
 * Read a measurement file into a measured part. A rejected data line is blanked (so line numbers
 * stay those of the file) and the file read again; the reading fails when a problem concerns the
 * file as a whole (line 0, a header, an option line), when frequencies are out of order, when a
 * Touchstone line that is not a whole record is rejected, when too many lines are rejected, when
 * fewer than two points remain, or on any rejected line with `strict`.
 */
export function readMeasurement(text: string, options: MeasurementReadOptions): MeasurementReading {
  const lines = splitLines(text);
  const attempt = (source: string): TextReadResult<MeasuredImpedance> => readPart(source, options);
  const droppable = options.kind === 'touchstone' ? touchstoneDataLine(lines) : tableDataLine(lines);
  const rejected: LineIssue[] = [];
  // Each round leaves out at least one more line (a left-out line is blank and cannot be rejected
  // again), and a Touchstone reader stops at its first broken line, so a round can bring out more.
  for (;;) {
    const result = attempt(lines.join('\n'));
    if (result.ok) return { ok: true, part: result.value, rejected: byLine(rejected), notes: result.notes };
    const blocking = result.issues.filter(
      (issue) =>
        issue.line <= 0 || issue.line > lines.length || isOrderProblem(issue) || !droppable(issue.line) || lines[issue.line - 1] === '',
    );
    const lineCount = new Set([...rejected, ...result.issues].map((issue) => issue.line)).size;
    if (options.strict || blocking.length > 0 || lineCount > MAX_REJECTED_LINES) {
      const tooMany: LineIssue[] =
        !options.strict && blocking.length === 0
          ? [{ line: 0, message: `more than ${MAX_REJECTED_LINES} lines rejected: this does not look like a measurement file of this kind` }]
          : [];
      return { ok: false, issues: [...byLine([...rejected, ...result.issues]), ...tooMany] };
    }
    for (const issue of result.issues) {
      lines[issue.line - 1] = '';
      rejected.push(issue);
    }
  }
}

function readPart(text: string, options: MeasurementReadOptions): TextReadResult<MeasuredImpedance> {
  const fileName = baseName(options.path);
  if (options.kind === 'impedance-table') {
    const read = readImpedanceTableCsv(text, options.frequencyUnit === undefined ? {} : { frequencyUnit: options.frequencyUnit });
    if (!read.ok) return read;
    return { ok: true, value: measuredPartFromTable(read.value.table, fileName), notes: read.notes };
  }
  const data = readTouchstone(text, { fileName: options.path });
  if (!data.ok) return data;
  const fixture = options.fixture ?? (data.value.ports === 1 ? 'reflection' : undefined);
  if (fixture === undefined) {
    return {
      ok: false,
      issues: [{ line: 0, message: `a ${data.value.ports}-port file: say how the part was connected with --fixture series-thru or --fixture shunt-thru` }],
    };
  }
  const converted = impedanceFromNetwork(data.value, fixture);
  if (!converted.ok) return converted;
  return { ok: true, value: measuredPartFromNetwork(converted.value, fileName), notes: [...data.notes, ...converted.notes] };
}

/** The last part of a path, short enough for `origin.fileName` (260 characters at most). */
export function baseName(path: string): string | undefined {
  const name = path.split(/[/\\]/u).pop() ?? '';
  return name === '' ? undefined : name.slice(0, 260);
}

/**
 * Frequencies out of order (repeated, or falling) are a problem of the table, not of one line:
 * which of two lines is wrong cannot be told, and leaving out every line below an outlier would keep
 * the outlier. Recognised by the readers' wording (pinned by test/cli/measured-part.test.ts).
 */
function isOrderProblem(issue: LineIssue): boolean {
  return /^frequency .* (?:repeats line \d+|is below the .* of line \d+|is not above the .* of line \d+)/u.test(issue.message);
}

/**
 * A table line may be left out when it lies in the data: at or after the first line that holds
 * three numbers and starts with one (a header or preamble line never does). A problem reported on a
 * header line therefore refuses the file, so a header is never dropped and its units never lost.
 */
function tableDataLine(lines: readonly string[]): (line: number) => boolean {
  const first = lines.findIndex(looksLikeData);
  return (line) => first >= 0 && line - 1 >= first;
}

function looksLikeData(line: string): boolean {
  const tokens = line
    .replace(/"/gu, '')
    .trim()
    .split(/[,;\s]+/u)
    .filter((token) => token !== '');
  if (tokens.length < 3 || parseDecimal(tokens[0]!) === undefined) return false;
  return tokens.filter((token) => parseDecimal(token) !== undefined).length >= 3;
}

/**
 * A Touchstone line may be left out when it holds a whole record: as many fields as most one-line
 * records of the file have (3 for a one-port, 9 for a two-port). A record wrapped over lines is never
 * split up, so leaving a line out can never join one record's frequency to another's numbers; option
 * lines and keyword lines are never dropped.
 */
function touchstoneDataLine(lines: readonly string[]): (line: number) => boolean {
  const fieldCount = (line: number): number | undefined => {
    const content = (lines[line - 1] ?? '').replace(/!.*$/u, '').trim();
    if (content === '' || content.startsWith('#') || content.startsWith('[')) return undefined;
    return content.split(/\s+/u).length;
  };
  // The usual length of a one-line record: the commonest odd field count.
  const counts = new Map<number, number>();
  for (let line = 1; line <= lines.length; line += 1) {
    const count = fieldCount(line);
    if (count !== undefined && count % 2 === 1 && count >= 3) counts.set(count, (counts.get(count) ?? 0) + 1);
  }
  let recordFields = 0;
  let seen = 0;
  for (const [count, times] of counts) if (times > seen) [recordFields, seen] = [count, times];
  return (line) => recordFields > 0 && fieldCount(line) === recordFields;
}

/** Issues in file order, whole-file problems (line 0) last. */
function byLine(issues: readonly LineIssue[]): LineIssue[] {
  const key = (issue: LineIssue): number => (issue.line > 0 ? issue.line : Number.POSITIVE_INFINITY);
  return [...issues].sort((a, b) => key(a) - key(b));
}
