import { z } from 'zod';
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
