import type { z } from 'zod';
import type { Design } from './design.ts';
import { DESIGN_FORMAT, DESIGN_VERSION, designSchema } from './design-schema.ts';
import { migrateDesign } from './migrations.ts';
import { formatPath, ValidationError, type ValidationCode, type ValidationIssue } from './validation-error.ts';

export type ReadResult<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly error: ValidationError };

/**
 * Validate anything that claims to be a design (parsed JSON, a worker message, a URL payload).
 * Older versions are migrated first; newer or unknown versions are refused by name.
 */
export function readDesign(input: unknown): ReadResult<Design> {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    return fail([{ path: '', code: 'not-a-design', message: 'expected a JSON object' }]);
  }
  const record = input as Record<string, unknown>;
  if (record['format'] !== DESIGN_FORMAT) {
    return fail([
      { path: 'format', code: 'not-a-design', message: `expected "${DESIGN_FORMAT}", got ${JSON.stringify(record['format']) ?? 'nothing'}` },
    ]);
  }
  const migrated = migrateDesign(record);
  if (!migrated.ok) return migrated;
  const parsed = designSchema.safeParse(migrated.value, { reportInput: true });
  if (parsed.success) return { ok: true, value: parsed.data };
  return fail(parsed.error.issues.map(toValidationIssue));
}

/** Parse design JSON text; bad JSON is reported like any other validation problem. */
export function readDesignJson(text: string): ReadResult<Design> {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (cause) {
    return fail([{ path: '', code: 'bad-json', message: `not valid JSON (${(cause as Error).message})` }]);
  }
  return readDesign(data);
}

/** Like readDesign, but throws the ValidationError: for callers that have nothing better to do. */
export function requireDesign(input: unknown): Design {
  const result = readDesign(input);
  if (!result.ok) throw result.error;
  return result.value;
}

function fail(issues: ValidationIssue[]): { ok: false; error: ValidationError } {
  return { ok: false, error: new ValidationError('invalid design', issues) };
}

export const CURRENT_DESIGN_VERSION = DESIGN_VERSION;

/** Translate a zod issue into our stable codes and a message a person can act on. */
export function toValidationIssue(issue: z.core.$ZodIssue): ValidationIssue {
  const path = formatPath(issue.path);
  const custom = issue.code === 'custom' ? (issue.params as { code?: ValidationCode } | undefined)?.code : undefined;
  if (custom) return { path, code: custom, message: issue.message };
  switch (issue.code) {
    case 'invalid_type':
      return issue.input === undefined
        ? { path, code: 'missing-field', message: issue.expected === 'nonoptional' ? 'missing' : `missing: expected ${issue.expected}` }
        : { path, code: 'wrong-type', message: `expected ${issue.expected}, got ${describeValue(issue.input)}` };
    case 'unrecognized_keys':
      return {
        path,
        code: 'unknown-field',
        message: `unknown field${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}`,
      };
    case 'invalid_union':
      return { path, code: 'unknown-kind', message: unionMessage(issue) };
    case 'invalid_value': {
      const choices = issue.values.map((v) => JSON.stringify(v)).join(', ');
      // A required choice left out is missing, not a wrong value ("got undefined" helps nobody).
      return issue.input === undefined
        ? { path, code: 'missing-field', message: `missing: expected one of ${choices}` }
        : { path, code: 'invalid-value', message: `expected one of ${choices}, got ${describeValue(issue.input)}` };
    }
    case 'too_small':
    case 'too_big':
      return { path, code: 'out-of-range', message: issue.message };
    default:
      return { path, code: 'invalid-value', message: issue.message };
  }
}

function unionMessage(issue: z.core.$ZodIssueInvalidUnion): string {
  // zod reports a bad discriminator at the "kind" path with the kind itself as input.
  const input: unknown = issue.input;
  const kind = typeof input === 'object' && input !== null ? (input as { kind?: unknown }).kind : input;
  const options = (issue as { options?: unknown[] }).options;
  const known = Array.isArray(options) ? ` (known kinds: ${options.map(String).join(', ')})` : '';
  if (kind === undefined) return `missing "kind"${known}`;
  return `unknown kind ${JSON.stringify(kind)}${known}`;
}

function describeValue(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'a list';
  if (typeof value === 'string') return JSON.stringify(value.length > 40 ? `${value.slice(0, 40)}…` : value);
  if (typeof value === 'object') return 'an object';
  return String(value);
}
