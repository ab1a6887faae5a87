import { describe, expect, it } from 'vitest';
import { dampedPeakFrequency, dampedPeakImpedance, optimalDampingQ, optimalDampingResistance, sectionOf } from '../../src/assist/damping/optimal-damping.ts';
import { peakNear, suggestDamping } from '../../src/assist/damping/suggest-damping.ts';
import { assistProblem } from '../../src/assist/margin/assist-problem.ts';
import { findResonances } from '../../src/assist/resonance/resonances.ts';
import { runSteps } from '../../src/assist/run/steps.ts';
import { sweepDesign } from '../../src/engine/index.ts';
import type { Design } from '../../src/model/design.ts';
import { buildDesign, capacitor, element, inductor } from '../support/design-builders.ts';
import { demoDesign, demoScan } from './demo-fixture.ts';

// references.md §8: L = 100 µH, C = 10 µF (R0 = 3.16228 Ω, f0 = 5.03292 kHz), optimum R_f–C_b damping,
// Erickson & Maksimović, Fundamentals of Power Electronics 2nd ed., input filter design (closed forms;
// the table's values computed from them and confirmed there by brute force).
const L = 100e-6;
const C = 10e-6;
const { characteristicOhm: R0, resonanceHz: F0 } = sectionOf(L, C);

describe('optimal R–C_b damping: the closed forms (references.md §8 table, domain.md C9)', () => {
  it('R0 and f0 of the undamped section', () => {
    expect(R0).toBeCloseTo(3.16228, 5);
    expect(F0 / 1e3).toBeCloseTo(5.03292, 5);
  });

  it.each([
    [1, 1.44914, 4.58258, 7.74597],
    [2, 0.912871, 2.88675, 4.47214],
    [4, 0.612372, 1.93649, 2.73861],
    [10, 0.381725, 1.20712, 1.54919],
  ])('n = %d: Q_opt %f, R_opt %f Ω, peak %f Ω', (n, q, r, peak) => {
    expect(optimalDampingQ(n)).toBeCloseTo(q, 5);
    expect(optimalDampingResistance(R0, n)).toBeCloseTo(r, 4);
    expect(dampedPeakImpedance(R0, n)).toBeCloseTo(peak, 4);
  });

  it('C9 in units of R0: n = 1: 1.4491, 2.4495; n = 2: 0.9129, 1.4142; n = 4: 0.6124, 0.8660', () => {
    expect([1, 2, 4].map((n) => [optimalDampingQ(n), dampedPeakImpedance(1, n)].map((x) => Number(x.toFixed(4))))).toEqual([
      [1.4491, 2.4495],
      [0.9129, 1.4142],
      [0.6124, 0.866],
    ]);
    expect(dampedPeakFrequency(F0, 4) / 1e3).toBeCloseTo(2.90576, 4);
  });
});

/** The section as the converter sees it: C and the damping leg across the lines, L/2 in each line to a near-short supply. */
function dampedSection(n: number, resistance: number): Design {
  return buildDesign({
    elements: [
      element('line-to-line', capacitor(C), 'C'),
      element('line-to-line', { kind: 'damping-rc', resistance, capacitance: n * C }, 'RD'),
      element('series-line1', inductor(L / 2), 'L1'),
      element('series-line2', inductor(L / 2), 'L2'),
    ],
    receivers: { line1: { kind: 'resistive', resistance: 1e-7 }, line2: { kind: 'resistive', resistance: 1e-7 } },
    frequencyPlan: { startHz: 500, stopHz: 50e3, pointsPerDecade: 200 },
  });
}

function enginePeak(design: Design): { peakOhm: number; atHz: number } {
  const sweep = sweepDesign({ ...design, frequencyPlan: { startHz: 1e3, stopHz: 20e3, pointsPerDecade: 20000 } }, { refine: false });
  let at = 0;
  const z = sweep.columns.inputImpedanceDmOhm;
  for (let i = 1; i < z.length; i += 1) if (z[i]! > z[at]!) at = i;
  return { peakOhm: z[at]!, atHz: sweep.frequencyHz[at]! };
}

describe('the engine confirms the optimum by brute force', () => {
  it.each([1, 2, 4])('n = %d: the peak output impedance at R_opt is the closed form, and no other R gives a lower peak', (n) => {
    const rOpt = optimalDampingResistance(R0, n);
    const peak = enginePeak(dampedSection(n, rOpt));
    expect(peak.peakOhm / dampedPeakImpedance(R0, n)).toBeCloseTo(1, 4);
    expect(peak.atHz / dampedPeakFrequency(F0, n)).toBeCloseTo(1, 2);
    const factors = [0.7, 0.8, 0.9, 0.95, 1, 1.05, 1.1, 1.25, 1.4];
    const peaks = factors.map((factor) => enginePeak(dampedSection(n, rOpt * factor)).peakOhm);
    const best = peaks.indexOf(Math.min(...peaks));
    expect(factors[best]).toBe(1);
  });
});

describe('resonances and damping on the invented demo', () => {
  const design = demoDesign();
  const report = runSteps(findResonances(design));

  it('lists the part self-resonances and the DM filter resonance near the fourth harmonic', () => {
    expect(report.parts.some((p) => p.elementId === 'LCM1')).toBe(true);
    const dm = report.filter.filter((r) => r.mode === 'differential-mode');
    expect(dm.some((r) => r.frequencyHz > 200e3 && r.frequencyHz < 330e3)).toBe(true);
  });

  it('finds the parts behind each resonance from the sensitivity of its frequency, not from names', () => {
    expect(report.filter.length).toBeGreaterThan(2);
    for (const resonance of report.filter) {
      expect(resonance.responsible.length).toBeGreaterThan(0);
      // Any resonance of inductances with capacitances: ω² scales as 1/(L·C), so scaling every L and C by
      // (1 + ε) moves it by (1 + ε)^(−1): the sensitivities add up to −1 (Euler on a homogeneous function).
      const total = resonance.responsible.filter((s) => s.quantity !== 'resistance').reduce((sum, s) => sum + s.frequencySensitivity, 0);
      expect(total).toBeLessThan(-0.8);
      expect(total).toBeGreaterThan(-1.2);
    }
    // The fourth-harmonic trouble: the mains-side choke's leakage with the inlet capacitor CX3.
    const dm = report.filter.find((r) => r.mode === 'differential-mode' && r.frequencyHz > 200e3 && r.frequencyHz < 330e3)!;
    expect(dm.responsible.slice(0, 2).map((s) => `${s.elementId}.${s.quantity}`).sort()).toEqual(['CX3.capacitance', 'LCM2.leakage']);
  });

  it('damps the DM resonance with an R–C_b leg; the new variant keeps the 6 dB margin on the demo scan', () => {
    const problem = assistProblem(design, { kind: 'scans', scans: [demoScan()] });
    const damped = runSteps(suggestDamping(design, { ratio: 2 }, problem));
    const suggestion = damped.suggestion!;
    expect(suggestion.leg).toBe('parallel-rc');
    expect(suggestion.resistanceOhm).toBeCloseTo(suggestion.characteristicOhm * optimalDampingQ(2), 12);
    expect(suggestion.besideElementId).toBe('CX3');
    expect(suggestion.dipAfterDb).toBeGreaterThan(suggestion.dipBeforeDb);
    expect(suggestion.marginBeforeDb!).toBeLessThan(6);
    expect(suggestion.marginAfterDb!).toBeGreaterThan(6);
    expect(suggestion.design.stages.flatMap((s) => s.elements.map((e) => e.id))).toContain(suggestion.addedElementIds[0]);
    expect(peakNear(suggestion.design, suggestion.resonance.frequencyHz)).toBeCloseTo(suggestion.peakAfterOhm, 9);
  });

  it('a series R–L leg is sized by the engine when asked', () => {
    const damped = runSteps(suggestDamping(design, { leg: 'series-rl', ratio: 1, resonanceHz: 280e3 }));
    const suggestion = damped.suggestion!;
    expect(suggestion.addedElementIds).toHaveLength(2);
    expect(suggestion.besideElementId).toBe('LCM2');
    expect(suggestion.dipAfterDb).toBeGreaterThan(suggestion.dipBeforeDb);
  });
});
