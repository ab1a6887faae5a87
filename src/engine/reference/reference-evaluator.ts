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
 * Solve the terminated network: unknowns x = [V_out; I_out];
 * source rows [P_s Q_s]·T·x = e, load rows [P_l Q_l]·x = 0. Gaussian elimination with partial
 * pivoting on an equilibrated system: currents are solved as R0·I (R0 = 50 Ω) so all unknowns
 * are volts, and each row is scaled by its largest entry, so no row or column dominates the
 * pivot choice by its units alone.
 */
function solveTerminated(t: Matrix, ps: Matrix, qs: Matrix, e: C[], pl: Matrix, ql: Matrix): C[] {
  const R0 = 50;
  const sourceRows = multiply(
    ps.map((row, r) => [...row, ...qs[r]!]),
    t,
  );
  const loadRows = pl.map((row, r) => [...row, ...ql[r]!]);
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
    const t = referenceChainMatrix(design, f);
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
    // Terminate the chain by the receivers, V_out = Z_L·I_out, which leaves two source equations
    // N·I_out = E with N = (A Z_L + B) + Z_S (C Z_L + D). With Z_S = (Z_dm/2)·I + Z_cm·u uᵀ
    // (u = [1, 1]) this is N = K + Z_cm·u wᵀ, K = X + (Z_dm/2)·W, wᵀ = uᵀ W, and the
    // matrix determinant lemma gives det N = det K + Z_cm·wᵀ adj(K) u without subtracting the
    // large rank-one part from itself (docs/engine-math.md §4.1).
    const solveInCircuit = (chain: Matrix, emf: C[]): C[] => {
      const x = add(multiply(block(chain, 0, 0), zLoad), block(chain, 0, 2));
      const w = add(multiply(block(chain, 2, 0), zLoad), block(chain, 2, 2));
      const k = add(x, scale(w, zdm.div(2)));
      const wRow = [w[0]![0]!.add(w[1]![0]!), w[0]![1]!.add(w[1]![1]!)];
      const adjK: Matrix = [
        [k[1]![1]!, k[0]![1]!.neg()],
        [k[1]![0]!.neg(), k[0]![0]!],
      ];
      const adjKu = [adjK[0]![0]!.add(adjK[0]![1]!), adjK[1]![0]!.add(adjK[1]![1]!)];
      const detK = k[0]![0]!.mul(k[1]![1]!).sub(k[0]![1]!.mul(k[1]![0]!));
      const detN = detK.add(zcm.mul(wRow[0]!.mul(adjKu[0]!).add(wRow[1]!.mul(adjKu[1]!))));
      // adj(N) = adj(K) + Z_cm·adj(u wᵀ), adj(u wᵀ) = [[w1, −w1], [−w0, w0]]
      const adjN: Matrix = [
        [adjK[0]![0]!.add(zcm.mul(wRow[1]!)), adjK[0]![1]!.sub(zcm.mul(wRow[1]!))],
        [adjK[1]![0]!.sub(zcm.mul(wRow[0]!)), adjK[1]![1]!.add(zcm.mul(wRow[0]!))],
      ];
      const current = multiply(adjN, [[emf[0]!], [emf[1]!]]).map((row) => row[0]!.div(detN));
      return [zl1.mul(current[0]!), zl2.mul(current[1]!)];
    };
    const cm = solveInCircuit(t, [ONE, ONE]);
    const dm = solveInCircuit(t, [ONE, c(-1)]);
    write(out.line1FromCm, cm[0]!);
    write(out.line2FromCm, cm[1]!);
    write(out.line1FromDm, dm[0]!);
    write(out.line2FromDm, dm[1]!);
    write(out.cmFromCm, cm[0]!.add(cm[1]!).div(2));
    write(out.dmFromCm, cm[0]!.sub(cm[1]!).div(2));
    write(out.cmFromDm, dm[0]!.add(dm[1]!).div(2));
    write(out.dmFromDm, dm[0]!.sub(dm[1]!).div(2));
    const bareCm = solveInCircuit(identity(4), [ONE, ONE]);
    const bareDm = solveInCircuit(identity(4), [ONE, c(-1)]);
    write(out.bareCmFromCm, bareCm[0]!.add(bareCm[1]!).div(2));
    write(out.bareDmFromDm, bareDm[0]!.sub(bareDm[1]!).div(2));

    // Input impedance: walk from the receivers back to the source, adding each series
    // impedance matrix and, for each shunt, its admittance matrix. Line to line (I1 = −I2):
    // Z11 − Z12 − Z21 + Z22; lines joined (V1 = V2): 1 / (sum of the entries of Z⁻¹).
    let zIn = zLoad;
    for (const element of elementChains(design, f).reverse()) {
      zIn = inverse2(add(inverse2(add(zIn, block(element, 0, 2))), block(element, 2, 0)));
    }
    write(out.inputImpedanceDm, zIn[0]![0]!.sub(zIn[0]![1]!).sub(zIn[1]![0]!).add(zIn[1]![1]!));
    const yIn = inverse2(zIn);
    write(out.inputImpedanceCm, ONE.div(yIn[0]![0]!.add(yIn[0]![1]!).add(yIn[1]![0]!).add(yIn[1]![1]!)));

    systems.forEach((system, s) => {
      const rs = system.sourceOhm;
      const rl = system.loadOhm;
      const without = rl / (rs + rl);
      // Common mode: the lines tied at each end (V1 − V2 = 0), r_s and r_l to ground.
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
      out.resistiveDmLoss[s]![i] = (without / dm[0]!.sub(dm[1]!).abs()) ** 2;
    });
  });
  return out;
}
