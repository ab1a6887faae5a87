import { type DampingReport, suggestDamping } from '../../assist/damping/suggest-damping.ts';
import { AssistInputError, type AssistProblem } from '../../assist/margin/assist-problem.ts';
import { runSteps } from '../../assist/run/steps.ts';
import { formatHz } from '../../assist/sizing/size-part.ts';
import { formatQuantity } from '../../model/index.ts';
import type { ParsedArgs } from '../args.ts';
import { DEMO_DESIGN, DEMO_SCAN, jsonReplacer, NOISE_OPTIONS, OUTPUT_OPTIONS, readAssistProblem, readChoiceOption, readNumberOption, readQuantityOption, checkNoiseOptions } from '../assist/assist-input.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { CliError, ExitCode } from '../exit-codes.ts';
import { tell, writeOutput } from '../output.ts';

const NAME = 'damp';

export const dampCommand: Command = {
  name: NAME,
  summary: 'list every resonance (part self-resonances, filter resonances where the insertion loss dips or turns into gain) with the parts behind it, and size a damping leg',
  description: [
    'Part self-resonances come from the engine; filter resonances are the dips of the in-circuit insertion loss, per mode, with the parts responsible found from the sensitivity of each resonance’s frequency to every part value (perturbed ±2 %).',
    'A damping leg is sized for one differential-mode resonance (with noise: the one nearest the worst margin; else the deepest; or --at): a parallel R–C_b leg across the capacitor it depends on most, R and C_b = n·C from the optimum of Erickson & Maksimović (--ratio n, default 2), or a series R ∥ L_b leg in each line (--leg rl), its R found with the engine. --variant <file> writes the design with the leg added.',
    'The noise options are optional here: with them, the margin before and after is given.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file' }],
  options: [
    ...NOISE_OPTIONS,
    { name: 'leg', value: 'kind', description: 'rc (parallel R–C_b across a capacitor, default) or rl (series R ∥ L_b in each line)' },
    { name: 'ratio', value: 'n', description: 'C_b/C (or L_b/L) of the leg (default 2)' },
    { name: 'at', value: 'frequency', description: 'damp the differential-mode resonance nearest this frequency' },
    { name: 'variant', value: 'file', description: 'write the design with the damping leg added to <file> (a new variant)' },
    ...OUTPUT_OPTIONS,
  ],
  examples: [
    { command: `chokepoint damp ${DEMO_DESIGN} --scan ${DEMO_SCAN} --scan-tag line1 --variant out/damped.design.json`, description: 'damp the demo’s fourth-harmonic resonance and save the variant' },
    { command: `chokepoint damp ${DEMO_DESIGN} --leg rl --ratio 1 --at 280kHz --json`, description: 'a series R–L leg instead' },
  ],
  run: runDamp,
};

async function runDamp(args: ParsedArgs, context: CommandContext): Promise<number> {
  const leg = readChoiceOption(args, 'leg', NAME, ['rc', 'rl'] as const) ?? 'rc';
  const ratio = readNumberOption(args, 'ratio', NAME, 0.05, 100);
  const at = readQuantityOption(args, 'at', NAME, 'Hz');
  const withNoise = ['scan', 'cm-scan', 'dm-scan'].some((name) => args.value(name) !== undefined) || args.flag('estimate');
  if (withNoise) checkNoiseOptions(args, NAME);
  const design = await loadDesign(context, args.positionals[0]!);
  const problem: AssistProblem | undefined = withNoise ? await readAssistProblem(args, context, design, NAME) : undefined;
  let report: DampingReport;
  try {
    report = runSteps(
      suggestDamping(design, { leg: leg === 'rl' ? 'series-rl' : 'parallel-rc', ...(ratio === undefined ? {} : { ratio }), ...(at === undefined ? {} : { resonanceHz: at }) }, problem),
    );
  } catch (error) {
    if (error instanceof AssistInputError) throw new CliError(error.message);
    throw error;
  }
  const variant = args.value('variant');
  if (variant !== undefined) {
    if (!report.suggestion) throw new CliError('no damping leg was sized, so there is no variant to write');
    await writeOutput(context, variant, `${JSON.stringify({ ...report.suggestion.design, name: `${design.name} (damped)` }, null, 2)}\n`);
    tell(context, `wrote the damped variant to ${variant}`);
  }
  const text = args.flag('json') ? `${JSON.stringify({ design: design.name, ...report }, jsonReplacer)}\n` : dampingText(design.name, report);
  await writeOutput(context, args.value('out'), text);
  return ExitCode.Ok;
}

const dB = (x: number | undefined): string => (x !== undefined && Number.isFinite(x) ? `${x.toFixed(1)} dB` : '–');
const MODE = { 'common-mode': 'CM', 'differential-mode': 'DM' } as const;

function dampingText(name: string, report: DampingReport): string {
  const lines = [`design: ${name}`, '', 'filter resonances (dips of the in-circuit insertion loss):'];
  for (const r of report.resonances.filter) {
    const who = r.responsible
      .slice(0, 4)
      .map((s) => `${s.elementId} ${s.quantity} ${s.frequencySensitivity.toFixed(2)}`)
      .join(', ');
    lines.push(`  ${MODE[r.mode]} ${formatHz(r.frequencyHz).padEnd(11)} loss ${dB(r.insertionLossDb).padStart(9)}${r.insertionLossDb < 0 ? ' (GAIN)' : ''}, ${dB(r.depthDb)} deep; parts (∂ln f/∂ln p): ${who}`);
  }
  lines.push('', 'part self-resonances:');
  for (const p of report.resonances.parts) lines.push(`  ${p.elementId.padEnd(8)} ${p.view.padEnd(17)} ${p.type.padEnd(8)} ${formatHz(p.frequencyHz)}`);
  lines.push('');
  const s = report.suggestion;
  if (s) {
    const legText =
      s.leg === 'parallel-rc'
        ? `R–C_b leg across ${s.besideElementId}: R = ${formatQuantity(s.resistanceOhm, 'Ω', 3)}, C_b = ${formatQuantity(s.legValue, 'F', 3)} (n = ${s.ratio}; R0 = ${formatQuantity(s.characteristicOhm, 'Ω', 3)}, predicted peak output impedance ${formatQuantity(s.predictedPeakOhm, 'Ω', 3)})`
        : `series R ∥ L_b leg in each line after ${s.besideElementId}: R = ${formatQuantity(s.resistanceOhm, 'Ω', 3)}, L_b = ${formatQuantity(s.legValue, 'H', 3)} per line`;
    lines.push(`damping the ${MODE[s.resonance.mode]} resonance at ${formatHz(s.resonance.frequencyHz)}: ${legText}`);
    lines.push(`  dip of the insertion loss ${dB(s.dipBeforeDb)} → ${dB(s.dipAfterDb)}; peak output impedance ${formatQuantity(s.peakBeforeOhm, 'Ω', 3)} → ${formatQuantity(s.peakAfterOhm, 'Ω', 3)}`);
    if (s.marginBeforeDb !== undefined) lines.push(`  worst margin ${dB(s.marginBeforeDb)} → ${dB(s.marginAfterDb)}`);
    for (const note of s.notes) lines.push(`  note: ${note}`);
  }
  for (const note of report.notes) lines.push(`note: ${note}`);
  return `${lines.join('\n')}\n`;
}
