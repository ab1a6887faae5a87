import { parseJsonText } from '../io/json-text.ts';
import { decodeText } from '../io/text-bytes.ts';
import { type Design, formatIssue, readDesign, type ValidationIssue } from '../model/index.ts';
import { describeFileError } from './cli-io.ts';
import type { CommandContext } from './command.ts';
import { CliError } from './exit-codes.ts';

/** The largest file read, and what to say of a larger one. */
export interface SizeLimit {
  readonly maxBytes: number;
  readonly tooLarge: (bytes: number) => string;
}

/**
 * Designs, masks and measurements: far above any real one (the largest design a plan allows, with
 * measured tables of 20 000 points, is a few MiB), low enough that a wrong file is refused unread.
 */
export const DEFAULT_LIMIT: SizeLimit = {
  maxBytes: 32 * 1024 * 1024,
  tooLarge: (bytes) => `the file is ${(bytes / 2 ** 20).toFixed(0)} MiB; files of this kind are read up to 32 MiB (is it the right file?)`,
};

/** The most problems listed for one file; the rest are counted. */
export const MAX_LISTED_PROBLEMS = 30;

/**
 * Read a text file named on the command line, or fail with a message that names it: every file the
 * command line reads comes through here, as bytes decoded by the one UTF-8 reader (src/io/text-bytes.ts).
 */
export async function readInputFile(context: CommandContext, path: string, what: string, limit: SizeLimit = DEFAULT_LIMIT): Promise<string> {
  if (path === '-') throw new CliError(`reading ${what} from standard input is not supported: give a file name`);
  if (path === '') throw new CliError(`the file name of ${what} is empty`);
  let bytes: Uint8Array;
  try {
    bytes = await context.io.readFile(path, limit.maxBytes);
  } catch (error) {
    const size = (error as { code?: unknown; size?: unknown } | null)?.code === 'EFBIG' ? (error as { size?: unknown }).size : undefined;
    if (typeof size === 'number') throw new CliError(`cannot read ${what} ${path}: ${limit.tooLarge(size)}`);
    throw new CliError(`cannot read ${what} ${path}: ${describeFileError(error)}`);
  }
  if (bytes.length > limit.maxBytes) throw new CliError(`cannot read ${what} ${path}: ${limit.tooLarge(bytes.length)}`);
  const decoded = decodeText(bytes);
  if (!decoded.ok) throw new CliError(`cannot read ${what} ${path}: ${decoded.error.message}`);
  return decoded.text;
}

/**
 * Read and validate a design file. Bad JSON is located by line and column; each validation issue
 * is listed with its field path ("stages[0].elements[0].part.capacitance") and, where the path
 * runs through an element or a stage, that element's or stage's id.
 */
export async function loadDesign(context: CommandContext, path: string): Promise<Design> {
  const text = await readInputFile(context, path, 'the design');
  const json = parseJsonText(text);
  if (!json.ok) {
    const { line, column, message, excerpt } = json.error;
    throw new CliError(`${path} is not valid JSON: line ${line}, column ${column}: ${message}`, excerpt.split('\n'));
  }
  const read = readDesign(json.value);
  if (read.ok) return read.value;
  const issues = read.error.issues;
  throw new CliError(
    `${path} is not a valid design (${issues.length} problem${issues.length === 1 ? '' : 's'}):`,
    listProblems(issues.map((issue) => describeIssue(issue, json.value))),
  );
}

/** The first MAX_LISTED_PROBLEMS lines and a count of the rest. */
export function listProblems(lines: readonly string[]): string[] {
  if (lines.length <= MAX_LISTED_PROBLEMS) return [...lines];
  return [...lines.slice(0, MAX_LISTED_PROBLEMS), `… and ${lines.length - MAX_LISTED_PROBLEMS} more`];
}

function describeIssue(issue: ValidationIssue, raw: unknown): string {
  const owner = ownerOf(issue.path, raw);
  return owner ? `${formatIssue(issue)} (${owner})` : formatIssue(issue);
}

/** 'element "CX1"' for a path inside stages[0].elements[0], 'stage "input"' inside stages[0]. */
function ownerOf(path: string, raw: unknown): string | undefined {
  const match = /^stages\[(\d+)\](?:\.elements\[(\d+)\])?/u.exec(path);
  if (!match) return undefined;
  const stage = itemAt(field(raw, 'stages'), Number(match[1]));
  if (match[2] !== undefined) {
    const id = field(itemAt(field(stage, 'elements'), Number(match[2])), 'id');
    return typeof id === 'string' && !path.endsWith('.id') ? `element "${id}"` : undefined;
  }
  const id = field(stage, 'id');
  return typeof id === 'string' && !path.endsWith('.id') ? `stage "${id}"` : undefined;
}

function field(value: unknown, name: string): unknown {
  return typeof value === 'object' && value !== null && !Array.isArray(value) ? (value as Record<string, unknown>)[name] : undefined;
}

function itemAt(value: unknown, index: number): unknown {
  return Array.isArray(value) ? (value[index] as unknown) : undefined;
}
