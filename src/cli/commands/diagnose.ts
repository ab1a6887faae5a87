import { limitingMode, type LimitingModeReport } from '../../assist/limiting-mode/limiting-mode.ts';
import { runSteps } from '../../assist/run/steps.ts';
import type { ParsedArgs } from '../args.ts';
import { DEMO_DESIGN, DEMO_SCAN, jsonReplacer, NOISE_OPTIONS, OUTPUT_OPTIONS, readAssistProblem, checkNoiseOptions } from '../assist/assist-input.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { CliError, ExitCode } from '../exit-codes.ts';
import { writeOutput } from '../output.ts';

export const diagnoseCommand: Command = {
  name: 'diagnose',
  summary: 'which mode (CM or DM) sets the margin in each range short of the target, how much is missing, and whether more CM inductance could help',
  description: [
    'For every range of frequencies where the predicted level is short of the target margin: whether common mode or differential mode sets the margin, the attenuation still missing in each mode, and whether more CM choke inductance could help at all (each CM choke, and all of them together, swept from 0.1× to 10× its inductance with the engine, winding capacitance and leakage held).',
    'A line scan cannot be split into modes: each range is judged with the noise taken as all common mode and as all differential mode. Scans from a CM/DM separator (--cm-scan, --dm-scan) speak for their own mode; the noise estimate carries both modes and is split at the worst point.',
    'Exit code 0 when every band keeps the target margin (nothing to diagnose), 1 when some range is short, 2 on bad input.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file' }],
  options: [...NOISE_OPTIONS, ...OUTPUT_OPTIONS],
  examples: [
    { command: `chokepoint diagnose ${DEMO_DESIGN} --scan ${DEMO_SCAN} --scan-tag line1`, description: 'the invented demo: the 260 kHz shortfall is differential mode' },
    { command: `chokepoint diagnose ${DEMO_DESIGN} --estimate --json`, description: 'from the design’s noise estimate, as JSON' },
  ],
  run: runDiagnose,
};

async function runDiagnose(args: ParsedArgs, context: CommandContext): Promise<number> {
  checkNoiseOptions(args, 'diagnose');
  const design = await loadDesign(context, args.positionals[0]!);
  const problem = await readAssistProblem(args, context, design, 'diagnose');
  const report = runSteps(limitingMode(problem));
  if (!report.judged) throw new CliError('nothing was judged: no limit covers the noise inside the bands, so there is no verdict to explain');
  const text = args.flag('json') ? `${JSON.stringify({ design: design.name, ...report }, jsonReplacer)}\n` : diagnosisText(design.name, report);
  await writeOutput(context, args.value('out'), text);
  return report.ranges.length === 0 ? ExitCode.Ok : ExitCode.NotPassed;
}

const MODE = { 'common-mode': 'CM', 'differential-mode': 'DM' } as const;
const dB = (x: number): string => (Number.isFinite(x) ? `${x.toFixed(1)} dB` : x === Number.POSITIVE_INFINITY ? 'cannot alone' : '–');

export function diagnosisText(name: string, report: LimitingModeReport): string {
  const lines = [`design: ${name}`, `target margin ${report.targetMarginDb} dB; worst margin ${dB(report.worstMarginDb)}`, ''];
  if (report.ranges.length === 0) lines.push('every band keeps the target margin: nothing to diagnose');
  for (const range of report.ranges) {
    lines.push(`${range.status === 'failing' ? 'OVER THE LIMIT' : 'short of target'}: ${range.summary}`);
    lines.push(`  margin as all CM ${dB(range.byMode.commonModeDb)}, as all DM ${dB(range.byMode.differentialModeDb)}; limiting: ${MODE[range.limitingMode]}`);
    for (const probe of range.inductanceProbes) {
      const cells = probe.factors.map((factor, i) => `${factor}×: ${dB(probe.marginDb[i]!)}`).join(', ');
      lines.push(`  CM inductance of ${probe.elementIds.join('+')}: ${cells}`);
    }
    lines.push('');
  }
  for (const note of report.notes) lines.push(`note: ${note}`);
  return `${lines.join('\n')}\n`;
}
