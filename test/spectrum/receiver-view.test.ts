import { describe, expect, it } from 'vitest';
import {
  PEAK_TO_RMS_DB,
  peakDbuV,
  receiverView,
  receiverViewInto,
  resolutionBandwidthHz,
  rmsReadingDbuV,
} from '../../src/spectrum/receiver-view.ts';

/*
 * The receiver's view of a line spectrum.
 * - rms calibration: a line of peak amplitude c reads 20·log10(c/√2 / 1 µV) = peak − 3.0103 dB
 *   (references.md §1.4, C: textbook arithmetic).
 * - 6 dB bandwidths 200 Hz (band A, 9–150 kHz), 9 kHz (band B, 0.15–30 MHz), 120 kHz (bands C/D):
 *   CISPR 16-1-1 receiver specification, references.md §1.4 (V2).
 * - Lines inside one bandwidth add in voltage: two sines in the IF passband beat, and the crest of
 *   their envelope is the sum of their amplitudes (textbook arithmetic); a peak detector holds that
 *   crest, QP and average read less, so the sum is the worst case (common practice, no source, for
 *   using it as the estimate's reading). domain.md §4 item 13 states that harmonics closer than
 *   9 kHz add inside one RBW.
 */

const mV = 1e-3;
const reading = (v: number): number => 20 * Math.log10(v / Math.SQRT2 / 1e-6);

describe('rms calibration (references.md §1.4: peak − 3.0103 dB, textbook arithmetic)', () => {
  it('20·log10(√2) = 3.0103 dB', () => {
    expect(Math.abs(PEAK_TO_RMS_DB - 3.0103)).toBeLessThan(5e-5);
  });

  it('1 V peak is 120 dBµV peak and reads 116.9897 dBµV; 1 µV peak is 0 dBµV peak', () => {
    expect(peakDbuV(1)).toBe(120);
    expect(Math.abs(rmsReadingDbuV(1) - 116.9897)).toBeLessThan(5e-5);
    expect(Math.abs(peakDbuV(1e-6))).toBeLessThan(1e-12);
    const view = receiverView(Float64Array.of(1e6), Float64Array.of(1));
    expect(Math.abs(view.readingDbuV[0]! - (120 - PEAK_TO_RMS_DB))).toBeLessThan(1e-12);
  });

  it('a zero line reads the engine floor (−400 dB), never −Infinity', () => {
    const view = receiverView(Float64Array.of(1e6), Float64Array.of(0));
    expect(view.readingDbuV[0]).toBe(-400);
  });
});

describe('CISPR 16-1-1 bandwidths (references.md §1.4, V2)', () => {
  it('200 Hz below 150 kHz, 9 kHz from 150 kHz to 30 MHz, 120 kHz above', () => {
    expect(resolutionBandwidthHz(9e3)).toBe(200);
    expect(resolutionBandwidthHz(149.999e3)).toBe(200);
    expect(resolutionBandwidthHz(150e3)).toBe(9e3);
    expect(resolutionBandwidthHz(30e6)).toBe(9e3);
    expect(resolutionBandwidthHz(30.001e6)).toBe(120e3);
  });
});

describe('lines inside one bandwidth add in voltage', () => {
  it('two lines 5 kHz apart at 1 MHz combine (9 kHz bandwidth): both read the sum', () => {
    const view = receiverView(Float64Array.of(1e6, 1.005e6), Float64Array.of(1 * mV, 0.5 * mV));
    for (let i = 0; i < 2; i += 1) {
      expect(Math.abs(view.combinedPeakV[i]! - 1.5 * mV)).toBeLessThan(1e-18);
      expect(Math.abs(view.readingDbuV[i]! - reading(1.5 * mV))).toBeLessThan(1e-12);
      expect(view.linesCombined[i]).toBe(2);
    }
    // Two equal lines: +6.0206 dB over one alone.
    const equal = receiverView(Float64Array.of(1e6, 1.005e6), Float64Array.of(mV, mV));
    expect(Math.abs(equal.readingDbuV[0]! - reading(mV) - 20 * Math.log10(2))).toBeLessThan(1e-12);
  });

  it('two lines 20 kHz apart at 1 MHz do not: each reads itself', () => {
    const view = receiverView(Float64Array.of(1e6, 1.02e6), Float64Array.of(1 * mV, 0.5 * mV));
    expect(Math.abs(view.readingDbuV[0]! - reading(1 * mV))).toBeLessThan(1e-12);
    expect(Math.abs(view.readingDbuV[1]! - reading(0.5 * mV))).toBeLessThan(1e-12);
    expect(Array.from(view.linesCombined)).toEqual([1, 1]);
  });

  it('lines exactly one bandwidth apart do not combine (a real filter takes 6 dB off each there)', () => {
    const view = receiverView(Float64Array.of(1e6, 1.009e6), Float64Array.of(mV, mV));
    expect(Array.from(view.linesCombined)).toEqual([1, 1]);
  });

  it('each line reads the largest sum over the tunings whose passband holds it', () => {
    // 1, 1, 1, 5 mV at 0, 4, 8, 12 kHz above 1 MHz: spans below 9 kHz are {0,4,8} and {4,8,12}.
    const view = receiverView(Float64Array.of(1e6, 1.004e6, 1.008e6, 1.012e6), Float64Array.of(mV, mV, mV, 5 * mV));
    const want = [3, 7, 7, 7].map((x) => x * mV);
    want.forEach((v, i) => expect(Math.abs(view.combinedPeakV[i]! - v)).toBeLessThan(1e-15));
    expect(Array.from(view.linesCombined)).toEqual([3, 3, 3, 3]);
  });

  it('band A: 150 Hz apart at 100 kHz combine, 300 Hz apart do not (200 Hz bandwidth)', () => {
    expect(Array.from(receiverView(Float64Array.of(100e3, 100.15e3), Float64Array.of(mV, mV)).linesCombined)).toEqual([2, 2]);
    expect(Array.from(receiverView(Float64Array.of(100e3, 100.3e3), Float64Array.of(mV, mV)).linesCombined)).toEqual([1, 1]);
  });

  it('above 30 MHz: 100 kHz apart at 50 MHz combine (120 kHz bandwidth)', () => {
    expect(Array.from(receiverView(Float64Array.of(50e6, 50.1e6), Float64Array.of(mV, mV)).linesCombined)).toEqual([2, 2]);
  });

  it('a 2 kHz PWM series: five harmonics (8 kHz span) share each 9 kHz passband (domain.md §2 Step 1b)', () => {
    const f = Float64Array.from({ length: 200 }, (_, i) => 1e6 + 2e3 * i);
    const view = receiverView(f, new Float64Array(200).fill(mV));
    for (let i = 0; i < 200; i += 1) expect(view.linesCombined[i]).toBe(5);
    expect(Math.abs(view.readingDbuV[100]! - reading(5 * mV))).toBeLessThan(1e-12);
  });

  it('the bandwidth widens at 150 kHz: the 150.5 kHz line takes in 149.9 kHz, not the reverse', () => {
    const view = receiverView(Float64Array.of(149.9e3, 150.5e3), Float64Array.of(mV, 2 * mV));
    expect(view.combinedPeakV[0]).toBe(mV);
    expect(Math.abs(view.combinedPeakV[1]! - 3 * mV)).toBeLessThan(1e-15);
  });

  it("'none' reports each line alone; a custom bandwidth is honoured", () => {
    const f = Float64Array.of(1e6, 1.005e6);
    const a = Float64Array.of(mV, mV);
    expect(Array.from(receiverView(f, a, { combination: 'none' }).combinedPeakV)).toEqual([mV, mV]);
    expect(Array.from(receiverView(f, a, { bandwidthHz: () => 1e3 }).linesCombined)).toEqual([1, 1]);
  });

  it('magnitudes are used; results land in caller columns', () => {
    const readingDbuV = new Float64Array(2);
    receiverViewInto(Float64Array.of(1e6, 1.001e6), Float64Array.of(-mV, mV), { readingDbuV });
    expect(Math.abs(readingDbuV[0]! - reading(2 * mV))).toBeLessThan(1e-12);
  });

  it('refuses falling frequencies and mismatched columns', () => {
    expect(() => receiverView(Float64Array.of(2e6, 1e6), Float64Array.of(mV, mV))).toThrow(RangeError);
    expect(() => receiverView(Float64Array.of(1e6), Float64Array.of(mV, mV))).toThrow(RangeError);
  });
});
