/**
 * The 4×4 chain (ABCD) matrix of a two-line network over a grid, and the in-place updates that
 * append one element to the cascade. See docs/engine-math.md §3.
 *
 *   [V_in; I_in] = T · [V_out; I_out],   T = [[A, B], [C, D]] with 2×2 blocks, lines 1 and 2.
 *
 * Line coordinates, not mode coordinates: a part in one line then touches only that line's
 * columns, so a large impedance in one line (a series capacitor, say) never has to cancel
 * against the other line. (Mode coordinates favour chokes instead; tried and measured, they lose
 * six digits on strongly unbalanced filters where line coordinates lose none. docs/engine-math.md §6.)
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

/**
 * For every row: column[target] += (column[a] − column[b]·[b ≥ 0])·f, and when `mirror` is set,
 * column[mirrorTarget] −= the same product. Every update below is one call.
 */
function addScaledColumn(
  chain: ChainBuffer,
  count: number,
  a: number,
  b: number,
  target: number,
  mirrorTarget: number,
  factorRe: Float64Array,
  factorIm: Float64Array,
  offset: number,
): void {
  const { re, im, stride } = chain;
  for (let row = 0; row < 4; row += 1) {
    const ca = (4 * row + a) * stride;
    const cb = (4 * row + (b < 0 ? a : b)) * stride;
    const useB = b < 0 ? 0 : 1;
    const t1 = (4 * row + target) * stride;
    const t2 = (4 * row + (mirrorTarget < 0 ? target : mirrorTarget)) * stride;
    const mirror = mirrorTarget < 0 ? 0 : 1;
    for (let i = 0; i < count; i += 1) {
      const sr = re[ca + i]! - useB * re[cb + i]!;
      const si = im[ca + i]! - useB * im[cb + i]!;
      const fr = factorRe[offset + i]!;
      const fi = factorIm[offset + i]!;
      const pr = sr * fr - si * fi;
      const pi = sr * fi + si * fr;
      re[t1 + i]! += pr;
      im[t1 + i]! += pi;
      re[t2 + i]! -= mirror * pr;
      im[t2 + i]! -= mirror * pi;
    }
  }
}

/** Series impedance z in line `line` (0 or 1): B[:,line] += A[:,line]·z, D likewise. */
export function appendSeries(
  chain: ChainBuffer,
  count: number,
  line: 0 | 1,
  zRe: Float64Array,
  zIm: Float64Array,
  offset = 0,
): void {
  addScaledColumn(chain, count, line, -1, line + 2, -1, zRe, zIm, offset);
}

/** Shunt admittance y from line `line` to ground: A[:,line] += B[:,line]·y, C likewise. */
export function appendShuntToGround(
  chain: ChainBuffer,
  count: number,
  line: 0 | 1,
  yRe: Float64Array,
  yIm: Float64Array,
  offset = 0,
): void {
  addScaledColumn(chain, count, line + 2, -1, line, -1, yRe, yIm, offset);
}

/**
 * Shunt admittance y between the lines: Y = y·[[1, −1], [−1, 1]], so
 * column0 += (column2 − column3)·y and column1 −= (column2 − column3)·y.
 */
export function appendShuntLineToLine(
  chain: ChainBuffer,
  count: number,
  yRe: Float64Array,
  yIm: Float64Array,
  offset = 0,
): void {
  addScaledColumn(chain, count, 2, 3, 0, 1, yRe, yIm, offset);
}

/**
 * A symmetric coupled series pair with impedance matrix [[zs, zm], [zm, zs]]:
 * column2 += column0·zs + column1·zm and column3 += column0·zm + column1·zs.
 */
export function appendCoupledSeries(
  chain: ChainBuffer,
  count: number,
  selfRe: Float64Array,
  selfIm: Float64Array,
  mutualRe: Float64Array,
  mutualIm: Float64Array,
  offset = 0,
): void {
  const { re, im, stride } = chain;
  for (let row = 0; row < 4; row += 1) {
    const c0 = 4 * row * stride;
    const c1 = c0 + stride;
    const c2 = c1 + stride;
    const c3 = c2 + stride;
    for (let i = 0; i < count; i += 1) {
      const ar = re[c0 + i]!, ai = im[c0 + i]!;
      const br = re[c1 + i]!, bi = im[c1 + i]!;
      const sr = selfRe[offset + i]!, si = selfIm[offset + i]!;
      const mr = mutualRe[offset + i]!, mi = mutualIm[offset + i]!;
      re[c2 + i]! += ar * sr - ai * si + (br * mr - bi * mi);
      im[c2 + i]! += ar * si + ai * sr + (br * mi + bi * mr);
      re[c3 + i]! += ar * mr - ai * mi + (br * sr - bi * si);
      im[c3 + i]! += ar * mi + ai * mr + (br * si + bi * sr);
    }
  }
}
