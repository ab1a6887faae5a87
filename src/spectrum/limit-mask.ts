/**
 * Limit masks evaluated at any frequency: the limit lines of the emission standards, and any line a
 * design adds (docs/design-format.md, `emissions.masks[]`).
 *
 * A mask is a list of (frequency, level) points, frequencies never falling, joined by straight lines
 * on a log-frequency axis; the standards' "decreases linearly with the logarithm of the frequency"
 * is exactly such a line. Between two points (f1, L1) and (f2, L2):
 *
 *     L(f) = L1 + (L2 − L1) · log10(f / f1) / log10(f2 / f1)
 *
 * A step is two points at one frequency (the level just below and just above it). At the step
 * frequency itself the LOWER of the two levels applies, as the band-edge rule of 47 CFR §15.107
 * says ("the lower limit applies at the band edges"; references.md §1.1, status V). The shape
 * (equal lengths, frequencies positive and never falling, at most two points at one frequency) is
 * checked once by `limitMaskSchema` when a design or a mask file is read; these functions trust it.
 */

/** What these functions read of a mask: a `LimitMask` from a design, or a frozen preset. */
export interface MaskPoints {
  readonly frequencyHz: readonly number[];
  readonly levelDbuV: readonly number[];
}

/**
 * The limit at one frequency, dBµV; undefined below the mask's first frequency, above its last one,
 * or for NaN. At a step frequency the lower level.
 */
export function limitAt(mask: MaskPoints, frequencyHz: number): number | undefined {
  const f = mask.frequencyHz;
  const last = f.length - 1;
  // Written so that NaN fails both comparisons and falls out here.
  if (last < 0 || !(frequencyHz >= f[0]!) || !(frequencyHz <= f[last]!)) return undefined;
  return levelInSpan(mask, frequencyHz);
}

/**
 * The limit at every frequency of a grid (in any order), dBµV. Frequencies outside the mask's span
 * get NaN, not undefined, so that the result stays one Float64Array column beside the grid: test
 * with Number.isNaN before comparing, and never let NaN reach a chart or a margin as a number. Writes
 * into `out` when given (it must be as long as the grid), else into a new array.
 */
export function limitOnGrid(mask: MaskPoints, frequencyHz: Float64Array, out?: Float64Array): Float64Array {
  const result = out ?? new Float64Array(frequencyHz.length);
  if (result.length !== frequencyHz.length) {
    throw new RangeError(`limitOnGrid: out has ${result.length} entries, the grid ${frequencyHz.length}`);
  }
  const f = mask.frequencyHz;
  const last = f.length - 1;
  const start = last < 0 ? Number.NaN : f[0]!;
  const stop = last < 0 ? Number.NaN : f[last]!;
  for (let k = 0; k < frequencyHz.length; k += 1) {
    const here = frequencyHz[k]!;
    result[k] = here >= start && here <= stop ? levelInSpan(mask, here) : Number.NaN;
  }
  return result;
}

/**
 * The frequencies where the mask's line changes course, rising and without repeats: its first and
 * last frequency, every step, and every point where the slope (dB per decade) changes. A point that
 * only continues a straight line is left out. Add these to a sweep or scan grid so that a margin is
 * taken exactly where a limit bends or steps, not only near it.
 */
export function maskCorners(mask: MaskPoints): Float64Array {
  const f = mask.frequencyHz;
  const level = mask.levelDbuV;
  const corners: number[] = [];
  const add = (frequency: number): void => {
    if (corners[corners.length - 1] !== frequency) corners.push(frequency);
  };
  for (let i = 0; i < f.length; i += 1) {
    const here = f[i]!;
    const first = i === 0;
    const lastPoint = i === f.length - 1;
    const step = (!first && f[i - 1] === here) || (!lastPoint && f[i + 1] === here);
    if (first || lastPoint || step) {
      add(here);
      continue;
    }
    // An interior point off the straight line (in log f) through its neighbours is a bend.
    const before = f[i - 1]!;
    const after = f[i + 1]!;
    const straight = level[i - 1]! + ((level[i + 1]! - level[i - 1]!) * Math.log10(here / before)) / Math.log10(after / before);
    if (Math.abs(straight - level[i]!) > BEND_TOLERANCE_DB) add(here);
  }
  return Float64Array.from(corners);
}

/** A point this close (dB) to the line through its neighbours is on it: rounding, not a bend. */
const BEND_TOLERANCE_DB = 1e-9;

/** The level at a frequency known to lie within the span (first ≤ f ≤ last). */
function levelInSpan(mask: MaskPoints, frequencyHz: number): number {
  const f = mask.frequencyHz;
  const level = mask.levelDbuV;
  // The last point at or below the frequency (the second point of a step, if it is one).
  let lo = 0;
  let hi = f.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (f[mid]! <= frequencyHz) lo = mid;
    else hi = mid - 1;
  }
  const f1 = f[lo]!;
  const l1 = level[lo]!;
  if (f1 === frequencyHz) {
    // On a point; on a step, the lower of its two levels.
    return lo > 0 && f[lo - 1] === frequencyHz ? Math.min(level[lo - 1]!, l1) : l1;
  }
  const f2 = f[lo + 1]!;
  const l2 = level[lo + 1]!;
  return l1 + ((l2 - l1) * Math.log10(frequencyHz / f1)) / Math.log10(f2 / f1);
}
