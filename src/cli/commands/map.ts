import { VALUE_QUANTITIES, type ValueQuantity, type ValueTarget } from '../../assist/design-edit/part-values.ts';
import { AssistInputError } from '../../assist/margin/assist-problem.ts';
import { runSplit, type SplitRunner } from '../../assist/pool/split-jobs.ts';
import { mainQuantity } from '../../assist/sizing/default-targets.ts';
import { mapCellDesign, type MapResult, type MapSettings } from '../../assist/value-map/value-map.ts';
import type { Design } from '../../model/design.ts';
import { formatQuantity, parseQuantity } from '../../model/index.ts';
import { UNIT_OF } from '../../assist/design-edit/part-values.ts';
import type { ParsedArgs } from '../args.ts';
import {
  checkNoiseOptions,
  DEMO_DESIGN,
  DEMO_SCAN,
  jsonReplacer,
  NOISE_OPTIONS,
  OUTPUT_OPTIONS,
  readAssistProblem,
  readCountOption,
  readQuantityOption,
  readNumberOption,
} from '../assist/assist-input.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { CliError, ExitCode, UsageError } from '../exit-codes.ts';
import { tell, writeOutput } from '../output.ts';

const NAME = 'map';

export const mapCommand: Command = {
  name: NAME,
  summary: 'the worst margin over a grid of two part values, with the pass outline, the current design and the leakage-current limit on a Y-capacitance axis',
  description: [
    'Every cell of a log-spaced grid of two part values (--x and --y: element ids, comma-separated to move several together, optionally :quantity; --x-range and --y-range: from,to) is judged with the engine like check. The text shows the grid (# keeps the target margin, . does not, @ the current design, | or - the leakage limit); --json gives every cell’s margin, the pass outline (marching squares at the target margin, in part values) and the boundary.',
    'With --leakage-limit (and the design’s operating.supply, or --line-voltage and --line-frequency) an axis that moves capacitors from a line to ground gets the largest value the limit allows drawn on it. --cell ix,iy with --variant <file> writes that cell as a design.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file' }],
  options: [
    ...NOISE_OPTIONS,
    { name: 'x', value: 'ids[:quantity]', description: 'the first axis: element ids (moved together), e.g. "LCM1" or "CY1,CY2:capacitance"' },
    { name: 'x-range', value: 'from,to', description: 'its values, e.g. "0.5mH,10mH"' },
    { name: 'y', value: 'ids[:quantity]', description: 'the second axis' },
    { name: 'y-range', value: 'from,to', description: 'its values' },
    { name: 'steps', value: 'n', description: 'cells along each axis (default 40)' },
    { name: 'workers', value: 'n', description: 'worker threads (default: one per core)' },
    { name: 'leakage-limit', value: 'current', description: 'draw the largest Y capacitance this leakage current allows, e.g. "0.75mA"' },
    { name: 'line-voltage', value: 'V', description: 'for the leakage limit (default: the design’s operating.supply)' },
    { name: 'line-frequency', value: 'Hz', description: 'for the leakage limit (default: the design’s operating.supply)' },
    { name: 'y-tolerance', value: '%', description: 'upper tolerance of the Y capacitors for the leakage limit (default 10)' },
    { name: 'cell', value: 'ix,iy', description: 'a cell (0-based column and row) to write with --variant' },
    { name: 'variant', value: 'file', description: 'write the design at --cell to <file>' },
    ...OUTPUT_OPTIONS,
  ],
  examples: [
    {
      command: `chokepoint map ${DEMO_DESIGN} --scan ${DEMO_SCAN} --x LCM1 --x-range 0.5mH,10mH --y CY1,CY2 --y-range 0.47nF,10nF --leakage-limit 0.75mA --line-voltage 264V --line-frequency 60Hz`,
      description: 'CM choke against Y capacitance on the demo, with the 0.75 mA limit',
    },
  ],
  run: runMap,
};

function readAxis(args: ParsedArgs, design: Design, name: 'x' | 'y'): MapSettings['x'] {
  const text = args.value(name);
  const range = args.value(`${name}-range`);
  if (text === undefined || range === undefined) throw new UsageError(`give --${name} <ids> and --${name}-range <from,to>`, NAME);
  const [ids, quantityText, ...rest] = text.split(':');
  if (rest.length > 0) throw new UsageError(`--${name}: write "ids" or "ids:quantity", got "${text}"`, NAME);
  const elementIds = (ids ?? '').split(',').map((s) => s.trim()).filter((s) => s !== '');
  if (elementIds.length === 0) throw new UsageError(`--${name} needs at least one element id`, NAME);
  let quantity: ValueQuantity | undefined;
  if (quantityText !== undefined) {
    quantity = VALUE_QUANTITIES.find((q) => q === quantityText.trim());
    if (!quantity) throw new UsageError(`--${name}: the quantity must be one of ${VALUE_QUANTITIES.join(', ')}, got "${quantityText}"`, NAME);
  } else quantity = mainQuantity(design, elementIds[0]!);
  if (!quantity) throw new CliError(`--${name}: no element "${elementIds[0]}" with a value in the design`);
  const target: ValueTarget = { elementIds, quantity };
  const ends = range.split(',').map((s) => parseQuantity(s, UNIT_OF[quantity]));
  if (ends.length !== 2 || !ends[0]!.ok || !ends[1]!.ok) throw new UsageError(`--${name}-range must be "from,to" in ${UNIT_OF[quantity]}, got "${range}"`, NAME);
  const steps = readCountOption(args, 'steps', NAME, 2, 400) ?? 40;
  return { target, fromValue: ends[0]!.value, toValue: ends[1]!.value, steps };
}

async function runMap(args: ParsedArgs, context: CommandContext): Promise<number> {
  checkNoiseOptions(args, NAME);
  const workers = readCountOption(args, 'workers', NAME, 1, 64) ?? Math.max(1, context.io.cores ?? 1);
  const leakageLimitA = readQuantityOption(args, 'leakage-limit', NAME, 'A');
  const cellText = args.value('cell');
  const variant = args.value('variant');
  if ((cellText === undefined) !== (variant === undefined)) throw new UsageError('--cell and --variant go together', NAME);
  const design = await loadDesign(context, args.positionals[0]!);
  const x = readAxis(args, design, 'x');
  const y = readAxis(args, design, 'y');
  let leakage: MapSettings['leakage'];
  if (leakageLimitA !== undefined) {
    const supply = design.operating?.supply;
    const lineVoltageV = readQuantityOption(args, 'line-voltage', NAME, 'V') ?? supply?.highestVoltage;
    const lineFrequencyHz = readQuantityOption(args, 'line-frequency', NAME, 'Hz') ?? (supply?.kind === 'ac-mains' ? supply.highestFrequencyHz : undefined);
    if (lineVoltageV === undefined || lineFrequencyHz === undefined) throw new CliError('the leakage limit needs the highest line voltage and frequency: add operating.supply to the design or give --line-voltage and --line-frequency');
    leakage = { leakageLimitA, lineVoltageV, lineFrequencyHz, tolerance: (readNumberOption(args, 'y-tolerance', NAME, 0, 90) ?? 10) / 100 };
  }
  const settings: MapSettings = { x, y, ...(leakage ? { leakage } : {}) };
  const problem = await readAssistProblem(args, context, design, NAME);
  const started = Date.now();
  const runner: SplitRunner | undefined = workers > 1 && context.io.splitRunner ? context.io.splitRunner(workers) : undefined;
  let result: MapResult;
  try {
    const outcome = await runSplit(
      {
        kind: 'map',
        design,
        noise: problem.noise,
        judging: { masks: problem.masks, targetMarginDb: problem.targetMarginDb, attribution: problem.attribution, ...(problem.noiseFloorDbuV === undefined ? {} : { noiseFloorDbuV: problem.noiseFloorDbuV }) },
        settings,
      },
      runner,
    );
    if (outcome.kind !== 'map') throw new Error('the pool returned another kind of result');
    result = outcome.result;
  } catch (error) {
    if (error instanceof AssistInputError) throw new CliError(error.message);
    throw error;
  } finally {
    runner?.close();
  }
  const elapsedMs = Date.now() - started;
  if (cellText !== undefined && variant !== undefined) {
    const [ix, iy, ...rest] = cellText.split(',').map((s) => Number(s.trim()));
    const nx = result.xValues.length;
    const ny = result.yValues.length;
    if (rest.length > 0 || !Number.isInteger(ix) || !Number.isInteger(iy) || ix! < 0 || iy! < 0 || ix! >= nx || iy! >= ny) {
      throw new UsageError(`--cell must be "ix,iy" with 0 ≤ ix < ${nx} and 0 ≤ iy < ${ny}, got "${cellText}"`, NAME);
    }
    const cell = mapCellDesign(design, settings, result.xValues[ix!]!, result.yValues[iy!]!);
    if (!cell) throw new CliError('that cell’s values make no valid part');
    await writeOutput(context, variant, `${JSON.stringify({ ...cell, name: `${design.name} (map cell ${ix},${iy})` }, null, 2)}\n`);
    tell(context, `wrote the design at cell ${ix},${iy} to ${variant}`);
  }
  const text = args.flag('json') ? `${JSON.stringify({ design: design.name, workers: runner?.workerCount ?? 1, elapsedMs, ...result }, jsonReplacer)}\n` : mapText(design.name, result);
  await writeOutput(context, args.value('out'), text);
  return ExitCode.Ok;
}

function mapText(name: string, r: MapResult): string {
  const nx = r.xValues.length;
  const ny = r.yValues.length;
  const unitX = UNIT_OF[r.xTarget.quantity];
  const unitY = UNIT_OF[r.yTarget.quantity];
  const nearest = (values: Float64Array, v: number): number => {
    let best = 0;
    for (let k = 1; k < values.length; k += 1) if (Math.abs(Math.log(values[k]! / v)) < Math.abs(Math.log(values[best]! / v))) best = k;
    return best;
  };
  const cx = nearest(r.xValues, r.current.x);
  const cy = nearest(r.yValues, r.current.y);
  const lines = [
    `design: ${name}`,
    `x: ${r.xTarget.quantity} of ${r.xTarget.elementIds.join('+')}, ${formatQuantity(r.xValues[0]!, unitX, 3)} to ${formatQuantity(r.xValues[nx - 1]!, unitX, 3)}`,
    `y: ${r.yTarget.quantity} of ${r.yTarget.elementIds.join('+')}, ${formatQuantity(r.yValues[0]!, unitY, 3)} to ${formatQuantity(r.yValues[ny - 1]!, unitY, 3)}`,
    `${r.passingCells} of ${nx * ny} cells keep the ${r.targetMarginDb} dB target; the current design (@) has ${r.current.marginDb.toFixed(1)} dB`,
    '',
  ];
  const boundary = r.leakageBoundary;
  for (let iy = ny - 1; iy >= 0; iy -= 1) {
    let row = '';
    for (let ix = 0; ix < nx; ix += 1) {
      const m = r.worstMarginDb[iy * nx + ix]!;
      let mark = m >= r.targetMarginDb ? '#' : '.';
      if (boundary?.axis === 'x' && r.xValues[ix]! > boundary.value) mark = m >= r.targetMarginDb ? '|' : ':';
      if (boundary?.axis === 'y' && r.yValues[iy]! > boundary.value) mark = m >= r.targetMarginDb ? '-' : ':';
      if (ix === cx && iy === cy) mark = '@';
      row += mark;
    }
    lines.push(`  ${row}`);
  }
  if (boundary) {
    const unit = boundary.axis === 'x' ? unitX : unitY;
    lines.push('', `leakage limit: ${boundary.axis} at most ${formatQuantity(boundary.value, unit, 4)} (cells beyond it shown as ${boundary.axis === 'x' ? '| and :' : '- and :'})`);
  }
  for (const note of r.notes) lines.push(`note: ${note}`);
  return `${lines.join('\n')}\n`;
}
