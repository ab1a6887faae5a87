/**
 * Frequency grids. A grid is a Float64Array of strictly rising frequencies in Hz, never mutated
 * after it is made. Points are log spaced like SPICE's "ac dec": start·10^(k/pointsPerDecade).
 */

/** Log-spaced points from start to stop inclusive; stop is appended when the decade count is fractional. */
export function logSpace(startHz: number, stopHz: number, pointsPerDecade: number): Float64Array {
  const decades = Math.log10(stopHz / startHz);
  const steps = Math.floor(decades * pointsPerDecade + 1e-9);
  const lastOnLattice = startHz * 10 ** (steps / pointsPerDecade);
  const appendStop = stopHz > lastOnLattice * (1 + 1e-12);
  const grid = new Float64Array(steps + 1 + (appendStop ? 1 : 0));
  for (let k = 0; k <= steps; k += 1) grid[k] = startHz * 10 ** (k / pointsPerDecade);
  // Pin the ends exactly: the user typed them, and limit masks step there.
  grid[0] = startHz;
  if (appendStop) grid[steps + 1] = stopHz;
  else grid[steps] = stopHz;
  return grid;
}

/** Where a grid point came from; kept beside the grid so plots and reports can mark them. */
export const PointOrigin = {
  Base: 0,
  ElementResonance: 1,
  ResponseExtremum: 2,
} as const;
export type PointOrigin = (typeof PointOrigin)[keyof typeof PointOrigin];

export interface TaggedGrid {
  readonly frequencyHz: Float64Array;
  readonly origin: Uint8Array;
}

/**
 * Merge extra points into a grid. Points within `relativeTolerance` of an existing point replace
 * nothing and are dropped (so a resonance that lands on a base point keeps the base point but
 * takes the extra point's origin tag); points outside [first, last] are dropped.
 */
export function mergeIntoGrid(
  base: TaggedGrid,
  extraHz: readonly number[],
  extraOrigin: PointOrigin,
  relativeTolerance = 1e-9,
): TaggedGrid {
  const first = base.frequencyHz[0] ?? 0;
  const last = base.frequencyHz[base.frequencyHz.length - 1] ?? 0;
  const extras = extraHz.filter((f) => Number.isFinite(f) && f >= first && f <= last).sort((a, b) => a - b);
  const frequencies: number[] = [];
  const origins: number[] = [];
  let j = 0;
  for (let i = 0; i < base.frequencyHz.length; i += 1) {
    const f = base.frequencyHz[i]!;
    let origin: number = base.origin[i]!;
    while (j < extras.length && extras[j]! < f * (1 - relativeTolerance)) {
      pushDistinct(frequencies, origins, extras[j]!, extraOrigin, relativeTolerance);
      j += 1;
    }
    while (j < extras.length && extras[j]! <= f * (1 + relativeTolerance)) {
      origin = Math.max(origin, extraOrigin);
      j += 1;
    }
    pushDistinct(frequencies, origins, f, origin, relativeTolerance);
  }
  return { frequencyHz: Float64Array.from(frequencies), origin: Uint8Array.from(origins) };
}

function pushDistinct(frequencies: number[], origins: number[], f: number, origin: number, tolerance: number): void {
  const previous = frequencies[frequencies.length - 1];
  if (previous !== undefined && f <= previous * (1 + tolerance)) {
    origins[origins.length - 1] = Math.max(origins[origins.length - 1]!, origin);
    return;
  }
  frequencies.push(f);
  origins.push(origin);
}

export function baseGrid(frequencyHz: Float64Array): TaggedGrid {
  return { frequencyHz, origin: new Uint8Array(frequencyHz.length) };
}
