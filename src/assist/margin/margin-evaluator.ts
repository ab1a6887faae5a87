import {
  allocateResponse,
  compileNetwork,
  createWorkspace,
  evaluateNetwork,
  type Network,
  type NetworkResponse,
  responseHead,
  type Workspace,
} from '../../engine/index.ts';
import type { Design, LimitMask, NoiseSource } from '../../model/design.ts';
import type { Attribution, Detector } from '../../model/emissions-schema.ts';
import { compareToMasks, type LevelSeries } from '../../spectrum/margin.ts';
import { estimateEmfs, estimateNoiseSource } from '../../spectrum/noise-estimate.ts';
import { baselineDesign } from '../../spectrum/prediction.ts';
import { analyzeEmissions } from '../../spectrum/emissions-analysis.ts';
import { maskCorners } from '../../spectrum/limit-mask.ts';
import { BAND_B_START_HZ, BAND_B_STOP_HZ, receiverViewInto } from '../../spectrum/receiver-view.ts';
import { reduceScan } from '../../spectrum/scan-reduction.ts';
import type { Scan, ScanTag } from '../../spectrum/spectrum-types.ts';
import type { AssistProblem } from './assist-problem.ts';

/**
 * The assistants' objective: the margin of a candidate design against the problem's limits, in
 * the check command's exact terms (docs/emissions.md), compiled once per problem so that a
 * candidate costs one engine pass on the noise's own frequencies and no allocation.
 *
 * - Scans: predicted = scan − 20·log10 |T_baseline / T_new| per mode, with T the in-circuit
 *   transfer; a scan of unknown mode takes its attribution (both: the smaller improvement).
 *   The baseline's transfer (or the bare source-to-receiver one) does not depend on the
 *   candidate, so it is computed once.
 * - Estimate: each line's spectral lines are |V_line from CM| + |V_line from DM| (in phase, the
 *   worst case), read as the CISPR 16-1-1 receiver reads them; the estimate's source impedances
 *   replace the design's, as in `predictFromEstimate`.
 *
 * "Judged" points are those with a limit, not at the noise floor, inside one of the problem's
 * bands: the check command passes when every band keeps the target margin, so the worst margin
 * here is taken over judged points and `meetsTarget` is exactly its pass.
 */

export interface ComparisonInfo {
  /** The level series: "line 1 scan, quasi-peak", "line 2, estimate". */
  readonly series: string;
  readonly seriesDetector: Detector;
  readonly maskId: string;
  readonly maskName: string;
  readonly maskDetector: Detector;
  /** A higher-reading detector judged against this limit (a peak trace against a quasi-peak limit). */
  readonly conservative: boolean;
  /** Where this comparison's points sit in the evaluated grid, and how many. */
  readonly offset: number;
  readonly count: number;
  readonly limitDbuV: Float64Array;
  /** 1 where the point counts for pass or fail: a limit applies, above the noise floor, inside a band. */
  readonly judged: Uint8Array;
  /** Band index per point, −1 outside every band (the first band that holds the point). */
  readonly band: Int16Array;
}

export interface MarginOutcome {
  /** True when at least one point was judged; a design with nothing judged never passes. */
  readonly judged: boolean;
  /** The lowest margin over judged points (dB), NaN when nothing was judged. */
  readonly worstMarginDb: number;
  readonly worstFrequencyHz: number;
  /** Which comparison holds the worst point, −1 when none. */
  readonly worstComparison: number;
  /** Per band, the lowest judged margin; NaN for a band with nothing judged. */
  readonly bandWorstDb: Float64Array;
  /** Per comparison, limit − predicted level over its points; NaN where no limit applies or at the floor. */
  readonly marginDb: readonly Float64Array[];
  /** Scans only: 20·log10 |T_baseline / T_new| per evaluated point, per mode (dB); NaN at the noise floor. */
  readonly improvementCmDb: Float64Array | undefined;
  readonly improvementDmDb: Float64Array | undefined;
  /** Estimate only: peak volts at each receiver from each mode's source, per evaluated point. */
  readonly estimateLines: EstimateLinePeaks | undefined;
}

export interface EstimateLinePeaks {
  readonly line1FromCm: Float64Array;
  readonly line1FromDm: Float64Array;
  readonly line2FromCm: Float64Array;
  readonly line2FromDm: Float64Array;
}

export interface MarginEvaluator {
  readonly problem: AssistProblem;
  /** Every frequency the noise is known at (scans one after another, or the estimate's harmonics). */
  readonly frequencyHz: Float64Array;
  readonly comparisons: readonly ComparisonInfo[];
  /** Where each scan's points lie in the grid (after the reduction to the receiver's resolution); the estimate is one segment. */
  readonly segments: readonly { readonly offset: number; readonly count: number; readonly tag: ScanTag | 'estimate' }[];
  /**
   * The margin of a candidate (same noise source and receivers as the problem's design; any
   * filter). The returned arrays are scratch, overwritten by the next call: copy what you keep.
   */
  evaluate(candidate: Design, attribution?: Attribution): MarginOutcome;
  /**
   * What no filter can change: the bands the noise does not cover (no judged point, or the points stop
   * short of an edge, as the check command decides it; src/spectrum/verdict.ts). With any band not
   * covered, no candidate passes: a pass needs evidence.
   */
  readonly coverage: { readonly uncoveredBands: readonly string[]; readonly reasons: readonly string[] };
  /** The check command's pass: every band covered, and the target margin met at every judged point. */
  meetsTarget(outcome: MarginOutcome): boolean;
}

const TAG_TEXT: Record<ScanTag, string> = {
  line1: 'line 1',
  line2: 'line 2',
  'common-mode': 'common mode',
  'differential-mode': 'differential mode',
  total: 'total',
};

interface ScanSegment {
  readonly scan: Scan;
  readonly offset: number;
  readonly count: number;
  /** The scan's own mode, or undefined for a scan of unknown mode (it takes the attribution). */
  readonly mode: 'common-mode' | 'differential-mode' | undefined;
  /** |T_baseline|² per mode at the scan's points. */
  readonly baseCm2: Float64Array;
  readonly baseDm2: Float64Array;
  readonly belowFloor: Uint8Array;
}

export function compileMarginEvaluator(problem: AssistProblem): MarginEvaluator {
  if (problem.noise.kind === 'estimate') return estimateEvaluator(problem, coverageOf(problem, [{ kind: 'estimate' }]));
  // The check command judges a scan at the receiver's resolution (scan-reduction.ts): the same points here.
  const edges = [BAND_B_START_HZ, BAND_B_STOP_HZ, ...problem.bands.flatMap((band) => [band.startHz, band.stopHz]), ...problem.masks.flatMap((mask) => [...maskCorners(mask)])];
  const scans = problem.noise.scans.map((scan) => reduceScan(scan, edges).scan);
  return scanEvaluator(problem, scans, coverageOf(problem, scans.map((scan) => ({ kind: 'scan' as const, scan }))));
}

/** Band coverage as the check command judges it, once per noise input (it does not depend on the filter). */
function coverageOf(problem: AssistProblem, inputs: readonly ({ kind: 'estimate' } | { kind: 'scan'; scan: Scan })[]): MarginEvaluator['coverage'] {
  const uncovered = new Set<string>();
  const reasons: string[] = [];
  for (const input of inputs) {
    const analysis = analyzeEmissions(problem.design, input, {
      masks: problem.masks,
      targetMarginDb: problem.targetMarginDb,
      attribution: problem.attribution,
      ...(problem.noiseFloorDbuV === undefined ? {} : { noiseFloorDbuV: problem.noiseFloorDbuV }),
    });
    for (const item of analysis.report.verdict.items) {
      if (item.status !== 'not-covered') continue;
      uncovered.add(item.name);
      reasons.push(`${item.name}: not covered: ${item.reason}`);
    }
  }
  return { uncoveredBands: [...uncovered], reasons };
}

/** One engine pass per candidate, reusing a workspace for every candidate of one topology. */
class NetworkRunner {
  private workspace: Workspace | undefined;
  private signature = '';
  private readonly response: NetworkResponse;
  constructor(
    private readonly frequencyHz: Float64Array,
    private readonly noiseSource: NoiseSource | undefined,
  ) {
    this.response = allocateResponse(frequencyHz.length, 0);
  }

  run(candidate: Design): NetworkResponse {
    const design = this.noiseSource ? { ...candidate, noiseSource: this.noiseSource } : candidate;
    const network = compileNetwork(design, []);
    const signature = topologySignature(network);
    if (!this.workspace || signature !== this.signature) {
      this.workspace = createWorkspace(network, this.frequencyHz.length);
      this.signature = signature;
    }
    this.response.flags.fill(0);
    evaluateNetwork(network, this.frequencyHz, this.workspace, this.response);
    return responseHead(this.response, this.frequencyHz.length);
  }
}

/** A workspace depends on the element count and which elements are coupled pairs, nothing else. */
function topologySignature(network: Network): string {
  return network.elements.map((e) => (e.kind === 'coupled-pair' ? 'c' : 't')).join('');
}

function magnitudeSquared(column: { re: Float64Array; im: Float64Array }, i: number): number {
  return column.re[i]! * column.re[i]! + column.im[i]! * column.im[i]!;
}

/** 10·log10 of a ratio of squared magnitudes, zeros handled as prediction.ts does. */
function ratioDb(numerator2: number, denominator2: number): number {
  if (numerator2 === 0 && denominator2 === 0) return 0;
  if (denominator2 === 0) return 400;
  if (numerator2 === 0) return -400;
  return 10 * Math.log10(numerator2 / denominator2);
}

function bandIndexOf(problem: AssistProblem, frequencyHz: number): number {
  for (let b = 0; b < problem.bands.length; b += 1) {
    const band = problem.bands[b]!;
    if (frequencyHz >= band.startHz && frequencyHz <= band.stopHz) return b;
  }
  return -1;
}

function comparisonInfo(
  problem: AssistProblem,
  series: LevelSeries,
  mask: LimitMask,
  conservative: boolean,
  offset: number,
  limitDbuV: Float64Array,
): ComparisonInfo {
  const count = series.frequencyHz.length;
  const judged = new Uint8Array(count);
  const band = new Int16Array(count);
  for (let i = 0; i < count; i += 1) {
    band[i] = bandIndexOf(problem, series.frequencyHz[i]!);
    judged[i] = !Number.isNaN(limitDbuV[i]!) && !series.excluded?.[i] && band[i]! >= 0 ? 1 : 0;
  }
  return {
    series: series.label,
    seriesDetector: series.detector,
    maskId: mask.id,
    maskName: mask.name,
    maskDetector: mask.detector,
    conservative,
    offset,
    count,
    limitDbuV,
    judged,
    band,
  };
}

/** Pair series with masks exactly as the margin table does (spectrum/margin.ts). */
function pairings(problem: AssistProblem, series: readonly LevelSeries[], offsets: readonly number[]): ComparisonInfo[] {
  const { comparisons } = compareToMasks(series, problem.masks);
  return comparisons.map((c) => {
    const index = series.findIndex((s) => s.label === c.series && s.detector === c.seriesDetector);
    const mask = problem.masks.find((m) => m.id === c.maskId)!;
    return comparisonInfo(problem, series[index]!, mask, c.conservative, offsets[index]!, c.limitDbuV);
  });
}

interface OutcomeScratch {
  readonly marginDb: Float64Array[];
  readonly bandWorstDb: Float64Array;
}

function scratchFor(comparisons: readonly ComparisonInfo[], bandCount: number): OutcomeScratch {
  return { marginDb: comparisons.map((c) => new Float64Array(c.count)), bandWorstDb: new Float64Array(bandCount) };
}

/** Worst judged margin over every comparison, and per band. */
function summarize(
  comparisons: readonly ComparisonInfo[],
  scratch: OutcomeScratch,
  frequencyHz: Float64Array,
): { judged: boolean; worstMarginDb: number; worstFrequencyHz: number; worstComparison: number } {
  scratch.bandWorstDb.fill(Number.NaN);
  let worst = Number.POSITIVE_INFINITY;
  let worstFrequencyHz = Number.NaN;
  let worstComparison = -1;
  for (let c = 0; c < comparisons.length; c += 1) {
    const info = comparisons[c]!;
    const margin = scratch.marginDb[c]!;
    for (let i = 0; i < info.count; i += 1) {
      if (!info.judged[i]) continue;
      const m = margin[i]!;
      const band = info.band[i]!;
      const bandWorst = scratch.bandWorstDb[band]!;
      if (!(m >= bandWorst)) scratch.bandWorstDb[band] = m;
      if (m < worst) {
        worst = m;
        worstFrequencyHz = frequencyHz[info.offset + i]!;
        worstComparison = c;
      }
    }
  }
  const judged = worstComparison >= 0;
  return { judged, worstMarginDb: judged ? worst : Number.NaN, worstFrequencyHz, worstComparison };
}

function scanEvaluator(problem: AssistProblem, scans: readonly Scan[], coverage: MarginEvaluator['coverage']): MarginEvaluator {
  const total = scans.reduce((sum, scan) => sum + scan.frequencyHz.length, 0);
  const frequencyHz = new Float64Array(total);
  const segments: ScanSegment[] = [];
  let offset = 0;
  for (const scan of scans) {
    frequencyHz.set(scan.frequencyHz, offset);
    const count = scan.frequencyHz.length;
    const mode = scan.tag === 'common-mode' || scan.tag === 'differential-mode' ? scan.tag : undefined;
    segments.push({ scan, offset, count, mode, baseCm2: new Float64Array(count), baseDm2: new Float64Array(count), belowFloor: floorMask(scan, problem.noiseFloorDbuV) });
    offset += count;
  }

  // The baseline: the filter fitted when the scan was taken, or none (the bare transfer, which
  // any candidate's response carries as well).
  const baseline = baselineDesign(problem.design);
  const baseResponse = new NetworkRunner(frequencyHz, undefined).run(baseline ?? problem.design);
  for (const segment of segments) {
    for (let i = 0; i < segment.count; i += 1) {
      const k = segment.offset + i;
      segment.baseCm2[i] = baseline ? magnitudeSquared(baseResponse.cmFromCm, k) : magnitudeSquared(baseResponse.bareCmFromCm, k);
      segment.baseDm2[i] = baseline ? magnitudeSquared(baseResponse.dmFromDm, k) : magnitudeSquared(baseResponse.bareDmFromDm, k);
    }
  }

  // Series as the check command names them; with several scans each gets its own label.
  const series: LevelSeries[] = [];
  const seriesOffsets: number[] = [];
  const seriesTrace: { segment: number; trace: number }[] = [];
  segments.forEach((segment, s) => {
    const name = scans.length > 1 ? `${TAG_TEXT[segment.scan.tag]} (${segment.scan.name}), predicted` : `${TAG_TEXT[segment.scan.tag]}, predicted`;
    segment.scan.traces.forEach((trace, t) => {
      series.push({ label: name, detector: trace.detector, frequencyHz: segment.scan.frequencyHz, levelDbuV: trace.levelDbuV, excluded: segment.belowFloor });
      seriesOffsets.push(segment.offset);
      seriesTrace.push({ segment: s, trace: t });
    });
  });
  const comparisons = pairings(problem, series, seriesOffsets);
  const comparisonTrace = comparisons.map((c) => seriesTrace[series.findIndex((s) => s.label === c.series && s.detector === c.seriesDetector)]!);

  const runner = new NetworkRunner(frequencyHz, undefined);
  const scratch = scratchFor(comparisons, problem.bands.length);
  const improvementCmDb = new Float64Array(total);
  const improvementDmDb = new Float64Array(total);
  const applied = new Float64Array(total);

  return {
    problem,
    frequencyHz,
    comparisons,
    segments: segments.map((segment) => ({ offset: segment.offset, count: segment.count, tag: segment.scan.tag })),
    evaluate(candidate, attribution = problem.attribution) {
      const response = runner.run(candidate);
      for (const segment of segments) {
        const chosen = segment.mode ?? attribution;
        for (let i = 0; i < segment.count; i += 1) {
          const k = segment.offset + i;
          // The receiver's floor carries no margin: skip its logarithms (most of a line scan's points).
          if (segment.belowFloor[i]) {
            improvementCmDb[k] = Number.NaN;
            improvementDmDb[k] = Number.NaN;
            applied[k] = Number.NaN;
            continue;
          }
          const cm = ratioDb(segment.baseCm2[i]!, magnitudeSquared(response.cmFromCm, k));
          const dm = ratioDb(segment.baseDm2[i]!, magnitudeSquared(response.dmFromDm, k));
          improvementCmDb[k] = cm;
          improvementDmDb[k] = dm;
          applied[k] = chosen === 'common-mode' ? cm : chosen === 'differential-mode' ? dm : Math.min(cm, dm);
        }
      }
      for (let c = 0; c < comparisons.length; c += 1) {
        const info = comparisons[c]!;
        const { segment: s, trace: t } = comparisonTrace[c]!;
        const segment = segments[s]!;
        const level = segment.scan.traces[t]!.levelDbuV;
        const margin = scratch.marginDb[c]!;
        for (let i = 0; i < info.count; i += 1) {
          margin[i] = segment.belowFloor[i] ? Number.NaN : info.limitDbuV[i]! - (level[i]! - applied[segment.offset + i]!);
        }
      }
      return {
        ...summarize(comparisons, scratch, frequencyHz),
        bandWorstDb: scratch.bandWorstDb,
        marginDb: scratch.marginDb,
        improvementCmDb,
        improvementDmDb,
        estimateLines: undefined,
      };
    },
    coverage,
    meetsTarget: (outcome) => coverage.uncoveredBands.length === 0 && outcome.judged && outcome.worstMarginDb >= problem.targetMarginDb,
  };
}

function floorMask(scan: Scan, floor: number | undefined): Uint8Array {
  const n = scan.frequencyHz.length;
  const below = new Uint8Array(n);
  if (floor === undefined) return below;
  for (let i = 0; i < n; i += 1) {
    let quiet = true;
    for (const trace of scan.traces) if (trace.levelDbuV[i]! > floor) quiet = false;
    below[i] = quiet ? 1 : 0;
  }
  return below;
}

function estimateEvaluator(problem: AssistProblem, coverage: MarginEvaluator['coverage']): MarginEvaluator {
  const estimate = problem.design.emissions!.estimate!;
  const emfs = estimateEmfs(estimate, { stopHz: problem.design.frequencyPlan.stopHz });
  const frequencyHz = emfs.frequencyHz;
  const n = frequencyHz.length;
  const noiseSource = estimateNoiseSource(problem.design, estimate);
  const lines: EstimateLinePeaks = {
    line1FromCm: new Float64Array(n),
    line1FromDm: new Float64Array(n),
    line2FromCm: new Float64Array(n),
    line2FromDm: new Float64Array(n),
  };
  const peak1 = new Float64Array(n);
  const peak2 = new Float64Array(n);
  const reading1 = new Float64Array(n);
  const reading2 = new Float64Array(n);

  // Every detector reads a steady line alike, so each line's reading meets every mask with the
  // mask's own detector; the series list mirrors analyzeEmissions for the pairing.
  const detectors: Detector[] = ['peak', 'quasi-peak', 'average'];
  const series: LevelSeries[] = [];
  for (const [label, levels] of [
    ['line 1, estimate', reading1],
    ['line 2, estimate', reading2],
  ] as const) {
    for (const detector of detectors) series.push({ label, detector, frequencyHz, levelDbuV: levels });
  }
  const comparisons = pairings(problem, series, series.map(() => 0));
  const readingOf = comparisons.map((c) => (c.series.startsWith('line 1') ? reading1 : reading2));
  const runner = new NetworkRunner(frequencyHz, noiseSource);
  const scratch = scratchFor(comparisons, problem.bands.length);
  const magnitude = (column: { re: Float64Array; im: Float64Array }, i: number): number => Math.sqrt(magnitudeSquared(column, i));

  return {
    problem,
    frequencyHz,
    comparisons,
    segments: [{ offset: 0, count: n, tag: 'estimate' }],
    evaluate(candidate) {
      if (n > 0) {
        const response = runner.run(candidate);
        for (let i = 0; i < n; i += 1) {
          const ecm = emfs.commonModeEmfV[i]!;
          const edm = emfs.differentialModeEmfV[i]!;
          lines.line1FromCm[i] = magnitude(response.line1FromCm, i) * ecm;
          lines.line1FromDm[i] = magnitude(response.line1FromDm, i) * edm;
          lines.line2FromCm[i] = magnitude(response.line2FromCm, i) * ecm;
          lines.line2FromDm[i] = magnitude(response.line2FromDm, i) * edm;
          peak1[i] = lines.line1FromCm[i]! + lines.line1FromDm[i]!;
          peak2[i] = lines.line2FromCm[i]! + lines.line2FromDm[i]!;
        }
        receiverViewInto(frequencyHz, peak1, { readingDbuV: reading1 });
        receiverViewInto(frequencyHz, peak2, { readingDbuV: reading2 });
      }
      for (let c = 0; c < comparisons.length; c += 1) {
        const info = comparisons[c]!;
        const reading = readingOf[c]!;
        const margin = scratch.marginDb[c]!;
        for (let i = 0; i < n; i += 1) margin[i] = info.limitDbuV[i]! - reading[i]!;
      }
      return {
        ...summarize(comparisons, scratch, frequencyHz),
        bandWorstDb: scratch.bandWorstDb,
        marginDb: scratch.marginDb,
        improvementCmDb: undefined,
        improvementDmDb: undefined,
        estimateLines: lines,
      };
    },
    coverage,
    meetsTarget: (outcome) => coverage.uncoveredBands.length === 0 && outcome.judged && outcome.worstMarginDb >= problem.targetMarginDb,
  };
}
