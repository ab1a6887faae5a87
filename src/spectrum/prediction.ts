import { compileNetwork, evaluateNetworkOnce, type NetworkResponse } from '../engine/index.ts';
import type { Design } from '../model/design.ts';
import type { Attribution, Detector } from '../model/emissions-schema.ts';
import type { Scan, ScanTag } from './spectrum-types.ts';

/**
 * Predict what a scan would read with a new filter: for each mode,
 *
 *   predicted = scan + 20·log10 |T_new / T_baseline|,
 *
 * with T the in-circuit transfer from the noise source to the receiving networks (source
 * impedance included), evaluated at the scan's own frequencies. T_baseline is the filter that was
 * fitted when the scan was taken, or no filter. Why not "scan − insertion loss": a 50 Ω insertion
 * loss is measured between 50 Ω and 50 Ω, and neither the converter nor the LISN at low
 * frequency is 50 Ω; a filter's effect in the real circuit can differ from it by tens of dB and
 * even change sign at a resonance (docs/emissions.md). The ratio of in-circuit transfers is the
 * change the receiver actually sees, whatever the scan's absolute calibration.
 */

export interface ImprovementColumns {
  /** 20·log10 |T_baseline / T_new| for common mode, dB; positive means the new filter helps. */
  readonly commonModeDb: Float64Array;
  readonly differentialModeDb: Float64Array;
  /** What was applied to the scan: the mode's own, or for a mode-unknown scan per its attribution. */
  readonly appliedDb: Float64Array;
}

export interface PredictedTrace {
  readonly detector: Detector;
  /** As scanned, dBµV. */
  readonly scanDbuV: Float64Array;
  /** With the new filter, dBµV. */
  readonly predictedDbuV: Float64Array;
  /** With no filter at all, dBµV (the level the filter has to deal with). */
  readonly unfilteredCommonModeDbuV: Float64Array;
  readonly unfilteredDifferentialModeDbuV: Float64Array;
}

export interface ScanPrediction {
  readonly scanName: string;
  readonly tag: ScanTag;
  /** How a mode-unknown scan was credited; undefined for a mode-separated scan. */
  readonly attribution: Attribution | undefined;
  readonly frequencyHz: Float64Array;
  readonly improvement: ImprovementColumns;
  readonly traces: readonly PredictedTrace[];
  /** 1 where every trace is at or below the noise floor: the receiver's floor, not noise. */
  readonly belowFloor: Uint8Array;
  readonly notes: readonly string[];
}

export interface PredictionOptions {
  /** For scans tagged line1, line2 or total. Default: both (the smaller improvement, worst case). */
  readonly attribution?: Attribution;
  /** Scan points at or below this level are the receiver's floor. */
  readonly noiseFloorDbuV?: number;
}

/** The design's mode transfers at the given frequencies, and the same without any filter. */
interface ModeTransfers {
  readonly withFilter: NetworkResponse;
}

function transfersOf(design: Design, frequencyHz: Float64Array): ModeTransfers {
  return { withFilter: evaluateNetworkOnce(compileNetwork(design, []), frequencyHz) };
}

/** The baseline as a design: the new design's source and receivers with the baseline's stages. */
export function baselineDesign(design: Design): Design | undefined {
  const baseline = design.emissions?.baseline;
  if (baseline === undefined || baseline.kind === 'none') return undefined;
  return { ...design, stages: baseline.stages };
}

function magnitudeSquared(column: { re: Float64Array; im: Float64Array }, i: number): number {
  return column.re[i]! * column.re[i]! + column.im[i]! * column.im[i]!;
}

/** 10·log10 of a ratio of squared magnitudes, with zero handled (a transfer of exactly 0 is a perfect block). */
function ratioDb(numerator2: number, denominator2: number): number {
  if (numerator2 === 0 && denominator2 === 0) return 0;
  if (denominator2 === 0) return 400;
  if (numerator2 === 0) return -400;
  return 10 * Math.log10(numerator2 / denominator2);
}

const MODE_OF_TAG: Partial<Record<ScanTag, 'common-mode' | 'differential-mode'>> = {
  'common-mode': 'common-mode',
  'differential-mode': 'differential-mode',
};

export function predictScan(design: Design, scan: Scan, options: PredictionOptions = {}): ScanPrediction {
  const f = scan.frequencyHz;
  const n = f.length;
  const notes: string[] = [];
  const current = transfersOf(design, f).withFilter;
  const baseline = baselineDesign(design);
  const before = baseline ? transfersOf(baseline, f).withFilter : undefined;
  notes.push(
    baseline
      ? `scan taken with a filter fitted (${design.emissions?.baseline.kind === 'stages' ? (design.emissions.baseline.label ?? 'baseline stages') : ''}); predictions scale by T_new / T_baseline`
      : 'scan taken with no filter fitted; predictions scale by T_new / T_without-filter',
  );

  const commonModeDb = new Float64Array(n);
  const differentialModeDb = new Float64Array(n);
  // Improvement of the no-filter case over the baseline: what the filter has to deal with.
  const bareOverBaselineCm = new Float64Array(n);
  const bareOverBaselineDm = new Float64Array(n);
  for (let i = 0; i < n; i += 1) {
    const baseCm = before ? magnitudeSquared(before.cmFromCm, i) : magnitudeSquared(current.bareCmFromCm, i);
    const baseDm = before ? magnitudeSquared(before.dmFromDm, i) : magnitudeSquared(current.bareDmFromDm, i);
    commonModeDb[i] = ratioDb(baseCm, magnitudeSquared(current.cmFromCm, i));
    differentialModeDb[i] = ratioDb(baseDm, magnitudeSquared(current.dmFromDm, i));
    bareOverBaselineCm[i] = ratioDb(magnitudeSquared(current.bareCmFromCm, i), baseCm);
    bareOverBaselineDm[i] = ratioDb(magnitudeSquared(current.bareDmFromDm, i), baseDm);
  }

  const mode = MODE_OF_TAG[scan.tag];
  const attribution: Attribution | undefined = mode ? undefined : (options.attribution ?? 'both');
  const appliedDb = new Float64Array(n);
  for (let i = 0; i < n; i += 1) {
    const cm = commonModeDb[i]!;
    const dm = differentialModeDb[i]!;
    const chosen = mode ?? attribution;
    // Worst case for an unknown mode: credit the filter with the smaller of the two improvements.
    appliedDb[i] = chosen === 'common-mode' ? cm : chosen === 'differential-mode' ? dm : Math.min(cm, dm);
  }
  if (attribution) {
    notes.push(
      attribution === 'both'
        ? 'mode unknown: the filter is credited with the smaller of its CM and DM improvements at each frequency (worst case)'
        : `mode unknown: the whole scan is treated as ${attribution === 'common-mode' ? 'common' : 'differential'}-mode noise`,
    );
  }

  const traces: PredictedTrace[] = scan.traces.map((trace) => {
    const predictedDbuV = new Float64Array(n);
    const unfilteredCommonModeDbuV = new Float64Array(n);
    const unfilteredDifferentialModeDbuV = new Float64Array(n);
    for (let i = 0; i < n; i += 1) {
      const level = trace.levelDbuV[i]!;
      predictedDbuV[i] = level - appliedDb[i]!;
      unfilteredCommonModeDbuV[i] = level + bareOverBaselineCm[i]!;
      unfilteredDifferentialModeDbuV[i] = level + bareOverBaselineDm[i]!;
    }
    return { detector: trace.detector, scanDbuV: trace.levelDbuV, predictedDbuV, unfilteredCommonModeDbuV, unfilteredDifferentialModeDbuV };
  });

  const belowFloor = new Uint8Array(n);
  const floor = options.noiseFloorDbuV;
  if (floor !== undefined) {
    let count = 0;
    const columns = scan.traces.map((trace) => trace.levelDbuV);
    for (let i = 0; i < n; i += 1) {
      let quiet = true;
      for (const column of columns) if (column[i]! > floor) quiet = false;
      if (quiet) {
        belowFloor[i] = 1;
        count += 1;
      }
    }
    if (count > 0) notes.push(`${count} of ${n} scan points at or below the noise floor (${floor} dBµV) are marked and left out of required attenuation`);
  }

  return {
    scanName: scan.name,
    tag: scan.tag,
    attribution,
    frequencyHz: f,
    improvement: { commonModeDb, differentialModeDb, appliedDb },
    traces,
    belowFloor,
    notes,
  };
}
