import type { NetworkResponse } from '../kernel/network-response.ts';
import { REFINED_CURVES, type RefinedCurve, refinedCurveDb } from './response-curves.ts';

/** A local peak or notch of one curve on the grid, to be located more precisely. */
export interface ExtremumCandidate {
  readonly curve: RefinedCurve;
  readonly index: number;
  readonly type: 'peak' | 'notch';
  readonly prominenceDb: number;
}

export interface RefinedExtremum {
  readonly curve: RefinedCurve;
  readonly type: 'peak' | 'notch';
  readonly frequencyHz: number;
  readonly valueDb: number;
}

/** Differences below this are rounding noise on a flat curve, not a feature. */
const MIN_PROMINENCE_DB = 1e-6;
export const MAX_REFINED_EXTREMA = 256;
const GOLDEN = (Math.sqrt(5) - 1) / 2;
/** 30 golden-section steps shrink a two-interval bracket by 5e-7. */
const GOLDEN_STEPS = 30;

/** Interior local extrema of every refined curve, most prominent first, at most MAX_REFINED_EXTREMA. */
export function findExtremumCandidates(response: NetworkResponse, count: number): { candidates: ExtremumCandidate[]; capped: boolean } {
  const candidates: ExtremumCandidate[] = [];
  for (const curve of REFINED_CURVES) {
    let previous = refinedCurveDb(response, curve, 0);
    let current = count > 1 ? refinedCurveDb(response, curve, 1) : previous;
    for (let i = 1; i + 1 < count; i += 1) {
      const next = refinedCurveDb(response, curve, i + 1);
      const rise = current - previous;
      const fall = current - next;
      if (rise > MIN_PROMINENCE_DB && fall >= 0 && fall + rise > 2 * MIN_PROMINENCE_DB) {
        candidates.push({ curve, index: i, type: 'peak', prominenceDb: Math.min(rise, Math.max(fall, MIN_PROMINENCE_DB)) });
      } else if (rise < -MIN_PROMINENCE_DB && fall <= 0 && fall + rise < -2 * MIN_PROMINENCE_DB) {
        candidates.push({ curve, index: i, type: 'notch', prominenceDb: Math.min(-rise, Math.max(-fall, MIN_PROMINENCE_DB)) });
      }
      previous = current;
      current = next;
    }
  }
  candidates.sort((a, b) => b.prominenceDb - a.prominenceDb);
  const capped = candidates.length > MAX_REFINED_EXTREMA;
  return { candidates: candidates.slice(0, MAX_REFINED_EXTREMA), capped };
}

/**
 * Golden-section search on log f for every candidate at once: each step evaluates one new
 * frequency per candidate in a single batched sweep, so k candidates cost about 30 sweeps of k
 * points. The bracket is the candidate's two neighbours, inside which the extremum must lie.
 */
export function refineExtrema(
  candidates: readonly ExtremumCandidate[],
  grid: Float64Array,
  sweepBatch: (frequencyHz: Float64Array) => NetworkResponse,
): RefinedExtremum[] {
  const k = candidates.length;
  if (k === 0) return [];
  const lo = new Float64Array(k);
  const hi = new Float64Array(k);
  const x1 = new Float64Array(k);
  const x2 = new Float64Array(k);
  const v1 = new Float64Array(k);
  const v2 = new Float64Array(k);
  candidates.forEach((c, n) => {
    lo[n] = Math.log(grid[c.index - 1]!);
    hi[n] = Math.log(grid[c.index + 1]!);
    x1[n] = hi[n]! - GOLDEN * (hi[n]! - lo[n]!);
    x2[n] = lo[n]! + GOLDEN * (hi[n]! - lo[n]!);
  });
  const value = (response: NetworkResponse, n: number, slot: number): number => {
    const c = candidates[n]!;
    const v = refinedCurveDb(response, c.curve, slot);
    return c.type === 'peak' ? v : -v;
  };

  const batch = new Float64Array(2 * k);
  for (let n = 0; n < k; n += 1) {
    batch[n] = Math.exp(x1[n]!);
    batch[k + n] = Math.exp(x2[n]!);
  }
  let response = sweepBatch(batch);
  for (let n = 0; n < k; n += 1) {
    v1[n] = value(response, n, n);
    v2[n] = value(response, n, k + n);
  }

  const step = new Float64Array(k);
  // Which of x1/x2 each candidate probes next: true for x1.
  const probesLow = new Uint8Array(k);
  for (let iteration = 0; iteration < GOLDEN_STEPS; iteration += 1) {
    for (let n = 0; n < k; n += 1) {
      if (v1[n]! >= v2[n]!) {
        // The extremum (maximum of the signed value) lies in [lo, x2].
        hi[n] = x2[n]!;
        x2[n] = x1[n]!;
        v2[n] = v1[n]!;
        x1[n] = hi[n]! - GOLDEN * (hi[n]! - lo[n]!);
        step[n] = Math.exp(x1[n]!);
        probesLow[n] = 1;
      } else {
        lo[n] = x1[n]!;
        x1[n] = x2[n]!;
        v1[n] = v2[n]!;
        x2[n] = lo[n]! + GOLDEN * (hi[n]! - lo[n]!);
        step[n] = Math.exp(x2[n]!);
        probesLow[n] = 0;
      }
    }
    response = sweepBatch(step);
    for (let n = 0; n < k; n += 1) {
      if (probesLow[n]) v1[n] = value(response, n, n);
      else v2[n] = value(response, n, n);
    }
  }

  return candidates.map((c, n) => {
    const useFirst = v1[n]! >= v2[n]!;
    const signed = useFirst ? v1[n]! : v2[n]!;
    return {
      curve: c.curve,
      type: c.type,
      frequencyHz: Math.exp(useFirst ? x1[n]! : x2[n]!),
      valueDb: c.type === 'peak' ? signed : -signed,
    };
  });
}
