import { describe, expect, it } from 'vitest';
import { DB_FLOOR, magnitudeToDb, PointFlag, powerRatioToDb, sweepDesign, type SweepResult } from '../../src/engine/index.ts';
import { ADMITTANCE_LIMIT_S, IMPEDANCE_LIMIT_OHM } from '../../src/engine/point-flags.ts';
import type { DesignInput } from '../../src/model/design.ts';
import { buildDesign, capacitor, element, inductor, resistor } from '../support/design-builders.ts';

/*
 * Ideal (lossless) parts exactly at resonance (domain §4 pitfalls 1, 5 and 17: ideal parts give
 * unbounded values, k = 1 makes the inductance matrix singular, dB of zero must not become
 * −Infinity/NaN — common practice, no source). The resonance frequencies are closed forms.
 */

type PartInput = DesignInput['stages'][number]['elements'][number]['part'];
const TWO_PI = 2 * Math.PI;

function expectAllFinite(result: SweepResult): void {
  for (const [id, values] of Object.entries(result.columns)) {
    values.forEach((v, i) => expect(Number.isFinite(v), `${id}[${i}] = ${v} at ${result.frequencyHz[i]} Hz`).toBe(true));
  }
  for (const [id, c] of Object.entries(result.transfers)) {
    c.re.forEach((v, i) => expect(Number.isFinite(v) && Number.isFinite(c.im[i]!), `${id}[${i}] at ${result.frequencyHz[i]} Hz`).toBe(true));
  }
  for (const e of result.elements) {
    for (const view of e.views) {
      view.magnitudeOhm.forEach((v, i) => expect(Number.isFinite(v) && Number.isFinite(view.phaseDeg[i]!), `${e.id} ${view.name}[${i}]`).toBe(true));
    }
  }
  result.frequencyHz.forEach((f) => expect(Number.isFinite(f)).toBe(true));
}

function pointAt(result: SweepResult, f: number): number {
  const index = result.frequencyHz.indexOf(f);
  expect(index, `${f} Hz should be a grid point`).toBeGreaterThanOrEqual(0);
  return index;
}

describe('an ESR = 0 capacitor exactly at 1/(2π√(ESL·C)) (closed form)', () => {
  const C = 100e-9;
  const ESL = 1e-9;
  const srf = 1 / (TWO_PI * Math.sqrt(ESL * C));
  const result = sweepDesign(
    buildDesign({ elements: [element('line-to-line', capacitor(C, { esl: ESL }))], frequencyPlan: { startHz: 1e6, stopHz: 100e6, pointsPerDecade: 20 } }),
    { extraFrequencyHz: [srf] },
  );

  it('every column, transfer and element view is finite', () => expectAllFinite(result));

  it('the point at the SRF carries PointFlag.IdealResonanceLimited, and a warning says so', () => {
    const i = pointAt(result, srf);
    expect(result.pointFlags[i]! & PointFlag.IdealResonanceLimited).toBe(PointFlag.IdealResonanceLimited);
    expect(result.warnings.some((w) => w.code === 'ideal-resonance-limited')).toBe(true);
  });

  /*
   * At the SRF the part is a short across the lines, which the engine limits to
   * ADMITTANCE_LIMIT_S (1e9 S, i.e. 1 nΩ). Closed form for the DM test with a shunt Y between
   * the lines: IL = 20·log|1 + Y·(Rs∥RL)|: 208 dB in 50/50, 160 dB in either worst-case system —
   * physically unbounded, in any case large and positive, never an insertion gain.
   */
  it('the DM insertion loss of the short is the closed form for the limiting admittance in every CISPR 17 system', () => {
    const i = pointAt(result, srf);
    const expected = (rs: number, rl: number): number => 20 * Math.log10(ADMITTANCE_LIMIT_S * ((rs * rl) / (rs + rl)));
    expect(result.columns.insertionLoss50Dm[i]!, '50/50').toBeCloseTo(expected(50, 50), 2);
    expect(result.columns.insertionLossLowHighDm[i]!, '0.1/100').toBeCloseTo(expected(0.1, 100), 2);
    expect(result.columns.insertionLossHighLowDm[i]!, '100/0.1').toBeCloseTo(expected(100, 0.1), 2);
  });

  /*
   * A part between the lines carries no common-mode current (V1 = V2 under CM excitation of a
   * symmetric network), so shorting the lines changes nothing for CM: closed form with the
   * default terminations (50 Ω receivers, Z_cm = 50 Ω, Z_dm = 100 Ω): T_CM = 25/(25 + 50 + 25)
   * = 0.25, CM input impedance 50 ∥ 50 = 25 Ω, CM insertion loss 0 dB.
   */
  // The limited 1e9 S entry costs the other mode about 1e-7 of relative rounding (point-flags.ts).
  it('common mode is untouched by the short between the lines: T_CM = 0.25, Z_in,CM = 25 Ω, CM insertion loss 0 dB (closed form)', () => {
    const i = pointAt(result, srf);
    const t = result.transfers;
    expect(Math.hypot(t.transferCm.re[i]! - 0.25, t.transferCm.im[i]!), `T_CM = ${t.transferCm.re[i]} + j${t.transferCm.im[i]}`).toBeLessThan(1e-6);
    expect(Math.hypot(t.inputImpedanceCm.re[i]! - 25, t.inputImpedanceCm.im[i]!), `Z_in,CM = ${t.inputImpedanceCm.re[i]} + j${t.inputImpedanceCm.im[i]}`).toBeLessThan(1e-6);
    expect(Math.abs(result.columns.insertionLoss50Cm[i]!)).toBeLessThan(1e-5);
    expect(Math.abs(result.columns.insertionLossInCircuitCm[i]!)).toBeLessThan(1e-5);
  });

  it('points away from the SRF are not flagged', () => {
    const flagged = result.frequencyHz.filter((_, k) => result.pointFlags[k] !== 0);
    flagged.forEach((f) => expect(Math.abs(f / srf - 1)).toBeLessThan(1e-6));
  });
});

describe('an inductor with winding capacitance and no loss, exactly at its SRF (closed form)', () => {
  const L = 1e-3;
  const CW = 10e-12;
  const srf = 1 / (TWO_PI * Math.sqrt(L * CW));
  const result = sweepDesign(
    buildDesign({
      elements: [element('series-line1', inductor(L, { windingCapacitance: CW })), element('series-line2', inductor(L, { windingCapacitance: CW }))],
      receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } },
      frequencyPlan: { startHz: 150e3, stopHz: 30e6, pointsPerDecade: 20 },
    }),
    { extraFrequencyHz: [srf] },
  );

  // The open winding is limited to IMPEDANCE_LIMIT_OHM (1 GΩ) in each line; closed form for the
  // DM test with a series Z in each line: IL = 20·log|1 + 2Z/(Rs + RL)| = 146 dB in 50/50.
  it('finite everywhere; flagged at the SRF with a warning; the open circuit there gives the closed-form insertion loss of the limit', () => {
    expectAllFinite(result);
    const i = pointAt(result, srf);
    expect(result.pointFlags[i]! & PointFlag.IdealResonanceLimited).toBe(PointFlag.IdealResonanceLimited);
    expect(result.warnings.some((w) => w.code === 'ideal-resonance-limited')).toBe(true);
    expect(result.columns.insertionLoss50Dm[i]!).toBeCloseTo(20 * Math.log10(1 + (2 * IMPEDANCE_LIMIT_OHM) / 100), 2);
    expect(result.elements[0]!.views[0]!.magnitudeOhm[i]!).toBeCloseTo(IMPEDANCE_LIMIT_OHM, -3);
  });
});

describe('an ideal (k = 1) common-mode choke, with and without winding capacitance', () => {
  const choke = (windingCapacitance: number): PartInput => ({ kind: 'common-mode-choke', inductance: 2e-3, coupling: { kind: 'coupling-factor', couplingFactor: 1 }, windingCapacitance });
  it('no winding capacitance: finite everywhere, never NaN, and nothing flagged (zero leakage is an ordinary zero)', () => {
    const result = sweepDesign(
      buildDesign({
        elements: [element('both-lines-coupled', choke(0)), element('line-to-line', capacitor(1e-6, { esr: 0.01, esl: 10e-9 }))],
        receivers: { line1: { kind: 'vehicle-5uh' }, line2: { kind: 'vehicle-5uh' } },
      }),
    );
    expectAllFinite(result);
    expect(result.pointFlags.every((flag) => flag === 0)).toBe(true);
  });

  /*
   * Behind the choke, an ESR-less X capacitor (1 µF, 10 nH: SRF 1.59155 MHz, references.md §6
   * style arithmetic) shorts the lines at its SRF. The CM input impedance does not involve it:
   * closed form Z_in,CM = jω·L_CM + Z_arm/2 with L_CM = (L + M)/2 = 2 mH for k = 1 and
   * Z_arm = 50 Ω ∥ jω·5 µH (vehicle network, references.md §2).
   */
  it('an ideal X capacitor at its SRF behind it: the CM input impedance is still jω·L_CM + Z_arm/2 at every point (closed form)', () => {
    const srf = 1 / (TWO_PI * Math.sqrt(10e-9 * 1e-6));
    const result = sweepDesign(
      buildDesign({
        elements: [element('both-lines-coupled', choke(0)), element('line-to-line', capacitor(1e-6, { esl: 10e-9 }))],
        receivers: { line1: { kind: 'vehicle-5uh' }, line2: { kind: 'vehicle-5uh' } },
        frequencyPlan: { startHz: 150e3, stopHz: 30e6, pointsPerDecade: 20 },
      }),
      { extraFrequencyHz: [srf] },
    );
    expectAllFinite(result);
    result.frequencyHz.forEach((f, i) => {
      const omega = TWO_PI * f;
      // 50 ∥ jωL5 = 50·jωL5/(50 + jωL5)
      const x = omega * 5e-6;
      const d = 2500 + x * x;
      const armRe = (50 * x * x) / d;
      const armIm = (2500 * x) / d;
      const re = armRe / 2;
      const im = armIm / 2 + omega * 2e-3;
      const z = result.transfers.inputImpedanceCm;
      expect(Math.hypot(z.re[i]! - re, z.im[i]! - im) / Math.hypot(re, im), `${f} Hz: ${z.re[i]} + j${z.im[i]}, expected ${re} + j${im}`).toBeLessThan(1e-6);
    });
  });

  it('with winding capacitance, exactly at the CM self-resonance: finite, flagged, warned', () => {
    const cw = 20e-12;
    // Each winding's capacitance sits across that winding, so the CM view is L_CM = (L + M)/2
    // with 2·C_w: f = 1/(2π√((L + M)·C_w)) = 1/(2π√(2L·C_w)) for k = 1 (closed form).
    const srf = 1 / (TWO_PI * Math.sqrt(2 * 2e-3 * cw));
    const result = sweepDesign(buildDesign({ elements: [element('both-lines-coupled', choke(cw))], frequencyPlan: { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 20 } }), {
      extraFrequencyHz: [srf],
    });
    expectAllFinite(result);
    const i = pointAt(result, srf);
    expect(result.pointFlags[i]! & PointFlag.IdealResonanceLimited).toBe(PointFlag.IdealResonanceLimited);
    expect(result.warnings.some((w) => w.code === 'ideal-resonance-limited')).toBe(true);
  });
});

describe('"ideal-part" warnings name the parts that lack their main parasitic', () => {
  const result = sweepDesign(
    buildDesign({
      elements: [
        element('line-to-line', capacitor(1e-6), 'bareCap'),
        element('line-to-line', capacitor(1e-6, { esl: 10e-9 }), 'realCap'),
        element('series-line1', inductor(1e-3), 'bareL'),
        element('series-line2', inductor(1e-3, { windingCapacitance: 5e-12 }), 'realL'),
        element('both-lines-coupled', { kind: 'common-mode-choke', inductance: 5e-3, coupling: { kind: 'leakage-inductance', leakageInductance: 50e-6 } }, 'bareChoke'),
        element('both-lines-coupled', { kind: 'common-mode-choke', inductance: 5e-3, coupling: { kind: 'leakage-inductance', leakageInductance: 50e-6 }, windingCapacitance: 10e-12 }, 'realChoke'),
        element('line1-to-ground', resistor(1e3), 'resistor'),
      ],
      frequencyPlan: { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 10 },
    }),
  );
  it('capacitor without ESL, inductor and choke without winding capacitance — and no others', () => {
    const named = result.warnings.filter((w) => w.code === 'ideal-part').map((w) => w.elementId);
    expect(named.sort()).toEqual(['bareCap', 'bareChoke', 'bareL']);
  });
});

describe('dB of zero is −400 dB, not −Infinity (domain §4 pitfall 17, common practice)', () => {
  it('the helpers floor at DB_FLOOR = −400', () => {
    expect(DB_FLOOR).toBe(-400);
    expect(magnitudeToDb(0)).toBe(-400);
    expect(powerRatioToDb(0)).toBe(-400);
    expect(magnitudeToDb(1)).toBe(0);
    expect(powerRatioToDb(100)).toBeCloseTo(20, 12);
  });

  it('a symmetric filter between matched receivers: the mode-conversion columns are exactly −400 dB everywhere', () => {
    const result = sweepDesign(
      buildDesign({
        elements: [
          element('series-line1', inductor(100e-6, { dcr: 0.01, windingCapacitance: 3e-12 })),
          element('series-line2', inductor(100e-6, { dcr: 0.01, windingCapacitance: 3e-12 })),
          element('line1-to-ground', capacitor(4.7e-9, { esr: 0.05, esl: 5e-9 })),
          element('line2-to-ground', capacitor(4.7e-9, { esr: 0.05, esl: 5e-9 })),
        ],
        receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } },
        frequencyPlan: { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 20 },
      }),
    );
    expectAllFinite(result);
    result.columns.conversionCmToDm.forEach((v) => expect(v).toBe(-400));
    result.columns.conversionDmToCm.forEach((v) => expect(v).toBe(-400));
  });

  const shorted = sweepDesign(buildDesign({ elements: [element('line-to-line', resistor(0))], frequencyPlan: { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 5 } }));

  it('a 0 Ω resistor across the lines: DM transfer tiny but finite, flagged, no NaN', () => {
    expectAllFinite(shorted);
    shorted.pointFlags.forEach((flag) => expect(flag & PointFlag.IdealResonanceLimited).toBe(PointFlag.IdealResonanceLimited));
    shorted.columns.transferDm.forEach((v) => expect(v).toBeLessThan(-200));
  });

  // Closed forms as for the capacitor at its SRF above: CM sees no line-to-line part, and the
  // DM insertion loss of the limited short is 20·log(1 + 1e9·25) in 50/50.
  it('the same 0 Ω resistor: CM untouched (T_CM = 0.25, Z_in,CM = 25 Ω) and DM 50/50 insertion loss of the limiting admittance at every point', () => {
    shorted.frequencyHz.forEach((f, i) => {
      const t = shorted.transfers;
      expect(Math.hypot(t.transferCm.re[i]! - 0.25, t.transferCm.im[i]!), `${f} Hz: T_CM = ${t.transferCm.re[i]} + j${t.transferCm.im[i]}`).toBeLessThan(1e-6);
      expect(Math.hypot(t.inputImpedanceCm.re[i]! - 25, t.inputImpedanceCm.im[i]!), `${f} Hz: Z_in,CM = ${t.inputImpedanceCm.re[i]}`).toBeLessThan(1e-6);
      expect(shorted.columns.insertionLoss50Dm[i]!, `${f} Hz`).toBeCloseTo(20 * Math.log10(1 + ADMITTANCE_LIMIT_S * 25), 2);
    });
  });
});
