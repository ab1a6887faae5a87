import { describe, expect, it } from 'vitest';
import { assistProblem } from '../../src/assist/margin/assist-problem.ts';
import { compileMarginEvaluator } from '../../src/assist/margin/margin-evaluator.ts';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';
import { demoDesign, demoScan } from './demo-fixture.ts';

// The assistants' fast objective is a second implementation of the check command's margin table
// (spectrum/emissions-analysis.ts): both must give the same worst margin per band and one verdict.
describe('the assistants judge a design exactly as the check command does', () => {
  const design = demoDesign();
  const scan = demoScan();

  for (const attribution of ['both', 'common-mode', 'differential-mode'] as const) {
    it(`demo scan, attribution ${attribution}`, () => {
      const analysis = analyzeEmissions(design, { kind: 'scan', scan }, { attribution });
      const evaluator = compileMarginEvaluator(assistProblem(design, { kind: 'scans', scans: [scan] }, { attribution }));
      const outcome = evaluator.evaluate(design);
      analysis.report.bands.forEach((band, b) => {
        if (band.worst) expect(outcome.bandWorstDb[b]).toBeCloseTo(band.worst.marginDb, 9);
        else expect(outcome.bandWorstDb[b]).toBeNaN();
      });
      expect(evaluator.meetsTarget(outcome)).toBe(analysis.report.pass);
    });
  }

  it('noise estimate', () => {
    const analysis = analyzeEmissions(design, { kind: 'estimate' });
    const evaluator = compileMarginEvaluator(assistProblem(design, { kind: 'estimate' }));
    const outcome = evaluator.evaluate(design);
    analysis.report.bands.forEach((band, b) => {
      if (band.worst) expect(outcome.bandWorstDb[b]).toBeCloseTo(band.worst.marginDb, 9);
    });
    expect(evaluator.meetsTarget(outcome)).toBe(analysis.report.pass);
  });

  it('a second candidate reuses the compiled problem and still agrees (no state leaks between calls)', () => {
    const evaluator = compileMarginEvaluator(assistProblem(design, { kind: 'scans', scans: [scan] }));
    const bare = { ...design, stages: [] };
    evaluator.evaluate(bare);
    const outcome = evaluator.evaluate(design);
    const analysis = analyzeEmissions(design, { kind: 'scan', scan });
    expect(outcome.worstMarginDb).toBeCloseTo(Math.min(...analysis.report.bands.filter((b) => b.worst).map((b) => b.worst!.marginDb)), 9);
  });
});

describe('a pass needs evidence (src/spectrum/verdict.ts), for the assistants as for check', () => {
  it('a band the scan does not reach makes every candidate fail, and says why', () => {
    const design = demoDesign();
    const scan = demoScan();
    const withBand = { ...design, emissions: { ...design.emissions!, bands: [...(design.emissions!.bands ?? []), { name: '30–40 MHz', startHz: 30e6, stopHz: 40e6 }] } };
    const problem = assistProblem(withBand, { kind: 'scans', scans: [scan] }, { targetMarginDb: 3 });
    const evaluator = compileMarginEvaluator(problem);
    expect(evaluator.coverage.uncoveredBands).toEqual(['30–40 MHz']);
    const outcome = evaluator.evaluate(withBand);
    expect(outcome.worstMarginDb).toBeGreaterThan(3);
    expect(evaluator.meetsTarget(outcome)).toBe(false);
    expect(analyzeEmissions(withBand, { kind: 'scan', scan }, { targetMarginDb: 3 }).report.pass).toBe(false);
  });
});
