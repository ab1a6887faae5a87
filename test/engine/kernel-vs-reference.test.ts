import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { complexColumns } from '../../src/engine/complex-columns.ts';
import { evaluateNetworkOnce } from '../../src/engine/kernel/evaluate-network.ts';
import type { NetworkResponse } from '../../src/engine/kernel/network-response.ts';
import { compileNetwork } from '../../src/engine/network.ts';
import { chokeEigenImpedances, twoTerminalEvaluator } from '../../src/engine/parts/part-impedance.ts';
import { receiverEvaluator } from '../../src/engine/parts/receiver-impedance.ts';
import {
  referenceChokeMatrix,
  referenceEvaluate,
  referencePartImpedance,
  referenceReceiverImpedance,
} from '../../src/engine/reference/reference-evaluator.ts';
import type { Design } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import { propertySettings } from '../support/property-settings.ts';
import { randomDesign, randomFrequencies } from '../support/random-designs.ts';

/**
 * Agreement required between the two evaluators. Both are correct to rounding, but rounding is
 * amplified by the network's own conditioning: a random cascade of up to twelve parts, some 10⁴
 * apart in impedance and several in one line only (which mode coordinates must carry as a
 * difference, docs/engine-math.md §6), can turn 1e-16 into 1e-9 and, rarely, into 1e-5. Checked
 * against 60-digit nodal solutions of the worst cases: each evaluator lands near the exact answer
 * on its own side; the worst seen over twenty seeds was 1.4e-3 (0.012 dB), on a random filter
 * with 1 Ω parts in one line beside 20 mH chokes. So: 1e-9 at 99 % of all values (a slip in the
 * algebra, or at the 64-point block boundaries, breaks far more than 1 %), and nothing beyond
 * 1e-2 anywhere.
 */
const RELATIVE = 1e-9;
const RELATIVE_CEILING = 1e-2;
const SHARE_WITHIN_RELATIVE = 0.99;

type ResponseKey = keyof NetworkResponse & string;

/**
 * Quantities are compared relative to the scale of the response they belong to at each point:
 * the receiver voltages (two lines or two modes, two excitations) come out of one 2×2 solve, so
 * a small one (a nearly cancelled mode conversion) carries the rounding of the large ones; the CM
 * and DM input impedances come from one 2×2 matrix.
 */
const SCALE_GROUPS: ResponseKey[][] = [
  ['line1FromCm', 'line2FromCm', 'line1FromDm', 'line2FromDm', 'cmFromCm', 'dmFromCm', 'cmFromDm', 'dmFromDm'],
  ['bareCmFromCm', 'bareDmFromDm'],
  ['inputImpedanceCm', 'inputImpedanceDm'],
];

function complexAt(response: NetworkResponse, key: ResponseKey, i: number): { re: number; im: number } {
  const column = response[key] as { re: Float64Array; im: Float64Array };
  return { re: column.re[i]!, im: column.im[i]! };
}

interface Agreement {
  compared: number;
  within: number;
  worst: { error: number; where: string };
}

function newAgreement(): Agreement {
  return { compared: 0, within: 0, worst: { error: 0, where: '' } };
}

function tally(agreement: Agreement, error: number, where: () => string): void {
  agreement.compared += 1;
  if (error <= RELATIVE) agreement.within += 1;
  if (!(error <= agreement.worst.error)) agreement.worst = { error, where: where() };
}

function compare(
  kernel: NetworkResponse,
  reference: NetworkResponse,
  frequencies: readonly number[],
  use: readonly boolean[],
  agreement: Agreement,
): void {
  for (let i = 0; i < frequencies.length; i += 1) {
    if (!use[i]) continue;
    for (const group of SCALE_GROUPS) {
      const scale = Math.max(...group.map((key) => Math.hypot(complexAt(reference, key, i).re, complexAt(reference, key, i).im)));
      for (const key of group) {
        const a = complexAt(kernel, key, i);
        const b = complexAt(reference, key, i);
        const error = Math.hypot(a.re - b.re, a.im - b.im) / scale;
        tally(agreement, error, () => `${key} at ${frequencies[i]} Hz: kernel ${a.re}+j${a.im}, reference ${b.re}+j${b.im}`);
      }
    }
    for (const [name, k, r] of [
      ['resistiveCmLoss', kernel.resistiveCmLoss, reference.resistiveCmLoss],
      ['resistiveDmLoss', kernel.resistiveDmLoss, reference.resistiveDmLoss],
    ] as const) {
      for (let s = 0; s < k.length; s += 1) {
        // Power ratios: compare their square roots, the voltage ratios.
        const error = Math.abs(Math.sqrt(k[s]![i]! / r[s]![i]!) - 1);
        tally(agreement, error, () => `${name}[${s}] at ${frequencies[i]} Hz: kernel ${k[s]![i]}, reference ${r[s]![i]}`);
      }
    }
  }
}

function expectAgreement(agreement: Agreement): void {
  if (process.env["CHOKEPOINT_SHOW_AGREEMENT"]) process.stdout.write(`agreement ${agreement.within}/${agreement.compared} worst ${agreement.worst.error}\n`);
  expect(agreement.compared).toBeGreaterThan(0);
  expect(agreement.worst.error, agreement.worst.where).toBeLessThanOrEqual(RELATIVE_CEILING);
  expect(agreement.within / agreement.compared, `worst: ${agreement.worst.where}`).toBeGreaterThanOrEqual(SHARE_WITHIN_RELATIVE);
}

/**
 * How differently the two evaluators compute the parts themselves at f (relative). Close to a
 * lossless-ish resonance (a winding capacitance against a large inductance, Q of 10⁴) a part's
 * impedance is 1 − ω²LC, a cancellation, and two correct formulas differ in the last digits they
 * keep; the network then passes that difference on. Such points measure the problem's
 * conditioning, not the cascade code, and are left out of the comparison (but counted).
 */
function partDisagreement(design: Design, f: number): number {
  const grid = Float64Array.of(f);
  const flags = new Uint8Array(1);
  const out = complexColumns(1);
  const odd = complexColumns(1);
  let worst = 0;
  const note = (re: number, im: number, ref: { re: number; im: number }): void => {
    worst = Math.max(worst, Math.hypot(re - ref.re, im - ref.im) / Math.hypot(ref.re, ref.im));
  };
  const parts = [design.noiseSource.commonMode.impedance, design.noiseSource.differentialMode.impedance];
  for (const receiver of [design.receivers.line1, design.receivers.line2]) {
    receiverEvaluator(receiver).evaluate(grid, out, flags);
    note(out.re[0]!, out.im[0]!, referenceReceiverImpedance(receiver, f));
  }
  for (const stage of design.stages) {
    for (const element of stage.elements) {
      const part = element.part;
      if (part.kind === 'common-mode-choke') {
        chokeEigenImpedances(part, grid, out, odd, flags);
        const z = referenceChokeMatrix(part, f);
        note(out.re[0]!, out.im[0]!, z[0]![0]!.add(z[0]![1]!));
        note(odd.re[0]!, odd.im[0]!, z[0]![0]!.sub(z[0]![1]!));
      } else parts.push(part);
    }
  }
  for (const part of parts) {
    twoTerminalEvaluator(part).evaluate(grid, out, flags);
    note(out.re[0]!, out.im[0]!, referencePartImpedance(part, f));
  }
  return worst;
}

describe('the Float64Array kernel agrees with the complex.js reference evaluator', () => {
  it('on random lossy designs, every output, to 1e-9 relative (seeded fast-check)', () => {
    const agreement = newAgreement();
    let leftOut = 0;
    fc.assert(
      fc.property(randomDesign, randomFrequencies(12), (input, frequencies) => {
        const design = requireDesign(input);
        const use = frequencies.map((f) => partDisagreement(design, f) <= 1e-13);
        leftOut += use.filter((u) => !u).length;
        const kernel = evaluateNetworkOnce(compileNetwork(design), Float64Array.from(frequencies));
        const reference = referenceEvaluate(design, frequencies);
        compare(kernel, reference, frequencies, use, agreement);
      }),
      propertySettings(300),
    );
    expectAgreement(agreement);
    // Points left out for ill-conditioned parts must stay rare, or this compares nothing.
    expect(leftOut).toBeLessThan(0.05 * 300 * 12);
  });

  it('part by part, the two sets of part formulas agree to rounding away from resonance', () => {
    fc.assert(
      fc.property(randomDesign, randomFrequencies(6), (input, frequencies) => {
        const design = requireDesign(input);
        const disagreements = frequencies.map((f) => partDisagreement(design, f)).sort((a, b) => a - b);
        expect(disagreements[2]!).toBeLessThan(1e-12);
      }),
      propertySettings(200),
    );
  });

  it('on grids longer than one cache block (block boundaries)', () => {
    const agreement = newAgreement();
    fc.assert(
      fc.property(randomDesign, randomFrequencies(150), (input, frequencies) => {
        const design = requireDesign(input);
        const use = frequencies.map((f) => partDisagreement(design, f) <= 1e-13);
        const kernel = evaluateNetworkOnce(compileNetwork(design), Float64Array.from(frequencies));
        const reference = referenceEvaluate(design, frequencies);
        compare(kernel, reference, frequencies, use, agreement);
      }),
      propertySettings(8),
    );
    expectAgreement(agreement);
  });
});
