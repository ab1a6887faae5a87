import { describe, expect, it } from 'vitest';
import { assistProblem } from '../../src/assist/margin/assist-problem.ts';
import { runSteps } from '../../src/assist/run/steps.ts';
import { preferredAtOrAbove, snapDown, snapUp } from '../../src/assist/sizing/preferred-values.ts';
import { capacitanceForCorner, ruleCorner } from '../../src/assist/sizing/second-order-rule.ts';
import { sizePart } from '../../src/assist/sizing/size-part.ts';
import type { Design, LimitMask } from '../../src/model/design.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { buildDesign, capacitor, element, inductor } from '../support/design-builders.ts';
import { demoDesign, demoScan } from './demo-fixture.ts';

describe('preferred values (IEC 60063 E series)', () => {
  it('snaps up and down to the published mantissas', () => {
    expect(snapUp(2.3e-3, 'E12')).toBeCloseTo(2.7e-3, 15);
    expect(snapUp(2.3e-3, 'E6')).toBeCloseTo(3.3e-3, 15);
    expect(snapUp(2.3e-3, 'E24')).toBeCloseTo(2.4e-3, 15);
    expect(snapUp(9.2e-9, 'E24')).toBeCloseTo(10e-9, 20);
    expect(snapDown(2.9e-6, 'E24')).toBeCloseTo(2.7e-6, 18);
    // E24 has 2.7, 3.0 and 3.3 (not the rounded geometric 2.9, 3.2): the published list.
    expect(preferredAtOrAbove(2.65, 'E24', 3)).toEqual([2.7, 3.0, 3.3]);
  });

  it('a value that is already preferred (up to rounding) stays', () => {
    expect(snapUp(4.7e-6, 'E6')).toBe(4.7e-6);
    expect(snapUp(0.1 + 0.2, 'E24')).toBe(3e-1);
    expect(snapUp(100e-9, 'E12')).toBe(1e-7);
  });
});

describe('the second-order rule f_c = f·10^(−A/40)', () => {
  it('40 dB at 750 kHz asks for a 75 kHz corner (domain.md C1, from a published engineering design notebook)', () => {
    expect(ruleCorner([{ frequencyHz: 750e3, attenuationDb: 40 }])!.cornerHz).toBeCloseTo(75e3, 6);
  });

  it('the most demanding point sets it (domain.md C24: synthetic, second-order rule)', () => {
    const corner = ruleCorner([
      { frequencyHz: 150e3, attenuationDb: 30 },
      { frequencyHz: 300e3, attenuationDb: 42 },
      { frequencyHz: 1e6, attenuationDb: 50 },
      { frequencyHz: 10e6, attenuationDb: 40 },
    ])!;
    expect(corner.cornerHz / 1e3).toBeCloseTo(26.67, 2);
    expect(corner.setBy.frequencyHz).toBe(150e3);
  });
});

/**
 * An ideal single LC section in the differential-mode loop: inductors L in each line (the loop sees
 * 2L), then C across the lines, between 100 Ω line-to-line source and load (two 50 Ω receivers). A
 * differential-mode scan at 750 kHz needs 40 dB with the 6 dB target.
 */
const L = 100e-6;
const F = 750e3;
const TARGET = 6;
const A = 40;
const LIMIT = 50;
const mask: LimitMask = { id: 'flat', name: 'flat test limit', detector: 'peak', frequencyHz: [150e3, 30e6], levelDbuV: [LIMIT, LIMIT] };
function lcProblemDesign(extra: { esl?: number } = {}): Design {
  const base = buildDesign({
    elements: [element('series-line1', inductor(L), 'L1'), element('series-line2', inductor(L), 'L2'), element('line-to-line', capacitor(22e-9, extra), 'CX')],
    differentialModeSource: { kind: 'resistor', resistance: 100 },
  });
  return { ...base, emissions: { masks: [mask], targetMarginDb: TARGET, attribution: 'both', bands: [{ name: 'all', startHz: 150e3, stopHz: 30e6 }], baseline: { kind: 'none' } } };
}
/** Noise at one frequency, and quiet points at the band's edges so that the scan covers the band (a pass needs evidence). */
function dmScan(frequencyHz: number, levelDbuV: number): Scan {
  return { name: 'test', tag: 'differential-mode', frequencyHz: Float64Array.of(150e3, frequencyHz, 30e6), traces: [{ detector: 'peak', levelDbuV: Float64Array.of(0, levelDbuV, 0) }], rejected: [], notes: [] };
}

/**
 * Hand-solved: with the chain matrix [[1 − ω²·2L·C, jω·2L], [jωC, 1]] between R_s and R_L, the
 * insertion loss is |(A·R_L + B + C·R_s·R_L + D·R_s)/(R_s + R_L)| (references.md §3, standard network
 * theory). Setting it to 10^(A/20) is a quadratic in C: (a − b·C)² + (c + d·C)² = G².
 */
function exactCapacitance(rs: number, rl: number, attenuationDb: number): number {
  const w = 2 * Math.PI * F;
  const a = rl + rs;
  const b = rl * w * w * 2 * L;
  const c = w * 2 * L;
  const d = w * rs * rl;
  const g = 10 ** (attenuationDb / 20) * (rs + rl);
  const qa = b * b + d * d;
  const qb = 2 * (c * d - a * b);
  const qc = a * a + c * c - g * g;
  return (-qb + Math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa);
}

describe('smallest X capacitance of an ideal LC section', () => {
  const design = lcProblemDesign();
  const problem = assistProblem(design, { kind: 'scans', scans: [dmScan(F, LIMIT - TARGET + A)] });
  const result = runSteps(sizePart(problem, { elementIds: ['CX'], quantity: 'capacitance' }, { series: 'E12' }));

  it('agrees with the hand-solved exact value (bisection to 0.1 %)', () => {
    const exact = exactCapacitance(100, 100, A);
    expect(result.answer).toBeDefined();
    expect(result.answer!.value / exact).toBeGreaterThan(1);
    expect(result.answer!.value / exact).toBeLessThan(1.0011);
    expect(result.answer!.marginDb).toBeGreaterThanOrEqual(TARGET);
  });

  it('agrees with the second-order rule within the equal-termination offset (≈6 dB: about twice the rule’s C)', () => {
    const rule = capacitanceForCorner(ruleCorner([{ frequencyHz: F, attenuationDb: A }])!.cornerHz, 2 * L);
    // 6.02 dB below the asymptote 40·log(f/f_c) means (f/f_c)² twice as large: C twice the rule's.
    expect(result.answer!.value / rule).toBeGreaterThan(1.9);
    expect(result.answer!.value / rule).toBeLessThan(2.1);
  });

  it('snaps up to E12 and checks the snapped value with the engine; the curve is for a plot', () => {
    expect(result.preferred!.value).toBeCloseTo(snapUp(result.answer!.value, 'E12'), 20);
    expect(result.preferred!.marginDb).toBeGreaterThanOrEqual(TARGET);
    expect(result.curve.value.length).toBeGreaterThan(17);
    expect(result.curve.value[0]).toBeCloseTo(22e-9 / 100, 20);
    for (let k = 1; k < result.curve.value.length; k += 1) expect(result.curve.value[k]!).toBeGreaterThan(result.curve.value[k - 1]!);
    expect(Array.from(result.curve.value)).toContain(result.answer!.value);
    // Margin rises with C on an ideal section: the curve crosses the target once.
    expect(result.passingRanges).toHaveLength(1);
  });
});

describe('when no value can meet the margin', () => {
  it('names the capacitor whose ESL self-resonance caps the attenuation above it', () => {
    // 130 dB asked for at 10 MHz; the X capacitor's 20 nH makes it an inductor above 7.6 MHz, so the
    // L-section becomes an inductive divider that gains only 20 dB per decade of L (about 100 dB at 1 mH).
    const design = lcProblemDesign({ esl: 20e-9 });
    const problem = assistProblem(design, { kind: 'scans', scans: [dmScan(10e6, LIMIT - TARGET + 130)] });
    const result = runSteps(sizePart(problem, { elementIds: ['L1', 'L2'], quantity: 'inductance' }, { rangeFactor: 10 }));
    expect(result.answer).toBeUndefined();
    expect(result.noSolution!.cause).toBe('self-resonance');
    expect(result.noSolution!.responsible!.elementId).toBe('CX');
    expect(result.noSolution!.responsible!.parasitic).toBe('esl');
    // Its series resonance, 1/(2π√(ESL·C)) for 22 nF with 20 nH = 7.587 MHz (references.md §6 formula).
    expect(result.noSolution!.responsible!.selfResonanceHz! / 1e6).toBeCloseTo(1 / (2 * Math.PI * Math.sqrt(20e-9 * 22e-9)) / 1e6, 2);
    expect(result.noSolution!.summary).toMatch(/self-resonance of CX/u);
  });

  it('on the demo, no CM choke inductance fixes the differential-mode resonance at 262 kHz', () => {
    const problem = assistProblem(demoDesign(), { kind: 'scans', scans: [demoScan()] });
    const result = runSteps(sizePart(problem, { elementIds: ['LCM1'], quantity: 'inductance' }, { scaling: { windingCapacitance: 'keep', leakage: 'fixed-value' } }));
    expect(result.answer).toBeUndefined();
    expect(result.noSolution!.worstFrequencyHz).toBe(262e3);
    expect(result.noSolution!.cause).toBe('insensitive');
  });
});
