/**
 * Predicted receiver levels from the design's noise estimate (`emissions.estimate`), before any
 * hardware exists: docs/noise-estimate.md §3.
 *
 * Common mode: the switch node's harmonics V_n drive the parasitic capacitance C_p to chassis. In
 * the engine's source model (docs/engine-math.md §2, §4.1) that is a common-mode EMF of V_n behind
 * a common-mode source impedance Z_cm = 1/(jωC_p).
 *
 * Differential mode: the converter draws current harmonics I_n from its input capacitor C_in
 * (ESR, ESL). Norton (I_n in parallel with Z_Cin) to Thevenin: a line-to-line EMF
 * e_ll = I_n·Z_Cin(f_n) behind Z_Cin. The engine's differential-mode EMF drives the lines with
 * ±e, a line-to-line EMF of 2e, and puts half of Z_dm in each line: so Z_dm = Z_Cin and e = e_ll/2.
 *
 * The filter is evaluated at every harmonic with the engine; each line's CM and DM contributions
 * are added in magnitude (their relative phase is not known: the worst case), and every column is
 * also shown as a CISPR 16-1-1 receiver reads it (receiver-view.ts).
 */
import { compileNetwork, evaluateNetworkOnce, type NetworkResponse, type ComplexColumns } from '../engine/index.ts';
import type { Capacitor, Design, NoiseEstimate, NoiseSource } from '../model/design.ts';
import { receiverViewInto, type ReceiverViewOptions } from './receiver-view.ts';
import { type HarmonicSpectrum, trapezoidIssue, trapezoidSpectrum } from './trapezoid-spectrum.ts';
import { triangleIssue, triangleSpectrum } from './triangle-spectrum.ts';

export interface EstimateOptions {
  /** Highest harmonic frequency listed; default 30 MHz (the conducted band's top). */
  readonly stopHz?: number;
  /** Harmonics below this are left out; default 0 (from each fundamental). */
  readonly startHz?: number;
  /** How the receiver combines lines inside its bandwidth (receiver-view.ts). */
  readonly receiver?: ReceiverViewOptions;
}

/** One predicted quantity over the frequency axis. */
export interface LevelColumns {
  /** Peak amplitude of each spectral line, V. */
  readonly peakV: Float64Array;
  /** What the receiver reads there, dBµV rms, lines inside one bandwidth combined (receiver-view.ts). */
  readonly readingDbuV: Float64Array;
}

export interface LinePrediction {
  /** The voltage the common-mode source produces at this line's receiver (with any mode conversion). */
  readonly fromCm: LevelColumns;
  /** The voltage the differential-mode source produces there. */
  readonly fromDm: LevelColumns;
  /** Worst case: |fromCm| + |fromDm| per line (the two add in phase), then the receiver view. */
  readonly total: LevelColumns;
}

export interface EstimatePrediction {
  /** Union of the CM and DM harmonic frequencies, rising (Hz). */
  readonly frequencyHz: Float64Array;
  /** The common-mode EMF at each frequency: the switch-node harmonic V_n, peak (0 where none). */
  readonly commonModeEmfV: Float64Array;
  /** The differential-mode EMF in the engine's convention, e_ll/2 = I_n·|Z_Cin|/2, peak (0 where none). */
  readonly differentialModeEmfV: Float64Array;
  readonly line1: LinePrediction;
  readonly line2: LinePrediction;
  /** |v_c| = |V1 + V2|/2 caused by the common-mode source: T_CM·V_n. */
  readonly commonMode: LevelColumns;
  /** |v_d| = |V1 − V2|/2 caused by the differential-mode source: T_DM·e_ll/2. */
  readonly differentialMode: LevelColumns;
  /** As commonMode with no filter: the source wired straight to the receivers. */
  readonly bareCommonMode: LevelColumns;
  /** As differentialMode with no filter. */
  readonly bareDifferentialMode: LevelColumns;
  /** The engine's PointFlag bits per frequency. */
  readonly flags: Uint8Array;
  /** The noise source the filter was evaluated with (built from the estimate). */
  readonly noiseSource: NoiseSource;
}

export interface EstimateIssue {
  readonly path: readonly (string | number)[];
  readonly message: string;
}

/** What stops an estimate from being evaluated, beyond what the schema checks field by field. */
export function estimateIssues(estimate: NoiseEstimate): EstimateIssue[] {
  const issues: EstimateIssue[] = [];
  if (estimate.commonMode) {
    const issue = trapezoidIssue(estimate.commonMode.switchNode);
    if (issue !== undefined) issues.push({ path: ['commonMode', 'switchNode'], message: issue });
  }
  if (estimate.differentialMode) {
    const current = estimate.differentialMode.current;
    const issue = current.kind === 'pulsed' ? trapezoidIssue(current.pulse) : triangleIssue(current);
    const path = current.kind === 'pulsed' ? ['differentialMode', 'current', 'pulse'] : ['differentialMode', 'current'];
    if (issue !== undefined) issues.push({ path, message: issue });
  }
  return issues;
}

/**
 * The design's noise source with the estimate's impedances: C_p from the lines' midpoint to
 * ground, the input capacitor (C, ESR, ESL) line to line. A mode the estimate leaves out keeps
 * the design's impedance.
 */
export function estimateNoiseSource(design: Design, estimate: NoiseEstimate): NoiseSource {
  const commonMode = estimate.commonMode
    ? { impedance: capacitorPart(estimate.commonMode.parasiticCapacitance, 0, 0), preset: 'emissions.estimate' }
    : design.noiseSource.commonMode;
  const dm = estimate.differentialMode;
  const differentialMode = dm ? { impedance: capacitorPart(dm.inputCapacitance, dm.esr, dm.esl), preset: 'emissions.estimate' } : design.noiseSource.differentialMode;
  return { commonMode, differentialMode };
}

function capacitorPart(capacitance: number, esr: number, esl: number): Capacitor {
  return { kind: 'capacitor', capacitance, esr, esl, safetyClass: 'none' };
}

/** |ESR + jωESL + 1/(jωC)|. */
export function capacitorImpedanceMagnitude(capacitance: number, esr: number, esl: number, frequencyHz: number): number {
  const omega = 2 * Math.PI * frequencyHz;
  return Math.hypot(esr, omega * esl - 1 / (omega * capacitance));
}

/** The source EMFs on one frequency axis: the CM and DM harmonics merged (docs/noise-estimate.md §3). */
export interface EstimateEmfs {
  readonly frequencyHz: Float64Array;
  readonly commonModeEmfV: Float64Array;
  readonly differentialModeEmfV: Float64Array;
}

/** Harmonic frequencies closer than this (relative) are one line: the same converter, rounded differently. */
const SAME_FREQUENCY = 1e-9;

export function estimateEmfs(estimate: NoiseEstimate, options: EstimateOptions = {}): EstimateEmfs {
  const range = { stopHz: options.stopHz ?? 30e6, startHz: options.startHz ?? 0 };
  const cm: HarmonicSpectrum | undefined = estimate.commonMode ? trapezoidSpectrum(estimate.commonMode.switchNode, range) : undefined;
  const dmEstimate = estimate.differentialMode;
  let dm: HarmonicSpectrum | undefined;
  let dmEmf: Float64Array | undefined;
  if (dmEstimate) {
    const current = dmEstimate.current;
    dm = current.kind === 'pulsed' ? trapezoidSpectrum(current.pulse, range) : triangleSpectrum(current, range);
    dmEmf = new Float64Array(dm.amplitude.length);
    for (let i = 0; i < dmEmf.length; i += 1) {
      // e = e_ll/2 = I_n·|Z_Cin|/2 (engine convention, docs/engine-math.md §2).
      const z = capacitorImpedanceMagnitude(dmEstimate.inputCapacitance, dmEstimate.esr, dmEstimate.esl, dm.frequencyHz[i]!);
      dmEmf[i] = (dm.amplitude[i]! * z) / 2;
    }
  }
  const cmF = cm?.frequencyHz ?? new Float64Array(0);
  const dmF = dm?.frequencyHz ?? new Float64Array(0);
  const merged: number[] = [];
  const cmAt: number[] = [];
  const dmAt: number[] = [];
  let a = 0;
  let b = 0;
  while (a < cmF.length || b < dmF.length) {
    const fa = a < cmF.length ? cmF[a]! : Number.POSITIVE_INFINITY;
    const fb = b < dmF.length ? dmF[b]! : Number.POSITIVE_INFINITY;
    if (Math.abs(fa - fb) <= SAME_FREQUENCY * Math.min(fa, fb)) {
      merged.push(fa);
      cmAt.push(cm!.amplitude[a]!);
      dmAt.push(dmEmf![b]!);
      a += 1;
      b += 1;
    } else if (fa < fb) {
      merged.push(fa);
      cmAt.push(cm!.amplitude[a]!);
      dmAt.push(0);
      a += 1;
    } else {
      merged.push(fb);
      cmAt.push(0);
      dmAt.push(dmEmf![b]!);
      b += 1;
    }
  }
  const count = merged.length;
  const buffer = new Float64Array(3 * count);
  const out = {
    frequencyHz: buffer.subarray(0, count),
    commonModeEmfV: buffer.subarray(count, 2 * count),
    differentialModeEmfV: buffer.subarray(2 * count, 3 * count),
  };
  out.frequencyHz.set(merged);
  out.commonModeEmfV.set(cmAt);
  out.differentialModeEmfV.set(dmAt);
  return out;
}

const LEVEL_KEYS = [
  'line1.fromCm',
  'line1.fromDm',
  'line1.total',
  'line2.fromCm',
  'line2.fromDm',
  'line2.total',
  'commonMode',
  'differentialMode',
  'bareCommonMode',
  'bareDifferentialMode',
] as const;
type LevelKey = (typeof LEVEL_KEYS)[number];

/**
 * Predicted levels at both receivers from the estimate, through the design's filter. Throws a
 * RangeError naming the field when the estimate cannot be evaluated (see `estimateIssues`).
 */
export function predictFromEstimate(design: Design, estimate: NoiseEstimate, options: EstimateOptions = {}): EstimatePrediction {
  const issues = estimateIssues(estimate);
  if (issues.length > 0) {
    throw new RangeError(issues.map((issue) => `emissions.estimate.${issue.path.join('.')}: ${issue.message}`).join('; '));
  }
  const emfs = estimateEmfs(estimate, options);
  const count = emfs.frequencyHz.length;
  const noiseSource = estimateNoiseSource(design, estimate);

  // One buffer: the three EMF-side columns, then peak and reading for every level column.
  const buffer = new Float64Array((3 + 2 * LEVEL_KEYS.length) * count);
  let offset = 0;
  const take = (): Float64Array => {
    const column = buffer.subarray(offset, offset + count);
    offset += count;
    return column;
  };
  const frequencyHz = take();
  const commonModeEmfV = take();
  const differentialModeEmfV = take();
  frequencyHz.set(emfs.frequencyHz);
  commonModeEmfV.set(emfs.commonModeEmfV);
  differentialModeEmfV.set(emfs.differentialModeEmfV);
  const levels = Object.fromEntries(LEVEL_KEYS.map((key) => [key, { peakV: take(), readingDbuV: take() }])) as Record<LevelKey, LevelColumns>;

  let flags = new Uint8Array(count);
  if (count > 0) {
    const network = compileNetwork({ ...design, noiseSource });
    const response = evaluateNetworkOnce(network, frequencyHz);
    flags = response.flags.slice();
    fillPeaks(response, commonModeEmfV, differentialModeEmfV, levels);
  }
  for (const key of LEVEL_KEYS) {
    receiverViewInto(frequencyHz, levels[key].peakV, levels[key], options.receiver);
  }
  const line = (n: 1 | 2): LinePrediction => ({
    fromCm: levels[`line${n}.fromCm`],
    fromDm: levels[`line${n}.fromDm`],
    total: levels[`line${n}.total`],
  });
  return {
    frequencyHz,
    commonModeEmfV,
    differentialModeEmfV,
    line1: line(1),
    line2: line(2),
    commonMode: levels.commonMode,
    differentialMode: levels.differentialMode,
    bareCommonMode: levels.bareCommonMode,
    bareDifferentialMode: levels.bareDifferentialMode,
    flags,
    noiseSource,
  };
}

/** |transfer per volt of EMF| × EMF for every level column; the line totals add magnitudes. */
function fillPeaks(response: NetworkResponse, cmEmf: Float64Array, dmEmf: Float64Array, levels: Record<LevelKey, LevelColumns>): void {
  const magnitude = (column: ComplexColumns, i: number): number => Math.hypot(column.re[i]!, column.im[i]!);
  for (let i = 0; i < cmEmf.length; i += 1) {
    const ecm = cmEmf[i]!;
    const edm = dmEmf[i]!;
    const l1cm = magnitude(response.line1FromCm, i) * ecm;
    const l1dm = magnitude(response.line1FromDm, i) * edm;
    const l2cm = magnitude(response.line2FromCm, i) * ecm;
    const l2dm = magnitude(response.line2FromDm, i) * edm;
    levels['line1.fromCm'].peakV[i] = l1cm;
    levels['line1.fromDm'].peakV[i] = l1dm;
    levels['line1.total'].peakV[i] = l1cm + l1dm;
    levels['line2.fromCm'].peakV[i] = l2cm;
    levels['line2.fromDm'].peakV[i] = l2dm;
    levels['line2.total'].peakV[i] = l2cm + l2dm;
    levels.commonMode.peakV[i] = magnitude(response.cmFromCm, i) * ecm;
    levels.differentialMode.peakV[i] = magnitude(response.dmFromDm, i) * edm;
    levels.bareCommonMode.peakV[i] = magnitude(response.bareCmFromCm, i) * ecm;
    levels.bareDifferentialMode.peakV[i] = magnitude(response.bareDmFromDm, i) * edm;
  }
}
