import type { EmissionsNoise, EmissionsRequest, EmissionsRequestOptions } from '../../workers/emissions-protocol.ts';
import type { EmissionsOutcome } from './emissions-outcome.ts';
import { NewestRequestQueue } from './newest-request-queue.ts';
import { readEmissionsReply } from './read-emissions-reply.ts';

/**
 * The worker as the emissions client calls it: a `Remote<SweepApi>` fits, and so does any test
 * double. Replies are typed unknown because the client checks them before use.
 */
export interface EmissionsRemote {
  analyzeEmissions(request: EmissionsRequest): Promise<unknown>;
}

/** What the page needs from an emissions client; the page depends on this, so tests can fake it. */
export interface EmissionsRequester {
  analyze(design: unknown, noise: EmissionsNoise, options?: EmissionsRequestOptions): Promise<EmissionsOutcome>;
}

/**
 * Sends emissions analyses to the worker so that the newest request wins (NewestRequestQueue):
 * typing a target margin or adding a mask never shows an older answer after a newer one, and the
 * worker is never more than one analysis behind.
 *
 * The scan is sent by structured clone, not transferred: the page keeps it for the next edit.
 */
export class EmissionsClient implements EmissionsRequester {
  private readonly queue: NewestRequestQueue<EmissionsOutcome>;

  constructor(
    private readonly remote: EmissionsRemote,
    /** Called once by dispose(), e.g. to terminate the worker. */
    onDispose: () => void = () => {},
  ) {
    this.queue = new NewestRequestQueue<EmissionsOutcome>('emissions', (reason) => `the worker did not answer the emissions analysis: ${reason}`, onDispose);
  }

  analyze(design: unknown, noise: EmissionsNoise, options?: EmissionsRequestOptions): Promise<EmissionsOutcome> {
    return this.queue.enqueue(async (requestId) => {
      const message: EmissionsRequest = { requestId, design, noise };
      if (options) message.options = options;
      return readEmissionsReply(await this.remote.analyzeEmissions(message), requestId);
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
