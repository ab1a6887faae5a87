import fc from 'fast-check';
import type { DesignInput } from '../../src/model/design.ts';

type StageInput = DesignInput['stages'][number];
type ElementInput = StageInput['elements'][number];
type PartInput = ElementInput['part'];
type TwoTerminalInput = Exclude<PartInput, { kind: 'common-mode-choke' }>;
type ReceiverInput = DesignInput['receivers']['line1'];

/** Log-uniform between lo and hi: component values span decades. */
export const logUniform = (lo: number, hi: number): fc.Arbitrary<number> =>
  fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((x) => 10 ** x);

/**
 * Lossy parts, as real ones are: every part has resistance, and magnetics have core loss that
 * holds the quality factor at self-resonance between 2 and 100 (real ferrite parts sit in that
 * range; a winding capacitance against a lossless 10 mH would give 10⁴ and make the answer
 * depend on the last digits of 1 − ω²LC, which no two correct programs share).
 */
export const lossyTwoTerminal: fc.Arbitrary<TwoTerminalInput> = fc.oneof(
  fc.record({
    kind: fc.constant('capacitor' as const),
    capacitance: logUniform(1e-10, 1e-5),
    esr: logUniform(1e-3, 1),
    esl: logUniform(1e-9, 3e-8),
  }),
  fc
    .record({
      inductance: logUniform(1e-6, 1e-2),
      dcr: logUniform(1e-3, 1),
      windingCapacitance: logUniform(1e-12, 5e-11),
      resonanceQ: logUniform(2, 100),
      permeability: fc.oneof(
        fc.constant({ kind: 'constant' as const }),
        fc.record({ kind: fc.constant('first-order-relaxation' as const), relaxationFrequencyHz: logUniform(1e5, 1e8) }),
      ),
    })
    .map(({ inductance, resonanceQ, ...rest }) => ({
      kind: 'inductor' as const,
      inductance,
      // Core loss sets the quality factor at the self-resonance: Rp = Q·√(L/C_w).
      coreLoss: { kind: 'parallel-resistance' as const, resistance: resonanceQ * Math.sqrt(inductance / rest.windingCapacitance) },
      ...rest,
    })),
  fc.record({ kind: fc.constant('resistor' as const), resistance: logUniform(0.01, 1e4), seriesInductance: logUniform(1e-10, 1e-7) }),
  fc.record({
    kind: fc.constant('ferrite-bead' as const),
    resistance: logUniform(10, 2000),
    inductance: logUniform(1e-7, 1e-5),
    capacitance: logUniform(1e-13, 1e-11),
    dcResistance: logUniform(1e-3, 0.5),
  }),
  fc.record({ kind: fc.constant('damping-rc' as const), resistance: logUniform(0.1, 100), capacitance: logUniform(1e-8, 1e-5) }),
  fc.record({ kind: fc.constant('damping-rl' as const), resistance: logUniform(0.1, 100), inductance: logUniform(1e-7, 1e-4) }),
);

/**
 * Chokes with realistic coupling: leakage between 0.2 % and 4 % of the winding inductance
 * (trade articles quote 0.5–4 %), given either way the schema allows.
 */
export const lossyChoke: fc.Arbitrary<PartInput> = fc
  .record({
    inductance: logUniform(1e-4, 2e-2),
    leakageFraction: logUniform(0.002, 0.04),
    asFactor: fc.boolean(),
    dcr: logUniform(1e-3, 0.5),
    windingCapacitance: logUniform(1e-12, 5e-11),
    resonanceQ: logUniform(2, 100),
    permeability: fc.oneof(
      fc.constant({ kind: 'constant' as const }),
      fc.record({ kind: fc.constant('first-order-relaxation' as const), relaxationFrequencyHz: logUniform(1e5, 1e7) }),
    ),
  })
  .map(({ inductance, leakageFraction, asFactor, resonanceQ, ...rest }) => ({
    kind: 'common-mode-choke' as const,
    inductance,
    coupling: asFactor
      ? { kind: 'coupling-factor' as const, couplingFactor: 1 - leakageFraction }
      : { kind: 'leakage-inductance' as const, leakageInductance: leakageFraction * inductance },
    // Loss across each winding bounds the Q of the leakage-path resonance, the sharper one.
    parallelResistance: resonanceQ * Math.sqrt((leakageFraction * inductance) / rest.windingCapacitance),
    ...rest,
  }));

const twoTerminalPlacement = fc.constantFrom(
  'series-line1' as const,
  'series-line2' as const,
  'line-to-line' as const,
  'line1-to-ground' as const,
  'line2-to-ground' as const,
);

export const randomElement: fc.Arbitrary<Omit<ElementInput, 'id'>> = fc.oneof(
  { weight: 5, arbitrary: fc.record({ placement: twoTerminalPlacement, part: lossyTwoTerminal }) },
  { weight: 1, arbitrary: fc.record({ placement: fc.constant('both-lines-coupled' as const), part: lossyChoke }) },
);

export const randomReceiver: fc.Arbitrary<ReceiverInput> = fc.oneof(
  fc.constant({ kind: 'cispr16-mains-50uh' as const }),
  fc.constant({ kind: 'vehicle-5uh' as const }),
  fc.record({ kind: fc.constant('resistive' as const), resistance: logUniform(1, 200) }),
  fc.record({ kind: fc.constant('custom' as const), impedance: lossyTwoTerminal }),
);

/** Give every element of every stage a unique id. */
export function withIds(stages: Omit<ElementInput, 'id'>[][]): StageInput[] {
  let n = 0;
  return stages.map((elements, s) => ({
    id: `s${s}`,
    elements: elements.map((element) => {
      n += 1;
      return { ...element, id: `e${n}` } as ElementInput;
    }),
  }));
}

/** A random passive, lossy, possibly asymmetric two-line filter with random terminations. */
export const randomDesign: fc.Arbitrary<DesignInput> = fc
  .record({
    stages: fc.array(fc.array(randomElement, { minLength: 1, maxLength: 4 }), { minLength: 1, maxLength: 3 }),
    line1: randomReceiver,
    line2: randomReceiver,
    commonMode: lossyTwoTerminal,
    differentialMode: lossyTwoTerminal,
  })
  .map(({ stages, line1, line2, commonMode, differentialMode }) => ({
    format: 'chokepoint-design' as const,
    version: 2 as const,
    name: 'random design',
    noiseSource: { commonMode: { impedance: commonMode }, differentialMode: { impedance: differentialMode } },
    receivers: { line1, line2 },
    stages: withIds(stages),
  }));

/** Frequencies between 9 kHz and 100 MHz. */
export const randomFrequencies = (count: number): fc.Arbitrary<number[]> =>
  fc.array(logUniform(9e3, 1e8), { minLength: count, maxLength: count });
