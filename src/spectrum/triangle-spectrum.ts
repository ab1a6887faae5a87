/**
 * Harmonic spectrum of a triangular ripple: the inductor current of a boost (PFC) or other
 * inductor-fed input, ΔI peak to peak, rising for a fraction D of the period and falling for the
 * rest. Derivation: docs/noise-estimate.md §2.
 *
 * The second derivative of the ripple is a pair of impulses per period, +ΔI/(T·D(1−D)) at the
 * valley and −ΔI/(T·D(1−D)) at the peak, so with the time origin at the valley
 *
 *     X_n = −ΔI·(1 − e^(−j2πnD)) / (4π²n²·D(1−D)),   c_n = 2|X_n| = ΔI·|sin(πnD)| / (π²n²·D(1−D)).
 *
 * c_1 = ΔI·sin(πD)/(π²D(1−D)): 4ΔI/π² at D = ½. The ripple has zero mean (its DC, the converter's
 * average input current, is not noise). A triangle is a trapezoid with no flat parts (τ = T/2,
 * t_r = DT, t_f = (1−D)T), which the tests use as a cross-check.
 */
import { allocateHarmonics, cosPi, type HarmonicRange, type HarmonicSpectrum, sinPi } from './trapezoid-spectrum.ts';

/** The shape of the schema's `triangular-ripple` current (SI units). */
export interface TriangularRipple {
  /** ΔI, peak to peak. */
  readonly peakToPeak: number;
  readonly frequencyHz: number;
  /** D: the fraction of the period during which the ripple rises, 0 < D < 1. */
  readonly riseFraction: number;
}

/** Why the ripple cannot be evaluated, or undefined when it can. */
export function triangleIssue(ripple: TriangularRipple): string | undefined {
  const { peakToPeak, frequencyHz, riseFraction } = ripple;
  if (!(Number.isFinite(peakToPeak) && peakToPeak >= 0)) return `peak-to-peak must be a finite number ≥ 0, got ${peakToPeak}`;
  if (!(Number.isFinite(frequencyHz) && frequencyHz > 0)) return `frequency must be a finite number > 0, got ${frequencyHz}`;
  if (!(riseFraction > 0 && riseFraction < 1)) return `rise fraction must lie between 0 and 1, got ${riseFraction}`;
  return undefined;
}

function requireTriangle(ripple: TriangularRipple): void {
  const issue = triangleIssue(ripple);
  if (issue !== undefined) throw new RangeError(`triangular ripple: ${issue}`);
}

/** Peak amplitude and phase of harmonic n ≥ 1 (integer), time origin at the valley. */
export function triangleHarmonic(ripple: TriangularRipple, n: number): { amplitude: number; phaseRad: number } {
  requireTriangle(ripple);
  if (!(Number.isInteger(n) && n >= 1)) throw new RangeError(`triangular ripple: harmonic number must be a whole number ≥ 1, got ${n}`);
  const harmonic = Float64Array.of(n);
  const amplitude = new Float64Array(1);
  const phase = new Float64Array(1);
  fillTriangle(ripple.peakToPeak, ripple.riseFraction, harmonic, amplitude, phase);
  return { amplitude: amplitude[0]!, phaseRad: phase[0]! };
}

/** The harmonics from `startHz` to `stopHz` (inclusive), in one buffer; dc is 0. */
export function triangleSpectrum(ripple: TriangularRipple, range: HarmonicRange): HarmonicSpectrum {
  requireTriangle(ripple);
  const spectrum = allocateHarmonics(ripple.frequencyHz, range, 0);
  fillTriangle(ripple.peakToPeak, ripple.riseFraction, spectrum.harmonic, spectrum.amplitude, spectrum.phaseRad);
  return spectrum;
}

function fillTriangle(peakToPeak: number, rise: number, harmonic: Float64Array, outAmplitude: Float64Array, outPhase: Float64Array): void {
  const scale = peakToPeak / (Math.PI * Math.PI * rise * (1 - rise));
  for (let i = 0; i < harmonic.length; i += 1) {
    const n = harmonic[i]!;
    // X_n = −(scale/(4n²))·(1 − e^(−jφ)), φ = 2πnD; 1 − e^(−jφ) = 2 sin(φ/2)·(sin(φ/2) + j cos(φ/2)).
    const s = sinPi(n * rise);
    const c = cosPi(n * rise);
    const magnitude = (scale / (n * n)) * Math.abs(s);
    outAmplitude[i] = magnitude;
    // Phase of −s·(s + j c): the common factor s only flips the sign.
    const re = -s * s;
    const im = -s * c;
    outPhase[i] = Math.atan2(im, re);
  }
}
