import { compileNetwork, evaluateNetworkOnce, powerRatioToDb, type NetworkResponse } from '../../src/engine/index.ts';
import type { Design, DesignInput } from '../../src/model/design.ts';
import { buildDesign, capacitor, element, inductor } from './design-builders.ts';

/**
 * Single-ended ladders (the textbook two-port) and their realisation in the two-line engine, for
 * tests that compare the engine with closed forms. The closed forms here are written from the
 * textbook chain (ABCD) matrices, independently of the engine:
 *   series Z → [[1, Z], [0, 1]],  shunt Y → [[1, 0], [Y, 1]],
 *   V_without = RL/(RS + RL),  V_with = RL/(A·RL + B + C·RS·RL + D·RS)   (references.md §3, C).
 */

type StageInput = DesignInput['stages'][number];
type ElementInput = StageInput['elements'][number];

/** A small complex number type for the closed forms; nothing from the engine. */
export interface Cx {
  readonly re: number;
  readonly im: number;
}
export const cx = (re: number, im = 0): Cx => ({ re, im });
export const add = (a: Cx, b: Cx): Cx => cx(a.re + b.re, a.im + b.im);
export const sub = (a: Cx, b: Cx): Cx => cx(a.re - b.re, a.im - b.im);
export const mul = (a: Cx, b: Cx): Cx => cx(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
export const div = (a: Cx, b: Cx): Cx => {
  const d = b.re * b.re + b.im * b.im;
  return cx((a.re * b.re + a.im * b.im) / d, (a.im * b.re - a.re * b.im) / d);
};
export const abs = (a: Cx): number => Math.hypot(a.re, a.im);
export const phaseDeg = (a: Cx): number => (Math.atan2(a.im, a.re) * 180) / Math.PI;
export const parallel = (a: Cx, b: Cx): Cx => div(mul(a, b), add(a, b));

/** One branch of a single-ended ladder, ordered from the source to the load. */
export interface LadderBranch {
  readonly position: 'series' | 'shunt';
  readonly kind: 'L' | 'C';
  /** Henries or farads. */
  readonly value: number;
}

export const seriesL = (value: number): LadderBranch => ({ position: 'series', kind: 'L', value });
export const seriesC = (value: number): LadderBranch => ({ position: 'series', kind: 'C', value });
export const shuntC = (value: number): LadderBranch => ({ position: 'shunt', kind: 'C', value });
export const shuntL = (value: number): LadderBranch => ({ position: 'shunt', kind: 'L', value });

function branchImpedance(branch: LadderBranch, f: number): Cx {
  const omega = 2 * Math.PI * f;
  return branch.kind === 'L' ? cx(0, omega * branch.value) : cx(0, -1 / (omega * branch.value));
}

/** Chain matrix of the ladder at f, as [A, B, C, D]. */
export function ladderChain(ladder: readonly LadderBranch[], f: number): [Cx, Cx, Cx, Cx] {
  let a = cx(1), b = cx(0), c = cx(0), d = cx(1);
  for (const branch of ladder) {
    const z = branchImpedance(branch, f);
    if (branch.position === 'series') {
      // [a b; c d]·[1 z; 0 1]
      b = add(b, mul(a, z));
      d = add(d, mul(c, z));
    } else {
      // [a b; c d]·[1 0; y 1]
      const y = div(cx(1), z);
      a = add(a, mul(b, y));
      c = add(c, mul(d, y));
    }
  }
  return [a, b, c, d];
}

/** Closed-form insertion loss (dB) of a single-ended ladder between rs and rl (CISPR 17 definition). */
export function ladderInsertionLossDb(ladder: readonly LadderBranch[], rs: number, rl: number, f: number): number {
  const [a, b, c, d] = ladderChain(ladder, f);
  const den = add(add(mul(a, cx(rl)), b), add(mul(c, cx(rs * rl)), mul(d, cx(rs))));
  return 20 * Math.log10(abs(den) / (rs + rl));
}

/**
 * The ladder as a balanced two-line filter for the differential-mode (symmetrical) test: a series
 * impedance Z becomes Z/2 in each line (L/2, or 2C), a shunt admittance Y sits line to line.
 * The half circuit is then the ladder scaled to half impedance, so the DM insertion loss between
 * r_s and r_l line to line equals the ladder's between r_s and r_l.
 */
export function differentialRealisation(ladder: readonly LadderBranch[]): ElementInput[] {
  return ladder.flatMap((branch): ElementInput[] => {
    if (branch.position === 'shunt') {
      return [element('line-to-line', branch.kind === 'C' ? capacitor(branch.value) : inductor(branch.value))];
    }
    const part = branch.kind === 'L' ? inductor(branch.value / 2) : capacitor(branch.value * 2);
    return [element('series-line1', part), element('series-line2', part)];
  });
}

/**
 * The ladder for the common-mode (asymmetrical, lines joined) test: a series impedance Z becomes
 * 2Z in each line (the two lines carry the current in parallel), a shunt admittance Y becomes Y/2
 * from each line to ground.
 */
export function commonModeRealisation(ladder: readonly LadderBranch[]): ElementInput[] {
  return ladder.flatMap((branch): ElementInput[] => {
    if (branch.position === 'shunt') {
      const part = branch.kind === 'C' ? capacitor(branch.value / 2) : inductor(branch.value * 2);
      return [element('line1-to-ground', part), element('line2-to-ground', part)];
    }
    const part = branch.kind === 'L' ? inductor(branch.value * 2) : capacitor(branch.value / 2);
    return [element('series-line1', part), element('series-line2', part)];
  });
}

/** One-stage design from elements (terminations resistive 50 Ω; they do not enter the CISPR 17 columns). */
export function designOf(elements: ElementInput[], extra: Parameters<typeof buildDesign>[0] = {}): Design {
  return buildDesign({ ...extra, elements });
}

/** The kernel's response at the given frequencies. */
export function respond(design: Design, frequencies: readonly number[]): NetworkResponse {
  return evaluateNetworkOnce(compileNetwork(design), Float64Array.from(frequencies));
}

/** Index of each CISPR 17 system in the engine's default system list. */
export const SYSTEM = { '50/50': 0, '0.1/100': 1, '100/0.1': 2 } as const;
export type SystemName = keyof typeof SYSTEM;
export const SYSTEM_OHMS: Record<SystemName, { rs: number; rl: number }> = {
  '50/50': { rs: 50, rl: 50 },
  '0.1/100': { rs: 0.1, rl: 100 },
  '100/0.1': { rs: 100, rl: 0.1 },
};

/** Resistive insertion loss in dB at point i. */
export function resistiveLossDb(response: NetworkResponse, mode: 'cm' | 'dm', system: SystemName, i: number): number {
  const columns = mode === 'cm' ? response.resistiveCmLoss : response.resistiveDmLoss;
  return powerRatioToDb(columns[SYSTEM[system]]![i]!);
}

/** Complex value at point i of a response column. */
export function at(columns: { re: Float64Array; im: Float64Array }, i: number): Cx {
  return cx(columns.re[i]!, columns.im[i]!);
}
