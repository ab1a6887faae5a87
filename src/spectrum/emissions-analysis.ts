import type { Design, LimitMask } from '../model/design.ts';
import { DEFAULT_BANDS, type Attribution, DETECTORS } from '../model/emissions-schema.ts';
import { type LevelSeries, marginReport, type MarginReport, requiredAttenuation } from './margin.ts';
import { type EstimatePrediction, predictFromEstimate } from './noise-estimate.ts';
import { maskCorners } from './limit-mask.ts';
import { predictScan, type ScanPrediction } from './prediction.ts';
import { BAND_B_START_HZ, BAND_B_STOP_HZ } from './receiver-view.ts';
import { reduceScan } from './scan-reduction.ts';
import type { Scan, ScanTag } from './spectrum-types.ts';

/**
 * One question, one answer: "with this filter, how far below the limit will I be, where, and how
 * much attenuation am I still missing?" The noise comes from a scan (scaled by the in-circuit
 * transfer of the new filter over the baseline) or, before hardware exists, from the design's
 * noise estimate. The same function serves the command line and the planner's worker.
 */

export type NoiseInput = { readonly kind: 'scan'; readonly scan: Scan } | { readonly kind: 'estimate' };

export interface AnalysisOptions {
  /** Override the design's masks (default: design.emissions.masks). */
  readonly masks?: readonly LimitMask[];
  readonly targetMarginDb?: number;
  readonly attribution?: Attribution;
  readonly noiseFloorDbuV?: number;
  readonly worstPeakCount?: number;
  /** For an estimate: the highest harmonic (default: the design's stop frequency). */
  readonly stopHz?: number;
}

export interface EmissionsAnalysis {
  readonly input: 'scan' | 'estimate';
  readonly frequencyHz: Float64Array;
  /** The predicted levels with the design's filter, one series per line or mode and detector. */
  readonly predicted: readonly LevelSeries[];
  /** The levels with no filter at all, per mode (dBµV), for plotting the starting point. */
  readonly unfilteredCommonModeDbuV: Float64Array | undefined;
  readonly unfilteredDifferentialModeDbuV: Float64Array | undefined;
  /** unfiltered − limit + target margin, clamped at 0; NaN where no mask applies or below the floor. */
  readonly requiredAttenuationCmDb: Float64Array | undefined;
  readonly requiredAttenuationDmDb: Float64Array | undefined;
  readonly masks: readonly LimitMask[];
  readonly report: MarginReport;
  readonly notes: readonly string[];
  readonly scanPrediction?: ScanPrediction;
  readonly estimatePrediction?: EstimatePrediction;
  /** For a scan: how many points it had and how many were analysed (scan-reduction.ts). */
  readonly scanPoints?: { readonly read: number; readonly analysed: number };
}

const TAG_TEXT: Record<ScanTag, string> = {
  line1: 'line 1',
  line2: 'line 2',
  'common-mode': 'common mode',
  'differential-mode': 'differential mode',
  total: 'total',
};

export function analyzeEmissions(design: Design, input: NoiseInput, options: AnalysisOptions = {}): EmissionsAnalysis {
  const emissions = design.emissions;
  const masks = options.masks ?? emissions?.masks ?? [];
  const targetMarginDb = options.targetMarginDb ?? emissions?.targetMarginDb ?? 6;
  const bands = emissions?.bands ?? DEFAULT_BANDS.map((band) => ({ ...band }));
  const notes: string[] = [];
  if (masks.length === 0) notes.push('no limit mask: nothing to judge against');

  if (input.kind === 'scan') {
    const attribution = options.attribution ?? emissions?.attribution ?? 'both';
    const noiseFloorDbuV = options.noiseFloorDbuV ?? emissions?.noiseFloorDbuV;
    // To the receiver's resolution first, split where a band or a limit line changes course: the
    // work and memory of what follows are then bounded whatever the length of the scan.
    const edges = [BAND_B_START_HZ, BAND_B_STOP_HZ, ...bands.flatMap((band) => [band.startHz, band.stopHz]), ...masks.flatMap((mask) => [...maskCorners(mask)])];
    const reduction = reduceScan(input.scan, edges);
    if (reduction.note) notes.push(reduction.note);
    const prediction = predictScan(design, reduction.scan, { attribution, ...(noiseFloorDbuV === undefined ? {} : { noiseFloorDbuV }) });
    const label = `${TAG_TEXT[input.scan.tag]}, predicted`;
    const predicted: LevelSeries[] = prediction.traces.map((trace) => ({
      label,
      detector: trace.detector,
      frequencyHz: prediction.frequencyHz,
      levelDbuV: trace.predictedDbuV,
      excluded: prediction.belowFloor,
    }));
    // Which modes the scan speaks for: its own, or both for an unknown mode credited to both.
    const mode = input.scan.tag === 'common-mode' || input.scan.tag === 'differential-mode' ? input.scan.tag : prediction.attribution;
    const unfiltered = (pick: 'unfilteredCommonModeDbuV' | 'unfilteredDifferentialModeDbuV'): LevelSeries[] =>
      prediction.traces.map((trace) => ({
        label: `${TAG_TEXT[input.scan.tag]}, no filter`,
        detector: trace.detector,
        frequencyHz: prediction.frequencyHz,
        levelDbuV: trace[pick],
        excluded: prediction.belowFloor,
      }));
    const cm = mode === 'common-mode' || mode === 'both';
    const dm = mode === 'differential-mode' || mode === 'both';
    const firstTrace = prediction.traces[0];
    return {
      input: 'scan',
      frequencyHz: prediction.frequencyHz,
      predicted,
      unfilteredCommonModeDbuV: cm ? firstTrace?.unfilteredCommonModeDbuV : undefined,
      unfilteredDifferentialModeDbuV: dm ? firstTrace?.unfilteredDifferentialModeDbuV : undefined,
      requiredAttenuationCmDb: cm ? requiredAttenuation(unfiltered('unfilteredCommonModeDbuV'), masks, targetMarginDb) : undefined,
      requiredAttenuationDmDb: dm ? requiredAttenuation(unfiltered('unfilteredDifferentialModeDbuV'), masks, targetMarginDb) : undefined,
      masks,
      report: marginReport(predicted, masks, {
        targetMarginDb,
        bands,
        ...(options.worstPeakCount ? { worstPeakCount: options.worstPeakCount } : {}),
        sampling: { kind: 'continuous' },
        source: 'the scan',
        hints: input.scan.warnings ?? [],
      }),
      notes: [...prediction.notes, ...notes],
      scanPrediction: prediction,
      scanPoints: { read: reduction.fromPoints, analysed: reduction.toPoints },
    };
  }

  const estimate = emissions?.estimate;
  if (!estimate || (!estimate.commonMode && !estimate.differentialMode)) {
    throw new RangeError('the design has no noise estimate (emissions.estimate) to analyse');
  }
  const upToHz = options.stopHz ?? design.frequencyPlan.stopHz;
  const prediction = predictFromEstimate(design, estimate, { stopHz: upToHz });
  // A line spectrum: every detector reads the same for each steady line (CISPR 16-1-1, CW), so
  // each line's reading stands for all three detectors and meets every mask with its own.
  const predicted: LevelSeries[] = [];
  for (const [label, line] of [
    ['line 1, estimate', prediction.line1],
    ['line 2, estimate', prediction.line2],
  ] as const) {
    for (const detector of DETECTORS) predicted.push({ label, detector, frequencyHz: prediction.frequencyHz, levelDbuV: line.total.readingDbuV });
  }
  const bare = (label: string, levels: Float64Array): LevelSeries[] =>
    DETECTORS.map((detector) => ({ label, detector, frequencyHz: prediction.frequencyHz, levelDbuV: levels }));
  notes.push(
    'estimate: a line spectrum from the switching waveform; each line reads the same on every detector; the two modes add in phase on each line (worst case)',
  );
  return {
    input: 'estimate',
    frequencyHz: prediction.frequencyHz,
    predicted,
    unfilteredCommonModeDbuV: prediction.bareCommonMode.readingDbuV,
    unfilteredDifferentialModeDbuV: prediction.bareDifferentialMode.readingDbuV,
    requiredAttenuationCmDb: requiredAttenuation(bare('common mode, no filter', prediction.bareCommonMode.readingDbuV), masks, targetMarginDb),
    requiredAttenuationDmDb: requiredAttenuation(bare('differential mode, no filter', prediction.bareDifferentialMode.readingDbuV), masks, targetMarginDb),
    masks,
    report: marginReport(predicted, masks, {
      targetMarginDb,
      bands,
      ...(options.worstPeakCount ? { worstPeakCount: options.worstPeakCount } : {}),
      sampling: { kind: 'lines', upToHz },
      source: 'the estimate',
    }),
    notes,
    estimatePrediction: prediction,
  };
}
