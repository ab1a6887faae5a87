import { describe, expect, it } from 'vitest';
import { triangleHarmonic, triangleIssue, triangleSpectrum, type TriangularRipple } from '../../src/spectrum/triangle-spectrum.ts';
import { trapezoidSpectrum } from '../../src/spectrum/trapezoid-spectrum.ts';

/*
 * Triangular ripple spectrum (derivation docs/noise-estimate.md §2).
 * Check values: domain.md §6 C19 (D = 0.5: 0.4053·ΔI; D = 0.3: 0.3903·ΔI — from memory, arithmetic
 * checked) and domain.md §2 Step 1b (c_1 = ΔI·sin(πD)/(π²D(1−D)), = 4ΔI/π² at D = 0.5). Both are
 * re-derived here by textbook arithmetic and checked against a DFT of the sampled waveform and
 * against the trapezoid of Paul's ch. 3 (a triangle is a trapezoid with no flat parts).
 */

/** The ripple at time t, origin at the valley: rises ΔI over D·T, falls over (1 − D)·T, zero mean. */
function triangleAt(r: TriangularRipple, t: number): number {
  const period = 1 / r.frequencyHz;
  const u = t / period - Math.floor(t / period);
  const d = r.riseFraction;
  const fromValley = u <= d ? u / d : (1 - u) / (1 - d);
  return r.peakToPeak * (fromValley - 0.5);
}

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

describe('fundamental (domain.md §6 C19, from memory; arithmetic checked)', () => {
  it('D = 0.5: c1 = 4ΔI/π² = 0.4053·ΔI', () => {
    const { amplitude } = triangleHarmonic({ peakToPeak: 1, frequencyHz: 65e3, riseFraction: 0.5 }, 1);
    expect(Math.abs(amplitude - 4 / Math.PI ** 2)).toBeLessThan(1e-15);
    expect(Math.abs(amplitude - 0.4053)).toBeLessThanOrEqual(5e-5);
  });

  it('D = 0.3: c1 = ΔI·sin(0.3π)/(0.21π²) = 0.3903·ΔI', () => {
    const { amplitude } = triangleHarmonic({ peakToPeak: 2, frequencyHz: 65e3, riseFraction: 0.3 }, 1);
    expect(Math.abs(amplitude - (2 * Math.sin(0.3 * Math.PI)) / (0.21 * Math.PI ** 2))).toBeLessThan(1e-15);
    expect(Math.abs(amplitude / 2 - 0.3903)).toBeLessThanOrEqual(5e-5);
  });

  it('D and 1 − D give the same amplitudes (the ripple mirrored in time)', () => {
    const a = triangleSpectrum({ peakToPeak: 1, frequencyHz: 1, riseFraction: 0.27 }, { stopHz: 50 });
    const b = triangleSpectrum({ peakToPeak: 1, frequencyHz: 1, riseFraction: 0.73 }, { stopHz: 50 });
    for (let i = 0; i < a.amplitude.length; i += 1) expect(Math.abs(a.amplitude[i]! - b.amplitude[i]!)).toBeLessThan(1e-15);
  });
});

describe('general harmonic c_n = ΔI·|sin(πnD)|/(π²n²D(1−D)) (textbook arithmetic)', () => {
  it('D = 0.5: odd harmonics fall as 1/n², even ones are exact nulls', () => {
    const s = triangleSpectrum({ peakToPeak: 1, frequencyHz: 1, riseFraction: 0.5 }, { stopHz: 99 });
    const c1 = s.amplitude[0]!;
    for (let i = 0; i < s.amplitude.length; i += 1) {
      const n = i + 1;
      if (n % 2 === 0) expect(s.amplitude[i]).toBe(0);
      else expect(Math.abs(s.amplitude[i]! * n * n - c1)).toBeLessThan(1e-14);
    }
  });

  it('D = 0.25: every fourth harmonic is a null; harmonic 2 is ΔI/(4π²·0.1875)', () => {
    const r: TriangularRipple = { peakToPeak: 1, frequencyHz: 1, riseFraction: 0.25 };
    expect(triangleHarmonic(r, 4).amplitude).toBe(0);
    expect(triangleHarmonic(r, 8).amplitude).toBe(0);
    expect(Math.abs(triangleHarmonic(r, 2).amplitude - 1 / (4 * Math.PI ** 2 * 0.1875))).toBeLessThan(1e-15);
  });

  it('the ripple has no DC term', () => {
    expect(triangleSpectrum({ peakToPeak: 5, frequencyHz: 1e5, riseFraction: 0.4 }, { stopHz: 1e6 }).dc).toBe(0);
  });
});

describe('against a DFT of the sampled ripple (textbook arithmetic)', () => {
  // N = 2^14: the aliased terms are below ΔI/(π²N²D(1−D))·2 ≈ 4e-8·ΔI for D ≥ 0.1.
  const N = 2 ** 14;
  for (const riseFraction of [0.5, 0.3, 0.12, 0.9]) {
    it(`D = ${riseFraction}: amplitude and phase (origin at the valley) of harmonics 0–30 within 1e-6·ΔI`, () => {
      const r: TriangularRipple = { peakToPeak: 1.7, frequencyHz: 1, riseFraction };
      const s = triangleSpectrum(r, { stopHz: 30 });
      const [dc] = dft((t) => triangleAt(r, t), 1, N, 0);
      expect(Math.abs(dc)).toBeLessThanOrEqual(1e-6);
      for (let i = 0; i < s.amplitude.length; i += 1) {
        const [re, im] = dft((t) => triangleAt(r, t), 1, N, i + 1);
        const c = s.amplitude[i]!;
        const phi = s.phaseRad[i]!;
        expect(Math.abs(c * Math.cos(phi) - 2 * re)).toBeLessThanOrEqual(1e-6 * 1.7);
        expect(Math.abs(c * Math.sin(phi) - 2 * im)).toBeLessThanOrEqual(1e-6 * 1.7);
      }
    });
  }
});

describe("against the trapezoid (Paul ch. 3 generalised): τ = T/2, t_r = DT, t_f = (1 − D)T", () => {
  for (const riseFraction of [0.5, 0.3, 0.05]) {
    it(`D = ${riseFraction}: the same amplitudes to 1e-12 relative`, () => {
      const f = 20e3;
      const tri = triangleSpectrum({ peakToPeak: 3, frequencyHz: f, riseFraction }, { stopHz: 2e6 });
      const trap = trapezoidSpectrum(
        { amplitude: 3, frequencyHz: f, duty: 0.5, riseTime: riseFraction / f, fallTime: (1 - riseFraction) / f },
        { stopHz: 2e6 },
      );
      for (let i = 0; i < tri.amplitude.length; i += 1) {
        expect(Math.abs(tri.amplitude[i]! - trap.amplitude[i]!)).toBeLessThanOrEqual(1e-12 * Math.max(tri.amplitude[0]!, 1e-300));
      }
    });
  }
});

describe('guards', () => {
  it('a rise fraction outside (0, 1) is reported and refused', () => {
    expect(triangleIssue({ peakToPeak: 1, frequencyHz: 1e5, riseFraction: 1 })).toMatch(/rise fraction/u);
    expect(() => triangleSpectrum({ peakToPeak: 1, frequencyHz: 1e5, riseFraction: 0 }, { stopHz: 1e6 })).toThrow(RangeError);
    expect(() => triangleHarmonic({ peakToPeak: 1, frequencyHz: 1e5, riseFraction: 0.5 }, 0)).toThrow(RangeError);
  });
});
