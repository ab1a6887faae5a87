import { z } from 'zod';
import type { ValidationIssue } from '../src/model/index.ts';
import type { CsvFile } from '../src/report/report-csv.ts';
import { safetyCheckOptionsSchema, type SafetyReport } from '../src/safety/index.ts';
import { scanIdSchema } from './emissions-protocol.ts';

/**
 * The safety checks and the hand-over report, asked of the engine's worker by the page. Validated
 * on arrival like a file: designs by readDesign, the rest here.
 */

export const safetyRequestSchema = z.strictObject({
  requestId: z.number().int().nonnegative(),
  design: z.unknown(),
  options: safetyCheckOptionsSchema.optional(),
});
export type SafetyRequest = z.input<typeof safetyRequestSchema>;

export type SafetyReply =
  | { readonly ok: true; readonly requestId: number; readonly report: SafetyReport }
  | { readonly ok: false; readonly requestId: number | null; readonly error: { readonly message: string; readonly issues: readonly ValidationIssue[] } };

export const reportRequestSchema = z.strictObject({
  design: z.unknown(),
  /** The noise: the design's estimate, or a scan the worker holds (storeScan); absent: the estimate if any. */
  noise: z.discriminatedUnion('kind', [z.strictObject({ kind: z.literal('estimate') }), z.strictObject({ kind: z.literal('stored-scan'), scanId: scanIdSchema })]).optional(),
  variants: z.array(z.strictObject({ variantId: z.string().min(1).max(20), name: z.string().min(1).max(200), design: z.unknown() })).max(24).default([]),
  designVariantName: z.string().max(200).optional(),
  origin: z.strictObject({
    version: z.string().max(40),
    generatedAt: z.string().max(40),
    scanFile: z.string().max(300).optional(),
  }),
});
export type ReportPageRequest = z.input<typeof reportRequestSchema>;

export type ReportReply =
  | { readonly ok: true; readonly html: string; readonly csv: readonly CsvFile[]; readonly designHash: string }
  | { readonly ok: false; readonly error: { readonly message: string; readonly issues: readonly ValidationIssue[] } };
