import { z } from 'zod';
import { quantity, quantityOr } from './quantity-field.ts';

/**
 * The "noise in, margin out" part of a design (optional): the limit masks to meet, the target
 * margin and bands of the margin table, how a scan of unknown mode is credited, the filter that
 * was fitted when the scan was taken, and an estimate of the noise for before hardware exists.
 * Scans themselves are files read at check time (they can hold a million rows), not part of it.
 */

/** The receiver detectors of CISPR 16-1-1. For an unmodulated sine all three read the same. */
export const DETECTORS = ['peak', 'quasi-peak', 'average'] as const;
export type Detector = (typeof DETECTORS)[number];

/** For a scan whose mode is unknown: which mode the filter's improvement is credited to. */
export const ATTRIBUTIONS = ['common-mode', 'differential-mode', 'both'] as const;
export type Attribution = (typeof ATTRIBUTIONS)[number];

const identifier = z
  .string()
  .regex(/^[A-Za-z][A-Za-z0-9_.-]{0,63}$/u, 'an id starts with a letter and holds letters, digits, ".", "-" or "_" (64 at most)');

/**
 * A limit line: (frequency, level) points joined by straight lines on a log-frequency axis. A step
 * is two points at the same frequency; at a step the lower level applies. Levels in dBµV.
 */
export const limitMaskSchema = z
  .strictObject({
    id: identifier,
    name: z.string().min(1).max(200),
    detector: z.enum(DETECTORS),
    frequencyHz: z.array(z.number().positive().finite()).min(2).max(10_000),
    levelDbuV: z.array(z.number().finite()).min(2).max(10_000),
    /** Where a copied preset came from (standard, edition, table), kept for the report. */
    origin: z.string().max(500).optional(),
  })
  .superRefine((mask, ctx) => {
    if (mask.levelDbuV.length !== mask.frequencyHz.length) {
      ctx.addIssue({
        code: 'custom',
        path: ['levelDbuV'],
        message: `has ${mask.levelDbuV.length} values but frequencyHz has ${mask.frequencyHz.length}`,
      });
    }
    for (let i = 1; i < mask.frequencyHz.length; i += 1) {
      const previous = mask.frequencyHz[i - 1]!;
      const here = mask.frequencyHz[i]!;
      if (here < previous) {
        ctx.addIssue({ code: 'custom', path: ['frequencyHz', i], message: 'frequencies must not fall' });
        return;
      }
      if (here === previous && i >= 2 && mask.frequencyHz[i - 2] === here) {
        ctx.addIssue({ code: 'custom', path: ['frequencyHz', i], message: 'a step is two points at one frequency, not three' });
        return;
      }
    }
  });

/** The most limit masks a design holds (and `check --limit` takes). */
export const MAX_LIMIT_MASKS = 16;

export const bandSchema = z.strictObject({
  name: z.string().min(1).max(80),
  startHz: quantity('Hz'),
  stopHz: quantity('Hz'),
});

/** The conducted-emission band split used in the margin table unless a design sets its own. */
export const DEFAULT_BANDS = [
  { name: '0.15–0.5 MHz', startHz: 150e3, stopHz: 500e3 },
  { name: '0.5–5 MHz', startHz: 500e3, stopHz: 5e6 },
  { name: '5–30 MHz', startHz: 5e6, stopHz: 30e6 },
] as const;

/** A trapezoidal pulse train: amplitude A (peak), frequency 1/T, duty τ/T (50 % points), rise and fall times. */
export const trapezoidSchema = z.strictObject({
  amplitude: quantity('V', 'positive'),
  frequencyHz: quantity('Hz'),
  duty: z.number().gt(0).lt(1),
  riseTime: quantity('s'),
  /** Defaults to the rise time. */
  fallTime: quantity('s').optional(),
});

/** A trapezoidal current pulse train (input current of a buck stage), amplitude in A. */
export const currentTrapezoidSchema = z.strictObject({
  amplitude: quantity('A', 'positive'),
  frequencyHz: quantity('Hz'),
  duty: z.number().gt(0).lt(1),
  riseTime: quantity('s'),
  fallTime: quantity('s').optional(),
});

export const noiseEstimateSchema = z.strictObject({
  /** Common mode: the switch-node voltage driving a parasitic capacitance to chassis. */
  commonMode: z
    .strictObject({
      switchNode: trapezoidSchema,
      parasiticCapacitance: quantity('F'),
    })
    .optional(),
  /** Differential mode: the converter's input current, flowing from its input capacitor. */
  differentialMode: z
    .strictObject({
      current: z.discriminatedUnion('kind', [
        z.strictObject({ kind: z.literal('pulsed'), pulse: currentTrapezoidSchema }),
        z.strictObject({
          kind: z.literal('triangular-ripple'),
          peakToPeak: quantity('A', 'positive'),
          frequencyHz: quantity('Hz'),
          /** Fraction of the period the current rises, 0 < D < 1. */
          riseFraction: z.number().gt(0).lt(1),
        }),
      ]),
      inputCapacitance: quantity('F'),
      esr: quantityOr(0, 'Ω'),
      esl: quantityOr(0, 'H'),
    })
    .optional(),
});

/** Everything but the baseline, which needs the stage schema (design-schema.ts adds it). */
export const emissionsFields = {
  masks: z.array(limitMaskSchema).max(MAX_LIMIT_MASKS).default([]),
  /** Required distance below every limit, dB (often 6). */
  targetMarginDb: z.number().finite().min(-40).max(60).default(6),
  bands: z.array(bandSchema).min(1).max(32).default(DEFAULT_BANDS.map((band) => ({ ...band }))),
  /** Scan points at or below this level are the receiver's floor, not noise, and are excluded from required attenuation. */
  noiseFloorDbuV: z.number().finite().optional(),
  attribution: z.enum(ATTRIBUTIONS).default('both'),
  estimate: noiseEstimateSchema.optional(),
};
