/**
 * Per-frequency flags carried beside every sweep result (a Uint8Array, one byte per point).
 * A flagged value is still finite; the flag says why it should not be trusted as it stands.
 */
export const PointFlag = {
  /** An ideal (lossless) part sat exactly on its resonance; its impedance was limited to stay finite. */
  IdealResonanceLimited: 1,
  /** A measured impedance table was held at its end value outside its measured range. */
  OutsideMeasuredRange: 2,
  /** A result was not finite even after limiting; the value shown is a placeholder. */
  NotFinite: 4,
} as const;
export type PointFlag = (typeof PointFlag)[keyof typeof PointFlag];

/**
 * Impedances are limited to IMPEDANCE_LIMIT_OHM and admittances to ADMITTANCE_LIMIT_S (1 nΩ).
 * 1 GΩ is beyond any real part in the band (a 0.1 pF stray at 9 kHz is 0.18 GΩ) and 1 nΩ below
 * any real ESR, so only an ideal part at (or within 10⁻⁸ of) its resonance, or a 0 Ω part placed
 * as a shunt, reaches them. The limits are also what keeps such a point computable: the cascade
 * carries the other mode beside a 10⁹ entry with about 10⁻⁷ relative rounding, where a 10¹⁵ entry
 * would swamp it (docs/engine-math.md §6).
 */
export const IMPEDANCE_LIMIT_OHM = 1e9;
export const ADMITTANCE_LIMIT_S = 1e9;

/** Levels below this magnitude print as DB_FLOOR (−400 dB) rather than −Infinity. */
export const MAGNITUDE_FLOOR = 1e-20;
export const DB_FLOOR = -400;

/** 10·log10 of a power ratio with the same floor, so that a zero stays finite. */
export function powerRatioToDb(ratio: number): number {
  return ratio > MAGNITUDE_FLOOR * MAGNITUDE_FLOOR ? 10 * Math.log10(ratio) : DB_FLOOR;
}

/** 20·log10(|value|) with a floor, for magnitudes that may legitimately be zero. */
export function magnitudeToDb(magnitude: number): number {
  return magnitude > MAGNITUDE_FLOOR ? 20 * Math.log10(magnitude) : DB_FLOOR;
}
