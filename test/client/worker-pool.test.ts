import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import { type PoolWorker, WorkerPool } from '../../src/client/worker-pool.ts';
import { assistApi } from '../../workers/assist-api.ts';
import { demoInput } from '../assist/demo-fixture.ts';

/** Workers as MessageChannels in this thread, each port exposing the real assistants' API. */
function channelWorkers(): { create: () => PoolWorker; close: () => void } {
  const channels: MessageChannel[] = [];
  return {
    create: () => {
      const channel = new MessageChannel();
      channels.push(channel);
      Comlink.expose(assistApi, channel.port1 as unknown as Comlink.Endpoint);
      return { endpoint: channel.port2 as unknown as Comlink.Endpoint, terminate: () => channel.port1.close() };
    },
    close: () => {
      for (const channel of channels) {
        channel.port1.close();
        channel.port2.close();
      }
    },
  };
}

const yieldRequest = { requestId: 1, design: demoInput, noise: { kind: 'estimate' as const }, settings: { samples: 120, seed: 5 } };

describe('the worker pool', () => {
  const pools: WorkerPool[] = [];
  const transports: { close: () => void }[] = [];
  afterEach(() => {
    for (const pool of pools.splice(0)) pool.dispose();
    for (const transport of transports.splice(0)) transport.close();
  });
  function pool(size: number): WorkerPool {
    const transport = channelWorkers();
    transports.push(transport);
    const created = new WorkerPool(transport.create, size);
    pools.push(created);
    return created;
  }

  it('gives the same yield run with one, two or three workers, and reports progress per chunk', async () => {
    const progress: number[] = [];
    const one = await pool(1).runYield(yieldRequest, { onProgress: (p) => progress.push(p.done) });
    const two = await pool(2).runYield(yieldRequest);
    const three = await pool(3).runYield(yieldRequest);
    if (one.status !== 'done' || two.status !== 'done' || three.status !== 'done') throw new Error('a run did not finish');
    expect(Array.from(two.result.worstMarginDb)).toEqual(Array.from(one.result.worstMarginDb));
    expect(Array.from(three.result.worstMarginDb)).toEqual(Array.from(one.result.worstMarginDb));
    expect(three.workers).toBe(3);
    expect(progress[progress.length - 1]).toBe(Math.ceil(120 / 25));
  });

  it('a cancel stops handing out chunks and the run resolves as cancelled', async () => {
    const controller = new AbortController();
    const outcome = await pool(2).runYield({ ...yieldRequest, settings: { samples: 2000, seed: 1 } }, {
      signal: controller.signal,
      onProgress: (p) => {
        if (p.done >= 2) controller.abort();
      },
    });
    expect(outcome.status).toBe('cancelled');
  });

  it('a bad request comes back as an error with its field path, from every worker alike', async () => {
    const outcome = await pool(2).runYield({ ...yieldRequest, settings: { samples: 0 } });
    expect(outcome.status).toBe('error');
    if (outcome.status === 'error') expect(outcome.error.message).toMatch(/settings\.samples/u);
  });
});

describe('the two-value map on the pool', () => {
  it('maps on two workers as on one, and a cell comes back as a design', async () => {
    const cleanups: (() => void)[] = [];
    const make = (size: number): WorkerPool => {
      const transport = channelWorkers();
      const created = new WorkerPool(transport.create, size);
      cleanups.push(() => {
        created.dispose();
        transport.close();
      });
      return created;
    };
    try {
    const settings = {
      x: { target: { elementIds: ['CX2'], quantity: 'capacitance' as const }, fromValue: 0.47e-6, toValue: 4.7e-6, steps: 6 },
      y: { target: { elementIds: ['CX3'], quantity: 'capacitance' as const }, fromValue: 10e-9, toValue: 470e-9, steps: 5 },
    };
    const request = { requestId: 3, design: demoInput, noise: { kind: 'estimate' as const }, settings };
    const one = await make(1).runMap(request);
    const pool = make(2);
    const two = await pool.runMap(request);
    if (one.status !== 'done' || two.status !== 'done') throw new Error('a map did not finish');
    expect(Array.from(two.result.worstMarginDb)).toEqual(Array.from(one.result.worstMarginDb));
    const cell = await pool.single().mapCell({ requestId: 4, design: demoInput, settings, x: 2.2e-6, y: 100e-9 });
    if (!cell.ok) throw new Error(cell.error.message);
    expect(cell.result.stages[1]!.elements.find((e) => e.id === 'CX2')!.part).toMatchObject({ capacitance: 2.2e-6 });
    } finally {
      for (const cleanup of cleanups) cleanup();
    }
  });
});
