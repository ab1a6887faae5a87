import type { Design } from '../../model/design.ts';
import { type AssistNoise, type AssistProblemOptions, assistProblem } from '../margin/assist-problem.ts';
import { chunkRanges, mergeYield, prepareYield, runYieldChunk, type YieldChunk, type YieldContext, type YieldResult, type YieldSettings } from '../tolerance/yield-run.ts';
import { mapChunkRanges, mergeMap, type MapChunk, type MapContext, type MapResult, type MapSettings, prepareMap, runMapChunk } from '../value-map/value-map.ts';

/**
 * Work that splits into independent chunks, for a pool of workers (one per core): the tolerance
 * yield (chunks of samples) and the two-value map (chunks of cells). Everything here is pure and
 * plain data: a job, the ranges it splits into, a chunk's result, and the merge. The pools are thin
 * transports around it: src/client/worker-pool.ts (comlink workers in the page) and the command
 * line's worker threads (src/cli/node-main.ts). Any worker that has prepared a job can run any
 * chunk, so the result never depends on how many workers there were.
 */

export type SplitJob =
  | { readonly kind: 'yield'; readonly design: Design; readonly noise: AssistNoise; readonly judging: AssistProblemOptions; readonly settings: YieldSettings }
  | { readonly kind: 'map'; readonly design: Design; readonly noise: AssistNoise; readonly judging: AssistProblemOptions; readonly settings: MapSettings };

export interface ChunkRange {
  readonly start: number;
  readonly count: number;
}

export type PreparedSplit = { readonly kind: 'yield'; readonly context: YieldContext } | { readonly kind: 'map'; readonly context: MapContext };
export type SplitChunk = { readonly kind: 'yield'; readonly chunk: YieldChunk } | { readonly kind: 'map'; readonly chunk: MapChunk };
export type SplitResult = { readonly kind: 'yield'; readonly result: YieldResult } | { readonly kind: 'map'; readonly result: MapResult };

/** Samples per yield chunk: about 50 ms of work, so progress moves and a cancel is heard quickly. */
export const YIELD_CHUNK_SAMPLES = 25;

export function prepareSplit(job: SplitJob): PreparedSplit {
  const problem = assistProblem(job.design, job.noise, job.judging);
  return job.kind === 'yield' ? { kind: 'yield', context: prepareYield(problem, job.settings) } : { kind: 'map', context: prepareMap(problem, job.settings) };
}

export function planSplit(prepared: PreparedSplit): ChunkRange[] {
  return prepared.kind === 'yield' ? chunkRanges(prepared.context.samples, YIELD_CHUNK_SAMPLES) : mapChunkRanges(prepared.context);
}

export function runSplitChunk(prepared: PreparedSplit, range: ChunkRange): SplitChunk {
  return prepared.kind === 'yield'
    ? { kind: 'yield', chunk: runYieldChunk(prepared.context, range.start, range.count) }
    : { kind: 'map', chunk: runMapChunk(prepared.context, range.start, range.count) };
}

export function mergeSplit(prepared: PreparedSplit, chunks: readonly SplitChunk[]): SplitResult {
  if (prepared.kind === 'yield') {
    return { kind: 'yield', result: mergeYield(prepared.context, chunks.flatMap((c) => (c.kind === 'yield' ? [c.chunk] : []))) };
  }
  return { kind: 'map', result: mergeMap(prepared.context, chunks.flatMap((c) => (c.kind === 'map' ? [c.chunk] : []))) };
}

/** How the command line or a page runs chunks on workers; absent, chunks run in this thread. */
export interface SplitRunner {
  readonly workerCount: number;
  /** Run every range of the job; `onChunk` is told the number of chunks finished so far. Resolves in range order. */
  run(job: SplitJob, ranges: readonly ChunkRange[], onChunk?: (finished: number) => void): Promise<SplitChunk[]>;
  close(): void;
}

/** Run a split job to its result: on a runner's workers if given, else here, chunk by chunk. */
export async function runSplit(job: SplitJob, runner: SplitRunner | undefined, onProgress?: (done: number, total: number) => void): Promise<SplitResult> {
  const prepared = prepareSplit(job);
  const ranges = planSplit(prepared);
  let chunks: SplitChunk[];
  if (runner) chunks = await runner.run(job, ranges, (finished) => onProgress?.(finished, ranges.length));
  else {
    chunks = [];
    for (const range of ranges) {
      chunks.push(runSplitChunk(prepared, range));
      onProgress?.(chunks.length, ranges.length);
    }
  }
  return mergeSplit(prepared, chunks);
}

/**
 * The transport-free scheduler both runners share: each worker takes the next range as soon as it
 * is free, results are stored by range index. `isCancelled` stops handing out ranges.
 */
export async function scheduleRanges<T>(
  ranges: readonly ChunkRange[],
  workers: readonly ((range: ChunkRange) => Promise<T>)[],
  onChunk?: (finished: number) => void,
  isCancelled?: () => boolean,
): Promise<T[]> {
  const results: T[] = new Array<T>(ranges.length);
  let next = 0;
  let finished = 0;
  await Promise.all(
    workers.map(async (work) => {
      while (next < ranges.length && !isCancelled?.()) {
        const index = next;
        next += 1;
        results[index] = await work(ranges[index]!);
        finished += 1;
        onChunk?.(finished);
      }
    }),
  );
  return results;
}
