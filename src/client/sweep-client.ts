import type { SweepRequest, SweepRequestOptions } from '../../workers/sweep-protocol.ts';
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

interface PendingRequest {
  readonly requestId: number;
  readonly design: unknown;
  readonly options: SweepRequestOptions | undefined;
  readonly resolve: (outcome: SweepOutcome) => void;
}

/**
 * Sends sweeps to the worker so that the newest request wins. While one sweep runs, at most one
 * more waits; a newer request replaces the waiting one, which resolves as superseded at once.
 * A reply for a request that has since been superseded also resolves as superseded, so a slow old
 * sweep can never overwrite a newer design on screen. Sweeps are not cancelled mid-run (the
 * engine is synchronous in the worker); holding one in reserve keeps the worker busy at most one
 * sweep behind the latest edit.
 */
export class SweepClient implements SweepRequester {
  private nextRequestId = 1;
  private latestRequestId = 0;
  private inFlight: PendingRequest | undefined;
  private waiting: PendingRequest | undefined;
  private closed = false;

  constructor(
    private readonly remote: SweepRemote,
    /** Called once by dispose(), e.g. to terminate the worker. */
    private readonly onDispose: () => void = () => {},
  ) {}

  request(design: unknown, options?: SweepRequestOptions): Promise<SweepOutcome> {
    const requestId = this.nextRequestId;
    this.nextRequestId += 1;
    this.latestRequestId = requestId;
    return new Promise<SweepOutcome>((resolve) => {
      const pending: PendingRequest = { requestId, design, options, resolve };
      if (this.closed) {
        resolve(workerFailure(requestId, 'the sweep client is closed'));
      } else if (this.inFlight === undefined) {
        this.send(pending);
      } else {
        if (this.waiting) supersede(this.waiting);
        this.waiting = pending;
      }
    });
  }

  /**
   * The worker can no longer answer (it failed to load or crashed): end every pending request
   * with this message instead of leaving the page waiting forever.
   */
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
    const message: SweepRequest = { requestId: pending.requestId, design: pending.design };
    if (pending.options) message.options = pending.options;
    this.remote.sweep(message).then(
      (reply) => this.settle(pending, readSweepReply(reply, pending.requestId)),
      (cause: unknown) => {
        const reason = cause instanceof Error ? cause.message : String(cause);
        this.settle(pending, workerFailure(pending.requestId, `the sweep worker did not answer: ${reason}`));
      },
    );
  }

  private settle(pending: PendingRequest, outcome: SweepOutcome): void {
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

function workerFailure(requestId: number, message: string): SweepOutcome {
  return { status: 'error', requestId, error: { kind: 'worker-failure', message, issues: [] } };
}
