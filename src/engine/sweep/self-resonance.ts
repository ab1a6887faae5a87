import { type ComplexColumns, complexColumns } from '../complex-columns.ts';
import type { SelfResonance } from './sweep-result.ts';

/** Writes an impedance over a grid; flags are ignored by the search. */
export type ImpedanceFunction = (f: Float64Array, out: ComplexColumns, flags: Uint8Array) => void;

const MAX_PER_VIEW = 16;
const BISECTION_STEPS = 60;

/**
 * Self-resonances of one impedance: every frequency where its reactance changes sign. A sign
 * change between neighbouring grid points is caught however sharp the resonance (the reactance of
 * a high-Q part still has opposite signs on either side), then pinned by bisection on log f.
 */
export function findSelfResonances(impedance: ImpedanceFunction, grid: Float64Array, onGrid: ComplexColumns): SelfResonance[] {
  const found: SelfResonance[] = [];
  const probeF = new Float64Array(1);
  const probeZ = complexColumns(1);
  const probeFlags = new Uint8Array(1);
  const reactanceAt = (f: number): number => {
    probeF[0] = f;
    impedance(probeF, probeZ, probeFlags);
    return probeZ.im[0]!;
  };
  for (let i = 0; i + 1 < grid.length && found.length < MAX_PER_VIEW; i += 1) {
    const x0 = onGrid.im[i]!;
    const x1 = onGrid.im[i + 1]!;
    if (x0 === 0 && i > 0) continue; // counted as the right end of the previous interval
    if (!(x0 < 0 && x1 >= 0) && !(x0 > 0 && x1 <= 0)) continue;
    const type: SelfResonance['type'] = x0 < 0 ? 'series' : 'parallel';
    let lo = Math.log(grid[i]!);
    let hi = Math.log(grid[i + 1]!);
    const sideLow = Math.sign(x0);
    for (let step = 0; step < BISECTION_STEPS && hi - lo > 1e-13; step += 1) {
      const mid = 0.5 * (lo + hi);
      const x = reactanceAt(Math.exp(mid));
      if (x === 0) {
        lo = mid;
        hi = mid;
        break;
      }
      if (Math.sign(x) === sideLow) lo = mid;
      else hi = mid;
    }
    found.push({ frequencyHz: Math.exp(0.5 * (lo + hi)), type });
  }
  return found;
}
