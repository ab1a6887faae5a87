import { z } from 'zod';
import { ATTRIBUTIONS, DETECTORS } from '../src/model/emissions-schema.ts';
import type { ValidationIssue } from '../src/model/index.ts';
import type { EmissionsAnalysis } from '../src/spectrum/emissions-analysis.ts';
import type { LimitingMode } from '../src/report/limiting-mode.ts';
import { SCAN_TAGS } from '../src/spectrum/spectrum-types.ts';

/**
 * What crosses the worker boundary for an emissions analysis ("noise in, margin out"). The request
 * is validated on arrival like a file: the design through readDesign (in sweep-api.ts), the scan's
 * columns here (typed arrays of one length, frequencies positive and strictly rising, every value
 * finite), so the spectrum code never meets a NaN or a falling axis it was promised it would not.
 */

/** A scan can hold a million rows; more than this many traces is not a receiver export. */
const MAX_TRACES = 8;

// Typed as the Scan's own columns (any buffer), checked as a Float64Array of this realm.
const float64 = z.custom<Float64Array>((value) => value instanceof Float64Array, { message: 'expected a Float64Array' });

export const scanSchema = z
  .strictObject({
    name: z.string().min(1).max(300),
    tag: z.enum(SCAN_TAGS),
    frequencyHz: float64,
    traces: z
      .array(z.strictObject({ detector: z.enum(DETECTORS), levelDbuV: float64 }))
      .min(1, 'a scan needs at least one trace')
      .max(MAX_TRACES),
    /** What the importer left out and noted: carried along for the report, not used in the analysis. */
    rejected: z.array(z.strictObject({ line: z.number().int().nonnegative(), reason: z.string() })).default([]),
    notes: z.array(z.string()).default([]),
    /** The reader's warnings ("check the frequency unit …"): hints beside a verdict that is not a pass. */
    warnings: z.array(z.string().max(2000)).max(100).optional(),
  })
  .superRefine((scan, ctx) => {
    const f = scan.frequencyHz;
    const n = f.length;
    if (n === 0) {
      ctx.addIssue({ code: 'custom', path: ['frequencyHz'], message: 'a scan needs at least one point', params: { code: 'out-of-range' } });
      return;
    }
    // One pass each, stopping at the first bad value: a million-point scan is checked in milliseconds.
    for (let i = 0; i < n; i += 1) {
      const here = f[i]!;
      if (!(Number.isFinite(here) && here > 0)) {
        const code = Number.isFinite(here) ? 'out-of-range' : 'not-finite';
        ctx.addIssue({ code: 'custom', path: ['frequencyHz', i], message: `expected a positive finite frequency, got ${here}`, params: { code } });
        return;
      }
      if (i > 0 && !(here > f[i - 1]!)) {
        ctx.addIssue({
          code: 'custom',
          path: ['frequencyHz', i],
          message: `frequencies must rise: ${here} Hz after ${f[i - 1]!} Hz`,
          params: { code: 'invalid-value' },
        });
        return;
      }
    }
    scan.traces.forEach((trace, t) => {
      const levels = trace.levelDbuV;
      if (levels.length !== n) {
        ctx.addIssue({
          code: 'custom',
          path: ['traces', t, 'levelDbuV'],
          message: `has ${levels.length} values, the frequency axis has ${n}`,
          params: { code: 'invalid-value' },
        });
        return;
      }
      for (let i = 0; i < n; i += 1) {
        if (!Number.isFinite(levels[i]!)) {
          ctx.addIssue({
            code: 'custom',
            path: ['traces', t, 'levelDbuV', i],
            message: `expected a finite level, got ${levels[i]!}`,
            params: { code: 'not-finite' },
          });
          return;
        }
      }
    });
  });

/** How the page names a scan it has given the worker. */
export const scanIdSchema = z.string().min(1).max(100);

/** The worker keeps at most this many scans for later analyses; the oldest goes first. */
export const MAX_STORED_SCANS = 8;

export const storeScanRequestSchema = z.strictObject({ scanId: scanIdSchema, scan: scanSchema });
export type StoreScanRequest = z.input<typeof storeScanRequestSchema>;
export type StoreScanReply = { readonly ok: true; readonly stored: number } | { readonly ok: false; readonly message: string };

export const emissionsRequestSchema = z.strictObject({
  /** Chosen by the caller, rising; echoed back so a reply can be matched to its request. */
  requestId: z.number().int('a request id is a whole number').nonnegative('a request id is 0 or more'),
  /** A design document, validated by the worker exactly as a file would be. */
  design: z.unknown(),
  /**
   * The noise: an imported scan, one the worker was given earlier (storeScan: a million-row scan is
   * not copied across for every edit), or the design's own estimate (emissions.estimate).
   */
  noise: z.discriminatedUnion('kind', [
    z.strictObject({ kind: z.literal('estimate') }),
    z.strictObject({ kind: z.literal('scan'), scan: scanSchema }),
    z.strictObject({ kind: z.literal('stored-scan'), scanId: scanIdSchema }),
  ]),
  /** Overrides of the design's own emissions settings, for a what-if that is not saved in the design. */
  options: z
    .strictObject({
      targetMarginDb: z.number().finite().min(-40).max(60).optional(),
      attribution: z.enum(ATTRIBUTIONS).optional(),
      noiseFloorDbuV: z.number().finite().optional(),
      worstPeakCount: z.number().int().min(1).max(1000).optional(),
    })
    .optional(),
});

export type EmissionsRequest = z.input<typeof emissionsRequestSchema>;
export type EmissionsRequestOptions = NonNullable<EmissionsRequest['options']>;
/** The noise part of a request: what the page sends (a scan as the importer made it, or the estimate). */
export type EmissionsNoise = EmissionsRequest['noise'];

export interface EmissionsSuccess {
  readonly ok: true;
  readonly requestId: number;
  readonly analysis: EmissionsAnalysis;
  /** Time spent in the worker validating and analysing, in milliseconds. */
  readonly elapsedMs: number;
  /** Which mode limits each band of the margin report, in its order, so nobody enlarges the CM choke to fix a DM failure. */
  readonly limitingModes: readonly LimitingMode[];
}

/**
 * Why a request produced no analysis:
 * - invalid-request: the message itself was malformed, or asked for an estimate the design does not have;
 * - invalid-design: the design failed validation (issue paths name design fields, as in a file);
 * - engine-failure: the analysis threw on valid input, which is a defect to report.
 */
export type EmissionsFailureKind = 'invalid-request' | 'invalid-design' | 'engine-failure';

export interface EmissionsFailure {
  readonly ok: false;
  /** null when the request was too malformed to carry a usable id. */
  readonly requestId: number | null;
  readonly error: {
    readonly kind: EmissionsFailureKind;
    readonly message: string;
    readonly issues: readonly ValidationIssue[];
  };
}

export type EmissionsReply = EmissionsSuccess | EmissionsFailure;
