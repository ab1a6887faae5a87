import { readFileSync } from 'node:fs';
import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import { readScanImportReply, ScanImportClient, type ScanImportRemote } from '../../src/client/scan-import-client.ts';
import { readScanText } from '../../src/io/scan-csv.ts';
import { type ScanImportApi, scanImportApi, type ScanImportReply, type ScanImportRequest } from '../../workers/scan-import-api.ts';

const scanText = readFileSync(new URL('../../fixtures/scans/invented-peak-qp-av-mhz.csv', import.meta.url), 'utf8');

function scanOf(reply: ScanImportReply): Extract<ScanImportReply, { ok: true }>['scan'] {
  if (!reply.ok) throw new Error(`expected a scan, got: ${reply.error.message}`);
  return reply.scan;
}

/** A remote that answers with whatever the test says, recording the requests it got. */
function fakeRemote(answer: (request: ScanImportRequest, onProgress?: (f: number) => void) => Promise<unknown>): {
  remote: ScanImportRemote;
  requests: ScanImportRequest[];
} {
  const requests: ScanImportRequest[] = [];
  return {
    requests,
    remote: {
      importScan(request, onProgress) {
        requests.push(request);
        return answer(request, onProgress);
      },
    },
  };
}

describe('ScanImportClient with a test double', () => {
  it('sends only the text and the options: an import never carries or touches a design', async () => {
    const { remote, requests } = fakeRemote((request) => Promise.resolve(scanImportApi.importScan(request)));
    const client = new ScanImportClient(remote);
    const reply = await client.importScan(scanText, { tag: 'line1' });
    expect(scanOf(reply).tag).toBe('line1');
    expect(requests).toHaveLength(1);
    expect(Object.keys(requests[0]!).sort()).toEqual(['options', 'text']);
    const plain = await client.importScan('1e6,50\n');
    expect(scanOf(plain).frequencyHz).toEqual(new Float64Array([1e6]));
    expect(Object.keys(requests[1]!)).toEqual(['text']);
  });

  it('the reader’s warnings come through the reply check (a scan in MHz read as Hz says so)', async () => {
    const { remote } = fakeRemote((request) => Promise.resolve(scanImportApi.importScan(request)));
    const reply = await new ScanImportClient(remote).importScan('0.15,60\n30,50\n');
    expect(scanOf(reply).warnings).toEqual([expect.stringMatching(/^check the frequency unit: the highest frequency is 30 Hz/u)]);
  });

  it('a remote that rejects gives { ok: false }, not a rejected promise', async () => {
    const client = new ScanImportClient(fakeRemote(() => Promise.reject(new Error('worker gone'))).remote);
    const reply = await client.importScan(scanText);
    expect(reply).toEqual({ ok: false, error: { message: 'the scan import worker did not answer: worker gone', rejected: [], notes: [] } });
  });

  it('a malformed reply is refused with the field that is wrong', async () => {
    const reply = await new ScanImportClient(fakeRemote(() => Promise.resolve({ ok: true, scan: { name: 'x' } })).remote).importScan('1,2');
    expect(reply.ok).toBe(false);
    if (reply.ok) return;
    expect(reply.error.message).toMatch(/^the scan import worker sent a malformed reply: scan\.tag/u);
  });

  it('checks lengths: a trace shorter than the axis is malformed', () => {
    const scan = { name: 's', tag: 'total', frequencyHz: new Float64Array(3), traces: [{ detector: 'peak', levelDbuV: new Float64Array(2) }], rejected: [], notes: [] };
    const reply = readScanImportReply({ ok: true, scan, elapsedMs: 1 });
    expect(reply.ok).toBe(false);
    if (reply.ok) return;
    expect(reply.error.message).toMatch(/traces\.0\.levelDbuV: has 2 values, the frequency axis has 3/u);
  });

  it('forwards rising progress only, says 1 before resolving, and drops progress that arrives late', async () => {
    let sendProgress: ((f: number) => void) | undefined;
    let answer!: (reply: unknown) => void;
    const { remote } = fakeRemote((_request, onProgress) => {
      sendProgress = onProgress;
      return new Promise((resolve) => (answer = resolve));
    });
    const client = new ScanImportClient(remote);
    const seen: number[] = [];
    const pending = client.importScan('1e6,50\n', undefined, (f) => seen.push(f));
    sendProgress?.(0.2);
    sendProgress?.(0.1); // out of order: dropped
    sendProgress?.(0.6);
    answer(scanImportApi.importScan({ text: '1e6,50\n' }));
    const reply = await pending;
    expect(reply.ok).toBe(true);
    expect(seen).toEqual([0.2, 0.6, 1]);
    sendProgress?.(0.9); // after the reply: dropped
    expect(seen).toEqual([0.2, 0.6, 1]);
  });

  it('failAll ends pending imports; dispose closes the client and calls onDispose once', async () => {
    let disposed = 0;
    const client = new ScanImportClient(fakeRemote(() => new Promise(() => {})).remote, () => (disposed += 1));
    const pending = client.importScan(scanText);
    client.failAll('the scan import worker stopped: boom');
    expect(await pending).toMatchObject({ ok: false, error: { message: 'the scan import worker stopped: boom' } });
    const second = client.importScan(scanText);
    client.dispose();
    client.dispose();
    expect(await second).toMatchObject({ ok: false, error: { message: 'the scan import client is closed' } });
    expect(await client.importScan(scanText)).toMatchObject({ ok: false, error: { message: 'the scan import client is closed' } });
    expect(disposed).toBe(1);
  });
});

describe('ScanImportClient over a MessageChannel with the real API', () => {
  const openPorts: MessagePort[] = [];
  afterEach(() => {
    for (const port of openPorts.splice(0)) port.close();
  });

  function connect(): ScanImportClient {
    const { port1, port2 } = new MessageChannel();
    openPorts.push(port1, port2);
    Comlink.expose(scanImportApi, port1 as unknown as Comlink.Endpoint);
    return new ScanImportClient(Comlink.wrap<ScanImportApi>(port2 as unknown as Comlink.Endpoint));
  }

  it('imports a scan with progress ending at 1 before the promise resolves', async () => {
    const client = connect();
    const seen: number[] = [];
    const reply = await client.importScan(scanText, { tag: 'line1', name: 'L1' }, (f) => seen.push(f));
    const expected = readScanText(scanText, { tag: 'line1', name: 'L1' });
    if (!expected.ok) throw new Error(expected.error.message);
    const scan = scanOf(reply);
    expect(scan.frequencyHz).toEqual(expected.scan.frequencyHz);
    expect(scan.traces.map((t) => [t.detector, [...t.levelDbuV]])).toEqual(expected.scan.traces.map((t) => [t.detector, [...t.levelDbuV]]));
    expect(seen.at(-1)).toBe(1);
    for (let i = 1; i < seen.length; i += 1) expect(seen[i]!).toBeGreaterThan(seen[i - 1]!);
  });

  it('a failed import returns the reasons and the rejected lines; nothing else changes', async () => {
    const client = connect();
    const seen: number[] = [];
    const reply = await client.importScan('Frequency [MHz],Peak [V]\n1,0\n', undefined, (f) => seen.push(f));
    expect(reply).toMatchObject({
      ok: false,
      error: { message: 'nothing usable in the file: all 1 data line was rejected (1 no dB value)', rejected: [{ line: 2 }] },
    });
    expect(seen).not.toContain(1);
    // The client is still usable after a failure.
    expect((await client.importScan(scanText)).ok).toBe(true);
  });
});
