/**
 * One problem found in data that entered from outside (file, URL, worker message, command line).
 * `path` names the field the way a person reads it: `stages[0].elements[2].part.capacitance`.
 */
export interface ValidationIssue {
  readonly path: string;
  readonly code: ValidationCode;
  readonly message: string;
}

/** Stable codes that tests and callers can match on; messages may be reworded. */
export type ValidationCode =
  | 'bad-json'
  | 'not-a-design'
  | 'unsupported-version'
  | 'missing-field'
  | 'unknown-field'
  | 'unknown-kind'
  | 'wrong-type'
  | 'bad-quantity'
  | 'not-finite'
  | 'out-of-range'
  | 'invalid-value'
  | 'duplicate-id'
  | 'bad-file';

export class ValidationError extends Error {
  readonly issues: readonly ValidationIssue[];
  constructor(what: string, issues: readonly ValidationIssue[]) {
    super(`${what}: ${issues.map(formatIssue).join('; ')}`);
    this.name = 'ValidationError';
    this.issues = issues;
  }
}

export function formatIssue(issue: ValidationIssue): string {
  return issue.path === '' ? issue.message : `${issue.path}: ${issue.message}`;
}

/** ['stages', 0, 'elements', 2, 'part'] -> "stages[0].elements[2].part" */
export function formatPath(path: readonly PropertyKey[]): string {
  let text = '';
  for (const key of path) {
    if (typeof key === 'number') text += `[${key}]`;
    else text += text === '' ? String(key) : `.${String(key)}`;
  }
  return text;
}
