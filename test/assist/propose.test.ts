import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { assistProblem } from '../../src/assist/margin/assist-problem.ts';
import { proposeFilters } from '../../src/assist/proposal/propose.ts';
import { runSteps } from '../../src/assist/run/steps.ts';
import { maximumYCapacitance } from '../../src/assist/sizing/leakage-limit.ts';
import { PREFERRED_SERIES } from '../../src/assist/sizing/preferred-values.ts';
import { readDesignJson } from '../../src/model/read-design.ts';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';
import { demoDesign, demoScan } from './demo-fixture.ts';

const isPreferred = (value: number): boolean => {
  const mantissa = value / 10 ** Math.floor(Math.log10(value) + 1e-12);
  return PREFERRED_SERIES.E6.some((m) => Math.abs(m - mantissa) < 1e-9);
};

describe('a proposed filter for the invented demo scan', () => {
  const design = demoDesign();
  const scan = demoScan();
  const leakage = { leakageLimitA: 0.75e-3, lineVoltageV: 264, lineFrequencyHz: 60, tolerance: 0.1 };
  const report = runSteps(proposeFilters(assistProblem(design, { kind: 'scans', scans: [scan] }), { leakage, maxStages: 2 }));

  it('proposes up to three filters, least total inductance first', () => {
    expect(report.proposals.length).toBeGreaterThan(0);
    expect(report.proposals.length).toBeLessThanOrEqual(3);
    for (let k = 1; k < report.proposals.length; k += 1) expect(report.proposals[k]!.totalInductanceH).toBeGreaterThanOrEqual(report.proposals[k - 1]!.totalInductanceH);
    expect(new Set(report.proposals.map((p) => p.topology)).size).toBe(report.proposals.length);
  });

  it('every proposal passes the check command’s own analysis (the full engine, not the 40 dB/decade rule)', () => {
    for (const proposal of report.proposals) {
      const analysis = analyzeEmissions(proposal.design, { kind: 'scan', scan });
      expect(analysis.report.pass).toBe(true);
      expect(Math.min(...analysis.report.bands.filter((b) => b.worst).map((b) => b.worst!.marginDb))).toBeCloseTo(proposal.marginDb, 9);
    }
  });

  it('uses E6 values, Y capacitors within the leakage limit, and a design that reads back', () => {
    const limit = maximumYCapacitance(0.75e-3, 264, 60, 0.1);
    for (const proposal of report.proposals) {
      for (const part of proposal.parts) expect(isPreferred(part.value)).toBe(true);
      expect(proposal.yPerLineF).toBeLessThanOrEqual(limit);
      expect(readDesignJson(JSON.stringify(proposal.design)).ok).toBe(true);
    }
  });
});

describe('a proposal behind a converter', () => {
  it('keeps the converter stable (Middlebrook, 6 dB) for every proposal', () => {
    const read = readDesignJson(readFileSync(new URL('../../fixtures/assist/invented-dc-input-converter.design.json', import.meta.url), 'utf8'));
    if (!read.ok) throw new Error(read.error.message);
    const report = runSteps(
      proposeFilters(assistProblem(read.value, { kind: 'estimate' }), { maxStages: 2, converter: { lowestInputVoltageV: 36, highestInputPowerW: 50 }, fixed: { yCapacitanceF: 4.7e-9 } }),
    );
    expect(report.proposals.length).toBeGreaterThan(0);
    for (const proposal of report.proposals) {
      expect(proposal.stability!.pass).toBe(true);
      expect(analyzeEmissions(proposal.design, { kind: 'estimate' }).report.pass).toBe(true);
    }
  });
});
