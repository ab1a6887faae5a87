import * as Comlink from 'comlink';
import { z } from 'zod';
import { DETECTORS } from '../model/emissions-schema.ts';
import type { MeasuredImpedance } from '../model/design.ts';
import { SCAN_TAGS } from '../spectrum/spectrum-types.ts';
import type { MeasuredPartReply, MeasuredPartRequest, ScanImportApi, ScanImportFailure, ScanImportOptions, ScanImportReply, ScanImportRequest } from '../../workers/scan-import-api.ts';

/**
 * The main-thread side of the scan-import worker: send a file's bytes (or text), get a Scan or the
 * reasons there is none, with progress while a large file is read.
 *
 * An import cannot disturb the design being edited: the client sends only the file and the reading
 * options, and what comes back is a new Scan or an error. Neither carries nor changes a design, so a
 * failed import leaves the current design exactly as it was; the caller decides what to do with a
 * scan that did read.
 */

/** The worker as the client calls it: a `Remote<ScanImportApi>` fits, and so does any test double. */
export interface ScanImportRemote {
  importScan(request: ScanImportRequest, onProgress?: (fractionDone: number) => void): Promise<unknown>;
  importMeasuredPart?(request: MeasuredPartRequest): Promise<unknown>;
}

export class ScanImportClient {
  private readonly pending = new Set<(reply: ScanImportReply) => void>();
  private closed = false;

  constructor(
    private readonly remote: ScanImportRemote,
    /** Called once by dispose(), e.g. to terminate the worker. */
    private readonly onDispose: () => void = () => {},
  ) {}

  /**
   * Read a scan in the worker: a file's bytes (moved to the worker, not copied: the caller gives them
   * up) or text already decoded. `onProgress` is told rising fractions of the work done and, when the
   * import succeeds, 1 before the promise resolves; nothing after. It never rejects: a worker that
   * cannot answer or sends a malformed reply gives `{ ok: false }` as well.
   */
  importScan(content: string | Uint8Array, options?: ScanImportOptions, onProgress?: (fractionDone: number) => void): Promise<ScanImportReply> {
    if (this.closed) return Promise.resolve(failure('the scan import client is closed'));
    return new Promise<ScanImportReply>((resolve) => {
      let settled = false;
      let last = 0;
      const tell = (fraction: number): void => {
        if (!onProgress || settled || !(fraction > last)) return;
        last = Math.min(1, fraction);
        try {
          onProgress(last);
        } catch {
          // Progress is advisory; the import goes on.
        }
      };
      const finish = (reply: ScanImportReply): void => {
        if (settled) return;
        if (reply.ok) tell(1);
        settled = true;
        this.pending.delete(finish);
        resolve(reply);
      };
      this.pending.add(finish);
      const file = typeof content === 'string' ? { text: content } : { bytes: content };
      const request: ScanImportRequest = options ? { ...file, options } : file;
      if (typeof content !== 'string') Comlink.transfer(request, [content.buffer]);
      // Progress messages travel on the proxy's own channel, so one may arrive after the reply:
      // `tell` drops it then, and `finish` has already said 1.
      this.remote.importScan(request, onProgress ? Comlink.proxy(tell) : undefined).then(
        (reply) => finish(readScanImportReply(reply)),
        (cause: unknown) => {
          const reason = cause instanceof Error ? cause.message : String(cause);
          finish(failure(`the scan import worker did not answer: ${reason}`));
        },
      );
    });
  }

  /**
   * Read a measured part's file (a |Z| table or a Touchstone file) in the worker, as the command line
   * reads it. Never rejects: a malformed reply or a worker that cannot answer is a refusal with a reason.
   */
  async importMeasuredPart(bytes: Uint8Array, name: string, options: Pick<MeasuredPartRequest, 'fixture' | 'frequencyUnit'> = {}): Promise<MeasuredPartReply> {
    if (this.closed || !this.remote.importMeasuredPart) return { ok: false, message: 'the file reader is not available', issues: [] };
    try {
      const reply = await this.remote.importMeasuredPart(Comlink.transfer({ bytes, name, ...options }, [bytes.buffer]));
      const parsed = measuredReplySchema.safeParse(reply);
      if (!parsed.success) return { ok: false, message: 'the file reader sent a malformed reply', issues: [] };
      if (!parsed.data.ok) return parsed.data;
      // The part itself is checked where it enters the design: the store validates the document.
      return { ...parsed.data, part: (reply as { part: MeasuredImpedance }).part };
    } catch (cause) {
      return { ok: false, message: `the file reader did not answer: ${cause instanceof Error ? cause.message : String(cause)}`, issues: [] };
    }
  }

  /** The worker can no longer answer (it failed to load or crashed): end every pending import with this message. */
  failAll(message: string): void {
    for (const finish of [...this.pending]) finish(failure(message));
  }

  /** Stop: pending imports end as failures and later ones fail at once. */
  dispose(): void {
    if (this.closed) return;
    this.closed = true;
    this.failAll('the scan import client is closed');
    this.onDispose();
  }
}

/**
 * The app's scan-import client: one module worker that reads scan files, started on first use (or
 * by `start()`), so that loading its script does not compete with the page's first plot.
 */
export function createScanImportWorkerClient(): ScanImportClient & { start(): void } {
  let worker: Worker | undefined;
  let remote: Comlink.Remote<ScanImportApi> | undefined;
  const started = (): Comlink.Remote<ScanImportApi> => {
    if (remote) return remote;
    worker = new Worker(new URL('../../workers/scan-import.worker.ts', import.meta.url), { type: 'module', name: 'chokepoint-scan-import' });
    remote = Comlink.wrap<ScanImportApi>(worker);
    // Without these, a worker that fails to load leaves every import pending forever.
    worker.addEventListener('error', (event) => {
      client.failAll(`the scan import worker stopped: ${event.message || 'its script could not be loaded'}`);
    });
    worker.addEventListener('messageerror', () => {
      client.failAll('the scan import worker sent a message that could not be read');
    });
    return remote;
  };
  const lazyRemote: ScanImportRemote = {
    importScan: (request, onProgress) => started().importScan(request, onProgress),
    importMeasuredPart: (request) => started().importMeasuredPart(request),
  };
  const client = Object.assign(new ScanImportClient(lazyRemote, () => worker?.terminate()), { start: () => void started() });
  return client;
}

/**
 * Check a reply before the page trusts it: a stale cached worker script would otherwise show up as
 * a TypeError deep in a chart. Structural only (types and lengths).
 */
export function readScanImportReply(reply: unknown): ScanImportReply {
  const parsed = replySchema.safeParse(reply);
  if (parsed.success) return parsed.data;
  const detail = parsed.error.issues.map((issue) => `${issue.path.map(String).join('.') || 'reply'}: ${issue.message}`).join('; ');
  return failure(`the scan import worker sent a malformed reply: ${detail}`);
}

function failure(message: string): ScanImportFailure {
  return { ok: false, error: { message, rejected: [], notes: [] } };
}

const measuredReplySchema = z.discriminatedUnion('ok', [
  z.object({ ok: z.literal(true), part: z.object({ kind: z.literal('measured') }).passthrough(), rejected: z.array(z.string()), notes: z.array(z.string()), kind: z.enum(['impedance-table', 'touchstone']) }),
  z.object({ ok: z.literal(false), message: z.string(), issues: z.array(z.string()) }),
]);

const float64 = z.instanceof(Float64Array, { message: 'expected a Float64Array' });
const rejectedSchema = z.object({ line: z.number().int().nonnegative(), reason: z.string() });

const scanSchema = z
  .object({
    name: z.string(),
    tag: z.enum(SCAN_TAGS),
    frequencyHz: float64,
    traces: z.array(z.object({ detector: z.enum(DETECTORS), levelDbuV: float64 })).min(1),
    rejected: z.array(rejectedSchema),
    notes: z.array(z.string()),
    warnings: z.array(z.string()).optional(),
  })
  .superRefine((scan, ctx) => {
    const n = scan.frequencyHz.length;
    for (const [i, trace] of scan.traces.entries()) {
      if (trace.levelDbuV.length !== n) {
        ctx.addIssue({ code: 'custom', path: ['traces', i, 'levelDbuV'], message: `has ${trace.levelDbuV.length} values, the frequency axis has ${n}` });
      }
    }
  });

const replySchema = z.discriminatedUnion('ok', [
  z.object({ ok: z.literal(true), scan: scanSchema, elapsedMs: z.number().nonnegative() }),
  z.object({ ok: z.literal(false), error: z.object({ message: z.string(), rejected: z.array(rejectedSchema), notes: z.array(z.string()) }) }),
]);
