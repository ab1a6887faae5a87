import * as Comlink from 'comlink';
import type { ChunkRange, SplitChunk, SplitResult } from '../assist/pool/split-jobs.ts';
import type { MapResult } from '../assist/value-map/value-map.ts';
import type { YieldResult } from '../assist/tolerance/yield-run.ts';
import type { AssistApi } from '../../workers/assist-api.ts';
import type { MapRequest, YieldRequest } from '../../workers/assist-protocol.ts';
import { collectTransferables } from '../../workers/transferables.ts';

/**
 * A pool of assistants' workers, one per core, for the work that splits into chunks (the
 * tolerance yield, the two-value map). The page calls `runYield` or `runMap` with the same request
 * it would send one worker; the pool prepares the job in every worker (each validates it), hands out
 * chunk ranges to whichever worker is free, reports progress per chunk, and asks one worker to merge.
 * Aborting the signal stops handing out chunks at once; the chunks already running finish (each is
 * a few tens of milliseconds) and the run resolves as cancelled. The numbers never depend on the
 * number of workers: every sample and every cell is computed from the request alone.
 *
 * The same assistants' workers answer single requests too: `single()` gives the first one, for
 * `diagnose`, `size`, `damp`, `stability` and `propose`.
 */

export interface PoolProgress {
  readonly done: number;
  readonly total: number;
}

export type PoolOutcome<T> =
  | { readonly status: 'done'; readonly result: T; readonly workers: number; readonly elapsedMs: number }
  | { readonly status: 'cancelled' }
  | { readonly status: 'error'; readonly error: { readonly kind: string; readonly message: string } };

export interface PoolRunOptions {
  readonly onProgress?: (progress: PoolProgress) => void;
  readonly signal?: AbortSignal;
}

/** A worker as the pool sees it: the comlink endpoint and how to stop it. */
export interface PoolWorker {
  readonly endpoint: Comlink.Endpoint;
  terminate(): void;
}

export class WorkerPool {
  private readonly workers: { remote: Comlink.Remote<AssistApi>; worker: PoolWorker }[] = [];
  private nextJobId = 1;
  private disposed = false;

  constructor(
    private readonly createWorker: () => PoolWorker,
    /** One per core by default. */
    readonly size: number = Math.max(1, globalThis.navigator?.hardwareConcurrency ?? 2),
  ) {}

  /** The first worker, for single requests (its progress and cancel as in assist-api.ts). */
  single(): Comlink.Remote<AssistApi> {
    return this.ensure(1)[0]!.remote;
  }

  runYield(request: YieldRequest, options: PoolRunOptions = {}): Promise<PoolOutcome<YieldResult>> {
    return this.run({ kind: 'yield', ...request }, 'yield', options) as Promise<PoolOutcome<YieldResult>>;
  }

  runMap(request: MapRequest, options: PoolRunOptions = {}): Promise<PoolOutcome<MapResult>> {
    return this.run({ kind: 'map', ...request }, 'map', options) as Promise<PoolOutcome<MapResult>>;
  }

  /** Stop every worker; later runs fail at once. */
  dispose(): void {
    this.disposed = true;
    for (const { remote, worker } of this.workers.splice(0)) {
      remote[Comlink.releaseProxy]();
      worker.terminate();
    }
  }

  private ensure(count: number): { remote: Comlink.Remote<AssistApi>; worker: PoolWorker }[] {
    while (this.workers.length < count) {
      const worker = this.createWorker();
      this.workers.push({ remote: Comlink.wrap<AssistApi>(worker.endpoint), worker });
    }
    return this.workers.slice(0, count);
  }

  private async run(request: object, kind: SplitResult['kind'], options: PoolRunOptions): Promise<PoolOutcome<YieldResult | MapResult>> {
    if (this.disposed) return { status: 'error', error: { kind: 'worker-failure', message: 'the worker pool is closed' } };
    const started = Date.now();
    const jobId = this.nextJobId;
    this.nextJobId += 1;
    const workers = this.ensure(this.size);
    const cancelled = (): boolean => options.signal?.aborted === true;
    try {
      const prepared = await Promise.all(workers.map(({ remote }) => remote.prepareSplit(jobId, request)));
      const refused = prepared.find((reply) => !reply.ok);
      if (refused && !refused.ok) return { status: 'error', error: refused.error };
      const ranges: readonly ChunkRange[] = prepared[0]!.ok ? prepared[0]!.value.ranges : [];
      const chunks: SplitChunk[] = new Array<SplitChunk>(ranges.length);
      let next = 0;
      let finished = 0;
      let failed: { kind: string; message: string } | undefined;
      options.onProgress?.({ done: 0, total: ranges.length });
      await Promise.all(
        workers.map(async ({ remote }) => {
          while (next < ranges.length && !cancelled() && !failed) {
            const index = next;
            next += 1;
            const reply = await remote.runSplitChunk(jobId, ranges[index]);
            if (!reply.ok) {
              failed = reply.error;
              return;
            }
            chunks[index] = reply.value;
            finished += 1;
            options.onProgress?.({ done: finished, total: ranges.length });
          }
        }),
      );
      if (failed) return { status: 'error', error: failed };
      if (cancelled()) return { status: 'cancelled' };
      const merged = await workers[0]!.remote.mergeSplit(jobId, Comlink.transfer(chunks, collectTransferables(chunks)));
      if (!merged.ok) return { status: 'error', error: merged.error };
      if (merged.value.kind !== kind) return { status: 'error', error: { kind: 'worker-failure', message: 'the pool merged a different kind of job' } };
      return { status: 'done', result: merged.value.result, workers: workers.length, elapsedMs: Date.now() - started };
    } catch (cause) {
      return { status: 'error', error: { kind: 'worker-failure', message: cause instanceof Error ? cause.message : String(cause) } };
    } finally {
      for (const { remote } of workers) void remote.releaseSplit(jobId).catch(() => undefined);
    }
  }
}
