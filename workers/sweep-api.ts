import * as Comlink from 'comlink';
import { sweepDesign, type SweepResult, SweepScratch, transferables } from '../src/engine/index.ts';
import { formatIssue, readDesign, toValidationIssue, type ValidationIssue } from '../src/model/index.ts';
import { analyzeEmissions, type EmissionsAnalysis, type NoiseInput } from '../src/spectrum/emissions-analysis.ts';
import { estimateIssues } from '../src/spectrum/noise-estimate.ts';
import type { Scan } from '../src/spectrum/spectrum-types.ts';
import {
  type EmissionsFailure,
  type EmissionsFailureKind,
  type EmissionsReply,
  emissionsRequestSchema,
  MAX_STORED_SCANS,
  type StoreScanReply,
  storeScanRequestSchema,
} from './emissions-protocol.ts';
import { type SweepFailure, type SweepFailureKind, type SweepReply, sweepRequestSchema } from './sweep-protocol.ts';
import { collectTransferables } from './transferables.ts';
import { describeSource, DISCHARGE_REQUIREMENTS, formatFigure, LEAKAGE_LIMITS, runSafetyChecks } from '../src/safety/index.ts';
import { limitingModeOfBand } from '../src/report/limiting-mode.ts';
import { reportRequestSchema, type ReportReply, type SafetyReply, safetyRequestSchema } from './checks-protocol.ts';

/**
 * Scans the page has handed over once, by the page's id, so that each later analysis names the scan
 * instead of copying a million rows across again. Oldest first; at most MAX_STORED_SCANS.
 */
const storedScans = new Map<string, Scan>();

/**
 * The last few designs validated, by their JSON text: the page asks for a sweep, an analysis and the
 * safety checks of one design in a row, and validating it once is enough.
 */
const validated = new Map<string, ReturnType<typeof readDesign>>();
const VALIDATED_KEPT = 8;

function readDesignOnce(design: unknown): ReturnType<typeof readDesign> {
  let key: string;
  try {
    key = JSON.stringify(design);
  } catch {
    return readDesign(design);
  }
  const known = validated.get(key);
  if (known) return known;
  const read = readDesign(design);
  validated.set(key, read);
  while (validated.size > VALIDATED_KEPT) validated.delete(validated.keys().next().value!);
  return read;
}

/** The kernel's working memory, kept from one sweep to the next: every edit sweeps again (sweep-scratch.ts). */
const scratch = new SweepScratch();

/**
 * The object the sweep worker exposes. It holds no DOM and no state but the stored scans, so tests
 * call it directly or over a MessageChannel. Bad input comes back as `{ ok: false }`: a throw would
 * surface on the main thread as an opaque rejected promise without field paths.
 */
export const sweepApi = {
  /** Keep a scan for later analyses (noise `{ kind: 'stored-scan', scanId }`). */
  storeScan(request: unknown): StoreScanReply {
    const parsed = storeScanRequestSchema.safeParse(request, { reportInput: true });
    if (!parsed.success) return { ok: false, message: `invalid scan: ${parsed.error.issues.map((issue) => formatIssue(toValidationIssue(issue))).join('; ')}` };
    storedScans.delete(parsed.data.scanId);
    storedScans.set(parsed.data.scanId, parsed.data.scan);
    while (storedScans.size > MAX_STORED_SCANS) storedScans.delete(storedScans.keys().next().value!);
    return { ok: true, stored: storedScans.size };
  },

  forgetScan(scanId: unknown): boolean {
    return typeof scanId === 'string' && storedScans.delete(scanId);
  },

  /** The safety and practical checks (docs/safety.md). */
  safetyChecks(request: unknown): SafetyReply {
    return safetyChecks(request);
  },

  /**
   * The names the page shows for the safety choices (listed leakage limits and discharge requirements):
   * what each is for, its value, its standard and clause, and how sure the value is, in plain words.
   */
  safetyChoiceLabels(): Record<string, string> {
    const labels: Record<string, string> = {};
    for (const limit of LEAKAGE_LIMITS) {
      const fault = limit.singleFaultA === undefined ? '' : `, ${formatFigure(limit.singleFaultA, 'A')} single fault`;
      labels[limit.id] = `${limit.name}: ${formatFigure(limit.normalConditionA, 'A')}${fault} (${describeSource(limit.source)})`;
    }
    for (const requirement of DISCHARGE_REQUIREMENTS) {
      if (requirement.id !== undefined) labels[requirement.id] = `${requirement.name}${requirement.source ? ` (${describeSource(requirement.source)})` : ''}`;
    }
    return labels;
  },

  /** The printable hand-over report and its CSV files (docs/report.md). */
  report(request: unknown): Promise<ReportReply> {
    return report(request);
  },

  /** Load the report's code now (the page asks once it has drawn), so a report works offline later. */
  async loadReportCode(): Promise<void> {
    await import('../src/report/make-report.ts');
  },

  /**
   * The storage of a sweep result the page no longer shows or keeps, handed back so that a later sweep
   * writes into it rather than into fresh memory (src/engine/sweep/sweep-scratch.ts).
   */
  reuseSweepBuffer(buffer: unknown): boolean {
    if (!(buffer instanceof ArrayBuffer)) return false;
    scratch.reuseResultBuffer(buffer);
    return true;
  },

  sweep(request: unknown): SweepReply {
    const started = performance.now();
    const parsed = sweepRequestSchema.safeParse(request, { reportInput: true });
    if (!parsed.success) {
      const issues = parsed.error.issues.map(toValidationIssue);
      return failure(salvageRequestId(request), 'invalid-request', 'invalid sweep request', issues);
    }
    const { requestId, design, options } = parsed.data;

    const read = readDesignOnce(design);
    if (!read.ok) return failure(requestId, 'invalid-design', 'invalid design', read.error.issues);

    let result: SweepResult;
    try {
      result = sweepDesign(read.value, { refine: options?.refine ?? true, scratch });
    } catch (cause) {
      const message = cause instanceof Error ? cause.message : String(cause);
      return failure(requestId, 'engine-failure', `the sweep failed: ${message}`, []);
    }
    const elapsedMs = performance.now() - started;
    // The columns share a few ArrayBuffers; moving them avoids copying megabytes per sweep.
    return Comlink.transfer({ ok: true, requestId, result, elapsedMs }, transferables(result));
  },

  /**
   * Predict the levels with the design's filter and judge them against its limit masks: the
   * margin report of docs/limits.md, from a scan (scaled by the filter's in-circuit transfer) or
   * from the design's noise estimate. The same analysis as `chokepoint check`.
   */
  analyzeEmissions(request: unknown): EmissionsReply {
    const started = performance.now();
    const parsed = emissionsRequestSchema.safeParse(request, { reportInput: true });
    if (!parsed.success) {
      const issues = parsed.error.issues.map(toValidationIssue);
      return emissionsFailure(salvageRequestId(request), 'invalid-request', 'invalid emissions request', issues);
    }
    const { requestId, design, noise, options } = parsed.data;

    const read = readDesignOnce(design);
    if (!read.ok) return emissionsFailure(requestId, 'invalid-design', 'invalid design', read.error.issues);
    const estimate = read.value.emissions?.estimate;

    let input: NoiseInput;
    if (noise.kind === 'scan') {
      const scan: Scan = noise.scan;
      input = { kind: 'scan', scan };
    } else if (noise.kind === 'stored-scan') {
      const scan = storedScans.get(noise.scanId);
      if (!scan) {
        return emissionsFailure(requestId, 'invalid-request', 'no such scan', [
          { path: 'noise.scanId', code: 'invalid-value', message: `the worker holds no scan "${noise.scanId}"; store it first` },
        ]);
      }
      input = { kind: 'scan', scan };
    } else {
      if (!estimate || (!estimate.commonMode && !estimate.differentialMode)) {
        return emissionsFailure(requestId, 'invalid-request', 'no noise to analyse', [
          { path: 'noise', code: 'invalid-value', message: 'the design has no noise estimate (emissions.estimate); send a scan instead' },
        ]);
      }
      const problems = estimateIssues(estimate);
      if (problems.length > 0) {
        const issues = problems.map(
          (problem): ValidationIssue => ({ path: `emissions.estimate.${problem.path.join('.')}`, code: 'invalid-value', message: problem.message }),
        );
        return emissionsFailure(requestId, 'invalid-design', 'the noise estimate cannot be evaluated', issues);
      }
      input = { kind: 'estimate' };
    }

    let analysis: EmissionsAnalysis;
    try {
      analysis = analyzeEmissions(read.value, input, {
        ...(options?.targetMarginDb === undefined ? {} : { targetMarginDb: options.targetMarginDb }),
        ...(options?.attribution === undefined ? {} : { attribution: options.attribution }),
        ...(options?.noiseFloorDbuV === undefined ? {} : { noiseFloorDbuV: options.noiseFloorDbuV }),
        ...(options?.worstPeakCount === undefined ? {} : { worstPeakCount: options.worstPeakCount }),
      });
    } catch (cause) {
      const message = cause instanceof Error ? cause.message : String(cause);
      return emissionsFailure(requestId, 'engine-failure', `the emissions analysis failed: ${message}`, []);
    }
    const elapsedMs = performance.now() - started;
    // A million-point scan makes tens of columns: move their buffers rather than copy them.
    const limitingModes = analysis.report.bands.map((band) => limitingModeOfBand(analysis, band));
    const reply = { ok: true as const, requestId, analysis, elapsedMs, limitingModes };
    // A stored scan's own columns appear in the analysis; moving them would empty the worker's copy.
    const kept = noise.kind === 'stored-scan' && input.kind === 'scan' ? new Set(collectTransferables(input.scan)) : new Set<ArrayBuffer>();
    return Comlink.transfer(reply, collectTransferables(analysis).filter((buffer) => !kept.has(buffer)));
  },
};

export type SweepApi = typeof sweepApi;

/** The safety checks of a design (docs/safety.md), as `chokepoint safety` runs them. */
function safetyChecks(request: unknown): SafetyReply {
  const parsed = safetyRequestSchema.safeParse(request, { reportInput: true });
  if (!parsed.success) {
    const issues = parsed.error.issues.map(toValidationIssue);
    return { ok: false, requestId: salvageRequestId(request), error: { message: `invalid safety request: ${issues.map(formatIssue).join('; ')}`, issues } };
  }
  const read = readDesignOnce(parsed.data.design);
  if (!read.ok) return { ok: false, requestId: parsed.data.requestId, error: { message: 'invalid design', issues: read.error.issues } };
  try {
    return { ok: true, requestId: parsed.data.requestId, report: runSafetyChecks(read.value, parsed.data.options ?? {}) };
  } catch (cause) {
    return { ok: false, requestId: parsed.data.requestId, error: { message: `the safety checks failed: ${cause instanceof Error ? cause.message : String(cause)}`, issues: [] } };
  }
}

/**
 * The hand-over report (docs/report.md), made exactly as `chokepoint report` makes it. The report's
 * code (the SVG drawings, the HTML, the hashes) loads on first use: a quarter of this worker that the
 * first plot does not need (the page loads it once it has drawn, so a report works offline).
 */
async function report(request: unknown): Promise<ReportReply> {
  const parsed = reportRequestSchema.safeParse(request, { reportInput: true });
  if (!parsed.success) {
    const issues = parsed.error.issues.map(toValidationIssue);
    return { ok: false, error: { message: `invalid report request: ${issues.map(formatIssue).join('; ')}`, issues } };
  }
  const { design, noise, variants, designVariantName, origin } = parsed.data;
  const read = readDesign(design);
  if (!read.ok) return { ok: false, error: { message: 'invalid design', issues: read.error.issues } };
  const others = [];
  for (const variant of variants) {
    const other = readDesign(variant.design);
    if (!other.ok) return { ok: false, error: { message: `variant “${variant.name}” is not a valid design`, issues: other.error.issues } };
    others.push({ variantId: variant.variantId, name: variant.name, design: other.value });
  }
  let noiseInput: NoiseInput | undefined;
  if (noise?.kind === 'stored-scan') {
    const scan = storedScans.get(noise.scanId);
    if (!scan) return { ok: false, error: { message: `the worker holds no scan "${noise.scanId}"`, issues: [] } };
    noiseInput = { kind: 'scan', scan };
  } else if (noise?.kind === 'estimate') noiseInput = { kind: 'estimate' };
  try {
    const { makeReport } = await import('../src/report/make-report.ts');
    const made = makeReport({
      design: read.value,
      ...(noiseInput ? { noise: noiseInput } : {}),
      variants: others,
      ...(designVariantName ? { designVariantName } : {}),
      origin: { program: 'chokepoint', version: origin.version, generatedAt: origin.generatedAt, ...(origin.scanFile ? { scanFile: origin.scanFile } : {}) },
    });
    return { ok: true, html: made.html, csv: made.csv, designHash: made.data.designHash };
  } catch (cause) {
    return { ok: false, error: { message: `the report could not be made: ${cause instanceof Error ? cause.message : String(cause)}`, issues: [] } };
  }
}


function failure(requestId: number | null, kind: SweepFailureKind, what: string, issues: readonly ValidationIssue[]): SweepFailure {
  const detail = issues.map(formatIssue).join('; ');
  return { ok: false, requestId, error: { kind, message: detail === '' ? what : `${what}: ${detail}`, issues } };
}

function emissionsFailure(requestId: number | null, kind: EmissionsFailureKind, what: string, issues: readonly ValidationIssue[]): EmissionsFailure {
  const detail = issues.map(formatIssue).join('; ');
  return { ok: false, requestId, error: { kind, message: detail === '' ? what : `${what}: ${detail}`, issues } };
}

/** Echo the id of a request that failed validation elsewhere, so the caller can still match it. */
function salvageRequestId(request: unknown): number | null {
  if (typeof request !== 'object' || request === null) return null;
  const id = (request as { requestId?: unknown }).requestId;
  return typeof id === 'number' && Number.isInteger(id) && id >= 0 ? id : null;
}
