import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compileNetwork, evaluateNetworkOnce, sweepDesign, type ResistiveSystem } from '../../src/engine/index.ts';
import type { DesignInput } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import { abs, add, at, cx } from '../support/ladder.ts';
import { propertySettings } from '../support/property-settings.ts';
import {
  logUniform,
  lossyChoke,
  lossyTwoTerminal,
  randomDesign,
  randomFrequencies,
  randomReceiver,
  withIds,
} from '../support/random-designs.ts';
import { compareResponses, flatten } from '../support/response-compare.ts';

/*
 * Physical invariants every correct network solver obeys, on seeded random designs. The sources
 * are textbook circuit theory (passivity, Tellegen/power balance, reciprocity of RLC networks,
 * symmetry), not any tabulated number.
 */

type ElementInput = DesignInput['stages'][number]['elements'][number];
type ElementNoId = Omit<ElementInput, 'id'>;
type PartInput = ElementInput['part'];
type TwoTerminalInput = Exclude<PartInput, { kind: 'common-mode-choke' }>;

const SYSTEMS: readonly ResistiveSystem[] = [
  { id: '50-50', sourceOhm: 50, loadOhm: 50 },
  { id: '0.1-100', sourceOhm: 0.1, loadOhm: 100 },
  { id: '100-0.1', sourceOhm: 100, loadOhm: 0.1 },
  { id: '3-700', sourceOhm: 3, loadOhm: 700 },
];

function designInput(stages: ElementNoId[][], line1: DesignInput['receivers']['line1'], line2: DesignInput['receivers']['line2'], cm: TwoTerminalInput, dm: TwoTerminalInput): DesignInput {
  return {
    format: 'chokepoint-design',
    version: 2,
    name: 'property design',
    noiseSource: { commonMode: { impedance: cm }, differentialMode: { impedance: dm } },
    receivers: { line1, line2 },
    stages: withIds(stages),
  };
}

/** The same two-terminal part placed symmetrically: a series pair, a to-ground pair, or line to line; or a choke. */
function symmetricSection(part: fc.Arbitrary<TwoTerminalInput>, choke: fc.Arbitrary<PartInput>): fc.Arbitrary<ElementNoId[]> {
  const pair = (a: ElementInput['placement'], b: ElementInput['placement']) =>
    fc.tuple(part, fc.boolean()).map(([p, swap]): ElementNoId[] => (swap ? [{ placement: b, part: p }, { placement: a, part: p }] : [{ placement: a, part: p }, { placement: b, part: p }]));
  return fc.oneof(
    pair('series-line1', 'series-line2'),
    pair('line1-to-ground', 'line2-to-ground'),
    part.map((p): ElementNoId[] => [{ placement: 'line-to-line', part: p }]),
    choke.map((p): ElementNoId[] => [{ placement: 'both-lines-coupled', part: p }]),
  );
}

const stagesOf = (section: fc.Arbitrary<ElementNoId[]>): fc.Arbitrary<ElementNoId[][]> =>
  fc.array(fc.array(section, { minLength: 1, maxLength: 3 }), { minLength: 1, maxLength: 3 }).map((stages) => stages.map((sections) => sections.flat()));

describe('(a) a lossless symmetric ladder conserves power (textbook: lossless two-port, P_load = P_available·(1 − |Γ|²))', () => {
  // Ideal L and C only, no parasitics; the choke is lossless with 0.9 ≤ k ≤ 1.
  const idealPart = fc.oneof(
    logUniform(1e-6, 1e-3).map((inductance): TwoTerminalInput => ({ kind: 'inductor', inductance })),
    logUniform(1e-9, 1e-5).map((capacitance): TwoTerminalInput => ({ kind: 'capacitor', capacitance })),
  );
  const idealChoke = fc
    .record({ inductance: logUniform(1e-4, 1e-2), couplingFactor: fc.double({ min: 0.9, max: 1, noNaN: true }) })
    .map(({ inductance, couplingFactor }): PartInput => ({ kind: 'common-mode-choke', inductance, coupling: { kind: 'coupling-factor', couplingFactor } }));

  it('with DM excitation: R_dm·(|V1|² + |V2|²)/R_L = 4·R_dm·Re Z_in/|Z_in + R_dm|² (seeded fast-check)', () => {
    let substantial = 0;
    let total = 0;
    fc.assert(
      fc.property(
        stagesOf(symmetricSection(idealPart, idealChoke)),
        logUniform(1, 200),
        logUniform(1, 200),
        logUniform(1, 1e4),
        randomFrequencies(8).map((fs) => fs.map((f) => Math.min(f, 30e6))),
        (stages, rLoad, rDm, rCm, frequencies) => {
          const receiver = { kind: 'resistive' as const, resistance: rLoad };
          const design = requireDesign(designInput(stages, receiver, receiver, { kind: 'resistor', resistance: rCm }, { kind: 'resistor', resistance: rDm }));
          const response = evaluateNetworkOnce(compileNetwork(design), Float64Array.from(frequencies));
          frequencies.forEach((f, i) => {
            const v1 = at(response.line1FromDm, i);
            const v2 = at(response.line2FromDm, i);
            const delivered = (rDm * (abs(v1) ** 2 + abs(v2) ** 2)) / rLoad;
            const zin = at(response.inputImpedanceDm, i);
            const accepted = (4 * rDm * zin.re) / abs(add(zin, cx(rDm))) ** 2;
            const scale = Math.max(delivered, accepted);
            total += 1;
            if (scale > 1e-3) substantial += 1;
            expect(delivered, `${f} Hz: delivered ${delivered}, accepted ${accepted}`).toBeLessThanOrEqual(1 + 1e-12);
            // Both sides are fractions of the available power. Near total reflection Re Z_in is a
            // tiny part of |Z_in|, so it carries the rounding of the larger impedances it was
            // formed from; hence a floor of 1e-11 of the available power besides 1e-8 relative.
            expect(Math.abs(delivered - accepted), `${f} Hz: delivered ${delivered}, accepted ${accepted}`).toBeLessThanOrEqual(1e-8 * scale + 1e-11);
          });
        },
      ),
      propertySettings(200),
    );
    // The property must have been exercised where the power is not negligible.
    expect(substantial / total).toBeGreaterThan(0.3);
  });
});

describe('(b) no passive design has transducer gain (textbook passivity: IL ≥ 20·log(2√(r_s·r_l)/(r_s + r_l)))', () => {
  it('every resistive system, CM and DM, on random lossy designs (seeded fast-check)', () => {
    fc.assert(
      fc.property(randomDesign, randomFrequencies(10), (input, frequencies) => {
        const response = evaluateNetworkOnce(compileNetwork(requireDesign(input), SYSTEMS), Float64Array.from(frequencies));
        SYSTEMS.forEach((system, s) => {
          const rs = system.sourceOhm;
          const rl = system.loadOhm;
          // Power ratio |V_without/V_with|² can fall no lower than 4·r_s·r_l/(r_s + r_l)².
          const bound = (4 * rs * rl) / (rs + rl) ** 2;
          frequencies.forEach((f, i) => {
            for (const [mode, ratios] of [
              ['CM', response.resistiveCmLoss],
              ['DM', response.resistiveDmLoss],
            ] as const) {
              expect(ratios[s]![i]!, `${mode} ${system.id} at ${f} Hz`).toBeGreaterThanOrEqual(bound * (1 - 1e-9));
            }
          });
        });
      }),
      propertySettings(200),
    );
  });

  it('the bound is 0 dB for 50/50 Ω and −23.99 dB for 0.1/100 Ω (arithmetic)', () => {
    expect(20 * Math.log10((2 * Math.sqrt(50 * 50)) / 100)).toBe(0);
    expect(20 * Math.log10((2 * Math.sqrt(0.1 * 100)) / 100.1)).toBeCloseTo(-23.99, 2);
  });
});

describe('(c) reciprocity (textbook: RLC networks are reciprocal): the filter reversed between swapped terminations has the same insertion loss', () => {
  it('every resistive system, CM and DM, on random lossy designs (seeded fast-check)', () => {
    const swapped = SYSTEMS.map((s) => ({ ...s, sourceOhm: s.loadOhm, loadOhm: s.sourceOhm }));
    let worst = { error: 0, where: '' };
    fc.assert(
      fc.property(randomDesign, randomFrequencies(10), (input, frequencies) => {
        const reversed: DesignInput = { ...input, stages: [...input.stages].reverse().map((stage) => ({ ...stage, elements: [...stage.elements].reverse() })) };
        const grid = Float64Array.from(frequencies);
        const forward = evaluateNetworkOnce(compileNetwork(requireDesign(input), SYSTEMS), grid);
        const backward = evaluateNetworkOnce(compileNetwork(requireDesign(reversed), swapped), grid);
        SYSTEMS.forEach((system, s) => {
          frequencies.forEach((f, i) => {
            for (const [mode, a, b] of [
              ['CM', forward.resistiveCmLoss, backward.resistiveCmLoss],
              ['DM', forward.resistiveDmLoss, backward.resistiveDmLoss],
            ] as const) {
              const error = Math.abs(Math.sqrt(a[s]![i]! / b[s]![i]!) - 1);
              if (error > worst.error) worst = { error, where: `${mode} ${system.id} at ${f} Hz: ${a[s]![i]} vs ${b[s]![i]}` };
              // Reversal reorders every product, so rounding amplified by the network shows (worst
              // seen over many seeds about 1e-5, with 1 Ω parts in one line beside 20 mH chokes; 1e-3 is
              // 0.009 dB);
              // a broken reciprocity would be of order 1.
              expect(error, `${mode} ${system.id} at ${f} Hz: forward ${a[s]![i]}, reversed ${b[s]![i]}`).toBeLessThanOrEqual(1e-3);
            }
          });
        });
      }),
      propertySettings(200),
    );
    if (process.env['CHOKEPOINT_SHOW_AGREEMENT']) process.stdout.write(`reciprocity worst ${worst.error} ${worst.where}\n`);
  });

  it('a deliberately asymmetric example: 10 µH series then 100 nF shunt is not the same filter turned round in 0.1/100 Ω (the test can tell them apart)', () => {
    const lc: DesignInput = designInput(
      [[{ placement: 'series-line1', part: { kind: 'inductor', inductance: 5e-6 } }, { placement: 'series-line2', part: { kind: 'inductor', inductance: 5e-6 } }, { placement: 'line-to-line', part: { kind: 'capacitor', capacitance: 100e-9 } }]],
      { kind: 'resistive', resistance: 50 },
      { kind: 'resistive', resistance: 50 },
      { kind: 'resistor', resistance: 50 },
      { kind: 'resistor', resistance: 100 },
    );
    const cl: DesignInput = { ...lc, stages: lc.stages.map((stage) => ({ ...stage, elements: [...stage.elements].reverse() })) };
    const grid = Float64Array.of(159e3);
    const a = evaluateNetworkOnce(compileNetwork(requireDesign(lc), SYSTEMS), grid);
    const b = evaluateNetworkOnce(compileNetwork(requireDesign(cl), SYSTEMS), grid);
    // Same system (not swapped): the two orders differ by many dB at the resonance.
    expect(Math.abs(10 * Math.log10(a.resistiveDmLoss[1]![0]! / b.resistiveDmLoss[1]![0]!))).toBeGreaterThan(10);
  });
});

describe('(d) a symmetric filter between matched receivers converts no mode (textbook symmetry)', () => {
  it('|DM from CM| and |CM from DM| below 1e-12 of the direct transfers (seeded fast-check)', () => {
    fc.assert(
      fc.property(stagesOf(symmetricSection(lossyTwoTerminal, lossyChoke)), randomReceiver, lossyTwoTerminal, lossyTwoTerminal, randomFrequencies(10), (stages, receiver, cm, dm, frequencies) => {
        const design = requireDesign(designInput(stages, receiver, receiver, cm, dm));
        const response = evaluateNetworkOnce(compileNetwork(design), Float64Array.from(frequencies));
        frequencies.forEach((f, i) => {
          const direct = Math.max(abs(at(response.cmFromCm, i)), abs(at(response.dmFromDm, i)));
          expect(abs(at(response.dmFromCm, i)), `DM from CM at ${f} Hz`).toBeLessThanOrEqual(1e-12 * direct);
          expect(abs(at(response.cmFromDm, i)), `CM from DM at ${f} Hz`).toBeLessThanOrEqual(1e-12 * direct);
          expect(direct).toBeGreaterThan(0);
        });
      }),
      propertySettings(200),
    );
  });

  it('and an asymmetric one does convert: a 10 µH inductor in line 1 only, mains LISNs', () => {
    const design = requireDesign(
      designInput([[{ placement: 'series-line1', part: { kind: 'inductor', inductance: 10e-6 } }]], { kind: 'cispr16-mains-50uh' }, { kind: 'cispr16-mains-50uh' }, { kind: 'capacitor', capacitance: 100e-12 }, { kind: 'resistor', resistance: 1 }),
    );
    const response = evaluateNetworkOnce(compileNetwork(design), Float64Array.of(1e6));
    expect(abs(at(response.dmFromCm, 0))).toBeGreaterThan(0.1 * abs(at(response.cmFromCm, 0)));
  });
});

describe('(e) two parallel shunt capacitors are one capacitor of the summed value (textbook: admittances in parallel add)', () => {
  const placements = fc.constantFrom('line-to-line' as const, 'line1-to-ground' as const, 'line2-to-ground' as const);
  const capacitorPair = (placement: ElementInput['placement'], c1: number, c2: number): ElementNoId[] => [
    { placement, part: { kind: 'capacitor', capacitance: c1 } },
    { placement, part: { kind: 'capacitor', capacitance: c2 } },
  ];
  const summed = (placement: ElementInput['placement'], c1: number, c2: number): ElementNoId[] => [{ placement, part: { kind: 'capacitor', capacitance: c1 + c2 } }];

  /*
   * The two descriptions differ only by the rounding of y1 + y2 against y12 (1e-16), which the
   * network then amplifies. Measured with the shared seed, in plain ladders: nearly every value
   * agrees to 1e-12, but the corners of the ranges amplify more — 200 dB of insertion loss
   * (20 µF across the lines behind 1 mH per line and a 10 mH part in one line) leaves 2e-9;
   * the CM input impedance, det Z / Z_dm of the 2×2 line impedance, loses digits in proportion
   * to |Z_cm/Z_dm| (20 µF across the input at 59 MHz: ratio 1.4e9, difference 1.6e-7, though
   * the physical Z_cm with the lines joined does not depend on that capacitor at all).
   * So: 99 % of all values within 1e-12, nothing beyond 1e-6. Any modelling slip (a wrong line,
   * a lost factor) gives errors of order 1.
   */
  it('in a plain ladder (series L pair, a lossy part in one line, a resistor across, resistive terminations): 99 % of all outputs within 1e-12 relative, none beyond 1e-6 (seeded fast-check)', () => {
    const errors: number[] = [];
    let worst = { error: 0, where: '' };
    fc.assert(
      fc.property(
        logUniform(1e-10, 1e-5),
        logUniform(1e-10, 1e-5),
        placements,
        fc.nat(3),
        logUniform(1e-6, 1e-3),
        lossyTwoTerminal,
        logUniform(1, 200),
        logUniform(1, 200),
        randomFrequencies(10),
        (c1, c2, placement, position, l, part, r1, r2, frequencies) => {
          const context: ElementNoId[][] = [
            [{ placement: 'series-line1', part: { kind: 'inductor', inductance: l } }, { placement: 'series-line2', part: { kind: 'inductor', inductance: l } }],
            [{ placement: 'series-line1', part }],
            [{ placement: 'line-to-line', part: { kind: 'resistor', resistance: r1 } }],
          ];
          const build = (inserted: ElementNoId[]): DesignInput =>
            designInput([...context.slice(0, position), inserted, ...context.slice(position)], { kind: 'resistive', resistance: r1 }, { kind: 'resistive', resistance: r2 }, { kind: 'resistor', resistance: r2 }, { kind: 'resistor', resistance: r1 });
          const grid = Float64Array.from(frequencies);
          const a = evaluateNetworkOnce(compileNetwork(requireDesign(build(capacitorPair(placement, c1, c2)))), grid);
          const b = evaluateNetworkOnce(compileNetwork(requireDesign(build(summed(placement, c1, c2)))), grid);
          const compared = compareResponses(a, b, grid);
          errors.push(...compared.errors);
          if (compared.worst.error > worst.error) worst = compared.worst;
          expect(compared.worst.error, compared.worst.where).toBeLessThanOrEqual(1e-6);
        },
      ),
      propertySettings(200),
    );
    const within = errors.filter((e) => e <= 1e-12).length / errors.length;
    if (process.env['CHOKEPOINT_SHOW_AGREEMENT']) process.stdout.write(`plain ladder: ${within} within 1e-12, worst ${worst.error} ${worst.where}\n`);
    expect(within, `worst: ${worst.where}`).toBeGreaterThanOrEqual(0.99);
  });

  /*
   * On random lossy designs (up to 12 parts, terminations from 0.1 Ω to LISNs) the amplification
   * is larger (kernel-vs-reference.test.ts documents the same between two correct evaluators). Measured with the shared seed: half the values agree exactly, 99 % within 1e-9,
   * the worst 3e-7 (a common-mode joined insertion loss, i.e. 3e-6 dB). Any modelling slip gives
   * errors of order 1.
   */
  it('anywhere in a random lossy design: 99 % of all outputs within 1e-9 relative and none beyond 1e-2 (seeded fast-check)', () => {
    const errors: number[] = [];
    let worst = { error: 0, where: '' };
    fc.assert(
      fc.property(randomDesign, logUniform(1e-10, 1e-5), logUniform(1e-10, 1e-5), placements, fc.nat(), randomFrequencies(10), (input, c1, c2, placement, where, frequencies) => {
        const position = where % (input.stages.length + 1);
        const withStage = (elements: ElementNoId[]): DesignInput => ({
          ...input,
          stages: [...input.stages.slice(0, position), { id: 'inserted', elements: elements.map((e, k) => ({ ...e, id: `inserted${k}` }) as ElementInput) }, ...input.stages.slice(position)],
        });
        const grid = Float64Array.from(frequencies);
        const a = evaluateNetworkOnce(compileNetwork(requireDesign(withStage(capacitorPair(placement, c1, c2)))), grid);
        const b = evaluateNetworkOnce(compileNetwork(requireDesign(withStage(summed(placement, c1, c2)))), grid);
        const compared = compareResponses(a, b, grid);
        errors.push(...compared.errors);
        if (compared.worst.error > worst.error) worst = compared.worst;
        expect(compared.worst.error, compared.worst.where).toBeLessThanOrEqual(1e-2);
      }),
      propertySettings(200),
    );
    const within = errors.filter((e) => e <= 1e-9).length / errors.length;
    if (process.env['CHOKEPOINT_SHOW_AGREEMENT']) process.stdout.write(`parallel capacitors: ${within} within 1e-9, worst ${worst.error} ${worst.where}\n`);
    expect(within, `worst: ${worst.where}`).toBeGreaterThanOrEqual(0.99);
  });
});

describe('(f) a disabled element is the same as no element', () => {
  it('kernel outputs identical bit for bit, and the sweep result identical (seeded fast-check)', () => {
    fc.assert(
      fc.property(randomDesign, fc.nat(), fc.nat(), randomFrequencies(6), (input, stagePick, elementPick, frequencies) => {
        const s = stagePick % input.stages.length;
        const stage = input.stages[s]!;
        const e = elementPick % stage.elements.length;
        const replaceStage = (elements: ElementInput[]): DesignInput => ({
          ...input,
          frequencyPlan: { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 10 },
          stages: input.stages.map((other, k) => (k === s ? { ...other, elements } : other)),
        });
        const disabled = replaceStage(stage.elements.map((el, k) => (k === e ? { ...el, enabled: false } : el)));
        const removed = replaceStage(stage.elements.filter((_, k) => k !== e));
        const grid = Float64Array.from(frequencies);
        const a = evaluateNetworkOnce(compileNetwork(requireDesign(disabled)), grid);
        const b = evaluateNetworkOnce(compileNetwork(requireDesign(removed)), grid);
        expect(flatten(a)).toEqual(flatten(b));
        const sweepA = sweepDesign(requireDesign(disabled));
        const sweepB = sweepDesign(requireDesign(removed));
        expect(sweepA.frequencyHz).toEqual(sweepB.frequencyHz);
        expect(sweepA.columns).toEqual(sweepB.columns);
        expect(sweepA.resonances).toEqual(sweepB.resonances);
        expect(sweepA.warnings).toEqual(sweepB.warnings);
        expect(sweepA.elements.map((el) => el.id)).toEqual(sweepB.elements.map((el) => el.id));
      }),
      propertySettings(60),
    );
  });
});
