import { type FrequencyUnit, FREQUENCY_UNITS, parseFrequencyUnit } from '../../io/frequency-unit.ts';
import { formatLineIssue, type LineIssue } from '../../io/text-issues.ts';
import { MEASUREMENT_FIXTURES, type MeasurementFixture } from '../../io/touchstone.ts';
import { readTouchstone } from '../../io/touchstone-network.ts';
import {
  formatIssue,
  formatQuantity,
  type MeasuredImpedance,
  type Placement,
  PLACEMENTS,
  readDesign,
  type ValidationIssue,
} from '../../model/index.ts';
import type { ParsedArgs } from '../args.ts';
import type { Command, CommandContext } from '../command.ts';
import { listProblems, readInputFile } from '../design-input.ts';
import { CliError, ExitCode, UsageError } from '../exit-codes.ts';
import { detectMeasurementKind, readMeasurement } from '../../io/measurement-file.ts';
import { tell, writeOutput } from '../output.ts';

const NAME = 'measured-part';
const BEAD = 'fixtures/measured/invented-bead.csv';
const WINDING = 'fixtures/measured/invented-winding-series-thru.s2p';
const ONE_PORT = 'fixtures/touchstone/rlc-bead-reflection-ma-mhz.s1p';

/** Where the element sits in the minimal design that checks it. */
const ELEMENT_PATH = 'stages[0].elements[0]';

/** A measured part is a two-terminal part: every placement but the choke's. */
const PART_PLACEMENTS: readonly Placement[] = PLACEMENTS.filter((p) => p !== 'both-lines-coupled');

export const measuredPartCommand: Command = {
  name: NAME,
  summary: 'turn a measured |Z|/phase table or a Touchstone file (one-port, or two-port thru) into a measured part for a design (JSON)',
  description: [
    'Reads a measurement of a two-terminal part and writes it as JSON for a design: the part ({"kind": "measured", "table": …, "origin": …}), or with --id and --placement a whole element to put in a stage’s "elements". The result is checked against the design schema before it is written, so it always loads.',
    'The file is a |Z| table (frequency, |Z| in Ω, phase in °; comma, semicolon, tab or space separated, an optional header naming columns and units) or a Touchstone file (version 1 or 2): a one-port (.s1p) of the part measured by reflection, Z = Z0·(1 + S11)/(1 − S11), or of Z- or Y-data as impedance analysers write them ("# Hz Z MA R 1"); or a two-port (.s2p) of the part in a thru fixture, whose S21 gives the impedance. Touchstone is recognised by the extension .s<n>p, .z<n>p, .y<n>p or .ts, or by its option line ("# MHz S DB R 50") or [Version] keyword; anything else is read as a table.',
    'A data line that cannot be used is left out and reported with its line number on standard error; the command still succeeds when at least two points remain. It fails (exit 2) when the file cannot be read, when a problem concerns the file as a whole (a header, the option line, a unit), when frequencies are out of order, when more than 199 lines are rejected, or when fewer than two points remain. --strict fails on any rejected line.',
  ],
  arguments: [{ name: 'file', description: 'a |Z| table (.csv, .txt, …) or a Touchstone file (.s1p, .s2p, .ts)' }],
  options: [
    { name: 'out', short: 'o', value: 'file', description: 'write to <file> instead of standard output ("-" is standard output)' },
    {
      name: 'fixture',
      value: 'fixture',
      description: 'Touchstone only, required for a two-port: "series-thru" (the part in series between port 1 and port 2) or "shunt-thru" (from the through line to ground); a one-port is "reflection" (the default)',
    },
    {
      name: 'frequency-unit',
      value: 'unit',
      description: 'tables only: Hz, kHz, MHz or GHz for a frequency column whose header names no unit (default Hz)',
    },
    { name: 'id', value: 'id', description: 'write a whole element with this id (with --placement)' },
    { name: 'placement', value: 'placement', description: `where the element sits (with --id): ${PART_PLACEMENTS.join(', ')}` },
    { name: 'strict', description: 'refuse the file if any line is rejected, instead of leaving the line out' },
  ],
  examples: [
    { command: `chokepoint ${NAME} ${BEAD}`, description: 'the part from a |Z| table, on standard output' },
    { command: `chokepoint ${NAME} ${WINDING} --fixture series-thru --id L1 --placement series-line1 -o out/l1.json`, description: 'a whole element from a series-thru Touchstone file, into out/l1.json' },
    { command: `chokepoint ${NAME} ${ONE_PORT}`, description: 'the part from a one-port reflection file' },
  ],
  run: runMeasuredPart,
};

async function runMeasuredPart(args: ParsedArgs, context: CommandContext): Promise<number> {
  // Every option is checked before the file is read, so a typo fails at once.
  const fixture = readFixture(args.value('fixture'));
  const frequencyUnit = readFrequencyUnit(args.value('frequency-unit'));
  const element = readElementOptions(args.value('id'), args.value('placement'));
  const path = args.positionals[0]!;
  const text = await readInputFile(context, path, 'the measurement file');

  const kind = detectMeasurementKind(path, text);
  if (kind === 'touchstone') {
    const ports = touchstonePorts(text, path);
    if (fixture === undefined && ports !== undefined && ports !== 1) {
      throw new UsageError(
        `${path} is a ${ports}-port Touchstone file: say how the part was connected with --fixture series-thru (in series between the ports) or --fixture shunt-thru (from the through line to ground)`,
        NAME,
      );
    }
    if (frequencyUnit !== undefined) {
      throw new UsageError(`--frequency-unit is for |Z| tables; the Touchstone file ${path} gives its unit in its option line`, NAME);
    }
  } else if (fixture !== undefined) {
    throw new UsageError(`--fixture is for Touchstone files; ${path} reads as a |Z| table (frequency, |Z|, phase)`, NAME);
  }

  const reading = readMeasurement(text, {
    kind,
    path,
    strict: args.flag('strict'),
    ...(fixture === undefined ? {} : { fixture }),
    ...(frequencyUnit === undefined ? {} : { frequencyUnit }),
  });
  const what = kind === 'touchstone' ? `a ${fixture ?? 'usable'} impedance` : 'a usable |Z| table';
  if (!reading.ok) {
    const count = reading.issues.length;
    throw new CliError(
      `${path} does not give ${what} (${count} problem${count === 1 ? '' : 's'}):`,
      listProblems(reading.issues.map(formatLineIssue)),
    );
  }

  for (const issue of reading.rejected) tell(context, `warning: ${path}, line ${issue.line} left out: ${issue.message}`);
  for (const note of reading.notes) tell(context, `note: ${where(path, note)}: ${note.message}`);

  const result = element ? { id: element.id, placement: element.placement, part: reading.part } : reading.part;
  const output = `${formatJson(result)}\n`;
  checkReadsBack(output, element);
  const out = args.value('out');
  await writeOutput(context, out, output);

  if (out !== undefined && out !== '-') {
    const table = reading.part.table;
    const n = table.frequencyHz.length;
    const left = reading.rejected.length > 0 ? `; ${reading.rejected.length} line${reading.rejected.length === 1 ? '' : 's'} left out` : '';
    tell(
      context,
      `wrote ${element ? `element "${element.id}" with a` : 'a'} measured part (${n} points from ${formatQuantity(table.frequencyHz[0]!, 'Hz')} to ${formatQuantity(table.frequencyHz[n - 1]!, 'Hz')}${left}) to ${out}`,
    );
  }
  return ExitCode.Ok;
}

function where(path: string, issue: LineIssue): string {
  return issue.line > 0 ? `${path}, line ${issue.line}` : path;
}

function readFixture(text: string | undefined): MeasurementFixture | undefined {
  if (text === undefined) return undefined;
  const fixture = MEASUREMENT_FIXTURES.find((f) => f === text);
  if (!fixture) throw new UsageError(`--fixture must be ${MEASUREMENT_FIXTURES.map((f) => `"${f}"`).join(', ')}, got "${text}"`, NAME);
  return fixture;
}

/**
 * The file's number of ports, from a first reading or else its name (.s2p); undefined when neither
 * tells. A one-port needs no --fixture; an unknown count is settled once the file is read.
 */
function touchstonePorts(text: string, path: string): number | undefined {
  const read = readTouchstone(text, { fileName: path });
  if (read.ok) return read.value.ports;
  const named = /\.[syz](\d+)p$/iu.exec(path);
  return named ? Number(named[1]) : undefined;
}

function readFrequencyUnit(text: string | undefined): FrequencyUnit | undefined {
  if (text === undefined) return undefined;
  const unit = parseFrequencyUnit(text);
  if (!unit) throw new UsageError(`--frequency-unit must be ${FREQUENCY_UNITS.join(', ')}, got "${text}"`, NAME);
  return unit;
}

interface ElementOptions {
  readonly id: string;
  readonly placement: Placement;
}

/** --id and --placement, checked by the design schema itself on a stand-in part. */
function readElementOptions(id: string | undefined, placement: string | undefined): ElementOptions | undefined {
  if (id === undefined && placement === undefined) return undefined;
  if (id === undefined) throw new UsageError('--placement needs --id: an element has both', NAME);
  if (placement === undefined) throw new UsageError(`--id needs --placement: where the element sits (${PART_PLACEMENTS.join(', ')})`, NAME);
  const chosen = PART_PLACEMENTS.find((p) => p === placement);
  if (!chosen) {
    const hint = placement === 'both-lines-coupled' ? ' ("both-lines-coupled" is for a common-mode choke)' : '';
    throw new UsageError(`--placement must be one of ${PART_PLACEMENTS.join(', ')}, got "${placement}"${hint}`, NAME);
  }
  const standIn: MeasuredImpedance = { kind: 'measured', table: { frequencyHz: [1, 2], magnitudeOhm: [1, 1], phaseDeg: [0, 0] } };
  const issues = designIssues({ id, placement: chosen, part: standIn });
  const idIssue = issues.find((issue) => issue.path === `${ELEMENT_PATH}.id`);
  if (idIssue) throw new UsageError(`--id: ${idIssue.message}, got "${id}"`, NAME);
  if (issues.length > 0) throw new CliError(`internal error: a stand-in element does not validate: ${issues.map(formatIssue).join('; ')}`, [], ExitCode.Internal);
  return { id, placement: chosen };
}

/** The problems readDesign finds in the smallest design holding this element. */
function designIssues(element: unknown): readonly ValidationIssue[] {
  const id = (element as { id?: unknown }).id;
  const design = {
    format: 'chokepoint-design',
    version: 2,
    name: 'measured part check',
    noiseSource: {
      commonMode: { impedance: { kind: 'resistor', resistance: 50 } },
      differentialMode: { impedance: { kind: 'resistor', resistance: 100 } },
    },
    receivers: { line1: { kind: 'resistive' }, line2: { kind: 'resistive' } },
    // Ids are unique across stages and elements: the stage takes a name the element does not.
    stages: [{ id: id === 'stage' ? 'stage-1' : 'stage', elements: [element] }],
  };
  const read = readDesign(design);
  return read.ok ? [] : read.error.issues;
}

/**
 * Read the printed JSON back as a design reads it: parsed from text, put in a minimal design, and
 * validated. Only a defect can fail here (the readers hold their tables to the schema's rules).
 */
function checkReadsBack(output: string, element: ElementOptions | undefined): void {
  const printed = JSON.parse(output) as unknown;
  const issues = designIssues(element ? printed : { id: 'M1', placement: 'series-line1', part: printed });
  if (issues.length > 0) {
    throw new CliError(
      'internal error, please report it with the command and input that caused it: the measured part does not validate as a design part:',
      listProblems(issues.map(formatIssue)),
      ExitCode.Internal,
    );
  }
}

/**
 * JSON for a person to paste into a design: objects indented, each list of numbers on one line (a
 * table of thousands of points stays one line per column). Numbers are written in full, so they
 * read back to the same doubles.
 */
export function formatJson(value: unknown, indent = ''): string {
  if (Array.isArray(value)) {
    if (value.every((item) => typeof item === 'number')) return `[${value.map((item) => JSON.stringify(item)).join(', ')}]`;
    const inner = `${indent}  `;
    return value.length === 0 ? '[]' : `[\n${value.map((item: unknown) => inner + formatJson(item, inner)).join(',\n')}\n${indent}]`;
  }
  if (typeof value === 'object' && value !== null) {
    const entries = Object.entries(value).filter(([, item]) => item !== undefined);
    if (entries.length === 0) return '{}';
    const inner = `${indent}  `;
    return `{\n${entries.map(([key, item]) => `${inner}${JSON.stringify(key)}: ${formatJson(item, inner)}`).join(',\n')}\n${indent}}`;
  }
  return JSON.stringify(value);
}
