import { z } from 'zod';
import type { ValidationIssue } from '../src/model/index.ts';
import type { SweepResult } from '../src/engine/index.ts';

/**
 * What crosses the worker boundary, in both directions. The request is validated on arrival
 * (a worker message is outside data like a file); the reply is a plain structured-clone value.
 */

export const sweepRequestSchema = z.strictObject({
  /** Chosen by the caller, rising; echoed back so a reply can be matched to its request. */
  requestId: z.number().int('a request id is a whole number').nonnegative('a request id is 0 or more'),
  /** A design document, validated by the worker exactly as a file would be. */
  design: z.unknown(),
  options: z
    .strictObject({
      refine: z.boolean().optional(),
    })
    .optional(),
});

export type SweepRequest = z.input<typeof sweepRequestSchema>;
export type SweepRequestOptions = NonNullable<SweepRequest['options']>;

export interface SweepSuccess {
  readonly ok: true;
  readonly requestId: number;
  readonly result: SweepResult;
  /** Time spent in the worker validating and sweeping, in milliseconds. */
  readonly elapsedMs: number;
}

/**
 * Why a request produced no result:
 * - invalid-request: the message itself was malformed (issue paths name request fields);
 * - invalid-design: the design failed validation (issue paths name design fields, as in a file);
 * - engine-failure: the engine threw on a valid design, which is a defect to report.
 */
export type SweepFailureKind = 'invalid-request' | 'invalid-design' | 'engine-failure';

export interface SweepFailure {
  readonly ok: false;
  /** null when the request was too malformed to carry a usable id. */
  readonly requestId: number | null;
  readonly error: {
    readonly kind: SweepFailureKind;
    readonly message: string;
    readonly issues: readonly ValidationIssue[];
  };
}

export type SweepReply = SweepSuccess | SweepFailure;
