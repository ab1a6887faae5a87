/**
 * What a CISPR 16-1-1 measuring receiver reads for a line spectrum (docs/noise-estimate.md §4).
 *
 * 1. Calibration: receivers read the rms of a sine, so a line of peak amplitude c reads
 *    20·log10(c/√2 / 1 µV) dBµV, i.e. the peak level − 3.0103 dB.
 * 2. Resolution bandwidth: lines closer together than the 6 dB bandwidth B6 (200 Hz below
 *    150 kHz, 9 kHz from 150 kHz to 30 MHz, 120 kHz above) pass the IF filter together. Their
 *    envelope beats, and its crest is the sum of their amplitudes: that is what a peak detector
 *    holds, and the worst case for quasi-peak and average (which read less). The model: a
 *    rectangular filter B6 wide; lines spanning less than B6 are summed in voltage at full
 *    weight; at each line the reading is the largest such sum over all tunings whose passband
 *    holds that line. This bounds a real filter (which takes 6 dB off a line at ±B6/2) from above.
 */
import { magnitudeToDb } from '../engine/index.ts';

/** 20·log10(√2): peak level minus this is the rms reading of a sine. */
export const PEAK_TO_RMS_DB = 20 * Math.log10(Math.SQRT2);

/** The band edges of CISPR 16-1-1 used here: band A below 150 kHz, B to 30 MHz, C/D above. */
export const BAND_B_START_HZ = 150e3;
export const BAND_B_STOP_HZ = 30e6;

/**
 * The CISPR 16-1-1 6 dB bandwidth at a frequency: 200 Hz below 150 kHz (band A, 9–150 kHz),
 * 9 kHz from 150 kHz to 30 MHz inclusive (band B), 120 kHz above (bands C/D, to 1 GHz). Below
 * 9 kHz and above 1 GHz the standard sets other or no values; the nearest band's is used.
 */
export function resolutionBandwidthHz(frequencyHz: number): number {
  if (frequencyHz < BAND_B_START_HZ) return 200;
  if (frequencyHz <= BAND_B_STOP_HZ) return 9e3;
  return 120e3;
}

/** Peak volts to dBµV (peak), with the engine's floor for zero (−400 dB). */
export function peakDbuV(peakV: number): number {
  return magnitudeToDb(peakV * 1e6);
}

/** Peak volts of a sine to the receiver's rms reading in dBµV; zero stays at the floor. */
export function rmsReadingDbuV(peakV: number): number {
  return magnitudeToDb((peakV / Math.SQRT2) * 1e6);
}

export type LineCombination = 'voltage-sum' | 'none';

export interface ReceiverViewOptions {
  /** 'voltage-sum' (default): lines inside one bandwidth add in voltage; 'none': each line alone. */
  readonly combination?: LineCombination;
  /** The 6 dB bandwidth at a frequency; default `resolutionBandwidthHz`. */
  readonly bandwidthHz?: (frequencyHz: number) => number;
}

/** Columns over the input's frequency axis, sharing one ArrayBuffer. */
export interface ReceiverView {
  /** The largest in-bandwidth voltage sum containing each line (V, peak of the beating envelope). */
  readonly combinedPeakV: Float64Array;
  /** The rms reading in dBµV: combinedPeakV/√2 in dBµV. */
  readonly readingDbuV: Float64Array;
  /** How many lines that sum holds (1 where the line stands alone). */
  readonly linesCombined: Float64Array;
}

/**
 * The receiver's view of a line spectrum: `frequencyHz` non-decreasing, `peakV` peak amplitudes
 * (their magnitudes are used) at the receiver's input.
 */
export function receiverView(frequencyHz: Float64Array, peakV: Float64Array, options: ReceiverViewOptions = {}): ReceiverView {
  const count = frequencyHz.length;
  const buffer = new Float64Array(3 * count);
  const view: ReceiverView = {
    combinedPeakV: buffer.subarray(0, count),
    readingDbuV: buffer.subarray(count, 2 * count),
    linesCombined: buffer.subarray(2 * count, 3 * count),
  };
  receiverViewInto(frequencyHz, peakV, view, options);
  return view;
}

/** As `receiverView`, into caller-owned columns of the input's length; the optional ones may be left out. */
export function receiverViewInto(
  frequencyHz: Float64Array,
  peakV: Float64Array,
  out: { readonly readingDbuV: Float64Array; readonly combinedPeakV?: Float64Array; readonly linesCombined?: Float64Array },
  options: ReceiverViewOptions = {},
): void {
  const count = frequencyHz.length;
  if (peakV.length !== count) throw new RangeError(`receiver view: ${peakV.length} amplitudes for ${count} frequencies`);
  for (let i = 1; i < count; i += 1) {
    if (!(frequencyHz[i]! >= frequencyHz[i - 1]!)) throw new RangeError(`receiver view: frequencies must not fall (index ${i})`);
  }
  const combination = options.combination ?? 'voltage-sum';
  const bandwidthOf = options.bandwidthHz ?? resolutionBandwidthHz;
  const { readingDbuV, combinedPeakV: combined, linesCombined: lines } = out;
  for (const column of [readingDbuV, combined, lines]) {
    if (column !== undefined && column.length !== count) throw new RangeError(`receiver view: an output column holds ${column.length} values, not ${count}`);
  }

  if (combination === 'none') {
    for (let i = 0; i < count; i += 1) {
      const c = Math.abs(peakV[i]!);
      if (combined) combined[i] = c;
      readingDbuV[i] = rmsReadingDbuV(c);
      if (lines) lines[i] = 1;
    }
    return;
  }

  // windowSum[j]: the sum of the lines from j upward that lie less than B from line j, for the
  // bandwidth B it was last computed with (bandwidths change only at band edges, so each is
  // computed about once). windowEnd[j]: one past the last line in that window.
  const windowSum = new Float64Array(count);
  const windowEnd = new Float64Array(count);
  const windowBandwidth = new Float64Array(count).fill(Number.NaN);
  let low = 0;
  for (let i = 0; i < count; i += 1) {
    const f = frequencyHz[i]!;
    const bandwidth = bandwidthOf(f);
    if (!(bandwidth > 0 && Number.isFinite(bandwidth))) throw new RangeError(`receiver view: bandwidth at ${f} Hz is ${bandwidth}`);
    // Windows holding line i start at a line j ≤ i with f − f_j < B; a window starting at a line
    // is the largest of those that start at the same place (no lower line would fit).
    // The bandwidth may widen at a band edge (200 Hz → 9 kHz at 150 kHz): step back first.
    while (low > 0 && f - frequencyHz[low - 1]! < bandwidth) low -= 1;
    while (f - frequencyHz[low]! >= bandwidth) low += 1;
    let best = -1;
    let bestLines = 0;
    for (let j = low; j <= i; j += 1) {
      if (windowBandwidth[j] !== bandwidth) {
        const start = frequencyHz[j]!;
        let sum = 0;
        let k = j;
        while (k < count && frequencyHz[k]! - start < bandwidth) {
          sum += Math.abs(peakV[k]!);
          k += 1;
        }
        windowSum[j] = sum;
        windowEnd[j] = k;
        windowBandwidth[j] = bandwidth;
      }
      if (windowSum[j]! > best) {
        best = windowSum[j]!;
        bestLines = windowEnd[j]! - j;
      }
    }
    if (combined) combined[i] = best;
    readingDbuV[i] = rmsReadingDbuV(best);
    if (lines) lines[i] = bestLines;
  }
}
