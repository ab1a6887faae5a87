import { AssistInputError } from '../src/assist/margin/assist-problem.ts';
import { type ChunkRange, mergeSplit, planSplit, type PreparedSplit, prepareSplit, runSplitChunk, type SplitChunk, type SplitJob, type SplitResult } from '../src/assist/pool/split-jobs.ts';
import { readDesign, toValidationIssue } from '../src/model/index.ts';
import { type AssistFailure, chunkRangeSchema, splitChunksSchema, splitRequestSchema } from './assist-protocol.ts';
import { failure } from './assist-failure.ts';

/**
 * One worker's side of the pool (docs/assistants.md, "Pool"): it prepares jobs (validating the
 * request exactly as the page's other requests), runs chunks of them, merges chunks and forgets
 * jobs. Used by the page's assistants' worker (assist-api.ts) and by the command line's worker
 * threads (src/cli/node-main.ts); it holds only the prepared jobs, keyed by the pool's job id.
 */

export type HostReply<T> = { readonly ok: true; readonly value: T } | AssistFailure;

export interface SplitHost {
  prepare(jobId: number, request: unknown): HostReply<{ readonly ranges: readonly ChunkRange[] }>;
  run(jobId: number, range: unknown): HostReply<SplitChunk>;
  merge(jobId: number, chunks: unknown): HostReply<SplitResult>;
  release(jobId: number): void;
}

/** The job a request describes, after validation; or why it is refused. */
export function splitJobOf(request: unknown): HostReply<SplitJob> {
  const parsed = splitRequestSchema.safeParse(request, { reportInput: true });
  if (!parsed.success) return failure(null, 'invalid-request', 'invalid pool request', parsed.error.issues.map(toValidationIssue));
  const read = readDesign(parsed.data.design);
  if (!read.ok) return failure(parsed.data.requestId, 'invalid-design', 'invalid design', read.error.issues);
  const { kind, noise, judging, settings } = parsed.data;
  const common = { design: read.value, noise, judging: judging ?? {} };
  return { ok: true, value: kind === 'yield' ? { kind, ...common, settings } : { kind: 'map', ...common, settings: parsed.data.settings as Extract<SplitJob, { kind: 'map' }>['settings'] } };
}

export function createSplitHost(): SplitHost {
  const prepared = new Map<number, PreparedSplit>();
  const guard = <T>(jobId: number, work: () => T): HostReply<T> => {
    try {
      return { ok: true, value: work() };
    } catch (cause) {
      if (cause instanceof AssistInputError || cause instanceof RangeError) return failure(jobId, 'unusable-input', cause.message, []);
      return failure(jobId, 'engine-failure', `the pool job failed: ${cause instanceof Error ? cause.message : String(cause)}`, []);
    }
  };
  return {
    prepare(jobId, request) {
      const job = splitJobOf(request);
      if (!job.ok) return job;
      return guard(jobId, () => {
        const ready = prepareSplit(job.value);
        prepared.set(jobId, ready);
        return { ranges: planSplit(ready) };
      });
    },
    run(jobId, range) {
      const ready = prepared.get(jobId);
      if (!ready) return failure(jobId, 'invalid-request', `no job ${jobId} is prepared in this worker`, []);
      const parsed = chunkRangeSchema.safeParse(range);
      if (!parsed.success) return failure(jobId, 'invalid-request', 'invalid chunk range', parsed.error.issues.map(toValidationIssue));
      return guard(jobId, () => runSplitChunk(ready, parsed.data));
    },
    merge(jobId, chunks) {
      const ready = prepared.get(jobId);
      if (!ready) return failure(jobId, 'invalid-request', `no job ${jobId} is prepared in this worker`, []);
      const parsed = splitChunksSchema.safeParse(chunks);
      if (!parsed.success) return failure(jobId, 'invalid-request', 'invalid chunks', parsed.error.issues.map(toValidationIssue));
      return guard(jobId, () => mergeSplit(ready, parsed.data));
    },
    release(jobId) {
      prepared.delete(jobId);
    },
  };
}
