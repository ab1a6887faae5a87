import { describe, expect, it } from 'vitest';
import { assistProblem } from '../../src/assist/margin/assist-problem.ts';
import { runSteps } from '../../src/assist/run/steps.ts';
import { sizePart } from '../../src/assist/sizing/size-part.ts';
import { drawSample, sampleSeed, variedParts } from '../../src/assist/tolerance/tolerance-model.ts';
import { chunkRanges, mergeYield, prepareYield, runYieldChunk, yieldInProcess } from '../../src/assist/tolerance/yield-run.ts';
import type { Design, LimitMask } from '../../src/model/design.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { buildDesign, capacitor, element, inductor } from '../support/design-builders.ts';
import { demoDesign, demoScan } from './demo-fixture.ts';

const mask: LimitMask = { id: 'flat', name: 'flat test limit', detector: 'peak', frequencyHz: [150e3, 30e6], levelDbuV: [50, 50] };
/** The ideal LC section of the sizing test (100 µH per line, X capacitor, 100 Ω terminations), 40 dB needed at 750 kHz. */
function lcDesign(capacitance: number, tolerance?: Design['stages'][number]['elements'][number]['tolerance']): Design {
  const base = buildDesign({
    elements: [element('series-line1', inductor(100e-6), 'L1'), element('series-line2', inductor(100e-6), 'L2'), element('line-to-line', capacitor(capacitance), 'CX')],
  });
  const stages = base.stages.map((stage) => ({ ...stage, elements: stage.elements.map((e) => (e.id === 'CX' && tolerance ? { ...e, tolerance } : e)) }));
  return { ...base, stages, emissions: { masks: [mask], targetMarginDb: 6, attribution: 'both', bands: [{ name: 'all', startHz: 150e3, stopHz: 30e6 }], baseline: { kind: 'none' } } };
}
// Noise at 750 kHz, quiet points at the band's edges so that the scan covers it (a pass needs evidence).
const scan: Scan = { name: 'dm', tag: 'differential-mode', frequencyHz: Float64Array.of(150e3, 750e3, 30e6), traces: [{ detector: 'peak', levelDbuV: Float64Array.of(0, 84, 0) }], rejected: [], notes: [] };

describe('tolerance yield', () => {
  it('zero tolerance gives zero spread: every sample is the nominal design', () => {
    const problem = assistProblem(demoDesign(), { kind: 'scans', scans: [demoScan()] });
    const result = runSteps(yieldInProcess(problem, { samples: 40, useDefaults: false }));
    expect(result.statistics.spreadDb).toBe(0);
    for (const m of result.worstMarginDb) expect(m).toBe(result.nominalMarginDb);
    expect(result.parts).toEqual([]);
    expect(result.yieldFraction).toBe(0);
  });

  it('a seeded run is the same however it is split into chunks and in whatever order they finish', () => {
    const problem = assistProblem(demoDesign(), { kind: 'estimate' });
    const context = prepareYield(problem, { samples: 60, seed: 42 });
    const one = mergeYield(context, [runYieldChunk(context, 0, 60)]);
    const split = chunkRanges(60, 7).reverse().map((r) => runYieldChunk(prepareYield(problem, { samples: 60, seed: 42 }), r.start, r.count));
    const many = mergeYield(context, split);
    expect(Array.from(many.worstMarginDb)).toEqual(Array.from(one.worstMarginDb));
    expect(Array.from(many.curve.marginP5Db)).toEqual(Array.from(one.curve.marginP5Db));
    expect(many.yieldFraction).toBe(one.yieldFraction);
    // A different seed draws different units.
    const other = mergeYield(prepareYield(problem, { samples: 60, seed: 43 }), [runYieldChunk(prepareYield(problem, { samples: 60, seed: 43 }), 0, 60)]);
    expect(Array.from(other.worstMarginDb)).not.toEqual(Array.from(one.worstMarginDb));
  });

  it('samples come from (seed, index) alone, and the default tolerances by kind apply', () => {
    const design = demoDesign();
    const parts = variedParts(design);
    expect(parts.find((p) => p.elementId === 'CX1')!.tolerance.percent).toBe(10);
    expect(parts.find((p) => p.elementId === 'LCM1')!.tolerance.percent).toBe(30);
    const a = new Float64Array(parts.length);
    const b = new Float64Array(parts.length);
    drawSample(parts, 9, 123, a);
    drawSample(parts, 9, 123, b);
    expect(Array.from(a)).toEqual(Array.from(b));
    for (let p = 0; p < parts.length; p += 1) expect(Math.abs(a[p]! - 1)).toBeLessThanOrEqual(parts[p]!.tolerance.percent / 100 + 1e-12);
    expect(sampleSeed(9, 123)).not.toBe(sampleSeed(9, 124));
  });

  it('one part whose band straddles the pass threshold: the yield matches the analytic expectation (uniform)', () => {
    // The smallest passing X capacitance (the sizing assistant's answer, hand-checked in sizing.test.ts), C*.
    const threshold = runSteps(sizePart(assistProblem(lcDesign(45e-9), { kind: 'scans', scans: [scan] }), { elementIds: ['CX'], quantity: 'capacitance' })).answer!.value;
    const nominal = threshold * 1.05;
    const problem = assistProblem(lcDesign(nominal, { percent: 20, distribution: 'uniform' }), { kind: 'scans', scans: [scan] });
    const result = runSteps(yieldInProcess(problem, { samples: 2000, seed: 7, useDefaults: false }));
    // P(C ≥ C*) for C uniform on nominal·[0.8, 1.2].
    const expected = (nominal * 1.2 - threshold) / (nominal * 0.4);
    const sigma = Math.sqrt((expected * (1 - expected)) / 2000);
    expect(Math.abs(result.yieldFraction - expected)).toBeLessThan(4 * sigma);
    expect(result.parts[0]!.elementId).toBe('CX');
    expect(result.parts[0]!.correlation).toBeGreaterThan(0.9);
  });

  it('the same with a normal spread (±20 % as 3σ, cut at the band)', () => {
    const threshold = runSteps(sizePart(assistProblem(lcDesign(45e-9), { kind: 'scans', scans: [scan] }), { elementIds: ['CX'], quantity: 'capacitance' })).answer!.value;
    const nominal = threshold * 1.05;
    const problem = assistProblem(lcDesign(nominal, { percent: 20, distribution: 'normal' }), { kind: 'scans', scans: [scan] });
    const result = runSteps(yieldInProcess(problem, { samples: 2000, seed: 11, useDefaults: false }));
    // z* = (C*/C_nominal − 1)/σ with σ = 0.2/3; truncated normal on ±3.
    const phi = (x: number): number => 0.5 * (1 + erf(x / Math.SQRT2));
    const z = (threshold / nominal - 1) / (0.2 / 3);
    const expected = (phi(3) - phi(z)) / (phi(3) - phi(-3));
    const sigma = Math.sqrt((expected * (1 - expected)) / 2000);
    expect(Math.abs(result.yieldFraction - expected)).toBeLessThan(4 * sigma);
  });

  it('gives a histogram over all samples and a 5th-percentile curve below the nominal one', () => {
    const problem = assistProblem(demoDesign(), { kind: 'scans', scans: [demoScan()] });
    const result = runSteps(yieldInProcess(problem, { samples: 100 }));
    expect(result.histogram.counts.reduce((a, b) => a + b, 0)).toBe(100);
    const { nominalMarginDb, marginP5Db } = result.curve;
    let below = 0;
    for (let b = 0; b < marginP5Db.length; b += 1) if (marginP5Db[b]! <= nominalMarginDb[b]! + 1e-6) below += 1;
    expect(below / marginP5Db.length).toBeGreaterThan(0.9);
    expect(result.parts.length).toBeGreaterThan(3);
  });
});

/** Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7): enough for a yield tolerance of 4σ ≈ 0.04. */
function erf(x: number): number {
  const t = 1 / (1 + 0.3275911 * Math.abs(x));
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-x * x);
  return x >= 0 ? y : -y;
}
