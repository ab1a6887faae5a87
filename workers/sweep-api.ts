import * as Comlink from 'comlink';
import { sweepDesign, type SweepResult, transferables } from '../src/engine/index.ts';
import { formatIssue, readDesign, toValidationIssue, type ValidationIssue } from '../src/model/index.ts';
import { type SweepFailure, type SweepFailureKind, type SweepReply, sweepRequestSchema } from './sweep-protocol.ts';

/**
 * The object the sweep worker exposes. It holds no DOM and no state, so tests call it directly
 * or over a MessageChannel. Bad input comes back as `{ ok: false }`: a throw would surface on
 * the main thread as an opaque rejected promise without field paths.
 */
export const sweepApi = {
  sweep(request: unknown): SweepReply {
    const started = performance.now();
    const parsed = sweepRequestSchema.safeParse(request, { reportInput: true });
    if (!parsed.success) {
      const issues = parsed.error.issues.map(toValidationIssue);
      return failure(salvageRequestId(request), 'invalid-request', 'invalid sweep request', issues);
    }
    const { requestId, design, options } = parsed.data;

    const read = readDesign(design);
    if (!read.ok) return failure(requestId, 'invalid-design', 'invalid design', read.error.issues);

    let result: SweepResult;
    try {
      result = sweepDesign(read.value, { refine: options?.refine ?? true });
    } catch (cause) {
      const message = cause instanceof Error ? cause.message : String(cause);
      return failure(requestId, 'engine-failure', `the sweep failed: ${message}`, []);
    }
    const elapsedMs = performance.now() - started;
    // The columns share a few ArrayBuffers; moving them avoids copying megabytes per sweep.
    return Comlink.transfer({ ok: true, requestId, result, elapsedMs }, transferables(result));
  },
};

export type SweepApi = typeof sweepApi;

function failure(requestId: number | null, kind: SweepFailureKind, what: string, issues: readonly ValidationIssue[]): SweepFailure {
  const detail = issues.map(formatIssue).join('; ');
  return { ok: false, requestId, error: { kind, message: detail === '' ? what : `${what}: ${detail}`, issues } };
}

/** Echo the id of a request that failed validation elsewhere, so the caller can still match it. */
function salvageRequestId(request: unknown): number | null {
  if (typeof request !== 'object' || request === null) return null;
  const id = (request as { requestId?: unknown }).requestId;
  return typeof id === 'number' && Number.isInteger(id) && id >= 0 ? id : null;
}
