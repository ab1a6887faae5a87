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
 * Close the cascade with its terminations and write every per-frequency output. Each
 * termination reduces to 2×2 algebra (docs/engine-math.md §4), so no general 4×4 solve runs:
 *
 * - in circuit: source Z_S = (Z_dm/2)·I + Z_cm·u uᵀ (u = [1, 1]), receivers Z_L = diag(z1, z2);
 *   E = N·I_out with N = (A Z_L + B) + Z_S (C Z_L + D), V_out = Z_L N⁻¹ E, for the common-mode
 *   EMF E = [1, 1] and the differential-mode EMF E = [1, −1];
 * - resistive common mode: both lines joined at each end, r_s and r_l to ground;
 * - resistive differential mode: r_s and r_l line to line, balanced about ground.
 *
 * `offset` is where this block of points starts in the grid; chain entries are indexed within
 * the block, outputs within the grid.
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
  // Hoisted: the response object may be in dictionary mode, and a property lookup per point costs.
  const zcRe = zc.re, zcIm = zc.im, zdRe = zd.re, zdIm = zd.im;
  const l1Re = l1.re, l1Im = l1.im, l2Re = l2.re, l2Im = l2.im;
  const cmFromCm = out.cmFromCm, dmFromCm = out.dmFromCm, cmFromDm = out.cmFromDm, dmFromDm = out.dmFromDm;
  const line1FromCm = out.line1FromCm, line2FromCm = out.line2FromCm;
  const line1FromDm = out.line1FromDm, line2FromDm = out.line2FromDm;
  const bareCmFromCm = out.bareCmFromCm, bareDmFromDm = out.bareDmFromDm;
  const flags = out.flags;

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

    // X = A Z_L + B, W = C Z_L + D (Z_L diagonal: column c scales by the line-c receiver).
    const x00r = t00r * zl1r - t00i * zl1i + t02r, x00i = t00r * zl1i + t00i * zl1r + t02i;
    const x01r = t01r * zl2r - t01i * zl2i + t03r, x01i = t01r * zl2i + t01i * zl2r + t03i;
    const x10r = t10r * zl1r - t10i * zl1i + t12r, x10i = t10r * zl1i + t10i * zl1r + t12i;
    const x11r = t11r * zl2r - t11i * zl2i + t13r, x11i = t11r * zl2i + t11i * zl2r + t13i;
    const w00r = t20r * zl1r - t20i * zl1i + t22r, w00i = t20r * zl1i + t20i * zl1r + t22i;
    const w01r = t21r * zl2r - t21i * zl2i + t23r, w01i = t21r * zl2i + t21i * zl2r + t23i;
    const w10r = t30r * zl1r - t30i * zl1i + t32r, w10i = t30r * zl1i + t30i * zl1r + t32i;
    const w11r = t31r * zl2r - t31i * zl2i + t33r, w11i = t31r * zl2i + t31i * zl2r + t33i;

    // N = X + Z_S W with Z_S = (Z_dm/2)·I + Z_cm·u uᵀ, u = [1, 1]: N = K + Z_cm·u wᵀ, where
    // K = X + (Z_dm/2)·W and wᵀ = uᵀW. A large Z_cm (a few pF to chassis) makes Z_S nearly rank
    // one, so det N is formed by the determinant lemma, det N = det K + Z_cm·wᵀ adj(K) u, and
    // the common-mode solution adj(N)·u = adj(K)·u does not contain Z_cm at all: nothing cancels.
    const hr = 0.5 * zdRe[i]!, hi = 0.5 * zdIm[i]!;
    const k00r = x00r + hr * w00r - hi * w00i, k00i = x00i + hr * w00i + hi * w00r;
    const k01r = x01r + hr * w01r - hi * w01i, k01i = x01i + hr * w01i + hi * w01r;
    const k10r = x10r + hr * w10r - hi * w10i, k10i = x10i + hr * w10i + hi * w10r;
    const k11r = x11r + hr * w11r - hi * w11i, k11i = x11i + hr * w11i + hi * w11r;
    const u0r = w00r + w10r, u0i = w00i + w10i;
    const u1r = w01r + w11r, u1i = w01i + w11i;
    // adj(K)·u = [K11 − K01, K00 − K10]
    const c1r = k11r - k01r, c1i = k11i - k01i;
    const c2r = k00r - k10r, c2i = k00i - k10i;
    const lemmar = u0r * c1r - u0i * c1i + (u1r * c2r - u1i * c2i);
    const lemmai = u0r * c1i + u0i * c1r + (u1r * c2i + u1i * c2r);
    const detr = k00r * k11r - k00i * k11i - (k01r * k10r - k01i * k10i) + (br * lemmar - bi * lemmai);
    const deti = k00r * k11i + k00i * k11r - (k01r * k10i + k01i * k10r) + (br * lemmai + bi * lemmar);

    const det2 = detr * detr + deti * deti;
    const invr = detr / det2, invi = -deti / det2;
    // I_out = adj(N)·E / det N and V = Z_L·I_out.
    // E_cm = u: adj(N)·u = adj(K)·u.
    {
      const pr = zl1r * c1r - zl1i * c1i;
      const pi = zl1r * c1i + zl1i * c1r;
      line1FromCm.re[i] = pr * invr - pi * invi;
      line1FromCm.im[i] = pr * invi + pi * invr;
    }
    {
      const pr = zl2r * c2r - zl2i * c2i;
      const pi = zl2r * c2i + zl2i * c2r;
      line2FromCm.re[i] = pr * invr - pi * invi;
      line2FromCm.im[i] = pr * invi + pi * invr;
    }
    // E_dm = [1, −1]: adj(N)·E = [K11 + K01 + 2·Z_cm·w1, −(K10 + K00 + 2·Z_cm·w0)].
    {
      const er = k11r + k01r + 2 * (br * u1r - bi * u1i);
      const ei = k11i + k01i + 2 * (br * u1i + bi * u1r);
      const pr = zl1r * er - zl1i * ei;
      const pi = zl1r * ei + zl1i * er;
      line1FromDm.re[i] = pr * invr - pi * invi;
      line1FromDm.im[i] = pr * invi + pi * invr;
    }
    {
      const er = -(k10r + k00r + 2 * (br * u0r - bi * u0i));
      const ei = -(k10i + k00i + 2 * (br * u0i + bi * u0r));
      const pr = zl2r * er - zl2i * ei;
      const pi = zl2r * ei + zl2i * er;
      line2FromDm.re[i] = pr * invr - pi * invi;
      line2FromDm.im[i] = pr * invi + pi * invr;
    }

    // Mode voltages from the line voltages: v_c = (V1 + V2)/2, v_d = (V1 − V2)/2.
    cmFromCm.re[i] = 0.5 * (line1FromCm.re[i]! + line2FromCm.re[i]!);
    cmFromCm.im[i] = 0.5 * (line1FromCm.im[i]! + line2FromCm.im[i]!);
    dmFromCm.re[i] = 0.5 * (line1FromCm.re[i]! - line2FromCm.re[i]!);
    dmFromCm.im[i] = 0.5 * (line1FromCm.im[i]! - line2FromCm.im[i]!);
    cmFromDm.re[i] = 0.5 * (line1FromDm.re[i]! + line2FromDm.re[i]!);
    cmFromDm.im[i] = 0.5 * (line1FromDm.im[i]! + line2FromDm.im[i]!);
    dmFromDm.re[i] = 0.5 * (line1FromDm.re[i]! - line2FromDm.re[i]!);
    dmFromDm.im[i] = 0.5 * (line1FromDm.im[i]! - line2FromDm.im[i]!);

    // No filter: X = Z_L, W = I, so K = diag(Z_L1 + Z_dm/2, Z_L2 + Z_dm/2) and w = u.
    const q1r = zl1r + hr, q1i = zl1i + hi;
    const q2r = zl2r + hr, q2i = zl2i + hi;
    const d0r = q1r * q2r - q1i * q2i + (br * (q1r + q2r) - bi * (q1i + q2i));
    const d0i = q1r * q2i + q1i * q2r + (br * (q1i + q2i) + bi * (q1r + q2r));
    const d02 = d0r * d0r + d0i * d0i;
    const inv0r = d0r / d02, inv0i = -d0i / d02;
    {
      // T_CM = (V1 + V2)/2 with V1 = z1·q2/det₀, V2 = z2·q1/det₀.
      const nr = 0.5 * (zl1r * q2r - zl1i * q2i + (zl2r * q1r - zl2i * q1i));
      const ni = 0.5 * (zl1r * q2i + zl1i * q2r + (zl2r * q1i + zl2i * q1r));
      bareCmFromCm.re[i] = nr * inv0r - ni * inv0i;
      bareCmFromCm.im[i] = nr * inv0i + ni * inv0r;
    }
    {
      // T_DM = (V1 − V2)/2 with V1 = z1·(q2 + 2 Z_cm)/det₀, V2 = −z2·(q1 + 2 Z_cm)/det₀.
      const e1r = q2r + 2 * br, e1i = q2i + 2 * bi;
      const e2r = q1r + 2 * br, e2i = q1i + 2 * bi;
      const nr = 0.5 * (zl1r * e1r - zl1i * e1i + (zl2r * e2r - zl2i * e2i));
      const ni = 0.5 * (zl1r * e1i + zl1i * e1r + (zl2r * e2i + zl2i * e2r));
      bareDmFromDm.re[i] = nr * inv0r - ni * inv0i;
      bareDmFromDm.im[i] = nr * inv0i + ni * inv0r;
    }

    let flag = 0;
    if (!(det2 > 0 && det2 < Infinity && d02 > 0)) flag |= PointFlag.NotFinite;
    if (flag !== 0) {
      flags[i]! |= flag;
      scrubPoint(out, i);
    }
  }
  for (let s = 0; s < systems.length; s += 1) {
    const system = systems[s]!;
    terminateResistive(chain, count, system.sourceOhm, system.loadOhm, out.resistiveCmLoss[s]!, out.resistiveDmLoss[s]!, flags, offset);
  }
}

/**
 * Resistive systems (CISPR 17 style), one pass per system so the loop keeps few live values.
 * Insertion loss is written as the power ratio |V_without / V_with|², V_without = r_l/(r_s + r_l).
 *
 * Common mode, lines joined: V_out = [u, u], I_out = [x, y] with x + y = u/r_l; the tie
 * V1_in = V2_in fixes the split, α + p·x + q·y = 0 with α = (t00 + t01) − (t10 + t11),
 * p = t02 − t12, q = t03 − t13. With no impedance around the loop the joined lines form
 * (p = q, e.g. an ideal choke) the split changes no voltage and is taken as even. Then
 * E = (V1_in + r_s·(I1_in + I2_in))·u and V_without/V_with = den·r_l/(r_s + r_l) per unit u.
 *
 * Differential mode, balanced: r_s/2 and r_l/2 per line, EMF ±½;
 * N = A·r_l/2 + B + (r_s/2)(C·r_l/2 + D), V_without/V_with = 4·det N/((r_s + r_l)·ΣN).
 */
function terminateResistive(
  chain: ChainBuffer,
  count: number,
  rs: number,
  rl: number,
  cmLoss: Float64Array,
  dmLoss: Float64Array,
  flags: Uint8Array,
  offset: number,
): void {
  const { re, im, stride } = chain;
  const g = 1 / rl;
  const zs = 0.5 * rs;
  const zl = 0.5 * rl;
  const sum2 = (rs + rl) * (rs + rl);
  for (let k = 0; k < count; k += 1) {
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

    const sa1r = t00r + t01r, sa1i = t00i + t01i;
    const alphar = sa1r - t10r - t11r, alphai = sa1i - t10i - t11i;
    const pr = t02r - t12r, pi = t02i - t12i;
    const qr = t03r - t13r, qi = t03i - t13i;
    const pqr = pr - qr, pqi = pi - qi;
    const pq2 = pqr * pqr + pqi * pqi;
    let xr: number, xi: number;
    if (pq2 <= JOINED_LOOP_EPSILON_SQUARED * (pr * pr + pi * pi + qr * qr + qi * qi)) {
      xr = 0.5 * g;
      xi = 0;
    } else {
      const numr = alphar + qr * g, numi = alphai + qi * g;
      xr = -(numr * pqr + numi * pqi) / pq2;
      xi = -(numi * pqr - numr * pqi) / pq2;
    }
    const yr = g - xr, yi = -xi;
    const vr = sa1r + (t02r * xr - t02i * xi) + (t03r * yr - t03i * yi);
    const vi = sa1i + (t02r * xi + t02i * xr) + (t03r * yi + t03i * yr);
    const sxr = t22r + t32r, sxi = t22i + t32i;
    const syr = t23r + t33r, syi = t23i + t33i;
    const cr = t20r + t21r + t30r + t31r + (sxr * xr - sxi * xi) + (syr * yr - syi * yi);
    const ci = t20i + t21i + t30i + t31i + (sxr * xi + sxi * xr) + (syr * yi + syi * yr);
    const denr = vr + rs * cr, deni = vi + rs * ci;
    const cmRatio = ((denr * denr + deni * deni) * rl * rl) / sum2;

    const m00r = t00r * zl + t02r + zs * (t20r * zl + t22r), m00i = t00i * zl + t02i + zs * (t20i * zl + t22i);
    const m01r = t01r * zl + t03r + zs * (t21r * zl + t23r), m01i = t01i * zl + t03i + zs * (t21i * zl + t23i);
    const m10r = t10r * zl + t12r + zs * (t30r * zl + t32r), m10i = t10i * zl + t12i + zs * (t30i * zl + t32i);
    const m11r = t11r * zl + t13r + zs * (t31r * zl + t33r), m11i = t11i * zl + t13i + zs * (t31i * zl + t33i);
    const mdr = m00r * m11r - m00i * m11i - (m01r * m10r - m01i * m10i);
    const mdi = m00r * m11i + m00i * m11r - (m01r * m10i + m01i * m10r);
    const sumr = m00r + m01r + m10r + m11r, sumi = m00i + m01i + m10i + m11i;
    const dmRatio = (16 * (mdr * mdr + mdi * mdi)) / (sum2 * (sumr * sumr + sumi * sumi));

    cmLoss[i] = cmRatio;
    dmLoss[i] = dmRatio;
    if (!(cmRatio < Infinity) || !(dmRatio < Infinity)) {
      flags[i]! |= PointFlag.NotFinite;
      if (!(cmRatio < Infinity)) cmLoss[i] = 0;
      if (!(dmRatio < Infinity)) dmLoss[i] = 0;
    }
  }
}

/** Replace any non-finite value at point i with 0 so no NaN escapes; the point is already flagged. */
function scrubPoint(out: NetworkResponse, i: number): void {
  const columns = [
    out.cmFromCm,
    out.dmFromCm,
    out.cmFromDm,
    out.dmFromDm,
    out.line1FromCm,
    out.line2FromCm,
    out.line1FromDm,
    out.line2FromDm,
    out.bareCmFromCm,
    out.bareDmFromDm,
  ];
  for (const column of columns) {
    if (!Number.isFinite(column.re[i]!) || !Number.isFinite(column.im[i]!)) {
      column.re[i] = 0;
      column.im[i] = 0;
    }
  }
}
