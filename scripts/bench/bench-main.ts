import { allocateResponse, compileNetwork, createWorkspace, evaluateNetwork, logSpace, referenceEvaluate, sweepDesign } from '../../src/engine/index.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import { BENCH_DESIGN } from './bench-design.ts';

/**
 * Times the sweep kernel, the reference evaluator and the whole sweep on one invented ten-element
 * design at 2001 points, on one core. Prints a table, or one JSON object with --json.
 * Medians of repeated runs after a warm-up, so the JIT has settled.
 */

interface Timing {
  medianMs: number;
  minimumMs: number;
  runs: number;
}

function time(run: () => void, budgetMs: number, minimumRuns: number, warmupRuns: number): Timing {
  for (let k = 0; k < warmupRuns; k += 1) run();
  const samples: number[] = [];
  const started = performance.now();
  while (samples.length < minimumRuns || performance.now() - started < budgetMs) {
    const t0 = performance.now();
    run();
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  return { medianMs: samples[Math.floor(samples.length / 2)]!, minimumMs: samples[0]!, runs: samples.length };
}

const asJson = process.argv.includes('--json');
const design = requireDesign(BENCH_DESIGN);
const grid = logSpace(1e4, 1e8, 500);
const points = grid.length;
const network = compileNetwork(design);
const elements = network.elements.length;
const workspace = createWorkspace(network, points);
const response = allocateResponse(points, network.resistiveSystems.length);

const kernel = time(() => evaluateNetwork(network, grid, workspace, response), 2000, 200, 300);
const inCircuitNetwork = compileNetwork(design, []);
const inCircuitWorkspace = createWorkspace(inCircuitNetwork, points);
const inCircuitResponse = allocateResponse(points, 0);
const inCircuitOnly = time(() => evaluateNetwork(inCircuitNetwork, grid, inCircuitWorkspace, inCircuitResponse), 1500, 200, 300);
const gridArray = Array.from(grid);
const reference = time(() => referenceEvaluate(design, gridArray), 3000, 3, 1);
const fullSweep = time(() => sweepDesign(design), 2000, 20, 20);

const result = {
  design: design.name,
  points,
  elements,
  kernelMs: kernel.medianMs,
  kernelMinimumMs: kernel.minimumMs,
  kernelNsPerPointElement: (kernel.medianMs * 1e6) / (points * elements),
  kernelInCircuitOnlyMs: inCircuitOnly.medianMs,
  referenceMs: reference.medianMs,
  kernelSpeedup: reference.medianMs / kernel.medianMs,
  fullSweepMs: fullSweep.medianMs,
  runs: { kernel: kernel.runs, inCircuitOnly: inCircuitOnly.runs, reference: reference.runs, fullSweep: fullSweep.runs },
  node: process.version,
};

if (asJson) {
  process.stdout.write(`${JSON.stringify(result)}\n`);
} else {
  const rows: [string, string][] = [
    ['design', `${result.design} (${elements} elements, ${points} points)`],
    ['kernel, full sweep (all outputs)', `${result.kernelMs.toFixed(3)} ms median, ${result.kernelMinimumMs.toFixed(3)} ms best`],
    ['kernel, ns per (point × element)', result.kernelNsPerPointElement.toFixed(1)],
    ['kernel, in circuit only', `${result.kernelInCircuitOnlyMs.toFixed(3)} ms`],
    ['reference evaluator (complex.js)', `${result.referenceMs.toFixed(1)} ms`],
    ['kernel speed-up over reference', `${result.kernelSpeedup.toFixed(0)}×`],
    ['sweepDesign (grid, resonances, refinement, columns)', `${result.fullSweepMs.toFixed(3)} ms`],
    ['node', result.node],
  ];
  const width = Math.max(...rows.map(([label]) => label.length));
  for (const [label, value] of rows) process.stdout.write(`${label.padEnd(width)}  ${value}\n`);
}
