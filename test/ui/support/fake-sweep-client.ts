import type { SweepRequester } from '../../../src/client/sweep-client.ts';
import type { SweepOutcome } from '../../../src/client/sweep-outcome.ts';

interface PendingSweep {
  readonly requestId: number;
  readonly design: unknown;
  readonly resolve: (outcome: SweepOutcome) => void;
}

/**
 * Stands in for the worker-backed client (happy-dom has no Worker): records each request and
 * lets the test decide what comes back and when.
 */
export class FakeSweepClient implements SweepRequester {
  readonly pending: PendingSweep[] = [];
  readonly requested: unknown[] = [];
  private nextId = 1;

  request(design: unknown): Promise<SweepOutcome> {
    this.requested.push(design);
    const requestId = this.nextId;
    this.nextId += 1;
    return new Promise((resolve) => this.pending.push({ requestId, design, resolve }));
  }

  /** Answer the oldest open request with the outcome built for its id. */
  answer(make: (requestId: number, design: unknown) => SweepOutcome): void {
    const next = this.pending.shift();
    if (!next) throw new Error('no sweep is waiting for an answer');
    next.resolve(make(next.requestId, next.design));
  }
}
