/**
 * The 4×4 chain (ABCD) matrix of a two-line network over a grid, in MODE coordinates, and the
 * in-place updates that append one element to the cascade. See docs/engine-math.md §3.
 *
 *   [v_in; i_in] = T · [v_out; i_out],   T = [[A, B], [C, D]] with 2×2 blocks,
 *   v = [v_c, v_d] = [(V1 + V2)/2, (V1 − V2)/2],   i = [i_c, i_d] = [I1 + I2, I1 − I2].
 *
 * Why modes: the parts with the most extreme impedances in a mains filter are symmetric — a
 * common-mode choke (common-mode impedance 10⁴ times its leakage) and an X capacitor near its
 * resonance (a near short between the lines). In mode coordinates both are diagonal, so neither
 * ever shares a matrix entry with the other mode. In line coordinates every entry mixes the modes
 * and, after a few such parts, the smaller mode is a difference of large numbers: measured against
 * 60-digit nodal solutions, line coordinates lost two significant digits of T_CM on a filter with
 * an X capacitor in front of two chokes (docs/engine-math.md §6). Single-line parts (a Y capacitor,
 * an inductor in one line) couple the modes, as they physically do.
 *
 * Storage is frequency-inner: entry (row r, column c) occupies re/im[(4r + c)·stride + i], so each
 * update streams over contiguous arrays. The kernel works through the grid in blocks of `stride`
 * points so the whole matrix stays in the first-level cache while every element is applied;
 * `offset` says where the block starts in the element's full-grid operand arrays. Appending an
 * element post-multiplies T by its chain matrix: a series element only adds to columns 2–3
 * (B and D), a shunt element only to columns 0–1 (A and C).
 */
export interface ChainBuffer {
  readonly re: Float64Array;
  readonly im: Float64Array;
  /** Distance between two entries of the matrix; a block may use fewer points than this. */
  readonly stride: number;
}

export function allocateChain(capacity: number): ChainBuffer {
  return { re: new Float64Array(16 * capacity), im: new Float64Array(16 * capacity), stride: capacity };
}

/** T = I for the first `count` points. */
export function resetToIdentity(chain: ChainBuffer, count: number): void {
  const { re, im, stride } = chain;
  for (let entry = 0; entry < 16; entry += 1) {
    const value = entry % 5 === 0 ? 1 : 0; // entries 0, 5, 10, 15 are the diagonal
    re.fill(value, entry * stride, entry * stride + count);
    im.fill(0, entry * stride, entry * stride + count);
  }
}

/** For every row: column[target] += column[source]·f. */
function addScaledColumn(
  chain: ChainBuffer,
  count: number,
  source: number,
  target: number,
  factorRe: Float64Array,
  factorIm: Float64Array,
  offset: number,
): void {
  const { re, im, stride } = chain;
  for (let row = 0; row < 4; row += 1) {
    const from = (4 * row + source) * stride;
    const to = (4 * row + target) * stride;
    for (let i = 0; i < count; i += 1) {
      const ar = re[from + i]!;
      const ai = im[from + i]!;
      const fr = factorRe[offset + i]!;
      const fi = factorIm[offset + i]!;
      re[to + i]! += ar * fr - ai * fi;
      im[to + i]! += ar * fi + ai * fr;
    }
  }
}

/**
 * For every row, with s = column[a] + sign·column[b]:
 * column[target] += s·f and column[mirror] += sign·s·f. The rank-one updates of single-line parts.
 */
function addRankOne(
  chain: ChainBuffer,
  count: number,
  a: number,
  b: number,
  sign: 1 | -1,
  target: number,
  mirror: number,
  factorRe: Float64Array,
  factorIm: Float64Array,
  offset: number,
): void {
  const { re, im, stride } = chain;
  for (let row = 0; row < 4; row += 1) {
    const ca = (4 * row + a) * stride;
    const cb = (4 * row + b) * stride;
    const t1 = (4 * row + target) * stride;
    const t2 = (4 * row + mirror) * stride;
    for (let i = 0; i < count; i += 1) {
      const sr = re[ca + i]! + sign * re[cb + i]!;
      const si = im[ca + i]! + sign * im[cb + i]!;
      const fr = factorRe[offset + i]!;
      const fi = factorIm[offset + i]!;
      const pr = sr * fr - si * fi;
      const pi = sr * fi + si * fr;
      re[t1 + i]! += pr;
      im[t1 + i]! += pi;
      re[t2 + i]! += sign * pr;
      im[t2 + i]! += sign * pi;
    }
  }
}

/**
 * A symmetric series pair (common-mode choke), diagonal in modes: Z_m = diag(z_c, z_d), so
 * column2 += column0·z_c and column3 += column1·z_d. For a choke z_c = even/2 (both windings in
 * parallel carry the common-mode current) and z_d = odd/2.
 */
export function appendSeriesModal(
  chain: ChainBuffer,
  count: number,
  commonRe: Float64Array,
  commonIm: Float64Array,
  differentialRe: Float64Array,
  differentialIm: Float64Array,
  offset = 0,
): void {
  addScaledColumn(chain, count, 0, 2, commonRe, commonIm, offset);
  addScaledColumn(chain, count, 1, 3, differentialRe, differentialIm, offset);
}

/**
 * Series impedance z in one line. In modes Z_m = (z/4)·[[1, ±1], [±1, 1]] (+ for line 1, − for
 * line 2), so with s = column0 ± column1: column2 += s·z/4 and column3 += ±s·z/4.
 * `quarterRe/Im` hold z/4.
 */
export function appendSeriesInLine(
  chain: ChainBuffer,
  count: number,
  line: 0 | 1,
  quarterRe: Float64Array,
  quarterIm: Float64Array,
  offset = 0,
): void {
  addRankOne(chain, count, 0, 1, line === 0 ? 1 : -1, 2, 3, quarterRe, quarterIm, offset);
}

/** Shunt admittance y between the lines: Y_m = diag(0, 4y), so column1 += column3·4y. `fourRe/Im` hold 4y. */
export function appendShuntLineToLine(
  chain: ChainBuffer,
  count: number,
  fourRe: Float64Array,
  fourIm: Float64Array,
  offset = 0,
): void {
  addScaledColumn(chain, count, 3, 1, fourRe, fourIm, offset);
}

/**
 * Shunt admittance y from one line to ground. In modes Y_m = y·[[1, ±1], [±1, 1]], so with
 * s = column2 ± column3: column0 += s·y and column1 += ±s·y.
 */
export function appendShuntToGround(
  chain: ChainBuffer,
  count: number,
  line: 0 | 1,
  yRe: Float64Array,
  yIm: Float64Array,
  offset = 0,
): void {
  addRankOne(chain, count, 2, 3, line === 0 ? 1 : -1, 0, 1, yRe, yIm, offset);
}
