import Papa from 'papaparse';
import type { LimitMask } from '../model/design.ts';
import { DETECTORS, type Detector, limitMaskSchema } from '../model/emissions-schema.ts';
import { formatPath } from '../model/validation-error.ts';
import { parseDecimal, quoteField } from './decimal-number.ts';
import { type FrequencyUnit, frequencyUnitFactor, parseFrequencyUnit, toHertz } from './frequency-unit.ts';
import { type LineIssue, splitLines, stripByteOrderMark, type TextReadResult } from './text-issues.ts';

/**
 * A limit mask as a text table: one line per point, frequency then level in dBµV, so that a limit
 * line can be typed into a spreadsheet or kept beside a test plan. The format is this project's own
 * (docs/limits.md, "Mask files"):
 *
 * ```text
 * # id: internal-class-b-qp
 * # name: Internal class B quasi-peak, 6 dB below the standard
 * # detector: quasi-peak
 * # origin: invented example
 * frequency (MHz),level (dBuV)
 * 0.15,60
 * 0.5,50
 * 5,50
 * 5,54
 * 30,54
 * ```
 *
 * - Separators: comma, semicolon or tab, found from the data unless given. A decimal comma
 *   ("0,15") is read when the separator is not a comma.
 * - Lines starting with #, !, % or // are comments. A comment `# key: value` with the key id, name,
 *   detector or origin (any case) gives that field of the mask; a value in double quotes is read as a
 *   JSON string (the writer quotes values with line breaks or outer blanks). Other comments are
 *   ignored.
 * - One header line, before the data, is optional: two names, a frequency column ("frequency",
 *   "f", anything with Hz) and a level column ("level", "limit", anything with dB), in either order.
 *   The frequency unit comes from it (Hz, kHz, MHz, GHz), else from the `frequencyUnit` option,
 *   else Hz. Levels are dBµV; a header naming another unit (dBm, dBµA, dBµV/m) is refused.
 * - A step is two lines at one frequency; frequencies must not fall, and no frequency may appear on
 *   more than two lines. A mask has 2 to 10 000 points.
 * - Every line that cannot be used is reported with its number and the reason, and then nothing is
 *   imported: a limit with a line silently dropped is a different limit.
 *
 * `maskToCsv` writes this format; reading what it wrote gives back the same mask.
 */

export type MaskDelimiter = ',' | ';' | '\t';
const DELIMITERS: readonly MaskDelimiter[] = [',', ';', '\t'];

export interface MaskCsvOptions {
  /** Unit of the frequency column when the header does not name one (default Hz). A header naming another unit is an error. */
  readonly frequencyUnit?: FrequencyUnit;
  /** The separator; found from the data when absent. */
  readonly delimiter?: MaskDelimiter;
  /** The detector when the file does not name one. A file naming a different one is an error. */
  readonly detector?: Detector;
  /** The name when the file does not give one (the file's name, say). */
  readonly name?: string;
  /** The id when the file does not give one; without either it is made from the name. */
  readonly id?: string;
  /** The origin when the file does not give one. */
  readonly origin?: string;
}

export interface MaskCsv {
  readonly mask: LimitMask;
  readonly frequencyUnit: FrequencyUnit;
  /** Where the frequency unit came from. */
  readonly frequencyUnitFrom: 'header' | 'option' | 'default';
  readonly delimiter: MaskDelimiter;
  /** True when at least one number was written with a decimal comma. */
  readonly decimalComma: boolean;
  /** Line of the header, if the file has one. */
  readonly headerLine: number | undefined;
  /** The file line of each point, in mask order. */
  readonly lines: readonly number[];
}

export interface MaskCsvWriteOptions {
  /** Unit of the frequency column (default Hz, which always reads back exactly). */
  readonly frequencyUnit?: FrequencyUnit;
  readonly delimiter?: MaskDelimiter;
}

/** The most points a mask may hold (the design schema's limit). */
export const MAX_MASK_POINTS = 10_000;
const MAX_ISSUES = 200;

const COMMENT = /^\s*(?:#|!|%|\/\/)/u;
const METADATA = /^\s*#\s*([A-Za-z]+)\s*:(.*)$/u;
const METADATA_KEYS = ['id', 'name', 'detector', 'origin'] as const;
type MetadataKey = (typeof METADATA_KEYS)[number];

/** Detector spellings accepted in a file, lower case with blanks, "_" and "-" removed. */
const DETECTOR_SPELLINGS: Readonly<Record<string, Detector>> = {
  peak: 'peak',
  pk: 'peak',
  quasipeak: 'quasi-peak',
  qp: 'quasi-peak',
  average: 'average',
  avg: 'average',
  av: 'average',
};

interface Line {
  readonly line: number;
  readonly fields: readonly string[];
  readonly quoteProblem: boolean;
}

interface Metadata {
  readonly value: string;
  readonly line: number;
}

export function readMaskCsv(text: string, options: MaskCsvOptions = {}): TextReadResult<MaskCsv> {
  const fileLines = splitLines(stripByteOrderMark(text));
  const issues: LineIssue[] = [];
  const notes: LineIssue[] = [];

  // Metadata comments, then the other lines (comments and blank lines dropped, numbers kept).
  const metadata = new Map<MetadataKey, Metadata>();
  const content: { line: number; text: string }[] = [];
  fileLines.forEach((textLine, index) => {
    const line = index + 1;
    if (COMMENT.test(textLine)) {
      const found = METADATA.exec(textLine);
      const key = found?.[1]?.toLowerCase();
      if (found && isMetadataKey(key)) {
        const earlier = metadata.get(key);
        const value = readMetadataValue(found[2]!);
        if (earlier) issues.push({ line, message: `the ${key} is already given on line ${earlier.line}` });
        else if (value.ok) metadata.set(key, { value: value.value, line });
        else issues.push({ line, message: `the ${key} ${value.reason}` });
      }
      return;
    }
    if (textLine.trim() !== '') content.push({ line, text: textLine });
  });

  // The separator: the one under which most lines read as two numbers.
  const candidates = options.delimiter ? [options.delimiter] : DELIMITERS;
  let best: { delimiter: MaskDelimiter; rows: Line[]; score: number } | undefined;
  for (const delimiter of candidates) {
    const rows = content.map(({ line, text: body }) => splitRow(line, body, delimiter));
    const score = rows.filter((row) => isData(row, delimiter)).length;
    if (!best || score > best.score) best = { delimiter, rows, score };
  }
  if (!best || best.score === 0) {
    const how = options.delimiter ? delimiterName(options.delimiter) : 'commas, semicolons or tabs';
    return fail([...issues, { line: 0, message: `no data lines found: expected lines of two numbers (frequency, level in dBµV) separated by ${how}` }]);
  }
  const { delimiter, rows } = best;
  const decimalCommaAllowed = delimiter !== ',';

  // The header: the text line before the first data line, if there is one.
  const firstData = rows.findIndex((row) => isData(row, delimiter));
  let columns = { frequency: 0, level: 1 };
  let headerUnit: FrequencyUnit | undefined;
  let levelUnitNamed = false;
  let headerLine: number | undefined;
  rows.slice(0, firstData).forEach((row, index) => {
    if (index < firstData - 1) {
      issues.push({ line: row.line, message: `${describeRow(row)} is neither a header nor data; start notes with #` });
      return;
    }
    const header = readHeader(row);
    if (header.kind === 'problem') {
      issues.push({ line: row.line, message: header.message });
      return;
    }
    columns = header.columns;
    headerUnit = header.frequencyUnit;
    levelUnitNamed = header.levelUnitNamed;
    headerLine = row.line;
  });

  // The frequency unit: the header's, the caller's, or hertz.
  let frequencyUnit: FrequencyUnit = 'Hz';
  let frequencyUnitFrom: MaskCsv['frequencyUnitFrom'] = 'default';
  if (headerUnit) {
    if (options.frequencyUnit && options.frequencyUnit !== headerUnit) {
      issues.push({ line: headerLine ?? 0, message: `the header gives frequencies in ${headerUnit} but ${options.frequencyUnit} was asked for; drop one of the two` });
    }
    frequencyUnit = headerUnit;
    frequencyUnitFrom = 'header';
  } else if (options.frequencyUnit) {
    frequencyUnit = options.frequencyUnit;
    frequencyUnitFrom = 'option';
  } else {
    notes.push({ line: 0, message: 'no frequency unit in a header: frequencies read as Hz' });
  }
  if (!levelUnitNamed) notes.push({ line: 0, message: 'no dBµV in a header: levels read as dBµV' });

  // Data lines.
  const points: { line: number; frequencyHz: number; levelDbuV: number }[] = [];
  let decimalComma = false;
  for (const row of rows.slice(firstData)) {
    if (issues.length >= MAX_ISSUES) break;
    if (row.quoteProblem) {
      issues.push({ line: row.line, message: 'a quoted field is not closed' });
      continue;
    }
    if (row.fields.length !== 2) {
      const commaHint = delimiter === ',' && row.fields.length === 3 ? '; with commas between the values, write decimals with a point (or separate with semicolons)' : '';
      issues.push({ line: row.line, message: `${row.fields.length} value${row.fields.length === 1 ? '' : 's'}, expected 2 (frequency, level)${commaHint}` });
      continue;
    }
    const problems: string[] = [];
    const read = (what: string, field: string): number | undefined => {
      const value = parseDecimal(field, decimalCommaAllowed);
      if (value === undefined) problems.push(field === '' ? `${what} is empty` : `${what} ${quoteField(field)} is not a number`);
      else if (decimalCommaAllowed && field.includes(',')) decimalComma = true;
      return value;
    };
    const frequency = read('frequency', row.fields[columns.frequency]!);
    const level = read('level', row.fields[columns.level]!);
    if (frequency !== undefined && !(frequency > 0)) problems.push(`frequency must be positive, got ${frequency}`);
    if (frequency === undefined || level === undefined || problems.length > 0) {
      issues.push({ line: row.line, message: problems.join('; ') });
      continue;
    }
    points.push({ line: row.line, frequencyHz: toHertz(frequency, frequencyUnit), levelDbuV: level });
  }

  // Order: never falling, a step is two points at one frequency.
  for (let i = 1; i < points.length && issues.length < MAX_ISSUES; i += 1) {
    const here = points[i]!;
    const before = points[i - 1]!;
    if (here.frequencyHz < before.frequencyHz) {
      issues.push({ line: here.line, message: `frequency ${here.frequencyHz} Hz is below the ${before.frequencyHz} Hz of line ${before.line}: frequencies must not fall` });
    } else if (here.frequencyHz === before.frequencyHz && i >= 2 && points[i - 2]!.frequencyHz === here.frequencyHz) {
      issues.push({
        line: here.line,
        message: `${here.frequencyHz} Hz is already on lines ${points[i - 2]!.line} and ${before.line}: a step is two points at one frequency, not three`,
      });
    }
  }
  if (points.length > MAX_MASK_POINTS) issues.push({ line: 0, message: `${points.length} points; a mask holds at most ${MAX_MASK_POINTS}` });
  else if (points.length < 2 && issues.length === 0) issues.push({ line: 0, message: `a mask needs at least 2 points, found ${points.length}` });

  // Detector, name, id and origin: the file's, else the caller's.
  const fileDetector = metadata.get('detector');
  let detector: Detector | undefined = options.detector;
  if (fileDetector) {
    const named = DETECTOR_SPELLINGS[fileDetector.value.toLowerCase().replace(/[\s_-]/gu, '')];
    if (!named) {
      issues.push({ line: fileDetector.line, message: `unknown detector ${quoteField(fileDetector.value)}: expected ${DETECTORS.join(', ')} (or pk, qp, av)` });
    } else if (options.detector && options.detector !== named) {
      issues.push({ line: fileDetector.line, message: `the file gives the detector ${named} but ${options.detector} was asked for; drop one of the two` });
    } else {
      detector = named;
    }
  } else if (!detector) {
    issues.push({ line: 0, message: `no detector: add a line "# detector: quasi-peak" (or peak, average) or choose one when importing` });
  }
  const name = metadata.get('name')?.value ?? options.name;
  const nameText = name ?? 'imported limit mask';
  if (name === undefined) notes.push({ line: 0, message: `no name in the file: named "${nameText}"` });
  let id = metadata.get('id')?.value ?? options.id;
  if (id === undefined) {
    id = idFromName(nameText);
    notes.push({ line: 0, message: `no id in the file: "${id}", made from the name` });
  }
  const origin = metadata.get('origin')?.value ?? options.origin;

  if (issues.length > 0 || detector === undefined) return fail(issues);

  const lines = points.map((p) => p.line);
  const parsed = limitMaskSchema.safeParse({
    id,
    name: nameText,
    detector,
    frequencyHz: points.map((p) => p.frequencyHz),
    levelDbuV: points.map((p) => p.levelDbuV),
    ...(origin === undefined ? {} : { origin }),
  });
  if (!parsed.success) {
    return fail(
      parsed.error.issues.map((issue) => {
        const [field, index] = issue.path;
        const line = typeof index === 'number' ? (lines[index] ?? 0) : isMetadataKey(field) ? (metadata.get(field)?.line ?? 0) : 0;
        return { line, message: `${formatPath(issue.path)}: ${issue.message}` };
      }),
    );
  }
  return {
    ok: true,
    value: { mask: parsed.data, frequencyUnit, frequencyUnitFrom, delimiter, decimalComma, headerLine, lines },
    notes,
  };
}

/**
 * A mask as text that `readMaskCsv` reads back to the same mask: metadata comments, a header and one
 * line per point. Numbers are written in their shortest exact form, so frequencies in Hz (the
 * default) always read back exactly; in kHz, MHz or GHz they do for frequencies of up to 15
 * significant digits (any a person types).
 */
export function maskToCsv(mask: LimitMask, options: MaskCsvWriteOptions = {}): string {
  const unit = options.frequencyUnit ?? 'Hz';
  const delimiter = options.delimiter ?? ',';
  const factor = frequencyUnitFactor(unit);
  const out = [
    '# chokepoint limit mask: one point per line, frequency then level in dBuV; a step is two lines at one frequency',
    `# id: ${metadataText(mask.id)}`,
    `# name: ${metadataText(mask.name)}`,
    `# detector: ${mask.detector}`,
  ];
  if (mask.origin !== undefined) out.push(`# origin: ${metadataText(mask.origin)}`);
  out.push(`frequency (${unit})${delimiter}level (dBuV)`);
  mask.frequencyHz.forEach((frequency, i) => {
    out.push(`${numberText(factor === 1 ? frequency : frequency / factor)}${delimiter}${numberText(mask.levelDbuV[i]!)}`);
  });
  return `${out.join('\n')}\n`;
}

/** Shortest text that reads back to the same double; String(-0) would lose the sign. */
function numberText(value: number): string {
  return Object.is(value, -0) ? '-0' : String(value);
}

function isMetadataKey(key: unknown): key is MetadataKey {
  return typeof key === 'string' && (METADATA_KEYS as readonly string[]).includes(key);
}

/** A metadata value: plain text (trimmed), or a JSON string when it starts with a double quote. */
function readMetadataValue(raw: string): { ok: true; value: string } | { ok: false; reason: string } {
  const trimmed = raw.trim();
  if (!trimmed.startsWith('"')) return { ok: true, value: trimmed };
  try {
    const value: unknown = JSON.parse(trimmed);
    if (typeof value === 'string') return { ok: true, value };
  } catch {
    // Reported below.
  }
  return { ok: false, reason: `${quoteField(trimmed)} starts with a double quote but is not one JSON string` };
}

/** Plain when it reads back as it is, else a JSON string. */
function metadataText(value: string): string {
  const control = [...value].some((ch) => {
    const code = ch.codePointAt(0)!;
    return code < 0x20 || code === 0x7f || code === 0x2028 || code === 0x2029;
  });
  const plain = value === value.trim() && value !== '' && !value.startsWith('"') && !control;
  return plain ? value : JSON.stringify(value);
}

/** "Internal class B (QP)" -> "Internal-class-B-QP": a valid mask id. */
function idFromName(name: string): string {
  const slug = name
    .replace(/[^A-Za-z0-9_.-]+/gu, '-')
    .replace(/^[^A-Za-z]+/u, '')
    .replace(/-+$/u, '')
    .slice(0, 64)
    .replace(/-+$/u, '');
  return slug === '' ? 'mask' : slug;
}

function splitRow(line: number, body: string, delimiter: MaskDelimiter): Line {
  const result = Papa.parse<string[]>(body, { delimiter, newline: '\n', quoteChar: '"', header: false, skipEmptyLines: false });
  const fields = (result.data[0] ?? []).map((field) => field.trim());
  return { line, fields: dropTrailingEmpty(fields), quoteProblem: result.errors.some((e) => e.type === 'Quotes') };
}

function dropTrailingEmpty(fields: string[]): string[] {
  let end = fields.length;
  while (end > 0 && fields[end - 1] === '') end -= 1;
  return fields.slice(0, end);
}

/** A data line: exactly two numbers. */
function isData(row: Line, delimiter: MaskDelimiter): boolean {
  const comma = delimiter !== ',';
  return row.fields.length === 2 && row.fields.every((field) => parseDecimal(field, comma) !== undefined);
}

function describeRow(row: Line): string {
  return row.fields.length === 0 ? 'an empty line' : `the line ${quoteField(row.fields.join(' '))}`;
}

const FREQUENCY_NAME = /freq|hz|^f$|^f[\s([/]/u;
const LEVEL_NAME = /level|limit|db|^l$|^l[\s([/]/u;

type HeaderReading =
  | { kind: 'columns'; columns: { frequency: number; level: number }; frequencyUnit: FrequencyUnit | undefined; levelUnitNamed: boolean }
  | { kind: 'problem'; message: string };

function readHeader(row: Line): HeaderReading {
  const names = row.fields.map((field) => quoteField(field)).join(', ');
  if (row.quoteProblem) return { kind: 'problem', message: 'a quoted field is not closed' };
  const lower = row.fields.map((field) => field.toLowerCase());
  const frequency = lower.findIndex((name) => FREQUENCY_NAME.test(name));
  const level = lower.findIndex((name, index) => index !== frequency && LEVEL_NAME.test(name));
  if (row.fields.length !== 2 || frequency < 0 || level < 0) {
    return {
      kind: 'problem',
      message: `${describeRow(row)} is neither data nor a header naming two columns, frequency and level (such as "frequency (MHz)", "level (dBuV)"); start notes with #`,
    };
  }
  const unitText = /(?:^|[^a-z])([kmg]?hz)(?:$|[^a-z])/u.exec(lower[frequency]!)?.[1];
  const frequencyUnit = unitText === undefined ? undefined : parseFrequencyUnit(unitText);
  // "level (dBuV)", "limit [dBµV]", "dB(uV)": the level must be in dBµV; a bare "dB" is taken as dBµV.
  const levelUnit = /dB\s*[([]?\s*([a-zµμ/]+)/iu.exec(row.fields[level]!)?.[1];
  if (levelUnit !== undefined && !['uv', 'µv', 'μv'].includes(levelUnit.toLowerCase())) {
    return { kind: 'problem', message: `the header ${names} gives levels in dB${levelUnit}; a limit mask is in dBµV` };
  }
  return { kind: 'columns', columns: { frequency, level }, frequencyUnit, levelUnitNamed: levelUnit !== undefined };
}

function delimiterName(delimiter: MaskDelimiter): string {
  switch (delimiter) {
    case ',':
      return 'commas';
    case ';':
      return 'semicolons';
    case '\t':
      return 'tabs';
  }
}

function fail<T>(issues: readonly LineIssue[]): TextReadResult<T> {
  return { ok: false, issues };
}
