import type { SweepRequest, SweepRequestOptions } from '../../workers/sweep-protocol.ts';
import { NewestRequestQueue } from './newest-request-queue.ts';
import { readSweepReply } from './read-sweep-reply.ts';
import type { SweepOutcome } from './sweep-outcome.ts';

/**
 * The worker as the client calls it: a `Remote<SweepApi>` fits, and so does any test double.
 * Replies are typed unknown because the client checks them before use (readSweepReply).
 */
export interface SweepRemote {
  sweep(request: SweepRequest): Promise<unknown>;
}

/** What the page needs from a sweep client; the app depends on this, so tests can fake it. */
export interface SweepRequester {
  request(design: unknown, options?: SweepRequestOptions): Promise<SweepOutcome>;
}

/**
 * Sends sweeps to the worker so that the newest request wins (NewestRequestQueue): a slow old
 * sweep can never overwrite a newer design on screen.
 */
export class SweepClient implements SweepRequester {
  private readonly queue: NewestRequestQueue<SweepOutcome>;

  constructor(
    private readonly remote: SweepRemote,
    /** Called once by dispose(), e.g. to terminate the worker. */
    onDispose: () => void = () => {},
  ) {
    this.queue = new NewestRequestQueue<SweepOutcome>('sweep', (reason) => `the sweep worker did not answer: ${reason}`, onDispose);
  }

  request(design: unknown, options?: SweepRequestOptions): Promise<SweepOutcome> {
    return this.queue.enqueue(async (requestId) => {
      const message: SweepRequest = { requestId, design };
      if (options) message.options = options;
      return readSweepReply(await this.remote.sweep(message), requestId);
    });
  }

  /** The worker can no longer answer: end every pending request with this message. */
  failAll(message: string): void {
    this.queue.failAll(message);
  }

  /** Stop: pending requests resolve as superseded and later ones fail at once. */
  dispose(): void {
    this.queue.dispose();
  }
}
