import type { ValidationIssue } from '../model/index.ts';
import type { EmissionsAnalysis } from '../spectrum/emissions-analysis.ts';
import type { LimitingMode } from '../report/limiting-mode.ts';
import type { EmissionsFailureKind } from '../../workers/emissions-protocol.ts';

/** How an emissions-analysis request ended, as the page sees it. */
export type EmissionsOutcome = EmissionsDone | EmissionsRefused | EmissionsSuperseded;

export interface EmissionsDone {
  readonly status: 'done';
  readonly requestId: number;
  readonly analysis: EmissionsAnalysis;
  /** Time the worker spent, not counting the trip across threads. */
  readonly elapsedMs: number;
  /** Which mode limits each band of the margin report, in its order (src/report/limiting-mode.ts). */
  readonly limitingModes: readonly LimitingMode[];
}

/**
 * No analysis: the worker refused the request or the design, the analysis failed, or the worker
 * itself could not answer ('worker-failure': it crashed, did not load, or sent a malformed reply).
 */
export interface EmissionsRefused {
  readonly status: 'error';
  readonly requestId: number;
  readonly error: EmissionsError;
}

export interface EmissionsError {
  readonly kind: EmissionsFailureKind | 'worker-failure';
  readonly message: string;
  readonly issues: readonly ValidationIssue[];
}

/** A newer request was made before this one could be shown; its analysis, if any, is dropped. */
export interface EmissionsSuperseded {
  readonly status: 'superseded';
  readonly requestId: number;
}
