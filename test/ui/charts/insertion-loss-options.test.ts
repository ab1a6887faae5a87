// @vitest-environment node
// The options builder is pure: it must build without a DOM, so this file runs in plain Node.
import type uPlot from 'uplot';
import { describe, expect, it } from 'vitest';
import { frequencyTickLabels, pixelsPerDecade } from '../../../src/drawing/frequency-ticks.ts';
import {
  buildInsertionLossPlot,
  columnExtent,
  describeInsertionLossChart,
  insertionLossRange,
} from '../../../src/ui/charts/insertion-loss-options.ts';
import { INSERTION_LOSS_SERIES } from '../../../src/ui/charts/insertion-loss-series.ts';
import { resonanceNotes } from '../../../src/ui/charts/resonance-marks.ts';
import { syntheticSweep } from '../support/synthetic-sweep.ts';

// Callbacks take the plot as first argument; these ones do not read it.
const noPlot = {} as uPlot;

describe('buildInsertionLossPlot', () => {
  it('is built in Node, with no DOM', () => {
    expect(typeof document).toBe('undefined');
    expect(() => buildInsertionLossPlot(syntheticSweep(), { width: 800, height: 400 })).not.toThrow();
  });

  it('draws CM and DM insertion loss, in circuit and 50 Ω/50 Ω, straight from the result columns', () => {
    const result = syntheticSweep();
    const { options, data } = buildInsertionLossPlot(result, { width: 800, height: 400 });
    expect(options.width).toBe(800);
    expect(options.height).toBe(400);
    expect(options.series.map((series) => series.label)).toEqual(['Frequency', 'CM in circuit', 'CM 50 Ω/50 Ω', 'DM in circuit', 'DM 50 Ω/50 Ω']);
    expect(data[0]).toBe(result.frequencyHz);
    expect(data.slice(1)).toEqual([
      result.columns.insertionLossInCircuitCm,
      result.columns.insertionLoss50Cm,
      result.columns.insertionLossInCircuitDm,
      result.columns.insertionLoss50Dm,
    ]);
    // Same arrays, not copies: the columns arrived by transfer and are only read.
    expect(data[1]).toBe(result.columns.insertionLossInCircuitCm);
  });

  it('puts frequency on a log axis fitted exactly to the sweep', () => {
    const result = syntheticSweep();
    const { options } = buildInsertionLossPlot(result, { width: 800, height: 400 });
    const x = options.scales?.['x'];
    expect(x?.distr).toBe(3);
    expect(x?.log).toBe(10);
    const range = x?.range as uPlot.Range.Function;
    expect(range(noPlot, 9e3, 30e6, 'x')).toEqual([9e3, 30e6]);
  });

  it('never clips negative insertion loss: the y range reaches below the lowest value and below 0 dB', () => {
    const result = syntheticSweep();
    const { yRangeDb, options } = buildInsertionLossPlot(result, { width: 800, height: 400 });
    const { min, max } = columnExtent(INSERTION_LOSS_SERIES.map((series) => result.columns[series.column]));
    expect(min).toBeCloseTo(-15, 9);
    expect(max).toBeCloseTo(142.9, 1);
    expect(yRangeDb).toEqual([-20, 150]);
    const range = options.scales?.['y']?.range as uPlot.Range.Function;
    expect(range(noPlot, -15, 142.9, 'y')).toEqual([-20, 150]);
    // Zoomed into a stretch where the curves are all negative, the range still covers them.
    expect(range(noPlot, -37.5, -3, 'y')).toEqual([-40, 10]);
  });

  it('formats legend values as dB and frequency with units', () => {
    const { options } = buildInsertionLossPlot(syntheticSweep(), { width: 800, height: 400 });
    const frequency = options.series[0]?.value as (u: uPlot, v: number | null, s: number, i: number) => string;
    const loss = options.series[1]?.value as (u: uPlot, v: number | null, s: number, i: number) => string;
    expect(frequency(noPlot, 2_345_678, 0, 0)).toBe('2.346 MHz');
    expect(loss(noPlot, -12.345, 1, 0)).toBe('-12.3 dB');
    expect(loss(noPlot, null, 1, 0)).toBe('–');
  });

  it('draws the 50 Ω curves dashed and the in-circuit curves solid, one colour per mode', () => {
    const { options } = buildInsertionLossPlot(syntheticSweep(), { width: 800, height: 400 });
    const [, cmCircuit, cm50, dmCircuit, dm50] = options.series;
    expect(cmCircuit?.dash).toEqual([]);
    expect(cm50?.dash?.length).toBeGreaterThan(0);
    expect(cmCircuit?.stroke).toBe(cm50?.stroke);
    expect(dmCircuit?.stroke).toBe(dm50?.stroke);
    expect(cmCircuit?.stroke).not.toBe(dmCircuit?.stroke);
  });

  it('says what it shows in one line', () => {
    expect(describeInsertionLossChart(syntheticSweep())).toBe(
      'Insertion loss of Synthetic filter, common and differential mode, in circuit and 50 Ω/50 Ω, from 9 kHz to 30 MHz; values from -15.0 dB to 142.9 dB',
    );
  });
});

describe('insertionLossRange', () => {
  it.each([
    [-25.3, 62.5, [-30, 70]],
    [-30, 60, [-40, 70]],
    [5, 40, [-10, 50]],
    [null, null, [-10, 10]],
    [-400, 10, [-410, 20]],
  ] as const)('from %s..%s dB shows %j', (min, max, expected) => {
    expect(insertionLossRange(min, max)).toEqual(expected);
  });
});

describe('frequency ticks', () => {
  it('labels 1, 2 and 5 per decade when there is room, else fewer', () => {
    const splits = [9e3, 1e4, 2e4, 3e4, 5e4, 1e5, 2e5, 1e6, null];
    expect(frequencyTickLabels(splits, 200)).toEqual(['', '10 kHz', '20 kHz', '', '50 kHz', '100 kHz', '200 kHz', '1 MHz', '']);
    expect(frequencyTickLabels(splits, 100)).toEqual(['', '10 kHz', '', '30 kHz', '', '100 kHz', '', '1 MHz', '']);
    expect(frequencyTickLabels(splits, 40)).toEqual(['', '10 kHz', '', '', '', '100 kHz', '', '1 MHz', '']);
  });

  it('measures room per decade', () => {
    expect(pixelsPerDecade(1e4, 1e7, 600)).toBe(200);
  });
});

describe('resonanceNotes', () => {
  it('lists every element self-resonance and the peaks of drawn curves only, by frequency', () => {
    const notes = resonanceNotes(syntheticSweep());
    expect(notes.map((note) => [note.kind, note.frequencyHz])).toEqual([
      ['self-resonance', 850e3],
      ['response', 2.37e6],
      ['self-resonance', 5e6],
      ['self-resonance', 16e6],
    ]);
    expect(notes[0]).toMatchObject({ elementId: 'LCM1', elementLabel: 'LCM1 2.2 mH choke', view: 'common-mode', type: 'parallel' });
    expect(notes[1]).toMatchObject({ valueDb: 157.2, type: 'peak', series: { column: 'insertionLoss50Dm', label: 'DM 50 Ω/50 Ω' } });
  });
});
