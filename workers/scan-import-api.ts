import * as Comlink from 'comlink';
import { z } from 'zod';
import { FREQUENCY_UNITS } from '../src/io/frequency-unit.ts';
import type { TableDelimiter } from '../src/io/impedance-table-csv.ts';
import { readScanTextWithProgress, type ScanReadError } from '../src/io/scan-csv.ts';
import { decodeText } from '../src/io/text-bytes.ts';
import { detectMeasurementKind, type MeasurementKind, readMeasurement } from '../src/io/measurement-file.ts';
import { MEASUREMENT_FIXTURES } from '../src/io/touchstone.ts';
import { formatLineIssue } from '../src/io/text-issues.ts';
import type { MeasuredImpedance } from '../src/model/index.ts';
import { DETECTORS } from '../src/model/emissions-schema.ts';
import { formatIssue, toValidationIssue } from '../src/model/index.ts';
import { LEVEL_UNIT_NAMES } from '../src/spectrum/level-units.ts';
import { SCAN_TAGS, type Scan } from '../src/spectrum/spectrum-types.ts';

/**
 * The object the scan-import worker exposes: a scan file's bytes (or text) in, a Scan (or the
 * reasons there is none) out. Bytes are decoded here by the one UTF-8 reader the command line uses too. It holds no DOM and no state, so tests call it directly or over a MessageChannel.
 *
 * It never sees the design being edited: an import returns a new Scan or an error and cannot change
 * anything else, so a failed import leaves the current design as it was. Bad input comes back as
 * `{ ok: false }`, never as a throw (which would reach the page as an opaque rejected promise).
 */

const DELIMITERS = [',', ';', '\t', 'whitespace'] as const satisfies readonly TableDelimiter[];

export const scanImportRequestSchema = z
  .strictObject({
    /** The file's bytes as the page read them (decoded here as UTF-8, or refused), or text already decoded (the demo scan). */
    bytes: z.custom<Uint8Array>((value) => value instanceof Uint8Array, { message: 'expected a Uint8Array' }).optional(),
    text: z.string().optional(),
    options: z
      .strictObject({
        name: z.string().min(1).max(200).optional(),
        tag: z.enum(SCAN_TAGS).optional(),
        frequencyUnit: z.enum(FREQUENCY_UNITS).optional(),
        levelUnit: z.enum(LEVEL_UNIT_NAMES).optional(),
        transferImpedanceOhm: z.number().positive('a transfer impedance is a positive number of ohms').optional(),
        detectors: z.array(z.enum(DETECTORS)).min(1).max(DETECTORS.length).optional(),
        delimiter: z.enum(DELIMITERS).optional(),
      })
      .optional(),
  })
  .refine((request) => (request.bytes === undefined) !== (request.text === undefined), { message: 'give the file as bytes or as text, not both' });

export type ScanImportRequest = z.input<typeof scanImportRequestSchema>;
export type ScanImportOptions = NonNullable<ScanImportRequest['options']>;

export interface ScanImportSuccess {
  readonly ok: true;
  readonly scan: Scan;
  /** Time spent in the worker validating and reading, in milliseconds. */
  readonly elapsedMs: number;
}

export interface ScanImportFailure {
  readonly ok: false;
  /** Why nothing usable came out, with the lines rejected on the way and the reader's notes. */
  readonly error: ScanReadError;
}

export type ScanImportReply = ScanImportSuccess | ScanImportFailure;

/** In the worker this is a Comlink proxy of the page's callback: calling it posts a message. */
export type ScanImportProgress = (fractionDone: number) => unknown;

export const scanImportApi = {
  /** A measured part's file, read as the command line reads it (importMeasuredPart below). */
  importMeasuredPart(request: unknown): MeasuredPartReply {
    return importMeasuredPart(request);
  },

  importScan(request: unknown, onProgress?: ScanImportProgress): ScanImportReply {
    const started = performance.now();
    try {
      if (onProgress !== undefined && typeof onProgress !== 'function') {
        return failure('invalid scan import request: onProgress: expected a function');
      }
      const parsed = scanImportRequestSchema.safeParse(request, { reportInput: true });
      if (!parsed.success) {
        const detail = parsed.error.issues.map((issue) => formatIssue(toValidationIssue(issue))).join('; ');
        return failure(`invalid scan import request: ${detail}`);
      }
      const { bytes, options } = parsed.data;
      let text = parsed.data.text ?? '';
      if (bytes !== undefined) {
        const decoded = decodeText(bytes);
        if (!decoded.ok) return failure(decoded.error.message);
        text = decoded.text;
      }
      let read: ReturnType<typeof readScanTextWithProgress>;
      try {
        read = readScanTextWithProgress(text, options ?? {}, onProgress && fireAndForget(onProgress));
      } catch (cause) {
        // The reader returns problems as results; a throw here is a defect to report.
        const message = cause instanceof Error ? cause.message : String(cause);
        return failure(`the scan import failed: ${message}`);
      }
      if (!read.ok) return { ok: false, error: read.error };
      const { scan } = read;
      // The axis and every trace share one ArrayBuffer: moving it avoids copying megabytes.
      return Comlink.transfer({ ok: true, scan, elapsedMs: performance.now() - started }, [scan.frequencyHz.buffer]);
    } finally {
      releaseRemote(onProgress);
    }
  },
};

export type ScanImportApi = typeof scanImportApi;

/** A measured part's file: its bytes, its name (the extension says Touchstone), and how it was read. */
export const measuredPartRequestSchema = z.strictObject({
  bytes: z.custom<Uint8Array>((value) => value instanceof Uint8Array, { message: 'expected a Uint8Array' }),
  name: z.string().min(1).max(260),
  /** Touchstone two-ports only: how the part sat between the ports (a one-port is a reflection). */
  fixture: z.enum(MEASUREMENT_FIXTURES).optional(),
  /** Tables only: the frequency unit when the header names none. */
  frequencyUnit: z.enum(FREQUENCY_UNITS).optional(),
});
export type MeasuredPartRequest = z.input<typeof measuredPartRequestSchema>;

export type MeasuredPartReply =
  | { readonly ok: true; readonly part: MeasuredImpedance; readonly rejected: readonly string[]; readonly notes: readonly string[]; readonly kind: MeasurementKind }
  | { readonly ok: false; readonly message: string; readonly issues: readonly string[] };

/**
 * Read a measured part (a |Z| table or a Touchstone file) exactly as `chokepoint measured-part` does
 * (src/io/measurement-file.ts): lines it cannot use are left out and listed, the file is refused when
 * no usable table remains.
 */
export function importMeasuredPart(request: unknown): MeasuredPartReply {
  const parsed = measuredPartRequestSchema.safeParse(request, { reportInput: true });
  if (!parsed.success) return { ok: false, message: `invalid measured-part request: ${parsed.error.issues.map((issue) => formatIssue(toValidationIssue(issue))).join('; ')}`, issues: [] };
  const { bytes, name, fixture, frequencyUnit } = parsed.data;
  const decoded = decodeText(bytes);
  if (!decoded.ok) return { ok: false, message: decoded.error.message, issues: [] };
  const kind = detectMeasurementKind(name, decoded.text);
  try {
    const reading = readMeasurement(decoded.text, { kind, path: name, ...(fixture ? { fixture } : {}), ...(frequencyUnit ? { frequencyUnit } : {}) });
    if (!reading.ok) return { ok: false, message: `${name} is not a measurement this program can use`, issues: reading.issues.map(formatLineIssue) };
    return { ok: true, part: reading.part, rejected: reading.rejected.map(formatLineIssue), notes: reading.notes.map(formatLineIssue), kind };
  } catch (cause) {
    return { ok: false, message: `the file could not be read: ${cause instanceof Error ? cause.message : String(cause)}`, issues: [] };
  }
}

function failure(message: string): ScanImportFailure {
  return { ok: false, error: { message, rejected: [], notes: [] } };
}

/** Call the page's callback without waiting for it; a page that has gone away is not an error here. */
function fireAndForget(onProgress: ScanImportProgress): (fractionDone: number) => void {
  return (fractionDone) => {
    const answer = onProgress(fractionDone);
    if (typeof answer === 'object' && answer !== null && 'then' in answer) Promise.resolve(answer).catch(() => undefined);
  };
}

/** Close the channel of a Comlink-proxied callback once the import is over; a plain function has none. */
function releaseRemote(onProgress: unknown): void {
  if (typeof onProgress !== 'function') return;
  const release: unknown = (onProgress as unknown as Record<typeof Comlink.releaseProxy, unknown>)[Comlink.releaseProxy];
  if (typeof release === 'function') (release as () => void)();
}
