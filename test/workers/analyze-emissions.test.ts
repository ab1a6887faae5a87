import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import demo from '../../fixtures/demo/adapter-two-stage.design.json';
import { requireDesign } from '../../src/model/index.ts';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import type { EmissionsFailure, EmissionsReply, EmissionsSuccess } from '../../workers/emissions-protocol.ts';
import { type SweepApi, sweepApi } from '../../workers/sweep-api.ts';
import { collectTransferables } from '../../workers/transferables.ts';

function expectFailure(reply: EmissionsReply): EmissionsFailure {
  if (reply.ok) throw new Error('expected the request to be refused');
  return reply;
}

function expectSuccess(reply: EmissionsReply): EmissionsSuccess {
  if (!reply.ok) throw new Error(`expected an analysis, got: ${reply.error.message}`);
  return reply;
}

/** A small scan: a floor with three tall points, on a rising axis, every column its own array. */
function scan(overrides: Partial<{ frequencyHz: Float64Array; levels: Float64Array; tag: Scan['tag'] }> = {}): {
  name: string;
  tag: Scan['tag'];
  frequencyHz: Float64Array;
  traces: { detector: 'peak' | 'quasi-peak' | 'average'; levelDbuV: Float64Array }[];
} {
  const frequencyHz = overrides.frequencyHz ?? Float64Array.from({ length: 60 }, (_, i) => 150e3 * 200 ** (i / 59));
  const peak = overrides.levels ?? Float64Array.from(frequencyHz, (_, i) => (i % 20 === 3 ? 80 : 25));
  return {
    name: 'bench.csv',
    tag: overrides.tag ?? 'line1',
    frequencyHz,
    traces: [
      { detector: 'peak', levelDbuV: peak },
      { detector: 'average', levelDbuV: Float64Array.from(peak, (v) => v - 8) },
    ],
  };
}

const estimate = { kind: 'estimate' } as const;

describe('sweepApi.analyzeEmissions: bad requests come back as refusals, never as throws', () => {
  it.each([
    ['not an object', 'hello', null, ''],
    ['a missing request id', { design: demo, noise: estimate }, null, 'requestId'],
    ['a fractional request id', { requestId: 1.5, design: demo, noise: estimate }, null, 'requestId'],
    ['a missing noise', { requestId: 2, design: demo }, 2, 'noise'],
    ['an unknown noise kind', { requestId: 3, design: demo, noise: { kind: 'guess' } }, 3, 'noise.kind'],
    ['an unknown field', { requestId: 4, design: demo, noise: estimate, colour: 'red' }, 4, ''],
    ['a target margin out of range', { requestId: 5, design: demo, noise: estimate, options: { targetMarginDb: 99 } }, 5, 'options.targetMarginDb'],
    ['an unknown attribution', { requestId: 6, design: demo, noise: estimate, options: { attribution: 'half' } }, 6, 'options.attribution'],
    ['a scan with plain arrays', { requestId: 7, design: demo, noise: { kind: 'scan', scan: { ...scan(), frequencyHz: [1e5, 2e5] } } }, 7, 'noise.scan.frequencyHz'],
    ['a scan with no traces', { requestId: 8, design: demo, noise: { kind: 'scan', scan: { ...scan(), traces: [] } } }, 8, 'noise.scan.traces'],
    ['a scan with an unknown tag', { requestId: 9, design: demo, noise: { kind: 'scan', scan: { ...scan(), tag: 'line3' } } }, 9, 'noise.scan.tag'],
  ])('refuses %s, naming the field', (_what, request, requestId, path) => {
    const reply = expectFailure(sweepApi.analyzeEmissions(request));
    expect(reply.requestId).toBe(requestId);
    expect(reply.error.kind).toBe('invalid-request');
    expect(reply.error.message).toMatch(/^invalid emissions request/u);
    expect(reply.error.issues.map((issue) => issue.path)).toContain(path);
  });

  it('refuses a scan whose frequencies do not rise, naming the first bad point', () => {
    const f = Float64Array.from({ length: 60 }, (_, i) => 150e3 + 1e4 * i);
    f[17] = f[16]!;
    const reply = expectFailure(sweepApi.analyzeEmissions({ requestId: 10, design: demo, noise: { kind: 'scan', scan: scan({ frequencyHz: f }) } }));
    expect(reply.error.issues).toEqual([{ path: 'noise.scan.frequencyHz[17]', code: 'invalid-value', message: `frequencies must rise: ${f[17]} Hz after ${f[16]} Hz` }]);
  });

  it('refuses a frequency that is zero, negative or not finite', () => {
    for (const bad of [0, -5, Number.NaN, Number.POSITIVE_INFINITY]) {
      const f = Float64Array.from({ length: 60 }, (_, i) => 150e3 + 1e4 * i);
      f[0] = bad;
      const reply = expectFailure(sweepApi.analyzeEmissions({ requestId: 11, design: demo, noise: { kind: 'scan', scan: scan({ frequencyHz: f }) } }));
      expect(reply.error.issues[0]).toMatchObject({ path: 'noise.scan.frequencyHz[0]', code: Number.isFinite(bad) ? 'out-of-range' : 'not-finite' });
    }
  });

  it('refuses traces of another length than the axis, and levels that are not finite', () => {
    const short = scan();
    short.traces[1]!.levelDbuV = new Float64Array(59);
    const uneven = expectFailure(sweepApi.analyzeEmissions({ requestId: 12, design: demo, noise: { kind: 'scan', scan: short } }));
    expect(uneven.error.issues).toEqual([{ path: 'noise.scan.traces[1].levelDbuV', code: 'invalid-value', message: 'has 59 values, the frequency axis has 60' }]);

    const levels = new Float64Array(60).fill(30);
    levels[42] = Number.NaN;
    const nan = expectFailure(sweepApi.analyzeEmissions({ requestId: 13, design: demo, noise: { kind: 'scan', scan: scan({ levels }) } }));
    expect(nan.error.issues[0]).toMatchObject({ path: 'noise.scan.traces[0].levelDbuV[42]', code: 'not-finite' });
  });

  it('refuses an empty scan', () => {
    const reply = expectFailure(
      sweepApi.analyzeEmissions({ requestId: 14, design: demo, noise: { kind: 'scan', scan: scan({ frequencyHz: new Float64Array(0), levels: new Float64Array(0) }) } }),
    );
    expect(reply.error.issues[0]).toMatchObject({ path: 'noise.scan.frequencyHz', message: 'a scan needs at least one point' });
  });

  it('refuses an invalid design with the paths of its bad fields', () => {
    const broken = structuredClone(demo);
    broken.emissions.targetMarginDb = 500;
    const reply = expectFailure(sweepApi.analyzeEmissions({ requestId: 15, design: broken, noise: estimate }));
    expect(reply.error.kind).toBe('invalid-design');
    expect(reply.error.issues).toEqual([expect.objectContaining({ path: 'emissions.targetMarginDb', code: 'out-of-range' })]);
  });

  it('refuses to analyse an estimate the design does not have', () => {
    const { emissions, ...rest } = structuredClone(demo);
    const { estimate: _none, ...withoutEstimate } = emissions;
    const reply = expectFailure(sweepApi.analyzeEmissions({ requestId: 16, design: { ...rest, emissions: withoutEstimate }, noise: estimate }));
    expect(reply.error.kind).toBe('invalid-request');
    expect(reply.error.issues).toEqual([expect.objectContaining({ path: 'noise', message: expect.stringContaining('no noise estimate') })]);
  });

  it('refuses an estimate whose edges do not fit in the pulse, naming the field', () => {
    const broken = structuredClone(demo);
    broken.emissions.estimate.commonMode.switchNode.riseTime = '20 us';
    const reply = expectFailure(sweepApi.analyzeEmissions({ requestId: 17, design: broken, noise: estimate }));
    expect(reply.error.kind).toBe('invalid-design');
    expect(reply.error.issues[0]?.path).toBe('emissions.estimate.commonMode.switchNode');
  });
});

describe('sweepApi.analyzeEmissions: answers', () => {
  it('analyses the design’s estimate exactly as the command line does', () => {
    const reply = expectSuccess(sweepApi.analyzeEmissions({ requestId: 20, design: demo, noise: estimate }));
    expect(reply.requestId).toBe(20);
    expect(reply.elapsedMs).toBeGreaterThanOrEqual(0);
    const direct = analyzeEmissions(requireDesign(demo), { kind: 'estimate' });
    expect(reply.analysis.input).toBe('estimate');
    expect(reply.analysis.report.bands).toEqual(direct.report.bands);
    expect(reply.analysis.report.pass).toBe(direct.report.pass);
    expect(reply.analysis.frequencyHz).toEqual(direct.frequencyHz);
    expect(reply.analysis.requiredAttenuationCmDb).toEqual(direct.requiredAttenuationCmDb);
  });

  it('analyses a scan with the design’s settings, and with what-if options', () => {
    const request = { requestId: 21, design: demo, noise: { kind: 'scan' as const, scan: scan() } };
    const reply = expectSuccess(sweepApi.analyzeEmissions(request));
    expect(reply.analysis.input).toBe('scan');
    expect(reply.analysis.scanPrediction?.attribution).toBe('both');
    expect(reply.analysis.report.targetMarginDb).toBe(demo.emissions.targetMarginDb);
    const direct = analyzeEmissions(requireDesign(demo), { kind: 'scan', scan: { ...scan(), rejected: [], notes: [] } });
    expect(reply.analysis.report.worst).toEqual(direct.report.worst);

    const whatIf = expectSuccess(sweepApi.analyzeEmissions({ ...request, requestId: 22, noise: { kind: 'scan', scan: scan() }, options: { attribution: 'differential-mode', targetMarginDb: 3 } }));
    expect(whatIf.analysis.scanPrediction?.attribution).toBe('differential-mode');
    expect(whatIf.analysis.report.targetMarginDb).toBe(3);
  });

  it('lists every buffer of the analysis once for transfer, so none is copied and none is listed twice', () => {
    const reply = expectSuccess(sweepApi.analyzeEmissions({ requestId: 23, design: demo, noise: { kind: 'scan', scan: scan() } }));
    const buffers = collectTransferables(reply.analysis);
    expect(new Set(buffers).size).toBe(buffers.length);
    expect(buffers).toContain(reply.analysis.frequencyHz.buffer);
    for (const comparison of reply.analysis.report.comparisons) expect(buffers).toContain(comparison.marginDb.buffer);
  });
});

describe('analyzeEmissions over a message channel', () => {
  const ports: MessagePort[] = [];
  afterEach(() => {
    for (const port of ports.splice(0)) port.close();
  });

  it('moves the analysis’ buffers across, leaving the sending side’s detached, and keeps the page’s scan', async () => {
    const { port1, port2 } = new MessageChannel();
    ports.push(port1, port2);
    const sent: EmissionsReply[] = [];
    const api: SweepApi = {
      ...sweepApi,
      analyzeEmissions(request) {
        const reply = sweepApi.analyzeEmissions(request);
        sent.push(reply);
        return reply;
      },
    };
    Comlink.expose(api, port1 as unknown as Comlink.Endpoint);
    const remote = Comlink.wrap<SweepApi>(port2 as unknown as Comlink.Endpoint);
    const pageScan = scan();
    const reply = (await remote.analyzeEmissions({ requestId: 30, design: demo, noise: { kind: 'scan', scan: pageScan } })) as EmissionsReply;
    const received = expectSuccess(reply);
    expect(received.analysis.frequencyHz).toEqual(pageScan.frequencyHz);
    expect(received.analysis.report.comparisons.length).toBeGreaterThan(0);
    const original = sent[0];
    if (!original?.ok) throw new Error('the API should have answered');
    expect(original.analysis.frequencyHz.byteLength).toBe(0);
    expect(original.analysis.report.comparisons[0]?.limitDbuV.byteLength).toBe(0);
    // The scan went over as a copy: the page still has its own.
    expect(pageScan.frequencyHz.byteLength).toBeGreaterThan(0);
    remote[Comlink.releaseProxy]();
  });
});

describe('sweepApi.storeScan: a scan handed over once, analysed by name', () => {
  it('gives the same analysis as sending the scan itself', () => {
    expect(sweepApi.storeScan({ scanId: 'scan-a', scan: scan() })).toEqual({ ok: true, stored: expect.any(Number) });
    const byName = expectSuccess(sweepApi.analyzeEmissions({ requestId: 40, design: demo, noise: { kind: 'stored-scan', scanId: 'scan-a' } }));
    const sent = expectSuccess(sweepApi.analyzeEmissions({ requestId: 41, design: demo, noise: { kind: 'scan', scan: scan() } }));
    expect(byName.analysis.report.worst).toEqual(sent.analysis.report.worst);
    expect(Array.from(byName.analysis.predicted[0]!.levelDbuV)).toEqual(Array.from(sent.analysis.predicted[0]!.levelDbuV));
  });

  it('refuses an unknown scan id, and a malformed scan, with the field named', () => {
    const unknown = expectFailure(sweepApi.analyzeEmissions({ requestId: 42, design: demo, noise: { kind: 'stored-scan', scanId: 'never-stored' } }));
    expect(unknown.error.issues[0]).toMatchObject({ path: 'noise.scanId' });
    const bad = sweepApi.storeScan({ scanId: 'x', scan: { ...scan(), traces: [] } });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.message).toMatch(/traces/u);
  });

  it('keeps at most eight, dropping the oldest; a forgotten scan is gone', () => {
    for (let k = 0; k < 10; k += 1) sweepApi.storeScan({ scanId: `many-${k}`, scan: scan() });
    expect(expectFailure(sweepApi.analyzeEmissions({ requestId: 43, design: demo, noise: { kind: 'stored-scan', scanId: 'many-0' } })).error.kind).toBe('invalid-request');
    expectSuccess(sweepApi.analyzeEmissions({ requestId: 44, design: demo, noise: { kind: 'stored-scan', scanId: 'many-9' } }));
    expect(sweepApi.forgetScan('many-9')).toBe(true);
    expect(sweepApi.forgetScan('many-9')).toBe(false);
  });
});

describe('a stored scan analysed again and again over a real channel', () => {
  it('keeps its columns in the worker: the second analysis still reads them', async () => {
    const { port1, port2 } = new MessageChannel();
    Comlink.expose(sweepApi, port1 as unknown as Comlink.Endpoint);
    const remote = Comlink.wrap<SweepApi>(port2 as unknown as Comlink.Endpoint);
    try {
      await remote.storeScan({ scanId: 'again', scan: scan() });
      const first = (await remote.analyzeEmissions({ requestId: 50, design: demo, noise: { kind: 'stored-scan', scanId: 'again' } })) as EmissionsReply;
      const second = (await remote.analyzeEmissions({ requestId: 51, design: demo, noise: { kind: 'stored-scan', scanId: 'again' } })) as EmissionsReply;
      expect(expectSuccess(first).analysis.frequencyHz.length).toBe(60);
      expect(expectSuccess(second).analysis.frequencyHz.length).toBe(60);
    } finally {
      remote[Comlink.releaseProxy]();
      port1.close();
      port2.close();
    }
  });
});
