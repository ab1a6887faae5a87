import { describe, expect, it } from 'vitest';
import { complexColumns } from '../../src/engine/complex-columns.ts';
import { sweepDesign } from '../../src/engine/index.ts';
import { chokeEigenImpedances, twoTerminalEvaluator } from '../../src/engine/parts/part-impedance.ts';
import type { DesignInput, Part, TwoTerminalPart } from '../../src/model/design.ts';
import { buildDesign, capacitor, element, inductor } from '../support/design-builders.ts';
import { abs, at, cx, type Cx, parallel, phaseDeg, respond } from '../support/ladder.ts';

/*
 * Part models against closed forms and references.md §6–§7.
 * Models (textbook; C. R. Paul, "Introduction to Electromagnetic Compatibility", 2nd ed., Wiley
 * 2006, Ch. 5 "Nonideal Behavior of Components" — chapter from memory): inductor
 * (R + jωL) ∥ 1/(jωC_w); capacitor ESR + jωESL + 1/(jωC); f_SRF = 1/(2π√(LC)) (V2: tutorial pages).
 */

type PartInput = DesignInput['stages'][number]['elements'][number]['part'];

function impedanceOf(part: PartInput, f: number): Cx {
  const design = buildDesign({ elements: [element('series-line1', part)] });
  const parsed = design.stages[0]!.elements[0]!.part as TwoTerminalPart;
  const out = complexColumns(1);
  twoTerminalEvaluator(parsed).evaluate(Float64Array.of(f), out, new Uint8Array(1));
  return cx(out.re[0]!, out.im[0]!);
}

const TWO_PI = 2 * Math.PI;
/** Half a unit of the last printed digit. */
const halfUnit = (printed: number, decimals: number): number => 0.5 * 10 ** -decimals + 1e-12 * Math.abs(printed);

describe('reactance arithmetic (textbook arithmetic, common practice; references.md §6, C)', () => {
  it('X_L of 120 mH at 50 Hz is 37.6991 Ω; 240 V drives 6.36620 A through it; at 60 Hz 45.2389 Ω', () => {
    const at50 = impedanceOf(inductor(120e-3), 50);
    expect(at50.re).toBe(0);
    expect(Math.abs(at50.im - 37.6991)).toBeLessThanOrEqual(halfUnit(37.6991, 4));
    expect(Math.abs(240 / abs(at50) - 6.3662)).toBeLessThanOrEqual(halfUnit(6.3662, 5));
    expect(Math.abs(impedanceOf(inductor(120e-3), 60).im - 45.2389)).toBeLessThanOrEqual(halfUnit(45.2389, 4));
  });

  it('Q of 10 µH with 50 mΩ series resistance at 100 kHz is ωL/R = 125.664', () => {
    const z = impedanceOf(inductor(10e-6, { dcr: 0.05 }), 100e3);
    expect(Math.abs(z.im / z.re - 125.664)).toBeLessThanOrEqual(halfUnit(125.664, 3));
  });
});

describe('self-resonances found by sweepDesign equal the closed form f = 1/(2π√(LC)) (references.md §6, C; formula V2)', () => {
  const cases: { name: string; part: PartInput; printedHz: number; printedDigits: number; type: 'series' | 'parallel'; exactHz: number }[] = [
    // With a series R in the inductive branch the reactance of (R + jωL) ∥ C vanishes at
    // ω² = 1/(LC) − R²/L² (closed form); the shift is below 1e-14 here.
    { name: 'choke-like 10 mH ∥ 20 pF, 1 Ω DCR', part: inductor(10e-3, { dcr: 1, windingCapacitance: 20e-12 }), printedHz: 355.881e3, printedDigits: 6, type: 'parallel', exactHz: Math.sqrt(1 / (10e-3 * 20e-12) - 1 / 10e-3 ** 2) / TWO_PI },
    { name: '4.7 mH ∥ 15 pF', part: inductor(4.7e-3, { windingCapacitance: 15e-12 }), printedHz: 599.412e3, printedDigits: 6, type: 'parallel', exactHz: 1 / (TWO_PI * Math.sqrt(4.7e-3 * 15e-12)) },
    { name: '1 mH ∥ 10 pF', part: inductor(1e-3, { windingCapacitance: 10e-12 }), printedHz: 1.59155e6, printedDigits: 6, type: 'parallel', exactHz: 1 / (TWO_PI * Math.sqrt(1e-3 * 10e-12)) },
    { name: 'X capacitor 0.47 µF with 15 nH ESL', part: capacitor(0.47e-6, { esr: 0.01, esl: 15e-9 }), printedHz: 1.89551e6, printedDigits: 6, type: 'series', exactHz: 1 / (TWO_PI * Math.sqrt(15e-9 * 0.47e-6)) },
    { name: '1 µF with 20 nH ESL', part: capacitor(1e-6, { esr: 0.005, esl: 20e-9 }), printedHz: 1.1254e6, printedDigits: 6, type: 'series', exactHz: 1 / (TWO_PI * Math.sqrt(20e-9 * 1e-6)) },
    { name: 'MLCC 100 nF with 1 nH', part: capacitor(100e-9, { esr: 0.002, esl: 1e-9 }), printedHz: 15.9155e6, printedDigits: 6, type: 'series', exactHz: 1 / (TWO_PI * Math.sqrt(1e-9 * 100e-9)) },
    { name: '15 nF with 0.9 nH', part: capacitor(15e-9, { esl: 0.9e-9 }), printedHz: 43.3165e6, printedDigits: 6, type: 'series', exactHz: 1 / (TWO_PI * Math.sqrt(0.9e-9 * 15e-9)) },
    { name: 'Y capacitor 4.7 nF with 5 nH', part: capacitor(4.7e-9, { esr: 0.05, esl: 5e-9 }), printedHz: 32.8312e6, printedDigits: 6, type: 'series', exactHz: 1 / (TWO_PI * Math.sqrt(5e-9 * 4.7e-9)) },
  ];
  for (const c of cases) {
    it(`${c.name}: ${c.type} resonance at ${c.printedHz} Hz`, () => {
      // The closed form itself matches the printed value to its 6 significant figures.
      const halfUnitHz = 0.5 * 10 ** (Math.floor(Math.log10(c.printedHz)) - c.printedDigits + 1);
      expect(Math.abs(c.exactHz - c.printedHz)).toBeLessThanOrEqual(halfUnitHz);
      const result = sweepDesign(buildDesign({ elements: [element('line-to-line', c.part)] }));
      const view = result.elements[0]!.views[0]!;
      expect(view.name).toBe('impedance');
      expect(view.selfResonances).toHaveLength(1);
      const found = view.selfResonances[0]!;
      expect(found.type).toBe(c.type);
      expect(Math.abs(found.frequencyHz / c.exactHz - 1)).toBeLessThan(1e-9);
      // The same resonance appears among the sweep's resonance marks.
      const mark = result.resonances.find((r) => r.kind === 'element' && r.elementId === result.elements[0]!.id);
      expect(mark?.frequencyHz).toBe(found.frequencyHz);
    });
  }

  it('the element view magnitude is |Z| of the part at every grid point', () => {
    const result = sweepDesign(buildDesign({ elements: [element('series-line2', inductor(10e-3, { dcr: 1, windingCapacitance: 20e-12 }))] }));
    const view = result.elements[0]!.views[0]!;
    result.frequencyHz.forEach((f, i) => {
      const omega = TWO_PI * f;
      const exact = parallel(cx(1, omega * 10e-3), cx(0, -1 / (omega * 20e-12)));
      expect(Math.abs(view.magnitudeOhm[i]! / abs(exact) - 1), `${f} Hz`).toBeLessThan(1e-9);
    });
  });
});

describe('1 mH ∥ 10 pF with 0.1 Ω in the winding (references.md §6, C)', () => {
  const part = inductor(1e-3, { dcr: 0.1, windingCapacitance: 10e-12 });
  const rows: [number, number, number][] = [
    [100e3, 630.8, 1],
    [1e6, 10.38e3, -1],
    [10e6, 1633, 0],
    [30e6, 532, 0],
  ];
  for (const [f, printed, decimals] of rows) {
    it(`|Z| at ${f / 1e6} MHz is ${printed} Ω`, () => {
      const z = impedanceOf(part, f);
      expect(Math.abs(abs(z) - printed)).toBeLessThanOrEqual(halfUnit(printed, decimals));
      const omega = TWO_PI * f;
      const exact = parallel(cx(0.1, omega * 1e-3), cx(0, -1 / (omega * 10e-12)));
      expect(Math.abs(abs(z) / abs(exact) - 1)).toBeLessThan(1e-12);
    });
  }
  it('inductive below the 1.59 MHz SRF, capacitive above it', () => {
    expect(phaseDeg(impedanceOf(part, 100e3))).toBeGreaterThan(89);
    expect(phaseDeg(impedanceOf(part, 10e6))).toBeLessThan(-89);
  });
});

describe('first-order relaxation core, L0 = 1 mH, f_r = 1 MHz: Z = ωL0·(x + j)/(1 + x²), x = f/f_r (references.md §7, C; Debye form V2)', () => {
  const part: PartInput = { kind: 'inductor', inductance: 1e-3, permeability: { kind: 'first-order-relaxation', relaxationFrequencyHz: 1e6 } };
  const rows: { f: number; magnitude: [number, number]; phase: [number, number]; rs?: [number, number]; xs?: [number, number] }[] = [
    { f: 100e3, magnitude: [625.2, 3], phase: [84.289, 3], rs: [62.21, 3], xs: [622.098, 3] },
    { f: 1e6, magnitude: [4442.88, 2], phase: [45.0, 3], rs: [3141.59, 2], xs: [3141.59, 2] },
    { f: 10e6, magnitude: [6252.0, 2], phase: [5.711, 3], rs: [6220.98, 2] },
    { f: 100e6, magnitude: [6282.87, 2], phase: [0.573, 3] },
  ];
  for (const row of rows) {
    it(`${row.f / 1e6} MHz: ${row.magnitude[0]} Ω ∠${row.phase[0]}°`, () => {
      const z = impedanceOf(part, row.f);
      expect(Math.abs(abs(z) - row.magnitude[0])).toBeLessThanOrEqual(halfUnit(...row.magnitude));
      expect(Math.abs(phaseDeg(z) - row.phase[0])).toBeLessThanOrEqual(halfUnit(...row.phase));
      if (row.rs) expect(Math.abs(z.re - row.rs[0])).toBeLessThanOrEqual(halfUnit(...row.rs));
      if (row.xs) expect(Math.abs(z.im - row.xs[0])).toBeLessThanOrEqual(halfUnit(...row.xs));
    });
  }
  it('at f = f_r: µ′ = µ″, |Z| = ω_r·L0/√2 at exactly 45°; far above, R_s → 2π·f_r·L0 = 6283.19 Ω and X_s → 2π·f_r²·L0/f', () => {
    const atFr = impedanceOf(part, 1e6);
    expect(Math.abs(atFr.re / atFr.im - 1)).toBeLessThan(1e-14);
    expect(Math.abs(abs(atFr) / ((TWO_PI * 1e6 * 1e-3) / Math.SQRT2) - 1)).toBeLessThan(1e-14);
    const far = impedanceOf(part, 1e11);
    expect(Math.abs(far.re - 6283.19)).toBeLessThanOrEqual(halfUnit(6283.19, 2));
    expect(Math.abs(far.im / ((TWO_PI * 1e12 * 1e-3) / 1e11) - 1)).toBeLessThan(1e-9);
  });
});

describe('common-mode choke: coupled windings (domain C18 — from memory; arithmetic L_CM = L(1+k)/2, DM loop 2L(1−k))', () => {
  const chokePart = (coupling: Extract<Part, { kind: 'common-mode-choke' }>['coupling']): PartInput => ({ kind: 'common-mode-choke', inductance: 10e-3, coupling });

  it('L = 10 mH, k = 0.99: the sweep’s CM view (lines joined) is 9.95 mH and its DM loop view 200 µH', () => {
    const design = buildDesign({
      elements: [element('both-lines-coupled', chokePart({ kind: 'coupling-factor', couplingFactor: 0.99 }))],
      frequencyPlan: { startHz: 50, stopHz: 1e5, pointsPerDecade: 10 },
    });
    const result = sweepDesign(design);
    const [cmView, dmView] = result.elements[0]!.views;
    expect(cmView!.name).toBe('common-mode');
    expect(dmView!.name).toBe('differential-mode');
    result.frequencyHz.forEach((f, i) => {
      expect(Math.abs(cmView!.magnitudeOhm[i]! / (TWO_PI * f) / 9.95e-3 - 1)).toBeLessThan(1e-12);
      expect(Math.abs(dmView!.magnitudeOhm[i]! / (TWO_PI * f) / 200e-6 - 1)).toBeLessThan(1e-9);
      expect(cmView!.phaseDeg[i]).toBeCloseTo(90, 9);
    });
  });

  it('the same choke in circuit: CM input impedance jω·9.95 mH + R/2, DM input impedance jω·200 µH + 2R (1 mΩ receivers)', () => {
    const design = buildDesign({
      elements: [element('both-lines-coupled', chokePart({ kind: 'coupling-factor', couplingFactor: 0.99 }))],
      receivers: { line1: { kind: 'resistive', resistance: 1e-3 }, line2: { kind: 'resistive', resistance: 1e-3 } },
    });
    const frequencies = [1e3, 10e3, 100e3];
    const response = respond(design, frequencies);
    frequencies.forEach((f, i) => {
      const cm = at(response.inputImpedanceCm, i);
      const dm = at(response.inputImpedanceDm, i);
      expect(Math.abs(cm.im / (TWO_PI * f) / 9.95e-3 - 1)).toBeLessThan(1e-12);
      expect(Math.abs(cm.re / 0.5e-3 - 1)).toBeLessThan(1e-9);
      expect(Math.abs(dm.im / (TWO_PI * f) / 200e-6 - 1)).toBeLessThan(1e-9);
      expect(Math.abs(dm.re / 2e-3 - 1)).toBeLessThan(1e-9);
    });
  });

  it('given as 50 µH leakage per winding: DM loop 2·50 µH = 100 µH, CM (L + M)/2 = 9.975 mH (arithmetic)', () => {
    const part = buildDesign({ elements: [element('both-lines-coupled', chokePart({ kind: 'leakage-inductance', leakageInductance: 50e-6 }))] })
      .stages[0]!.elements[0]!.part;
    if (part.kind !== 'common-mode-choke') throw new Error('expected a choke');
    const even = complexColumns(1);
    const odd = complexColumns(1);
    const f = 1e3;
    chokeEigenImpedances(part, Float64Array.of(f), even, odd, new Uint8Array(1));
    expect(Math.abs(even.im[0]! / 2 / (TWO_PI * f) / 9.975e-3 - 1)).toBeLessThan(1e-12);
    expect(Math.abs((2 * odd.im[0]!) / (TWO_PI * f) / 100e-6 - 1)).toBeLessThan(1e-12);
  });

  it('k = 1 (ideal coupling): zero leakage, finite everywhere, no NaN; invisible to DM (0 dB) and a plain series L for CM: IL = 20·log|1 + jωL/(r_s + r_l)|', () => {
    const design = buildDesign({
      elements: [element('both-lines-coupled', chokePart({ kind: 'coupling-factor', couplingFactor: 1 }))],
      receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } },
      frequencyPlan: { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 50 },
    });
    const result = sweepDesign(design);
    for (const [id, values] of Object.entries(result.columns)) {
      values.forEach((v, i) => expect(Number.isFinite(v), `${id}[${i}] = ${v}`).toBe(true));
    }
    for (const [id, c] of Object.entries(result.transfers)) {
      c.re.forEach((v, i) => expect(Number.isFinite(v) && Number.isFinite(c.im[i]!), `${id}[${i}]`).toBe(true));
    }
    const dmView = result.elements[0]!.views[1]!;
    dmView.magnitudeOhm.forEach((v) => expect(v).toBe(0));
    result.frequencyHz.forEach((f, i) => {
      expect(Math.abs(result.columns.insertionLoss50Dm[i]!)).toBeLessThan(1e-12);
      const expected = 20 * Math.log10(Math.hypot(1, (TWO_PI * f * 10e-3) / 100));
      expect(Math.abs(result.columns.insertionLoss50Cm[i]! - expected), `${f} Hz`).toBeLessThan(1e-9);
    });
    expect(result.pointFlags.every((flag) => flag === 0)).toBe(true);
  });
});

describe('core loss given as Q at a frequency (textbook: series-equivalent Q = X_s/R_s of jωL ∥ R_p is R_p/(ωL))', () => {
  const part: PartInput = { kind: 'inductor', inductance: 100e-6, coreLoss: { kind: 'quality-factor', qualityFactor: 50, atFrequencyHz: 1e6 } };
  it('Q = 50 at 1 MHz: X_s/R_s = 50 there; Q scales as 1/f for a parallel loss (500 at 100 kHz, 5 at 10 MHz)', () => {
    for (const [f, q] of [
      [1e6, 50],
      [100e3, 500],
      [10e6, 5],
    ] as const) {
      const z = impedanceOf(part, f);
      expect(Math.abs(z.im / z.re / q - 1), `${f} Hz`).toBeLessThan(1e-12);
    }
  });
  it('the resistance across the winding is Q·ω0·L = 31.4159 kΩ: |Z| at 1 MHz = R_p·ωL/√(R_p² + ω²L²)', () => {
    const omegaL = TWO_PI * 1e6 * 100e-6;
    const rp = 50 * omegaL;
    expect(Math.abs(rp - 31415.9)).toBeLessThan(0.05);
    expect(Math.abs(abs(impedanceOf(part, 1e6)) / ((rp * omegaL) / Math.hypot(rp, omegaL)) - 1)).toBeLessThan(1e-12);
  });
});
