// @vitest-environment node
// The chart's option builders are pure: they run in plain Node, with no DOM and no canvas.
import type uPlot from 'uplot';
import { describe, expect, it } from 'vitest';
import {
  ATTRIBUTION_NOTES,
  binsFor,
  buildEmissionsPlot,
  buildRequiredAttenuationPlot,
  emissionsChartModel,
  emissionsChartSize,
  emissionsPlotData,
  levelRange,
  LIMIT_COLOURS,
  mergeRanges,
  requiredAttenuationModel,
  sameValues,
} from '../../../src/ui/charts/emissions-options.ts';
import { logTickLabels } from '../../../src/ui/charts/log-frequency-axis.ts';
import { logSplits } from '../../../src/drawing/frequency-ticks.ts';
import { analyse, emissionsDesignDocument, scanNoise, syntheticScan } from '../support/emissions-fixtures.ts';

const noPlot = {} as uPlot;
const context = { baselineFitted: false, noiseFloorDbuV: 20 };
const document = emissionsDesignDocument();
const scan = syntheticScan();
const scanAnalysis = analyse(document, scanNoise(scan));
const estimateAnalysis = analyse(document, { kind: 'estimate' });

describe('emissionsChartModel, from a scan', () => {
  const model = emissionsChartModel(scanAnalysis, context);

  it('draws the scan as measured, the prediction per detector and each limit, in that order', () => {
    expect(model.series.map((s) => s.label)).toEqual([
      'scan as measured, peak',
      'scan as measured, QP',
      'scan as measured, AV',
      'line 1, predicted, peak',
      'line 1, predicted, QP',
      'line 1, predicted, AV',
      'limit: FCC Part 15 class B, quasi-peak',
      'limit: FCC Part 15 class B, average',
    ]);
    expect(model.series.map((s) => s.kind)).toEqual(['scan', 'scan', 'scan', 'predicted', 'predicted', 'predicted', 'limit', 'limit']);
    expect(model.series.every((s) => s.style === 'line')).toBe(true);
    // Straight from the worker's columns, not copies.
    expect(model.series[0]?.values).toBe(scanAnalysis.scanPrediction?.traces[0]?.scanDbuV);
    expect(model.series[4]?.values).toBe(scanAnalysis.predicted[1]?.levelDbuV);
    expect(model.frequencyHz).toBe(scanAnalysis.frequencyHz);
  });

  it('takes the limit lines from the analysis’ own comparisons (limitOnGrid as judged), min-held when thinned', () => {
    const qp = model.series.find((s) => s.id === 'limit-fcc-15.107-class-b-qp');
    const comparison = scanAnalysis.report.comparisons.find((c) => c.maskId === 'fcc-15.107-class-b-qp');
    expect(qp?.values).toBe(comparison?.limitDbuV);
    expect(qp?.reduce).toBe('min');
    expect(qp?.stroke).toBe(LIMIT_COLOURS[0]);
    expect(model.series.find((s) => s.id === 'limit-fcc-15.107-class-b-av')?.dash.length).toBeGreaterThan(0);
    expect(qp?.dash).toEqual([]);
  });

  it('keeps the step of a limit when thinned: 56 dBµV up to 5 MHz, 60 dBµV after, nothing between', () => {
    const data = emissionsPlotData(model, [4e6, 6e6], 40);
    const x = data[0] as number[];
    const qpIndex = model.series.findIndex((s) => s.id === 'limit-fcc-15.107-class-b-qp') + 1;
    const limit = data[qpIndex] as (number | null)[];
    x.forEach((f, i) => {
      if (f > 4e6 && f <= 5e6) expect(limit[i]).toBe(56);
      if (f > 5e6 && f < 6e6) expect(limit[i]).toBe(60);
    });
  });

  it('does not draw the level with no filter twice when the scan was taken without a filter', () => {
    expect(model.series.some((s) => s.kind === 'unfiltered')).toBe(false);
    const withBaseline = emissionsChartModel(scanAnalysis, { ...context, baselineFitted: true });
    expect(withBaseline.series.filter((s) => s.kind === 'unfiltered').map((s) => s.label)).toEqual(['no filter, CM', 'no filter, DM']);
  });

  it('shades where the margin is short of the target, ranges merged', () => {
    expect(model.belowTarget.length).toBeGreaterThan(0);
    expect(model.belowTarget.length).toBeLessThanOrEqual(scanAnalysis.report.failingRanges.length);
    for (const range of scanAnalysis.report.failingRanges) {
      expect(model.belowTarget.some((shade) => shade.startHz <= range.startHz && shade.stopHz >= range.stopHz)).toBe(true);
    }
    expect(model.targetMarginDb).toBe(6);
    expect(model.noiseFloorDbuV).toBe(20);
    expect(model.worst).toEqual(scanAnalysis.report.worst);
  });

  it('says on the plot how a scan of unknown mode was credited, for each attribution', () => {
    expect(model.attributionNote).toBe(ATTRIBUTION_NOTES.both);
    expect(model.attributionNote).toMatch(/^Mode unknown: .*smaller of its CM and DM improvements \(worst case\)/u);
    for (const attribution of ['common-mode', 'differential-mode'] as const) {
      const credited = emissionsChartModel(analyse(document, scanNoise(scan), { attribution }), context);
      expect(credited.attributionNote).toBe(ATTRIBUTION_NOTES[attribution]);
    }
    expect(ATTRIBUTION_NOTES['common-mode']).toContain('common-mode noise');
    expect(ATTRIBUTION_NOTES['differential-mode']).toContain('differential-mode noise');
  });

  it('has no attribution note for a scan of a known mode', () => {
    const cm = emissionsChartModel(analyse(document, scanNoise(syntheticScan({ tag: 'common-mode' }))), context);
    expect(cm.attributionNote).toBeUndefined();
    expect(cm.series.find((s) => s.kind === 'predicted')?.label).toBe('common mode, predicted, peak');
  });

  it('describes itself in one line', () => {
    expect(model.description).toMatch(/^Predicted levels from the scan “synthetic\.csv” against 2 limit lines, from 150 kHz to 30 MHz; lowest margin -?\d+\.\d dB at /u);
  });
});

describe('emissionsChartModel, from the estimate', () => {
  const model = emissionsChartModel(estimateAnalysis, context);

  it('draws a line spectrum as dots: each line once (not once per detector), and the two modes with no filter', () => {
    const predicted = model.series.filter((s) => s.kind === 'predicted');
    // The test design is balanced, so the two lines read alike and are drawn once.
    expect(predicted.map((s) => s.label)).toEqual(['lines 1 and 2, estimate (any detector)']);
    expect(model.series.filter((s) => s.kind === 'unfiltered').map((s) => s.label)).toEqual(['no filter, CM', 'no filter, DM']);
    expect(model.series.filter((s) => s.kind !== 'limit').every((s) => s.style === 'dots')).toBe(true);
    expect(model.series.filter((s) => s.kind === 'limit')).toHaveLength(2);
    expect(model.attributionNote).toBeUndefined();
    // No floor is drawn for an estimate: the floor belongs to a receiver's scan.
    expect(model.noiseFloorDbuV).toBeUndefined();
  });

  it('draws dots with no line between them', () => {
    const { options } = buildEmissionsPlot(model, { width: 900, height: 500 });
    const dots = options.series[1];
    expect(dots?.paths?.(noPlot, 1, 0, 1)).toBeNull();
    expect(dots?.points?.show).toBe(true);
    const limit = options.series[options.series.length - 1];
    expect(limit?.paths).toBeUndefined();
    expect(limit?.points?.show).toBe(false);
  });
});

describe('buildEmissionsPlot', () => {
  const model = emissionsChartModel(scanAnalysis, context);

  it('puts frequency on a log axis with ticks on the decades and levels in dBµV', () => {
    const { options } = buildEmissionsPlot(model, { width: 900, height: 500 });
    expect(options.scales?.['x']?.distr).toBe(3);
    expect(options.scales?.['x']?.log).toBe(10);
    expect(options.axes?.[1]?.label).toBe('Level (dBµV)');
    const splits = options.axes?.[0]?.splits as (u: uPlot, axis: number, min: number, max: number) => number[];
    expect(splits(noPlot, 0, 150e3, 1e6)).toEqual([2e5, 3e5, 4e5, 5e5, 6e5, 7e5, 8e5, 9e5, 1e6]);
    const y = options.scales?.['y']?.range as uPlot.Range.Function;
    expect(y(noPlot, 0, 1, 'y')).toEqual([...model.yRangeDbuV]);
  });

  it('labels every series and reads values out in dBµV and kHz/MHz', () => {
    const { options } = buildEmissionsPlot(model, { width: 900, height: 500 });
    expect(options.series.map((s) => s.label)).toEqual(['Frequency', ...model.series.map((s) => s.label)]);
    const frequency = options.series[0]?.value as (u: uPlot, v: number | null, s: number, i: number) => string;
    const level = options.series[1]?.value as (u: uPlot, v: number | null, s: number, i: number) => string;
    expect(frequency(noPlot, 262_000, 0, 0)).toBe('262 kHz');
    expect(level(noPlot, 57.94, 1, 0)).toBe('57.9 dBµV');
    expect(level(noPlot, null, 1, 0)).toBe('–');
  });

  it('thins the data to about one point per pixel and never drops the peaks', () => {
    const dense = syntheticScan({ points: 200_000 });
    const denseModel = emissionsChartModel(analyse(document, scanNoise(dense)), context);
    const { data } = buildEmissionsPlot(denseModel, { width: 800, height: 480 });
    expect((data[0] as number[]).length).toBeLessThanOrEqual(binsFor(800) + 4);
    const peakColumn = data[1] as (number | null)[];
    const highest = (values: ArrayLike<number | null>): number => {
      let top = -Infinity;
      for (let i = 0; i < values.length; i += 1) top = Math.max(top, values[i] ?? -Infinity);
      return top;
    };
    expect(highest(peakColumn)).toBe(highest(dense.traces[0]!.levelDbuV));
  });

  it('thins again for the zoomed window once uPlot has finished, and back out on a zoom out', () => {
    const dense = syntheticScan({ points: 100_000 });
    const denseAnalysis = analyse(document, scanNoise(dense));
    const denseModel = emissionsChartModel(denseAnalysis, context);
    const tasks: (() => void)[] = [];
    const { options } = buildEmissionsPlot(denseModel, { width: 800, height: 480 }, (task) => tasks.push(task));
    const calls: { data?: uPlot.AlignedData; scale?: { min: number; max: number } }[] = [];
    const stub = {
      scales: { x: { min: 1e6, max: 2e6 } },
      bbox: { width: 800 },
      batch(fn: () => void) {
        fn();
      },
      setData(data: uPlot.AlignedData) {
        calls.push({ data });
      },
      setScale(_key: string, scale: { min: number; max: number }) {
        calls.push({ scale });
      },
    };
    const hook = options.hooks?.setScale?.[0] as (u: uPlot, key: string) => void;
    hook(stub as unknown as uPlot, 'y');
    expect(tasks).toHaveLength(0);
    hook(stub as unknown as uPlot, 'x');
    expect(tasks).toHaveLength(1);
    expect(calls).toHaveLength(0);
    tasks.shift()?.();
    const x = calls[0]?.data?.[0] as number[];
    expect(x[0]).toBe(dense.frequencyHz[0]);
    expect(x[x.length - 1]).toBe(dense.frequencyHz[dense.frequencyHz.length - 1]);
    // The analysis judges the scan at the receiver's resolution (2.25 kHz bins here): the zoomed window
    // shows every point it judged there, far more than the thinned whole-span view holds.
    const judgedInWindow = denseAnalysis.frequencyHz.filter((f) => f >= 1e6 && f <= 2e6).length;
    expect(judgedInWindow).toBeGreaterThan(400);
    expect(x.filter((f) => f >= 1e6 && f <= 2e6).length).toBe(judgedInWindow);
    expect(calls[1]?.scale).toEqual({ min: 1e6, max: 2e6 });

    // The same window again (uPlot reporting the scale it was just given) does nothing.
    hook(stub as unknown as uPlot, 'x');
    expect(tasks).toHaveLength(0);

    // Two zooms in a row: only the last is thinned.
    stub.scales.x = { min: 3e6, max: 4e6 };
    hook(stub as unknown as uPlot, 'x');
    stub.scales.x = { min: 150e3, max: 30e6 };
    hook(stub as unknown as uPlot, 'x');
    tasks.splice(0).forEach((task) => task());
    expect(calls.slice(2).filter((c) => c.scale).map((c) => c.scale)).toEqual([{ min: 150e3, max: 30e6 }]);
  });

  it('is taller than wide charts need and sized from the width', () => {
    expect(emissionsChartSize(1000)).toEqual({ width: 1000, height: 540 });
    expect(emissionsChartSize(600)).toEqual({ width: 600, height: 348 });
    expect(emissionsChartSize(0)).toEqual({ width: 280, height: 300 });
  });
});

describe('required attenuation chart', () => {
  it('draws the attenuation still needed per mode, max-held, as dots for the estimate', () => {
    const model = requiredAttenuationModel(estimateAnalysis);
    expect(model?.series.map((s) => s.label)).toEqual(['CM needed', 'DM needed']);
    expect(model?.series[0]?.values).toBe(estimateAnalysis.requiredAttenuationCmDb);
    expect(model?.style).toBe('dots');
    expect(model?.yMaxDb).toBeGreaterThanOrEqual(10);
    const { options, data } = buildRequiredAttenuationPlot(model!, { width: 600, height: 190 });
    expect(options.series.map((s) => s.label)).toEqual(['Frequency', 'CM needed', 'DM needed']);
    expect(options.axes?.[1]?.label).toBe('Needed (dB)');
    expect(data).toHaveLength(3);
  });

  it('draws lines for a scan, with gaps where the noise floor leaves no information', () => {
    const model = requiredAttenuationModel(scanAnalysis);
    expect(model?.style).toBe('line');
    const { data } = buildRequiredAttenuationPlot(model!, { width: 600, height: 190 });
    expect((data[1] as (number | null)[]).some((v) => v === null)).toBe(true);
  });
});

describe('small helpers', () => {
  it('merges overlapping and touching ranges', () => {
    expect(
      mergeRanges([
        { startHz: 5, stopHz: 6 },
        { startHz: 1, stopHz: 3 },
        { startHz: 2, stopHz: 4 },
        { startHz: 4, stopHz: 4 },
      ]),
    ).toEqual([
      { startHz: 1, stopHz: 4 },
      { startHz: 5, stopHz: 6 },
    ]);
  });

  it.each([
    [-5, 79.3, [-10, 100]],
    [-200, 60, [-30, 80]],
    [null, null, [-10, 100]],
    [40, 45, [30, 60]],
  ] as const)('shows levels %s..%s dBµV on %j', (min, max, expected) => {
    expect(levelRange(min, max)).toEqual(expected);
  });

  it('ticks a log axis on 1…9 × 10^k wherever it starts, and finer when zoomed far in', () => {
    expect(logSplits(65e3, 300e3)).toEqual([7e4, 8e4, 9e4, 1e5, 2e5, 3e5]);
    expect(logSplits(3.62e6, 4.01e6)).toEqual([3.7e6, 3.8e6, 3.9e6, 4e6]);
    expect(logSplits(3.8012e6, 3.8052e6)).toEqual([3.802e6, 3.803e6, 3.804e6, 3.805e6]);
    expect(logSplits(0, 1)).toEqual([]);
  });

  it('labels whole-mantissa ticks at 1, 2 and 5 per decade, and finer ticks wherever there is room', () => {
    expect(logTickLabels([1e5, 2e5, 3e5, 5e5, 1e6], 1e5, 300)).toEqual(['100 kHz', '200 kHz', '', '500 kHz', '1 MHz']);
    expect(logTickLabels([3.7e6, 3.8e6, 3.9e6, 4e6], 3.62e6, 3000)).toEqual(['3.7 MHz', '', '3.9 MHz', '']);
    expect(logTickLabels([3.7e6, 3.8e6, 3.9e6, 4e6], 3.62e6, 20000)).toEqual(['3.7 MHz', '3.8 MHz', '3.9 MHz', '4 MHz']);
  });

  it('compares columns value for value', () => {
    expect(sameValues(Float64Array.of(1, Number.NaN), Float64Array.of(1, Number.NaN))).toBe(true);
    expect(sameValues(Float64Array.of(1, 2), Float64Array.of(1, 3))).toBe(false);
    expect(sameValues(Float64Array.of(1), Float64Array.of(1, 2))).toBe(false);
  });
});
