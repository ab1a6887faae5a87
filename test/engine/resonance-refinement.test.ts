import { describe, expect, it } from 'vitest';
import { compileNetwork, evaluateNetworkOnce, logSpace, PointOrigin, powerRatioToDb, sweepDesign } from '../../src/engine/index.ts';
import { buildDesign, capacitor, element } from '../support/design-builders.ts';
import { designOf, differentialRealisation, seriesL, shuntC } from '../support/ladder.ts';

/*
 * Sharp features a plain grid misses (domain §4 pitfall 4: "a Q of 100 at 1 MHz has a 10 kHz
 * bandwidth, finer than a 100 points/decade grid … compute pole frequencies or refine
 * adaptively" — common practice). The expected values are closed forms.
 */

const PLAN = { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 10 } as const;

describe('a high-Q capacitor notch between the points of a 10 points/decade plan', () => {
  // 100 nF with 1 nH ESL: SRF 15.9155 MHz (references.md §6, C). ESR 0.1 mΩ gives
  // Q = √(L/C)/R = 0.1 Ω / 0.1 mΩ = 1000 (series RLC, closed form).
  const C = 100e-9;
  const ESL = 1e-9;
  const ESR = 1e-4;
  const srf = 1 / (2 * Math.PI * Math.sqrt(ESL * C));
  // Line to line in the DM 50/50 test: IL = 20·log|1 + (Rs∥RL)/Z|, and Z = ESR at the SRF.
  const depthAtSrfDb = 20 * Math.log10(1 + 25 / ESR);
  const design = buildDesign({ elements: [element('line-to-line', capacitor(C, { esr: ESR, esl: ESL }))], frequencyPlan: PLAN });

  it('closed form: Q = 1000 and the SRF falls well between two plan points', () => {
    expect(Math.sqrt(ESL / C) / ESR).toBeCloseTo(1000, 9);
    const grid = logSpace(PLAN.startHz, PLAN.stopHz, PLAN.pointsPerDecade);
    const nearest = Math.min(...Array.from(grid, (f) => Math.abs(Math.log10(f / srf))));
    expect(nearest).toBeGreaterThan(0.02); // > 4.7 % away, about 50 bandwidths of a Q of 1000
  });

  it('a plain logSpace evaluation misses the notch depth by tens of dB', () => {
    const grid = logSpace(PLAN.startHz, PLAN.stopHz, PLAN.pointsPerDecade);
    const response = evaluateNetworkOnce(compileNetwork(design), grid);
    const deepest = Math.max(...Array.from(response.resistiveDmLoss[0]!, powerRatioToDb));
    expect(depthAtSrfDb - deepest).toBeGreaterThan(30);
  });

  it('sweepDesign puts the SRF in the grid (tagged as not a base point) and its deepest point is the closed-form depth within 0.1 dB', () => {
    const result = sweepDesign(design);
    const index = result.frequencyHz.findIndex((f) => Math.abs(f / srf - 1) < 1e-9);
    expect(index).toBeGreaterThanOrEqual(0);
    expect([PointOrigin.ElementResonance, PointOrigin.ResponseExtremum]).toContain(result.pointOrigin[index]);
    expect(result.elements[0]!.views[0]!.selfResonances.map((r) => r.type)).toEqual(['series']);
    const column = result.columns.insertionLoss50Dm;
    const deepest = Math.max(...column);
    expect(Math.abs(deepest - depthAtSrfDb)).toBeLessThan(0.1);
    expect(Math.abs(column[index]! - depthAtSrfDb)).toBeLessThan(0.1);
    // Every base point is still there: refinement adds points, never moves them.
    const base = logSpace(PLAN.startHz, PLAN.stopHz, PLAN.pointsPerDecade);
    const kept = Array.from(base).filter((f) => result.frequencyHz.includes(f));
    expect(kept).toHaveLength(base.length);
  });
});

describe('a filter-level resonance: 10 µH / 100 nF L-C in the 0.1/100 Ω system (references.md §3: −19.1805 dB at f0, C)', () => {
  const ladder = [seriesL(10e-6), shuntC(100e-9)];
  const design = designOf(differentialRealisation(ladder), { frequencyPlan: PLAN });
  const result = sweepDesign(design);
  const f0 = 1 / (2 * Math.PI * Math.sqrt(10e-6 * 100e-9));

  /** Brute force: the gain peak on a dense grid (2 million points per decade over ±5 %). */
  function denseMinimum(): { frequencyHz: number; valueDb: number } {
    const grid = logSpace(f0 * 0.95, f0 * 1.05, 2e6);
    const response = evaluateNetworkOnce(compileNetwork(design), grid);
    let best = { frequencyHz: 0, valueDb: Infinity };
    response.resistiveDmLoss[1]!.forEach((ratio, i) => {
      const db = powerRatioToDb(ratio);
      if (db < best.valueDb) best = { frequencyHz: grid[i]!, valueDb: db };
    });
    return best;
  }

  it('the refined mark (kind "response", insertionLossLowHighDm, notch) matches a dense-grid minimum within 0.01 dB and 1e-4 in frequency', () => {
    const marks = result.resonances.filter((r) => r.kind === 'response' && r.column === 'insertionLossLowHighDm' && r.type === 'notch');
    expect(marks).toHaveLength(1);
    const mark = marks[0]!;
    if (mark.kind !== 'response') throw new Error('expected a response mark');
    const dense = denseMinimum();
    expect(Math.abs(mark.valueDb - dense.valueDb)).toBeLessThan(0.01);
    expect(Math.abs(mark.frequencyHz / dense.frequencyHz - 1)).toBeLessThan(1e-4);
    // And the peak lies near f0 with about the tabulated gain (closed form value at f0: −19.1805 dB).
    expect(Math.abs(mark.frequencyHz / f0 - 1)).toBeLessThan(0.01);
    expect(mark.valueDb).toBeLessThanOrEqual(-19.1805 + 0.001);
    // The refined point is in the grid, tagged, and the column there is the mark's value.
    const index = result.frequencyHz.indexOf(mark.frequencyHz);
    expect(index).toBeGreaterThanOrEqual(0);
    expect(result.pointOrigin[index]).toBe(PointOrigin.ResponseExtremum);
    expect(result.columns.insertionLossLowHighDm[index]).toBeCloseTo(mark.valueDb, 9);
  });

  it('without refinement the 10 points/decade grid reports a much shallower gain peak', () => {
    const coarse = sweepDesign(design, { refine: false });
    expect(coarse.resonances.filter((r) => r.kind === 'response')).toHaveLength(0);
    expect(Math.min(...coarse.columns.insertionLossLowHighDm)).toBeGreaterThan(denseMinimum().valueDb + 3);
  });
});
