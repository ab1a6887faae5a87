// One fuzz target in a worker thread (scripts/fuzz.mjs starts it): runs `runs` seeded cases with
// fast-check and tells the main thread about each case before running it, so that the main thread's
// watchdog can name the input of a case that does not finish.
import { parentPort, workerData } from 'node:worker_threads';
import fc from 'fast-check';
import { fuzzRunners } from '../../test/fuzz/fuzz-targets.ts';

interface Job {
  readonly target: string;
  readonly runs: number;
  readonly seed: number;
  readonly path?: string;
}

const job = workerData as Job;
let index = 0;
const runner = fuzzRunners((shown) => {
  index += 1;
  parentPort!.postMessage({ type: 'case', index, shown: shown.slice(0, 2000) });
}).find((candidate) => candidate.name === job.target);
if (!runner) throw new Error(`no fuzz target ${job.target}`);

const details = await fc.check(runner.property, {
  seed: job.seed,
  numRuns: job.runs,
  ...(job.path === undefined ? {} : { path: job.path }),
});
parentPort!.postMessage({
  type: 'done',
  failed: details.failed,
  numRuns: details.numRuns,
  seed: details.seed,
  path: details.counterexamplePath,
  counterexample: details.counterexample === null ? null : runner.show(details.counterexample[0]).slice(0, 4000),
  error: details.errorInstance instanceof Error ? details.errorInstance.message.slice(0, 2000) : details.errorInstance === null ? null : String(details.errorInstance),
});
