import { allocateResponse, compileNetwork, createWorkspace, evaluateNetwork, logSpace, referenceEvaluate, sweepDesign } from '../../../src/engine/index.ts';
import { requireDesign } from '../../../src/model/read-design.ts';
import { BENCH_DESIGN } from '../bench-design.ts';
import { type BenchSection, time } from '../bench-section.ts';

/**
 * The sweep kernel, the reference evaluator and the whole sweep on one invented ten-element design
 * at 2001 points, on one core.
 */
export const kernelSection: BenchSection = {
  id: 'kernel',
  title: 'sweep kernel',
  run() {
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

    const nsPerPointElement = (kernel.medianMs * 1e6) / (points * elements);
    return Promise.resolve({
      figures: {
        benchDesign: design.name,
        points,
        elements,
        kernelMs: kernel.medianMs,
        kernelMinimumMs: kernel.minimumMs,
        kernelNsPerPointElement: nsPerPointElement,
        kernelInCircuitOnlyMs: inCircuitOnly.medianMs,
        referenceMs: reference.medianMs,
        kernelSpeedup: reference.medianMs / kernel.medianMs,
        fullSweepMs: fullSweep.medianMs,
      },
      rows: [
        ['design', `${design.name} (${elements} elements, ${points} points)`],
        ['kernel, full sweep (all outputs)', `${kernel.medianMs.toFixed(3)} ms median, ${kernel.minimumMs.toFixed(3)} ms best`],
        ['kernel, ns per (point × element)', nsPerPointElement.toFixed(1)],
        ['kernel, in circuit only', `${inCircuitOnly.medianMs.toFixed(3)} ms`],
        ['reference evaluator (complex.js)', `${reference.medianMs.toFixed(1)} ms`],
        ['kernel speed-up over reference', `${(reference.medianMs / kernel.medianMs).toFixed(0)}×`],
        ['sweepDesign (grid, resonances, refinement, columns)', `${fullSweep.medianMs.toFixed(3)} ms`],
      ],
    });
  },
};
