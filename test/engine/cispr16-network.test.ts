import { describe, expect, it } from 'vitest';
import { complexColumns } from '../../src/engine/complex-columns.ts';
import { receiverEvaluator } from '../../src/engine/parts/receiver-impedance.ts';
import type { Receiver } from '../../src/model/design.ts';
import { buildDesign } from '../support/design-builders.ts';
import { abs, add, at, cx, type Cx, div, mul, parallel, phaseDeg, respond, sub } from '../support/ladder.ts';

/*
 * Receiving networks (LISN / artificial network) against references.md §2.
 * Circuit: Z(f) = R ∥ (Rs + jωL). The 50 Ω ∥ (50 µH + 5 Ω) V-network is CISPR 16-1-2's AMN
 * (circuit well known, from memory, references.md tag M); the table values are computed from the
 * circuit (C). The 50 Ω ∥ 5 µH network is the ideal CISPR 25 artificial network (V2: open-hardware
 * LISN documentation).
 */

function receiverImpedance(receiver: Receiver, f: number): Cx {
  const out = complexColumns(1);
  receiverEvaluator(receiver).evaluate(Float64Array.of(f), out, new Uint8Array(1));
  return cx(out.re[0]!, out.im[0]!);
}

/** Closed form R ∥ (Rs + jωL). */
const arm = (r: number, l: number, rs: number, f: number): Cx => parallel(cx(r), cx(rs, 2 * Math.PI * f * l));

const MAINS: Receiver = { kind: 'cispr16-mains-50uh' };
const VEHICLE: Receiver = { kind: 'vehicle-5uh' };

/** Printed to 4–6 significant figures: 1e-4 relative on |Z|, 0.01° on phase (references.md suggests 1e-4). */
const RELATIVE = 1e-4;
const DEGREES = 0.01;
const PRINTED_HALF_UNIT = 5e-5 + 1e-9;

describe('CISPR 16-1-2 V-network 50 Ω ∥ (50 µH + 5 Ω) (circuit from memory; values references.md §2, C)', () => {
  const rows: [number, number, number, number, number][] = [
    // f, |Z|, phase°, Re, Im
    [9e3, 5.215, 26.545, 4.6653, 2.3306],
    [50e3, 14.4098, 56.404, 7.9734, 12.0028],
    [100e3, 25.1115, 51.222, 15.7275, 19.5764],
    [150e3, 32.7146, 43.353, 23.7879, 22.4585],
    [200e3, 37.7412, 36.647, 30.2806, 22.5273],
    [500e3, 47.2147, 17.474, 45.0359, 14.1774],
    [1e6, 49.2572, 9.018, 48.6483, 7.7211],
    [2e6, 49.8111, 4.547, 49.6544, 3.9486],
    [5e6, 49.9696, 1.823, 49.9443, 1.5896],
    [10e6, 49.9924, 0.912, 49.9861, 0.7955],
    [30e6, 49.9992, 0.304, 49.9985, 0.2652],
  ];
  for (const [f, magnitude, phase, re, im] of rows) {
    it(`${f / 1e3} kHz: ${magnitude} Ω ∠${phase}° (${re} + j${im} Ω)`, () => {
      const z = receiverImpedance(MAINS, f);
      expect(Math.abs(abs(z) / magnitude - 1)).toBeLessThanOrEqual(RELATIVE);
      expect(Math.abs(phaseDeg(z) - phase)).toBeLessThanOrEqual(DEGREES);
      // Re and Im are printed to 4 decimals: half a unit of the last digit.
      expect(Math.abs(z.re - re)).toBeLessThanOrEqual(PRINTED_HALF_UNIT);
      expect(Math.abs(z.im - im)).toBeLessThanOrEqual(PRINTED_HALF_UNIT);
      // And the closed form at full precision.
      const exact = arm(50, 50e-6, 5, f);
      expect(abs(sub(z, exact)) / abs(exact)).toBeLessThan(1e-13);
    });
  }

  it('corner ωL = R at 159.155 kHz (references.md §2, C): the inductive branch reactance equals 50 Ω there', () => {
    const corner = 50 / (2 * Math.PI * 50e-6);
    expect(Math.abs(corner / 159.155e3 - 1)).toBeLessThan(5e-6);
  });

  it('low end (domain §2 step 0, arithmetic checked): ≈ 5 Ω at 9 kHz and ≈ 33 Ω at 150 kHz, far from 50 Ω', () => {
    expect(abs(receiverImpedance(MAINS, 9e3))).toBeCloseTo(5.21, 2);
    expect(abs(receiverImpedance(MAINS, 150e3))).toBeCloseTo(32.71, 2);
  });
});

describe('vehicle network 50 Ω ∥ 5 µH (CISPR 25 ideal AN, references.md §2: circuit V2, values C)', () => {
  const rows: [number, number, number][] = [
    [150e3, 4.6916, 84.616],
    [500e3, 14.9858, 72.559],
    [1e6, 26.6009, 57.858],
    [50 / (2 * Math.PI * 5e-6), 50 / Math.SQRT2, 45],
    [10e6, 49.3785, 9.043],
    [100e6, 49.9937, 0.912],
  ];
  for (const [f, magnitude, phase] of rows) {
    it(`${(f / 1e6).toPrecision(6)} MHz: ${magnitude.toPrecision(6)} Ω ∠${phase}°`, () => {
      const z = receiverImpedance(VEHICLE, f);
      expect(Math.abs(abs(z) / magnitude - 1)).toBeLessThanOrEqual(RELATIVE);
      expect(Math.abs(phaseDeg(z) - phase)).toBeLessThanOrEqual(DEGREES);
      expect(abs(sub(z, arm(50, 5e-6, 0, f))) / abs(z)).toBeLessThan(1e-13);
    });
  }
  it('150 kHz real and imaginary parts 0.4402 / 4.6709 Ω; at the 1.59155 MHz corner 25 + j25 Ω', () => {
    const z = receiverImpedance(VEHICLE, 150e3);
    expect(Math.abs(z.re - 0.4402)).toBeLessThanOrEqual(PRINTED_HALF_UNIT);
    expect(Math.abs(z.im - 4.6709)).toBeLessThanOrEqual(PRINTED_HALF_UNIT);
    const corner = receiverImpedance(VEHICLE, 1.59155e6);
    expect(corner.re).toBeCloseTo(25, 3);
    expect(corner.im).toBeCloseTo(25, 3);
  });
});

describe('mode impedances of a two-line LISN with no filter: CM sees 25 Ω, DM 100 Ω at 30 MHz (textbook rule, e.g. C. R. Paul, Introduction to EMC, 2nd ed., Ch. 6 — chapter from memory; rule common practice)', () => {
  const f = 30e6;
  const zArm = arm(50, 50e-6, 5, f);
  const zcm = cx(1e4);
  const zdm = cx(100);
  const design = buildDesign({
    receivers: { line1: MAINS, line2: MAINS },
    commonModeSource: { kind: 'resistor', resistance: zcm.re },
    differentialModeSource: { kind: 'resistor', resistance: zdm.re },
  });
  const response = respond(design, [f]);

  it('input impedance with no filter: lines joined = Z_arm/2 ≈ 25 Ω, line to line = 2·Z_arm ≈ 100 Ω', () => {
    const cm = at(response.inputImpedanceCm, 0);
    const dm = at(response.inputImpedanceDm, 0);
    expect(Math.abs(abs(cm) / 25 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(abs(dm) / 100 - 1)).toBeLessThan(1e-4);
    // Closed form, exactly.
    expect(abs(sub(cm, mul(zArm, cx(0.5)))) / abs(cm)).toBeLessThan(1e-13);
    expect(abs(sub(dm, mul(zArm, cx(2)))) / abs(dm)).toBeLessThan(1e-13);
  });

  it('bare transfers follow the source T network: T_CM = (Z/2)/(Z/2 + Z_cm + Z_dm/4), T_DM = Z/(Z + Z_dm/2) (closed form)', () => {
    const half = mul(zArm, cx(0.5));
    const expectedCm = div(half, add(add(half, zcm), mul(zdm, cx(0.25))));
    const expectedDm = div(zArm, add(zArm, mul(zdm, cx(0.5))));
    expect(abs(sub(at(response.bareCmFromCm, 0), expectedCm)) / abs(expectedCm)).toBeLessThan(1e-12);
    expect(abs(sub(at(response.bareDmFromDm, 0), expectedDm)) / abs(expectedDm)).toBeLessThan(1e-12);
    // With no filter the filtered transfers equal the bare ones.
    expect(abs(sub(at(response.cmFromCm, 0), expectedCm)) / abs(expectedCm)).toBeLessThan(1e-12);
    expect(abs(sub(at(response.dmFromDm, 0), expectedDm)) / abs(expectedDm)).toBeLessThan(1e-12);
  });

  it('1 µA of total CM current gives 25 µV = 27.9588 dBµV at each LISN port (references.md §2, C)', () => {
    // Source side: V_line = 1 − I_line·(Z_dm/2 + 2·Z_cm) with both lines carrying I_line.
    const vLine = at(response.line1FromCm, 0);
    const iLine = div(sub(cx(1), vLine), add(mul(zdm, cx(0.5)), mul(zcm, cx(2))));
    const iTotal = mul(iLine, cx(2));
    const volts = abs(div(vLine, iTotal)) * 1e-6;
    const dbMicrovolt = 20 * Math.log10(volts / 1e-6);
    expect(Math.abs(dbMicrovolt - 27.9588)).toBeLessThan(0.001);
    expect(abs(sub(at(response.line2FromCm, 0), vLine))).toBeLessThan(1e-15);
  });
});
