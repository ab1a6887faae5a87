import type { MarginEvaluator, MarginOutcome } from './margin-evaluator.ts';

/**
 * The tightest judged margin at each evaluated point, over every comparison that covers it (the
 * detector and mask pairs): NaN where nothing is judged. Writes into `out` (one entry per point
 * of `evaluator.frequencyHz`).
 */
export function envelopeMargin(evaluator: MarginEvaluator, outcome: MarginOutcome, out: Float64Array = new Float64Array(evaluator.frequencyHz.length)): Float64Array {
  out.fill(Number.NaN);
  evaluator.comparisons.forEach((info, c) => {
    const margin = outcome.marginDb[c]!;
    for (let i = 0; i < info.count; i += 1) {
      if (!info.judged[i]) continue;
      const k = info.offset + i;
      if (!(margin[i]! >= out[k]!)) out[k] = margin[i]!;
    }
  });
  return out;
}

/** Where one scan's points start and end in the evaluated grid (an estimate is one segment). */
export function gridSegments(evaluator: MarginEvaluator): { offset: number; count: number }[] {
  return evaluator.segments.map((segment) => ({ offset: segment.offset, count: segment.count }));
}

/** A run of judged points below a threshold, in one segment of the grid. */
export interface MarginRun {
  readonly segment: number;
  /** Grid indices, first and last point of the run. */
  readonly first: number;
  readonly last: number;
  /** Grid index of the lowest margin in the run. */
  readonly worst: number;
}

/** Contiguous runs of points whose envelope margin is below `threshold`; unjudged points end a run. */
export function runsBelow(evaluator: MarginEvaluator, envelope: Float64Array, threshold: number): MarginRun[] {
  const runs: MarginRun[] = [];
  gridSegments(evaluator).forEach((segment, s) => {
    let first = -1;
    let worst = -1;
    const close = (last: number): void => {
      if (first >= 0) runs.push({ segment: s, first, last, worst });
      first = -1;
      worst = -1;
    };
    for (let k = segment.offset; k < segment.offset + segment.count; k += 1) {
      const m = envelope[k]!;
      if (m < threshold) {
        if (first < 0) first = k;
        if (worst < 0 || m < envelope[worst]!) worst = k;
      } else close(k - 1);
    }
    close(segment.offset + segment.count - 1);
  });
  return runs;
}
