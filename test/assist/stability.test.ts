import { describe, expect, it } from 'vitest';
import { dampedPeakFrequency, optimalDampingResistance, sectionOf } from '../../src/assist/damping/optimal-damping.ts';
import { runSteps } from '../../src/assist/run/steps.ts';
import { converterStability, negativeInputResistance } from '../../src/assist/stability/stability.ts';
import type { Design } from '../../src/model/design.ts';
import { buildDesign, capacitor, element, inductor } from '../support/design-builders.ts';
import { demoDesign } from './demo-fixture.ts';

describe('the converter’s negative input resistance −V²/P (references.md §8, computed)', () => {
  it.each([
    [24, 100, -5.76],
    [12, 100, -1.44],
    [48, 200, -11.52],
    [400, 1000, -160],
    [12, 24, -6], // domain.md C22
  ])('%d V, %d W: %f Ω', (v, p, r) => {
    expect(negativeInputResistance(v, p)).toBeCloseTo(r, 9);
  });
});

// The n = 4 optimally damped section of references.md §8 (L = 100 µH, C = 10 µF, C_b = 40 µF, R_f = 1.93649 Ω;
// Erickson & Maksimović's closed forms) behind a 24 V, 100 W converter.
function dampedSection(extra: Partial<Design['operating']> = {}): Design {
  const L = 100e-6;
  const C = 10e-6;
  const base = buildDesign({
    elements: [
      element('line-to-line', capacitor(C), 'C'),
      element('line-to-line', { kind: 'damping-rc', resistance: optimalDampingResistance(sectionOf(L, C).characteristicOhm, 4), capacitance: 4 * C }, 'RD'),
      element('series-line1', inductor(L / 2), 'L1'),
      element('series-line2', inductor(L / 2), 'L2'),
    ],
    receivers: { line1: { kind: 'resistive', resistance: 1e-7 }, line2: { kind: 'resistive', resistance: 1e-7 } },
    frequencyPlan: { startHz: 100, stopHz: 1e6, pointsPerDecade: 100 },
  });
  return { ...base, operating: { converter: { lowestInputVoltage: 24, highestInputPower: 100 }, ...extra } };
}

describe('Middlebrook’s criterion on the n = 4 damped section', () => {
  it('closest approach 6.458 dB (20·log(5.76/2.73861)) at 2.906 kHz: passes a 6 dB margin', () => {
    const result = runSteps(converterStability(dampedSection()));
    expect(result.negativeResistanceOhm).toBeCloseTo(-5.76, 9);
    expect(result.closest.marginDb).toBeCloseTo(6.458, 3);
    expect(result.closest.outputImpedanceOhm).toBeCloseTo(2.73861, 4);
    expect(result.closest.frequencyHz / dampedPeakFrequency(sectionOf(100e-6, 10e-6).resonanceHz, 4)).toBeCloseTo(1, 2);
    expect(result.pass).toBe(true);
    expect(result.flagged).toEqual([]);
  });

  it('fails a 7 dB margin and flags the range around the peak', () => {
    const result = runSteps(converterStability(dampedSection(), { requiredMarginDb: 7 }));
    expect(result.pass).toBe(false);
    expect(result.flagged).toHaveLength(1);
    expect(result.flagged[0]!.startHz).toBeLessThan(2906);
    expect(result.flagged[0]!.stopHz).toBeGreaterThan(2906);
    expect(result.flagged[0]!.worstMarginDb).toBeGreaterThanOrEqual(result.closest.marginDb - 1e-9);
  });

  it('refuses to judge without converter data (no evidence, no pass)', () => {
    expect(() => runSteps(converterStability(demoDesign()))).toThrow(/operating\.converter/u);
  });
});
