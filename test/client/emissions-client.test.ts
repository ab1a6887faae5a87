import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import demo from '../../fixtures/demo/adapter-two-stage.design.json';
import { EmissionsClient, type EmissionsRemote } from '../../src/client/emissions-client.ts';
import type { EmissionsOutcome } from '../../src/client/emissions-outcome.ts';
import { readEmissionsReply } from '../../src/client/read-emissions-reply.ts';
import type { EmissionsReply, EmissionsRequest } from '../../workers/emissions-protocol.ts';
import { type SweepApi, sweepApi } from '../../workers/sweep-api.ts';

/** A remote whose replies the test releases one by one, to pin down the order of events. */
class ControlledRemote implements EmissionsRemote {
  readonly received: EmissionsRequest[] = [];
  private readonly answers: ((reply: EmissionsReply | Error) => void)[] = [];

  analyzeEmissions(request: EmissionsRequest): Promise<EmissionsReply> {
    this.received.push(request);
    return new Promise<EmissionsReply>((resolve, reject) => {
      this.answers.push((reply) => (reply instanceof Error ? reject(reply) : resolve(reply)));
    });
  }

  /** Answer the oldest unanswered call with what the real API says, or with a failure. */
  async answerNext(with_: 'real' | Error = 'real'): Promise<void> {
    const index = this.received.length - this.answers.length;
    const answer = this.answers.shift();
    if (!answer) throw new Error('no call is waiting for an answer');
    answer(with_ === 'real' ? sweepApi.analyzeEmissions(this.received[index]) : with_);
    await settle();
  }
}

async function settle(): Promise<void> {
  for (let i = 0; i < 5; i += 1) await Promise.resolve();
}

function track(promise: Promise<EmissionsOutcome>): { outcome: EmissionsOutcome | undefined } {
  const box: { outcome: EmissionsOutcome | undefined } = { outcome: undefined };
  void promise.then((outcome) => (box.outcome = outcome));
  return box;
}

const estimate = { kind: 'estimate' } as const;
const withMargin = (targetMarginDb: number): unknown => ({ ...demo, emissions: { ...demo.emissions, targetMarginDb } });

describe('EmissionsClient: the newest request wins', () => {
  it('gives each request a rising id and sends the design, the noise and any options', async () => {
    const remote = new ControlledRemote();
    const client = new EmissionsClient(remote);
    const first = client.analyze(demo, estimate, { worstPeakCount: 3 });
    await remote.answerNext();
    const second = client.analyze(demo, estimate);
    await remote.answerNext();
    expect(remote.received).toEqual([
      { requestId: 1, design: demo, noise: estimate, options: { worstPeakCount: 3 } },
      { requestId: 2, design: demo, noise: estimate },
    ]);
    const done = await first;
    expect(done).toMatchObject({ status: 'done', requestId: 1 });
    expect(done.status === 'done' && done.analysis.report.worstPeaks.length).toBe(3);
    expect(await second).toMatchObject({ status: 'done', requestId: 2 });
  });

  it('keeps one request in flight and one waiting; a newer request replaces the waiting one and outdates the running one', async () => {
    const remote = new ControlledRemote();
    const client = new EmissionsClient(remote);
    const first = track(client.analyze(withMargin(1), estimate));
    const second = track(client.analyze(withMargin(2), estimate));
    const third = track(client.analyze(withMargin(3), estimate));
    await settle();
    expect(remote.received.map((r) => r.requestId)).toEqual([1]);
    expect(second.outcome).toEqual({ status: 'superseded', requestId: 2 });

    await remote.answerNext();
    expect(first.outcome).toEqual({ status: 'superseded', requestId: 1 });
    expect(remote.received.map((r) => r.requestId)).toEqual([1, 3]);
    await remote.answerNext();
    expect(third.outcome?.status === 'done' && third.outcome.analysis.report.targetMarginDb).toBe(3);
  });

  it('passes a refusal on with its issues, and turns a rejected call into a worker failure', async () => {
    const remote = new ControlledRemote();
    const client = new EmissionsClient(remote);
    const refused = track(client.analyze({ ...demo, stages: 'none' }, estimate));
    await remote.answerNext();
    expect(refused.outcome).toMatchObject({ status: 'error', error: { kind: 'invalid-design', issues: [expect.objectContaining({ path: 'stages' })] } });

    const failing = track(client.analyze(demo, estimate));
    await remote.answerNext(new Error('boom'));
    expect(failing.outcome).toMatchObject({ status: 'error', error: { kind: 'worker-failure', message: 'the worker did not answer the emissions analysis: boom' } });
  });

  it('ends every pending request when the worker dies; after dispose it refuses at once and cleans up once', async () => {
    const remote = new ControlledRemote();
    let cleanups = 0;
    const client = new EmissionsClient(remote, () => (cleanups += 1));
    const running = track(client.analyze(demo, estimate));
    const waiting = track(client.analyze(demo, estimate));
    client.failAll('the sweep worker stopped');
    await settle();
    expect(running.outcome).toMatchObject({ status: 'error', error: { message: 'the sweep worker stopped' } });
    expect(waiting.outcome).toMatchObject({ status: 'error', requestId: 2 });
    await remote.answerNext();
    expect(running.outcome?.status).toBe('error');

    const pending = track(client.analyze(demo, estimate));
    client.dispose();
    client.dispose();
    await settle();
    expect(pending.outcome?.status).toBe('superseded');
    expect(cleanups).toBe(1);
    expect(await client.analyze(demo, estimate)).toMatchObject({ status: 'error', error: { message: 'the emissions client is closed' } });
  });

  it('reports a malformed reply as a worker failure naming the field', async () => {
    const remote: EmissionsRemote = {
      analyzeEmissions: (request) => {
        const reply = sweepApi.analyzeEmissions(request);
        if (!reply.ok) throw new Error(reply.error.message);
        return Promise.resolve({ ...reply, analysis: { ...reply.analysis, input: 'guess' } });
      },
    };
    expect(await new EmissionsClient(remote).analyze(demo, estimate)).toMatchObject({
      status: 'error',
      error: { kind: 'worker-failure', issues: [expect.objectContaining({ path: 'analysis.input' })] },
    });
  });
});

describe('readEmissionsReply', () => {
  const good = (): EmissionsReply => sweepApi.analyzeEmissions({ requestId: 4, design: demo, noise: estimate });

  it('hands on a good analysis untouched', () => {
    const reply = good();
    const outcome = readEmissionsReply(reply, 4);
    expect(outcome.status === 'done' && reply.ok && outcome.analysis).toBe(reply.ok ? reply.analysis : undefined);
  });

  it('refuses a reply for another request, a column of the wrong length, and something that is not a reply', () => {
    expect(readEmissionsReply(good(), 5)).toMatchObject({ status: 'error', error: { kind: 'worker-failure', issues: [{ path: 'requestId' }] } });

    const reply = good();
    if (!reply.ok) throw new Error('expected an analysis');
    const comparisons = reply.analysis.report.comparisons.map((c, i) => (i === 0 ? { ...c, marginDb: new Float64Array(2) } : c));
    const short = { ...reply, analysis: { ...reply.analysis, report: { ...reply.analysis.report, comparisons } } };
    const outcome = readEmissionsReply(short, 4);
    expect(outcome).toMatchObject({ status: 'error', error: { issues: [expect.objectContaining({ path: 'analysis.report.comparisons[0].marginDb' })] } });
    expect(outcome.status === 'error' && outcome.error.message).toMatch(/^the worker sent a malformed emissions reply: /u);

    expect(readEmissionsReply('hello', 1)).toMatchObject({ status: 'error', error: { kind: 'worker-failure' } });
  });

  it('passes a refusal through with its issues', () => {
    const refused = sweepApi.analyzeEmissions({ requestId: 6, design: demo });
    expect(readEmissionsReply(refused, 6)).toMatchObject({ status: 'error', requestId: 6, error: { kind: 'invalid-request', issues: [{ path: 'noise' }] } });
  });
});

describe('EmissionsClient over a message channel', () => {
  const ports: MessagePort[] = [];
  afterEach(() => {
    for (const port of ports.splice(0)) port.close();
  });

  it('delivers only the newest of several quick edits, and the analysis arrives whole', async () => {
    const { port1, port2 } = new MessageChannel();
    ports.push(port1, port2);
    const seen: number[] = [];
    const api: SweepApi = {
      ...sweepApi,
      analyzeEmissions(request) {
        const reply = sweepApi.analyzeEmissions(request);
        if (reply.ok) seen.push(reply.analysis.report.targetMarginDb);
        return reply;
      },
    };
    Comlink.expose(api, port1 as unknown as Comlink.Endpoint);
    const client = new EmissionsClient(Comlink.wrap<SweepApi>(port2 as unknown as Comlink.Endpoint));
    const outcomes = await Promise.all([1, 2, 3, 4].map((margin) => client.analyze(withMargin(margin), estimate)));
    expect(outcomes.map((o) => o.status)).toEqual(['superseded', 'superseded', 'superseded', 'done']);
    // The first was already running; the middle two never reached the worker.
    expect(seen).toEqual([1, 4]);
    const last = outcomes[3]!;
    if (last.status !== 'done') throw new Error('expected an analysis');
    expect(last.analysis.frequencyHz).toBeInstanceOf(Float64Array);
    expect(last.analysis.report.comparisons[0]?.limitDbuV.length).toBe(last.analysis.frequencyHz.length);
  });
});
