import { z } from 'zod';
import { VALUE_QUANTITIES } from '../src/assist/design-edit/part-values.ts';
import { PREFERRED_SERIES_NAMES, type PreferredSeries } from '../src/assist/sizing/preferred-values.ts';
import { ATTRIBUTIONS, limitMaskSchema } from '../src/model/emissions-schema.ts';
import type { ValidationIssue } from '../src/model/index.ts';
import { scanSchema } from './emissions-protocol.ts';

/**
 * What crosses the assistants' worker boundary (docs/assistants.md, "From the page"). Every request
 * carries its id, a design document (validated by the worker exactly as a file would be), the noise
 * it is judged by and optional overrides of the design's judging settings; each assistant adds its
 * own parameters. Replies are plain structured-clone values: `{ ok: true, result }` or a failure
 * with field paths.
 */

const requestId = z.number().int('a request id is a whole number').nonnegative('a request id is 0 or more');

export const assistNoiseSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('estimate') }),
  /** One scan of any tag, or a separator's CM and DM outputs. */
  z.strictObject({ kind: z.literal('scans'), scans: z.array(scanSchema).min(1, 'give at least one scan').max(4) }),
]);

export const judgingSchema = z
  .strictObject({
    masks: z.array(limitMaskSchema).min(1).max(16).optional(),
    targetMarginDb: z.number().finite().min(-40).max(60).optional(),
    attribution: z.enum(ATTRIBUTIONS).optional(),
    noiseFloorDbuV: z.number().finite().optional(),
  })
  .optional();

/** The fields every assistant that judges margins shares. */
export const problemFields = {
  requestId,
  design: z.unknown(),
  noise: assistNoiseSchema,
  judging: judgingSchema,
};

export const diagnoseRequestSchema = z.strictObject({ ...problemFields });
export type DiagnoseRequest = z.input<typeof diagnoseRequestSchema>;

/**
 * Why a request produced no result:
 * - invalid-request: the message was malformed (issue paths name request fields);
 * - invalid-design: the design failed validation (paths name design fields);
 * - unusable-input: valid, but nothing can be worked out (no mask, no estimate, no converter…);
 * - cancelled: `cancel(requestId)` arrived while it ran;
 * - engine-failure: a defect, to report.
 */
export type AssistFailureKind = 'invalid-request' | 'invalid-design' | 'unusable-input' | 'cancelled' | 'engine-failure';

export interface AssistFailure {
  readonly ok: false;
  readonly requestId: number | null;
  readonly error: { readonly kind: AssistFailureKind; readonly message: string; readonly issues: readonly ValidationIssue[] };
}

export interface AssistSuccess<T> {
  readonly ok: true;
  readonly requestId: number;
  readonly result: T;
  /** Time spent in the worker, ms. */
  readonly elapsedMs: number;
}

export type AssistReply<T> = AssistSuccess<T> | AssistFailure;

const valueTargetSchema = z.strictObject({
  elementIds: z.array(z.string().min(1).max(64)).min(1).max(16),
  quantity: z.enum(VALUE_QUANTITIES),
});

export const scalingSchema = z
  .strictObject({ windingCapacitance: z.enum(['keep', 'scale-with-turns']), leakage: z.enum(['fixed-fraction', 'fixed-value']) })
  .optional();

export const sizeRequestSchema = z.strictObject({
  ...problemFields,
  /** The part (or parts moved together) to size; absent: every CM choke, DM inductance and X capacitor. */
  target: valueTargetSchema.optional(),
  scaling: scalingSchema,
  series: z.enum(PREFERRED_SERIES_NAMES as [PreferredSeries, ...PreferredSeries[]]).optional(),
  rangeFactor: z.number().min(1.5).max(1e4).optional(),
});
export type SizeRequest = z.input<typeof sizeRequestSchema>;

export const yCapacitanceRequestSchema = z.strictObject({
  ...problemFields,
  leakageLimitA: z.number().positive().max(1),
  lineVoltageV: z.number().positive().max(1e4).optional(),
  lineFrequencyHz: z.number().positive().max(1e4).optional(),
  tolerance: z.number().min(0).max(0.9).optional(),
});
export type YCapacitanceRequest = z.input<typeof yCapacitanceRequestSchema>;

export const resonancesRequestSchema = z.strictObject({
  requestId,
  design: z.unknown(),
  minimumDepthDb: z.number().min(0).max(60).optional(),
});
export type ResonancesRequest = z.input<typeof resonancesRequestSchema>;

export const dampRequestSchema = z.strictObject({
  requestId,
  design: z.unknown(),
  /** Optional: with noise, the resonance nearest the worst margin is damped and the margin given before and after. */
  noise: assistNoiseSchema.optional(),
  judging: judgingSchema,
  leg: z.enum(['parallel-rc', 'series-rl']).optional(),
  ratio: z.number().min(0.05).max(100).optional(),
  resonanceHz: z.number().positive().optional(),
});
export type DampRequest = z.input<typeof dampRequestSchema>;

export const stabilityRequestSchema = z.strictObject({
  requestId,
  design: z.unknown(),
  lowestInputVoltageV: z.number().positive().max(1e5).optional(),
  highestInputPowerW: z.number().positive().max(1e7).optional(),
  requiredMarginDb: z.number().min(0).max(60).optional(),
  upToHz: z.number().positive().optional(),
});
export type StabilityRequest = z.input<typeof stabilityRequestSchema>;

const float64Array = z.custom<Float64Array>((value) => value instanceof Float64Array, { message: 'expected a Float64Array' });
const float32Array = z.custom<Float32Array>((value) => value instanceof Float32Array, { message: 'expected a Float32Array' });

export const yieldSettingsSchema = z
  .strictObject({
    samples: z.number().int().min(1).max(100_000).optional(),
    seed: z.number().int().min(0).max(2 ** 31 - 1).optional(),
    useDefaults: z.boolean().optional(),
    permeabilityBand: z.strictObject({ lowPercent: z.number().min(-90).max(0), highPercent: z.number().min(0).max(200) }).optional(),
  })
  .default({});

const mapAxisSchema = z.strictObject({
  target: valueTargetSchema,
  fromValue: z.number().positive(),
  toValue: z.number().positive(),
  steps: z.number().int().min(2).max(400).optional(),
});

export const mapSettingsSchema = z.strictObject({
  x: mapAxisSchema,
  y: mapAxisSchema,
  scaling: scalingSchema,
  leakage: z
    .strictObject({ leakageLimitA: z.number().positive().max(1), lineVoltageV: z.number().positive(), lineFrequencyHz: z.number().positive(), tolerance: z.number().min(0).max(0.9) })
    .optional(),
});

/** Work split over the pool: a tolerance-yield run or a two-value map. The pool validates it in every worker. */
export const splitRequestSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('yield'), ...problemFields, settings: yieldSettingsSchema }),
  z.strictObject({ kind: z.literal('map'), ...problemFields, settings: mapSettingsSchema }),
]);
export type SplitRequest = z.input<typeof splitRequestSchema>;
export type YieldRequest = Omit<Extract<SplitRequest, { kind: 'yield' }>, 'kind'>;
export type MapRequest = Omit<Extract<SplitRequest, { kind: 'map' }>, 'kind'>;

export const chunkRangeSchema = z.strictObject({ start: z.number().int().nonnegative(), count: z.number().int().positive().max(100_000) });

/** Chunks on their way back to a worker for the merge. */
export const splitChunksSchema = z.array(
  z.discriminatedUnion('kind', [
    z.strictObject({
      kind: z.literal('yield'),
      chunk: z.strictObject({ start: z.number().int().nonnegative(), count: z.number().int().positive(), worstMarginDb: float64Array, factors: float64Array, binMarginDb: float32Array }),
    }),
    z.strictObject({
      kind: z.literal('map'),
      chunk: z.strictObject({ start: z.number().int().nonnegative(), count: z.number().int().positive(), worstMarginDb: float64Array, worstFrequencyHz: float64Array }),
    }),
  ]),
);

export const mapCellRequestSchema = z.strictObject({
  requestId,
  design: z.unknown(),
  settings: mapSettingsSchema,
  x: z.number().positive(),
  y: z.number().positive(),
});
export type MapCellRequest = z.input<typeof mapCellRequestSchema>;

export const proposeRequestSchema = z.strictObject({
  ...problemFields,
  leakage: z
    .strictObject({ leakageLimitA: z.number().positive().max(1), lineVoltageV: z.number().positive(), lineFrequencyHz: z.number().positive(), tolerance: z.number().min(0).max(0.9).optional() })
    .optional(),
  maxStages: z.number().int().min(1).max(3).optional(),
  converter: z.strictObject({ lowestInputVoltageV: z.number().positive(), highestInputPowerW: z.number().positive(), stabilityMarginDb: z.number().min(0).max(60).optional() }).optional(),
  series: z.enum(PREFERRED_SERIES_NAMES as [PreferredSeries, ...PreferredSeries[]]).optional(),
  fixed: z.strictObject({ chokeInductanceH: z.number().positive().optional(), xCapacitanceF: z.number().positive().optional(), yCapacitanceF: z.number().positive().optional() }).optional(),
});
export type ProposeRequest = z.input<typeof proposeRequestSchema>;
