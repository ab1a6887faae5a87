import type { Band, LimitMask } from '../model/design.ts';
import type { Detector } from '../model/emissions-schema.ts';
import { limitOnGrid } from './limit-mask.ts';

/**
 * Margin = limit − level, per frequency, for every level series (a predicted trace on one line
 * or in one mode) against every mask it may be compared with, and the tables an engineer reads:
 * worst margin overall and per band, the worst local peaks, the failing frequency ranges, pass
 * or fail against the target margin, and the attenuation still missing per mode.
 */

/** One series of levels to judge: a detector's trace as predicted, on a line or in a mode. */
export interface LevelSeries {
  readonly label: string;
  readonly detector: Detector;
  readonly frequencyHz: Float64Array;
  readonly levelDbuV: Float64Array;
  /** 1 at points to leave out (the receiver's noise floor). */
  readonly excluded?: Uint8Array;
}

/** Peak ≥ quasi-peak ≥ average for any signal; equal for an unmodulated sine. */
const DETECTOR_RANK: Record<Detector, number> = { peak: 2, 'quasi-peak': 1, average: 0 };

export interface Comparison {
  readonly series: string;
  readonly seriesDetector: Detector;
  readonly maskId: string;
  readonly maskName: string;
  readonly maskDetector: Detector;
  /** True when the series' detector reads higher than the mask's (a peak scan against a QP or AV limit). */
  readonly conservative: boolean;
  readonly frequencyHz: Float64Array;
  readonly limitDbuV: Float64Array;
  /** limit − level; NaN where the mask does not apply or the point is excluded. */
  readonly marginDb: Float64Array;
}

export interface MarginPoint {
  readonly frequencyHz: number;
  readonly levelDbuV: number;
  readonly limitDbuV: number;
  readonly marginDb: number;
  readonly series: string;
  readonly maskName: string;
  readonly conservative: boolean;
}

export interface BandResult {
  readonly name: string;
  readonly startHz: number;
  readonly stopHz: number;
  /** The lowest margin in the band, or undefined when no mask covers any point of it. */
  readonly worst: MarginPoint | undefined;
  readonly pass: boolean | undefined;
}

export interface FailingRange {
  readonly startHz: number;
  readonly stopHz: number;
  readonly worst: MarginPoint;
}

export interface MarginReport {
  readonly targetMarginDb: number;
  readonly comparisons: readonly Comparison[];
  readonly worst: MarginPoint | undefined;
  readonly bands: readonly BandResult[];
  /** The N local minima of margin (peaks of the level relative to the limit), lowest first. */
  readonly worstPeaks: readonly MarginPoint[];
  /** Contiguous frequency ranges where the margin is below the target, per comparison. */
  readonly failingRanges: readonly FailingRange[];
  /** Every band with a mask meets the target margin. */
  readonly pass: boolean;
  readonly notes: readonly string[];
}

export interface MarginOptions {
  readonly targetMarginDb: number;
  readonly bands: readonly Band[];
  readonly worstPeakCount?: number;
}

/**
 * Pair every series with the masks it can be judged against: the mask's own detector, or a
 * detector that reads at least as high (conservative, and said so). A series that reads lower
 * than the mask's detector (an average scan against a quasi-peak limit) would understate the
 * problem and is not compared; a note says which pairs were skipped.
 */
export function compareToMasks(series: readonly LevelSeries[], masks: readonly LimitMask[]): { comparisons: Comparison[]; notes: string[] } {
  const comparisons: Comparison[] = [];
  const notes: string[] = [];
  for (const mask of masks) {
    const exact = series.filter((s) => s.detector === mask.detector);
    const higher = series.filter((s) => DETECTOR_RANK[s.detector] > DETECTOR_RANK[mask.detector]);
    // Prefer the matching detector; fall back to the lowest detector that still reads higher.
    const lowestHigher = Math.min(...higher.map((s) => DETECTOR_RANK[s.detector]));
    const chosen = exact.length > 0 ? exact : higher.filter((s) => DETECTOR_RANK[s.detector] === lowestHigher);
    if (chosen.length === 0) {
      notes.push(`${mask.name}: no ${mask.detector} or higher-reading trace to compare; not judged`);
      continue;
    }
    for (const s of chosen) {
      const limitDbuV = limitOnGrid(mask, s.frequencyHz);
      const marginDb = new Float64Array(s.frequencyHz.length);
      for (let i = 0; i < marginDb.length; i += 1) {
        marginDb[i] = s.excluded?.[i] ? Number.NaN : limitDbuV[i]! - s.levelDbuV[i]!;
      }
      const conservative = s.detector !== mask.detector;
      if (conservative) {
        notes.push(`${mask.name} (${mask.detector}) judged against the ${s.detector} trace of ${s.label}: conservative, a ${s.detector} reading is never below a ${mask.detector} one`);
      }
      comparisons.push({
        series: s.label,
        seriesDetector: s.detector,
        maskId: mask.id,
        maskName: mask.name,
        maskDetector: mask.detector,
        conservative,
        frequencyHz: s.frequencyHz,
        limitDbuV,
        marginDb,
      });
    }
  }
  return { comparisons, notes };
}

function pointOf(comparison: Comparison, levels: Float64Array, i: number): MarginPoint {
  return {
    frequencyHz: comparison.frequencyHz[i]!,
    levelDbuV: levels[i]!,
    limitDbuV: comparison.limitDbuV[i]!,
    marginDb: comparison.marginDb[i]!,
    series: comparison.series,
    maskName: comparison.maskName,
    conservative: comparison.conservative,
  };
}

export function marginReport(series: readonly LevelSeries[], masks: readonly LimitMask[], options: MarginOptions): MarginReport {
  const { comparisons, notes } = compareToMasks(series, masks);
  const levelsOf = new Map(series.map((s) => [s.label + '\u0000' + s.detector, s.levelDbuV]));
  const levels = (c: Comparison): Float64Array => levelsOf.get(c.series + '\u0000' + c.seriesDetector)!;
  const target = options.targetMarginDb;

  let worst: MarginPoint | undefined;
  const bands: { name: string; startHz: number; stopHz: number; worst: MarginPoint | undefined }[] = options.bands.map((band) => ({
    ...band,
    worst: undefined,
  }));
  // The worst peaks, kept sorted and bounded as they are found: a noisy million-point scan has
  // hundreds of thousands of local minima, and none of the others is ever shown.
  const peakCount = options.worstPeakCount ?? 10;
  const peaks: MarginPoint[] = [];
  const failingRanges: FailingRange[] = [];

  for (const c of comparisons) {
    const m = c.marginDb;
    const level = levels(c);
    let rangeStart = -1;
    let rangeWorst: MarginPoint | undefined;
    for (let i = 0; i < m.length; i += 1) {
      const margin = m[i]!;
      if (Number.isNaN(margin)) {
        if (rangeStart >= 0 && rangeWorst) failingRanges.push({ startHz: c.frequencyHz[rangeStart]!, stopHz: c.frequencyHz[i - 1]!, worst: rangeWorst });
        rangeStart = -1;
        rangeWorst = undefined;
        continue;
      }
      if (!worst || margin < worst.marginDb) worst = pointOf(c, level, i);
      const f = c.frequencyHz[i]!;
      for (const band of bands) {
        if (f >= band.startHz && f <= band.stopHz && (!band.worst || margin < band.worst.marginDb)) band.worst = pointOf(c, level, i);
      }
      // A local minimum of margin: a peak of the level against its limit.
      const before = i > 0 ? m[i - 1]! : Number.POSITIVE_INFINITY;
      const after = i + 1 < m.length ? m[i + 1]! : Number.POSITIVE_INFINITY;
      const isPeak = margin <= (Number.isNaN(before) ? Infinity : before) && margin < (Number.isNaN(after) ? Infinity : after);
      if (isPeak && (peaks.length < peakCount || margin < peaks[peaks.length - 1]!.marginDb)) {
        let at = peaks.length;
        while (at > 0 && peaks[at - 1]!.marginDb > margin) at -= 1;
        peaks.splice(at, 0, pointOf(c, level, i));
        if (peaks.length > peakCount) peaks.pop();
      }
      if (margin < target) {
        if (rangeStart < 0) rangeStart = i;
        if (!rangeWorst || margin < rangeWorst.marginDb) rangeWorst = pointOf(c, level, i);
      } else if (rangeStart >= 0 && rangeWorst) {
        failingRanges.push({ startHz: c.frequencyHz[rangeStart]!, stopHz: c.frequencyHz[i - 1]!, worst: rangeWorst });
        rangeStart = -1;
        rangeWorst = undefined;
      }
    }
    if (rangeStart >= 0 && rangeWorst) failingRanges.push({ startHz: c.frequencyHz[rangeStart]!, stopHz: c.frequencyHz[m.length - 1]!, worst: rangeWorst });
  }

  const judged: BandResult[] = bands.map((band) => ({ ...band, pass: band.worst === undefined ? undefined : band.worst.marginDb >= target }));
  failingRanges.sort((a, b) => a.startHz - b.startHz);
  if (comparisons.length === 0) notes.push('no mask could be applied: nothing was judged');
  return {
    targetMarginDb: target,
    comparisons,
    worst,
    bands: judged,
    worstPeaks: peaks,
    failingRanges,
    pass: comparisons.length > 0 && judged.every((band) => band.pass !== false),
    notes,
  };
}

/**
 * The attenuation still missing: unfiltered level − limit + target margin, clamped at 0, per
 * frequency, worst over the masks the series may be judged against. NaN where no mask applies or
 * the point is excluded (the noise floor carries no information about the noise).
 */
export function requiredAttenuation(unfiltered: readonly LevelSeries[], masks: readonly LimitMask[], targetMarginDb: number): Float64Array | undefined {
  const { comparisons } = compareToMasks(unfiltered, masks);
  if (comparisons.length === 0) return undefined;
  const n = comparisons[0]!.frequencyHz.length;
  const required = new Float64Array(n).fill(Number.NaN);
  for (const c of comparisons) {
    for (let i = 0; i < n; i += 1) {
      const margin = c.marginDb[i]!;
      if (Number.isNaN(margin)) continue;
      const need = Math.max(0, targetMarginDb - margin);
      if (!(required[i]! >= need)) required[i] = need;
    }
  }
  return required;
}
