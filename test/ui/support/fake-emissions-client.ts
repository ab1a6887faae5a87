import type { EmissionsRequester } from '../../../src/client/emissions-client.ts';
import type { EmissionsOutcome } from '../../../src/client/emissions-outcome.ts';
import { readEmissionsReply } from '../../../src/client/read-emissions-reply.ts';
import type { EmissionsNoise } from '../../../workers/emissions-protocol.ts';
import { sweepApi } from '../../../workers/sweep-api.ts';

interface PendingAnalysis {
  readonly requestId: number;
  readonly design: unknown;
  readonly noise: EmissionsNoise;
  readonly resolve: (outcome: EmissionsOutcome) => void;
}

/**
 * Stands in for the worker-backed emissions client (happy-dom has no Worker): records each request
 * and lets the test decide what comes back and when. `answer()` runs the worker's own API in-process,
 * so the page gets exactly what the worker would send.
 */
export class FakeEmissionsClient implements EmissionsRequester {
  readonly pending: PendingAnalysis[] = [];
  readonly requested: { design: unknown; noise: EmissionsNoise }[] = [];
  private nextId = 1;

  analyze(design: unknown, noise: EmissionsNoise): Promise<EmissionsOutcome> {
    this.requested.push({ design, noise });
    const requestId = this.nextId;
    this.nextId += 1;
    return new Promise((resolve) => this.pending.push({ requestId, design, noise, resolve }));
  }

  /** Answer the oldest open request as the worker would. */
  answer(): EmissionsOutcome {
    const next = this.take();
    const outcome = readEmissionsReply(sweepApi.analyzeEmissions({ requestId: next.requestId, design: next.design, noise: next.noise }), next.requestId);
    next.resolve(outcome);
    return outcome;
  }

  /** Answer the oldest open request with an outcome built for it. */
  answerWith(make: (requestId: number) => EmissionsOutcome): void {
    const next = this.take();
    next.resolve(make(next.requestId));
  }

  private take(): PendingAnalysis {
    const next = this.pending.shift();
    if (!next) throw new Error('no analysis is waiting for an answer');
    return next;
  }
}
