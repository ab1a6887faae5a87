import { z } from 'zod';
import { optionalQuantity, quantity } from './quantity-field.ts';

/**
 * The safety choices of a design (version 2) and the core data of chokes and inductors. Neither
 * changes the filter's response; the safety checks (src/safety, docs/safety.md) read them. The ids
 * of the listed limits and requirements live here so that a file naming an unknown one fails at
 * the edge; their values, standards and clauses live with the checks in src/safety.
 */

/** Leakage (touch) current limits the checks know, each with its standard and clause in src/safety/leakage-limits.ts. */
export const LEAKAGE_LIMIT_IDS = [
  'iec60335-1-class-ii',
  'iec60335-1-class-0-0i-iii',
  'iec60335-1-class-i-portable',
  'iec60335-1-class-i-stationary-motor',
  'iec60335-1-class-i-stationary-heating',
  'iec60950-1-not-earthed',
  'iec60950-1-class-i-hand-held',
  'iec60950-1-class-i-pluggable-a',
  'iec62368-1-class-i-pluggable-a',
  'iec62368-1-es1',
  'iec60601-1-touch',
  'iec60601-1-earth-2nd-edition',
  'iec60601-1-2005-earth',
] as const;
export type LeakageLimitId = (typeof LEAKAGE_LIMIT_IDS)[number];

/** X-capacitor discharge requirements the checks know (src/safety/discharge-requirements.ts). */
export const DISCHARGE_REQUIREMENT_IDS = ['iec60950-1-pluggable-a', 'iec60950-1-pluggable-b', 'iec60335-1', 'iec62368-1'] as const;
export type DischargeRequirementId = (typeof DISCHARGE_REQUIREMENT_IDS)[number];

const note = z.string().max(200);
const fraction = (what: string) => z.number().min(0, `${what} is a fraction from 0`).lt(1, `${what} is a fraction below 1 (0.2 for 20 %)`);

export const leakageLimitSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('listed-limit'), id: z.enum(LEAKAGE_LIMIT_IDS) }),
  z.strictObject({
    kind: z.literal('entered-limit'),
    /** The limit in normal condition, rms. */
    normalCondition: quantity('A'),
    /** The limit with one supply conductor open; absent means the standard gives none here. */
    singleFault: optionalQuantity('A'),
    /** Where the value comes from: the standard and clause. */
    label: note.optional(),
  }),
]);

export const dischargeRequirementSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('listed-requirement'), id: z.enum(DISCHARGE_REQUIREMENT_IDS) }),
  z.strictObject({
    kind: z.literal('time-constant'),
    /** The largest allowed R·C of the capacitance across the plug pins. */
    maxTimeConstant: quantity('s'),
    label: note.optional(),
  }),
  z.strictObject({
    kind: z.literal('residual-voltage'),
    /** The highest voltage allowed across the plug pins `after` seconds after disconnection at the mains peak. */
    maxVoltage: quantity('V'),
    after: quantity('s'),
    label: note.optional(),
  }),
]);

export const safetySchema = z.strictObject({
  leakageLimit: leakageLimitSchema.optional(),
  discharge: dischargeRequirementSchema.optional(),
  /** A bleed resistance across the lines outside the design's stages (in the converter), in parallel with the design's own. */
  externalBleedResistance: optionalQuantity('Ω'),
  /** Upper tolerance of every capacitor, a fraction (0.2 for +20 %); absent: 0.2. */
  capacitorTolerance: fraction('a capacitor tolerance').optional(),
  /** How far below saturation the peak flux must stay, a fraction (0.2 for 20 %); absent: 0.2. */
  saturationMargin: fraction('a saturation margin').optional(),
  /** Peak over rms of the line current; absent: √2 on mains (a sine), 1 on a DC input. */
  lineCurrentCrestFactor: z.number().min(1, 'a crest factor is at least 1').max(10, 'a crest factor is at most 10').optional(),
});

/** Inductance over its zero-current value against the current through the winding (DC, or the peak of an AC current). */
export const biasCurveSchema = z
  .strictObject({
    currentA: z.array(z.number().min(0).finite()).min(2).max(1000),
    inductanceRatio: z.array(z.number().positive().max(2, 'an inductance ratio is at most 2').finite()).min(2).max(1000),
  })
  .superRefine((curve, ctx) => {
    if (curve.inductanceRatio.length !== curve.currentA.length) {
      ctx.addIssue({ code: 'custom', path: ['inductanceRatio'], message: `has ${curve.inductanceRatio.length} values but currentA has ${curve.currentA.length}` });
      return;
    }
    for (let i = 1; i < curve.currentA.length; i += 1) {
      if (!(curve.currentA[i]! > curve.currentA[i - 1]!)) {
        ctx.addIssue({ code: 'custom', path: ['currentA', i], message: 'currents must rise strictly' });
        return;
      }
    }
  });

/** What the saturation check needs about a winding's core; every field is optional, a missing one is named by the check. */
export const partCoreSchema = z.strictObject({
  /** A_e, the core's effective cross-section, in mm² (a plain number, as data sheets give it). */
  effectiveAreaMm2: z.number().positive().max(1e6).optional(),
  /** N, turns of each winding. */
  turns: z.number().int('turns are a whole number').positive().max(100_000).optional(),
  /** B_sat of the core material at its working temperature, in tesla (a plain number). */
  saturationFluxDensityTesla: z.number().positive().max(5, 'a saturation flux density is at most 5 T').optional(),
  biasCurve: biasCurveSchema.optional(),
});
