import { z } from 'zod';
import { ATTRIBUTIONS, DETECTORS } from '../model/emissions-schema.ts';
import { formatIssue, toValidationIssue, type ValidationCode, type ValidationIssue } from '../model/index.ts';
import type { EmissionsAnalysis } from '../spectrum/emissions-analysis.ts';
import { SCAN_TAGS } from '../spectrum/spectrum-types.ts';
import { ITEM_STATUSES, VERDICT_STATUSES } from '../spectrum/verdict.ts';
import type { EmissionsOutcome } from './emissions-outcome.ts';

/**
 * Check a reply from the worker's emissions analysis before the page trusts it: a stale cached
 * worker script or a protocol change on one side only would otherwise surface as a blank chart or a
 * TypeError deep in a render. Structural only (types and column lengths): the numbers are the
 * worker's, nothing is recomputed here.
 */
export function readEmissionsReply(reply: unknown, requestId: number): EmissionsOutcome {
  const parsed = replySchema.safeParse(reply, { reportInput: true });
  if (!parsed.success) return malformed(requestId, parsed.error.issues.map(toValidationIssue));
  const value = parsed.data;
  if (value.requestId !== requestId) {
    return malformed(requestId, [{ path: 'requestId', code: 'invalid-value', message: `expected ${requestId}, got ${String(value.requestId)}` }]);
  }
  if (!value.ok) return { status: 'error', requestId, error: value.error };
  // zod hands back copies without the fields it was not told about: pass on the reply's own
  // analysis, whose every field the page reads was checked above.
  const { analysis } = reply as { analysis: EmissionsAnalysis };
  return { status: 'done', requestId, analysis, elapsedMs: value.elapsedMs, limitingModes: value.limitingModes ?? [] };
}

function malformed(requestId: number, issues: ValidationIssue[]): EmissionsOutcome {
  return {
    status: 'error',
    requestId,
    error: { kind: 'worker-failure', message: `the worker sent a malformed emissions reply: ${issues.map(formatIssue).join('; ')}`, issues },
  };
}

const float64 = z.instanceof(Float64Array, { message: 'expected a Float64Array' });
const detector = z.enum(DETECTORS);

const issueSchema = z.object({
  path: z.string(),
  code: z.custom<ValidationCode>((code) => typeof code === 'string', 'expected a string'),
  message: z.string(),
});

const pointSchema = z.object({
  frequencyHz: z.number(),
  levelDbuV: z.number(),
  limitDbuV: z.number(),
  marginDb: z.number(),
  series: z.string(),
  maskName: z.string(),
  conservative: z.boolean(),
});

const bandSchema = z.object({
  name: z.string(),
  startHz: z.number(),
  stopHz: z.number(),
  worst: pointSchema.optional(),
  pass: z.boolean().optional(),
  status: z.enum(ITEM_STATUSES),
  judgedPoints: z.number().int().nonnegative(),
  coveredPoints: z.number().int().nonnegative(),
  coveredFromHz: z.number().optional(),
  coveredToHz: z.number().optional(),
  reason: z.string(),
});

const reportSchema = z.object({
  targetMarginDb: z.number(),
  comparisons: z.array(
    z.object({
      series: z.string(),
      seriesDetector: detector,
      maskId: z.string(),
      maskName: z.string(),
      maskDetector: detector,
      conservative: z.boolean(),
      frequencyHz: float64,
      limitDbuV: float64,
      marginDb: float64,
    }),
  ),
  worst: pointSchema.optional(),
  bands: z.array(bandSchema),
  worstPeaks: z.array(pointSchema),
  failingRanges: z.array(z.object({ startHz: z.number(), stopHz: z.number(), worst: pointSchema })),
  verdict: z.object({ status: z.enum(VERDICT_STATUSES), items: z.array(bandSchema), judgedPoints: z.number().int().nonnegative(), reasons: z.array(z.string()) }),
  pass: z.boolean(),
  notes: z.array(z.string()),
});

const analysisSchema = z
  .object({
    input: z.enum(['scan', 'estimate']),
    frequencyHz: float64,
    predicted: z.array(z.object({ label: z.string(), detector, frequencyHz: float64, levelDbuV: float64 })),
    unfilteredCommonModeDbuV: float64.optional(),
    unfilteredDifferentialModeDbuV: float64.optional(),
    requiredAttenuationCmDb: float64.optional(),
    requiredAttenuationDmDb: float64.optional(),
    masks: z.array(z.object({ id: z.string(), name: z.string(), detector, origin: z.string().optional() })),
    report: reportSchema,
    notes: z.array(z.string()),
    scanPrediction: z
      .object({
        scanName: z.string(),
        tag: z.enum(SCAN_TAGS),
        attribution: z.enum(ATTRIBUTIONS).optional(),
        frequencyHz: float64,
        traces: z.array(z.object({ detector, scanDbuV: float64 })),
      })
      .optional(),
  })
  .superRefine((analysis, ctx) => {
    const n = analysis.frequencyHz.length;
    const check = (array: ArrayLike<number> | undefined, path: (string | number)[]): void => {
      if (array !== undefined && array.length !== n) ctx.addIssue({ code: 'custom', path, message: `has ${array.length} values, the frequency axis has ${n}` });
    };
    analysis.predicted.forEach((series, i) => check(series.levelDbuV, ['predicted', i, 'levelDbuV']));
    check(analysis.unfilteredCommonModeDbuV, ['unfilteredCommonModeDbuV']);
    check(analysis.unfilteredDifferentialModeDbuV, ['unfilteredDifferentialModeDbuV']);
    check(analysis.requiredAttenuationCmDb, ['requiredAttenuationCmDb']);
    check(analysis.requiredAttenuationDmDb, ['requiredAttenuationDmDb']);
    analysis.report.comparisons.forEach((comparison, i) => {
      check(comparison.limitDbuV, ['report', 'comparisons', i, 'limitDbuV']);
      check(comparison.marginDb, ['report', 'comparisons', i, 'marginDb']);
    });
    analysis.scanPrediction?.traces.forEach((trace, i) => check(trace.scanDbuV, ['scanPrediction', 'traces', i, 'scanDbuV']));
  });

const replySchema = z.discriminatedUnion('ok', [
  z.object({
    ok: z.literal(true),
    requestId: z.number(),
    analysis: analysisSchema,
    elapsedMs: z.number().nonnegative(),
    limitingModes: z.array(z.object({ mode: z.enum(['common mode', 'differential mode', 'both modes', 'not known']), reason: z.string() })).optional(),
  }),
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
