import { type AssistProblem } from '../margin/assist-problem.ts';
import { envelopeMargin } from '../margin/envelope.ts';
import { compileMarginEvaluator, type MarginEvaluator } from '../margin/margin-evaluator.ts';
import { applyFactors, drawSample, type ToleranceSettings, type VariedPart, variedParts } from './tolerance-model.ts';

/**
 * The Monte Carlo yield run, split into independent chunks of samples (docs/assistants.md,
 * "Tolerance yield"). `prepareYield` compiles the judge once per worker; `runYieldChunk` draws and
 * judges samples [start, start + count) — each sample from its own generator, so chunks can run in
 * any order on any number of workers; `mergeYield` puts the chunks back in sample order and
 * computes the distribution, the yield, the 5th-percentile curve and the most influential parts.
 */

export interface YieldSettings extends ToleranceSettings {
  /** How many samples (default 2000). */
  readonly samples?: number;
  /** The run's seed (default 1): the same seed gives the same samples. */
  readonly seed?: number;
}

export interface YieldContext {
  readonly problem: AssistProblem;
  readonly evaluator: MarginEvaluator;
  readonly parts: readonly VariedPart[];
  readonly samples: number;
  readonly seed: number;
  /** Plot bins of the frequency axis: every judged point goes into one bin. */
  readonly bins: PlotBins;
}

export interface PlotBins {
  /** Bin centre frequencies (Hz) and, per evaluated grid point, its bin (−1: not judged). */
  readonly frequencyHz: Float64Array;
  readonly binOf: Int32Array;
}

export interface YieldChunk {
  readonly start: number;
  readonly count: number;
  /** Worst judged margin per sample, dB (NaN: nothing judged). */
  readonly worstMarginDb: Float64Array;
  /** Per sample, each varied part's factor on its main value (count × parts, sample-major). */
  readonly factors: Float64Array;
  /** Per sample, the lowest envelope margin in each plot bin (count × bins, sample-major), dB. */
  readonly binMarginDb: Float32Array;
}

export interface Histogram {
  /** Bin edges (one more than counts), dB. */
  readonly edgesDb: Float64Array;
  readonly counts: Uint32Array;
}

export interface PartInfluence {
  readonly elementId: string;
  readonly label: string;
  readonly percent: number;
  readonly distribution: 'uniform' | 'normal';
  readonly source: 'element' | 'default';
  readonly hasPermeabilityBand: boolean;
  /** Pearson correlation of the part's factor with the worst margin (0 when either does not vary). */
  readonly correlation: number;
  /** Least-squares slope: dB of worst margin per percent of the part's value. */
  readonly slopeDbPerPercent: number;
}

export interface YieldResult {
  readonly samples: number;
  readonly seed: number;
  readonly targetMarginDb: number;
  /** Samples judged at all; a sample with nothing judged never passes. */
  readonly judgedSamples: number;
  readonly passingSamples: number;
  /** passing / samples. */
  readonly yieldFraction: number;
  /** The nominal design's worst margin. */
  readonly nominalMarginDb: number;
  readonly worstMarginDb: Float64Array;
  readonly statistics: { readonly minimumDb: number; readonly p5Db: number; readonly medianDb: number; readonly p95Db: number; readonly maximumDb: number; readonly spreadDb: number };
  readonly histogram: Histogram;
  /** Per plot bin: the nominal margin, its 5th percentile over the samples, the tightest limit, and the level that 95 % of units stay below (limit − 5th-percentile margin). */
  readonly curve: {
    readonly frequencyHz: Float64Array;
    readonly nominalMarginDb: Float64Array;
    readonly marginP5Db: Float64Array;
    readonly limitDbuV: Float64Array;
    readonly levelP95DbuV: Float64Array;
  };
  readonly parts: readonly PartInfluence[];
  readonly notes: readonly string[];
}

export const DEFAULT_SAMPLES = 2000;
/** The percentile curve keeps one value per sample and bin; beyond this many bins the axis is merged on log f. */
export const MAX_PLOT_BINS = 1000;

export function prepareYield(problem: AssistProblem, settings: YieldSettings = {}): YieldContext {
  const evaluator = compileMarginEvaluator(problem);
  return {
    problem,
    evaluator,
    parts: variedParts(problem.design, settings),
    samples: settings.samples ?? DEFAULT_SAMPLES,
    seed: settings.seed ?? 1,
    bins: plotBins(evaluator),
  };
}

/** Judged points by frequency: one bin per distinct frequency when there are few, else MAX_PLOT_BINS bins on log f. */
function plotBins(evaluator: MarginEvaluator): PlotBins {
  const f = evaluator.frequencyHz;
  const judged = new Uint8Array(f.length);
  for (const info of evaluator.comparisons) for (let i = 0; i < info.count; i += 1) if (info.judged[i]) judged[info.offset + i] = 1;
  const distinct = [...new Set(Array.from(f).filter((_, k) => judged[k]))].sort((a, b) => a - b);
  const binOf = new Int32Array(f.length).fill(-1);
  if (distinct.length <= MAX_PLOT_BINS) {
    const index = new Map(distinct.map((value, b) => [value, b]));
    for (let k = 0; k < f.length; k += 1) if (judged[k]) binOf[k] = index.get(f[k]!)!;
    return { frequencyHz: Float64Array.from(distinct), binOf };
  }
  // Log-f bins, then only the bins that hold a point, each at the geometric middle of its points.
  const low = Math.log(distinct[0]!);
  const span = Math.log(distinct[distinct.length - 1]!) - low || 1;
  const raw = (frequency: number): number => Math.min(MAX_PLOT_BINS - 1, Math.floor(((Math.log(frequency) - low) / span) * MAX_PLOT_BINS));
  const first = new Float64Array(MAX_PLOT_BINS).fill(Number.NaN);
  const last = new Float64Array(MAX_PLOT_BINS);
  for (const frequency of distinct) {
    const b = raw(frequency);
    if (Number.isNaN(first[b]!)) first[b] = frequency;
    last[b] = frequency;
  }
  const compact = new Int32Array(MAX_PLOT_BINS).fill(-1);
  const centres: number[] = [];
  for (let b = 0; b < MAX_PLOT_BINS; b += 1) {
    if (Number.isNaN(first[b]!)) continue;
    compact[b] = centres.length;
    centres.push(Math.sqrt(first[b]! * last[b]!));
  }
  for (let k = 0; k < f.length; k += 1) if (judged[k]) binOf[k] = compact[raw(f[k]!)]!;
  return { frequencyHz: Float64Array.from(centres), binOf };
}

export function runYieldChunk(context: YieldContext, start: number, count: number): YieldChunk {
  const { parts, evaluator, bins } = context;
  const binCount = bins.frequencyHz.length;
  const worstMarginDb = new Float64Array(count);
  const factors = new Float64Array(count * parts.length);
  const binMarginDb = new Float32Array(count * binCount);
  const sampleFactors = new Float64Array(parts.length);
  const envelope = new Float64Array(evaluator.frequencyHz.length);
  for (let s = 0; s < count; s += 1) {
    drawSample(parts, context.seed, start + s, sampleFactors);
    factors.set(sampleFactors, s * parts.length);
    const outcome = evaluator.evaluate(applyFactors(context.problem.design, parts, sampleFactors));
    worstMarginDb[s] = outcome.worstMarginDb;
    envelopeMargin(evaluator, outcome, envelope);
    binMins(envelope, bins, binMarginDb.subarray(s * binCount, (s + 1) * binCount));
  }
  return { start, count, worstMarginDb, factors, binMarginDb };
}

function binMins(envelope: Float64Array, bins: PlotBins, out: Float32Array): void {
  out.fill(Number.NaN);
  for (let k = 0; k < envelope.length; k += 1) {
    const b = bins.binOf[k]!;
    if (b < 0) continue;
    const m = envelope[k]!;
    if (!(m >= out[b]!)) out[b] = m;
  }
}

export function mergeYield(context: YieldContext, chunks: readonly YieldChunk[]): YieldResult {
  const { parts, samples, bins, evaluator, problem } = context;
  const binCount = bins.frequencyHz.length;
  const worst = new Float64Array(samples).fill(Number.NaN);
  const factors = new Float64Array(samples * parts.length);
  const binMargins = new Float32Array(samples * binCount).fill(Number.NaN);
  for (const chunk of chunks) {
    worst.set(chunk.worstMarginDb, chunk.start);
    factors.set(chunk.factors, chunk.start * parts.length);
    binMargins.set(chunk.binMarginDb, chunk.start * binCount);
  }
  const target = problem.targetMarginDb;
  let judgedSamples = 0;
  let passingSamples = 0;
  const covered = evaluator.coverage.uncoveredBands.length === 0;
  for (const m of worst) {
    if (Number.isNaN(m)) continue;
    judgedSamples += 1;
    if (covered && m >= target) passingSamples += 1;
  }
  const sorted = Array.from(worst).filter((m) => !Number.isNaN(m)).sort((a, b) => a - b);
  const pick = (p: number): number => (sorted.length === 0 ? Number.NaN : sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(p * sorted.length) - 1))]!);

  // The nominal design, and the tightest limit per bin, for the percentile curve.
  const nominalOutcome = evaluator.evaluate(problem.design);
  const nominalMarginDb = nominalOutcome.worstMarginDb;
  const nominalEnvelope = envelopeMargin(evaluator, nominalOutcome);
  const nominalBins = new Float32Array(binCount);
  binMins(nominalEnvelope, bins, nominalBins);
  const limitDbuV = new Float64Array(binCount).fill(Number.NaN);
  evaluator.comparisons.forEach((info) => {
    for (let i = 0; i < info.count; i += 1) {
      const b = bins.binOf[info.offset + i]!;
      if (b >= 0 && info.judged[i] && !(info.limitDbuV[i]! >= limitDbuV[b]!)) limitDbuV[b] = info.limitDbuV[i]!;
    }
  });
  const marginP5Db = new Float64Array(binCount);
  const column = new Float64Array(samples);
  for (let b = 0; b < binCount; b += 1) {
    let n = 0;
    for (let s = 0; s < samples; s += 1) {
      const m = binMargins[s * binCount + b]!;
      if (!Number.isNaN(m)) column[n++] = m;
    }
    const values = column.subarray(0, n).sort();
    marginP5Db[b] = n === 0 ? Number.NaN : values[Math.min(n - 1, Math.max(0, Math.ceil(0.05 * n) - 1))]!;
  }
  const levelP95DbuV = Float64Array.from(marginP5Db, (m, b) => limitDbuV[b]! - m);

  return {
    samples,
    seed: context.seed,
    targetMarginDb: target,
    judgedSamples,
    passingSamples,
    yieldFraction: samples > 0 ? passingSamples / samples : 0,
    nominalMarginDb,
    worstMarginDb: worst,
    statistics: { minimumDb: pick(0), p5Db: pick(0.05), medianDb: pick(0.5), p95Db: pick(0.95), maximumDb: pick(1), spreadDb: sorted.length > 0 ? sorted[sorted.length - 1]! - sorted[0]! : 0 },
    histogram: histogram(sorted),
    curve: { frequencyHz: bins.frequencyHz, nominalMarginDb: Float64Array.from(nominalBins), marginP5Db, limitDbuV, levelP95DbuV },
    parts: influences(parts, factors, worst),
    notes: [
      `${samples} samples, seed ${context.seed}; each part's value drawn from its own tolerance (the design's, or the default for its kind), magnetic parts also over their permeability band with one temperature per sample`,
      'the 5th-percentile curve is taken per frequency bin, each sample contributing its lowest margin in the bin; the level shown is against the tightest limit in the bin',
      ...evaluator.coverage.reasons.map((reason) => `${reason}: no unit passes until this band is covered`),
    ],
  };
}

/** 0.25 dB bins at least, at most 40 of them, over the range of worst margins. */
function histogram(sorted: readonly number[]): Histogram {
  if (sorted.length === 0) return { edgesDb: new Float64Array(0), counts: new Uint32Array(0) };
  const low = sorted[0]!;
  const high = sorted[sorted.length - 1]!;
  const width = Math.max(0.25, (high - low) / 40);
  const count = Math.max(1, Math.ceil((high - low) / width + 1e-9));
  const start = low - (count * width - (high - low)) / 2;
  const edgesDb = Float64Array.from({ length: count + 1 }, (_, k) => start + k * width);
  const counts = new Uint32Array(count);
  for (const m of sorted) counts[Math.min(count - 1, Math.floor((m - start) / width))]! += 1;
  return { edgesDb, counts };
}

/** Correlation and slope of the worst margin against each part's factor, over the judged samples. */
function influences(parts: readonly VariedPart[], factors: Float64Array, worst: Float64Array): PartInfluence[] {
  const samples = worst.length;
  return parts
    .map((part, p) => {
      let n = 0;
      let sx = 0;
      let sy = 0;
      for (let s = 0; s < samples; s += 1) {
        const y = worst[s]!;
        if (Number.isNaN(y)) continue;
        n += 1;
        sx += factors[s * parts.length + p]!;
        sy += y;
      }
      const mx = n > 0 ? sx / n : 0;
      const my = n > 0 ? sy / n : 0;
      let sxx = 0;
      let syy = 0;
      let sxy = 0;
      for (let s = 0; s < samples; s += 1) {
        const y = worst[s]!;
        if (Number.isNaN(y)) continue;
        const dx = factors[s * parts.length + p]! - mx;
        const dy = y - my;
        sxx += dx * dx;
        syy += dy * dy;
        sxy += dx * dy;
      }
      const correlation = sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : 0;
      const slope = sxx > 0 ? sxy / sxx / 100 : 0;
      return {
        elementId: part.elementId,
        label: part.label,
        percent: part.tolerance.percent,
        distribution: part.tolerance.distribution,
        source: part.source,
        hasPermeabilityBand: part.tolerance.permeabilityLowPercent !== undefined,
        correlation,
        slopeDbPerPercent: slope,
      };
    })
    .sort((a, b) => Math.abs(b.correlation) - Math.abs(a.correlation));
}

/** Sample ranges of at most `size` samples. */
export function chunkRanges(total: number, size: number): { start: number; count: number }[] {
  const ranges: { start: number; count: number }[] = [];
  for (let start = 0; start < total; start += size) ranges.push({ start, count: Math.min(size, total - start) });
  return ranges;
}

/** The whole run in this thread, chunk by chunk (the command line without workers, and tests). */
export function* yieldInProcess(problem: AssistProblem, settings: YieldSettings = {}, chunkSize = 50): Generator<{ done: number; total: number; stage: string }, YieldResult, void> {
  const context = prepareYield(problem, settings);
  const chunks: YieldChunk[] = [];
  for (const range of chunkRanges(context.samples, chunkSize)) {
    chunks.push(runYieldChunk(context, range.start, range.count));
    yield { done: range.start + range.count, total: context.samples, stage: 'drawing samples' };
  }
  return mergeYield(context, chunks);
}

