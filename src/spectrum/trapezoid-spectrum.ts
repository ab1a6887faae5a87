/**
 * Harmonic spectrum of a trapezoidal pulse train: the switch-node voltage of a converter, or the
 * pulsed input current of a buck stage. Derivation and conventions: docs/noise-estimate.md §1.
 *
 * Waveform: amplitude A (0 to A), period T = 1/f0, width τ = duty·T between the 50 % points, rise
 * time t_r and fall time t_f (10 %–90 % is not meant: the edges are straight lines from 0 to A).
 * Time origin at the centre of the pulse, midway between its two 50 % points.
 *
 * With θ = nπτ/T, s_r = sinc(nπt_r/T), s_f = sinc(nπt_f/T), sinc(x) = sin(x)/x, the complex
 * Fourier coefficient is X_n = A/(2πn)·[(s_r + s_f)·sin θ − j(s_r − s_f)·cos θ], so the one-sided
 * (peak) amplitude of the n-th harmonic is
 *
 *     c_n = 2|X_n| = (2A/(πn))·√(σ²·sin²θ + δ²·cos²θ),   σ = (s_r + s_f)/2,  δ = (s_r − s_f)/2.
 *
 * For t_r = t_f, δ = 0 and this is C. R. Paul's c_n = 2A(τ/T)·|sinc(nπτ/T)|·|sinc(nπt_r/T)|.
 */

/** The shape of `trapezoidSchema` and `currentTrapezoidSchema` after validation (SI units). */
export interface TrapezoidWaveform {
  /** Peak value A (V or A); the waveform runs from 0 to A. */
  readonly amplitude: number;
  /** Repetition frequency 1/T. */
  readonly frequencyHz: number;
  /** τ/T, τ measured between the 50 % points; 0 < duty < 1. */
  readonly duty: number;
  readonly riseTime: number;
  /** Defaults to the rise time. */
  readonly fallTime?: number | undefined;
}

/**
 * A line spectrum, columnar: harmonic n, its frequency, its one-sided peak amplitude c_n ≥ 0 and
 * its phase (cosine form, x(t) = dc + Σ c_n·cos(2πf_n·t + φ_n), time origin as the generator
 * states). All columns share one ArrayBuffer.
 */
export interface HarmonicSpectrum {
  readonly harmonic: Float64Array;
  readonly frequencyHz: Float64Array;
  readonly amplitude: Float64Array;
  readonly phaseRad: Float64Array;
  /** The mean value (the n = 0 term). */
  readonly dc: number;
}

export interface HarmonicRange {
  /** Harmonics at or below this frequency are listed (a little rounding is forgiven). */
  readonly stopHz: number;
  /** Harmonics below this frequency are left out; default 0 (from the fundamental). */
  readonly startHz?: number;
}

/** More harmonics than this is a mistake (a 50 Hz fundamental to 30 MHz is 600 000). */
export const MAX_HARMONICS = 2_000_000;

/** sin(πx), exact zero at every integer x (so the nulls of a 50 % duty cycle are exact). */
export function sinPi(x: number): number {
  // Reduce to r ∈ [−1, 1] (sin(πx) has period 2), then fold into [−½, ½] where Math.sin is accurate.
  let r = x - 2 * Math.round(x / 2);
  if (r > 0.5) r = 1 - r;
  else if (r < -0.5) r = -1 - r;
  return Math.sin(Math.PI * r);
}

/** cos(πx) = sin(π(x + ½)), exact zero at every half-integer x. */
export function cosPi(x: number): number {
  return sinPi(x + 0.5);
}

/** sin(πx)/(πx), 1 at x = 0. */
export function sincPi(x: number): number {
  return x === 0 ? 1 : sinPi(x) / (Math.PI * x);
}

function fallTimeOf(waveform: TrapezoidWaveform): number {
  return waveform.fallTime ?? waveform.riseTime;
}

/**
 * Why the waveform cannot be a trapezoid, or undefined when it can. The edges must fit: the flat
 * top τ − (t_r + t_f)/2 and the flat bottom T − τ − (t_r + t_f)/2 may be zero (a triangle) but not
 * negative. The schema checks each field; this checks them together.
 */
export function trapezoidIssue(waveform: TrapezoidWaveform): string | undefined {
  const { amplitude, frequencyHz, duty, riseTime } = waveform;
  const fallTime = fallTimeOf(waveform);
  if (!(Number.isFinite(amplitude) && amplitude >= 0)) return `amplitude must be a finite number ≥ 0, got ${amplitude}`;
  if (!(Number.isFinite(frequencyHz) && frequencyHz > 0)) return `frequency must be a finite number > 0, got ${frequencyHz}`;
  if (!(duty > 0 && duty < 1)) return `duty must lie between 0 and 1, got ${duty}`;
  if (!(Number.isFinite(riseTime) && riseTime > 0)) return `rise time must be a finite number > 0, got ${riseTime}`;
  if (!(Number.isFinite(fallTime) && fallTime > 0)) return `fall time must be a finite number > 0, got ${fallTime}`;
  const period = 1 / frequencyHz;
  const width = duty * period;
  const edges = (riseTime + fallTime) / 2;
  // A relative slack of 1e-12 lets an exact triangle (edges = τ = T/2) through despite rounding.
  const slack = 1e-12 * period;
  if (edges > width + slack) {
    return `the edges do not fit in the pulse: (rise + fall)/2 = ${edges} s exceeds the width between the 50 % points, τ = duty/f = ${width} s`;
  }
  if (edges > period - width + slack) {
    return `the edges do not fit between pulses: (rise + fall)/2 = ${edges} s exceeds the off time (1 − duty)/f = ${period - width} s`;
  }
  return undefined;
}

function requireTrapezoid(waveform: TrapezoidWaveform): void {
  const issue = trapezoidIssue(waveform);
  if (issue !== undefined) throw new RangeError(`trapezoid: ${issue}`);
}

/** Peak amplitude and phase of harmonic n ≥ 1 (integer), time origin at the pulse centre. */
export function trapezoidHarmonic(waveform: TrapezoidWaveform, n: number): { amplitude: number; phaseRad: number } {
  requireTrapezoid(waveform);
  if (!(Number.isInteger(n) && n >= 1)) throw new RangeError(`trapezoid: harmonic number must be a whole number ≥ 1, got ${n}`);
  const { amplitude, frequencyHz, duty, riseTime } = waveform;
  const harmonic = new Float64Array(1);
  const out = { amplitude: new Float64Array(1), phaseRad: new Float64Array(1) };
  harmonic[0] = n;
  fillTrapezoid(amplitude, duty, riseTime * frequencyHz, fallTimeOf(waveform) * frequencyHz, harmonic, out.amplitude, out.phaseRad);
  return { amplitude: out.amplitude[0]!, phaseRad: out.phaseRad[0]! };
}

/** The harmonics from `startHz` to `stopHz` (inclusive), in one buffer. */
export function trapezoidSpectrum(waveform: TrapezoidWaveform, range: HarmonicRange): HarmonicSpectrum {
  requireTrapezoid(waveform);
  const spectrum = allocateHarmonics(waveform.frequencyHz, range, waveform.amplitude * waveform.duty);
  const { amplitude, frequencyHz, duty, riseTime } = waveform;
  fillTrapezoid(amplitude, duty, riseTime * frequencyHz, fallTimeOf(waveform) * frequencyHz, spectrum.harmonic, spectrum.amplitude, spectrum.phaseRad);
  return spectrum;
}

/**
 * c_n and φ_n for the harmonic numbers in `harmonic`; rise and fall as fractions of the period.
 * X_n = (A/(2πn))·[(s_r + s_f)·sin θ − j·(s_r − s_f)·cos θ] (docs/noise-estimate.md §1).
 */
function fillTrapezoid(
  amplitude: number,
  duty: number,
  riseFraction: number,
  fallFraction: number,
  harmonic: Float64Array,
  outAmplitude: Float64Array,
  outPhase: Float64Array,
): void {
  for (let i = 0; i < harmonic.length; i += 1) {
    const n = harmonic[i]!;
    const sr = sincPi(n * riseFraction);
    const sf = sincPi(n * fallFraction);
    const sigma = (sr + sf) / 2;
    const delta = (sr - sf) / 2;
    const sinTheta = sinPi(n * duty);
    const cosTheta = cosPi(n * duty);
    // 2|X_n| = (2A/(πn))·|σ·sin θ − j·δ·cos θ|
    const re = sigma * sinTheta;
    const im = -delta * cosTheta;
    outAmplitude[i] = ((2 * amplitude) / (Math.PI * n)) * Math.hypot(re, im);
    outPhase[i] = Math.atan2(im, re);
  }
}

/** Harmonic numbers and frequencies of a fundamental f0 in [startHz, stopHz], columns to fill. */
export function allocateHarmonics(fundamentalHz: number, range: HarmonicRange, dc: number): HarmonicSpectrum {
  const { stopHz } = range;
  const startHz = range.startHz ?? 0;
  if (!(Number.isFinite(fundamentalHz) && fundamentalHz > 0)) throw new RangeError(`harmonics: fundamental must be > 0 Hz, got ${fundamentalHz}`);
  if (!(stopHz >= 0 && Number.isFinite(stopHz))) throw new RangeError(`harmonics: stop frequency must be a finite number ≥ 0, got ${stopHz}`);
  if (!(startHz >= 0 && Number.isFinite(startHz))) throw new RangeError(`harmonics: start frequency must be a finite number ≥ 0, got ${startHz}`);
  // 1e-9 relative forgives rounding in stop/f0 (30 MHz / 100 kHz must give 300, not 299).
  const last = Math.floor((stopHz / fundamentalHz) * (1 + 1e-9));
  const first = Math.max(1, Math.ceil((startHz / fundamentalHz) * (1 - 1e-9)));
  const count = Math.max(0, last - first + 1);
  if (count > MAX_HARMONICS) {
    throw new RangeError(`harmonics: ${count} harmonics of ${fundamentalHz} Hz up to ${stopHz} Hz; at most ${MAX_HARMONICS} are computed`);
  }
  const buffer = new Float64Array(4 * count);
  const spectrum: HarmonicSpectrum = {
    harmonic: buffer.subarray(0, count),
    frequencyHz: buffer.subarray(count, 2 * count),
    amplitude: buffer.subarray(2 * count, 3 * count),
    phaseRad: buffer.subarray(3 * count, 4 * count),
    dc,
  };
  for (let i = 0; i < count; i += 1) {
    const n = first + i;
    spectrum.harmonic[i] = n;
    spectrum.frequencyHz[i] = n * fundamentalHz;
  }
  return spectrum;
}

/** The corners and levels of the envelope (docs/noise-estimate.md §1.2). */
export interface TrapezoidCorners {
  /** 2Aτ/T, the flat part (a bound on every c_n). */
  readonly flatLevel: number;
  /** 1/(πτ): the flat part meets the −20 dB/decade line. */
  readonly firstCornerHz: number;
  /** 1/(π·t_e): the −20 dB/decade line meets the −40 dB/decade line. */
  readonly secondCornerHz: number;
  /** t_e = 2·t_r·t_f/(t_r + t_f), the harmonic mean of the edges (= t_r when they are equal). */
  readonly edgeTime: number;
}

export function trapezoidCorners(waveform: TrapezoidWaveform): TrapezoidCorners {
  requireTrapezoid(waveform);
  const { amplitude, frequencyHz, duty, riseTime } = waveform;
  const fallTime = fallTimeOf(waveform);
  const width = duty / frequencyHz;
  const edgeTime = (2 * riseTime * fallTime) / (riseTime + fallTime);
  return {
    flatLevel: 2 * amplitude * duty,
    firstCornerHz: 1 / (Math.PI * width),
    secondCornerHz: 1 / (Math.PI * edgeTime),
    edgeTime,
  };
}

/**
 * Paul's envelope, the least of three bounds on c_n: 2Aτ/T; 2A/(πTf); 2A/(π²·T·t_e·f²). With equal
 * edges t_e = t_r and this is flat to 1/(πτ), −20 dB/decade to 1/(πt_r), −40 dB/decade beyond.
 * With unequal edges the harmonic mean t_e keeps it a bound (docs/noise-estimate.md §1.2).
 */
export function trapezoidEnvelope(waveform: TrapezoidWaveform, frequencyHz: Float64Array): Float64Array {
  const { edgeTime, flatLevel } = trapezoidCorners(waveform);
  const { amplitude } = waveform;
  const period = 1 / waveform.frequencyHz;
  const out = new Float64Array(frequencyHz.length);
  for (let i = 0; i < frequencyHz.length; i += 1) {
    const f = frequencyHz[i]!;
    const slope20 = (2 * amplitude) / (Math.PI * period * f);
    const slope40 = (2 * amplitude) / (Math.PI * Math.PI * period * edgeTime * f * f);
    out[i] = Math.min(flatLevel, slope20, slope40);
  }
  return out;
}
