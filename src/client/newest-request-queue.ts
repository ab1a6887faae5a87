/** The two endings every newest-request-wins client shares, whatever its successful outcome is. */
export type QueueEnding =
  | { readonly status: 'superseded'; readonly requestId: number }
  | {
      readonly status: 'error';
      readonly requestId: number;
      readonly error: { readonly kind: 'worker-failure'; readonly message: string; readonly issues: readonly never[] };
    };

/**
 * Sends requests to a worker so that the newest request wins. While one runs, at most one more
 * waits; a newer request replaces the waiting one, which resolves as superseded at once. A reply
 * for a request that has since been superseded also resolves as superseded, so a slow old answer
 * can never overwrite a newer one on screen. Nothing is cancelled mid-run (the engine is
 * synchronous in the worker); holding one request in reserve keeps the worker at most one behind
 * the latest edit. `send` performs one request and never rejects with an unread reply: the owner
 * turns replies into outcomes; a rejection becomes a worker failure.
 */
export class NewestRequestQueue<Outcome extends { readonly requestId: number }> {
  private nextRequestId = 1;
  private latestRequestId = 0;
  private inFlight: Pending<Outcome> | undefined;
  private waiting: Pending<Outcome> | undefined;
  private closed = false;

  constructor(
    /** Names the client in "the sweep client is closed". */
    private readonly what: string,
    /** The message for a call the worker did not answer (it crashed, or postMessage refused). */
    private readonly noAnswer: (reason: string) => string,
    private readonly onDispose: () => void = () => {},
  ) {}

  /** Queue one request; `send(requestId)` is called when its turn comes. */
  enqueue(send: (requestId: number) => Promise<Outcome>): Promise<Outcome | QueueEnding> {
    const requestId = this.nextRequestId;
    this.nextRequestId += 1;
    this.latestRequestId = requestId;
    return new Promise((resolve) => {
      const pending: Pending<Outcome> = { requestId, send, resolve };
      if (this.closed) {
        resolve(workerFailure(requestId, `the ${this.what} client is closed`));
      } else if (this.inFlight === undefined) {
        this.start(pending);
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

  private start(pending: Pending<Outcome>): void {
    this.inFlight = pending;
    let call: Promise<Outcome>;
    try {
      call = pending.send(pending.requestId);
    } catch (cause) {
      // postMessage throws synchronously for a value it cannot clone.
      call = Promise.reject(cause instanceof Error ? cause : new Error(String(cause)));
    }
    call.then(
      (outcome) => this.settle(pending, outcome),
      (cause: unknown) => {
        const reason = cause instanceof Error ? cause.message : String(cause);
        this.settle(pending, workerFailure(pending.requestId, this.noAnswer(reason)));
      },
    );
  }

  private settle(pending: Pending<Outcome>, outcome: Outcome | QueueEnding): void {
    // Already ended by failAll or dispose: this late reply has no one left to tell.
    if (this.inFlight !== pending) return;
    this.inFlight = undefined;
    if (pending.requestId === this.latestRequestId) pending.resolve(outcome);
    else supersede(pending);
    const next = this.waiting;
    this.waiting = undefined;
    if (next) this.start(next);
  }
}

interface Pending<Outcome> {
  readonly requestId: number;
  readonly send: (requestId: number) => Promise<Outcome>;
  readonly resolve: (outcome: Outcome | QueueEnding) => void;
}

function supersede<Outcome>(request: Pending<Outcome>): void {
  request.resolve({ status: 'superseded', requestId: request.requestId });
}

function workerFailure(requestId: number, message: string): QueueEnding {
  return { status: 'error', requestId, error: { kind: 'worker-failure', message, issues: [] } };
}
