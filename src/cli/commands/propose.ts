import { AssistInputError } from '../../assist/margin/assist-problem.ts';
import { proposeFilters, type ProposalConstraints, type ProposalReport } from '../../assist/proposal/propose.ts';
import { runSteps } from '../../assist/run/steps.ts';
import { PREFERRED_SERIES_NAMES } from '../../assist/sizing/preferred-values.ts';
import { formatHz } from '../../assist/sizing/size-part.ts';
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
  readCountOption,
  readNumberOption,
  readQuantityOption,
} from '../assist/assist-input.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { CliError, ExitCode } from '../exit-codes.ts';
import { tell, writeOutput } from '../output.ts';

const NAME = 'propose';

export const proposeCommand: Command = {
  name: NAME,
  summary: 'propose up to three filters (topology and preferred values) that keep the target margin with the least total inductance, each checked with the engine',
  description: [
    'Searches 1 to --stages CM stages (default 2), with the DM inductance from the chokes’ leakage or from a line inductor pair: the Y capacitors at the largest preferred value the leakage limit allows, every X capacitor over the series from 47 nF to 4.7 µF, and for each the smallest preferred choke inductance that keeps the target margin, every candidate judged like check. New parts get default parasitics by stated models (docs/assistants.md). With a converter (the design’s operating.converter, or --voltage and --power) every proposal also keeps its output impedance 6 dB below V²/P.',
    'The noise source, receivers and limits are the design’s; its stages are replaced. --variant <file> writes the first proposal as a design.',
    'Exit code 0 when a filter was found, 1 when none keeps the margin within the constraints, 2 on bad input.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file (its noise source, receivers and limits are used)' }],
  options: [
    ...NOISE_OPTIONS,
    { name: 'stages', value: 'n', description: 'at most this many CM stages, 1 to 3 (default 2)' },
    { name: 'series', value: 'name', description: `preferred values: ${PREFERRED_SERIES_NAMES.join(', ')} (default E6)` },
    { name: 'leakage-limit', value: 'current', description: 'the leakage-current limit that bounds the Y capacitors, e.g. "0.75mA"' },
    { name: 'line-voltage', value: 'V', description: 'for the leakage limit (default: the design’s operating.supply)' },
    { name: 'line-frequency', value: 'Hz', description: 'for the leakage limit (default: the design’s operating.supply)' },
    { name: 'voltage', value: 'V', description: 'the converter’s lowest input voltage (default: operating.converter)' },
    { name: 'power', value: 'W', description: 'the converter’s highest input power (default: operating.converter)' },
    { name: 'stability-margin', value: 'dB', description: 'how far the output impedance must stay below V²/P (default 6)' },
    { name: 'fixed-choke', value: 'H', description: 'every choke takes this inductance' },
    { name: 'fixed-x', value: 'F', description: 'every X capacitor takes this capacitance' },
    { name: 'fixed-y', value: 'F', description: 'the Y capacitors take this capacitance' },
    { name: 'variant', value: 'file', description: 'write the first proposal as a design to <file>' },
    ...OUTPUT_OPTIONS,
  ],
  examples: [
    { command: `chokepoint propose ${DEMO_DESIGN} --scan ${DEMO_SCAN} --scan-tag line1 --leakage-limit 0.75mA --line-voltage 264V --line-frequency 60Hz`, description: 'filters for the demo’s scan, Y bounded by 0.75 mA' },
    { command: `chokepoint propose fixtures/assist/invented-dc-input-converter.design.json --estimate --fixed-y 4.7nF --variant out/proposed.design.json`, description: 'behind the example’s 36 V, 50 W converter, kept stable' },
  ],
  run: runPropose,
};

async function runPropose(args: ParsedArgs, context: CommandContext): Promise<number> {
  checkNoiseOptions(args, NAME);
  const stages = readCountOption(args, 'stages', NAME, 1, 3);
  const series = readChoiceOption(args, 'series', NAME, PREFERRED_SERIES_NAMES);
  const leakageLimitA = readQuantityOption(args, 'leakage-limit', NAME, 'A');
  const voltage = readQuantityOption(args, 'voltage', NAME, 'V');
  const power = readQuantityOption(args, 'power', NAME, 'W');
  const stabilityMarginDb = readNumberOption(args, 'stability-margin', NAME, 0, 60);
  const fixedChoke = readQuantityOption(args, 'fixed-choke', NAME, 'H');
  const fixedX = readQuantityOption(args, 'fixed-x', NAME, 'F');
  const fixedY = readQuantityOption(args, 'fixed-y', NAME, 'F');
  const design = await loadDesign(context, args.positionals[0]!);
  const problem = await readAssistProblem(args, context, design, NAME);

  let leakage: ProposalConstraints['leakage'];
  if (leakageLimitA !== undefined) {
    const supply = design.operating?.supply;
    const lineVoltageV = readQuantityOption(args, 'line-voltage', NAME, 'V') ?? supply?.highestVoltage;
    const lineFrequencyHz = readQuantityOption(args, 'line-frequency', NAME, 'Hz') ?? (supply?.kind === 'ac-mains' ? supply.highestFrequencyHz : undefined);
    if (lineVoltageV === undefined || lineFrequencyHz === undefined) throw new CliError('the leakage limit needs the highest line voltage and frequency: add operating.supply to the design or give --line-voltage and --line-frequency');
    leakage = { leakageLimitA, lineVoltageV, lineFrequencyHz };
  }
  const converterVoltage = voltage ?? design.operating?.converter?.lowestInputVoltage;
  const converterPower = power ?? design.operating?.converter?.highestInputPower;
  const constraints: ProposalConstraints = {
    ...(leakage ? { leakage } : {}),
    ...(stages === undefined ? {} : { maxStages: stages }),
    ...(series === undefined ? {} : { series }),
    ...(converterVoltage !== undefined && converterPower !== undefined
      ? { converter: { lowestInputVoltageV: converterVoltage, highestInputPowerW: converterPower, ...(stabilityMarginDb === undefined ? {} : { stabilityMarginDb }) } }
      : {}),
    fixed: { ...(fixedChoke === undefined ? {} : { chokeInductanceH: fixedChoke }), ...(fixedX === undefined ? {} : { xCapacitanceF: fixedX }), ...(fixedY === undefined ? {} : { yCapacitanceF: fixedY }) },
  };
  let report: ProposalReport;
  try {
    report = runSteps(proposeFilters(problem, constraints));
  } catch (error) {
    if (error instanceof AssistInputError) throw new CliError(error.message);
    throw error;
  }
  const variant = args.value('variant');
  if (variant !== undefined && report.proposals[0]) {
    await writeOutput(context, variant, `${JSON.stringify(report.proposals[0].design, null, 2)}\n`);
    tell(context, `wrote the first proposal to ${variant}`);
  }
  const text = args.flag('json') ? `${JSON.stringify({ design: design.name, ...report }, jsonReplacer)}\n` : proposalText(design.name, report);
  await writeOutput(context, args.value('out'), text);
  return report.proposals.length > 0 ? ExitCode.Ok : ExitCode.NotPassed;
}

function proposalText(name: string, report: ProposalReport): string {
  const lines = [`design: ${name} (its noise source, receivers and limits)`, `target margin ${report.targetMarginDb} dB; ${report.evaluations} engine evaluations`, ''];
  report.proposals.forEach((p, k) => {
    lines.push(`${k + 1}. ${p.topology}: total inductance ${formatQuantity(p.totalInductanceH, 'H', 3)}, worst margin ${p.marginDb.toFixed(1)} dB at ${formatHz(p.worstFrequencyHz)}`);
    lines.push(`   ${p.description}`);
    lines.push(`   ${p.parts.map((part) => `${part.elementId} ${formatQuantity(part.value, part.unit, 3)}`).join(', ')}`);
    if (p.stability) lines.push(`   converter stability: closest approach ${p.stability.closest.marginDb.toFixed(1)} dB at ${formatHz(p.stability.closest.frequencyHz)}`);
    lines.push('');
  });
  for (const note of report.notes) lines.push(`note: ${note}`);
  return `${lines.join('\n')}\n`;
}
