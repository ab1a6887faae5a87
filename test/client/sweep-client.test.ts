import { describe, expect, it } from 'vitest';
import { SweepClient, type SweepRemote } from '../../src/client/sweep-client.ts';
import type { SweepOutcome } from '../../src/client/sweep-outcome.ts';
import { sweepApi } from '../../workers/sweep-api.ts';
import type { SweepReply, SweepRequest } from '../../workers/sweep-protocol.ts';

/** A remote whose replies the test releases one by one, to pin down the order of events. */
class ControlledRemote implements SweepRemote {
  readonly received: SweepRequest[] = [];
  private readonly answers: ((reply: SweepReply | Error) => void)[] = [];

  sweep(request: SweepRequest): Promise<SweepReply> {
    this.received.push(request);
    return new Promise<SweepReply>((resolve, reject) => {
      this.answers.push((reply) => (reply instanceof Error ? reject(reply) : resolve(reply)));
    });
  }

  /** Answer the oldest unanswered call with what the real API says, or with a failure. */
  async answerNext(with_: 'real' | Error = 'real'): Promise<void> {
    const index = this.received.length - this.answers.length;
    const answer = this.answers.shift();
    if (!answer) throw new Error('no call is waiting for an answer');
    answer(with_ === 'real' ? sweepApi.sweep(this.received[index]) : with_);
    await settle();
  }

  get unanswered(): number {
    return this.answers.length;
  }
}

async function settle(): Promise<void> {
  for (let i = 0; i < 5; i += 1) await Promise.resolve();
}

/** Record outcomes as they resolve, to check which were ever delivered and when. */
function track(promise: Promise<SweepOutcome>): { outcome: SweepOutcome | undefined } {
  const box: { outcome: SweepOutcome | undefined } = { outcome: undefined };
  void promise.then((outcome) => (box.outcome = outcome));
  return box;
}

const design = {
  format: 'chokepoint-design',
  version: 2,
  name: 'tiny',
  frequencyPlan: { startHz: 1e5, stopHz: 1e6, pointsPerDecade: 5 },
  noiseSource: {
    commonMode: { impedance: { kind: 'resistor', resistance: 50 } },
    differentialMode: { impedance: { kind: 'resistor', resistance: 100 } },
  },
  receivers: { line1: { kind: 'resistive' }, line2: { kind: 'resistive' } },
  stages: [],
};

describe('SweepClient', () => {
  it('gives each request a rising id and sends the design with its options', async () => {
    const remote = new ControlledRemote();
    const client = new SweepClient(remote);
    const first = client.request(design, { refine: false });
    await remote.answerNext();
    const second = client.request(design);
    await remote.answerNext();
    expect(remote.received).toEqual([
      { requestId: 1, design, options: { refine: false } },
      { requestId: 2, design },
    ]);
    expect(await first).toMatchObject({ status: 'done', requestId: 1 });
    expect(await second).toMatchObject({ status: 'done', requestId: 2 });
  });

  it('keeps one request in flight and one waiting; a newer waiting request replaces the older', async () => {
    const remote = new ControlledRemote();
    const client = new SweepClient(remote);
    const first = track(client.request(design));
    const second = track(client.request(design));
    const third = track(client.request(design));
    await settle();
    expect(remote.received.map((r) => r.requestId)).toEqual([1]);
    expect(second.outcome).toEqual({ status: 'superseded', requestId: 2 });
    expect(first.outcome).toBeUndefined();

    // The first sweep finishes after the third request was made: it is stale and never shown.
    await remote.answerNext();
    expect(first.outcome).toEqual({ status: 'superseded', requestId: 1 });
    expect(remote.received.map((r) => r.requestId)).toEqual([1, 3]);
    expect(third.outcome).toBeUndefined();

    await remote.answerNext();
    expect(third.outcome).toMatchObject({ status: 'done', requestId: 3 });
    expect(remote.unanswered).toBe(0);
  });

  it('drops the result of an in-flight request when a newer one arrives before it returns', async () => {
    const remote = new ControlledRemote();
    const client = new SweepClient(remote);
    const old = track(client.request(design));
    const newer = track(client.request({ ...design, name: 'newer' }));
    await remote.answerNext();
    expect(old.outcome?.status).toBe('superseded');
    await remote.answerNext();
    expect(newer.outcome?.status).toBe('done');
    expect(newer.outcome?.status === 'done' && newer.outcome.result.designName).toBe('newer');
  });

  it('passes a refusal from the worker on with its issues', async () => {
    const remote = new ControlledRemote();
    const client = new SweepClient(remote);
    const outcome = track(client.request({ ...design, stages: 'none' }));
    await remote.answerNext();
    expect(outcome.outcome).toMatchObject({
      status: 'error',
      requestId: 1,
      error: { kind: 'invalid-design', issues: [expect.objectContaining({ path: 'stages' })] },
    });
  });

  it('turns a rejected call into a worker failure and goes on with the waiting request', async () => {
    const remote = new ControlledRemote();
    const client = new SweepClient(remote);
    const failing = track(client.request(design));
    await remote.answerNext(new Error('boom'));
    expect(failing.outcome).toMatchObject({
      status: 'error',
      error: { kind: 'worker-failure', message: 'the sweep worker did not answer: boom' },
    });
    const next = track(client.request(design));
    await remote.answerNext();
    expect(next.outcome?.status).toBe('done');
  });

  it('ends every pending request when the worker dies, and ignores its late reply', async () => {
    const remote = new ControlledRemote();
    const client = new SweepClient(remote);
    const running = track(client.request(design));
    const waiting = track(client.request(design));
    client.failAll('the sweep worker stopped: out of memory');
    await settle();
    expect(running.outcome).toMatchObject({ status: 'error', error: { message: 'the sweep worker stopped: out of memory' } });
    expect(waiting.outcome).toMatchObject({ status: 'error', requestId: 2 });
    await remote.answerNext();
    expect(running.outcome?.status).toBe('error');
  });

  it('on dispose supersedes what is pending, calls its cleanup once and refuses later requests', async () => {
    const remote = new ControlledRemote();
    let cleanups = 0;
    const client = new SweepClient(remote, () => (cleanups += 1));
    const running = track(client.request(design));
    client.dispose();
    client.dispose();
    await settle();
    expect(running.outcome?.status).toBe('superseded');
    expect(cleanups).toBe(1);
    expect(await client.request(design)).toMatchObject({ status: 'error', error: { message: 'the sweep client is closed' } });
  });

  it('reports a malformed reply as a worker failure naming the field', async () => {
    const remote: SweepRemote = {
      sweep: (request) => Promise.resolve({ ...sweepApi.sweep(request), elapsedMs: 'soon' }),
    };
    const outcome = await new SweepClient(remote).request(design);
    expect(outcome).toMatchObject({
      status: 'error',
      error: { kind: 'worker-failure', issues: [expect.objectContaining({ path: 'elapsedMs' })] },
    });
  });
});
