import type { Band, LimitMask } from '../model/design.ts';
import type { Detector } from '../model/emissions-schema.ts';
import { formatQuantity } from '../model/units.ts';
import { limitOnGrid } from './limit-mask.ts';
import { type ItemStatus, judge, type JudgedItem, type Verdict } from './verdict.ts';

/**
 * Margin = limit − level, per frequency, for every level series (a predicted trace on one line
 * or in one mode) against every mask it may be compared with, and the tables an engineer reads:
 * worst margin overall and per band, the worst local peaks, the failing frequency ranges, the
 * verdict against the target margin with the evidence for it (verdict.ts: a band passes only when
 * judged points cover it), and the attenuation still missing per mode.
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

/**
 * One band of the margin table, judged: pass, fail, or not covered (no judged point in it, or judged
 * points that do not reach its edges). A judged point is a frequency in the band where a limit
 * applies and the level is not left out (below the noise floor): it has a margin.
 */
export interface BandResult extends JudgedItem {
  readonly startHz: number;
  readonly stopHz: number;
  /** The lowest margin in the band, or undefined when no point of it was judged. */
  readonly worst: MarginPoint | undefined;
  /** Points in the band where a limit applies: the judged points and those left out at the noise floor. */
  readonly coveredPoints: number;
  /** The lowest and highest covered frequency in the band; undefined when none is covered. */
  readonly coveredFromHz: number | undefined;
  readonly coveredToHz: number | undefined;
  /** true for a pass, false for a fail, undefined when not covered (the status says it in full). */
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
  /** Pass, fail (a band failed or is not covered) or refused (nothing judged), with the reasons. */
  readonly verdict: Verdict<BandResult>;
  /** verdict.status === 'pass': every band is covered by judged points and keeps the target margin. */
  readonly pass: boolean;
  readonly notes: readonly string[];
}

/**
 * How the levels sample the spectrum, which decides what "covers a band" means:
 * - continuous (a scan): the judged points must reach both edges of the band (within two of their
 *   own average steps, at least 1 %), since what lies beyond the last point was not measured;
 * - lines (an estimate's harmonics): between lines there is no emission, so a band is covered when
 *   it holds a judged line and the lines were worked out up to the band's top (`upToHz`).
 */
export type LevelSampling = { readonly kind: 'continuous' } | { readonly kind: 'lines'; readonly upToHz: number };

export interface MarginOptions {
  readonly targetMarginDb: number;
  readonly bands: readonly Band[];
  readonly worstPeakCount?: number;
  /** Default continuous. */
  readonly sampling?: LevelSampling;
  /** What the levels are, for the reasons ("the scan", "the estimate"); default "the levels". */
  readonly source?: string;
  /** Said with the verdict when it is not a pass: what may explain it (the scan reader's warnings). */
  readonly hints?: readonly string[];
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
        notes.push(`${mask.name} (${mask.detector}) judged against the ${s.detector} trace of ${s.label}: conservative, a ${s.detector} reading is never below ${mask.detector === 'average' ? 'an' : 'a'} ${mask.detector} one`);
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

  failingRanges.sort((a, b) => a.startHz - b.startHz);
  if (comparisons.length === 0) notes.push('no mask could be applied: nothing was judged');
  const verdict = judgeBands(series, masks, comparisons, bands, options);
  return {
    targetMarginDb: target,
    comparisons,
    worst,
    bands: verdict.items,
    worstPeaks: peaks,
    failingRanges,
    verdict,
    pass: verdict.status === 'pass',
    notes,
  };
}

/** A band edge this close (as a frequency ratio) to a judged point is reached. */
const EDGE_TOLERANCE = 1.01;

const hz = (f: number): string => formatQuantity(f, 'Hz', 6);
const db = (x: number): string => `${x.toFixed(1)} dB`;

/** Per frequency axis: where a limit applies, and where a margin was taken. */
interface AxisMarks {
  readonly axis: Float64Array;
  readonly limited: Uint8Array;
  readonly judged: Uint8Array;
  /** Judged points already counted in some band, so that a point on a band edge counts once overall. */
  readonly counted: Uint8Array;
}

function axisMarks(comparisons: readonly Comparison[]): AxisMarks[] {
  const byAxis = new Map<Float64Array, AxisMarks>();
  for (const c of comparisons) {
    let marks = byAxis.get(c.frequencyHz);
    if (!marks) {
      const n = c.frequencyHz.length;
      marks = { axis: c.frequencyHz, limited: new Uint8Array(n), judged: new Uint8Array(n), counted: new Uint8Array(n) };
      byAxis.set(c.frequencyHz, marks);
    }
    const { limited, judged } = marks;
    for (let i = 0; i < c.marginDb.length; i += 1) {
      if (!Number.isNaN(c.limitDbuV[i]!)) limited[i] = 1;
      if (!Number.isNaN(c.marginDb[i]!)) judged[i] = 1;
    }
  }
  return [...byAxis.values()];
}

/** The first index of a rising axis at or above `f`. */
function lowerBound(axis: Float64Array, f: number): number {
  let lo = 0;
  let hi = axis.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (axis[mid]! < f) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The first index of a rising axis above `f`. */
function upperBound(axis: Float64Array, f: number): number {
  let lo = 0;
  let hi = axis.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (axis[mid]! <= f) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

interface BandEvidence {
  /** Points of the levels in the band. */
  inBand: number;
  /** Of those, points where a limit applies: the coverage, whose span must reach the band's edges. */
  limited: number;
  /** Of those, points with a margin (not left out at the noise floor): the judged points. */
  judged: number;
  /** The lowest and highest covered frequency. */
  first: number;
  last: number;
}

/**
 * Each band's status from its evidence, and the verdict over all of them. The worst point per band
 * was found by the caller; here each band counts its judged points and their span.
 */
function judgeBands(
  series: readonly LevelSeries[],
  masks: readonly LimitMask[],
  comparisons: readonly Comparison[],
  bands: readonly { name: string; startHz: number; stopHz: number; worst: MarginPoint | undefined }[],
  options: MarginOptions,
): Verdict<BandResult> {
  const target = options.targetMarginDb;
  const sampling = options.sampling ?? { kind: 'continuous' };
  const source = options.source ?? 'the levels';
  const marks = axisMarks(comparisons);
  // The axes of every series, for "no point in this band" even where no comparison was made.
  const axes = [...new Set(series.map((s) => s.frequencyHz))];
  let judgedOverall = 0;

  const results = bands.map((band): BandResult => {
    const evidence: BandEvidence = { inBand: 0, limited: 0, judged: 0, first: Number.NaN, last: Number.NaN };
    for (const axis of axes) {
      const from = lowerBound(axis, band.startHz);
      const end = upperBound(axis, band.stopHz);
      evidence.inBand += end - from;
      const m = marks.find((mark) => mark.axis === axis);
      if (!m) continue;
      for (let i = from; i < end; i += 1) {
        if (!m.limited[i]) continue;
        // Covered: measured where a limit applies (a point at the noise floor was measured too).
        evidence.limited += 1;
        const f = axis[i]!;
        if (!(f >= evidence.first)) evidence.first = f;
        if (!(f <= evidence.last)) evidence.last = f;
        if (!m.judged[i]) continue;
        evidence.judged += 1;
        if (!m.counted[i]) {
          m.counted[i] = 1;
          judgedOverall += 1;
        }
      }
    }
    const { status, reason } = bandStatus(band, evidence, target, sampling, source, masks.length > 0 && comparisons.length > 0);
    const covered = evidence.limited > 0;
    return {
      name: band.name,
      startHz: band.startHz,
      stopHz: band.stopHz,
      status,
      judgedPoints: evidence.judged,
      reason,
      worst: band.worst,
      coveredPoints: evidence.limited,
      coveredFromHz: covered ? evidence.first : undefined,
      coveredToHz: covered ? evidence.last : undefined,
      pass: status === 'pass' ? true : status === 'fail' ? false : undefined,
    };
  });

  const refusals: string[] = [];
  if (masks.length === 0) refusals.push('no limit mask to judge against');
  else if (comparisons.length === 0) refusals.push('no trace could be compared with any limit (see the notes on detectors)');
  else if (judgedOverall === 0) refusals.push(`nothing was judged: ${nothingJudged(series, bands, source, sampling)}`);
  return judge(results, { refusals, judgedPoints: judgedOverall, hints: options.hints ?? [] });
}

function bandStatus(
  band: { startHz: number; stopHz: number; worst: MarginPoint | undefined },
  evidence: BandEvidence,
  target: number,
  sampling: LevelSampling,
  source: string,
  anyComparison: boolean,
): { status: ItemStatus; reason: string } {
  const { inBand, limited, judged, first, last } = evidence;
  const point = sampling.kind === 'lines' ? 'spectral line' : 'point';
  if (judged === 0) {
    if (inBand === 0) return { status: 'not-covered', reason: `${source} has no ${point} in this band` };
    if (!anyComparison || limited === 0) {
      return { status: 'not-covered', reason: 'no limit line applies in this band: add one that does, or leave the band out of emissions.bands' };
    }
    return { status: 'not-covered', reason: `every ${point} here is at or below the noise floor, so none carries a margin` };
  }
  const worst = band.worst!;
  const floorPoints = limited - judged;
  const atFloor = floorPoints > 0 ? ` (and ${floorPoints} at the noise floor)` : '';
  const span = `${judged} ${point}${judged === 1 ? '' : 's'} judged${atFloor}, covering ${hz(first)} to ${hz(last)}`;
  const at = `worst margin ${db(worst.marginDb)} at ${hz(worst.frequencyHz)} (${worst.maskName}; ${worst.series})`;
  if (worst.marginDb < target) {
    const how = worst.marginDb < 0 ? 'over the limit' : `below the ${target} dB target`;
    return { status: 'fail', reason: `${at}, ${how}; ${span}` };
  }
  if (sampling.kind === 'lines') {
    if (sampling.upToHz * EDGE_TOLERANCE < band.stopHz) {
      return { status: 'not-covered', reason: `${source} was worked out only up to ${hz(sampling.upToHz)}, below the band's top; ${span}` };
    }
    return { status: 'pass', reason: `${at}; ${span}` };
  }
  // Continuous levels must reach both edges: two average steps of their own, at least 1 %.
  const tolerance = limited >= 2 ? Math.max(EDGE_TOLERANCE, (last / first) ** (2 / (limited - 1))) : EDGE_TOLERANCE;
  const short: string[] = [];
  if (first > band.startHz * tolerance) short.push(`lower edge (${hz(band.startHz)})`);
  if (last * tolerance < band.stopHz) short.push(`upper edge (${hz(band.stopHz)})`);
  if (short.length > 0) return { status: 'not-covered', reason: `${span} only: ${source} does not reach the band's ${short.join(' or ')}` };
  return { status: 'pass', reason: `${at}; ${span}` };
}

/** Why no point was judged anywhere: where the levels lie against the bands. */
function nothingJudged(
  series: readonly LevelSeries[],
  bands: readonly { startHz: number; stopHz: number }[],
  source: string,
  sampling: LevelSampling,
): string {
  let low = Number.POSITIVE_INFINITY;
  let high = Number.NEGATIVE_INFINITY;
  for (const s of series) {
    const f = s.frequencyHz;
    if (f.length === 0) continue;
    low = Math.min(low, f[0]!);
    high = Math.max(high, f[f.length - 1]!);
  }
  const bandLow = Math.min(...bands.map((b) => b.startHz));
  const bandHigh = Math.max(...bands.map((b) => b.stopHz));
  const bandsText = bands.length === 0 ? 'there are no bands' : `the bands span ${hz(bandLow)} to ${hz(bandHigh)}`;
  if (!Number.isFinite(low)) return `${source} holds no level at all`;
  const where = `${source} spans ${hz(low)} to ${hz(high)}, ${bandsText}`;
  const point = sampling.kind === 'lines' ? 'spectral line' : 'point';
  if (sampling.kind === 'continuous' && high < bandLow) return `no ${point} falls in any band: ${where}; is the frequency unit right (a file in kHz or MHz read as Hz)?`;
  if (sampling.kind === 'continuous' && low > bandHigh) return `no ${point} falls in any band: ${where}; is the frequency unit right (a file in Hz read as kHz or MHz)?`;
  if (high < bandLow || low > bandHigh) return `no ${point} falls in any band: ${where}`;
  return `no ${point} in any band has both a limit and a level above the noise floor (${where})`;
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
