import type { SweepResult } from '../engine/index.ts';
import type { ValidationIssue } from '../model/index.ts';
import type { SweepFailureKind } from '../../workers/sweep-protocol.ts';

/** How a sweep request ended, as the page sees it. */
export type SweepOutcome = SweepDone | SweepRefused | SweepSuperseded;

export interface SweepDone {
  readonly status: 'done';
  readonly requestId: number;
  readonly result: SweepResult;
  /** Time the worker spent, not counting the trip across threads. */
  readonly elapsedMs: number;
}

/**
 * No result: the worker refused the request or the design, the engine failed, or the worker
 * itself could not answer ('worker-failure': it crashed, did not load, or sent a malformed reply).
 */
export interface SweepRefused {
  readonly status: 'error';
  readonly requestId: number;
  readonly error: SweepError;
}

export interface SweepError {
  readonly kind: SweepFailureKind | 'worker-failure';
  readonly message: string;
  readonly issues: readonly ValidationIssue[];
}

/** A newer request was made before this one could be shown; its result, if any, is dropped. */
export interface SweepSuperseded {
  readonly status: 'superseded';
  readonly requestId: number;
}
