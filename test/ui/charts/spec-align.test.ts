import { describe, expect, it } from 'vitest';
import type { PlotSpec } from '../../../src/drawing/plot-spec.ts';
import { alignSpec } from '../../../src/ui/charts/spec-align.ts';

/** Several grids on one x array for uPlot: exact when few points, max/min-held bins when many. */

function specWith(series: { f: Float64Array; v: Float64Array; reduce: 'max' | 'min' }[]): PlotSpec {
  return {
    id: 't',
    title: 't',
    description: '',
    x: { label: 'f', min: 1e5, max: 1e8 },
    y: { label: 'y', unit: 'dB', scale: 'linear' },
    series: series.map((s, i) => ({ id: `s${i}`, label: `s${i}`, frequencyHz: s.f, values: s.v, style: { color: 'neutral', dash: 'solid', width: 1, draw: 'line' }, reduce: s.reduce })),
    bands: [],
    regions: [],
    levels: [],
    markers: [],
    notes: [],
  };
}

describe('alignSpec', () => {
  it('few points: the union of the grids, each value at its own frequency, undefined elsewhere, null for a gap', () => {
    const aligned = alignSpec(
      specWith([
        { f: Float64Array.of(1e5, 1e6), v: Float64Array.of(1, 2), reduce: 'max' },
        { f: Float64Array.of(5e5, 1e6, 2e6), v: Float64Array.of(7, Number.NaN, 9), reduce: 'min' },
      ]),
      1e5,
      1e8,
      100,
    );
    expect(aligned.x).toEqual([1e5, 5e5, 1e6, 2e6]);
    expect(aligned.columns[0]).toEqual([1, undefined, 2, undefined]);
    expect(aligned.columns[1]).toEqual([undefined, 7, null, 9]);
  });

  it('many points: about one bin per pixel; a one-point peak survives max-hold, a dip survives min-hold', () => {
    const n = 200_000;
    const f = Float64Array.from({ length: n }, (_, i) => 1e5 * 1000 ** (i / (n - 1)));
    const level = Float64Array.from({ length: n }, (_, i) => (i === 123_457 ? 99 : 10));
    const limit = Float64Array.from({ length: n }, (_, i) => (i === 77_777 ? -50 : 60));
    const aligned = alignSpec(specWith([{ f, v: level, reduce: 'max' }, { f, v: limit, reduce: 'min' }]), 1e5, 1e8, 500);
    expect(aligned.x.length).toBe(502);
    expect(Math.max(...aligned.columns[0]!.filter((v): v is number => typeof v === 'number'))).toBe(99);
    expect(Math.min(...aligned.columns[1]!.filter((v): v is number => typeof v === 'number'))).toBe(-50);
  });

  it('a zoomed window keeps one point beyond each edge so lines reach the edges', () => {
    const f = Float64Array.of(1e5, 1e6, 2e6, 3e6, 1e7);
    const aligned = alignSpec(specWith([{ f, v: Float64Array.of(1, 2, 3, 4, 5), reduce: 'max' }]), 1.5e6, 2.5e6, 100);
    expect(aligned.x).toEqual([1e6, 2e6, 3e6]);
  });
});
