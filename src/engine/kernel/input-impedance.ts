import { PointFlag } from '../point-flags.ts';
import type { ComplexColumns } from '../complex-columns.ts';

/**
 * The impedance looking into the filter from the source side with the receivers connected,
 * found by walking from the receivers back to the source (docs/engine-math.md §5). It is not
 * taken from the chain matrix as (A Z_L + B)(C Z_L + D)⁻¹: that ratio divides nearly singular
 * 2×2 determinants when one path's impedance dwarfs the others, and was measured to lose about
 * six digits on such designs, where this recursion loses none.
 *
 * The state is the symmetric 2×2 line impedance Z = [[z00, z01], [z01, z11]] per point
 * (V = Z·I). A series element adds to it; a shunt element is a rank-one admittance y·v vᵀ
 * (v = [1, 0], [0, 1] or [1, −1]), so Sherman–Morrison updates Z without inverting it:
 *   Z ← Z − (Z v)(Z v)ᵀ · y / (1 + y·vᵀ Z v).
 */
export interface LineImpedance {
  readonly z00: ComplexColumns;
  readonly z01: ComplexColumns;
  readonly z11: ComplexColumns;
}

/** Z = diag(receiver 1, receiver 2). */
export function startAtReceivers(state: LineImpedance, line1: ComplexColumns, line2: ComplexColumns, count: number): void {
  state.z00.re.set(line1.re.subarray(0, count));
  state.z00.im.set(line1.im.subarray(0, count));
  state.z11.re.set(line2.re.subarray(0, count));
  state.z11.im.set(line2.im.subarray(0, count));
  state.z01.re.fill(0, 0, count);
  state.z01.im.fill(0, 0, count);
}

/** Series z in one line: Z[line][line] += z. */
export function addSeriesInLine(state: LineImpedance, z: ComplexColumns, line: 0 | 1, count: number): void {
  const target = line === 0 ? state.z00 : state.z11;
  for (let i = 0; i < count; i += 1) {
    target.re[i]! += z.re[i]!;
    target.im[i]! += z.im[i]!;
  }
}

/** A symmetric coupled series pair: Z += [[zs, zm], [zm, zs]]. */
export function addCoupledSeries(state: LineImpedance, self: ComplexColumns, mutual: ComplexColumns, count: number): void {
  const { z00, z01, z11 } = state;
  for (let i = 0; i < count; i += 1) {
    z00.re[i]! += self.re[i]!;
    z00.im[i]! += self.im[i]!;
    z11.re[i]! += self.re[i]!;
    z11.im[i]! += self.im[i]!;
    z01.re[i]! += mutual.re[i]!;
    z01.im[i]! += mutual.im[i]!;
  }
}

/**
 * A shunt admittance y·v vᵀ with v = [v0, v1]: [1, 0] line 1 to ground, [0, 1] line 2 to ground,
 * [1, −1] line to line. Where 1 + y·vᵀZv = 0 (a lossless parallel resonance) the point is
 * flagged and Z left as it was.
 */
export function addShunt(
  state: LineImpedance,
  admittance: ComplexColumns,
  v0: 0 | 1,
  v1: 0 | 1 | -1,
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
 * From the line impedance at the filter input: line to line (I1 = −I2) Z_dm = z00 − 2·z01 + z11;
 * lines joined (V1 = V2, I = I1 + I2) Z_cm = det Z / Z_dm.
 */
export function writeInputImpedances(
  state: LineImpedance,
  commonMode: ComplexColumns,
  differentialMode: ComplexColumns,
  count: number,
  flags: Uint8Array,
): void {
  const { z00, z01, z11 } = state;
  for (let i = 0; i < count; i += 1) {
    const a00r = z00.re[i]!, a00i = z00.im[i]!;
    const a01r = z01.re[i]!, a01i = z01.im[i]!;
    const a11r = z11.re[i]!, a11i = z11.im[i]!;
    const dmr = a00r - 2 * a01r + a11r;
    const dmi = a00i - 2 * a01i + a11i;
    differentialMode.re[i] = dmr;
    differentialMode.im[i] = dmi;
    const detr = a00r * a11r - a00i * a11i - (a01r * a01r - a01i * a01i);
    const deti = a00r * a11i + a00i * a11r - 2 * a01r * a01i;
    const d2 = dmr * dmr + dmi * dmi;
    if (!(d2 > 0)) {
      commonMode.re[i] = 0;
      commonMode.im[i] = 0;
      flags[i]! |= PointFlag.NotFinite;
      continue;
    }
    commonMode.re[i] = (detr * dmr + deti * dmi) / d2;
    commonMode.im[i] = (deti * dmr - detr * dmi) / d2;
  }
}
