/**
 * Thinning a long curve for drawing: keep, in each pixel column, the one point whose value is the
 * extreme the curve asks for (max-hold for levels, min-hold for limits and margins), as a receiver's
 * display does. Never an average, which would shave a one-point peak down to the noise beside it.
 * A column holding no finite value is a gap. Curves with no more points than twice the columns are
 * returned point for point.
 */

export interface ThinnedPoints {
  /** Pixel x of each kept point (the point's own frequency, not the column's centre). */
  readonly x: number[];
  /** The kept value; NaN marks a gap (the path is broken there). */
  readonly values: number[];
}

/**
 * `position(f)` maps a frequency to pixel x. Points left of `left` or right of `right` are dropped,
 * except the nearest one on each side, so a line runs to the edge of the plot.
 */
export function thinToColumns(
  frequencyHz: ArrayLike<number>,
  values: ArrayLike<number>,
  reduce: 'max' | 'min',
  position: (hz: number) => number,
  left: number,
  right: number,
): ThinnedPoints {
  const n = Math.min(frequencyHz.length, values.length);
  let start = 0;
  while (start < n && !(position(frequencyHz[start]!) >= left)) start += 1;
  let stop = n;
  while (stop > start && !(position(frequencyHz[stop - 1]!) <= right)) stop -= 1;
  const from = Math.max(0, start - 1);
  const to = Math.min(n, stop + 1);
  const out: ThinnedPoints = { x: [], values: [] };
  const columns = Math.max(1, Math.ceil(right - left));
  if (to - from <= 2 * columns) {
    for (let i = from; i < to; i += 1) {
      out.x.push(position(frequencyHz[i]!));
      out.values.push(Number.isFinite(values[i]!) ? values[i]! : Number.NaN);
    }
    return out;
  }
  const isMax = reduce === 'max';
  let column = Number.NaN;
  let bestAt = -1;
  let sawGap = false;
  const flush = (): void => {
    if (bestAt >= 0) {
      out.x.push(position(frequencyHz[bestAt]!));
      out.values.push(values[bestAt]!);
    } else if (sawGap) {
      out.x.push(Number.NaN);
      out.values.push(Number.NaN);
    }
  };
  for (let i = from; i < to; i += 1) {
    const x = position(frequencyHz[i]!);
    const c = Math.floor(x - left);
    if (c !== column) {
      if (i !== from) flush();
      column = c;
      bestAt = -1;
      sawGap = false;
    }
    const value = values[i]!;
    if (!Number.isFinite(value)) {
      sawGap = true;
      continue;
    }
    if (bestAt < 0 || (isMax ? value > values[bestAt]! : value < values[bestAt]!)) bestAt = i;
  }
  flush();
  return out;
}

export interface ThinnedBand {
  readonly x: number[];
  readonly upper: number[];
  readonly lower: number[];
}

/**
 * A band thinned the same way, both edges together so they stay paired: per pixel column the
 * highest upper edge and the lowest lower edge (the band never looks narrower than it is), at the
 * column's first point; a column where either edge has no finite value is a gap.
 */
export function thinBandToColumns(
  frequencyHz: ArrayLike<number>,
  lower: ArrayLike<number>,
  upper: ArrayLike<number>,
  position: (hz: number) => number,
  left: number,
  right: number,
): ThinnedBand {
  const n = Math.min(frequencyHz.length, lower.length, upper.length);
  let start = 0;
  while (start < n && !(position(frequencyHz[start]!) >= left)) start += 1;
  let stop = n;
  while (stop > start && !(position(frequencyHz[stop - 1]!) <= right)) stop -= 1;
  const from = Math.max(0, start - 1);
  const to = Math.min(n, stop + 1);
  const out: ThinnedBand = { x: [], upper: [], lower: [] };
  const columns = Math.max(1, Math.ceil(right - left));
  const both = (i: number): boolean => Number.isFinite(lower[i]!) && Number.isFinite(upper[i]!);
  if (to - from <= 2 * columns) {
    for (let i = from; i < to; i += 1) {
      out.x.push(position(frequencyHz[i]!));
      out.upper.push(both(i) ? upper[i]! : Number.NaN);
      out.lower.push(both(i) ? lower[i]! : Number.NaN);
    }
    return out;
  }
  let column = Number.NaN;
  let x = 0;
  let high = -Infinity;
  let low = Infinity;
  let any = false;
  const flush = (): void => {
    out.x.push(x);
    out.upper.push(any ? high : Number.NaN);
    out.lower.push(any ? low : Number.NaN);
  };
  for (let i = from; i < to; i += 1) {
    const px = position(frequencyHz[i]!);
    const c = Math.floor(px - left);
    if (c !== column) {
      if (i !== from) flush();
      column = c;
      x = px;
      high = -Infinity;
      low = Infinity;
      any = false;
    }
    if (!both(i)) continue;
    any = true;
    if (upper[i]! > high) high = upper[i]!;
    if (lower[i]! < low) low = lower[i]!;
  }
  flush();
  return out;
}
