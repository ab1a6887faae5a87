import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import demo from '../../fixtures/demo/adapter-two-stage.design.json';
import { SweepClient } from '../../src/client/sweep-client.ts';
import type { SweepOutcome } from '../../src/client/sweep-outcome.ts';
import { sweepDesign, SWEEP_COLUMNS, type SweepResult } from '../../src/engine/index.ts';
import { requireDesign } from '../../src/model/index.ts';
import { type SweepApi, sweepApi } from '../../workers/sweep-api.ts';
import type { SweepReply } from '../../workers/sweep-protocol.ts';

// The same wiring as the app, with a MessageChannel standing in for the worker's message port:
// replies are structured-cloned and their buffers transferred exactly as between threads.

const openPorts: MessagePort[] = [];

afterEach(() => {
  for (const port of openPorts.splice(0)) port.close();
});

/** Expose an API on one end of a channel and return a client for the other end. */
function connect(api: SweepApi): SweepClient {
  const { port1, port2 } = new MessageChannel();
  openPorts.push(port1, port2);
  Comlink.expose(api, port1 as unknown as Comlink.Endpoint);
  return new SweepClient(Comlink.wrap<SweepApi>(port2 as unknown as Comlink.Endpoint));
}

/** The real API, recording what it sent so the test can inspect the sending side afterwards. */
function recordingApi(): { api: SweepApi; sent: SweepReply[] } {
  const sent: SweepReply[] = [];
  const api: SweepApi = {
    ...sweepApi,
    sweep(request) {
      const reply = sweepApi.sweep(request);
      sent.push(reply);
      return reply;
    },
    analyzeEmissions: sweepApi.analyzeEmissions,
  };
  return { api, sent };
}

function done(outcome: SweepOutcome): SweepResult {
  if (outcome.status !== 'done') throw new Error(`expected a finished sweep, got ${JSON.stringify(outcome)}`);
  return outcome.result;
}

describe('SweepClient over a message channel', () => {
  it('delivers the sweep with every column intact and moves, not copies, the buffers', async () => {
    const { api, sent } = recordingApi();
    const client = connect(api);
    const outcome = await client.request(demo);
    const received = done(outcome);
    const expected = sweepDesign(requireDesign(demo));

    expect(received.frequencyHz).toBeInstanceOf(Float64Array);
    expect(received.frequencyHz).toEqual(expected.frequencyHz);
    for (const { id } of SWEEP_COLUMNS) {
      expect(received.columns[id], id).toBeInstanceOf(Float64Array);
      expect(received.columns[id], id).toEqual(expected.columns[id]);
    }
    expect(received.pointOrigin).toEqual(expected.pointOrigin);
    expect(received.resonances).toEqual(expected.resonances);
    expect(received.elements.map((e) => e.id)).toEqual(expected.elements.map((e) => e.id));
    expect(received.elements[0]?.views[0]?.magnitudeOhm).toEqual(expected.elements[0]?.views[0]?.magnitudeOhm);

    // Transferred buffers are detached on the sending side.
    const original = sent[0];
    if (!original?.ok) throw new Error('the API should have produced a result');
    expect(original.result.frequencyHz.byteLength).toBe(0);
    expect(original.result.columns.insertionLoss50Cm.byteLength).toBe(0);
  });

  it('never delivers a superseded result: only the newest design reaches the caller', async () => {
    const { api, sent } = recordingApi();
    const client = connect(api);
    const named = (name: string): unknown => ({ ...demo, name });
    const requests = ['first', 'second', 'third', 'fourth'].map((name) => client.request(named(name)));
    const outcomes = await Promise.all(requests);

    expect(outcomes.map((o) => o.status)).toEqual(['superseded', 'superseded', 'superseded', 'done']);
    expect(done(outcomes[3]!).designName).toBe('fourth');
    // The first was already running and finished; the middle two never reached the worker.
    expect(sent.map((reply) => reply.ok && reply.result.designName)).toEqual(['first', 'fourth']);
    expect(sent.map((reply) => reply.requestId)).toEqual([1, 4]);
  });

  it('brings back a refusal for an invalid design with field paths', async () => {
    const client = connect(sweepApi);
    const broken = structuredClone(demo);
    broken.stages[1]!.elements[0]!.part.capacitance = 'lots';
    const outcome = await client.request(broken);
    expect(outcome).toMatchObject({
      status: 'error',
      error: { kind: 'invalid-design', issues: [expect.objectContaining({ path: 'stages[1].elements[0].part.capacitance', code: 'bad-quantity' })] },
    });
  });
});
