import { PointFlag } from '../point-flags.ts';
import type { ComplexColumns } from '../complex-columns.ts';

/**
 * The impedance looking into the filter from the source side with the receivers connected,
 * found by walking from the receivers back to the source (docs/engine-math.md §5), not taken from
 * the chain matrix as (A Z_L + B)(C Z_L + D)⁻¹, which divides nearly singular determinants.
 *
 * The state is the symmetric 2×2 MODE impedance Z = [[z00, z01], [z01, z11]] per point, with
 * v = [(V1 + V2)/2, (V1 − V2)/2] = Z·[I1 + I2, I1 − I2]. In modes a choke adds diag(even/2, odd/2)
 * and a part between the lines touches z11 only, so a choke's common-mode impedance and an X
 * capacitor at resonance never have to cancel against each other (in line coordinates the
 * joined-lines impedance came out as a difference of two squares of the choke's impedance).
 * A series element adds to Z; a shunt element is a rank-one admittance y·v vᵀ, so
 * Sherman–Morrison updates Z without inverting it: Z ← Z − (Z v)(Z v)ᵀ · y / (1 + y·vᵀ Z v).
 */
export interface ModeImpedance {
  readonly z00: ComplexColumns;
  readonly z01: ComplexColumns;
  readonly z11: ComplexColumns;
}

/** Z = receivers in modes: ¼·[[z1 + z2, z1 − z2], [z1 − z2, z1 + z2]]. */
export function startAtReceivers(state: ModeImpedance, line1: ComplexColumns, line2: ComplexColumns, count: number): void {
  const { z00, z01, z11 } = state;
  for (let i = 0; i < count; i += 1) {
    const pr = 0.25 * (line1.re[i]! + line2.re[i]!);
    const pi = 0.25 * (line1.im[i]! + line2.im[i]!);
    z00.re[i] = pr;
    z00.im[i] = pi;
    z11.re[i] = pr;
    z11.im[i] = pi;
    z01.re[i] = 0.25 * (line1.re[i]! - line2.re[i]!);
    z01.im[i] = 0.25 * (line1.im[i]! - line2.im[i]!);
  }
}

/** A choke from its eigen-impedances per winding: Z += diag(even/2, odd/2). */
export function addCoupledPair(state: ModeImpedance, even: ComplexColumns, odd: ComplexColumns, count: number): void {
  const { z00, z11 } = state;
  for (let i = 0; i < count; i += 1) {
    z00.re[i]! += 0.5 * even.re[i]!;
    z00.im[i]! += 0.5 * even.im[i]!;
    z11.re[i]! += 0.5 * odd.re[i]!;
    z11.im[i]! += 0.5 * odd.im[i]!;
  }
}

/** Series z in line 1 (sign +1) or line 2 (sign −1): Z += (z/4)·[[1, ±1], [±1, 1]]. */
export function addSeriesInLine(state: ModeImpedance, z: ComplexColumns, sign: 1 | -1, count: number): void {
  const { z00, z01, z11 } = state;
  for (let i = 0; i < count; i += 1) {
    const qr = 0.25 * z.re[i]!;
    const qi = 0.25 * z.im[i]!;
    z00.re[i]! += qr;
    z00.im[i]! += qi;
    z11.re[i]! += qr;
    z11.im[i]! += qi;
    z01.re[i]! += sign * qr;
    z01.im[i]! += sign * qi;
  }
}

/**
 * A shunt admittance y·v vᵀ with v = [v0, v1]: [1, 1] line 1 to ground, [1, −1] line 2 to
 * ground (admittance y), [0, 1] line to line (admittance 4y, the mode form of y across the
 * lines). Where 1 + y·vᵀZv = 0 (a lossless parallel resonance) the point is flagged and Z left as
 * it was.
 */
export function addShunt(
  state: ModeImpedance,
  admittance: ComplexColumns,
  v0: number,
  v1: number,
  count: number,
  flags: Uint8Array,
): void {
  const { z00, z01, z11 } = state;
  for (let i = 0; i < count; i += 1) {
    const a00r = z00.re[i]!, a00i = z00.im[i]!;
    const a01r = z01.re[i]!, a01i = z01.im[i]!;
    const a11r = z11.re[i]!, a11i = z11.im[i]!;
    // u = Z v, s = vᵀ u
    const u0r = v0 * a00r + v1 * a01r, u0i = v0 * a00i + v1 * a01i;
    const u1r = v0 * a01r + v1 * a11r, u1i = v0 * a01i + v1 * a11i;
    const sr = v0 * u0r + v1 * u1r, si = v0 * u0i + v1 * u1i;
    const yr = admittance.re[i]!, yi = admittance.im[i]!;
    const dr = 1 + yr * sr - yi * si;
    const di = yr * si + yi * sr;
    const d2 = dr * dr + di * di;
    if (!(d2 > 0)) {
      flags[i]! |= PointFlag.NotFinite;
      continue;
    }
    // f = y / (1 + y s)
    const fr = (yr * dr + yi * di) / d2;
    const fi = (yi * dr - yr * di) / d2;
    const p00r = u0r * u0r - u0i * u0i, p00i = 2 * u0r * u0i;
    const p01r = u0r * u1r - u0i * u1i, p01i = u0r * u1i + u0i * u1r;
    const p11r = u1r * u1r - u1i * u1i, p11i = 2 * u1r * u1i;
    z00.re[i] = a00r - (fr * p00r - fi * p00i);
    z00.im[i] = a00i - (fr * p00i + fi * p00r);
    z01.re[i] = a01r - (fr * p01r - fi * p01i);
    z01.im[i] = a01i - (fr * p01i + fi * p01r);
    z11.re[i] = a11r - (fr * p11r - fi * p11i);
    z11.im[i] = a11i - (fr * p11i + fi * p11r);
  }
}

/**
 * From the mode impedance at the filter input: line to line (I1 = −I2 = I, so i = [0, 2I] and
 * V1 − V2 = 2·v_d) Z_dm = 4·z11; lines joined (v_d = 0) Z_cm = z00 − z01²/z11.
 */
export function writeInputImpedances(
  state: ModeImpedance,
  commonMode: ComplexColumns,
  differentialMode: ComplexColumns,
  count: number,
  flags: Uint8Array,
): void {
  const { z00, z01, z11 } = state;
  for (let i = 0; i < count; i += 1) {
    const br = z11.re[i]!, bi = z11.im[i]!;
    differentialMode.re[i] = 4 * br;
    differentialMode.im[i] = 4 * bi;
    const cr = z01.re[i]!, ci = z01.im[i]!;
    if (cr === 0 && ci === 0) {
      // Matched: the modes are apart, and joined lines see the common-mode impedance as it is.
      commonMode.re[i] = z00.re[i]!;
      commonMode.im[i] = z00.im[i]!;
      continue;
    }
    const b2 = br * br + bi * bi;
    if (!(b2 > 0)) {
      commonMode.re[i] = z00.re[i]!;
      commonMode.im[i] = z00.im[i]!;
      flags[i]! |= PointFlag.NotFinite;
      continue;
    }
    const c2r = cr * cr - ci * ci, c2i = 2 * cr * ci;
    commonMode.re[i] = z00.re[i]! - (c2r * br + c2i * bi) / b2;
    commonMode.im[i] = z00.im[i]! - (c2i * br - c2r * bi) / b2;
  }
}
