import { describe, expect, it } from 'vitest';
import { compileNetwork, evaluateNetworkOnce } from '../../src/engine/index.ts';
import type { NoiseEstimate } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import {
  capacitorImpedanceMagnitude,
  estimateEmfs,
  estimateIssues,
  estimateNoiseSource,
  predictFromEstimate,
} from '../../src/spectrum/noise-estimate.ts';
import { peakDbuV, receiverView, rmsReadingDbuV } from '../../src/spectrum/receiver-view.ts';
import { trapezoidHarmonic } from '../../src/spectrum/trapezoid-spectrum.ts';
import { buildDesign, capacitor, element, inductor } from '../support/design-builders.ts';
import { abs, add, cx, type Cx, div, mul, parallel } from '../support/ladder.ts';

/*
 * The noise estimate through the engine.
 * - Source model: docs/engine-math.md §2 and §4.1 (CM EMF [1, 1] behind Z_cm from the lines'
 *   midpoint to ground; DM EMF [1, −1] with Z_dm/2 in each line, so a line-to-line EMF e_ll is a
 *   DM EMF of e_ll/2).
 * - CM check case: domain.md §6 C15 (method from memory, arithmetic checked): 0–400 V, 50 %,
 *   100 kHz, C_p = 50 pF → V1 = 254.6 V pk, I_CM1 = 8.0 mA pk, 0.2 V pk = 103.0 dBµV rms reading
 *   at each 50 Ω receiver (the two in parallel, 25 Ω; references.md §2 CP rule, Paul 2nd ed.
 *   ch. 6 from memory). Spectrum: Paul 2nd ed. ch. 3 (from memory), references.md §5.
 * - DM check case: domain.md §6 C16 (method from memory, arithmetic checked): buck, I_out 3 A,
 *   D 0.5, 400 kHz, C_in 10 µF → V1 = 76.0 mV pk = 97.6 dBµV pk, 94.6 dBµV rms reading across
 *   the capacitor; domain.md §2 Step 1b: each arm of the 100 Ω loop reads about half.
 * - Closed forms below are written in line coordinates (nodal analysis of the T source and the
 *   receivers), independently of the engine's mode coordinates: textbook arithmetic.
 */

const TWO_PI = 2 * Math.PI;
const relative = (got: number, want: number): number => Math.abs(got / want - 1);
const capacitorZ = (c: number, f: number, esr = 0, esl = 0): Cx => cx(esr, TWO_PI * f * esl - 1 / (TWO_PI * f * c));
const noFilter = [{ id: 'none', elements: [] }];

/**
 * Receiver voltages V1, V2 of the T source (EMFs v_cm common, ±e_dm in the lines, Z_cm from the
 * midpoint M to ground, Z_dm/2 in each line) into per-line series impedances zs1, zs2 and
 * receivers zr1, zr2 to ground (no shunt parts). Node M: V_M = v_cm − Z_cm·(I1 + I2),
 * I_k = (V_M ± e_dm)/(Z_dm/2 + zs_k + zr_k).
 */
function tSource(vcm: number, edm: number, zcm: Cx, zdm: Cx, zs: [Cx, Cx], zr: [Cx, Cx]): [Cx, Cx] {
  const half = mul(zdm, cx(0.5));
  const b1 = add(add(half, zs[0]), zr[0]);
  const b2 = add(add(half, zs[1]), zr[1]);
  const y = add(div(cx(1), b1), div(cx(1), b2));
  // V_M·(1 + Z_cm·y) = v_cm − Z_cm·(e/b1 − e/b2)
  const drive = add(cx(vcm), mul(cx(-1), mul(zcm, add(div(cx(edm), b1), div(cx(-edm), b2)))));
  const vm = div(drive, add(cx(1), mul(zcm, y)));
  const i1 = div(add(vm, cx(edm)), b1);
  const i2 = div(add(vm, cx(-edm)), b2);
  return [mul(i1, zr[0]), mul(i2, zr[1])];
}

/** domain.md C15 switch node: 0–400 V, 50 %, 100 kHz; edges 20 ns (not stated in C15; references.md §5's value). */
const C15: NoiseEstimate = {
  commonMode: { switchNode: { amplitude: 400, frequencyHz: 100e3, duty: 0.5, riseTime: 20e-9 }, parasiticCapacitance: 50e-12 },
};
/** domain.md C16 buck input current: 3 A, D 0.5, 400 kHz; edges 1 ns (C16 assumes ideal rectangles). */
const C16: NoiseEstimate = {
  differentialMode: {
    current: { kind: 'pulsed', pulse: { amplitude: 3, frequencyHz: 400e3, duty: 0.5, riseTime: 1e-9 } },
    inputCapacitance: 10e-6,
    esr: 0,
    esl: 0,
  },
};

describe('common mode: domain.md §6 C15 (50 Ω receivers, no filter)', () => {
  const design = buildDesign({ stages: noFilter, differentialModeSource: { kind: 'resistor', resistance: 0.1 } });
  const prediction = predictFromEstimate(design, C15, { stopHz: 30e6 });

  it('V1 = 254.6 V pk, I_CM1 = 8.0 mA pk, 0.2 V pk = 103.0 dBµV rms reading per receiver', () => {
    expect(prediction.frequencyHz[0]).toBe(100e3);
    const v1 = prediction.commonModeEmfV[0]!;
    expect(Math.abs(v1 - 254.6)).toBeLessThanOrEqual(0.05);
    const icm = v1 * TWO_PI * 100e3 * 50e-12;
    expect(Math.abs(icm - 8.0e-3)).toBeLessThanOrEqual(0.05e-3);
    for (const line of [prediction.line1, prediction.line2]) {
      expect(Math.abs(line.fromCm.peakV[0]! - 0.2)).toBeLessThanOrEqual(0.0005);
      expect(Math.abs(line.fromCm.readingDbuV[0]! - 103.0)).toBeLessThanOrEqual(0.05);
      // 25 Ω × I_CM holds because |1/(jωC_p)| = 31.8 kΩ ≫ 25 Ω: within 1e-6 here.
      expect(relative(line.fromCm.peakV[0]!, 25 * icm)).toBeLessThan(1e-6);
    }
  });

  it('equals the closed form V_n·25/|Z_cp + Z_dm/4 + 25| at every harmonic to 30 MHz (1e-9)', () => {
    const f = prediction.frequencyHz;
    expect(f.length).toBe(300);
    for (let i = 0; i < f.length; i += 1) {
      const vn = trapezoidHarmonic(C15.commonMode!.switchNode, i + 1).amplitude;
      expect(prediction.commonModeEmfV[i]).toBe(vn);
      const [v1, v2] = tSource(vn, 0, capacitorZ(50e-12, f[i]!), cx(0.1), [cx(0), cx(0)], [cx(50), cx(50)]);
      if (vn === 0) {
        expect(prediction.line1.fromCm.peakV[i]).toBe(0);
        continue;
      }
      expect(relative(prediction.line1.fromCm.peakV[i]!, abs(v1))).toBeLessThan(1e-9);
      expect(relative(prediction.line2.fromCm.peakV[i]!, abs(v2))).toBeLessThan(1e-9);
      expect(relative(prediction.commonMode.peakV[i]!, abs(v1))).toBeLessThan(1e-9);
      expect(relative(prediction.bareCommonMode.peakV[i]!, abs(v1))).toBeLessThan(1e-9);
    }
  });

  it('the CM current is flat between the corners (domain.md §2 Step 1b): odd harmonics to 1.1 MHz read 0.2 V within 0.1 %', () => {
    for (let n = 1; n <= 11; n += 2) expect(relative(prediction.line1.fromCm.peakV[n - 1]!, 0.2)).toBeLessThan(1e-3);
  });

  it('no DM part: DM columns are zero (the floor), totals equal the CM part', () => {
    expect(prediction.differentialModeEmfV.every((v) => v === 0)).toBe(true);
    expect(prediction.line1.fromDm.readingDbuV[0]).toBe(-400);
    expect(Array.from(prediction.line1.total.peakV)).toEqual(Array.from(prediction.line1.fromCm.peakV));
    // The design's DM source impedance is kept; C_p becomes the CM source impedance.
    expect(prediction.noiseSource.differentialMode).toEqual(design.noiseSource.differentialMode);
    expect(prediction.noiseSource.commonMode.impedance).toEqual({ kind: 'capacitor', capacitance: 50e-12, esr: 0, esl: 0, safetyClass: 'none' });
  });

  it('CISPR 16 V-network receivers: V_n·(Z_arm/2)/(Z_cp + Z_dm/4 + Z_arm/2), Z_arm = 50 ∥ (50 µH + 5 Ω) (references.md §2)', () => {
    const mains = buildDesign({
      stages: noFilter,
      differentialModeSource: { kind: 'resistor', resistance: 0.1 },
      receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } },
    });
    const p = predictFromEstimate(mains, C15, { stopHz: 5e6 });
    for (let i = 0; i < p.frequencyHz.length; i += 2) {
      const f = p.frequencyHz[i]!;
      const arm = parallel(cx(50), cx(5, TWO_PI * f * 50e-6));
      const [v1] = tSource(p.commonModeEmfV[i]!, 0, capacitorZ(50e-12, f), cx(0.1), [cx(0), cx(0)], [arm, arm]);
      expect(relative(p.line1.fromCm.peakV[i]!, abs(v1))).toBeLessThan(1e-9);
    }
  });
});

describe('differential mode: domain.md §6 C16 (50 Ω receivers, no filter)', () => {
  const design = buildDesign({ stages: noFilter, commonModeSource: { kind: 'capacitor', capacitance: 100e-12 } });
  const prediction = predictFromEstimate(design, C16, { stopHz: 30e6 });
  const zc = 1 / (TWO_PI * 400e3 * 10e-6);

  it('across the capacitor V1 = I_1/(2πf C_in) = 76.0 mV pk = 97.6 dBµV pk, 94.6 dBµV rms reading', () => {
    // The engine's DM EMF is half the line-to-line EMF e_ll = I_1·|Z_Cin|.
    const ell = 2 * prediction.differentialModeEmfV[0]!;
    expect(Math.abs(ell - 76.0e-3)).toBeLessThanOrEqual(0.05e-3);
    expect(Math.abs(peakDbuV(ell) - 97.6)).toBeLessThanOrEqual(0.05);
    expect(Math.abs(rmsReadingDbuV(ell) - 94.6)).toBeLessThanOrEqual(0.05);
    // I_1 = (2·I_out/π)·sin(πD) (domain.md §2 Step 1b) to the 1 ns edge: 3e-7.
    expect(relative(ell, ((2 * 3) / Math.PI) * zc)).toBeLessThan(1e-6);
  });

  it('each receiver reads half: e_ll·50/|100 + Z_C| = 37.995 mV = 91.59 dBµV pk, 88.58 dBµV rms (6.02 dB below)', () => {
    const ell = 2 * prediction.differentialModeEmfV[0]!;
    const want = (ell * 50) / Math.hypot(100, zc);
    for (const line of [prediction.line1, prediction.line2]) {
      expect(relative(line.fromDm.peakV[0]!, want)).toBeLessThan(1e-9);
      expect(Math.abs(line.fromDm.peakV[0]! - 37.995e-3)).toBeLessThanOrEqual(0.0005e-3);
      expect(Math.abs(peakDbuV(line.fromDm.peakV[0]!) - 91.59)).toBeLessThanOrEqual(0.005);
      expect(Math.abs(line.fromDm.readingDbuV[0]! - 88.58)).toBeLessThanOrEqual(0.005);
      expect(Math.abs(peakDbuV(ell) - peakDbuV(line.fromDm.peakV[0]!) - 20 * Math.log10(2))).toBeLessThan(1e-4);
    }
    expect(relative(prediction.differentialMode.peakV[0]!, want)).toBeLessThan(1e-9);
    expect(relative(prediction.bareDifferentialMode.peakV[0]!, want)).toBeLessThan(1e-9);
    expect(prediction.line1.fromCm.peakV[0]).toBe(0);
  });

  it('every harmonic equals the closed form in line coordinates (1e-9)', () => {
    const f = prediction.frequencyHz;
    for (let i = 0; i < f.length; i += 1) {
      const edm = prediction.differentialModeEmfV[i]!;
      if (edm === 0) continue;
      const [v1, v2] = tSource(0, edm, capacitorZ(100e-12, f[i]!), capacitorZ(10e-6, f[i]!), [cx(0), cx(0)], [cx(50), cx(50)]);
      expect(relative(prediction.line1.fromDm.peakV[i]!, abs(v1))).toBeLessThan(1e-9);
      expect(relative(prediction.line2.fromDm.peakV[i]!, abs(v2))).toBeLessThan(1e-9);
    }
  });

  it('the noise source is the input capacitor line to line', () => {
    expect(estimateNoiseSource(design, C16).differentialMode.impedance).toEqual({ kind: 'capacitor', capacitance: 10e-6, esr: 0, esl: 0, safetyClass: 'none' });
  });
});

describe('through a filter (closed forms in line coordinates)', () => {
  it('DM: an X capacitor (1 µF) across the receivers: V_ll = e_ll·Zp/(Z_Cin + Zp), Zp = 100 Ω ∥ Z_X, half per line', () => {
    const design = buildDesign({ elements: [element('line-to-line', capacitor(1e-6))], commonModeSource: { kind: 'capacitor', capacitance: 100e-12 } });
    const p = predictFromEstimate(design, C16, { stopHz: 10e6 });
    for (let i = 0; i < p.frequencyHz.length; i += 1) {
      const f = p.frequencyHz[i]!;
      const ell = 2 * p.differentialModeEmfV[i]!;
      if (ell === 0) continue;
      const zp = parallel(cx(100), capacitorZ(1e-6, f));
      const vll = abs(div(mul(cx(ell), zp), add(capacitorZ(10e-6, f), zp)));
      expect(relative(p.line1.fromDm.peakV[i]!, vll / 2)).toBeLessThan(1e-9);
      expect(relative(p.bareDifferentialMode.peakV[i]!, (ell * 50) / abs(add(capacitorZ(10e-6, f), cx(100))))).toBeLessThan(1e-9);
    }
  });

  it('CM: Y capacitors (4.7 nF each line to ground): V_n·Zp/(Z_cp + Z_dm/4 + Zp), Zp = 25 Ω ∥ 1/(jω·2C_Y)', () => {
    const design = buildDesign({
      elements: [element('line1-to-ground', capacitor(4.7e-9)), element('line2-to-ground', capacitor(4.7e-9))],
      differentialModeSource: { kind: 'resistor', resistance: 0.1 },
    });
    const p = predictFromEstimate(design, C15, { stopHz: 10e6 });
    for (let i = 0; i < p.frequencyHz.length; i += 1) {
      const f = p.frequencyHz[i]!;
      const vn = p.commonModeEmfV[i]!;
      if (vn === 0) continue;
      const zp = parallel(cx(25), capacitorZ(2 * 4.7e-9, f));
      const v = abs(div(mul(cx(vn), zp), add(add(capacitorZ(50e-12, f), cx(0.025)), zp)));
      expect(relative(p.commonMode.peakV[i]!, v)).toBeLessThan(1e-9);
      expect(relative(p.line2.fromCm.peakV[i]!, v)).toBeLessThan(1e-9);
    }
  });

  it('an inductor in line 1 only converts modes: each line gets CM and DM parts, total = |CM part| + |DM part| (worst case)', () => {
    const design = buildDesign({ elements: [element('series-line1', inductor(10e-6))] });
    const both: NoiseEstimate = { ...C15, ...C16 };
    // Same switching frequency in both modes so the axes coincide.
    const estimate: NoiseEstimate = {
      commonMode: { ...both.commonMode!, switchNode: { ...both.commonMode!.switchNode, frequencyHz: 400e3 } },
      differentialMode: both.differentialMode!,
    };
    const p = predictFromEstimate(design, estimate, { stopHz: 4e6 });
    expect(p.frequencyHz.length).toBe(10);
    let differs = false;
    for (let i = 0; i < p.frequencyHz.length; i += 1) {
      const f = p.frequencyHz[i]!;
      const zs: [Cx, Cx] = [cx(0, TWO_PI * f * 10e-6), cx(0)];
      const zcp = capacitorZ(50e-12, f);
      const zcin = capacitorZ(10e-6, f);
      const [c1, c2] = tSource(p.commonModeEmfV[i]!, 0, zcp, zcin, zs, [cx(50), cx(50)]);
      const [d1, d2] = tSource(0, p.differentialModeEmfV[i]!, zcp, zcin, zs, [cx(50), cx(50)]);
      const check = (got: number, want: number): void => {
        if (want === 0) expect(got).toBe(0);
        else expect(relative(got, want)).toBeLessThan(1e-8);
      };
      check(p.line1.fromCm.peakV[i]!, abs(c1));
      check(p.line2.fromCm.peakV[i]!, abs(c2));
      check(p.line1.fromDm.peakV[i]!, abs(d1));
      check(p.line2.fromDm.peakV[i]!, abs(d2));
      expect(p.line1.total.peakV[i]).toBe(p.line1.fromCm.peakV[i]! + p.line1.fromDm.peakV[i]!);
      expect(p.line2.total.peakV[i]).toBe(p.line2.fromCm.peakV[i]! + p.line2.fromDm.peakV[i]!);
      if (p.commonModeEmfV[i]! > 0 && relative(p.line1.fromCm.peakV[i]!, p.line2.fromCm.peakV[i]!) > 1e-6) differs = true;
    }
    expect(differs).toBe(true);
    // The mode columns are the engine's T_CM·V_n and T_DM·e (conversions show in the line columns).
    const response = evaluateNetworkOnce(compileNetwork({ ...design, noiseSource: p.noiseSource }), p.frequencyHz);
    expect(relative(p.commonMode.peakV[0]!, Math.hypot(response.cmFromCm.re[0]!, response.cmFromCm.im[0]!) * p.commonModeEmfV[0]!)).toBeLessThan(1e-15);
    expect(relative(p.differentialMode.peakV[0]!, Math.hypot(response.dmFromDm.re[0]!, response.dmFromDm.im[0]!) * p.differentialModeEmfV[0]!)).toBeLessThan(1e-15);
  });

  it('every reading is the receiver view of its peak column', () => {
    const design = buildDesign({ elements: [element('line-to-line', capacitor(1e-6))] });
    const p = predictFromEstimate(design, { ...C15, ...C16 }, { stopHz: 2e6 });
    for (const column of [p.line1.total, p.line2.fromCm, p.commonMode, p.bareDifferentialMode]) {
      expect(Array.from(column.readingDbuV)).toEqual(Array.from(receiverView(p.frequencyHz, column.peakV).readingDbuV));
    }
    expect(p.flags.length).toBe(p.frequencyHz.length);
  });
});

describe('sources and axes', () => {
  it('CM at 100 kHz and DM at 150 kHz to 1 MHz: 13 frequencies, each EMF zero where its mode has no line', () => {
    const estimate: NoiseEstimate = {
      ...C15,
      differentialMode: { ...C16.differentialMode!, current: { kind: 'pulsed', pulse: { amplitude: 3, frequencyHz: 150e3, duty: 0.3, riseTime: 10e-9 } } },
    };
    const emfs = estimateEmfs(estimate, { stopHz: 1e6 });
    expect(Array.from(emfs.frequencyHz)).toEqual([100e3, 150e3, 200e3, 300e3, 400e3, 450e3, 500e3, 600e3, 700e3, 750e3, 800e3, 900e3, 1e6]);
    expect(emfs.differentialModeEmfV[0]).toBe(0);
    expect(emfs.commonModeEmfV[1]).toBe(0);
    expect(emfs.commonModeEmfV[3]! > 0 && emfs.differentialModeEmfV[3]! > 0).toBe(true);
  });

  it('triangular ripple into C_in with ESR and ESL: e = c_n·|ESR + j(ωESL − 1/(ωC))|/2', () => {
    const estimate: NoiseEstimate = {
      differentialMode: {
        current: { kind: 'triangular-ripple', peakToPeak: 2, frequencyHz: 65e3, riseFraction: 0.3 },
        inputCapacitance: 1e-6,
        esr: 0.05,
        esl: 20e-9,
      },
    };
    const emfs = estimateEmfs(estimate, { startHz: 150e3, stopHz: 30e6 });
    expect(emfs.frequencyHz[0]).toBe(195e3);
    for (let i = 0; i < emfs.frequencyHz.length; i += 1) {
      const f = emfs.frequencyHz[i]!;
      const n = Math.round(f / 65e3);
      const cn = (2 * Math.abs(Math.sin(Math.PI * n * 0.3))) / (Math.PI ** 2 * n * n * 0.21);
      const z = Math.hypot(0.05, TWO_PI * f * 20e-9 - 1 / (TWO_PI * f * 1e-6));
      // Near the nulls (n·0.3 whole) Math.sin above carries about n·1e-16 of rounding; the code's are exact.
      expect(Math.abs(emfs.differentialModeEmfV[i]! - (cn * z) / 2)).toBeLessThanOrEqual(1e-12 * ((cn * z) / 2) + (1e-14 * z) / n);
      expect(capacitorImpedanceMagnitude(1e-6, 0.05, 20e-9, f)).toBe(z);
    }
  });

  it('an estimate read from a design file (engineering text) predicts the same as the numbers', () => {
    const design = requireDesign({
      format: 'chokepoint-design',
      version: 2,
      name: 'estimate from text',
      noiseSource: {
        commonMode: { impedance: { kind: 'resistor', resistance: 50 } },
        differentialMode: { impedance: { kind: 'resistor', resistance: 0.1 } },
      },
      receivers: { line1: { kind: 'resistive' }, line2: { kind: 'resistive' } },
      stages: [],
      emissions: {
        estimate: {
          commonMode: {
            switchNode: { amplitude: '400 V', frequencyHz: '100 kHz', duty: 0.5, riseTime: '20 ns' },
            parasiticCapacitance: '50 pF',
          },
        },
      },
    });
    const fromFile = predictFromEstimate(design, design.emissions!.estimate!, { stopHz: 1e6 });
    const fromNumbers = predictFromEstimate(design, C15, { stopHz: 1e6 });
    expect(fromFile.line1.total.readingDbuV.length).toBe(10);
    for (let i = 0; i < 10; i += 1) {
      expect(relative(fromFile.line1.total.peakV[i]! + 1e-30, fromNumbers.line1.total.peakV[i]! + 1e-30)).toBeLessThan(1e-12);
    }
    expect(Math.abs(fromFile.line1.total.readingDbuV[0]! - 103.0)).toBeLessThanOrEqual(0.05);
  });

  it('an empty estimate gives empty columns', () => {
    const p = predictFromEstimate(buildDesign({}), {});
    expect(p.frequencyHz.length).toBe(0);
    expect(p.line1.total.readingDbuV.length).toBe(0);
  });

  it('edges that do not fit are reported with their path and refused', () => {
    const bad: NoiseEstimate = {
      commonMode: { switchNode: { amplitude: 400, frequencyHz: 100e3, duty: 0.05, riseTime: 2e-6 }, parasiticCapacitance: 50e-12 },
    };
    expect(estimateIssues(bad)).toEqual([{ path: ['commonMode', 'switchNode'], message: expect.stringMatching(/do not fit/u) }]);
    expect(() => predictFromEstimate(buildDesign({}), bad)).toThrow(/emissions\.estimate\.commonMode\.switchNode/u);
    expect(estimateIssues(C16)).toEqual([]);
  });
});
