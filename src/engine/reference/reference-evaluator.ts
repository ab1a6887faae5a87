import Complex from 'complex.js';
import type { CommonModeChoke, Design, Receiver, TwoTerminalPart } from '../../model/design.ts';
import { CISPR17_SYSTEMS, type ResistiveSystem } from '../network.ts';
import { chokeInductances } from '../parts/part-impedance.ts';
import { CISPR16_MAINS_NETWORK, VEHICLE_NETWORK } from '../parts/receiver-impedance.ts';
import { allocateResponse, type NetworkResponse } from '../kernel/network-response.ts';

/**
 * The reference evaluator: the same physics written the plain way, one frequency at a time, with
 * complex.js numbers, full 4×4 chain matrices and a general 4×4 solve for each termination. It
 * is slow on purpose and shares no arithmetic with the kernel, so the tests that compare the two
 * catch indexing and algebra slips in the fast path. It does not limit ideal resonances: use it on
 * designs whose parts are not exactly at a lossless resonance.
 */

type C = Complex;
type Matrix = C[][];

const ZERO = new Complex(0, 0);
const ONE = new Complex(1, 0);
const j = new Complex(0, 1);

function c(re: number, im = 0): C {
  return new Complex(re, im);
}

function parallel(a: C, b: C): C {
  return a.mul(b).div(a.add(b));
}

/** Impedance of a two-terminal part at one frequency. */
export function referencePartImpedance(part: TwoTerminalPart, frequencyHz: number): C {
  const omega = 2 * Math.PI * frequencyHz;
  switch (part.kind) {
    case 'capacitor':
      return c(part.esr).add(j.mul(omega * part.esl)).add(ONE.div(j.mul(omega * part.capacitance)));
    case 'inductor': {
      const mu = relativePermeability(part.permeability, frequencyHz);
      let core = j.mul(omega * part.inductance).mul(mu);
      if (part.coreLoss.kind === 'parallel-resistance') core = parallel(core, c(part.coreLoss.resistance));
      if (part.coreLoss.kind === 'quality-factor') {
        core = parallel(core, c(part.coreLoss.qualityFactor * 2 * Math.PI * part.coreLoss.atFrequencyHz * part.inductance));
      }
      const winding = core.add(part.dcr);
      return withParallelCapacitance(winding, part.windingCapacitance, omega);
    }
    case 'resistor':
      return c(part.resistance).add(j.mul(omega * part.seriesInductance));
    case 'ferrite-bead': {
      let admittance = c(1 / part.resistance).add(ONE.div(j.mul(omega * part.inductance)));
      admittance = admittance.add(j.mul(omega * part.capacitance));
      return ONE.div(admittance).add(part.dcResistance);
    }
    case 'damping-rc':
      return c(part.resistance).add(ONE.div(j.mul(omega * part.capacitance)));
    case 'damping-rl':
      return parallel(c(part.resistance), j.mul(omega * part.inductance));
    case 'measured':
      return referenceTableImpedance(part.table, frequencyHz);
  }
}

function withParallelCapacitance(z: C, capacitance: number, omega: number): C {
  if (capacitance === 0) return z;
  return ONE.div(ONE.div(z).add(j.mul(omega * capacitance)));
}

function relativePermeability(permeability: CommonModeChoke['permeability'], frequencyHz: number): C {
  if (permeability.kind === 'constant') return ONE;
  return ONE.div(ONE.add(j.mul(frequencyHz / permeability.relaxationFrequencyHz)));
}

/** Straight lines on a Bode plot between table points, end values held outside. */
function referenceTableImpedance(table: { frequencyHz: number[]; magnitudeOhm: number[]; phaseDeg: number[] }, f: number): C {
  const phases: number[] = [];
  table.phaseDeg.forEach((deg, i) => {
    let phase = (deg * Math.PI) / 180;
    if (i > 0) {
      while (phase - phases[i - 1]! > Math.PI) phase -= 2 * Math.PI;
      while (phase - phases[i - 1]! < -Math.PI) phase += 2 * Math.PI;
    }
    phases.push(phase);
  });
  const n = table.frequencyHz.length;
  let magnitude: number;
  let phase: number;
  if (f <= table.frequencyHz[0]!) {
    magnitude = table.magnitudeOhm[0]!;
    phase = phases[0]!;
  } else if (f >= table.frequencyHz[n - 1]!) {
    magnitude = table.magnitudeOhm[n - 1]!;
    phase = phases[n - 1]!;
  } else {
    let k = 0;
    while (table.frequencyHz[k + 1]! < f) k += 1;
    const t = Math.log(f / table.frequencyHz[k]!) / Math.log(table.frequencyHz[k + 1]! / table.frequencyHz[k]!);
    magnitude = Math.exp(Math.log(table.magnitudeOhm[k]!) * (1 - t) + Math.log(table.magnitudeOhm[k + 1]!) * t);
    phase = phases[k]! * (1 - t) + phases[k + 1]! * t;
  }
  return new Complex({ abs: magnitude, arg: phase });
}

/**
 * The choke's 2×2 series impedance matrix. A symmetric coupled pair has two natural currents:
 * equal in both windings (impedance s + m) and opposite (s − m). The winding capacitance and
 * loss resistance across each winding load each of them separately, and
 * Z = ½·[[p + q, p − q], [p − q, p + q]] puts them back together. (Forming Z from s and m first
 * would keep the small s − m as a difference of two large numbers.)
 */
export function referenceChokeMatrix(part: CommonModeChoke, frequencyHz: number): Matrix {
  const omega = 2 * Math.PI * frequencyHz;
  const { mutual, leakage } = chokeInductances(part);
  const mu = relativePermeability(part.permeability, frequencyHz);
  const m = j.mul(omega * mutual).mul(mu);
  const even = c(part.dcr).add(j.mul(omega * leakage)).add(m.mul(2));
  const odd = c(part.dcr).add(j.mul(omega * leakage));
  const across = j.mul(omega * part.windingCapacitance).add(part.parallelResistance === undefined ? 0 : 1 / part.parallelResistance);
  const loaded = (z: C): C => z.div(ONE.add(across.mul(z)));
  const p = loaded(even);
  const q = loaded(odd);
  return [
    [p.add(q).div(2), p.sub(q).div(2)],
    [p.sub(q).div(2), p.add(q).div(2)],
  ];
}

export function referenceReceiverImpedance(receiver: Receiver, frequencyHz: number): C {
  const omega = 2 * Math.PI * frequencyHz;
  switch (receiver.kind) {
    case 'cispr16-mains-50uh':
      return parallel(c(CISPR16_MAINS_NETWORK.portResistance), c(CISPR16_MAINS_NETWORK.seriesResistance, omega * CISPR16_MAINS_NETWORK.inductance));
    case 'vehicle-5uh':
      return parallel(c(VEHICLE_NETWORK.portResistance), c(0, omega * VEHICLE_NETWORK.inductance));
    case 'resistive':
      return c(receiver.resistance);
    case 'custom':
      return referencePartImpedance(receiver.impedance, frequencyHz);
  }
}

function identity(size: number): Matrix {
  return Array.from({ length: size }, (_, r) => Array.from({ length: size }, (_, k) => (r === k ? ONE : ZERO)));
}

function multiply(a: Matrix, b: Matrix): Matrix {
  return a.map((row) => b[0]!.map((_, k) => row.reduce((sum, value, m) => sum.add(value.mul(b[m]![k]!)), ZERO)));
}

function add(a: Matrix, b: Matrix): Matrix {
  return a.map((row, r) => row.map((value, k) => value.add(b[r]![k]!)));
}

function inverse2(m: Matrix): Matrix {
  const [[a, b], [cc, d]] = m as [[C, C], [C, C]];
  const det = a.mul(d).sub(b.mul(cc));
  return [
    [d.div(det), b.neg().div(det)],
    [cc.neg().div(det), a.div(det)],
  ];
}

function block(t: Matrix, row: number, col: number): Matrix {
  return [
    [t[row]![col]!, t[row]![col + 1]!],
    [t[row + 1]![col]!, t[row + 1]![col + 1]!],
  ];
}

/** Chain matrix of one element: series [[I, Z], [0, I]], shunt [[I, 0], [Y, I]]. */
function elementChain(z2x2: Matrix, series: boolean): Matrix {
  const t = identity(4);
  for (let r = 0; r < 2; r += 1) {
    for (let k = 0; k < 2; k += 1) {
      if (series) t[r]![k + 2] = z2x2[r]![k]!;
      else t[r + 2]![k] = z2x2[r]![k]!;
    }
  }
  return t;
}

/** Each enabled element's 4×4 chain matrix in line coordinates, source side first. */
function elementChains(design: Design, frequencyHz: number): Matrix[] {
  const chains: Matrix[] = [];
  for (const stage of design.stages) {
    for (const element of stage.elements) {
      if (!element.enabled) continue;
      const part = element.part;
      if (part.kind === 'common-mode-choke') {
        chains.push(elementChain(referenceChokeMatrix(part, frequencyHz), true));
        continue;
      }
      const z = referencePartImpedance(part, frequencyHz);
      const y = ONE.div(z);
      switch (element.placement) {
        case 'series-line1':
          chains.push(elementChain([[z, ZERO], [ZERO, ZERO]], true));
          break;
        case 'series-line2':
          chains.push(elementChain([[ZERO, ZERO], [ZERO, z]], true));
          break;
        case 'line1-to-ground':
          chains.push(elementChain([[y, ZERO], [ZERO, ZERO]], false));
          break;
        case 'line2-to-ground':
          chains.push(elementChain([[ZERO, ZERO], [ZERO, y]], false));
          break;
        case 'line-to-line':
          chains.push(elementChain([[y, y.neg()], [y.neg(), y]], false));
          break;
        case 'both-lines-coupled':
          throw new Error('a coupled placement needs a common-mode choke');
      }
    }
  }
  return chains;
}

/** The filter's 4×4 chain matrix in line coordinates (source side first). */
export function referenceChainMatrix(design: Design, frequencyHz: number): Matrix {
  return elementChains(design, frequencyHz).reduce((chain, element) => multiply(chain, element), identity(4));
}

/**
 * Mode coordinates: line quantities x = P·m with V = S·[v_c, v_d] (S = [[1, 1], [1, −1]]) and
 * I = S'·[i_c, i_d] (S' = ½S). A chain matrix in modes is P⁻¹·T·P. The cascade is multiplied in
 * modes so a choke's common-mode impedance and a near short between the lines stay out of each
 * other's entries (docs/engine-math.md §6); each element is still written in line coordinates.
 */
const half = c(0.5);
const P: Matrix = [
  [ONE, ONE, ZERO, ZERO],
  [ONE, c(-1), ZERO, ZERO],
  [ZERO, ZERO, half, half],
  [ZERO, ZERO, half, c(-0.5)],
];
const P_INVERSE: Matrix = [
  [half, half, ZERO, ZERO],
  [half, c(-0.5), ZERO, ZERO],
  [ZERO, ZERO, ONE, ONE],
  [ZERO, ZERO, ONE, c(-1)],
];
const S_PRIME: Matrix = [
  [half, half],
  [half, c(-0.5)],
];

/** The filter's chain matrix in mode coordinates: each element's line chain matrix, transformed, multiplied in order. */
export function referenceModalChain(design: Design, frequencyHz: number): Matrix {
  let chain = identity(4);
  for (const element of elementChains(design, frequencyHz)) chain = multiply(chain, multiply(multiply(P_INVERSE, element), P));
  return chain;
}

/**
 * Solve the terminated network for the output in mode coordinates, m = [v_c, v_d, i_c, i_d]:
 * `tModal` is the chain in modes and the constraints are written in line coordinates, so
 * source rows [P_s Q_s]·P·T_m·m = e, load rows [P_l Q_l]·P·m = 0. Gaussian elimination with partial
 * pivoting on an equilibrated system: currents are solved as R0·I (R0 = 50 Ω) so all unknowns
 * are volts, and each row is scaled by its largest entry, so no row or column dominates the
 * pivot choice by its units alone.
 */
function solveTerminated(tModal: Matrix, ps: Matrix, qs: Matrix, e: C[], pl: Matrix, ql: Matrix): C[] {
  const R0 = 50;
  const sourceRows = multiply(
    multiply(
      ps.map((row, r) => [...row, ...qs[r]!]),
      P,
    ),
    tModal,
  );
  const loadRows = multiply(
    pl.map((row, r) => [...row, ...ql[r]!]),
    P,
  );
  const rhs = [e[0]!, e[1]!, ZERO, ZERO];
  const a: C[][] = [];
  const b: C[] = [];
  [...sourceRows, ...loadRows].forEach((row, r) => {
    const scaled = row.map((value, k) => (k >= 2 ? value.div(R0) : value));
    const largest = Math.max(...scaled.map((value) => value.abs()));
    if (largest === 0) throw new Error('singular terminated network');
    a.push(scaled.map((value) => value.div(largest)));
    b.push(rhs[r]!.div(largest));
  });
  const n = 4;
  for (let col = 0; col < n; col += 1) {
    let pivot = col;
    for (let r = col + 1; r < n; r += 1) if (a[r]![col]!.abs() > a[pivot]![col]!.abs()) pivot = r;
    [a[col], a[pivot]] = [a[pivot]!, a[col]!];
    [b[col], b[pivot]] = [b[pivot]!, b[col]!];
    if (a[col]![col]!.abs() < 1e-14) throw new Error('singular terminated network');
    for (let r = col + 1; r < n; r += 1) {
      const factor = a[r]![col]!.div(a[col]![col]!);
      for (let k = col; k < n; k += 1) a[r]![k] = a[r]![k]!.sub(factor.mul(a[col]![k]!));
      b[r] = b[r]!.sub(factor.mul(b[col]!));
    }
  }
  const x: C[] = [ZERO, ZERO, ZERO, ZERO];
  for (let r = n - 1; r >= 0; r -= 1) {
    let sum = b[r]!;
    for (let k = r + 1; k < n; k += 1) sum = sum.sub(a[r]![k]!.mul(x[k]!));
    x[r] = sum.div(a[r]![r]!);
  }
  return [x[0]!, x[1]!, x[2]!.div(R0), x[3]!.div(R0)];
}

function diagonal(a: C, b: C): Matrix {
  return [
    [a, ZERO],
    [ZERO, b],
  ];
}

function scale(m: Matrix, factor: C): Matrix {
  return m.map((row) => row.map((value) => value.mul(factor)));
}

/** Everything NetworkResponse holds, at each frequency, computed the slow way. */
export function referenceEvaluate(
  design: Design,
  frequencyHz: readonly number[],
  systems: readonly ResistiveSystem[] = CISPR17_SYSTEMS,
): NetworkResponse {
  const out = allocateResponse(frequencyHz.length, systems.length);
  frequencyHz.forEach((f, i) => {
    const t = referenceModalChain(design, f);
    const zl1 = referenceReceiverImpedance(design.receivers.line1, f);
    const zl2 = referenceReceiverImpedance(design.receivers.line2, f);
    const zcm = referencePartImpedance(design.noiseSource.commonMode.impedance, f);
    const zdm = referencePartImpedance(design.noiseSource.differentialMode.impedance, f);
    const zLoad = diagonal(zl1, zl2);
    const id = identity(2);
    const write = (column: { re: Float64Array; im: Float64Array }, value: C): void => {
      column.re[i] = value.re;
      column.im[i] = value.im;
    };
    // In circuit, in modes: the receivers are Z_L,m = S'·Z_L·S'; the source (half Z_dm in each
    // line, Z_cm from the midpoint) is diagonal, Z_S,m = diag(Z_cm + Z_dm/4, Z_dm/4); the EMFs are
    // [1, 0] (common mode) and [0, 1] (differential mode). With v_out = Z_L,m·i_out the source
    // equations read N·i_out = e, N = (A Z_L,m + B) + Z_S,m (C Z_L,m + D).
    const zLoadModal = multiply(multiply(S_PRIME, zLoad), S_PRIME);
    const zSourceModal = diagonal(zcm.add(zdm.div(4)), zdm.div(4));
    const solveInCircuit = (chain: Matrix, emf: C[]): C[] => {
      const x = add(multiply(block(chain, 0, 0), zLoadModal), block(chain, 0, 2));
      const w = add(multiply(block(chain, 2, 0), zLoadModal), block(chain, 2, 2));
      const n = add(x, multiply(zSourceModal, w));
      const current = multiply(inverse2(n), [[emf[0]!], [emf[1]!]]);
      const v = multiply(zLoadModal, current);
      return [v[0]![0]!, v[1]![0]!];
    };
    const cm = solveInCircuit(t, [ONE, ZERO]);
    const dm = solveInCircuit(t, [ZERO, ONE]);
    write(out.cmFromCm, cm[0]!);
    write(out.dmFromCm, cm[1]!);
    write(out.cmFromDm, dm[0]!);
    write(out.dmFromDm, dm[1]!);
    write(out.line1FromCm, cm[0]!.add(cm[1]!));
    write(out.line2FromCm, cm[0]!.sub(cm[1]!));
    write(out.line1FromDm, dm[0]!.add(dm[1]!));
    write(out.line2FromDm, dm[0]!.sub(dm[1]!));
    write(out.bareCmFromCm, solveInCircuit(identity(4), [ONE, ZERO])[0]!);
    write(out.bareDmFromDm, solveInCircuit(identity(4), [ZERO, ONE])[1]!);

    // Input impedance: walk from the receivers back to the source in mode coordinates, adding
    // each series impedance matrix and, for each shunt, its admittance matrix. A differential
    // current (i = [0, i_d]) sees 4·Z11 line to line; joined lines hold v_d = 0.
    let zIn = zLoadModal;
    for (const element of elementChains(design, f).reverse()) {
      const modal = multiply(multiply(P_INVERSE, element), P);
      zIn = inverse2(add(inverse2(add(zIn, block(modal, 0, 2))), block(modal, 2, 0)));
    }
    write(out.inputImpedanceDm, zIn[1]![1]!.mul(4));
    write(out.inputImpedanceCm, zIn[0]![0]!.sub(zIn[0]![1]!.mul(zIn[1]![0]!).div(zIn[1]![1]!)));

    systems.forEach((system, s) => {
      const rs = system.sourceOhm;
      const rl = system.loadOhm;
      const without = rl / (rs + rl);
      // Common mode: the lines tied at each end (V1 − V2 = 0), r_s and r_l to ground; the
      // solution is in modes, so the joined lines' voltage is v_c.
      const tie: Matrix = [
        [ONE, c(-1)],
        [ONE, ZERO],
      ];
      const sourceRows: Matrix = [
        [ZERO, ZERO],
        [c(rs), c(rs)],
      ];
      const loadRows: Matrix = [
        [ZERO, ZERO],
        [c(-rl), c(-rl)],
      ];
      let cm: C[];
      try {
        cm = solveTerminated(t, tie, sourceRows, [ZERO, ONE], tie, loadRows);
      } catch {
        // No impedance around the loop the two joined lines form (no series part, or an ideal
        // choke): the split of current between the lines is free and changes no voltage. Fix it
        // as equal (I1 = I2) instead of tying the load ends, which that equal split implies.
        const equalSplit: Matrix = [
          [ZERO, ZERO],
          [ONE, ZERO],
        ];
        const splitRows: Matrix = [
          [ONE, c(-1)],
          [c(-rl), c(-rl)],
        ];
        cm = solveTerminated(t, tie, sourceRows, [ZERO, ONE], equalSplit, splitRows);
      }
      out.resistiveCmLoss[s]![i] = (without / cm[0]!.abs()) ** 2;
      // Differential mode: r_s/2 and r_l/2 per line, EMF ±1/2, measured line to line.
      const dm = solveTerminated(t, id, scale(id, c(rs / 2)), [c(0.5), c(-0.5)], id, scale(id, c(-rl / 2)));
      out.resistiveDmLoss[s]![i] = (without / dm[1]!.mul(2).abs()) ** 2;
    });
  });
  return out;
}
