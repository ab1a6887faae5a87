import { VALUE_QUANTITIES, type ScalingModel, type ValueQuantity } from '../../assist/design-edit/part-values.ts';
import { AssistInputError } from '../../assist/margin/assist-problem.ts';
import { runSteps } from '../../assist/run/steps.ts';
import { defaultTargets, mainQuantity, type NamedTarget } from '../../assist/sizing/default-targets.ts';
import { PREFERRED_SERIES_NAMES } from '../../assist/sizing/preferred-values.ts';
import { formatHz, sizePart, type SizingResult } from '../../assist/sizing/size-part.ts';
import { yCapacitance, type YCapacitanceResult } from '../../assist/sizing/y-capacitance.ts';
import { formatQuantity } from '../../model/index.ts';
import type { ParsedArgs } from '../args.ts';
import {
  checkNoiseOptions,
  DEMO_DESIGN,
  DEMO_SCAN,
  jsonReplacer,
  NOISE_OPTIONS,
  OUTPUT_OPTIONS,
  readAssistProblem,
  readChoiceOption,
  readNumberOption,
  readQuantityOption,
} from '../assist/assist-input.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { CliError, ExitCode, UsageError } from '../exit-codes.ts';
import { writeOutput } from '../output.ts';

const NAME = 'size';

export const sizeCommand: Command = {
  name: NAME,
  summary: 'the smallest part values that keep the target margin (CM choke, DM inductance, X capacitor), snapped to E-series values, and the largest Y capacitance a leakage limit allows',
  description: [
    'For each part (or group of parts moved together) the margin is computed against its value on a log grid from 1/100 to 100 times the present value, the smallest passing value is found by bisection on log(value) with the engine, and it is snapped up to an IEC 60063 preferred value that is checked again. When no value passes, the limiting frequency is given and which part’s self-resonance limits it there (found by halving each part’s parasitic in turn).',
    'Without --part: every CM choke’s inductance and leakage, every line inductor pair and every X capacitor, one at a time, the others held. With --leakage-limit: the largest Y capacitance from one line to earth that the limit allows, C = I/(2π·f·V·(1 + tol)), and the margin with the Y capacitors scaled to it.',
    'When an inductance changes, its winding capacitance is kept or scaled with the turns (C ∝ √L), its leakage kept as a fraction or in henries (docs/assistants.md).',
  ],
  arguments: [{ name: 'design.json', description: 'a design file' }],
  options: [
    ...NOISE_OPTIONS,
    { name: 'part', value: 'ids', description: 'the element(s) to size, comma-separated; several are moved together (both Y capacitors, a pair of line inductors)' },
    { name: 'quantity', value: 'name', description: `what to size: ${VALUE_QUANTITIES.join(', ')} (default: the part’s main value)` },
    { name: 'series', value: 'name', description: `preferred-value series: ${PREFERRED_SERIES_NAMES.join(', ')} (default E12)` },
    { name: 'winding', value: 'model', description: 'winding capacitance when an inductance changes: keep, or scale (with the turns, default)' },
    { name: 'leakage', value: 'model', description: 'choke leakage when its inductance changes: fraction (fixed fraction, default) or value (fixed henries)' },
    { name: 'range', value: 'factor', description: 'search from value/factor to value·factor (default 100)' },
    { name: 'leakage-limit', value: 'current', description: 'also the largest Y capacitance this leakage current allows, e.g. "0.75 mA"' },
    { name: 'line-voltage', value: 'V', description: 'highest line voltage for the leakage (default: the design’s operating.supply)' },
    { name: 'line-frequency', value: 'Hz', description: 'highest line frequency for the leakage (default: the design’s operating.supply)' },
    { name: 'y-tolerance', value: '%', description: 'upper tolerance of the Y capacitors (default: their own, else 10 %)' },
    ...OUTPUT_OPTIONS,
  ],
  examples: [
    { command: `chokepoint size ${DEMO_DESIGN} --scan ${DEMO_SCAN} --scan-tag line1 --part CX2`, description: 'the smallest X capacitance at the demo’s inlet' },
    { command: `chokepoint size ${DEMO_DESIGN} --estimate --leakage-limit 0.75mA --line-voltage 264V --line-frequency 60Hz`, description: 'every part, and the Y limit for 0.75 mA' },
  ],
  run: runSize,
};

interface SizeOutput {
  readonly description: string;
  readonly result: SizingResult;
}

async function runSize(args: ParsedArgs, context: CommandContext): Promise<number> {
  checkNoiseOptions(args, NAME);
  const quantity = readChoiceOption(args, 'quantity', NAME, VALUE_QUANTITIES);
  const series = readChoiceOption(args, 'series', NAME, PREFERRED_SERIES_NAMES) ?? 'E12';
  const winding = readChoiceOption(args, 'winding', NAME, ['keep', 'scale'] as const) ?? 'scale';
  const leakage = readChoiceOption(args, 'leakage', NAME, ['fraction', 'value'] as const) ?? 'fraction';
  const rangeFactor = readNumberOption(args, 'range', NAME, 1.5, 1e4);
  const leakageLimitA = readQuantityOption(args, 'leakage-limit', NAME, 'A');
  const lineVoltageV = readQuantityOption(args, 'line-voltage', NAME, 'V');
  const lineFrequencyHz = readQuantityOption(args, 'line-frequency', NAME, 'Hz');
  const yTolerance = readNumberOption(args, 'y-tolerance', NAME, 0, 90);
  const scaling: ScalingModel = { windingCapacitance: winding === 'keep' ? 'keep' : 'scale-with-turns', leakage: leakage === 'value' ? 'fixed-value' : 'fixed-fraction' };

  const design = await loadDesign(context, args.positionals[0]!);
  const problem = await readAssistProblem(args, context, design, NAME);
  const partText = args.value('part');
  let targets: NamedTarget[];
  if (partText !== undefined) {
    const ids = partText.split(',').map((s) => s.trim()).filter((s) => s !== '');
    if (ids.length === 0) throw new UsageError('--part needs at least one element id', NAME);
    const chosen: ValueQuantity | undefined = quantity ?? mainQuantity(design, ids[0]!);
    if (!chosen) throw new CliError(`no element "${ids[0]}" with a value to size in the design`);
    targets = [{ elementIds: ids, quantity: chosen, description: `${chosen} of ${ids.join('+')}` }];
  } else {
    if (quantity !== undefined) throw new UsageError('--quantity goes with --part', NAME);
    targets = defaultTargets(design);
  }

  const outputs: SizeOutput[] = [];
  let y: YCapacitanceResult | undefined;
  try {
    for (const target of targets) {
      outputs.push({
        description: target.description,
        result: runSteps(sizePart(problem, target, { scaling, series, ...(rangeFactor === undefined ? {} : { rangeFactor }) })),
      });
    }
    if (leakageLimitA !== undefined) {
      y = runSteps(
        yCapacitance(problem, {
          leakageLimitA,
          ...(lineVoltageV === undefined ? {} : { lineVoltageV }),
          ...(lineFrequencyHz === undefined ? {} : { lineFrequencyHz }),
          ...(yTolerance === undefined ? {} : { tolerance: yTolerance / 100 }),
        }),
      );
    }
  } catch (error) {
    if (error instanceof AssistInputError) throw new CliError(error.message);
    throw error;
  }
  if (targets.length === 0 && !y) throw new CliError('nothing to size: the design has no CM choke, line inductor or X capacitor (name one with --part)');
  const text = args.flag('json')
    ? `${JSON.stringify({ design: design.name, targetMarginDb: problem.targetMarginDb, parts: outputs, yCapacitance: y }, jsonReplacer)}\n`
    : sizingText(design.name, problem.targetMarginDb, outputs, y);
  await writeOutput(context, args.value('out'), text);
  return ExitCode.Ok;
}

const value = (x: number, unit: 'F' | 'H' | 'Ω'): string => (Number.isFinite(x) ? formatQuantity(x, unit, 4) : '–');
const dB = (x: number): string => (Number.isFinite(x) ? `${x.toFixed(1)} dB` : '–');

function sizingText(name: string, targetDb: number, outputs: readonly SizeOutput[], y: YCapacitanceResult | undefined): string {
  const lines = [`design: ${name}`, `target margin ${targetDb} dB`, ''];
  for (const { description, result } of outputs) {
    const unit = result.unit;
    lines.push(`${description}: now ${value(result.present.value, unit)}, margin ${dB(result.present.marginDb)}`);
    if (result.answer) {
      lines.push(`  smallest meeting the target: ${value(result.answer.value, unit)} (margin ${dB(result.answer.marginDb)}, worst at ${formatHz(result.answer.worstFrequencyHz)})`);
      lines.push(
        result.preferred
          ? `  preferred (${result.preferred.series}): ${value(result.preferred.value, unit)} (margin ${dB(result.preferred.marginDb)})`
          : '  preferred: none of the next values passes',
      );
    } else if (result.noSolution) lines.push(`  ${result.noSolution.summary}`);
    for (const note of result.notes) lines.push(`  note: ${note}`);
    lines.push('');
  }
  if (y) {
    lines.push(
      `Y capacitance: at most ${value(y.maximumPerLineF, 'F')} from one line to earth for ${formatQuantity(y.leakageLimitA, 'A', 3)} at ${formatQuantity(y.lineVoltageV, 'V', 4)}, ${formatQuantity(y.lineFrequencyHz, 'Hz', 3)}, +${(y.tolerance * 100).toFixed(0)} %`,
    );
    lines.push(`  now: line 1 ${value(y.line1F, 'F')}, line 2 ${value(y.line2F, 'F')}; leakage ${formatQuantity(y.presentLeakageA, 'A', 3)}${y.headroomRatio < 1 ? ' (OVER THE LIMIT)' : ''}`);
    if (Number.isFinite(y.marginAtMaximumDb)) lines.push(`  with the Y capacitors scaled to the limit the worst margin is ${dB(y.marginAtMaximumDb)}`);
    for (const caution of y.cautions) lines.push(`  caution: ${caution}`);
  }
  return `${lines.join('\n')}\n`;
}
