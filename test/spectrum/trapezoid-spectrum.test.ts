import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  MAX_HARMONICS,
  sinPi,
  sincPi,
  type TrapezoidWaveform,
  trapezoidCorners,
  trapezoidEnvelope,
  trapezoidHarmonic,
  trapezoidIssue,
  trapezoidSpectrum,
} from '../../src/spectrum/trapezoid-spectrum.ts';
import { peakDbuV, rmsReadingDbuV } from '../../src/spectrum/receiver-view.ts';
import { propertySettings } from '../support/property-settings.ts';

/*
 * Trapezoidal pulse-train spectrum.
 * Source: C. R. Paul, Introduction to Electromagnetic Compatibility, 2nd ed., Wiley 2006, ch. 3
 * (trapezoidal pulse-train spectrum and its bounds; chapter number from memory), as reproduced in
 * references.md §5 (formula V2; the worked-example numbers are C, computed from it) and domain.md
 * §6 C8. The unequal-edge coefficient is derived in docs/noise-estimate.md §1 and checked here
 * against Paul's formula (equal edges) and against a DFT of the sampled waveform (textbook
 * arithmetic: the DFT of samples of a continuous periodic signal is the sum of its aliased
 * Fourier coefficients).
 */

/** Paul's formula, written plainly from the book (references.md §5). */
function paul(a: number, period: number, width: number, rise: number, n: number): number {
  const sinc = (x: number): number => (x === 0 ? 1 : Math.sin(x) / x);
  return 2 * a * (width / period) * Math.abs(sinc((n * Math.PI * width) / period)) * Math.abs(sinc((n * Math.PI * rise) / period));
}

const relative = (got: number, want: number): number => Math.abs(got / want - 1);

/** references.md §5 worked example: 400 V, 100 kHz, 50 %, 20 ns edges. */
const EXAMPLE: TrapezoidWaveform = { amplitude: 400, frequencyHz: 100e3, duty: 0.5, riseTime: 20e-9 };
/** references.md suggests 1e-4 relative for the C values (4–6 significant figures) and ±0.001 dB. */
const PRINTED_RELATIVE = 1e-4;
const PRINTED_DB = 0.001;

describe("Paul's worked example (references.md §5, C; Paul 2nd ed. ch. 3 from memory)", () => {
  const rows: [number, number, number][] = [
    // n, volts, dBµV peak
    [1, 254.646, 168.119],
    [3, 84.8776, 158.576],
    [5, 50.9212, 154.138],
    [9, 28.2791, 149.029],
    [11, 23.1314, 147.284],
    [99, 2.4095, 127.639],
  ];
  for (const [n, volts, dbuv] of rows) {
    it(`harmonic ${n} (${n * 100} kHz): ${volts} V = ${dbuv} dBµV peak`, () => {
      const { amplitude } = trapezoidHarmonic(EXAMPLE, n);
      expect(relative(amplitude, volts)).toBeLessThanOrEqual(PRINTED_RELATIVE);
      expect(Math.abs(peakDbuV(amplitude) - dbuv)).toBeLessThanOrEqual(PRINTED_DB);
      expect(relative(amplitude, paul(400, 10e-6, 5e-6, 20e-9, n))).toBeLessThan(1e-12);
    });
  }

  it('rms readings: harmonic 1 165.108 dBµV, harmonic 3 155.566 dBµV (peak − 3.0103 dB, references.md §1.4)', () => {
    expect(Math.abs(rmsReadingDbuV(trapezoidHarmonic(EXAMPLE, 1).amplitude) - 165.108)).toBeLessThanOrEqual(PRINTED_DB);
    expect(Math.abs(rmsReadingDbuV(trapezoidHarmonic(EXAMPLE, 3).amplitude) - 155.566)).toBeLessThanOrEqual(PRINTED_DB);
  });

  it('harmonics 10 and 300 are exact nulls (every even harmonic at exactly 50 % duty with t_r = t_f)', () => {
    expect(trapezoidHarmonic(EXAMPLE, 10).amplitude).toBe(0);
    expect(trapezoidHarmonic(EXAMPLE, 300).amplitude).toBe(0);
    const spectrum = trapezoidSpectrum(EXAMPLE, { stopHz: 30e6 });
    for (let i = 1; i < spectrum.amplitude.length; i += 2) expect(spectrum.amplitude[i]).toBe(0);
  });

  it('harmonic 99: second sinc 0.936748; 299 and 301 sit near the envelope (second sinc 0.504551 at 300)', () => {
    expect(Math.abs(sincPi((99 * 20e-9) / 10e-6) - 0.936748)).toBeLessThanOrEqual(5e-7);
    expect(Math.abs(sincPi((300 * 20e-9) / 10e-6) - 0.504551)).toBeLessThanOrEqual(5e-7);
    const envelope = trapezoidEnvelope(EXAMPLE, Float64Array.of(29.9e6, 30.1e6));
    expect(trapezoidHarmonic(EXAMPLE, 299).amplitude / envelope[0]!).toBeGreaterThan(0.6);
    expect(trapezoidHarmonic(EXAMPLE, 301).amplitude / envelope[1]!).toBeGreaterThan(0.6);
  });

  it('DC and flat level: 2Aτ/T = 400 V = 172.041 dBµV; mean Aτ/T = 200 V', () => {
    expect(trapezoidCorners(EXAMPLE).flatLevel).toBe(400);
    expect(Math.abs(peakDbuV(400) - 172.041)).toBeLessThanOrEqual(PRINTED_DB);
    expect(trapezoidSpectrum(EXAMPLE, { stopHz: 1e6 }).dc).toBe(200);
  });

  it('corners 1/(πτ) = 63.6620 kHz and 1/(πt_r) = 15.9155 MHz', () => {
    const corners = trapezoidCorners(EXAMPLE);
    expect(relative(corners.firstCornerHz, 63.662e3)).toBeLessThanOrEqual(PRINTED_RELATIVE);
    expect(relative(corners.secondCornerHz, 15.9155e6)).toBeLessThanOrEqual(PRINTED_RELATIVE);
    expect(corners.edgeTime).toBe(20e-9);
  });

  it('envelope: 25.4648 V = 148.119 dBµV at 1 MHz, 2.54648 V = 128.119 at 10 MHz, 0.450316 V = 113.070 at 30 MHz', () => {
    const envelope = trapezoidEnvelope(EXAMPLE, Float64Array.of(1e6, 10e6, 30e6));
    const want: [number, number][] = [
      [25.4648, 148.119],
      [2.54648, 128.119],
      [0.450316, 113.07],
    ];
    want.forEach(([volts, dbuv], i) => {
      expect(relative(envelope[i]!, volts)).toBeLessThanOrEqual(PRINTED_RELATIVE);
      expect(Math.abs(peakDbuV(envelope[i]!) - dbuv)).toBeLessThanOrEqual(PRINTED_DB);
    });
  });

  it('duty 0.45: harmonic 10 is no longer a null, 25.448 V = 148.113 dBµV', () => {
    const { amplitude } = trapezoidHarmonic({ ...EXAMPLE, duty: 0.45 }, 10);
    expect(relative(amplitude, 25.448)).toBeLessThanOrEqual(PRINTED_RELATIVE);
    expect(Math.abs(peakDbuV(amplitude) - 148.113)).toBeLessThanOrEqual(PRINTED_DB);
  });
});

describe('domain.md §6 C8 (arithmetic checked; Paul ch. 3 formula)', () => {
  const c8: TrapezoidWaveform = { amplitude: 1, frequencyHz: 100e3, duty: 0.5, riseTime: 20e-9 };
  it('A = 1 V, T = 10 µs, τ = 5 µs, t_r = 20 ns: c1 = 0.6366 V, c2 ≈ 0, c3 = 0.2122 V; corners 63.66 kHz, 15.92 MHz', () => {
    expect(Math.abs(trapezoidHarmonic(c8, 1).amplitude - 0.6366)).toBeLessThanOrEqual(5e-5);
    expect(trapezoidHarmonic(c8, 2).amplitude).toBeLessThan(1e-12);
    expect(Math.abs(trapezoidHarmonic(c8, 3).amplitude - 0.2122)).toBeLessThanOrEqual(5e-5);
    const corners = trapezoidCorners(c8);
    expect(Math.abs(corners.firstCornerHz - 63.66e3)).toBeLessThanOrEqual(5);
    expect(Math.abs(corners.secondCornerHz - 15.92e6)).toBeLessThanOrEqual(5e3);
  });
});

describe('unequal rise and fall (derivation in docs/noise-estimate.md §1)', () => {
  it("reduces to Paul's formula when t_f = t_r (1e-12 relative, 1e-13·A near nulls; many duties and harmonics)", () => {
    for (const duty of [0.05, 0.2, 0.37, 0.5, 0.81]) {
      for (const riseFraction of [1e-4, 3e-3, 0.02]) {
        const waveform: TrapezoidWaveform = { amplitude: 7, frequencyHz: 1, duty, riseTime: riseFraction, fallTime: riseFraction };
        const spectrum = trapezoidSpectrum(waveform, { stopHz: 400 });
        for (let i = 0; i < spectrum.amplitude.length; i += 1) {
          const want = paul(7, 1, duty, riseFraction, i + 1);
          // Near a null Math.sin(nπτ/T) in the plain formula carries about n·1e-16 of rounding.
          expect(Math.abs(spectrum.amplitude[i]! - want)).toBeLessThanOrEqual(1e-12 * want + 1e-13 * 7);
        }
      }
    }
  });

  it('is continuous as t_f → t_r (a 1e-9 difference changes no amplitude by more than 1e-8 relative)', () => {
    const equal: TrapezoidWaveform = { amplitude: 1, frequencyHz: 1, duty: 0.3, riseTime: 0.01 };
    const nearly: TrapezoidWaveform = { ...equal, fallTime: 0.01 * (1 + 1e-9) };
    const a = trapezoidSpectrum(equal, { stopHz: 200 });
    const b = trapezoidSpectrum(nearly, { stopHz: 200 });
    for (let i = 0; i < a.amplitude.length; i += 1) {
      expect(Math.abs(a.amplitude[i]! - b.amplitude[i]!)).toBeLessThanOrEqual(1e-8 * Math.max(a.amplitude[i]!, 1e-3));
    }
  });

  it('the fall time defaults to the rise time', () => {
    const a = trapezoidHarmonic({ amplitude: 1, frequencyHz: 1e5, duty: 0.4, riseTime: 50e-9 }, 7);
    const b = trapezoidHarmonic({ amplitude: 1, frequencyHz: 1e5, duty: 0.4, riseTime: 50e-9, fallTime: 50e-9 }, 7);
    expect(a).toEqual(b);
  });

  it('swapping rise and fall keeps every amplitude (the waveform is mirrored in time)', () => {
    const a = trapezoidSpectrum({ amplitude: 1, frequencyHz: 1, duty: 0.35, riseTime: 0.01, fallTime: 0.06 }, { stopHz: 300 });
    const b = trapezoidSpectrum({ amplitude: 1, frequencyHz: 1, duty: 0.35, riseTime: 0.06, fallTime: 0.01 }, { stopHz: 300 });
    for (let i = 0; i < a.amplitude.length; i += 1) expect(Math.abs(a.amplitude[i]! - b.amplitude[i]!)).toBeLessThanOrEqual(1e-15);
  });
});

/** The trapezoid sampled at t (any real), time origin at the pulse centre (between the 50 % points). */
function trapezoidAt(w: Required<TrapezoidWaveform>, t: number): number {
  const period = 1 / w.frequencyHz;
  const width = w.duty * period;
  const u = t - period * Math.round(t / period);
  const up = Math.min(1, Math.max(0, (u + width / 2 + w.riseTime / 2) / w.riseTime));
  const down = Math.min(1, Math.max(0, (width / 2 + w.fallTime / 2 - u) / w.fallTime));
  return w.amplitude * Math.min(up, down);
}

/** DFT coefficient X_n of N samples over one period (textbook arithmetic), as [re, im]. */
function dft(sample: (t: number) => number, period: number, samples: number, n: number): [number, number] {
  let re = 0;
  let im = 0;
  for (let k = 0; k < samples; k += 1) {
    const x = sample((k * period) / samples);
    const angle = (-2 * Math.PI * n * k) / samples;
    re += x * Math.cos(angle);
    im += x * Math.sin(angle);
  }
  return [re / samples, im / samples];
}

describe('against a DFT of the sampled waveform (textbook arithmetic)', () => {
  // N = 2^14 samples of a period: the aliased terms Σ_{m≠0} X_{n+mN} are below A·T(1/t_r + 1/t_f)/(π²N²)·2
  // ≈ 1e-7·A for the edges here (|X_k| ≤ A·T(1/t_r + 1/t_f)/(2π²k²), docs/noise-estimate.md §1.2).
  const N = 2 ** 14;
  const cases: Required<TrapezoidWaveform>[] = [
    { amplitude: 1, frequencyHz: 1, duty: 0.3, riseTime: 0.01, fallTime: 0.04 },
    { amplitude: 2.5, frequencyHz: 1, duty: 0.62, riseTime: 0.07, fallTime: 0.015 },
    { amplitude: 1, frequencyHz: 1, duty: 0.5, riseTime: 0.02, fallTime: 0.02 },
  ];
  for (const w of cases) {
    it(`duty ${w.duty}, t_r ${w.riseTime}·T, t_f ${w.fallTime}·T: amplitude and phase of harmonics 0–40 within 1e-6·A`, () => {
      const spectrum = trapezoidSpectrum(w, { stopHz: 40 });
      const [dc] = dft((t) => trapezoidAt(w, t), 1, N, 0);
      expect(Math.abs(spectrum.dc - dc)).toBeLessThanOrEqual(1e-6 * w.amplitude);
      for (let i = 0; i < spectrum.amplitude.length; i += 1) {
        const [re, im] = dft((t) => trapezoidAt(w, t), 1, N, i + 1);
        // c_n·e^{jφ_n} = 2·X_n
        const c = spectrum.amplitude[i]!;
        const phi = spectrum.phaseRad[i]!;
        expect(Math.abs(c * Math.cos(phi) - 2 * re)).toBeLessThanOrEqual(1e-6 * w.amplitude);
        expect(Math.abs(c * Math.sin(phi) - 2 * im)).toBeLessThanOrEqual(1e-6 * w.amplitude);
      }
    });
  }
});

describe('the envelope bounds every harmonic (Paul ch. 3 bounds; harmonic mean edge for t_r ≠ t_f)', () => {
  it('worked example: every harmonic to 30 MHz lies on or below the envelope', () => {
    const spectrum = trapezoidSpectrum(EXAMPLE, { stopHz: 30e6 });
    const envelope = trapezoidEnvelope(EXAMPLE, spectrum.frequencyHz);
    for (let i = 0; i < envelope.length; i += 1) expect(spectrum.amplitude[i]!).toBeLessThanOrEqual(envelope[i]! * (1 + 1e-12));
  });

  it('random waveforms, equal and unequal edges (seeded fast-check)', () => {
    const waveform = fc
      .record({
        duty: fc.double({ min: 0.02, max: 0.98, noNaN: true }),
        rise: fc.double({ min: 1e-5, max: 1, noNaN: true }),
        fall: fc.double({ min: 1e-5, max: 1, noNaN: true }),
        equal: fc.boolean(),
      })
      .map(({ duty, rise, fall, equal }) => {
        // Scale the edges so that they fit the narrower of the pulse and the gap.
        const room = 2 * Math.min(duty, 1 - duty);
        const riseTime = (rise * room) / 2;
        const fallTime = equal ? riseTime : (fall * room) / 2;
        return { amplitude: 3, frequencyHz: 1, duty, riseTime, fallTime };
      });
    fc.assert(
      fc.property(waveform, (w) => {
        const spectrum = trapezoidSpectrum(w, { stopHz: 3000 });
        const envelope = trapezoidEnvelope(w, spectrum.frequencyHz);
        for (let i = 0; i < envelope.length; i += 1) {
          if (!(spectrum.amplitude[i]! <= envelope[i]! * (1 + 1e-12))) return false;
        }
        return true;
      }),
      propertySettings(200),
    );
  });

  it('the envelope is flat, then −20 dB/decade, then −40 dB/decade', () => {
    const e = trapezoidEnvelope(EXAMPLE, Float64Array.of(1e3, 1e4, 2e5, 2e6, 1e8, 1e9));
    expect(e[0]).toBe(400);
    expect(e[1]).toBe(400);
    expect(Math.abs(20 * Math.log10(e[2]! / e[3]!) - 20)).toBeLessThan(1e-9);
    expect(Math.abs(20 * Math.log10(e[4]! / e[5]!) - 40)).toBeLessThan(1e-9);
  });
});

describe('columns and guards', () => {
  it('lists harmonics up to the stop frequency inclusive (300 at 30 MHz), from startHz, in one buffer', () => {
    const all = trapezoidSpectrum(EXAMPLE, { stopHz: 30e6 });
    expect(all.frequencyHz.length).toBe(300);
    expect(all.harmonic[0]).toBe(1);
    expect(all.frequencyHz[299]).toBe(30e6);
    const band = trapezoidSpectrum(EXAMPLE, { startHz: 150e3, stopHz: 30e6 });
    expect(band.harmonic[0]).toBe(2);
    expect(band.frequencyHz.length).toBe(299);
    expect(band.amplitude.buffer).toBe(band.frequencyHz.buffer);
    expect(band.phaseRad.buffer).toBe(band.harmonic.buffer);
    expect(trapezoidSpectrum(EXAMPLE, { stopHz: 50e3 }).frequencyHz.length).toBe(0);
  });

  it('sinPi is exact at integers and agrees with Math.sin elsewhere', () => {
    for (const x of [0, 1, 2, 5, -3, 1e6]) expect(sinPi(x)).toBe(0);
    for (const x of [0.1, 0.5, 0.77, 1.3, -2.2, 123.456]) expect(Math.abs(sinPi(x) - Math.sin(Math.PI * x))).toBeLessThan(1e-12);
  });

  it('edges that do not fit are reported and refused', () => {
    const wide: TrapezoidWaveform = { amplitude: 1, frequencyHz: 1e5, duty: 0.1, riseTime: 1.5e-6 };
    expect(trapezoidIssue(wide)).toMatch(/do not fit in the pulse/u);
    expect(trapezoidIssue({ amplitude: 1, frequencyHz: 1e5, duty: 0.9, riseTime: 1.5e-6 })).toMatch(/between pulses/u);
    expect(() => trapezoidSpectrum(wide, { stopHz: 1e6 })).toThrow(RangeError);
    expect(() => trapezoidHarmonic(EXAMPLE, 1.5)).toThrow(RangeError);
    expect(trapezoidIssue(EXAMPLE)).toBeUndefined();
    // A triangle is the limit: edges exactly fill the pulse and the gap.
    expect(trapezoidIssue({ amplitude: 1, frequencyHz: 1e5, duty: 0.5, riseTime: 3e-6, fallTime: 7e-6 })).toBeUndefined();
  });

  it(`refuses more than ${MAX_HARMONICS} harmonics`, () => {
    expect(() => trapezoidSpectrum({ ...EXAMPLE, frequencyHz: 1 }, { stopHz: 1e9 })).toThrow(/at most/u);
  });
});
