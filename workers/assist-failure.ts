import { formatIssue, type ValidationIssue } from '../src/model/index.ts';
import type { AssistFailure, AssistFailureKind } from './assist-protocol.ts';

/** A failure reply: what went wrong, with every validation issue in the message as well. */
export function failure(requestId: number | null, kind: AssistFailureKind, what: string, issues: readonly ValidationIssue[]): AssistFailure {
  const detail = issues.map(formatIssue).join('; ');
  return { ok: false, requestId, error: { kind, message: detail === '' ? what : `${what}: ${detail}`, issues } };
}
