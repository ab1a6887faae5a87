import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { emissionsPlot, levelRange } from '../../src/drawing/plots/emissions-plot.ts';
import { insertionLossPlot, insertionLossRange } from '../../src/drawing/plots/insertion-loss-plot.ts';
import { partImpedancePlot } from '../../src/drawing/plots/part-impedance-plot.ts';
import { requiredAttenuationPlot } from '../../src/drawing/plots/required-attenuation-plot.ts';
import type { PlotSpec } from '../../src/drawing/plot-spec.ts';
import { sweepDesign } from '../../src/engine/index.ts';
import { readScanText } from '../../src/io/scan-csv.ts';
import type { DesignInput } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';

/**
 * The plot builders pick, label and style what the engine and the analysis computed; they must not
 * change a number. Each check compares a drawn column with the result it came from.
 */

const demoInput = JSON.parse(readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8')) as DesignInput;
const demo = requireDesign(demoInput);
const sweep = sweepDesign(demo);
const read = readScanText(readFileSync(new URL('../../fixtures/scans/invented-adapter-no-filter.csv', import.meta.url), 'utf8'), { tag: 'line1' });
if (!read.ok) throw new Error(read.error.message);
const analysis = analyzeEmissions(demo, { kind: 'scan', scan: read.scan });

const series = (spec: PlotSpec, id: string) => {
  const found = spec.series.find((s) => s.id === id);
  if (!found) throw new Error(`no series ${id} in ${spec.series.map((s) => s.id).join(', ')}`);
  return found;
};

/** Every drawn value sits below the top of the range; with `bottomToo`, above its bottom as well. */
function visibleWithin(spec: PlotSpec, bottomToo: boolean): void {
  let low = Infinity;
  let high = -Infinity;
  for (const s of spec.series) {
    if (s.hidden) continue;
    for (const value of s.values) {
      if (!Number.isFinite(value)) continue;
      low = Math.min(low, value);
      high = Math.max(high, value);
    }
  }
  expect(high).toBeLessThanOrEqual(spec.y.max!);
  if (bottomToo) expect(low).toBeGreaterThanOrEqual(spec.y.min!);
}

describe('insertion loss', () => {
  const spec = insertionLossPlot(sweep);

  it('draws the engine columns themselves, in circuit solid and 50 Ω dashed', () => {
    expect(series(spec, 'in-circuit-cm').values).toBe(sweep.columns.insertionLossInCircuitCm);
    expect(series(spec, 'fifty-dm').values).toBe(sweep.columns.insertionLoss50Dm);
    expect(series(spec, 'in-circuit-cm').style.dash).toBe('solid');
    expect(series(spec, 'fifty-cm').style.dash).toBe('dash');
  });

  it('the worst-case band spans exactly the two approximate worst-case tests at every point', () => {
    for (const [band, a, b] of [
      ['worst-case-cm', sweep.columns.insertionLossLowHighCm, sweep.columns.insertionLossHighLowCm],
      ['worst-case-dm', sweep.columns.insertionLossLowHighDm, sweep.columns.insertionLossHighLowDm],
    ] as const) {
      const found = spec.bands.find((x) => x.id === band)!;
      for (let i = 0; i < sweep.frequencyHz.length; i += 7) {
        expect(found.lower[i]).toBe(Math.min(a[i]!, b[i]!));
        expect(found.upper[i]).toBe(Math.max(a[i]!, b[i]!));
      }
    }
  });

  it('a symmetric filter shows no conversion curve and says so; an imbalanced one shows it as a loss', () => {
    expect(spec.series.some((s) => s.id.startsWith('conversion'))).toBe(false);
    expect(spec.notes.join(' ')).toMatch(/symmetric/u);
    const imbalanced = structuredClone(demoInput);
    imbalanced.stages[0]!.elements = imbalanced.stages[0]!.elements.filter((e) => e.id !== 'CY2');
    const tilted = sweepDesign(requireDesign(imbalanced));
    const conversion = series(insertionLossPlot(tilted), 'conversion-cm-dm');
    expect(conversion.values[100]).toBe(-tilted.columns.conversionCmToDm[100]!);
  });

  it('marks every element self-resonance the engine found', () => {
    const srfs = sweep.resonances.filter((r) => r.kind === 'element').map((r) => r.frequencyHz);
    const marked = spec.markers.filter((m) => m.shape === 'triangle-down').map((m) => m.frequencyHz);
    expect(marked.sort()).toEqual([...srfs].sort());
    expect(srfs.length).toBeGreaterThan(3);
  });

  it('overlaid variants get their own dash and keep their own numbers', () => {
    const other = sweepDesign(requireDesign({ ...demoInput, stages: demoInput.stages.slice(0, 1) }));
    const overlaid = insertionLossPlot(sweep, { overlays: [{ variantId: 'v2', name: 'one stage', result: other }] });
    const curve = series(overlaid, 'v2:in-circuit-dm');
    expect(curve.values).toBe(other.columns.insertionLossInCircuitDm);
    expect(curve.style.dash).not.toBe('solid');
    expect(curve.label).toContain('one stage');
  });

  it('the y range reaches below 0 dB and holds every drawn value (CISPR 17 worst cases can go negative)', () => {
    expect(insertionLossRange(3, 40)).toEqual([-10, 50]);
    expect(insertionLossRange(-19.2, 60)).toEqual([-30, 70]);
    visibleWithin(spec, true);
  });

  it('a legend-hidden curve stays in the spec, marked hidden', () => {
    expect(series(insertionLossPlot(sweep, { hidden: new Set(['fifty-cm']) }), 'fifty-cm').hidden).toBe(true);
  });
});

describe('emissions', () => {
  const spec = emissionsPlot(analysis, { baselineFitted: false, noiseFloorDbuV: 20 });

  it('draws the scan, the prediction and each limit as the analysis evaluated them', () => {
    const qp = analysis.predicted.find((p) => p.detector === 'quasi-peak')!;
    expect(series(spec, 'predicted-quasi-peak').values).toBe(qp.levelDbuV);
    for (const comparison of analysis.report.comparisons) expect(series(spec, `limit-${comparison.maskId}`).values).toBe(comparison.limitDbuV);
    expect(spec.series.some((s) => s.id === 'unfiltered-cm')).toBe(false);
  });

  it('shades the failing ranges (the demo fails near 260 kHz) and rings the worst margin', () => {
    expect(spec.regions.length).toBeGreaterThan(0);
    for (const region of spec.regions) {
      expect(region.startHz).toBeGreaterThan(250e3);
      expect(region.stopHz).toBeLessThan(270e3);
    }
    expect(spec.markers[0]!.frequencyHz).toBe(analysis.report.worst!.frequencyHz);
    expect(spec.levels[0]!.value).toBe(20);
  });

  it('the level range has room above the highest value and shows at most 110 dB below the top', () => {
    expect(levelRange(30, 75)).toEqual([20, 90]);
    expect(levelRange(-60, 75)).toEqual([-20, 90]);
    visibleWithin(spec, false);
  });
});

describe('attenuation needed and given', () => {
  it('draws the needed attenuation per mode over the in-circuit insertion loss', () => {
    const spec = requiredAttenuationPlot(analysis, sweep)!;
    expect(spec).toBeDefined();
    expect(series(spec, 'given-dm').values).toBe(sweep.columns.insertionLossInCircuitDm);
    const needed = spec.series.filter((s) => s.id.startsWith('needed'));
    expect(needed.length).toBeGreaterThan(0);
    expect(needed[0]!.values).toBe(analysis.requiredAttenuationCmDb ?? analysis.requiredAttenuationDmDb);
  });
});

describe('part impedance', () => {
  it('one |Z| curve per part (two for a choke), the engine’s own, each self-resonance marked', () => {
    const spec = partImpedancePlot(sweep, { selectedId: 'LCM1' });
    const choke = sweep.elements.find((e) => e.id === 'LCM1')!;
    expect(series(spec, 'LCM1:common-mode').values).toBe(choke.views[0]!.magnitudeOhm);
    expect(series(spec, 'LCM1:common-mode').style.width).toBeGreaterThan(series(spec, 'CX1:impedance').style.width);
    const srfCount = sweep.elements.reduce((n, e) => n + e.views.reduce((m, v) => m + v.selfResonances.length, 0), 0);
    expect(spec.markers).toHaveLength(srfCount);
    expect(spec.y.scale).toBe('log');
    expect(partImpedancePlot(sweep, { only: ['CX1'] }).series.map((s) => s.id)).toEqual(['CX1:impedance']);
  });
});
