import { leakageCurrentA, maxCapacitanceForLeakageF } from './leakage-current.ts';

/**
 * Which capacitance each test condition puts between the live supply and protective earth, for a
 * filter with capacitance C1 from line 1 to ground, C2 from line 2 to ground and C_X across the lines,
 * on a supply whose neutral is at earth potential (TN or TT). The plug may be inserted either way, so
 * either line can be the live one.
 *
 * - Normal condition: the live line's own capacitance to earth, C1 (line 1 live) or C2 (line 2 live);
 *   the neutral's capacitor has no voltage across it.
 * - One supply conductor open (an open neutral, or the live and neutral swapped with one open): the
 *   other line floats and reaches earth through its own capacitor. When the converter's input or the
 *   X capacitors tie it to the live line at mains frequency it sits at the live voltage and the live
 *   sees C1 + C2: the worst case, judged here. With the load not conducting and only C_X tying the
 *   lines, the floating line's capacitor is in series with C_X: C1 + C2·C_X/(C2 + C_X).
 * - Protective earth open (class I): a person touching the enclosure carries what the earth conductor
 *   carried in normal condition; the body's 2 kΩ is nothing against a Y capacitor's hundreds of kΩ,
 *   so the figure is the normal-condition one.
 */

export interface LineCapacitances {
  readonly line1F: number;
  readonly line2F: number;
  readonly acrossF: number;
}

export interface LeakageCases {
  readonly line1LiveA: number;
  readonly line2LiveA: number;
  /** The larger of the two polarities. */
  readonly normalA: number;
  /** One supply conductor open, the floating line tied to the live: (C1 + C2)·ωV·(1 + tol). */
  readonly openConductorA: number;
  /** The same with the load not conducting: the floating line's capacitor in series with C_X. */
  readonly openConductorLoadOpenA: number;
}

function series(a: number, b: number): number {
  return a + b === 0 ? 0 : (a * b) / (a + b);
}

export function leakageCases(c: LineCapacitances, voltageV: number, frequencyHz: number, tolerance: number): LeakageCases {
  const current = (capacitanceF: number): number => leakageCurrentA(capacitanceF, voltageV, frequencyHz, tolerance);
  const line1LiveA = current(c.line1F);
  const line2LiveA = current(c.line2F);
  const loadOpen = Math.max(c.line1F + series(c.line2F, c.acrossF), c.line2F + series(c.line1F, c.acrossF));
  return {
    line1LiveA,
    line2LiveA,
    normalA: Math.max(line1LiveA, line2LiveA),
    openConductorA: current(c.line1F + c.line2F),
    openConductorLoadOpenA: current(loadOpen),
  };
}

export interface LargestYCapacitance {
  /** The most capacitance from each line to earth in normal condition (nominal, before the tolerance). */
  readonly perLineF: number;
  /** The most capacitance from both lines together: the smaller of 2 × perLineF (balanced) and the single-fault bound. */
  readonly totalF: number;
  /** The total allowed with one supply conductor open. */
  readonly singleFaultTotalF: number;
  /** Which condition sets totalF. */
  readonly governedBy: 'normal-condition' | 'single-fault';
  /** True when no separate single-fault limit was given and the normal-condition limit was used for it (conservative). */
  readonly singleFaultLimitFromNormal: boolean;
  readonly normalConditionLimitA: number;
  readonly singleFaultLimitA: number;
  readonly voltageV: number;
  readonly frequencyHz: number;
  readonly tolerance: number;
}

/**
 * The largest Y capacitance that keeps the leakage current within a limit at the highest supply
 * voltage and frequency with the capacitors `tolerance` above nominal: per line from the normal
 * condition, C = I/(2πfV(1 + tol)); in total from the single fault (C1 + C2 ≤ I_SFC/(2πfV(1 + tol)))
 * and from two balanced lines (2 × per line). With no single-fault limit the normal-condition limit
 * stands in for it, as the total Y capacitance is commonly sized against the limit.
 */
export function largestYCapacitance(
  limit: { readonly normalConditionA: number; readonly singleFaultA?: number | undefined },
  voltageV: number,
  frequencyHz: number,
  tolerance: number,
): LargestYCapacitance {
  const singleFaultLimitA = limit.singleFaultA ?? limit.normalConditionA;
  const perLineF = maxCapacitanceForLeakageF(limit.normalConditionA, voltageV, frequencyHz, tolerance);
  const singleFaultTotalF = maxCapacitanceForLeakageF(singleFaultLimitA, voltageV, frequencyHz, tolerance);
  const balancedTotalF = 2 * perLineF;
  const governedBy = singleFaultTotalF < balancedTotalF ? 'single-fault' : 'normal-condition';
  return {
    perLineF,
    totalF: Math.min(balancedTotalF, singleFaultTotalF),
    singleFaultTotalF,
    governedBy,
    singleFaultLimitFromNormal: limit.singleFaultA === undefined,
    normalConditionLimitA: limit.normalConditionA,
    singleFaultLimitA,
    voltageV,
    frequencyHz,
    tolerance,
  };
}
