import type { ComplexColumns } from '../complex-columns.ts';
import type { ResistiveSystem } from '../network.ts';
import { PointFlag } from '../point-flags.ts';
import type { ChainBuffer } from './chain-ops.ts';
import type { NetworkResponse } from './network-response.ts';

/** Termination impedances over the grid (ohms). */
export interface TerminationImpedances {
  /** Noise source: from the lines' midpoint to ground. */
  readonly commonModeSource: ComplexColumns;
  /** Noise source: line to line, half in each line. */
  readonly differentialModeSource: ComplexColumns;
  readonly receiverLine1: ComplexColumns;
  readonly receiverLine2: ComplexColumns;
}

/** Below this ratio the two lines' loop impedance counts as zero when the lines are joined. */
const JOINED_LOOP_EPSILON_SQUARED = 1e-28;

/**
 * Close the cascade with its terminations and write every per-frequency output. The derivations
 * (docs/engine-math.md §4) reduce each termination to 2×2 algebra, so no general 4×4 solve runs:
 *
 * - in circuit: source Z_S = [[a, b], [b, a]] (a = Z_cm + Z_dm/2, b = Z_cm), receivers Z_L = diag;
 *   E = N·I_out with N = (A Z_L + B) + Z_S (C Z_L + D), V_out = Z_L N⁻¹ E;
 * - input impedance: Z_in = (A Z_L + B)(C Z_L + D)⁻¹, reduced to line-to-line and joined-lines values;
 * - resistive common mode: both lines joined at each end, r_s and r_l to ground;
 * - resistive differential mode: r_s and r_l line to line, balanced about ground.
 */
export function terminate(
  chain: ChainBuffer,
  count: number,
  terminations: TerminationImpedances,
  systems: readonly ResistiveSystem[],
  out: NetworkResponse,
  offset = 0,
): void {
  const { re, im, stride } = chain;
  const { commonModeSource: zc, differentialModeSource: zd, receiverLine1: l1, receiverLine2: l2 } = terminations;
  const zcRe = zc.re, zcIm = zc.im, zdRe = zd.re, zdIm = zd.im;
  const l1Re = l1.re, l1Im = l1.im, l2Re = l2.re, l2Im = l2.im;
  const systemCount = systems.length;
  const sourceOhm = Float64Array.from(systems, (s) => s.sourceOhm);
  const loadOhm = Float64Array.from(systems, (s) => s.loadOhm);
  const cmLoss = out.resistiveCmLoss;
  const dmLoss = out.resistiveDmLoss;
  const flags = out.flags;
  // Hoisted: the response object may be in dictionary mode, and a property lookup per point costs.
  const line1FromCm = out.line1FromCm, line2FromCm = out.line2FromCm;
  const line1FromDm = out.line1FromDm, line2FromDm = out.line2FromDm;
  const bareLine1FromCm = out.bareLine1FromCm, bareLine2FromCm = out.bareLine2FromCm;
  const bareLine1FromDm = out.bareLine1FromDm, bareLine2FromDm = out.bareLine2FromDm;
  const inputImpedanceCm = out.inputImpedanceCm, inputImpedanceDm = out.inputImpedanceDm;
  for (let k = 0; k < count; k += 1) {
    // Chain entries t_rc for this frequency; k indexes the block, i the grid.
    const i = offset + k;
    const t00r = re[k]!, t00i = im[k]!;
    const t01r = re[stride + k]!, t01i = im[stride + k]!;
    const t02r = re[2 * stride + k]!, t02i = im[2 * stride + k]!;
    const t03r = re[3 * stride + k]!, t03i = im[3 * stride + k]!;
    const t10r = re[4 * stride + k]!, t10i = im[4 * stride + k]!;
    const t11r = re[5 * stride + k]!, t11i = im[5 * stride + k]!;
    const t12r = re[6 * stride + k]!, t12i = im[6 * stride + k]!;
    const t13r = re[7 * stride + k]!, t13i = im[7 * stride + k]!;
    const t20r = re[8 * stride + k]!, t20i = im[8 * stride + k]!;
    const t21r = re[9 * stride + k]!, t21i = im[9 * stride + k]!;
    const t22r = re[10 * stride + k]!, t22i = im[10 * stride + k]!;
    const t23r = re[11 * stride + k]!, t23i = im[11 * stride + k]!;
    const t30r = re[12 * stride + k]!, t30i = im[12 * stride + k]!;
    const t31r = re[13 * stride + k]!, t31i = im[13 * stride + k]!;
    const t32r = re[14 * stride + k]!, t32i = im[14 * stride + k]!;
    const t33r = re[15 * stride + k]!, t33i = im[15 * stride + k]!;

    const zl1r = l1Re[i]!, zl1i = l1Im[i]!;
    const zl2r = l2Re[i]!, zl2i = l2Im[i]!;
    const br = zcRe[i]!, bi = zcIm[i]!;
    const ar = br + 0.5 * zdRe[i]!, ai = bi + 0.5 * zdIm[i]!;

    // X = A Z_L + B, W = C Z_L + D (Z_L diagonal: column c scales by the line-c receiver).
    const x00r = t00r * zl1r - t00i * zl1i + t02r, x00i = t00r * zl1i + t00i * zl1r + t02i;
    const x01r = t01r * zl2r - t01i * zl2i + t03r, x01i = t01r * zl2i + t01i * zl2r + t03i;
    const x10r = t10r * zl1r - t10i * zl1i + t12r, x10i = t10r * zl1i + t10i * zl1r + t12i;
    const x11r = t11r * zl2r - t11i * zl2i + t13r, x11i = t11r * zl2i + t11i * zl2r + t13i;
    const w00r = t20r * zl1r - t20i * zl1i + t22r, w00i = t20r * zl1i + t20i * zl1r + t22i;
    const w01r = t21r * zl2r - t21i * zl2i + t23r, w01i = t21r * zl2i + t21i * zl2r + t23i;
    const w10r = t30r * zl1r - t30i * zl1i + t32r, w10i = t30r * zl1i + t30i * zl1r + t32i;
    const w11r = t31r * zl2r - t31i * zl2i + t33r, w11i = t31r * zl2i + t31i * zl2r + t33i;

    // N = X + Z_S W
    const n00r = x00r + (ar * w00r - ai * w00i) + (br * w10r - bi * w10i);
    const n00i = x00i + (ar * w00i + ai * w00r) + (br * w10i + bi * w10r);
    const n01r = x01r + (ar * w01r - ai * w01i) + (br * w11r - bi * w11i);
    const n01i = x01i + (ar * w01i + ai * w01r) + (br * w11i + bi * w11r);
    const n10r = x10r + (br * w00r - bi * w00i) + (ar * w10r - ai * w10i);
    const n10i = x10i + (br * w00i + bi * w00r) + (ar * w10i + ai * w10r);
    const n11r = x11r + (br * w01r - bi * w01i) + (ar * w11r - ai * w11i);
    const n11i = x11i + (br * w01i + bi * w01r) + (ar * w11i + ai * w11r);

    let flag = 0;
    // 1/det(N)
    const detr = n00r * n11r - n00i * n11i - (n01r * n10r - n01i * n10i);
    const deti = n00r * n11i + n00i * n11r - (n01r * n10i + n01i * n10r);
    const det2 = detr * detr + deti * deti;
    const invr = detr / det2, invi = -deti / det2;
    // I_out = adj(N)·E / det; V = Z_L·I. E_cm = [1, 1], E_dm = [1, −1].
    {
      const pr = zl1r * (n11r - n01r) - zl1i * (n11i - n01i);
      const pi = zl1r * (n11i - n01i) + zl1i * (n11r - n01r);
      line1FromCm.re[i] = pr * invr - pi * invi;
      line1FromCm.im[i] = pr * invi + pi * invr;
    }
    {
      const pr = zl2r * (n00r - n10r) - zl2i * (n00i - n10i);
      const pi = zl2r * (n00i - n10i) + zl2i * (n00r - n10r);
      line2FromCm.re[i] = pr * invr - pi * invi;
      line2FromCm.im[i] = pr * invi + pi * invr;
    }
    {
      const pr = zl1r * (n11r + n01r) - zl1i * (n11i + n01i);
      const pi = zl1r * (n11i + n01i) + zl1i * (n11r + n01r);
      line1FromDm.re[i] = pr * invr - pi * invi;
      line1FromDm.im[i] = pr * invi + pi * invr;
    }
    {
      const pr = zl2r * (-(n10r + n00r)) - zl2i * (-(n10i + n00i));
      const pi = zl2r * (-(n10i + n00i)) + zl2i * (-(n10r + n00r));
      line2FromDm.re[i] = pr * invr - pi * invi;
      line2FromDm.im[i] = pr * invi + pi * invr;
    }

    // No filter: N₀ = Z_L + Z_S.
    const p1r = zl1r + ar, p1i = zl1i + ai;
    const p2r = zl2r + ar, p2i = zl2i + ai;
    const d0r = p1r * p2r - p1i * p2i - (br * br - bi * bi);
    const d0i = p1r * p2i + p1i * p2r - 2 * br * bi;
    const d02 = d0r * d0r + d0i * d0i;
    const inv0r = d0r / d02, inv0i = -d0i / d02;
    {
      const pr = zl1r * (p2r - br) - zl1i * (p2i - bi);
      const pi = zl1r * (p2i - bi) + zl1i * (p2r - br);
      bareLine1FromCm.re[i] = pr * inv0r - pi * inv0i;
      bareLine1FromCm.im[i] = pr * inv0i + pi * inv0r;
    }
    {
      const pr = zl2r * (p1r - br) - zl2i * (p1i - bi);
      const pi = zl2r * (p1i - bi) + zl2i * (p1r - br);
      bareLine2FromCm.re[i] = pr * inv0r - pi * inv0i;
      bareLine2FromCm.im[i] = pr * inv0i + pi * inv0r;
    }
    {
      const pr = zl1r * (p2r + br) - zl1i * (p2i + bi);
      const pi = zl1r * (p2i + bi) + zl1i * (p2r + br);
      bareLine1FromDm.re[i] = pr * inv0r - pi * inv0i;
      bareLine1FromDm.im[i] = pr * inv0i + pi * inv0r;
    }
    {
      const pr = zl2r * (-(br + p1r)) - zl2i * (-(bi + p1i));
      const pi = zl2r * (-(bi + p1i)) + zl2i * (-(br + p1r));
      bareLine2FromDm.re[i] = pr * inv0r - pi * inv0i;
      bareLine2FromDm.im[i] = pr * inv0i + pi * inv0r;
    }

    // Input impedance: S = (X00 − X10)(W11 + W01) − (X01 − X11)(W10 + W00);
    // Z_dm = S / det W, Z_cm = det X / S.
    const dxr = x00r - x10r, dxi = x00i - x10i;
    const sw1r = w11r + w01r, sw1i = w11i + w01i;
    const ex = x01r - x11r, exi = x01i - x11i;
    const sw0r = w10r + w00r, sw0i = w10i + w00i;
    const sr = dxr * sw1r - dxi * sw1i - (ex * sw0r - exi * sw0i);
    const si = dxr * sw1i + dxi * sw1r - (ex * sw0i + exi * sw0r);
    const detWr = w00r * w11r - w00i * w11i - (w01r * w10r - w01i * w10i);
    const detWi = w00r * w11i + w00i * w11r - (w01r * w10i + w01i * w10r);
    const detXr = x00r * x11r - x00i * x11i - (x01r * x10r - x01i * x10i);
    const detXi = x00r * x11i + x00i * x11r - (x01r * x10i + x01i * x10r);
    flag |= writeQuotient(inputImpedanceDm, i, sr, si, detWr, detWi);
    flag |= writeQuotient(inputImpedanceCm, i, detXr, detXi, sr, si);

    // Resistive common mode, lines joined. With V_out = [u, u], I_out = [x, y], x + y = u/r_l, the
    // tie V1_in = V2_in fixes the split: α + p·x + q·y = 0 (see engine-math.md §4.3).
    const sa1r = t00r + t01r, sa1i = t00i + t01i;
    const alphar = sa1r - t10r - t11r, alphai = sa1i - t10i - t11i;
    const pr = t02r - t12r, pi = t02i - t12i;
    const qr = t03r - t13r, qi = t03i - t13i;
    const pqr = pr - qr, pqi = pi - qi;
    const pq2 = pqr * pqr + pqi * pqi;
    const joinedLoopIsShort = pq2 <= JOINED_LOOP_EPSILON_SQUARED * (pr * pr + pi * pi + qr * qr + qi * qi);
    const ipqr = pqr / pq2, ipqi = -pqi / pq2;
    const scr = t20r + t21r + t30r + t31r, sci = t20i + t21i + t30i + t31i;
    const cxr = t22r + t32r, cxi = t22i + t32i;
    const cyr = t23r + t33r, cyi = t23i + t33i;

    for (let s = 0; s < systemCount; s += 1) {
      const rs = sourceOhm[s]!;
      const rl = loadOhm[s]!;
      const g = 1 / rl;
      let xr: number, xi: number;
      if (joinedLoopIsShort) {
        // Zero loop impedance: the split does not change any voltage; take the symmetric one.
        xr = 0.5 * g;
        xi = 0;
      } else {
        const numr = alphar + qr * g, numi = alphai + qi * g;
        xr = -(numr * ipqr - numi * ipqi);
        xi = -(numr * ipqi + numi * ipqr);
      }
      const yr = g - xr, yi = -xi;
      const vr = sa1r + (t02r * xr - t02i * xi) + (t03r * yr - t03i * yi);
      const vi = sa1i + (t02r * xi + t02i * xr) + (t03r * yi + t03i * yr);
      const cr = scr + (cxr * xr - cxi * xi) + (cyr * yr - cyi * yi);
      const ci = sci + (cxr * xi + cxi * xr) + (cyr * yi + cyi * yr);
      const denr = vr + rs * cr, deni = vi + rs * ci;
      // V_with = 1/den, V_without = r_l/(r_s + r_l); IL = 20 log |V_without / V_with|.
      // In power terms, so one log and no square root: IL = 10 log(|den|²·r_l² / (r_s + r_l)²).
      const cmPowerRatio = ((denr * denr + deni * deni) * rl * rl) / ((rs + rl) * (rs + rl));
      cmLoss[s]![i] = cmPowerRatio;
      if (!(cmPowerRatio < Infinity)) flag |= PointFlag.NotFinite;

      // Resistive differential mode: r_s/2 and r_l/2 per line, EMF ±1/2.
      const zs = 0.5 * rs, zl = 0.5 * rl;
      const m00r = t00r * zl + t02r + zs * (t20r * zl + t22r), m00i = t00i * zl + t02i + zs * (t20i * zl + t22i);
      const m01r = t01r * zl + t03r + zs * (t21r * zl + t23r), m01i = t01i * zl + t03i + zs * (t21i * zl + t23i);
      const m10r = t10r * zl + t12r + zs * (t30r * zl + t32r), m10i = t10i * zl + t12i + zs * (t30i * zl + t32i);
      const m11r = t11r * zl + t13r + zs * (t31r * zl + t33r), m11i = t11i * zl + t13i + zs * (t31i * zl + t33i);
      const mdr = m00r * m11r - m00i * m11i - (m01r * m10r - m01i * m10i);
      const mdi = m00r * m11i + m00i * m11r - (m01r * m10i + m01i * m10r);
      const sumr = m00r + m01r + m10r + m11r, sumi = m00i + m01i + m10i + m11i;
      // V_without / V_with = 4·|det N| / ((r_s + r_l)·|ΣN|)
      const dmPowerRatio = (16 * (mdr * mdr + mdi * mdi)) / ((rs + rl) * (rs + rl) * (sumr * sumr + sumi * sumi));
      dmLoss[s]![i] = dmPowerRatio;
      if (!(dmPowerRatio < Infinity)) flag |= PointFlag.NotFinite;
    }

    if (!(det2 > 0 && d02 > 0)) flag |= PointFlag.NotFinite;
    if (flag !== 0) {
      flags[i]! |= flag;
      if (flag & PointFlag.NotFinite) scrubPoint(out, i);
    }
  }
}

/** out[i] = n / d; returns PointFlag.NotFinite (writing 0) when d is zero. */
function writeQuotient(out: ComplexColumns, i: number, nr: number, ni: number, dr: number, di: number): number {
  const d2 = dr * dr + di * di;
  if (!(d2 > 0) || !Number.isFinite(d2)) {
    out.re[i] = 0;
    out.im[i] = 0;
    return PointFlag.NotFinite;
  }
  out.re[i] = (nr * dr + ni * di) / d2;
  out.im[i] = (ni * dr - nr * di) / d2;
  return 0;
}

/** Replace any non-finite value at point i with 0 so no NaN escapes; the point is already flagged. */
function scrubPoint(out: NetworkResponse, i: number): void {
  const columns = [
    out.line1FromCm,
    out.line2FromCm,
    out.line1FromDm,
    out.line2FromDm,
    out.bareLine1FromCm,
    out.bareLine2FromCm,
    out.bareLine1FromDm,
    out.bareLine2FromDm,
    out.inputImpedanceCm,
    out.inputImpedanceDm,
  ];
  for (const column of columns) {
    if (!Number.isFinite(column.re[i]!) || !Number.isFinite(column.im[i]!)) {
      column.re[i] = 0;
      column.im[i] = 0;
    }
  }
  for (const column of [...out.resistiveCmLoss, ...out.resistiveDmLoss]) {
    if (!Number.isFinite(column[i]!)) column[i] = 0;
  }
}
