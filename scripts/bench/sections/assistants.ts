import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { join } from 'node:path';
import { assistProblem } from '../../../src/assist/margin/assist-problem.ts';
import { proposeFilters } from '../../../src/assist/proposal/propose.ts';
import { runSteps } from '../../../src/assist/run/steps.ts';
import { sizePart } from '../../../src/assist/sizing/size-part.ts';
import { readScanText } from '../../../src/io/scan-csv.ts';
import type { DesignInput } from '../../../src/model/design.ts';
import { requireDesign } from '../../../src/model/read-design.ts';
import { type BenchSection, time } from '../bench-section.ts';

/**
 * The design assistants (docs/assistants.md): sizing one part and a proposal on the demo scan in this
 * thread; 2000 Monte Carlo units of an invented four-stage filter at 1001 points, and a 40×40 map, on
 * the command line's worker threads (one and all cores), timed by the command itself (`elapsedMs`:
 * thread start, preparing the job in every thread, the chunks and the merge).
 */

// The bench runs from a bundle in node_modules/.cache, with the repository as its working folder.
const root = process.cwd();
const cache = join(root, 'node_modules', '.cache', 'chokepoint-bench');

/** An invented four-stage mains filter: Y capacitors at the converter side, then four choke + X capacitor stages. */
function fourStageDesign(): DesignInput {
  const stage = (k: number) => ({
    id: `stage${k}`,
    elements: [
      ...(k === 1
        ? [
            { id: 'CX0', placement: 'line-to-line' as const, part: { kind: 'capacitor' as const, capacitance: '220n', esr: '20m', esl: '12n' } },
            { id: 'CY1', placement: 'line1-to-ground' as const, part: { kind: 'capacitor' as const, capacitance: '2n2', esr: 0.2, esl: '5n' } },
            { id: 'CY2', placement: 'line2-to-ground' as const, part: { kind: 'capacitor' as const, capacitance: '2n2', esr: 0.2, esl: '5n' } },
          ]
        : []),
      {
        id: `LCM${k}`,
        placement: 'both-lines-coupled' as const,
        part: { kind: 'common-mode-choke' as const, inductance: '1m', coupling: { kind: 'leakage-inductance' as const, leakageInductance: '10u' }, dcr: '40m', windingCapacitance: '5p' },
      },
      { id: `CX${k}`, placement: 'line-to-line' as const, part: { kind: 'capacitor' as const, capacitance: '220n', esr: '20m', esl: '12n' } },
    ],
  });
  const demo = JSON.parse(readFileSync(join(root, 'fixtures/demo/adapter-two-stage.design.json'), 'utf8')) as DesignInput;
  return { ...demo, name: 'Benchmark: invented four-stage filter', stages: [stage(1), stage(2), stage(3), stage(4)] };
}

/** An invented line scan at 1001 log-spaced points, 150 kHz to 30 MHz: a falling envelope with harmonic peaks. */
function benchScan(): string {
  const lines = ['# INVENTED benchmark scan, 1001 points', 'Frequency [MHz],Peak [dBuV]'];
  for (let k = 0; k < 1001; k += 1) {
    const f = 150e3 * 200 ** (k / 1000);
    const level = 150 - 25 * Math.log10(f / 150e3) + 6 * Math.cos(k / 3);
    lines.push(`${(f / 1e6).toFixed(9)},${level.toFixed(3)}`);
  }
  return `${lines.join('\n')}\n`;
}

function cli(args: readonly string[]): Record<string, unknown> {
  let stdout: string;
  try {
    stdout = execFileSync(process.execPath, [join(root, 'bin/chokepoint.mjs'), ...args], { cwd: root, maxBuffer: 256 * 1024 * 1024, encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] });
  } catch (error) {
    // A judgement that does not pass exits 1 and still writes its JSON.
    const failed = error as { status?: number; stdout?: string };
    if (failed.status !== 1 || !failed.stdout) throw error;
    stdout = failed.stdout;
  }
  return JSON.parse(stdout) as Record<string, unknown>;
}

export const assistantsSection: BenchSection = {
  id: 'assistants',
  title: 'design assistants',
  run() {
    const demo = requireDesign(JSON.parse(readFileSync(join(root, 'fixtures/demo/adapter-two-stage.design.json'), 'utf8')));
    const read = readScanText(readFileSync(join(root, 'fixtures/scans/invented-adapter-no-filter.csv'), 'utf8'), { tag: 'line1' });
    if (!read.ok) throw new Error(read.error.message);
    const problem = assistProblem(demo, { kind: 'scans', scans: [read.scan] });
    const sizing = time(() => runSteps(sizePart(problem, { elementIds: ['CX2'], quantity: 'capacitance' })), 3000, 3, 1);
    const leakage = { leakageLimitA: 0.75e-3, lineVoltageV: 264, lineFrequencyHz: 60 };
    let evaluations = 0;
    const proposal = time(() => {
      evaluations = runSteps(proposeFilters(problem, { leakage, maxStages: 2 })).evaluations;
    }, 0, 2, 0);

    mkdirSync(cache, { recursive: true });
    const designPath = join(cache, 'assist-four-stage.design.json');
    const scanPath = join(cache, 'assist-scan-1001.csv');
    writeFileSync(designPath, JSON.stringify(fourStageDesign()));
    writeFileSync(scanPath, benchScan());
    const cores = availableParallelism();
    const monteCarlo = (workers: number): number =>
      cli(['tolerance', designPath, '--scan', scanPath, '--samples', '2000', '--seed', '1', '--workers', String(workers), '--json'])['elapsedMs'] as number;
    cli(['tolerance', designPath, '--scan', scanPath, '--samples', '50', '--json']); // builds the command line if stale
    const oneThreadMs = monteCarlo(1);
    const allThreadsMs = monteCarlo(Math.max(2, cores));
    const mapMs = cli(['map', designPath, '--scan', scanPath, '--x', 'LCM1', '--x-range', '0.1mH,10mH', '--y', 'CX1', '--y-range', '22nF,2.2uF', '--steps', '40', '--workers', String(Math.max(2, cores)), '--json'])['elapsedMs'] as number;

    return Promise.resolve({
      figures: {
        assistSizeOnePartMs: sizing.medianMs,
        assistProposalMs: proposal.medianMs,
        assistProposalEvaluations: evaluations,
        assistMonteCarlo2000OneThreadMs: oneThreadMs,
        assistMonteCarlo2000AllThreadsMs: allThreadsMs,
        assistMonteCarloThreads: Math.max(2, cores),
        assistMonteCarloSamplesPerSecond: 2000 / (allThreadsMs / 1000),
        assistMap40x40Ms: mapMs,
        assistLoadAverage1m: loadavg()[0]!,
      },
      rows: [
        ['size one part (demo scan, 7463 points; goal < 200 ms)', `${sizing.medianMs.toFixed(0)} ms`],
        ['proposal, up to 2 stages (demo scan; goal < 10 s)', `${(proposal.medianMs / 1000).toFixed(2)} s, ${evaluations} engine evaluations`],
        ['2000 Monte Carlo units, 4 stages, 1001 points, 1 thread', `${(oneThreadMs / 1000).toFixed(2)} s`],
        [`2000 Monte Carlo units, ${Math.max(2, cores)} threads (goal < 3 s)`, `${(allThreadsMs / 1000).toFixed(2)} s, ${(2000 / (allThreadsMs / 1000)).toFixed(0)} units/s`],
        [`40×40 map, 4 stages, 1001 points, ${Math.max(2, cores)} threads (goal < 2 s)`, `${(mapMs / 1000).toFixed(2)} s`],
      ],
      notes: [`the threaded figures include starting the threads and preparing the job in each; load average ${loadavg()[0]!.toFixed(1)} on ${cores} cores while measuring`],
    });
  },
};
