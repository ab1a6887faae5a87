import type { BiasCurve, CommonModeChoke } from '../model/design.ts';

/**
 * Copper loss and peak flux of windings. The flux in a core from a current i through inductance L
 * of N turns is Φ = L·i/N (flux linkage L·i over the turns), so the flux density over the core's
 * effective area is B = L·i/(N·A_e).
 *
 * For a common-mode choke with self-inductance L and mutual inductance M per winding, the line
 * (differential) current i_d drives only the leakage L − M of each winding: B_DM = (L − M)·i_d/(N·A_e),
 * taken as if all the leakage flux ran in the core's cross-section (it partly runs in air, so this
 * is an upper bound; common practice). The common-mode current, i_cm in total over both windings,
 * drives the shared flux M·i_cm/N: B_CM = M·i_cm/(N·A_e). In one half of the core the two add.
 */

export function copperLossW(currentA: number, resistanceOhm: number): number {
  return currentA * currentA * resistanceOhm;
}

export function fluxDensityT(inductanceH: number, currentA: number, turns: number, effectiveAreaM2: number): number {
  if (!(turns > 0) || !(effectiveAreaM2 > 0)) throw new RangeError('turns and effective area must be positive');
  return (inductanceH * currentA) / (turns * effectiveAreaM2);
}

/** M and L − M from either way the design states the coupling (docs/design-format.md, `common-mode-choke`). */
export function chokeMutualAndLeakage(part: CommonModeChoke): { mutualH: number; leakageH: number } {
  if (part.coupling.kind === 'leakage-inductance') {
    return { mutualH: part.inductance - part.coupling.leakageInductance, leakageH: part.coupling.leakageInductance };
  }
  const mutualH = part.coupling.couplingFactor * part.inductance;
  return { mutualH, leakageH: part.inductance - mutualH };
}

/** L/L0 at `currentA`, linear between the curve's points; undefined beyond its last point. Below its first point the first ratio holds. */
export function inductanceRatioAt(curve: BiasCurve, currentA: number): number | undefined {
  const { currentA: currents, inductanceRatio: ratios } = curve;
  if (currentA <= currents[0]!) return ratios[0]!;
  for (let i = 1; i < currents.length; i += 1) {
    const high = currents[i]!;
    if (currentA <= high) {
      const low = currents[i - 1]!;
      const t = (currentA - low) / (high - low);
      return ratios[i - 1]! + t * (ratios[i]! - ratios[i - 1]!);
    }
  }
  return undefined;
}

export const SQUARE_MM = 1e-6;
