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
 * Impedances are limited to ±IMPEDANCE_LIMIT_OHM and admittances to ±ADMITTANCE_LIMIT_S.
 * 1e15 Ω is far beyond any real part (a 1 fF stray at 10 kHz is 1.6e10 Ω), so only exact
 * lossless resonances ever reach it.
 */
export const IMPEDANCE_LIMIT_OHM = 1e15;
export const ADMITTANCE_LIMIT_S = 1e15;

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
