/** Small helpers over sorted Float64Array columns. */

/** The first index whose value is ≥ `value` (column rising). */
export function lowerBound(column: ArrayLike<number>, value: number): number {
  let low = 0;
  let high = column.length;
  while (low < high) {
    const mid = (low + high) >>> 1;
    if (column[mid]! < value) low = mid + 1;
    else high = mid;
  }
  return low;
}

/** The highest finite value in [startHz, stopHz] of a column on a frequency axis, with its frequency. */
export function maxInRange(frequencyHz: Float64Array, values: Float64Array, startHz: number, stopHz: number): { value: number; frequencyHz: number } | undefined {
  let best: { value: number; frequencyHz: number } | undefined;
  for (let i = lowerBound(frequencyHz, startHz); i < frequencyHz.length && frequencyHz[i]! <= stopHz; i += 1) {
    const value = values[i]!;
    if (Number.isFinite(value) && (!best || value > best.value)) best = { value, frequencyHz: frequencyHz[i]! };
  }
  return best;
}
