import { AssistInputError } from '../../assist/margin/assist-problem.ts';
import { runSplit, type SplitRunner } from '../../assist/pool/split-jobs.ts';
import { DEFAULT_SAMPLES, type YieldResult } from '../../assist/tolerance/yield-run.ts';
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
  readNumberOption,
} from '../assist/assist-input.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { CliError, ExitCode, UsageError } from '../exit-codes.ts';
import { tell, writeOutput } from '../output.ts';

const NAME = 'tolerance';

export const toleranceCommand: Command = {
  name: NAME,
  summary: 'tolerance yield: Monte Carlo over every part’s tolerance, the distribution of worst margin, the yield and the parts that move it most',
  description: [
    'Draws N units of the design (--samples, default 2000), each part’s main value from its tolerance (the element’s own, else the default for its kind: capacitors ±10 %, chokes and inductors ±30 %, …) and magnetic parts over their permeability band with one temperature per unit, and judges every unit like check. Each unit comes from its own generator seeded by (--seed, unit number), so a run is the same on any number of worker threads (--workers, default one per core).',
    'Prints the yield (units keeping the target margin), the distribution of worst margin, and the parts whose tolerance moves the margin most; --json adds the histogram and the 5th-percentile curve against the limit.',
    'Exit code 0 when the yield reaches --required-yield (default 95 %), 1 when it does not, 2 on bad input.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file' }],
  options: [
    ...NOISE_OPTIONS,
    { name: 'samples', value: 'n', description: `how many units to draw (default ${DEFAULT_SAMPLES})` },
    { name: 'seed', value: 'n', description: 'the run’s seed, a whole number (default 1)' },
    { name: 'workers', value: 'n', description: 'worker threads (default: one per core)' },
    { name: 'required-yield', value: '%', description: 'the yield that passes (default 95)' },
    { name: 'no-defaults', description: 'vary only parts with their own tolerance in the design' },
    { name: 'permeability-band', value: 'low,high', description: 'permeability band over temperature, percent, for magnetic parts without their own (e.g. "-30,10")' },
    ...OUTPUT_OPTIONS,
  ],
  examples: [
    { command: `chokepoint tolerance ${DEMO_DESIGN} --scan ${DEMO_SCAN} --scan-tag line1 --samples 500`, description: 'the demo’s yield on its scan' },
    { command: `chokepoint tolerance ${DEMO_DESIGN} --estimate --seed 7 --workers 2 --json -o out/yield.json`, description: 'a reproducible run on two threads, as JSON' },
  ],
  run: runTolerance,
};

async function runTolerance(args: ParsedArgs, context: CommandContext): Promise<number> {
  checkNoiseOptions(args, NAME);
  const samples = readCountOption(args, 'samples', NAME, 1, 100_000) ?? DEFAULT_SAMPLES;
  const seed = readCountOption(args, 'seed', NAME, 0, 2 ** 31 - 1) ?? 1;
  const workers = readCountOption(args, 'workers', NAME, 1, 64) ?? Math.max(1, context.io.cores ?? 1);
  const requiredYield = (readNumberOption(args, 'required-yield', NAME, 0, 100) ?? 95) / 100;
  const band = readBand(args);
  const design = await loadDesign(context, args.positionals[0]!);
  const problem = await readAssistProblem(args, context, design, NAME);

  const started = Date.now();
  const runner: SplitRunner | undefined = workers > 1 && context.io.splitRunner ? context.io.splitRunner(workers) : undefined;
  let result: YieldResult;
  try {
    const outcome = await runSplit(
      {
        kind: 'yield',
        design,
        noise: problem.noise,
        judging: { masks: problem.masks, targetMarginDb: problem.targetMarginDb, attribution: problem.attribution, ...(problem.noiseFloorDbuV === undefined ? {} : { noiseFloorDbuV: problem.noiseFloorDbuV }) },
        settings: { samples, seed, useDefaults: !args.flag('no-defaults'), ...(band ? { permeabilityBand: band } : {}) },
      },
      runner,
    );
    if (outcome.kind !== 'yield') throw new Error('the pool returned another kind of result');
    result = outcome.result;
  } catch (error) {
    if (error instanceof AssistInputError) throw new CliError(error.message);
    throw error;
  } finally {
    runner?.close();
  }
  const elapsedMs = Date.now() - started;
  if (result.judgedSamples === 0) throw new CliError('nothing was judged in any unit (no limit covers the noise inside the bands): no yield to give');
  const pass = result.yieldFraction >= requiredYield;
  tell(context, `${samples} units on ${runner ? runner.workerCount : 1} thread${runner && runner.workerCount > 1 ? 's' : ''}`);
  const text = args.flag('json')
    ? `${JSON.stringify({ design: design.name, requiredYield, pass, workers: runner?.workerCount ?? 1, elapsedMs, ...result }, jsonReplacer)}\n`
    : toleranceText(design.name, result, requiredYield, pass);
  await writeOutput(context, args.value('out'), text);
  return pass ? ExitCode.Ok : ExitCode.NotPassed;
}

function readBand(args: ParsedArgs): { lowPercent: number; highPercent: number } | undefined {
  const text = args.value('permeability-band');
  if (text === undefined) return undefined;
  const [low, high, ...rest] = text.split(',').map((s) => Number(s.trim()));
  if (rest.length > 0 || low === undefined || high === undefined || !(low <= 0 && low >= -90 && high >= 0 && high <= 200)) {
    throw new UsageError(`--permeability-band must be "low,high" in percent with -90 ≤ low ≤ 0 ≤ high ≤ 200, got "${text}"`, NAME);
  }
  return { lowPercent: low, highPercent: high };
}

const dB = (x: number): string => (Number.isFinite(x) ? `${x.toFixed(2)} dB` : '–');

function toleranceText(name: string, r: YieldResult, requiredYield: number, pass: boolean): string {
  const s = r.statistics;
  const lines = [
    `design: ${name}`,
    `${r.samples} units (seed ${r.seed}); target margin ${r.targetMarginDb} dB; nominal worst margin ${dB(r.nominalMarginDb)}`,
    `yield: ${(r.yieldFraction * 100).toFixed(1)} % (${r.passingSamples} of ${r.samples} keep the target margin; required ${(requiredYield * 100).toFixed(0)} %)`,
    `worst margin over the units: min ${dB(s.minimumDb)}, 5th percentile ${dB(s.p5Db)}, median ${dB(s.medianDb)}, 95th percentile ${dB(s.p95Db)}, max ${dB(s.maximumDb)}`,
    '',
    'distribution of worst margin:',
  ];
  const most = Math.max(1, ...r.histogram.counts);
  r.histogram.counts.forEach((count, k) => {
    lines.push(`  ${r.histogram.edgesDb[k]!.toFixed(2).padStart(7)} … ${r.histogram.edgesDb[k + 1]!.toFixed(2).padStart(7)} dB  ${'#'.repeat(Math.round((40 * count) / most)).padEnd(40)} ${count}`);
  });
  lines.push('', 'parts whose tolerance moves the worst margin most (correlation; dB per % of value):');
  for (const part of r.parts.slice(0, 8)) {
    lines.push(
      `  ${part.elementId.padEnd(8)} ±${part.percent} % ${part.distribution}${part.source === 'default' ? ' (default)' : ''}${part.hasPermeabilityBand ? ' + permeability band' : ''}: r = ${part.correlation.toFixed(2)}, ${part.slopeDbPerPercent.toFixed(3)} dB/%`,
    );
  }
  for (const note of r.notes) lines.push(`note: ${note}`);
  lines.push('', pass ? 'RESULT: PASS' : 'RESULT: FAIL, the yield is below the required one');
  return `${lines.join('\n')}\n`;
}
