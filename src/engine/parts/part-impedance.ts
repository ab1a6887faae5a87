import type {
  Capacitor,
  CommonModeChoke,
  DampingRc,
  DampingRl,
  FerriteBead,
  Inductor,
  Resistor,
  TwoTerminalPart,
} from '../../model/design.ts';
import type { ComplexColumns } from '../complex-columns.ts';
import { IMPEDANCE_LIMIT_OHM, PointFlag } from '../point-flags.ts';
import { interpolateImpedanceTable, type PreparedTable, prepareImpedanceTable } from './impedance-table.ts';

/**
 * Impedance of each part over a grid, written into caller-owned arrays (no allocation per point).
 * Formulas are in docs/engine-math.md §2. Every result is finite. A part with losses is stored
 * exactly as computed, however large (a lossy choke's self-resonance peak is finite and must not
 * be clipped); only a lossless value (purely reactive: its real part exactly zero) beyond
 * IMPEDANCE_LIMIT_OHM, which an ideal part reaches only at its resonance, is limited and flagged
 * (docs/engine-math.md §6).
 */

const TWO_PI = 2 * Math.PI;
const LIMIT_SQUARED = IMPEDANCE_LIMIT_OHM * IMPEDANCE_LIMIT_OHM;

/**
 * Store z at index i. A lossless value (re exactly 0: every formula here adds only positive real
 * parts for its losses, so an ideal part's real part is an exact zero) beyond the limit is the
 * rounding residue of an exact pole and is limited, with the point flagged; so is a value that
 * is not finite (a division by an exact zero). A lossy value is never touched.
 */
function store(out: ComplexColumns, flags: Uint8Array, i: number, re: number, im: number): void {
  const magnitudeSquared = re * re + im * im;
  if (Number.isFinite(magnitudeSquared) && (re !== 0 || magnitudeSquared <= LIMIT_SQUARED)) {
    out.re[i] = re;
    out.im[i] = im;
    return;
  }
  flags[i]! |= PointFlag.IdealResonanceLimited;
  if (!Number.isFinite(magnitudeSquared)) {
    // An infinite parallel resonance: its direction is lost, and a lossy one peaks real.
    out.re[i] = Number.isFinite(re) ? Math.sign(re) * IMPEDANCE_LIMIT_OHM : IMPEDANCE_LIMIT_OHM;
    out.im[i] = 0;
    return;
  }
  out.re[i] = 0;
  out.im[i] = Math.sign(im) * IMPEDANCE_LIMIT_OHM;
}

/**
 * z / (1 + (G + jωC)·z): a branch z with conductance G and capacitance C across it (core loss,
 * winding capacitance). Written so that z = 0 stays exactly 0 and a lossless resonance is
 * limited, not divided by zero.
 */
function storeWithParallelCapacitance(
  out: ComplexColumns,
  flags: Uint8Array,
  i: number,
  zr: number,
  zi: number,
  omegaC: number,
  conductance = 0,
): void {
  if (omegaC === 0 && conductance === 0) {
    store(out, flags, i, zr, zi);
    return;
  }
  const dr = 1 + conductance * zr - omegaC * zi;
  const di = omegaC * zr + conductance * zi;
  const d2 = dr * dr + di * di;
  if (d2 === 0) {
    store(out, flags, i, Infinity, 0);
    return;
  }
  store(out, flags, i, (zr * dr + zi * di) / d2, (zi * dr - zr * di) / d2);
}

export function capacitorImpedance(part: Capacitor, f: Float64Array, out: ComplexColumns, flags: Uint8Array): void {
  for (let i = 0; i < f.length; i += 1) {
    const omega = TWO_PI * f[i]!;
    store(out, flags, i, part.esr, omega * part.esl - 1 / (omega * part.capacitance));
  }
}

/** Multiplier for a first-order relaxation core: 1/(1 + j f/fr); written as (re, im) for speed. */
function relaxationFrequency(permeability: Inductor['permeability']): number {
  return permeability.kind === 'first-order-relaxation' ? permeability.relaxationFrequencyHz : Infinity;
}

export function inductorImpedance(part: Inductor, f: Float64Array, out: ComplexColumns, flags: Uint8Array): void {
  const fr = relaxationFrequency(part.permeability);
  const parallelR =
    part.coreLoss.kind === 'parallel-resistance'
      ? part.coreLoss.resistance
      : part.coreLoss.kind === 'quality-factor'
        ? part.coreLoss.qualityFactor * TWO_PI * part.coreLoss.atFrequencyHz * part.inductance
        : Infinity;
  for (let i = 0; i < f.length; i += 1) {
    const omega = TWO_PI * f[i]!;
    // jωL·µ(f)/µi with µ(f)/µi = 1/(1 + jx): (jωL)(1 − jx)/(1 + x²) = ωL(x + j)/(1 + x²)
    const x = f[i]! / fr;
    const scale = (omega * part.inductance) / (1 + x * x);
    let lr = scale * x;
    let li = scale;
    if (parallelR !== Infinity) {
      // (lr + j li) ∥ R = R·zl / (R + zl)
      const dr = parallelR + lr;
      const di = li;
      const d2 = dr * dr + di * di;
      const nr = parallelR * lr;
      const ni = parallelR * li;
      lr = (nr * dr + ni * di) / d2;
      li = (ni * dr - nr * di) / d2;
    }
    storeWithParallelCapacitance(out, flags, i, part.dcr + lr, li, omega * part.windingCapacitance);
  }
}

export function resistorImpedance(part: Resistor, f: Float64Array, out: ComplexColumns, flags: Uint8Array): void {
  for (let i = 0; i < f.length; i += 1) store(out, flags, i, part.resistance, TWO_PI * f[i]! * part.seriesInductance);
}

export function ferriteBeadImpedance(part: FerriteBead, f: Float64Array, out: ComplexColumns, flags: Uint8Array): void {
  const conductance = 1 / part.resistance;
  for (let i = 0; i < f.length; i += 1) {
    const omega = TWO_PI * f[i]!;
    // R ∥ L ∥ C in admittance form; 1/R > 0 keeps it finite at resonance.
    const yi = omega * part.capacitance - 1 / (omega * part.inductance);
    const y2 = conductance * conductance + yi * yi;
    store(out, flags, i, part.dcResistance + conductance / y2, -yi / y2);
  }
}

export function dampingRcImpedance(part: DampingRc, f: Float64Array, out: ComplexColumns, flags: Uint8Array): void {
  for (let i = 0; i < f.length; i += 1) store(out, flags, i, part.resistance, -1 / (TWO_PI * f[i]! * part.capacitance));
}

export function dampingRlImpedance(part: DampingRl, f: Float64Array, out: ComplexColumns, flags: Uint8Array): void {
  const r = part.resistance;
  for (let i = 0; i < f.length; i += 1) {
    const xl = TWO_PI * f[i]! * part.inductance;
    // jXR/(R + jX) = (X²R + j XR²)/(R² + X²)
    const d = r * r + xl * xl;
    store(out, flags, i, (xl * xl * r) / d, (xl * r * r) / d);
  }
}

/** A two-terminal part prepared once per sweep (tables unwrapped), evaluated per grid. */
export interface TwoTerminalEvaluator {
  evaluate(f: Float64Array, out: ComplexColumns, flags: Uint8Array): void;
}

export function twoTerminalEvaluator(part: TwoTerminalPart): TwoTerminalEvaluator {
  switch (part.kind) {
    case 'capacitor':
      return { evaluate: (f, out, flags) => capacitorImpedance(part, f, out, flags) };
    case 'inductor':
      return { evaluate: (f, out, flags) => inductorImpedance(part, f, out, flags) };
    case 'resistor':
      return { evaluate: (f, out, flags) => resistorImpedance(part, f, out, flags) };
    case 'ferrite-bead':
      return { evaluate: (f, out, flags) => ferriteBeadImpedance(part, f, out, flags) };
    case 'damping-rc':
      return { evaluate: (f, out, flags) => dampingRcImpedance(part, f, out, flags) };
    case 'damping-rl':
      return { evaluate: (f, out, flags) => dampingRlImpedance(part, f, out, flags) };
    case 'measured': {
      const table: PreparedTable = prepareImpedanceTable(part.table);
      return { evaluate: (f, out, flags) => measuredImpedance(table, f, out, flags) };
    }
  }
}

function measuredImpedance(table: PreparedTable, f: Float64Array, out: ComplexColumns, flags: Uint8Array): void {
  for (let i = 0; i < f.length; i += 1) {
    const outside = interpolateImpedanceTable(table, f[i]!, out, i);
    if (outside) flags[i]! |= PointFlag.OutsideMeasuredRange;
  }
}

/**
 * The two eigen-impedances of a symmetric common-mode choke, per winding:
 *   even (both windings carry equal currents): s + m, the common-mode path;
 *   odd (equal and opposite currents):         s − m, the leakage path;
 * each with the winding capacitance (and loss resistance, if given) across it. The 2×2 series
 * impedance matrix is
 *   [[(even+odd)/2, (even−odd)/2], [(even−odd)/2, (even+odd)/2]].
 * The relaxation acts on the coupled (magnetising) part M only; leakage flux runs mostly in air.
 */
export function chokeEigenImpedances(
  part: CommonModeChoke,
  f: Float64Array,
  even: ComplexColumns,
  odd: ComplexColumns,
  flags: Uint8Array,
): void {
  const { mutual, leakage } = chokeInductances(part);
  const fr = relaxationFrequency(part.permeability);
  const conductance = part.parallelResistance === undefined ? 0 : 1 / part.parallelResistance;
  for (let i = 0; i < f.length; i += 1) {
    const omega = TWO_PI * f[i]!;
    const x = f[i]! / fr;
    const scale = (omega * mutual) / (1 + x * x);
    const mr = scale * x;
    const mi = scale;
    const omegaC = omega * part.windingCapacitance;
    storeWithParallelCapacitance(even, flags, i, part.dcr + 2 * mr, omega * leakage + 2 * mi, omegaC, conductance);
    storeWithParallelCapacitance(odd, flags, i, part.dcr, omega * leakage, omegaC, conductance);
  }
}

/** Mutual inductance M and per-winding leakage L − M from either way of stating the coupling. */
export function chokeInductances(part: CommonModeChoke): { mutual: number; leakage: number } {
  if (part.coupling.kind === 'leakage-inductance') {
    return { mutual: part.inductance - part.coupling.leakageInductance, leakage: part.coupling.leakageInductance };
  }
  const mutual = part.coupling.couplingFactor * part.inductance;
  return { mutual, leakage: part.inductance - mutual };
}
