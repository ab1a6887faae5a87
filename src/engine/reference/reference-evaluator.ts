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

/** The choke's 2×2 series impedance matrix, winding capacitance across each winding. */
export function referenceChokeMatrix(part: CommonModeChoke, frequencyHz: number): Matrix {
  const omega = 2 * Math.PI * frequencyHz;
  const { mutual, leakage } = chokeInductances(part);
  const mu = relativePermeability(part.permeability, frequencyHz);
  const m = j.mul(omega * mutual).mul(mu);
  const self = c(part.dcr).add(j.mul(omega * leakage)).add(m);
  const z: Matrix = [
    [self, m],
    [m, self],
  ];
  if (part.windingCapacitance === 0) return z;
  // Z (I + jωC Z)⁻¹
  const jwc = j.mul(omega * part.windingCapacitance);
  const inner: Matrix = [
    [ONE.add(jwc.mul(self)), jwc.mul(m)],
    [jwc.mul(m), ONE.add(jwc.mul(self))],
  ];
  return multiply(z, inverse2(inner));
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

/** The filter's 4×4 chain matrix at one frequency (source side first). */
export function referenceChainMatrix(design: Design, frequencyHz: number): Matrix {
  let chain = identity(4);
  for (const stage of design.stages) {
    for (const element of stage.elements) {
      if (!element.enabled) continue;
      const part = element.part;
      if (part.kind === 'common-mode-choke') {
        chain = multiply(chain, elementChain(referenceChokeMatrix(part, frequencyHz), true));
        continue;
      }
      const z = referencePartImpedance(part, frequencyHz);
      const y = ONE.div(z);
      switch (element.placement) {
        case 'series-line1':
          chain = multiply(chain, elementChain([[z, ZERO], [ZERO, ZERO]], true));
          break;
        case 'series-line2':
          chain = multiply(chain, elementChain([[ZERO, ZERO], [ZERO, z]], true));
          break;
        case 'line1-to-ground':
          chain = multiply(chain, elementChain([[y, ZERO], [ZERO, ZERO]], false));
          break;
        case 'line2-to-ground':
          chain = multiply(chain, elementChain([[ZERO, ZERO], [ZERO, y]], false));
          break;
        case 'line-to-line':
          chain = multiply(chain, elementChain([[y, y.neg()], [y.neg(), y]], false));
          break;
        case 'both-lines-coupled':
          throw new Error('a coupled placement needs a common-mode choke');
      }
    }
  }
  return chain;
}

/**
 * Solve the terminated network: unknowns x = [V_out; I_out];
 * source rows [P_s Q_s]·T·x = e, load rows [P_l Q_l]·x = 0. Gaussian elimination, partial pivoting.
 */
function solveTerminated(t: Matrix, ps: Matrix, qs: Matrix, e: C[], pl: Matrix, ql: Matrix): C[] {
  const sourceRows = multiply(
    ps.map((row, r) => [...row, ...qs[r]!]),
    t,
  );
  const loadRows = pl.map((row, r) => [...row, ...ql[r]!]);
  const a = [...sourceRows, ...loadRows].map((row) => [...row]);
  const b = [e[0]!, e[1]!, ZERO, ZERO];
  const n = 4;
  for (let col = 0; col < n; col += 1) {
    let pivot = col;
    for (let r = col + 1; r < n; r += 1) if (a[r]![col]!.abs() > a[pivot]![col]!.abs()) pivot = r;
    [a[col], a[pivot]] = [a[pivot]!, a[col]!];
    [b[col], b[pivot]] = [b[pivot]!, b[col]!];
    if (a[col]![col]!.abs() === 0) throw new Error('singular terminated network');
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
  return x;
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
    // Source: half the DM impedance in each line, the CM impedance from their midpoint to ground.
    const zSource: Matrix = [
      [zcm.add(zdm.div(2)), zcm],
      [zcm, zcm.add(zdm.div(2))],
    ];
    const zLoad = diagonal(zl1, zl2);
    const id = identity(2);
    const negLoad = scale(zLoad, c(-1));
    const write = (column: { re: Float64Array; im: Float64Array }, value: C): void => {
      column.re[i] = value.re;
      column.im[i] = value.im;
    };
    for (const [chain, prefix] of [
      [t, 'line'],
      [identity(4), 'bareLine'],
    ] as const) {
      const cm = solveTerminated(chain, id, zSource, [ONE, ONE], id, negLoad);
      const dm = solveTerminated(chain, id, zSource, [ONE, c(-1)], id, negLoad);
      write(out[`${prefix}1FromCm`], cm[0]!);
      write(out[`${prefix}2FromCm`], cm[1]!);
      write(out[`${prefix}1FromDm`], dm[0]!);
      write(out[`${prefix}2FromDm`], dm[1]!);
    }

    // Z_in = (A Z_L + B)(C Z_L + D)⁻¹
    const x = add(multiply(block(t, 0, 0), zLoad), block(t, 0, 2));
    const w = add(multiply(block(t, 2, 0), zLoad), block(t, 2, 2));
    const zin = multiply(x, inverse2(w));
    write(out.inputImpedanceDm, zin[0]![0]!.sub(zin[0]![1]!).sub(zin[1]![0]!).add(zin[1]![1]!));
    const yin = inverse2(zin);
    write(out.inputImpedanceCm, ONE.div(yin[0]![0]!.add(yin[0]![1]!).add(yin[1]![0]!).add(yin[1]![1]!)));

    systems.forEach((system, s) => {
      const rs = system.sourceOhm;
      const rl = system.loadOhm;
      const without = rl / (rs + rl);
      // Common mode: the lines tied at each end (V1 − V2 = 0), r_s and r_l to ground.
      const tie: Matrix = [
        [ONE, c(-1)],
        [ONE, ZERO],
      ];
      const cm = solveTerminated(
        t,
        tie,
        [
          [ZERO, ZERO],
          [c(rs), c(rs)],
        ],
        [ZERO, ONE],
        tie,
        [
          [ZERO, ZERO],
          [c(-rl), c(-rl)],
        ],
      );
      out.resistiveCmLoss[s]![i] = (without / cm[0]!.abs()) ** 2;
      // Differential mode: r_s/2 and r_l/2 per line, EMF ±1/2, measured line to line.
      const dm = solveTerminated(t, id, scale(id, c(rs / 2)), [c(0.5), c(-0.5)], id, scale(id, c(-rl / 2)));
      out.resistiveDmLoss[s]![i] = (without / dm[0]!.sub(dm[1]!).abs()) ** 2;
    });
  });
  return out;
}
