import type { PlotSpec } from '../../drawing/plot-spec.ts';
import { lowerBound, upperBound } from './decimate.ts';

/**
 * A PlotSpec's series, each on its own frequency grid, put on the one x array uPlot draws, for a
 * window of the axis and about `bins` pixels. Few points: the union of the grids, every point where
 * it is (exact). Many points (a million-row scan): log-spaced bins, each series keeping its extreme
 * in a bin (max-hold for levels, min-hold for limits; never an average, which would shave a peak).
 * In uPlot's terms a value is a number, null (a gap: the series has a point there but no value) or
 * undefined (the series has no point there; the line runs on past it).
 */

export type Cell = number | null | undefined;

export interface Aligned {
  readonly x: number[];
  /** Series first (spec order), then each band's lower and upper. */
  readonly columns: Cell[][];
}

interface Column {
  readonly frequencyHz: Float64Array;
  readonly values: Float64Array;
  readonly reduce: 'max' | 'min';
}

function columnsOf(spec: PlotSpec): Column[] {
  return [
    ...spec.series.map((s) => ({ frequencyHz: s.frequencyHz, values: s.values, reduce: s.reduce })),
    ...spec.bands.flatMap((b) => [
      { frequencyHz: b.frequencyHz, values: b.lower, reduce: 'min' as const },
      { frequencyHz: b.frequencyHz, values: b.upper, reduce: 'max' as const },
    ]),
  ];
}

const cell = (value: number): Cell => (Number.isFinite(value) ? value : null);

export function alignSpec(spec: PlotSpec, fromHz: number, toHz: number, bins: number): Aligned {
  const columns = columnsOf(spec);
  // Each column's range in the window, with one point beyond each side so lines run to the edges.
  const ranges = columns.map((c) => {
    const start = Math.max(0, lowerBound(c.frequencyHz, fromHz) - 1);
    const stop = Math.min(c.frequencyHz.length, upperBound(c.frequencyHz, toHz) + 1);
    return { start, stop };
  });
  const total = ranges.reduce((n, r) => n + (r.stop - r.start), 0);
  return total <= 3 * bins ? union(columns, ranges) : binned(columns, ranges, fromHz, toHz, bins);
}

function union(columns: readonly Column[], ranges: readonly { start: number; stop: number }[]): Aligned {
  const all = new Set<number>();
  columns.forEach((c, k) => {
    for (let i = ranges[k]!.start; i < ranges[k]!.stop; i += 1) all.add(c.frequencyHz[i]!);
  });
  const x = [...all].sort((a, b) => a - b);
  const index = new Map(x.map((hz, i) => [hz, i]));
  const out: Cell[][] = columns.map((c, k) => {
    const column: Cell[] = new Array<Cell>(x.length).fill(undefined);
    for (let i = ranges[k]!.start; i < ranges[k]!.stop; i += 1) column[index.get(c.frequencyHz[i]!)!] = cell(c.values[i]!);
    return column;
  });
  return { x, columns: out };
}

function binned(columns: readonly Column[], ranges: readonly { start: number; stop: number }[], fromHz: number, toHz: number, bins: number): Aligned {
  const logFrom = Math.log10(fromHz);
  const step = (Math.log10(toHz) - logFrom) / bins;
  // Bin centres, plus one slot before and after the window for the points just outside it.
  const x: number[] = [fromHz / 10 ** step];
  for (let b = 0; b < bins; b += 1) x.push(10 ** (logFrom + (b + 0.5) * step));
  x.push(toHz * 10 ** step);
  const out: Cell[][] = columns.map((c, k) => {
    const column: Cell[] = new Array<Cell>(x.length).fill(undefined);
    const { start, stop } = ranges[k]!;
    const isMax = c.reduce === 'max';
    for (let i = start; i < stop; i += 1) {
      const hz = c.frequencyHz[i]!;
      const slot = hz < fromHz ? 0 : hz > toHz ? bins + 1 : 1 + Math.min(bins - 1, Math.floor((Math.log10(hz) - logFrom) / step));
      const value = c.values[i]!;
      const held = column[slot];
      if (!Number.isFinite(value)) {
        if (held === undefined) column[slot] = null;
      } else if (held === undefined || held === null || (isMax ? value > held : value < held)) column[slot] = value;
    }
    return column;
  });
  return { x, columns: out };
}
