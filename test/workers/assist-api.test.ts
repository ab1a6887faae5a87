import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import type { AssistProgress } from '../../src/assist/run/steps.ts';
import { type AssistApi, assistApi } from '../../workers/assist-api.ts';
import { demoInput, demoScan } from '../assist/demo-fixture.ts';

const scanNoise = () => ({ kind: 'scans' as const, scans: [demoScan()] });

describe('the assistants’ worker API', () => {
  it('diagnoses the demo: the 260 kHz range is differential mode', async () => {
    const progress: AssistProgress[] = [];
    const reply = await assistApi.diagnose({ requestId: 1, design: demoInput, noise: scanNoise() }, (p) => progress.push(p));
    if (!reply.ok) throw new Error(reply.error.message);
    expect(reply.requestId).toBe(1);
    expect(reply.result.ranges[0]!.limitingMode).toBe('differential-mode');
    expect(progress.length).toBeGreaterThan(0);
    expect(progress[progress.length - 1]!.done).toBe(progress[progress.length - 1]!.total);
  });

  it('refuses a malformed request with field paths, and a bad design with the design’s paths', async () => {
    const bad = await assistApi.diagnose({ requestId: 2, design: demoInput, noise: { kind: 'scans', scans: [] } });
    expect(bad.ok).toBe(false);
    if (!bad.ok) {
      expect(bad.error.kind).toBe('invalid-request');
      expect(bad.error.issues[0]!.path).toBe('noise.scans');
    }
    const design = JSON.parse(JSON.stringify(demoInput)) as { stages: { elements: { part: { capacitance?: unknown } }[] }[] };
    design.stages[0]!.elements[0]!.part.capacitance = '4.7 q';
    const invalid = await assistApi.diagnose({ requestId: 3, design, noise: { kind: 'estimate' } });
    expect(invalid.ok).toBe(false);
    if (!invalid.ok) {
      expect(invalid.error.kind).toBe('invalid-design');
      expect(invalid.error.issues[0]!.path).toBe('stages[0].elements[0].part.capacitance');
    }
  });

  it('says when the input cannot be worked on (a design with no limits)', async () => {
    const design = JSON.parse(JSON.stringify(demoInput)) as { emissions: { masks: unknown[] } };
    design.emissions.masks = [];
    const reply = await assistApi.diagnose({ requestId: 4, design, noise: { kind: 'estimate' } });
    expect(reply.ok).toBe(false);
    if (!reply.ok) expect(reply.error.kind).toBe('unusable-input');
  });
});

describe('over a MessageChannel, as the page calls it', () => {
  let channel: MessageChannel | undefined;
  afterEach(() => {
    channel?.port1.close();
    channel?.port2.close();
  });

  it('reports progress through a proxied callback, and a cancel ends the run', async () => {
    channel = new MessageChannel();
    Comlink.expose(assistApi, channel.port1 as unknown as Comlink.Endpoint);
    const remote = Comlink.wrap<AssistApi>(channel.port2 as unknown as Comlink.Endpoint);
    let calls = 0;
    const request = { requestId: 7, design: demoInput, noise: scanNoise() };
    const pending = remote.diagnose(
      request,
      Comlink.proxy(() => {
        calls += 1;
        if (calls === 1) void remote.cancel(7);
      }),
    );
    const reply = await pending;
    expect(reply.ok).toBe(false);
    if (!reply.ok) expect(reply.error.kind).toBe('cancelled');
    expect(calls).toBeGreaterThan(0);
    // The worker is free again: the same request now runs to the end.
    const again = await remote.diagnose({ ...request, requestId: 8 });
    expect(again.ok).toBe(true);
  });
});

describe('sizing through the worker API', () => {
  it('sizes one part and answers the Y limit', async () => {
    const reply = await assistApi.size({ requestId: 20, design: demoInput, noise: { kind: 'estimate' }, target: { elementIds: ['CX2'], quantity: 'capacitance' }, series: 'E24' });
    if (!reply.ok) throw new Error(reply.error.message);
    expect(reply.result).toHaveLength(1);
    expect(reply.result[0]!.curve.value).toBeInstanceOf(Float64Array);
    const y = await assistApi.yCapacitance({ requestId: 21, design: demoInput, noise: { kind: 'estimate' }, leakageLimitA: 0.75e-3, lineVoltageV: 250, lineFrequencyHz: 50, tolerance: 0 });
    if (!y.ok) throw new Error(y.error.message);
    expect(y.result.maximumPerLineF * 1e9).toBeCloseTo(9.5493, 4);
  });

  it('refuses a quantity the part does not have', async () => {
    const reply = await assistApi.size({ requestId: 22, design: demoInput, noise: { kind: 'estimate' }, target: { elementIds: ['CX2'], quantity: 'leakage' } });
    expect(reply.ok).toBe(false);
    if (!reply.ok) expect(reply.error.kind).toBe('unusable-input');
  });
});

describe('resonances and damping through the worker API', () => {
  it('returns the resonances and a damped variant that validates as a design', async () => {
    const list = await assistApi.resonances({ requestId: 30, design: demoInput });
    if (!list.ok) throw new Error(list.error.message);
    expect(list.result.filter.length).toBeGreaterThan(0);
    const reply = await assistApi.damp({ requestId: 31, design: demoInput, noise: scanNoise(), ratio: 2 });
    if (!reply.ok) throw new Error(reply.error.message);
    const { readDesign } = await import('../../src/model/index.ts');
    expect(readDesign(JSON.parse(JSON.stringify(reply.result.suggestion!.design))).ok).toBe(true);
    expect(reply.result.suggestion!.marginAfterDb!).toBeGreaterThan(6);
  });
});

describe('stability through the worker API', () => {
  it('judges the demo behind a 127 V, 90 W converter given in the request, and refuses without one', async () => {
    const reply = await assistApi.stability({ requestId: 40, design: demoInput, lowestInputVoltageV: 127, highestInputPowerW: 90 });
    if (!reply.ok) throw new Error(reply.error.message);
    expect(reply.result.negativeResistanceOhm).toBeCloseTo(-(127 * 127) / 90, 9);
    expect(reply.result.marginDb).toBeInstanceOf(Float64Array);
    const refused = await assistApi.stability({ requestId: 41, design: demoInput });
    expect(refused.ok).toBe(false);
    if (!refused.ok) expect(refused.error.kind).toBe('unusable-input');
  });
});

describe('a proposal through the worker API', () => {
  it('proposes for the demo from its estimate, with progress', async () => {
    const progress: number[] = [];
    const reply = await assistApi.propose(
      { requestId: 50, design: demoInput, noise: { kind: 'estimate' }, maxStages: 1, leakage: { leakageLimitA: 0.75e-3, lineVoltageV: 264, lineFrequencyHz: 60 } },
      (p) => progress.push(p.done),
    );
    if (!reply.ok) throw new Error(reply.error.message);
    expect(reply.result.evaluations).toBeGreaterThan(5);
    expect(progress.length).toBeGreaterThan(0);
    for (const proposal of reply.result.proposals) expect(proposal.stages).toBe(1);
  });
});
