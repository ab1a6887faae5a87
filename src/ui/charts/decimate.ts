/**
 * Thinning a long frequency axis for drawing: a scan can hold a million points and a chart is about a
 * thousand pixels wide. The axis is cut into bins of equal width on a log-frequency scale (about one
 * per pixel) and each column keeps its extreme value in each bin: max-hold for levels (a narrow
 * emission peak must survive, as on a receiver's display), min-hold for limits and margins (the
 * stricter value). Never an average, which would shave a one-point peak down to the noise around it.
 *
 * Pure and allocation-light: one pass over the points in the window, no logarithm per point (the bin
 * edges are computed once and the sorted axis is walked against them).
 */

/** How a column is reduced within a bin. */
export type Reduce = 'max' | 'min';

export interface DecimateOptions {
  /** Bins across the window: about one per pixel of plot width. */
  readonly bins: number;
  /** The window on the axis, inclusive; default the whole axis. */
  readonly fromX?: number;
  readonly toX?: number;
  /** Per column; default 'max' for every column. */
  readonly reduce?: readonly Reduce[];
  /**
   * Also keep the axis' very first and last points when they fall outside the window, so that the
   * data still spans the whole axis (a chart zoomed in on decimated data can then zoom back out).
   */
  readonly keepEnds?: boolean;
}

export interface Decimated {
  /** Rising. A bin holding one point keeps that point's own x; a fuller bin the x of column 0's extreme. */
  readonly x: number[];
  /** One array per input column, as long as x; null where a bin holds no finite value (a gap). */
  readonly columns: (number | null)[][];
}

/** The first index whose x is ≥ value (x rising). */
export function lowerBound(x: ArrayLike<number>, value: number): number {
  let low = 0;
  let high = x.length;
  while (low < high) {
    const mid = (low + high) >>> 1;
    if (x[mid]! < value) low = mid + 1;
    else high = mid;
  }
  return low;
}

/** The first index whose x is > value (x rising). */
export function upperBound(x: ArrayLike<number>, value: number): number {
  let low = 0;
  let high = x.length;
  while (low < high) {
    const mid = (low + high) >>> 1;
    if (x[mid]! <= value) low = mid + 1;
    else high = mid;
  }
  return low;
}

const finiteOrNull = (value: number): number | null => (Number.isFinite(value) ? value : null);

/**
 * Max-hold (or min-hold) decimation on a log-x axis. `x` must be rising and positive. Points just
 * outside the window (one on each side) are kept as they are, so lines run to the plot's edges.
 * A window holding no more points than `bins` is returned point for point, with no binning at all.
 */
export function decimateLogMaxHold(x: ArrayLike<number>, columns: readonly ArrayLike<number>[], options: DecimateOptions): Decimated {
  const n = x.length;
  const out: Decimated = { x: [], columns: columns.map(() => []) };
  if (n === 0) return out;
  const bins = Math.max(1, Math.floor(options.bins));
  const fromX = options.fromX ?? x[0]!;
  const toX = options.toX ?? x[n - 1]!;
  const reduce = columns.map((_, c) => options.reduce?.[c] ?? 'max');

  const push = (i: number): void => {
    out.x.push(x[i]!);
    columns.forEach((column, c) => out.columns[c]!.push(finiteOrNull(column[i]!)));
  };

  const start = lowerBound(x, fromX);
  const stop = upperBound(x, toX);
  if (options.keepEnds && start > 1) push(0);
  if (start > 0) push(start - 1);

  if (stop - start <= bins || !(toX > fromX && fromX > 0)) {
    for (let i = start; i < stop; i += 1) push(i);
  } else {
    const logFrom = Math.log10(fromX);
    const step = (Math.log10(toX) - logFrom) / bins;
    const held = new Float64Array(columns.length);
    let i = start;
    for (let b = 0; b < bins && i < stop; b += 1) {
      // Points up to this edge belong to bin b; the last bin takes the rest of the window.
      const edge = b === bins - 1 ? Infinity : 10 ** (logFrom + (b + 1) * step);
      const first = i;
      while (i < stop && x[i]! < edge) i += 1;
      const count = i - first;
      if (count === 0) continue;
      if (count === 1) {
        push(first);
        continue;
      }
      let where = first;
      for (let c = 0; c < columns.length; c += 1) {
        const column = columns[c]!;
        const isMax = reduce[c] === 'max';
        let best = Number.NaN;
        let bestAt = -1;
        for (let k = first; k < i; k += 1) {
          const value = column[k]!;
          if (!Number.isFinite(value)) continue;
          if (bestAt < 0 || (isMax ? value > best : value < best)) {
            best = value;
            bestAt = k;
          }
        }
        held[c] = best;
        if (c === 0 && bestAt >= 0) where = bestAt;
      }
      out.x.push(x[where]!);
      for (let c = 0; c < columns.length; c += 1) out.columns[c]!.push(finiteOrNull(held[c]!));
    }
  }

  if (stop < n) push(stop);
  if (options.keepEnds && stop < n - 1) push(n - 1);
  return out;
}
