import { sweepDesign } from '../../engine/index.ts';
import { EXPORT_COLUMN_SETS, type ExportColumnSet, sweepCsvChunks, sweepJsonChunks } from '../../io/sweep-export.ts';
import { frequencyPlanSchema } from '../../model/design-schema.ts';
import { type Design, type FrequencyPlan, formatQuantity, parseQuantity } from '../../model/index.ts';
import type { ParsedArgs } from '../args.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { CliError, ExitCode, UsageError } from '../exit-codes.ts';
import { readWholeOption } from '../numeric-options.ts';
import { tell, writeOutputChunks } from '../output.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';

export const sweepCommand: Command = {
  name: 'sweep',
  summary: 'sweep a design: insertion loss and the level at each receiving network, as CSV or JSON',
  description: [
    'Sweeps the design over its frequency plan (or the one given here) and writes one row per frequency: CM and DM insertion loss in the 50 Ω/50 Ω test and in circuit, and the transfer from the CM and DM noise sources to the receiving network on each line, in dB and degrees. The grid holds the plan’s log-spaced points plus each part’s self-resonances and the located peaks and notches of the response.',
    'Warnings from the sweep (ideal parts, a measured table held outside its range) go to standard error.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file (JSON, format "chokepoint-design", version 1 or 2)' }],
  options: [
    { name: 'out', short: 'o', value: 'file', description: 'write to <file> instead of standard output ("-" is standard output)' },
    { name: 'json', description: 'write JSON (columns, data arrays, warnings, resonances) instead of CSV' },
    { name: 'columns', value: 'set', description: '"standard" (default): insertion losses and per-line transfers; "all": every engine column' },
    { name: 'no-refine', description: 'do not locate peaks and notches between grid points (faster, coarser)' },
    { name: 'start', value: 'frequency', description: 'start of the sweep instead of the design’s, e.g. "150 kHz"' },
    { name: 'stop', value: 'frequency', description: 'end of the sweep instead of the design’s, e.g. "30 MHz"' },
    { name: 'points-per-decade', value: 'n', description: 'log-grid density instead of the design’s (a whole number)' },
    { name: 'quiet', short: 'q', description: 'print no warnings or summary on standard error' },
  ],
  examples: [
    { command: `chokepoint sweep ${DEMO}`, description: 'CSV on standard output' },
    { command: `chokepoint sweep ${DEMO} --json --out out/sweep.json`, description: 'JSON into a file' },
    { command: `chokepoint sweep ${DEMO} --start 150k --stop 30MHz --points-per-decade 50 --no-refine`, description: 'a quick, coarse look at the CISPR band B range' },
  ],
  run: runSweep,
};

async function runSweep(args: ParsedArgs, context: CommandContext): Promise<number> {
  // Check every argument before the (slower) file work, so a typo fails at once.
  const columns = readColumnSet(args.value('columns'));
  const overrides = readPlanOverrides(args);
  const design = await loadDesign(context, args.positionals[0]!);
  const planned = applyPlanOverrides(design, overrides);

  const result = sweepDesign(planned, { refine: !args.flag('no-refine') });
  // In pieces: a million-point sweep is written without ever being one string.
  const chunks = args.flag('json')
    ? withLineEnd(sweepJsonChunks(result, { columns, generator: `${context.program} ${context.io.version}` }))
    : sweepCsvChunks(result, { columns });
  const out = args.value('out');
  await writeOutputChunks(context, out, chunks);

  if (!args.flag('quiet')) {
    for (const warning of result.warnings) tell(context, `warning: ${warning.message}`);
    if (out !== undefined && out !== '-') {
      const plan = planned.frequencyPlan;
      tell(
        context,
        `wrote ${result.frequencyHz.length} points from ${formatQuantity(plan.startHz, 'Hz')} to ${formatQuantity(plan.stopHz, 'Hz')} to ${out}`,
      );
    }
  }
  return ExitCode.Ok;
}

function* withLineEnd(chunks: Iterable<string>): Generator<string> {
  yield* chunks;
  yield '\n';
}

function readColumnSet(text: string | undefined): ExportColumnSet {
  if (text === undefined) return 'standard';
  const set = EXPORT_COLUMN_SETS.find((s) => s === text);
  if (!set) throw new UsageError(`--columns must be ${EXPORT_COLUMN_SETS.map((s) => `"${s}"`).join(' or ')}, got "${text}"`, 'sweep');
  return set;
}

interface PlanOverrides {
  readonly startHz?: number;
  readonly stopHz?: number;
  readonly pointsPerDecade?: number;
}

/**
 * The frequencies an option may give, each on its own: from 1 mHz to 1 THz. Beyond them the
 * number is not a plan but a typo (1e-320 Hz is below the smallest normal double and made the
 * span of decades infinite), and the message names the option, not a field it happened to upset.
 */
export const OPTION_FREQUENCY_RANGE_HZ = { min: 1e-3, max: 1e12 } as const;

function readFrequency(args: ParsedArgs, name: string): number | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const parsed = parseQuantity(text, 'Hz');
  if (!parsed.ok) throw new UsageError(`--${name}: cannot read "${text}" as a frequency: ${parsed.reason}`, 'sweep');
  const { min, max } = OPTION_FREQUENCY_RANGE_HZ;
  if (!(parsed.value >= min && parsed.value <= max)) {
    throw new UsageError(`--${name} must be a frequency from ${formatQuantity(min, 'Hz')} to ${formatQuantity(max, 'Hz')}, got "${text}"`, 'sweep');
  }
  return parsed.value;
}

function readPlanOverrides(args: ParsedArgs): PlanOverrides {
  const startHz = readFrequency(args, 'start');
  const stopHz = readFrequency(args, 'stop');
  const pointsPerDecade = readWholeOption(args, 'points-per-decade', 'sweep', 1, 100_000);
  return { startHz, stopHz, pointsPerDecade };
}

const PLAN_FIELD_OPTION: Readonly<Record<keyof FrequencyPlan, string>> = {
  startHz: '--start',
  stopHz: '--stop',
  pointsPerDecade: '--points-per-decade',
};

/** The design with the plan's fields replaced by those given on the command line, checked as a plan. */
function applyPlanOverrides(design: Design, overrides: PlanOverrides): Design {
  if (overrides.startHz === undefined && overrides.stopHz === undefined && overrides.pointsPerDecade === undefined) return design;
  const plan = design.frequencyPlan;
  const merged: FrequencyPlan = {
    startHz: overrides.startHz ?? plan.startHz,
    stopHz: overrides.stopHz ?? plan.stopHz,
    pointsPerDecade: overrides.pointsPerDecade ?? plan.pointsPerDecade,
  };
  const source = (key: keyof FrequencyPlan): string =>
    overrides[key] === undefined ? `frequencyPlan.${key} in the design` : PLAN_FIELD_OPTION[key];
  if (!(merged.stopHz > merged.startHz)) {
    throw new CliError(
      `the sweep would start at ${formatQuantity(merged.startHz, 'Hz')} (${source('startHz')}), not below its stop at ${formatQuantity(merged.stopHz, 'Hz')} (${source('stopHz')})`,
    );
  }
  const checked = frequencyPlanSchema.safeParse(merged);
  if (!checked.success) {
    // A problem of the plan as a whole (too many points) is the three values together: name each one's source.
    const whole = `from ${formatQuantity(merged.startHz, 'Hz')} (${source('startHz')}) to ${formatQuantity(merged.stopHz, 'Hz')} (${source('stopHz')}) at ${merged.pointsPerDecade} points per decade (${source('pointsPerDecade')})`;
    const details = checked.error.issues.map((issue) => {
      const key = issue.path[0];
      if (key === 'pointsPerDecade' && /points; at most/u.test(issue.message)) return `the sweep ${whole}: ${issue.message}`;
      const where = typeof key === 'string' && key in PLAN_FIELD_OPTION ? source(key as keyof FrequencyPlan) : 'frequency plan';
      return `${where}: ${issue.message}`;
    });
    throw new CliError('the frequency plan from the command line is not usable:', details);
  }
  return { ...design, frequencyPlan: checked.data };
}
