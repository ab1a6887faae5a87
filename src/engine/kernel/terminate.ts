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

/**
 * Close the cascade (mode coordinates, see chain-ops.ts) with its terminations and write every
 * per-frequency output. Each termination reduces to 2×2 algebra (docs/engine-math.md §4):
 *
 * - in circuit: in modes the source is diagonal, Z_S = diag(Z_cm + Z_dm/4, Z_dm/4), and the
 *   receivers are Z_L = ¼·[[z1 + z2, z1 − z2], [z1 − z2, z1 + z2]]; the source EMFs are
 *   e = [1, 0] (common mode) and [0, 1] (differential mode). N = (A Z_L + B) + Z_S (C Z_L + D),
 *   i_out = N⁻¹ e, v_out = Z_L i_out;
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

    // Receivers in modes: lp on the diagonal, lm off it (zero for matched receivers).
    const lpr = 0.25 * (l1Re[i]! + l2Re[i]!), lpi = 0.25 * (l1Im[i]! + l2Im[i]!);
    const lmr = 0.25 * (l1Re[i]! - l2Re[i]!), lmi = 0.25 * (l1Im[i]! - l2Im[i]!);
    // Source in modes: sc for common mode, sd for differential mode.
    const sdr = 0.25 * zdRe[i]!, sdi = 0.25 * zdIm[i]!;
    const scr = zcRe[i]! + sdr, sci = zcIm[i]! + sdi;

    // X = A Z_L + B, W = C Z_L + D.
    const x00r = t00r * lpr - t00i * lpi + (t01r * lmr - t01i * lmi) + t02r;
    const x00i = t00r * lpi + t00i * lpr + (t01r * lmi + t01i * lmr) + t02i;
    const x01r = t00r * lmr - t00i * lmi + (t01r * lpr - t01i * lpi) + t03r;
    const x01i = t00r * lmi + t00i * lmr + (t01r * lpi + t01i * lpr) + t03i;
    const x10r = t10r * lpr - t10i * lpi + (t11r * lmr - t11i * lmi) + t12r;
    const x10i = t10r * lpi + t10i * lpr + (t11r * lmi + t11i * lmr) + t12i;
    const x11r = t10r * lmr - t10i * lmi + (t11r * lpr - t11i * lpi) + t13r;
    const x11i = t10r * lmi + t10i * lmr + (t11r * lpi + t11i * lpr) + t13i;
    const w00r = t20r * lpr - t20i * lpi + (t21r * lmr - t21i * lmi) + t22r;
    const w00i = t20r * lpi + t20i * lpr + (t21r * lmi + t21i * lmr) + t22i;
    const w01r = t20r * lmr - t20i * lmi + (t21r * lpr - t21i * lpi) + t23r;
    const w01i = t20r * lmi + t20i * lmr + (t21r * lpi + t21i * lpr) + t23i;
    const w10r = t30r * lpr - t30i * lpi + (t31r * lmr - t31i * lmi) + t32r;
    const w10i = t30r * lpi + t30i * lpr + (t31r * lmi + t31i * lmr) + t32i;
    const w11r = t30r * lmr - t30i * lmi + (t31r * lpr - t31i * lpi) + t33r;
    const w11i = t30r * lmi + t30i * lmr + (t31r * lpi + t31i * lpr) + t33i;

    // N = X + Z_S W with Z_S diagonal: row 0 takes sc, row 1 takes sd. (A large Z_cm, a few pF
    // to chassis, multiplies row 0 only: in modes nothing cancels against it.)
    const n00r = x00r + (scr * w00r - sci * w00i), n00i = x00i + (scr * w00i + sci * w00r);
    const n01r = x01r + (scr * w01r - sci * w01i), n01i = x01i + (scr * w01i + sci * w01r);
    const n10r = x10r + (sdr * w10r - sdi * w10i), n10i = x10i + (sdr * w10i + sdi * w10r);
    const n11r = x11r + (sdr * w11r - sdi * w11i), n11i = x11i + (sdr * w11i + sdi * w11r);
    const detr = n00r * n11r - n00i * n11i - (n01r * n10r - n01i * n10i);
    const deti = n00r * n11i + n00i * n11r - (n01r * n10i + n01i * n10r);
    const det2 = detr * detr + deti * deti;
    const invr = detr / det2, invi = -deti / det2;

    // Common-mode EMF: i = [N11, −N10]/det; differential-mode EMF: i = [−N01, N00]/det.
    // v = Z_L i: v_c = lp·i_c + lm·i_d, v_d = lm·i_c + lp·i_d; V1 = v_c + v_d, V2 = v_c − v_d.
    {
      const icr = n11r * invr - n11i * invi, ici = n11r * invi + n11i * invr;
      const idr = -(n10r * invr - n10i * invi), idi = -(n10r * invi + n10i * invr);
      const vcr = lpr * icr - lpi * ici + (lmr * idr - lmi * idi);
      const vci = lpr * ici + lpi * icr + (lmr * idi + lmi * idr);
      const vdr = lmr * icr - lmi * ici + (lpr * idr - lpi * idi);
      const vdi = lmr * ici + lmi * icr + (lpr * idi + lpi * idr);
      cmFromCm.re[i] = vcr;
      cmFromCm.im[i] = vci;
      dmFromCm.re[i] = vdr;
      dmFromCm.im[i] = vdi;
      line1FromCm.re[i] = vcr + vdr;
      line1FromCm.im[i] = vci + vdi;
      line2FromCm.re[i] = vcr - vdr;
      line2FromCm.im[i] = vci - vdi;
    }
    {
      const icr = -(n01r * invr - n01i * invi), ici = -(n01r * invi + n01i * invr);
      const idr = n00r * invr - n00i * invi, idi = n00r * invi + n00i * invr;
      const vcr = lpr * icr - lpi * ici + (lmr * idr - lmi * idi);
      const vci = lpr * ici + lpi * icr + (lmr * idi + lmi * idr);
      const vdr = lmr * icr - lmi * ici + (lpr * idr - lpi * idi);
      const vdi = lmr * ici + lmi * icr + (lpr * idi + lpi * idr);
      cmFromDm.re[i] = vcr;
      cmFromDm.im[i] = vci;
      dmFromDm.re[i] = vdr;
      dmFromDm.im[i] = vdi;
      line1FromDm.re[i] = vcr + vdr;
      line1FromDm.im[i] = vci + vdi;
      line2FromDm.re[i] = vcr - vdr;
      line2FromDm.im[i] = vci - vdi;
    }

    // No filter: N₀ = Z_L + Z_S = [[lp + sc, lm], [lm, lp + sd]];
    // T_CM = (lp·(lp + sd) − lm²)/det₀, T_DM = (lp·(lp + sc) − lm²)/det₀.
    const a0r = lpr + scr, a0i = lpi + sci;
    const d0r = lpr + sdr, d0i = lpi + sdi;
    const lm2r = lmr * lmr - lmi * lmi, lm2i = 2 * lmr * lmi;
    const e0r = a0r * d0r - a0i * d0i - lm2r, e0i = a0r * d0i + a0i * d0r - lm2i;
    const e02 = e0r * e0r + e0i * e0i;
    writeQuotient(bareCmFromCm, i, lpr * d0r - lpi * d0i - lm2r, lpr * d0i + lpi * d0r - lm2i, e0r, e0i);
    writeQuotient(bareDmFromDm, i, lpr * a0r - lpi * a0i - lm2r, lpr * a0i + lpi * a0r - lm2i, e0r, e0i);

    if (!(det2 > 0 && det2 < Infinity && e02 > 0)) {
      flags[i]! |= PointFlag.NotFinite;
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
 * Common mode, lines joined: at both ends v_d = 0; the load gives v_c,out = r_l·i_c,out, and the
 * tie at the input, v_d,in = 0, fixes the split: i_d = −(A10·r_l + B10)/B11 per unit i_c. With no
 * differential-mode impedance around the loop (B11 = 0, e.g. an ideal choke) the split changes no
 * voltage and is taken as even (i_d = 0). Then E = (v_c,in + r_s·i_c,in)·i_c and
 * V_without/V_with = den/(r_s + r_l).
 *
 * Differential mode, balanced: e = [0, ½], N = A·r_l/4 + B + (r_s/4)(C·r_l/4 + D),
 * V_out = V1 − V2 = r_l·N00/(4 det N), so V_without/V_with = 4·det N/((r_s + r_l)·N00).
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
  const sum2 = (rs + rl) * (rs + rl);
  const ql = 0.25 * rl;
  const qs = 0.25 * rs;
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

    // Common mode, joined lines.
    const numr = t10r * rl + t12r, numi = t10i * rl + t12i;
    const b2 = t13r * t13r + t13i * t13i;
    let idr = 0;
    let idi = 0;
    if (b2 > 0 && (numr !== 0 || numi !== 0)) {
      idr = -(numr * t13r + numi * t13i) / b2;
      idi = -(numi * t13r - numr * t13i) / b2;
    }
    const vr = t00r * rl + t02r + (t03r * idr - t03i * idi);
    const vi = t00i * rl + t02i + (t03r * idi + t03i * idr);
    const cr = t20r * rl + t22r + (t23r * idr - t23i * idi);
    const ci = t20i * rl + t22i + (t23r * idi + t23i * idr);
    const denr = vr + rs * cr, deni = vi + rs * ci;
    const cmRatio = (denr * denr + deni * deni) / sum2;

    // Differential mode, balanced. Only N00 and det N are needed.
    const m00r = t00r * ql + t02r + qs * (t20r * ql + t22r), m00i = t00i * ql + t02i + qs * (t20i * ql + t22i);
    const m01r = t01r * ql + t03r + qs * (t21r * ql + t23r), m01i = t01i * ql + t03i + qs * (t21i * ql + t23i);
    const m10r = t10r * ql + t12r + qs * (t30r * ql + t32r), m10i = t10i * ql + t12i + qs * (t30i * ql + t32i);
    const m11r = t11r * ql + t13r + qs * (t31r * ql + t33r), m11i = t11i * ql + t13i + qs * (t31i * ql + t33i);
    const mdr = m00r * m11r - m00i * m11i - (m01r * m10r - m01i * m10i);
    const mdi = m00r * m11i + m00i * m11r - (m01r * m10i + m01i * m10r);
    const dmRatio = (16 * (mdr * mdr + mdi * mdi)) / (sum2 * (m00r * m00r + m00i * m00i));

    cmLoss[i] = cmRatio;
    dmLoss[i] = dmRatio;
    if (!(cmRatio < Infinity) || !(dmRatio < Infinity)) {
      flags[i]! |= PointFlag.NotFinite;
      if (!(cmRatio < Infinity)) cmLoss[i] = 0;
      if (!(dmRatio < Infinity)) dmLoss[i] = 0;
    }
  }
}

/** out[i] = n / d; returns PointFlag.NotFinite (writing 0) when d is zero. */
function writeQuotient(out: ComplexColumns, i: number, nr: number, ni: number, dr: number, di: number): number {
  const d2 = dr * dr + di * di;
  if (!(d2 > 0) || !(d2 < Infinity)) {
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
