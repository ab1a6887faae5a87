import type { EmissionsNoise, EmissionsRequest, EmissionsRequestOptions } from '../../workers/emissions-protocol.ts';
import type { EmissionsOutcome } from './emissions-outcome.ts';
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

interface PendingRequest {
  readonly requestId: number;
  readonly design: unknown;
  readonly noise: EmissionsNoise;
  readonly options: EmissionsRequestOptions | undefined;
  readonly resolve: (outcome: EmissionsOutcome) => void;
}

/**
 * Sends emissions analyses to the worker so that the newest request wins, exactly as the sweep
 * client does: one request in flight, at most one waiting; a newer request replaces the waiting one,
 * which resolves as superseded at once, and a reply for a request that has since been superseded
 * resolves as superseded too. Typing a target margin or adding a mask therefore never shows an
 * older answer after a newer one, and the worker is never more than one analysis behind.
 *
 * The scan is sent by structured clone, not transferred: the page keeps it for the next edit.
 */
export class EmissionsClient implements EmissionsRequester {
  private nextRequestId = 1;
  private latestRequestId = 0;
  private inFlight: PendingRequest | undefined;
  private waiting: PendingRequest | undefined;
  private closed = false;

  constructor(
    private readonly remote: EmissionsRemote,
    /** Called once by dispose(), e.g. to terminate the worker. */
    private readonly onDispose: () => void = () => {},
  ) {}

  analyze(design: unknown, noise: EmissionsNoise, options?: EmissionsRequestOptions): Promise<EmissionsOutcome> {
    const requestId = this.nextRequestId;
    this.nextRequestId += 1;
    this.latestRequestId = requestId;
    return new Promise<EmissionsOutcome>((resolve) => {
      const pending: PendingRequest = { requestId, design, noise, options, resolve };
      if (this.closed) {
        resolve(workerFailure(requestId, 'the emissions client is closed'));
      } else if (this.inFlight === undefined) {
        this.send(pending);
      } else {
        if (this.waiting) supersede(this.waiting);
        this.waiting = pending;
      }
    });
  }

  /** The worker can no longer answer: end every pending request with this message. */
  failAll(message: string): void {
    const pending = [this.inFlight, this.waiting];
    this.inFlight = undefined;
    this.waiting = undefined;
    for (const request of pending) request?.resolve(workerFailure(request.requestId, message));
  }

  /** Stop: pending requests resolve as superseded and later ones fail at once. */
  dispose(): void {
    if (this.closed) return;
    this.closed = true;
    const pending = [this.inFlight, this.waiting];
    this.inFlight = undefined;
    this.waiting = undefined;
    for (const request of pending) if (request) supersede(request);
    this.onDispose();
  }

  private send(pending: PendingRequest): void {
    this.inFlight = pending;
    const message: EmissionsRequest = { requestId: pending.requestId, design: pending.design, noise: pending.noise };
    if (pending.options) message.options = pending.options;
    let call: Promise<unknown>;
    try {
      call = this.remote.analyzeEmissions(message);
    } catch (cause) {
      // postMessage throws synchronously for a value it cannot clone.
      call = Promise.reject(cause instanceof Error ? cause : new Error(String(cause)));
    }
    call.then(
      (reply) => this.settle(pending, readEmissionsReply(reply, pending.requestId)),
      (cause: unknown) => {
        const reason = cause instanceof Error ? cause.message : String(cause);
        this.settle(pending, workerFailure(pending.requestId, `the worker did not answer the emissions analysis: ${reason}`));
      },
    );
  }

  private settle(pending: PendingRequest, outcome: EmissionsOutcome): void {
    // Already ended by failAll or dispose: this late reply has no one left to tell.
    if (this.inFlight !== pending) return;
    this.inFlight = undefined;
    if (pending.requestId === this.latestRequestId) pending.resolve(outcome);
    else supersede(pending);
    const next = this.waiting;
    this.waiting = undefined;
    if (next) this.send(next);
  }
}

function supersede(request: PendingRequest): void {
  request.resolve({ status: 'superseded', requestId: request.requestId });
}

function workerFailure(requestId: number, message: string): EmissionsOutcome {
  return { status: 'error', requestId, error: { kind: 'worker-failure', message, issues: [] } };
}
