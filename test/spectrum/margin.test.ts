import { describe, expect, it } from 'vitest';
import { DEFAULT_BANDS } from '../../src/model/emissions-schema.ts';
import { copyPreset } from '../../src/spectrum/limit-presets.ts';
import { type LevelSeries, marginReport, requiredAttenuation } from '../../src/spectrum/margin.ts';

// Limits from 47 CFR §15.107(a), class B (status V in references.md): QP 66→56 dBµV falling with
// log f over 0.15–0.5 MHz, 56 dBµV to 5 MHz, 60 dBµV to 30 MHz; AV 10 dB lower.
const qp = copyPreset('fcc-15.107-class-b-qp');
const av = copyPreset('fcc-15.107-class-b-av');
const bands = DEFAULT_BANDS.map((band) => ({ ...band }));

const f = Float64Array.of(0.15e6, 0.3e6, 1e6, 2e6, 3e6, 10e6, 20e6);
const series = (label: string, detector: LevelSeries['detector'], levels: number[]): LevelSeries => ({
  label,
  detector,
  frequencyHz: f,
  levelDbuV: Float64Array.from(levels),
});

describe('margin table (limit − level), 47 CFR §15.107(a) class B limits', () => {
  const qpTrace = series('line 1', 'quasi-peak', [60, 58, 40, 52, 45, 30, 58]);
  const report = marginReport([qpTrace], [qp], { targetMarginDb: 6, bands });

  it('margin at each point is limit − level (0.3 MHz limit 60.2428 dBµV, log-f interpolation, references.md §1.2)', () => {
    const c = report.comparisons[0]!;
    expect(c.marginDb[0]).toBeCloseTo(66 - 60, 9);
    expect(c.marginDb[1]).toBeCloseTo(60.2428 - 58, 3);
    expect(c.marginDb[3]).toBeCloseTo(56 - 52, 9);
    expect(c.marginDb[6]).toBeCloseTo(60 - 58, 9);
  });

  // Margins: 6, 2.2428, 16, 4, 11, 30, 2 dB.
  it('worst overall and per band, with pass/fail against the target margin', () => {
    expect(report.worst!.marginDb).toBeCloseTo(2, 9);
    expect(report.worst!.frequencyHz).toBe(20e6);
    const [low, mid, high] = report.bands;
    expect(low!.worst!.frequencyHz).toBe(0.3e6);
    expect(mid!.worst!.marginDb).toBeCloseTo(4, 9);
    expect(high!.worst!.marginDb).toBeCloseTo(2, 9);
    expect(report.bands.map((b) => b.pass)).toEqual([false, false, false]);
    expect(report.pass).toBe(false);
  });

  it('failing ranges group the contiguous points below the target, and the worst peaks are the local minima of margin', () => {
    // 0.15 MHz has exactly the target margin (6 dB): not failing.
    expect(report.failingRanges.map((r) => [r.startHz, r.stopHz])).toEqual([
      [0.3e6, 0.3e6],
      [2e6, 2e6],
      [20e6, 20e6],
    ]);
    expect(report.worstPeaks[0]!.frequencyHz).toBe(20e6);
    expect(report.worstPeaks.map((p) => p.frequencyHz)).toContain(2e6);
  });

  it('passes when every band keeps the target margin', () => {
    const quiet = marginReport([series('line 1', 'quasi-peak', [50, 50, 40, 40, 40, 30, 40])], [qp], { targetMarginDb: 6, bands });
    expect(quiet.pass).toBe(true);
    expect(quiet.failingRanges).toEqual([]);
  });

  it('a peak scan is judged against quasi-peak and average limits, flagged as conservative', () => {
    const peakOnly = marginReport([series('line 1', 'peak', [60, 58, 40, 52, 45, 30, 58])], [qp, av], { targetMarginDb: 6, bands });
    expect(peakOnly.comparisons).toHaveLength(2);
    expect(peakOnly.comparisons.every((c) => c.conservative)).toBe(true);
    expect(peakOnly.notes.join(' ')).toMatch(/conservative/);
  });

  it('an average trace is never judged against a quasi-peak limit (it would understate the problem)', () => {
    const averageOnly = marginReport([series('line 1', 'average', [40, 40, 30, 30, 30, 20, 30])], [qp, av], { targetMarginDb: 6, bands });
    expect(averageOnly.comparisons.map((c) => c.maskId)).toEqual([av.id]);
    expect(averageOnly.notes.join(' ')).toMatch(/not judged/);
  });

  it('the matching detector is preferred when several traces exist', () => {
    const both = marginReport([series('line 1', 'peak', [70, 70, 70, 70, 70, 70, 70]), qpTrace], [qp], { targetMarginDb: 6, bands });
    expect(both.comparisons.map((c) => c.seriesDetector)).toEqual(['quasi-peak']);
  });

  it('excluded points (noise floor) carry no margin', () => {
    const floor = { ...qpTrace, excluded: Uint8Array.of(1, 1, 0, 0, 0, 0, 0) };
    const r = marginReport([floor], [qp], { targetMarginDb: 6, bands });
    expect(Number.isNaN(r.comparisons[0]!.marginDb[0]!)).toBe(true);
    expect(r.bands[0]!.worst).toBeUndefined();
  });
});

describe('required attenuation = unfiltered level − limit + target margin, clamped at 0', () => {
  it('per frequency, against the tightest applicable mask', () => {
    const unfiltered = series('CM, no filter', 'quasi-peak', [90, 80, 50, 70, 45, 60, 75]);
    const need = requiredAttenuation([unfiltered], [qp], 6)!;
    expect(need[0]).toBeCloseTo(90 - 66 + 6, 9);
    expect(need[1]).toBeCloseTo(80 - 60.2428 + 6, 3);
    expect(need[2]).toBe(0); // 50 dBµV against 56 with 6 dB margin: exactly enough
    expect(need[4]).toBe(0); // below the limit with room to spare: clamped, never negative
    expect(need[6]).toBeCloseTo(75 - 60 + 6, 9);
  });
});
