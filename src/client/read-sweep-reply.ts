import { z } from 'zod';
import type { SweepResult } from '../engine/index.ts';
import { formatIssue, toValidationIssue, type ValidationCode, type ValidationIssue } from '../model/index.ts';
import type { SweepOutcome } from './sweep-outcome.ts';

/**
 * Check a reply from the sweep worker before the page trusts it. The worker is our own code, but a
 * stale cached worker script or a protocol change on one side only would otherwise show up as a
 * blank chart or a TypeError deep in a render; here it becomes one message naming the field.
 * The check is structural (types and lengths), not a re-run of the physics.
 */
export function readSweepReply(reply: unknown, requestId: number): SweepOutcome {
  const parsed = replySchema.safeParse(reply, { reportInput: true });
  if (!parsed.success) return malformed(requestId, parsed.error.issues.map(toValidationIssue));
  const value = parsed.data;
  if (value.requestId !== requestId) {
    return malformed(requestId, [
      { path: 'requestId', code: 'invalid-value', message: `expected ${requestId}, got ${String(value.requestId)}` },
    ]);
  }
  if (!value.ok) return { status: 'error', requestId, error: value.error };
  // zod returns copies without the fields it was not told about, so hand on the reply's own result:
  // the schema checked every field the page reads, and the engine's types describe the rest.
  const { result } = reply as { result: SweepResult };
  return { status: 'done', requestId, result, elapsedMs: value.elapsedMs };
}

function malformed(requestId: number, issues: ValidationIssue[]): SweepOutcome {
  return {
    status: 'error',
    requestId,
    error: { kind: 'worker-failure', message: `the sweep worker sent a malformed reply: ${issues.map(formatIssue).join('; ')}`, issues },
  };
}

const float64 = z.instanceof(Float64Array, { message: 'expected a Float64Array' });
const bytes = z.instanceof(Uint8Array, { message: 'expected a Uint8Array' });

// Codes are informative: a code this page does not know still reads as a string.
const issueSchema = z.object({
  path: z.string(),
  code: z.custom<ValidationCode>((code) => typeof code === 'string', 'expected a string'),
  message: z.string(),
});

const resultSchema = z
  .object({
    designName: z.string(),
    frequencyHz: float64,
    pointOrigin: bytes,
    pointFlags: bytes,
    columns: z.record(z.string(), float64),
    transfers: z.record(z.string(), z.object({ re: float64, im: float64 })),
    elements: z.array(z.object({ id: z.string(), label: z.string() })),
    resonances: z.array(
      z.object({ kind: z.enum(['element', 'response']), frequencyHz: z.number(), type: z.enum(['series', 'parallel', 'peak', 'notch']) }),
    ),
    warnings: z.array(z.object({ code: z.string(), message: z.string() })),
  })
  .superRefine((result, ctx) => {
    const n = result.frequencyHz.length;
    const check = (array: ArrayLike<number>, path: (string | number)[]): void => {
      if (array.length !== n) ctx.addIssue({ code: 'custom', path, message: `has ${array.length} values, the frequency axis has ${n}` });
    };
    check(result.pointOrigin, ['pointOrigin']);
    check(result.pointFlags, ['pointFlags']);
    for (const [id, column] of Object.entries(result.columns)) check(column, ['columns', id]);
  });

const replySchema = z.discriminatedUnion('ok', [
  z.object({ ok: z.literal(true), requestId: z.number(), result: resultSchema, elapsedMs: z.number().nonnegative() }),
  z.object({
    ok: z.literal(false),
    requestId: z.number().nullable(),
    error: z.object({
      kind: z.enum(['invalid-request', 'invalid-design', 'engine-failure']),
      message: z.string(),
      issues: z.array(issueSchema),
    }),
  }),
]);
