import { describe, expect, it } from 'vitest';
import { targetValue } from '../../src/assist/design-edit/part-values.ts';
import { assistProblem } from '../../src/assist/margin/assist-problem.ts';
import { compileMarginEvaluator } from '../../src/assist/margin/margin-evaluator.ts';
import { mergeSplit, planSplit, prepareSplit, runSplitChunk } from '../../src/assist/pool/split-jobs.ts';
import { maximumYCapacitance } from '../../src/assist/sizing/leakage-limit.ts';
import { mapCellDesign, type MapResult, type MapSettings } from '../../src/assist/value-map/value-map.ts';
import type { Design, LimitMask } from '../../src/model/design.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { buildDesign, capacitor, element, inductor } from '../support/design-builders.ts';
import { demoDesign, demoScan } from './demo-fixture.ts';

function runMap(design: Design, noise: Parameters<typeof assistProblem>[1], settings: MapSettings): MapResult {
  const job = { kind: 'map' as const, design, noise, judging: {}, settings };
  const prepared = prepareSplit(job);
  const merged = mergeSplit(prepared, planSplit(prepared).map((range) => runSplitChunk(prepareSplit(job), range)));
  if (merged.kind !== 'map') throw new Error('not a map');
  return merged.result;
}

// The ideal LC section of the sizing test, 40 dB needed at 750 kHz between 100 Ω terminations.
const mask: LimitMask = { id: 'flat', name: 'flat', detector: 'peak', frequencyHz: [150e3, 30e6], levelDbuV: [50, 50] };
const lc: Design = {
  ...buildDesign({ elements: [element('series-line1', inductor(100e-6), 'L1'), element('series-line2', inductor(100e-6), 'L2'), element('line-to-line', capacitor(45e-9), 'CX')] }),
  emissions: { masks: [mask], targetMarginDb: 6, attribution: 'both', bands: [{ name: 'all', startHz: 150e3, stopHz: 30e6 }], baseline: { kind: 'none' } },
};
// Noise at 750 kHz, quiet points at the band's edges so that the scan covers it (a pass needs evidence).
const scan: Scan = { name: 'dm', tag: 'differential-mode', frequencyHz: Float64Array.of(150e3, 750e3, 30e6), traces: [{ detector: 'peak', levelDbuV: Float64Array.of(0, 84, 0) }], rejected: [], notes: [] };

/** Hand-solved insertion loss of the L-section (references.md §3 chain matrix) at 750 kHz, loop inductance 2L. */
function exactLossDb(lPerLine: number, c: number): number {
  const w = 2 * Math.PI * 750e3;
  const re = 100 * (1 - w * w * 2 * lPerLine * c) + 100;
  const im = w * 2 * lPerLine + w * c * 100 * 100;
  return 20 * Math.log10(Math.hypot(re, im) / 200);
}

describe('the two-value map', () => {
  const settings: MapSettings = {
    x: { target: { elementIds: ['CX'], quantity: 'capacitance' }, fromValue: 5e-9, toValue: 500e-9, steps: 24 },
    y: { target: { elementIds: ['L1', 'L2'], quantity: 'inductance' }, fromValue: 10e-6, toValue: 1e-3, steps: 20 },
  };
  const map = runMap(lc, { kind: 'scans', scans: [scan] }, settings);

  it('every cell is the hand-solved LC section’s margin (loss − 40 dB + 6 dB target)', () => {
    expect(map.worstMarginDb).toHaveLength(24 * 20);
    for (let iy = 0; iy < 20; iy += 1) {
      for (let ix = 0; ix < 24; ix += 1) {
        const expected = exactLossDb(map.yValues[iy]!, map.xValues[ix]!) - 40 + 6;
        expect(map.worstMarginDb[iy * 24 + ix]!).toBeCloseTo(expected, 6);
      }
    }
  });

  it('the pass outline (marching squares, d3-contour) follows the exact target curve', () => {
    expect(map.passOutline.length).toBeGreaterThan(0);
    let checked = 0;
    for (const polygon of map.passOutline) {
      const ring = polygon[0]!;
      for (let k = 0; k < ring.x.length; k += 1) {
        const x = ring.x[k]!;
        const y = ring.y[k]!;
        // Points on the map's edge close the region; inside, the outline sits on margin = target.
        const onEdge = x <= map.xValues[0]! * 1.0001 || x >= map.xValues[23]! * 0.9999 || y <= map.yValues[0]! * 1.0001 || y >= map.yValues[19]! * 0.9999;
        if (onEdge) continue;
        expect(Math.abs(exactLossDb(y, x) - 40)).toBeLessThan(1.5);
        checked += 1;
      }
    }
    expect(checked).toBeGreaterThan(10);
  });

  it('marks the current design and turns a cell into a design', () => {
    expect(map.current.x).toBe(45e-9);
    expect(map.current.y).toBe(100e-6);
    expect(map.current.marginDb).toBeCloseTo(exactLossDb(100e-6, 45e-9) - 34, 6);
    const cell = mapCellDesign(lc, settings, map.xValues[3]!, map.yValues[7]!)!;
    expect(targetValue(cell, settings.x.target)).toBe(map.xValues[3]);
    expect(targetValue(cell, { elementIds: ['L2'], quantity: 'inductance' })).toBeCloseTo(map.yValues[7]!, 18);
    const evaluator = compileMarginEvaluator(assistProblem(lc, { kind: 'scans', scans: [scan] }));
    expect(evaluator.evaluate(cell).worstMarginDb).toBeCloseTo(map.worstMarginDb[7 * 24 + 3]!, 9);
  });

  it('draws the leakage-current limit when an axis is the Y capacitance (references.md §9)', () => {
    const demo = demoDesign();
    const demoMap = runMap(demo, { kind: 'scans', scans: [demoScan()] }, {
      x: { target: { elementIds: ['LCM1'], quantity: 'inductance' }, fromValue: 0.5e-3, toValue: 10e-3, steps: 6 },
      y: { target: { elementIds: ['CY1', 'CY2'], quantity: 'capacitance' }, fromValue: 0.47e-9, toValue: 10e-9, steps: 5 },
      leakage: { leakageLimitA: 0.75e-3, lineVoltageV: 250, lineFrequencyHz: 50, tolerance: 0 },
    });
    expect(demoMap.leakageBoundary).toEqual({ axis: 'y', value: maximumYCapacitance(0.75e-3, 250, 50, 0) });
    expect(demoMap.leakageBoundary!.value * 1e9).toBeCloseTo(9.5493, 4);
  });
});
