/**
 * Preferred numbers for component values: the E6, E12 and E24 series of IEC 60063 ("Preferred
 * number series for resistors and capacitors"), each a list of mantissas per decade. The values are
 * the published ones, written here from the standard's tables as widely reproduced (from memory,
 * checked against the familiar E24 list: note 2.7, 3.0, 3.3 and 4.7, which are not the rounded
 * geometric values).
 */

export const PREFERRED_SERIES = {
  E6: [1.0, 1.5, 2.2, 3.3, 4.7, 6.8],
  E12: [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2],
  E24: [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1],
} as const satisfies Record<string, readonly number[]>;

export type PreferredSeries = keyof typeof PREFERRED_SERIES;
export const PREFERRED_SERIES_NAMES = Object.keys(PREFERRED_SERIES) as PreferredSeries[];

/** Relative slack so that a value that is a preferred number up to rounding (4.7e-6) snaps to itself. */
const SAME = 1e-9;

/** The series value at `index` steps from 1.0 in decade 10^decade. */
function seriesValue(series: PreferredSeries, decade: number, index: number): number {
  const mantissas = PREFERRED_SERIES[series];
  const n = mantissas.length;
  const shift = Math.floor(index / n);
  const mantissa = mantissas[index - shift * n]!;
  // Decades as an exact power of ten, then the two-digit mantissa: 4.7 × 1e-6 stays the double nearest 4.7e-6.
  const exponent = decade + shift;
  return exponent >= 0 ? mantissa * 10 ** exponent : mantissa / 10 ** -exponent;
}

/** The smallest preferred value at or above `value` (value > 0). */
export function snapUp(value: number, series: PreferredSeries): number {
  return preferredAtOrAbove(value, series, 1)[0]!;
}

/** The `count` smallest preferred values at or above `value`, rising. */
export function preferredAtOrAbove(value: number, series: PreferredSeries, count: number): number[] {
  if (!(value > 0 && Number.isFinite(value))) throw new RangeError(`a preferred value needs a positive value, got ${value}`);
  const decade = Math.floor(Math.log10(value));
  const out: number[] = [];
  // Start one decade low so a rounding error in log10 can never skip the answer.
  for (let index = -PREFERRED_SERIES[series].length; out.length < count; index += 1) {
    const candidate = seriesValue(series, decade, index);
    if (candidate >= value * (1 - SAME)) out.push(candidate);
  }
  return out;
}

/** The largest preferred value at or below `value`. */
export function snapDown(value: number, series: PreferredSeries): number {
  if (!(value > 0 && Number.isFinite(value))) throw new RangeError(`a preferred value needs a positive value, got ${value}`);
  const decade = Math.floor(Math.log10(value));
  let best = Number.NaN;
  for (let index = -PREFERRED_SERIES[series].length; index <= 2 * PREFERRED_SERIES[series].length; index += 1) {
    const candidate = seriesValue(series, decade, index);
    if (candidate <= value * (1 + SAME)) best = candidate;
    else break;
  }
  return best;
}
