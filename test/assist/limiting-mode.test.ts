import { describe, expect, it } from 'vitest';
import { withTargetValue } from '../../src/assist/design-edit/part-values.ts';
import { limitingMode } from '../../src/assist/limiting-mode/limiting-mode.ts';
import { assistProblem } from '../../src/assist/margin/assist-problem.ts';
import { runSteps } from '../../src/assist/run/steps.ts';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { demoDesign, demoScan } from './demo-fixture.ts';

describe('which mode limits, on the invented demo', () => {
  const design = demoDesign();
  const scan = demoScan();
  const report = runSteps(limitingMode(assistProblem(design, { kind: 'scans', scans: [scan] })));

  it('finds the one range below target, at the fourth harmonic (258–262 kHz), as the check command does', () => {
    const check = analyzeEmissions(design, { kind: 'scan', scan });
    expect(report.ranges).toHaveLength(1);
    const range = report.ranges[0]!;
    expect(range.startHz).toBeGreaterThanOrEqual(Math.min(...check.report.failingRanges.map((r) => r.startHz)));
    expect(range.stopHz).toBeLessThanOrEqual(Math.max(...check.report.failingRanges.map((r) => r.stopHz)));
    expect(range.marginDb).toBeCloseTo(check.report.worst!.marginDb, 9);
    expect(range.status).toBe('marginal');
  });

  it('says the 260 kHz shortfall is differential mode, with the CM attribution passing there', () => {
    const range = report.ranges[0]!;
    expect(range.limitingMode).toBe('differential-mode');
    expect(range.evidence).toBe('attribution');
    expect(range.byMode.differentialModeDb).toBeCloseTo(range.marginDb, 9);
    expect(range.byMode.commonModeDb).toBeGreaterThan(report.targetMarginDb);
    expect(range.missingCmDb).toBe(0);
    expect(range.missingDmDb).toBeCloseTo(report.targetMarginDb - range.marginDb, 9);
    expect(range.summary).toMatch(/differential mode sets it/u);
  });

  it('sweeping the CM chokes 0.1× to 10× (0.22 to 22 mH for LCM1) never reaches the target there', () => {
    const range = report.ranges[0]!;
    expect(range.inductanceProbes.map((p) => p.elementIds.join('+'))).toEqual(['LCM1', 'LCM2', 'LCM1+LCM2']);
    for (const probe of range.inductanceProbes) {
      expect(probe.reachesTarget).toBe(false);
      expect(probe.gainDb).toBeLessThan(0.01);
      expect(probe.bestMarginDb).toBeCloseTo(range.marginDb, 2);
    }
    expect(range.cmInductanceCanFix).toBe(false);
    expect(range.summary).toMatch(/more CM inductance cannot fix it/u);
  });
});

describe('which mode limits, when the common mode is short', () => {
  // The demo with its converter-side choke cut to a tenth: the CM path now fails near 190 kHz.
  const design = withTargetValue(demoDesign(), { elementIds: ['LCM1'], quantity: 'inductance' }, 0.22e-3, { windingCapacitance: 'keep', leakage: 'fixed-value' })!;
  const scan = demoScan();

  it('names common mode at the low harmonics and finds that more CM inductance fixes them', () => {
    const report = runSteps(limitingMode(assistProblem(design, { kind: 'scans', scans: [scan] })));
    const cmRanges = report.ranges.filter((r) => r.limitingMode === 'common-mode');
    expect(cmRanges.length).toBeGreaterThan(1);
    for (const range of cmRanges) {
      expect(range.byMode.commonModeDb).toBeLessThan(range.byMode.differentialModeDb);
      expect(range.missingCmDb).toBeGreaterThan(0);
      // CM alone short: more CM inductance gets there; DM short too (the 260 kHz resonance): it cannot.
      const dmShort = range.byMode.differentialModeDb < report.targetMarginDb;
      expect(range.cmInductanceCanFix).toBe(!dmShort);
      if (dmShort) expect(range.summary).toMatch(/differential mode is short here too/u);
    }
  });

  it('a scan tagged as the common-mode output of a separator speaks for its mode directly', () => {
    const cmScan: Scan = { ...scan, tag: 'common-mode', name: 'as if from a separator' };
    const report = runSteps(limitingMode(assistProblem(design, { kind: 'scans', scans: [cmScan] })));
    expect(report.ranges.length).toBeGreaterThan(0);
    for (const range of report.ranges) {
      expect(range.evidence).toBe('scan-mode');
      expect(range.limitingMode).toBe('common-mode');
      expect(range.missingDmDb).toBe(0);
    }
  });
});

describe('which mode limits, from the noise estimate', () => {
  it('splits each failing line into its CM and DM parts; missing attenuation per mode', () => {
    const design = demoDesign();
    const report = runSteps(limitingMode(assistProblem(design, { kind: 'estimate' })));
    expect(report.ranges.length).toBeGreaterThan(0);
    for (const range of report.ranges) {
      expect(range.evidence).toBe('estimate');
      // The limiting mode's own margin is the lower of the two; only it can be fixed alone.
      const own = range.limitingMode === 'common-mode' ? range.byMode.commonModeDb : range.byMode.differentialModeDb;
      const other = range.limitingMode === 'common-mode' ? range.byMode.differentialModeDb : range.byMode.commonModeDb;
      expect(own).toBeLessThanOrEqual(other);
      expect(own).toBeGreaterThanOrEqual(range.marginDb);
      // Fixing the limiting mode alone needs at least the shortfall.
      const missing = range.limitingMode === 'common-mode' ? range.missingCmDb : range.missingDmDb;
      expect(missing).toBeGreaterThanOrEqual(report.targetMarginDb - range.marginDb - 1e-9);
    }
  });
});
