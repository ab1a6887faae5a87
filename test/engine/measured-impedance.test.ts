import { describe, expect, it } from 'vitest';
import { PointFlag, sweepDesign, type SweepColumnId, type SweepResult } from '../../src/engine/index.ts';
import type { Design, DesignInput } from '../../src/model/design.ts';
import { buildDesign, capacitor, element } from '../support/design-builders.ts';

/*
 * The measured part: a table of |Z| and phase, read by the engine as docs/design-format.md
 * ("measured") and docs/engine-math.md (part table) specify it: ln|Z| and the unwrapped phase are
 * straight lines in log f between points, and the end values are held, and flagged, outside.
 *
 * Closed forms used below (arithmetic on that rule): between points (f1, |Z1|, φ1) and
 * (f2, |Z2|, φ2), with t = log(f/f1)/log(f2/f1),
 *   |Z(f)| = |Z1|^(1−t)·|Z2|^t   (a straight line on log-log axes),   φ(f) = φ1 + t·(φ2 − φ1);
 * at the log midpoint f = √(f1·f2): t = 1/2, |Z| = √(|Z1|·|Z2|) (the geometric mean), φ = (φ1 + φ2)/2.
 */

interface Table {
  readonly frequencyHz: number[];
  readonly magnitudeOhm: number[];
  readonly phaseDeg: number[];
}

type PlanInput = DesignInput['frequencyPlan'];

function designWith(table: Table, frequencyPlan: PlanInput, placement: 'series-line1' | 'line-to-line' = 'series-line1'): Design {
  return buildDesign({ elements: [element(placement, { kind: 'measured', table }, 'M1')], frequencyPlan });
}

/** The measured element's own impedance over the grid. */
function viewOf(result: SweepResult): { magnitudeOhm: Float64Array; phaseDeg: Float64Array } {
  const found = result.elements.find((e) => e.id === 'M1');
  if (!found) throw new Error('the sweep has no element M1');
  expect(found.partKind).toBe('measured');
  expect(found.views.map((v) => v.name)).toEqual(['impedance']);
  return found.views[0]!;
}

/** The grid index of a frequency the sweep was asked to include (merged points may differ by rounding). */
function indexOf(result: SweepResult, frequencyHz: number): number {
  let best = -1;
  result.frequencyHz.forEach((f, i) => {
    if (Math.abs(f / frequencyHz - 1) < 1e-9 && (best < 0 || Math.abs(f - frequencyHz) < Math.abs(result.frequencyHz[best]! - frequencyHz))) best = i;
  });
  if (best < 0) throw new Error(`${frequencyHz} Hz is not on the grid`);
  return best;
}

const relative = (actual: number, wanted: number): number => Math.abs(actual - wanted) / Math.abs(wanted);
/** The difference of two angles in degrees, wrapped into (−180°, 180°]. */
const angleBetween = (a: number, b: number): number => {
  const d = (a - b) % 360;
  return Math.abs(d > 180 ? d - 360 : d <= -180 ? d + 360 : d);
};
/** f1·(f2/f1)^t: the point a fraction t of the way from f1 to f2 on a log axis. */
const logBetween = (f1: number, f2: number, t: number): number => f1 * (f2 / f1) ** t;

// An invented table with a resonance-like turn (no wrap): 100 kHz to 30 MHz.
const TABLE: Table = {
  frequencyHz: [1e5, 3e5, 1e6, 4.7e6, 1e7, 3e7],
  magnitudeOhm: [2, 5, 40, 300, 120, 15],
  phaseDeg: [60, 75, 85, 10, -70, -88],
};
const PLAN: PlanInput = { startHz: 1e4, stopHz: 1e8, pointsPerDecade: 20 };
const FRACTIONS = [0.25, 0.5, 0.8];
const BETWEEN = TABLE.frequencyHz.slice(1).flatMap((f2, k) => FRACTIONS.map((t) => logBetween(TABLE.frequencyHz[k]!, f2, t)));

describe('a design with a measured part', () => {
  const design = designWith(TABLE, PLAN);
  const result = sweepDesign(design, { extraFrequencyHz: [...TABLE.frequencyHz, ...BETWEEN] });
  const view = viewOf(result);

  it('sweeps: every column finite, and the element listed with its impedance', () => {
    expect(result.frequencyHz.length).toBeGreaterThan(80);
    for (const column of Object.values(result.columns)) expect(column.every(Number.isFinite)).toBe(true);
    expect(view.magnitudeOhm.every((m) => Number.isFinite(m) && m > 0)).toBe(true);
  });

  it('at the table’s own frequencies the element’s impedance is the table (|Z| to 1e-9 relative, phase to 1e-9°)', () => {
    TABLE.frequencyHz.forEach((f, k) => {
      const i = indexOf(result, f);
      expect(relative(view.magnitudeOhm[i]!, TABLE.magnitudeOhm[k]!), `|Z| at ${f} Hz`).toBeLessThan(1e-9);
      expect(angleBetween(view.phaseDeg[i]!, TABLE.phaseDeg[k]!), `phase at ${f} Hz`).toBeLessThan(1e-9);
    });
  });

  it('between two points |Z| is a straight line on log-log axes and the phase is linear in log f', () => {
    TABLE.frequencyHz.slice(1).forEach((f2, k) => {
      const f1 = TABLE.frequencyHz[k]!;
      const [m1, m2] = [TABLE.magnitudeOhm[k]!, TABLE.magnitudeOhm[k + 1]!];
      const [p1, p2] = [TABLE.phaseDeg[k]!, TABLE.phaseDeg[k + 1]!];
      for (const t of FRACTIONS) {
        const i = indexOf(result, logBetween(f1, f2, t));
        expect(relative(view.magnitudeOhm[i]!, m1 ** (1 - t) * m2 ** t), `|Z| at t = ${t} from ${f1} Hz`).toBeLessThan(1e-9);
        expect(angleBetween(view.phaseDeg[i]!, p1 + t * (p2 - p1)), `phase at t = ${t} from ${f1} Hz`).toBeLessThan(1e-9);
      }
      // The log midpoint: the geometric mean of the magnitudes, the mean of the phases.
      const mid = indexOf(result, Math.sqrt(f1 * f2));
      expect(relative(view.magnitudeOhm[mid]!, Math.sqrt(m1 * m2))).toBeLessThan(1e-9);
      expect(angleBetween(view.phaseDeg[mid]!, (p1 + p2) / 2)).toBeLessThan(1e-9);
    });
  });

  it('outside the measured range the end value is held, the points are flagged and the sweep warns', () => {
    const first = TABLE.frequencyHz[0]!;
    const last = TABLE.frequencyHz[TABLE.frequencyHz.length - 1]!;
    let below = 0;
    let above = 0;
    result.frequencyHz.forEach((f, i) => {
      const flagged = (result.pointFlags[i]! & PointFlag.OutsideMeasuredRange) !== 0;
      if (f < first) {
        below += 1;
        expect(flagged, `${f} Hz is below the table`).toBe(true);
        expect(relative(view.magnitudeOhm[i]!, TABLE.magnitudeOhm[0]!)).toBeLessThan(1e-12);
        expect(angleBetween(view.phaseDeg[i]!, TABLE.phaseDeg[0]!)).toBeLessThan(1e-9);
      } else if (f > last) {
        above += 1;
        expect(flagged, `${f} Hz is above the table`).toBe(true);
        expect(relative(view.magnitudeOhm[i]!, TABLE.magnitudeOhm[5]!)).toBeLessThan(1e-12);
        expect(angleBetween(view.phaseDeg[i]!, TABLE.phaseDeg[5]!)).toBeLessThan(1e-9);
      } else {
        expect(flagged, `${f} Hz is inside the table`).toBe(false);
      }
    });
    // A decade at each end at 20 points per decade; the table's end points themselves are inside.
    expect(below).toBeGreaterThanOrEqual(20);
    expect(above).toBeGreaterThanOrEqual(10);
    expect(result.pointFlags[indexOf(result, first)]).toBe(0);
    expect(result.pointFlags[indexOf(result, last)]).toBe(0);
    const warning = result.warnings.find((w) => w.code === 'outside-measured-range');
    expect(warning?.message).toMatch(new RegExp(`^measured impedance held at its end value outside the measured range at ${below + above} points from `, 'u'));
  });

  it('a sweep inside the measured range has no such flag and no such warning', () => {
    const inside = sweepDesign(designWith(TABLE, { startHz: 1e5, stopHz: 3e7, pointsPerDecade: 20 }));
    expect(inside.pointFlags.every((flags) => (flags & PointFlag.OutsideMeasuredRange) === 0)).toBe(true);
    expect(inside.warnings.map((w) => w.code)).not.toContain('outside-measured-range');
  });
});

describe('a phase that wraps through ±180°', () => {
  // |Z| from 10 Ω to 1 kΩ over a decade; the phase steps 20° across the ±180° seam of the display.
  const cases = [
    { name: '170° → −170° (rising through 180°)', phaseDeg: [170, -170], expected: (t: number) => 170 + 20 * t },
    { name: '−170° → 170° (falling through −180°)', phaseDeg: [-170, 170], expected: (t: number) => -170 - 20 * t },
  ];
  for (const c of cases) {
    it(`${c.name} interpolates through 180°, not through 0°`, () => {
      const table: Table = { frequencyHz: [1e6, 1e7], magnitudeOhm: [10, 1000], phaseDeg: c.phaseDeg };
      const points = [0.25, 0.5, 0.75].map((t) => ({ t, f: logBetween(1e6, 1e7, t) }));
      const result = sweepDesign(designWith(table, { startHz: 1e6, stopHz: 1e7, pointsPerDecade: 10 }), {
        refine: false,
        extraFrequencyHz: points.map((p) => p.f),
      });
      const view = viewOf(result);
      for (const { t, f } of points) {
        const i = indexOf(result, f);
        expect(angleBetween(view.phaseDeg[i]!, c.expected(t)), `phase at t = ${t}`).toBeLessThan(1e-9);
        expect(relative(view.magnitudeOhm[i]!, 10 * 100 ** t), `|Z| at t = ${t}`).toBeLessThan(1e-9);
      }
      // At the log midpoint: 180° and the geometric mean 100 Ω; through 0° it would be 0°.
      const mid = indexOf(result, Math.sqrt(1e13));
      expect(angleBetween(view.phaseDeg[mid]!, 180)).toBeLessThan(1e-9);
      expect(Math.abs(view.phaseDeg[mid]!)).toBeGreaterThan(179.999);
      expect(relative(view.magnitudeOhm[mid]!, 100)).toBeLessThan(1e-9);
      // The whole way across, the phase stays within 10° of the seam.
      view.phaseDeg.forEach((phase) => expect(Math.abs(phase)).toBeGreaterThanOrEqual(170 - 1e-9));
    });
  }
});

describe('a measured table of a capacitor against the capacitor part', () => {
  /*
   * Capacitor with parasitics, Z = ESR + j(ωESL − 1/(ωC)) (the engine's capacitor model; textbook:
   * C. R. Paul, "Introduction to Electromagnetic Compatibility", 2nd ed., Wiley 2006, Ch. 5 —
   * chapter from memory, as test/engine/part-impedance.test.ts). 1 µF, 0.1 Ω, 10 nH:
   * Z0 = √(ESL/C) = 0.1 Ω, so Q = Z0/ESR = 1, resonance at 1/(2π√(ESL·C)) = 1.59 MHz.
   *
   * The error of a straight line through two points (interpolation error theorem, any
   * numerical-analysis text): |g − line| ≤ h²/8 · max|g''| on a step h. With g = ln|Z| against
   * v = ln(f/f0): |Z|² = ESR² + 4·Z0²·sinh²v, so g''(0) = 4Q² is the largest curvature; at 40 points
   * per decade h = ln(10)/40, so ln|Z| is off by at most h²/8 · 4 = 1.66e-3 (0.0144 dB) midway
   * between points near the resonance, and insertion loss with it.
   */
  const C = 1e-6;
  const ESR = 0.1;
  const ESL = 10e-9;
  const impedance = (f: number): { re: number; im: number } => {
    const w = 2 * Math.PI * f;
    return { re: ESR, im: w * ESL - 1 / (w * C) };
  };
  const POINTS_PER_DECADE = 40;
  const frequencyHz = Array.from({ length: 4 * POINTS_PER_DECADE + 1 }, (_, k) => 1e4 * 10 ** (k / POINTS_PER_DECADE));
  const table: Table = {
    frequencyHz,
    magnitudeOhm: frequencyHz.map((f) => Math.hypot(impedance(f).re, impedance(f).im)),
    phaseDeg: frequencyHz.map((f) => (Math.atan2(impedance(f).im, impedance(f).re) * 180) / Math.PI),
  };
  const midpoints = frequencyHz.slice(1).map((f2, k) => Math.sqrt(frequencyHz[k]! * f2));
  const plan: PlanInput = { startHz: 1e4, stopHz: 1e8, pointsPerDecade: 100 };
  const options = { refine: false, extraFrequencyHz: [...frequencyHz, ...midpoints] };
  const withCapacitor = sweepDesign(buildDesign({ elements: [element('line-to-line', capacitor(C, { esr: ESR, esl: ESL }), 'M1')], frequencyPlan: plan }), options);
  const withTable = sweepDesign(designWith(table, plan, 'line-to-line'), options);

  const H = Math.log(10) / POINTS_PER_DECADE;
  const BOUND_LN = (H * H) / 8 * 4;
  const BOUND_DB = (20 / Math.log(10)) * BOUND_LN;

  it('the straight-line bound in closed form: h²/8 · 4Q² is 0.0144 dB at 40 points per decade', () => {
    expect(BOUND_DB).toBeGreaterThan(0.0143);
    expect(BOUND_DB).toBeLessThan(0.0145);
  });

  it('the table’s |Z| between points stays within that bound of the closed form', () => {
    const view = viewOf(withTable);
    let worst = 0;
    for (const f of midpoints) {
      const i = indexOf(withTable, f);
      const z = impedance(withTable.frequencyHz[i]!);
      worst = Math.max(worst, Math.abs(Math.log(view.magnitudeOhm[i]! / Math.hypot(z.re, z.im))));
    }
    expect(worst).toBeLessThanOrEqual(BOUND_LN * (1 + 1e-6));
    // And the bound is nearly reached: the comparison below is not of two identical curves.
    expect(worst).toBeGreaterThan(0.5 * BOUND_LN);
  });

  const LOSSES: readonly SweepColumnId[] = [
    'insertionLoss50Cm',
    'insertionLoss50Dm',
    'insertionLossLowHighCm',
    'insertionLossLowHighDm',
    'insertionLossHighLowCm',
    'insertionLossHighLowDm',
    'insertionLossInCircuitCm',
    'insertionLossInCircuitDm',
  ];

  /** The largest difference of a column at the frequencies both sweeps share (their resonance points differ). */
  function worstDifference(column: SweepColumnId, only?: readonly number[]): number {
    const reference = new Map<number, number>();
    withCapacitor.frequencyHz.forEach((f, i) => reference.set(f, withCapacitor.columns[column][i]!));
    const wanted = only ? new Set(only.map((f) => withTable.frequencyHz[indexOf(withTable, f)]!)) : undefined;
    let worst = 0;
    let compared = 0;
    withTable.frequencyHz.forEach((f, i) => {
      const other = reference.get(f);
      if (other === undefined || (wanted && !wanted.has(f))) return;
      compared += 1;
      worst = Math.max(worst, Math.abs(withTable.columns[column][i]! - other));
    });
    expect(compared).toBeGreaterThan(only ? only.length - 1 : 500);
    return worst;
  }

  it('gives the capacitor’s insertion loss within 0.05 dB everywhere (the straight-line error)', () => {
    for (const column of LOSSES) expect(worstDifference(column), column).toBeLessThan(0.05);
    // The DM loss in 50 Ω follows |Z| (about 48 dB here): its error is the one bounded above.
    const dm = worstDifference('insertionLoss50Dm');
    expect(dm).toBeLessThanOrEqual(BOUND_DB * 1.05);
    expect(dm).toBeGreaterThan(0.5 * BOUND_DB);
  });

  it('and the same insertion loss at the table’s own frequencies', () => {
    for (const column of LOSSES) expect(worstDifference(column, frequencyHz), column).toBeLessThan(1e-9);
  });
});
