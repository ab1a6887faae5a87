import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { runCli } from '../../src/cli/run-cli.ts';
import { encodeBase64Url, encodeUtf8, readDesignHash } from '../../src/io/design-url.ts';
import { readImpedanceTableCsv } from '../../src/io/impedance-table-csv.ts';
import { parseJsonText } from '../../src/io/json-text.ts';
import { readMaskCsv } from '../../src/io/mask-csv.ts';
import { readScanText } from '../../src/io/scan-csv.ts';
import type { LineIssue, TextReadResult } from '../../src/io/text-issues.ts';
import { impedanceFromNetwork } from '../../src/io/touchstone.ts';
import { readTouchstone } from '../../src/io/touchstone-network.ts';
import { impedanceTableSchema } from '../../src/model/design-schema.ts';
import { limitMaskSchema } from '../../src/model/emissions-schema.ts';
import { readDesign } from '../../src/model/read-design.ts';
import type { ValidationIssue } from '../../src/model/validation-error.ts';
import { applyMutations, mutatedFrom, mutationArbitrary, piecesText, SPECIAL_TOKENS } from './mutations.ts';

/**
 * Every way into chokepoint, as fuzz targets shared by the test suite (test/fuzz/inputs.fuzz.test.ts,
 * a few hundred cases per format) and `npm run fuzz` (scripts/fuzz, at least 10 000 per format, each
 * format in a worker with a watchdog). Each target has inputs built from the format's pieces
 * (property-based) and edits of the real fixture files (mutation), and one check that throws a
 * FuzzFailure when a property breaks. The properties, for every input:
 *
 * - nothing throws (the readers return their result; the command line returns an exit code, never 3);
 * - a result that is accepted is valid (a table or mask passes the design schema, a scan rises strictly
 *   with finite levels, a Touchstone network is finite and rising and its part impedance loads);
 * - a rejection is typed and located: text readers give issues with a line number inside the file
 *   (0 for the file as a whole); JSON syntax errors a line and a column inside the text; design and
 *   link problems a field path and a stable code; the command line a message starting "chokepoint:"
 *   that names the option, file or argument at fault;
 * - every message is for a person: not empty, not a stack trace, no "undefined", "NaN" or "[object".
 *
 * Sizes are bounded (inputs of at most a few hundred pieces or eight edits of a fixture, fixtures of at
 * most 20 kB), so every case is bounded in time as the readers are linear; the fuzz script's watchdog
 * catches any case that is not.
 */

export class FuzzFailure extends Error {
  override readonly name = 'FuzzFailure';
}

export interface FuzzTarget<T> {
  readonly name: string;
  readonly arbitrary: fc.Arbitrary<T>;
  readonly check: (input: T) => Promise<void>;
  /** A short view of an input, for a report. */
  readonly show: (input: T) => string;
}

/** Repository files, read from the working directory (the tests and the fuzz script run from the root). */
function repoFile(path: string): string {
  return readFileSync(join(process.cwd(), path), 'utf8');
}

function folderFiles(folder: string, pattern: RegExp, maxBytes = 20_000): { path: string; text: string }[] {
  return readdirSync(join(process.cwd(), folder))
    .filter((name) => pattern.test(name))
    .sort()
    .map((name) => ({ path: `${folder}/${name}`, text: repoFile(`${folder}/${name}`) }))
    .filter((file) => file.text.length <= maxBytes);
}

function fail(message: string): never {
  throw new FuzzFailure(message);
}

const INHUMAN = /\bundefined\b|\bNaN\b|\[object |\n\s+at .+:\d+:\d+|^\s*$/u;

/** A message a person can read: text, not empty, not a stack trace, no leaked placeholders. */
export function checkMessage(message: unknown, where: string, echoed: readonly string[] = []): void {
  if (typeof message !== 'string') fail(`${where}: the message is ${typeof message}, not text`);
  // Quoted text, and what the user typed, is the input shown back ("NaN" is not a number): only the words
  // around it are judged.
  const own = echoed.filter((text) => text.trim().length >= 2).reduce((rest, text) => rest.split(text).join('…'), message);
  if (INHUMAN.test(own.replace(/"(?:[^"\\]|\\.)*"|“[^”]*”/gu, '"…"'))) fail(`${where}: the message is not for a person: ${JSON.stringify(message.slice(0, 300))}`);
  if (message.length > 5000) fail(`${where}: the message is ${message.length} characters long`);
}

function lineCount(text: string): number {
  return text.split(/\r\n|\r|\n/u).length;
}

/** Issues located by line: whole numbers from 0 (the whole file) to the file's last line. */
function checkLineIssues(issues: readonly LineIssue[], text: string, where: string): void {
  const lines = lineCount(text);
  for (const issue of issues) {
    if (!Number.isInteger(issue.line) || issue.line < 0 || issue.line > lines) {
      fail(`${where}: issue placed on line ${issue.line} of a ${lines}-line file: ${issue.message}`);
    }
    checkMessage(issue.message, `${where}, line ${issue.line}`);
  }
}

function checkTextResult<T>(result: TextReadResult<T>, text: string, where: string): T | undefined {
  if (result.ok) {
    checkLineIssues(result.notes, text, `${where} note`);
    return result.value;
  }
  if (result.issues.length === 0) fail(`${where}: refused with no issue`);
  checkLineIssues(result.issues, text, where);
  return undefined;
}

const VALIDATION_CODES = new Set([
  'bad-json',
  'not-a-design',
  'unsupported-version',
  'missing-field',
  'unknown-field',
  'unknown-kind',
  'wrong-type',
  'bad-quantity',
  'not-finite',
  'out-of-range',
  'invalid-value',
  'duplicate-id',
  'bad-file',
]);

/** Design problems: each with a field path (text, "" for the document as a whole), a known code and a message. */
function checkValidationIssues(issues: readonly ValidationIssue[], where: string): void {
  if (issues.length === 0) fail(`${where}: refused with no issue`);
  for (const issue of issues) {
    if (typeof issue.path !== 'string') fail(`${where}: an issue without a field path`);
    if (!VALIDATION_CODES.has(issue.code)) fail(`${where}: unknown code ${String(issue.code)}`);
    checkMessage(issue.message, `${where} at "${issue.path}"`);
  }
}

const shorten = (text: string): string => JSON.stringify(text.length > 400 ? `${text.slice(0, 400)}…` : text);

function textTarget(name: string, arbitrary: fc.Arbitrary<string>, check: (text: string) => void): FuzzTarget<string> {
  return {
    name,
    arbitrary,
    check: async (text) => {
      try {
        check(text);
      } catch (error) {
        if (error instanceof FuzzFailure) throw error;
        fail(`${name}: threw ${error instanceof Error ? `${error.name}: ${error.message}` : String(error)}`);
      }
    },
    show: shorten,
  };
}

// ---- the formats -------------------------------------------------------------------------------

const scanSeeds = [
  ...folderFiles('fixtures/scans', /\.(csv|txt)$/u).map((f) => f.text),
  // The large invented scan, cut to its first lines.
  repoFile('fixtures/scans/invented-adapter-no-filter.csv').split('\n').slice(0, 120).join('\n'),
];

export const scanTarget = textTarget(
  'scan',
  fc.oneof(
    piecesText(['Frequency [MHz]', 'Peak [dBµV]', 'QP', 'AV', 'f/kHz', 'level', '(dBm)', '[dBuA]', '0.15', '30', '45.2', '45,2', ',', ';', '\t', '\n', '  ']),
    mutatedFrom(scanSeeds),
  ),
  (text) => {
    const result = readScanText(text);
    if (result.ok) {
      const { scan } = result;
      for (let i = 0; i < scan.frequencyHz.length; i += 1) {
        if (!(scan.frequencyHz[i]! > (i === 0 ? 0 : scan.frequencyHz[i - 1]!)) || !Number.isFinite(scan.frequencyHz[i]!)) {
          fail(`scan: frequency ${i} (${scan.frequencyHz[i]!}) is not positive, finite and rising`);
        }
      }
      for (const trace of scan.traces) for (const level of trace.levelDbuV) if (!Number.isFinite(level)) fail('scan: a level is not finite');
      for (const rejected of scan.rejected) checkLineIssues([{ line: rejected.line, message: rejected.reason }], text, 'scan rejected line');
      for (const note of scan.notes) checkMessage(note, 'scan note');
      return;
    }
    checkMessage(result.error.message, 'scan');
    for (const rejected of result.error.rejected) {
      if (!(rejected.line >= 1)) fail(`scan: a rejected line without a line number: ${rejected.reason}`);
      checkLineIssues([{ line: rejected.line, message: rejected.reason }], text, 'scan rejected line');
    }
    for (const note of result.error.notes) checkMessage(note, 'scan note');
  },
);

export const maskTarget = textTarget(
  'mask',
  fc.oneof(
    piecesText(['# id: m', '# name: n', '# detector: qp', '# origin: o', 'frequency (MHz)', 'level (dBuV)', '0.15', '66', '0.5', '56', ',', ';', '\t', '\n']),
    mutatedFrom(folderFiles('fixtures/masks', /\.csv$/u).map((f) => f.text)),
  ),
  (text) => {
    const mask = checkTextResult(readMaskCsv(text, { name: 'fuzz' }), text, 'mask');
    if (mask && !limitMaskSchema.safeParse(mask.mask).success) fail('mask: an accepted mask fails the design schema');
  },
);

export const impedanceTableTarget = textTarget(
  'impedance-table',
  fc.oneof(
    piecesText(['Frequency (Hz)', '|Z| (Ohm)', 'Phase (deg)', 'kHz', 'mOhm', 'rad', '1e6', '12.5', '-45', ',', ';', '\t', '\n', '#', '!']),
    mutatedFrom([...folderFiles('fixtures/measured', /\.csv$/u).map((f) => f.text)]),
  ),
  (text) => {
    const read = checkTextResult(readImpedanceTableCsv(text), text, 'impedance table');
    if (read && !impedanceTableSchema.safeParse(read.table).success) fail('impedance table: an accepted table fails the design schema');
  },
);

const touchstoneFiles = [
  ...folderFiles('fixtures/measured', /\.s\dp$/u),
  ...folderFiles('fixtures/touchstone', /\.(s\dp|ts)$/u),
];

export const touchstoneTarget: FuzzTarget<{ name: string; text: string }> = {
  name: 'touchstone',
  arbitrary: fc.oneof(
    fc.record({
      name: fc.constantFrom('part.s1p', 'part.s2p', 'part.s4p', 'part.ts', 'part.txt'),
      text: piecesText([
        '# Hz S RI R 50',
        '# GHz Z MA R 1',
        '#',
        '[Version] 2.0',
        '[Number of Ports] 1',
        '[Number of Ports] 2',
        '[Two-Port Data Order] 12_21',
        '[Number of Frequencies] 2',
        '[Reference] 50 75',
        '[Matrix Format] Lower',
        '[Network Data]',
        '[Noise Data]',
        '[End]',
        '! Port Impedance 50 0 50 0',
        '! Port[1] = 50+j0',
        '1',
        '2',
        '0.5',
        '-0.25',
        '90',
        ' ',
        '\n',
      ]),
    }),
    fc
      .tuple(fc.constantFrom(...touchstoneFiles), fc.array(mutationArbitrary, { minLength: 1, maxLength: 8 }))
      .map(([file, mutations]) => ({ name: file.path.split('/').pop()!, text: applyMutations(file.text, mutations) })),
  ),
  check: async ({ name, text }) => {
    try {
      const network = checkTextResult(readTouchstone(text, { fileName: name }), text, 'touchstone');
      if (!network) return;
      const n = network.ports;
      if (network.frequencyHz.length * n * n !== network.re.length) fail('touchstone: the matrix columns do not match the frequencies');
      for (let k = 0; k < network.frequencyHz.length; k += 1) {
        if (k > 0 && !(network.frequencyHz[k]! > network.frequencyHz[k - 1]!)) fail('touchstone: frequencies do not rise');
        const line = network.lines[k]!;
        if (!(line >= 1 && line <= lineCount(text))) fail(`touchstone: record placed on line ${line}`);
      }
      for (const values of [network.re, network.im, network.referenceRe, network.referenceIm]) {
        for (const value of values) if (!Number.isFinite(value)) fail('touchstone: a value is not finite');
      }
      if (n <= 2) {
        for (const fixture of n === 1 ? (['reflection'] as const) : (['series-thru', 'shunt-thru'] as const)) {
          const part = checkTextResult(impedanceFromNetwork(network, fixture), text, `touchstone ${fixture}`);
          if (part && !impedanceTableSchema.safeParse(part.table).success) fail(`touchstone ${fixture}: an accepted table fails the design schema`);
        }
      }
    } catch (error) {
      if (error instanceof FuzzFailure) throw error;
      fail(`touchstone: threw ${error instanceof Error ? `${error.name}: ${error.message}` : String(error)}`);
    }
  },
  show: ({ name, text }) => `${name}: ${shorten(text)}`,
};

const designFiles = [
  ...folderFiles('fixtures/demo', /\.json$/u),
  ...folderFiles('fixtures/examples', /\.json$/u),
  ...folderFiles('fixtures/migrations', /\.json$/u),
];
const designSeeds = designFiles.map((f) => f.text);

/** A design document with one value somewhere in it replaced: reaches the schema's checks, not only the JSON syntax. */
const structurallyMutatedDesign: fc.Arbitrary<string> = fc
  .tuple(
    fc.constantFrom(...designSeeds),
    fc.array(
      fc.tuple(
        fc.nat({ max: 10_000 }),
        fc.oneof(
          fc.jsonValue({ maxDepth: 2 }),
          fc.constantFrom<unknown>('4.7 q', '1 M', '-1', '1e309', '', 'NaN', 'Infinity', 1e308, -0, 0, 2, 3, 'bogus', null, [], {}),
        ),
      ),
      { minLength: 1, maxLength: 4 },
    ),
  )
  .map(([seed, edits]) => {
    const document = JSON.parse(seed) as unknown;
    for (const [pick, value] of edits) replaceSomewhere(document, pick, value);
    return JSON.stringify(document, null, 2);
  });

/** Replace the `pick`-th value (depth first, wrapping) of a JSON document in place. */
function replaceSomewhere(document: unknown, pick: number, value: unknown): void {
  const slots: { holder: Record<string, unknown> | unknown[]; key: string | number }[] = [];
  const walk = (node: unknown): void => {
    if (Array.isArray(node)) node.forEach((item, index) => (slots.push({ holder: node, key: index }), walk(item)));
    else if (typeof node === 'object' && node !== null) {
      for (const [key, item] of Object.entries(node)) {
        slots.push({ holder: node as Record<string, unknown>, key });
        walk(item);
      }
    }
  };
  walk(document);
  if (slots.length === 0) return;
  const slot = slots[pick % slots.length]!;
  (slot.holder as Record<string | number, unknown>)[slot.key] = value;
}

export const designJsonTarget = textTarget(
  'design-json',
  fc.oneof(
    structurallyMutatedDesign,
    mutatedFrom(designSeeds),
    fc.json({ maxDepth: 4 }),
    // Deep nesting, up to 3000 levels (1500 openers of up to two levels) (deeper text is a known defect of the JSON error locator: DEVELOPERS.md, Fuzzing).
    fc.tuple(fc.integer({ min: 1, max: 1500 }), fc.constantFrom('[', '{"a":', '[{"b":'), fc.boolean()).map(([depth, open, closed]) => {
      const close = open === '[' ? ']' : open === '{"a":' ? '}' : '}]';
      return `${open.repeat(depth)}1${closed ? close.repeat(depth) : ''}`;
    }),
  ),
  (text) => {
    const json = parseJsonText(text);
    if (!json.ok) {
      const { line, column, message, excerpt } = json.error;
      const lines = text.split('\n');
      if (!(Number.isInteger(line) && line >= 1 && line <= lines.length)) fail(`design JSON: syntax error placed on line ${line}`);
      const lineLength = (lines[line - 1] ?? '').length;
      if (!(Number.isInteger(column) && column >= 1 && column <= lineLength + 1)) fail(`design JSON: syntax error placed on column ${column} of a ${lineLength}-character line`);
      checkMessage(message, 'design JSON syntax error');
      if (typeof excerpt !== 'string') fail('design JSON: no excerpt');
      return;
    }
    const read = readDesign(json.value);
    if (!read.ok) checkValidationIssues(read.error.issues, 'design');
  },
);

const encodeHash = (text: string): string => `#design=${encodeBase64Url(encodeUtf8(text))}`;

export const shareLinkTarget = textTarget(
  'share-link',
  fc.oneof(
    structurallyMutatedDesign.map(encodeHash),
    fc.constantFrom(...designSeeds).map((seed) => encodeHash(JSON.stringify(JSON.parse(seed)))),
    // Edits of a valid link: cut short, characters flipped, keys doubled or reordered.
    fc
      .tuple(fc.constantFrom(...designSeeds), fc.array(mutationArbitrary, { minLength: 1, maxLength: 6 }))
      .map(([seed, mutations]) => applyMutations(encodeHash(JSON.stringify(JSON.parse(seed))), mutations)),
    mutatedFrom(designSeeds).map(encodeHash),
    piecesText(['#', 'design=', '&', 'x=1', 'eyJ', 'AAAA', '-', '_', '=', '%20', 'design']),
  ),
  (hash) => {
    // The page's public reader; its result says absent, found, or invalid with located issues.
    const reading = readDesignHash(hash);
    if (reading.status === 'invalid') checkValidationIssues(reading.error.issues, 'share link');
    else if (reading.status === 'found' && !readDesign(reading.document).ok) fail('share link: a found design does not validate');
  },
);

// ---- the command line -------------------------------------------------------------------------

const cliFiles: Record<string, string> = Object.fromEntries(
  [
    ...designFiles,
    ...folderFiles('fixtures/scans', /\.(csv|txt)$/u),
    ...folderFiles('fixtures/masks', /\.csv$/u),
    ...folderFiles('fixtures/measured', /./u),
    ...folderFiles('fixtures/touchstone', /\.(s\dp|ts)$/u),
  ].map((file) => [file.path, file.text]),
);
const cliPaths = Object.keys(cliFiles);
const designPaths = designFiles.map((f) => f.path);

/** Working command lines, as docs/cli.md gives them (small plans, so that each run stays short). */
const CLI_EXAMPLES: readonly (readonly string[])[] = [
  ['sweep', 'fixtures/demo/adapter-two-stage.design.json', '--points-per-decade', '5', '--no-refine'],
  ['sweep', 'fixtures/examples/engineering-notation.design.json', '--json', '--points-per-decade', '4', '--start', '150k', '--stop', '30MHz'],
  ['check', 'fixtures/demo/adapter-two-stage.design.json', '--scan', 'fixtures/scans/invented-peak-qp-av-mhz.csv', '--margin', '6'],
  ['check', 'fixtures/demo/adapter-two-stage.design.json', '--estimate', '--peaks', '3', '--json'],
  ['check', 'fixtures/demo/adapter-two-stage.design.json', '--scan', 'fixtures/scans/invented-separator-cm.txt', '--scan-tag', 'common-mode', '--limit', 'fixtures/masks/fcc-15.107-class-b-qp.csv'],
  ['limits'],
  ['limits', '--read', 'fixtures/masks/invented-dc-input-peak-tab.csv'],
  ['measured-part', 'fixtures/measured/invented-bead.csv'],
  ['measured-part', 'fixtures/measured/invented-winding-series-thru.s2p', '--fixture', 'series-thru', '--id', 'L1', '--placement', 'series-line1'],
  ['measured-part', 'fixtures/touchstone/rlc-bead-reflection-ma-mhz.s1p'],
  ['help', 'check'],
];

const CLI_TOKENS = [
  'sweep',
  'check',
  'limits',
  'measured-part',
  'help',
  '--help',
  '--version',
  '--json',
  '--out',
  '-o',
  '--columns',
  'all',
  '--no-refine',
  '--start',
  '--stop',
  '--points-per-decade',
  '--scan',
  '--estimate',
  '--limit',
  '--margin',
  '--scan-tag',
  '--attribution',
  '--noise-floor',
  '--frequency-unit',
  '--level-unit',
  '--transfer-impedance',
  '--peaks',
  '--fixture',
  '--id',
  '--placement',
  '--strict',
  '--preset',
  '--read',
  '--design',
  '--mask',
  '-q',
  '--',
  '-',
  'cispr32-class-b-qp',
  'series-thru',
  'reflection',
  'line1',
  'both',
  'MHz',
  'dBm',
  '150k',
  '30MHz',
  '1e-320',
  '0x10',
  '1.5',
  '1e3',
  '-3',
  '5',
  'missing.json',
  'out.csv',
  '/readonly/out.csv',
];

const cliArgument = fc.oneof(
  { weight: 4, arbitrary: fc.constantFrom(...CLI_TOKENS) },
  { weight: 2, arbitrary: fc.constantFrom(...cliPaths) },
  { weight: 1, arbitrary: fc.constantFrom(...SPECIAL_TOKENS) },
  { weight: 1, arbitrary: fc.string({ maxLength: 6 }) },
  { weight: 1, arbitrary: fc.tuple(fc.constantFrom('--margin', '--peaks', '--start', '--out', '--fixture'), fc.string({ maxLength: 5 })).map(([o, v]) => `${o}=${v}`) },
);

type ArgumentEdit = { kind: 'drop' | 'duplicate'; at: number } | { kind: 'replace' | 'insert'; at: number; value: string };
const argumentEdit: fc.Arbitrary<ArgumentEdit> = fc.oneof(
  fc.record({ kind: fc.constantFrom('drop' as const, 'duplicate' as const), at: fc.nat({ max: 100 }) }),
  fc.record({ kind: fc.constantFrom('replace' as const, 'insert' as const), at: fc.nat({ max: 100 }), value: cliArgument }),
);

function editArguments(argv: readonly string[], edits: readonly ArgumentEdit[]): string[] {
  const out = [...argv];
  for (const edit of edits) {
    const at = out.length === 0 ? 0 : edit.at % out.length;
    if (!('value' in edit)) {
      if (edit.kind === 'drop') out.splice(at, 1);
      else out.splice(at, 0, out[at] ?? 'help');
    } else if (edit.kind === 'replace') out[at] = edit.value;
    else out.splice(at, 0, edit.value);
  }
  return out;
}

/** The points a command line could sweep are bounded: plans of at most 5 points per decade. */
function bounded(argv: string[]): string[] {
  return argv.map((argument, index) => (argv[index - 1] === '--points-per-decade' && /^\d/u.test(argument) && Number(argument) > 5 ? '5' : argument));
}

const argvArbitrary: fc.Arbitrary<string[]> = fc
  .oneof(
    fc.tuple(fc.constantFrom(...CLI_EXAMPLES), fc.array(argumentEdit, { minLength: 1, maxLength: 4 })).map(([argv, edits]) => editArguments(argv, edits)),
    fc.tuple(fc.constantFrom('sweep', 'check', 'measured-part', 'limits'), fc.constantFrom(...designPaths), fc.array(cliArgument, { maxLength: 6 })).map(([command, path, rest]) => [command, path, ...rest]),
    fc.array(cliArgument, { maxLength: 6 }),
  )
  .map(bounded);

/** An argument a message may name as the place of the problem: the token itself, or an option's name. */
function places(argv: readonly string[]): string[] {
  return argv.flatMap((argument) => [argument, argument.split('=')[0]!]).filter((text) => text.trim().length >= 1);
}

export const cliTarget: FuzzTarget<string[]> = {
  name: 'cli-arguments',
  arbitrary: argvArbitrary,
  check: async (argv) => {
    let stdout = '';
    let stderr = '';
    let code: number;
    try {
      code = await runCli(argv, {
        readFile: async (path) => {
          const text = cliFiles[path];
          if (text === undefined) throw Object.assign(new Error(`ENOENT: no such file, '${path}'`), { code: 'ENOENT' });
          return new TextEncoder().encode(text);
        },
        writeTextFile: async (path) => {
          if (path.startsWith('/readonly/')) throw Object.assign(new Error(`EACCES: permission denied, '${path}'`), { code: 'EACCES' });
        },
        stdout: (text) => {
          stdout += text;
        },
        stderr: (text) => {
          stderr += text;
        },
        version: 'fuzz',
      });
    } catch (error) {
      fail(`cli: runCli threw ${error instanceof Error ? error.message : String(error)}`);
    }
    if (code === 3) fail(`cli: exit 3 (internal error): ${stderr.slice(0, 500)}`);
    if (![0, 1, 2].includes(code)) fail(`cli: exit ${code}`);
    if (code === 2) {
      const first = stderr.split('\n').find((line) => line.startsWith('chokepoint: ') && !line.startsWith('chokepoint: note:') && !line.startsWith('chokepoint: warning:'));
      if (first === undefined) fail(`cli: exit 2 without a "chokepoint:" message: ${JSON.stringify(stderr.slice(0, 300))}`);
      checkMessage(stderr, 'cli', argv);
      // Located: the message names something the user typed (an option, a value, a file), an option to give, or
      // says what is missing.
      const named =
        places(argv).some((place) => stderr.includes(place)) ||
        /(?:^|\s)--[a-z][a-z-]+/u.test(first) ||
        /missing command|unknown command|no command/u.test(stderr) ||
        (argv.some((argument) => argument.trim() === '') && /empty/u.test(stderr)) ||
        (argv.includes('-') && /standard input|standard output/u.test(stderr));
      if (!named) fail(`cli: the message names nothing the user typed: ${JSON.stringify(first)}`);
    }
    if (stdout.includes('\n    at ')) fail('cli: a stack trace on standard output');
  },
  show: (argv) => JSON.stringify(argv),
};

/** A target with its input type hidden, for running the targets in one loop. */
export interface FuzzRunner {
  readonly name: string;
  readonly property: fc.IAsyncProperty<[unknown]>;
  readonly show: (input: unknown) => string;
}

/** The property of a target; `beforeCase` is told each input first (the fuzz script's watchdog shows the one that hangs). */
export function fuzzRunner<T>(target: FuzzTarget<T>, beforeCase?: (shown: string) => void): FuzzRunner {
  const property = fc.asyncProperty(target.arbitrary, async (input) => {
    beforeCase?.(target.show(input));
    await target.check(input);
  });
  return { name: target.name, property: property as unknown as fc.IAsyncProperty<[unknown]>, show: (input) => target.show(input as T) };
}

export function fuzzRunners(beforeCase?: (shown: string) => void): FuzzRunner[] {
  return [
    fuzzRunner(scanTarget, beforeCase),
    fuzzRunner(maskTarget, beforeCase),
    fuzzRunner(impedanceTableTarget, beforeCase),
    fuzzRunner(touchstoneTarget, beforeCase),
    fuzzRunner(designJsonTarget, beforeCase),
    fuzzRunner(shareLinkTarget, beforeCase),
    fuzzRunner(cliTarget, beforeCase),
  ];
}
