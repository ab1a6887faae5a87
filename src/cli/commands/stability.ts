import { AssistInputError } from '../../assist/margin/assist-problem.ts';
import { runSteps } from '../../assist/run/steps.ts';
import { formatHz } from '../../assist/sizing/size-part.ts';
import { converterStability, type StabilityResult } from '../../assist/stability/stability.ts';
import { formatQuantity } from '../../model/index.ts';
import type { ParsedArgs } from '../args.ts';
import { jsonReplacer, OUTPUT_OPTIONS, readNumberOption, readQuantityOption } from '../assist/assist-input.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { CliError, ExitCode } from '../exit-codes.ts';
import { writeOutput } from '../output.ts';

const NAME = 'stability';
const EXAMPLE = 'fixtures/assist/invented-dc-input-converter.design.json';

export const stabilityCommand: Command = {
  name: NAME,
  summary: 'Middlebrook’s criterion: the filter’s output impedance seen by the converter against the converter’s negative input resistance −V²/P',
  description: [
    'The converter’s incremental input resistance −V²/P at its lowest input voltage and highest power (the design’s operating.converter, or --voltage and --power) against the filter’s DM output impedance seen from the converter (the engine’s input impedance from the source side, supply network connected). The margin is 20·log10(|V²/P| / |Z_o|) at every frequency; the closest approach is located between grid points, and every range below the required margin (--margin, default 6 dB) is flagged.',
    'Exit code 0 when the closest approach keeps the required margin, 1 when it does not, 2 on bad input (including a design with no converter data: nothing is judged without it).',
  ],
  arguments: [{ name: 'design.json', description: 'a design file' }],
  options: [
    { name: 'voltage', value: 'V', description: 'the converter’s lowest input voltage (default: operating.converter.lowestInputVoltage)' },
    { name: 'power', value: 'W', description: 'the converter’s highest input power (default: operating.converter.highestInputPower)' },
    { name: 'margin', value: 'dB', description: 'how far |Z_o| must stay below |V²/P| (default 6 dB)' },
    { name: 'up-to', value: 'frequency', description: 'judge only up to the converter’s loop bandwidth (default: the whole plan)' },
    ...OUTPUT_OPTIONS,
  ],
  examples: [
    { command: `chokepoint stability ${EXAMPLE}`, description: 'the invented 48 V, 50 W example: passes with 9.5 dB' },
    { command: `chokepoint stability ${EXAMPLE} --voltage 24V --power 100W --json`, description: 'the same filter behind a 24 V, 100 W converter' },
  ],
  run: runStability,
};

async function runStability(args: ParsedArgs, context: CommandContext): Promise<number> {
  const voltage = readQuantityOption(args, 'voltage', NAME, 'V');
  const power = readQuantityOption(args, 'power', NAME, 'W');
  const margin = readNumberOption(args, 'margin', NAME, 0, 60);
  const upTo = readQuantityOption(args, 'up-to', NAME, 'Hz');
  const design = await loadDesign(context, args.positionals[0]!);
  let result: StabilityResult;
  try {
    result = runSteps(
      converterStability(design, {
        ...(voltage === undefined ? {} : { lowestInputVoltageV: voltage }),
        ...(power === undefined ? {} : { highestInputPowerW: power }),
        ...(margin === undefined ? {} : { requiredMarginDb: margin }),
        ...(upTo === undefined ? {} : { upToHz: upTo }),
      }),
    );
  } catch (error) {
    if (error instanceof AssistInputError) throw new CliError(error.message);
    throw error;
  }
  const text = args.flag('json') ? `${JSON.stringify({ design: design.name, ...result }, jsonReplacer)}\n` : stabilityText(design.name, result);
  await writeOutput(context, args.value('out'), text);
  return result.pass ? ExitCode.Ok : ExitCode.NotPassed;
}

function stabilityText(name: string, r: StabilityResult): string {
  const lines = [
    `design: ${name}`,
    `converter: ${formatQuantity(r.lowestInputVoltageV, 'V', 4)} lowest input, ${formatQuantity(r.highestInputPowerW, 'W', 4)} highest power: −V²/P = ${formatQuantity(r.negativeResistanceOhm, 'Ω', 4)}`,
    `closest approach: |Z_o| = ${formatQuantity(r.closest.outputImpedanceOhm, 'Ω', 4)} at ${formatHz(r.closest.frequencyHz)}, margin ${r.closest.marginDb.toFixed(2)} dB (required ${r.requiredMarginDb} dB)`,
  ];
  if (r.flagged.length === 0) lines.push('no frequency below the required margin');
  for (const range of r.flagged) lines.push(`  below the required margin: ${formatHz(range.startHz)} to ${formatHz(range.stopHz)}, worst ${range.worstMarginDb.toFixed(2)} dB`);
  for (const note of r.notes) lines.push(`note: ${note}`);
  lines.push('', r.pass ? `RESULT: PASS, the filter's output impedance stays ${r.requiredMarginDb} dB below |V²/P|` : 'RESULT: FAIL, the filter’s output impedance comes too close to the converter’s negative input resistance');
  return `${lines.join('\n')}\n`;
}
