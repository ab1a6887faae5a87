/**
 * How a long assistant run reports progress and can be stopped, the same way in the command line
 * and in a worker. An assistant is a generator that yields a progress report after each piece of
 * work (typically one engine pass) and returns its result:
 *
 * - `runSteps` drives it to the end at once (command line, tests);
 * - `runStepsCooperatively` drives it in slices of a few milliseconds and gives the event loop a
 *   turn between slices, so a worker can receive a cancel message while an assistant runs (the
 *   engine itself is synchronous; this is the only point where a run can stop).
 */

export interface AssistProgress {
  /** Work done and total, in the assistant's own units (engine passes, samples, cells). */
  readonly done: number;
  readonly total: number;
  /** What is being done now, in a few words ("sizing LCM1", "checking candidates"). */
  readonly stage: string;
}

export type Steps<T> = Generator<AssistProgress, T, void>;

/** Thrown out of a cooperative run that was cancelled. */
export class AssistCancelled extends Error {
  constructor() {
    super('cancelled');
    this.name = 'AssistCancelled';
  }
}

/** Drive an assistant to its result in one go; progress goes to `onProgress` if given. */
export function runSteps<T>(steps: Steps<T>, onProgress?: (progress: AssistProgress) => void): T {
  for (;;) {
    const next = steps.next();
    if (next.done) return next.value;
    onProgress?.(next.value);
  }
}

export interface CooperativeOptions {
  readonly onProgress?: (progress: AssistProgress) => void;
  /** Asked between slices; true ends the run with AssistCancelled. */
  readonly isCancelled?: () => boolean;
  /** Gives the event loop a turn (a worker passes a zero-delay timer); the pure layers have none. */
  readonly yieldToEventLoop: () => Promise<void>;
  /** Longest stretch of work between two turns of the event loop, ms (default 25). */
  readonly sliceMs?: number;
  /** The clock, ms (default Date.now). */
  readonly now?: () => number;
}

/**
 * Drive an assistant in slices. Progress is reported at most once per slice (the latest report),
 * so a fast run does not flood the page with messages.
 */
export async function runStepsCooperatively<T>(steps: Steps<T>, options: CooperativeOptions): Promise<T> {
  const now = options.now ?? Date.now;
  const sliceMs = options.sliceMs ?? 25;
  for (;;) {
    if (options.isCancelled?.()) {
      steps.return(undefined as never);
      throw new AssistCancelled();
    }
    const started = now();
    let latest: AssistProgress | undefined;
    for (;;) {
      const next = steps.next();
      if (next.done) {
        if (latest) options.onProgress?.(latest);
        return next.value;
      }
      latest = next.value;
      if (now() - started >= sliceMs) break;
    }
    if (latest) options.onProgress?.(latest);
    await options.yieldToEventLoop();
  }
}

/** Count work done across the parts of a run whose total is known up front. */
export class ProgressCounter {
  private done = 0;
  constructor(
    private total: number,
    private stage: string,
  ) {}
  /** One more piece done, in the current stage. */
  step(count = 1): AssistProgress {
    this.done = Math.min(this.total, this.done + count);
    return { done: this.done, total: this.total, stage: this.stage };
  }
  /** A new stage, and optionally more work found on the way. */
  enter(stage: string, moreWork = 0): void {
    this.stage = stage;
    this.total += moreWork;
  }
}
