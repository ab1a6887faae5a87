import { readFileSync } from 'node:fs';
import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import { readScanText } from '../../src/io/scan-csv.ts';
import { type ScanImportApi, scanImportApi, type ScanImportFailure, type ScanImportReply, type ScanImportSuccess } from '../../workers/scan-import-api.ts';

const scanText = readFileSync(new URL('../../fixtures/scans/invented-peak-qp-av-mhz.csv', import.meta.url), 'utf8');

function success(reply: ScanImportReply): ScanImportSuccess {
  if (!reply.ok) throw new Error(`expected a scan, got: ${reply.error.message}`);
  return reply;
}

function failure(reply: ScanImportReply): ScanImportFailure {
  if (reply.ok) throw new Error('expected the import to be refused');
  return reply;
}

describe('scanImportApi.importScan called directly', () => {
  it('reads a scan and reports progress to a plain function', () => {
    const reported: number[] = [];
    const reply = success(scanImportApi.importScan({ text: scanText, options: { tag: 'line1', name: 'L1' } }, (f) => reported.push(f)));
    expect(reply.scan).toMatchObject({ name: 'L1', tag: 'line1' });
    expect(reply.scan.traces.map((t) => t.detector)).toEqual(['peak', 'quasi-peak', 'average']);
    expect(reply.elapsedMs).toBeGreaterThanOrEqual(0);
    expect(reported.at(-1)).toBe(1);
  });

  it.each([
    ['not an object', 'hello', /^invalid scan import request: /u],
    ['no file', { options: {} }, /give the file as bytes or as text, not both/u],
    ['both bytes and text', { text: '1,2', bytes: new Uint8Array(3) }, /give the file as bytes or as text, not both/u],
    ['bytes that are not a Uint8Array', { bytes: [49, 44, 50] }, /bytes: expected a Uint8Array/u],
    ['text that is not a string', { text: 42 }, /text: /u],
    ['an unknown option', { text: '1,2', options: { colour: 'red' } }, /options: /u],
    ['an unknown tag', { text: '1,2', options: { tag: 'neutral' } }, /options\.tag/u],
    ['an unknown level unit', { text: '1,2', options: { levelUnit: 'dBpW' } }, /options\.levelUnit/u],
    ['a negative transfer impedance', { text: '1,2', options: { transferImpedanceOhm: -5 } }, /options\.transferImpedanceOhm/u],
    ['an unknown detector', { text: '1,2', options: { detectors: ['rms'] } }, /options\.detectors/u],
  ])('refuses %s without throwing, naming the field', (_what, request, message) => {
    const reply = failure(scanImportApi.importScan(request));
    expect(reply.error.message).toMatch(message);
    expect(reply.error.rejected).toEqual([]);
  });

  it('refuses a progress callback that is not a function', () => {
    const reply = failure(scanImportApi.importScan({ text: scanText }, 'tell me' as unknown as () => void));
    expect(reply.error.message).toBe('invalid scan import request: onProgress: expected a function');
  });

  it('reads a file’s bytes as UTF-8, like the command line, and refuses what is not UTF-8 by name', () => {
    const reply = success(scanImportApi.importScan({ bytes: new TextEncoder().encode(scanText), options: { tag: 'line1' } }));
    expect(reply.scan.frequencyHz).toEqual(success(scanImportApi.importScan({ text: scanText })).scan.frequencyHz);
    // Buffer's encoders write the files as a Windows editor or an old instrument would.
    const utf16 = failure(scanImportApi.importScan({ bytes: new Uint8Array(Buffer.from(`\uFEFF${scanText}`, 'utf16le')) }));
    expect(utf16.error.message).toBe('not UTF-8 text: the file is UTF-16 LE text (its byte-order mark says so): save it as UTF-8');
    const latin1 = failure(scanImportApi.importScan({ bytes: new Uint8Array(Buffer.from('Frequency [MHz],Peak [dBµV]\n0.15,40\n', 'latin1')) }));
    expect(latin1.error.message).toMatch(/^not UTF-8 text: byte 0xB5 at line 1, column 25 /u);
  });

  it('a file with nothing usable comes back as { ok: false } with the rejected lines', () => {
    const reply = failure(scanImportApi.importScan({ text: 'Frequency [MHz],Peak [V]\n1,0\n2,-0.5\n' }));
    expect(reply.error.message).toBe('nothing usable in the file: all 2 data lines were rejected (2 no dB value)');
    expect(reply.error.rejected).toEqual([
      { line: 2, reason: 'peak level 0 V has no dB value (a voltage must be positive)' },
      { line: 3, reason: 'peak level -0.5 V has no dB value (a voltage must be positive)' },
    ]);
    expect(reply.error.notes.length).toBeGreaterThan(0);
  });
});

describe('scanImportApi over a MessageChannel (as between threads)', () => {
  const openPorts: MessagePort[] = [];
  afterEach(() => {
    for (const port of openPorts.splice(0)) port.close();
  });

  /** The real API, recording what it sent so the sending side can be inspected afterwards. */
  function connect(): { remote: Comlink.Remote<ScanImportApi>; sent: ScanImportReply[] } {
    const sent: ScanImportReply[] = [];
    const api: ScanImportApi = {
      ...scanImportApi,
      importScan(request, onProgress) {
        const reply = scanImportApi.importScan(request, onProgress);
        sent.push(reply);
        return reply;
      },
    };
    const { port1, port2 } = new MessageChannel();
    openPorts.push(port1, port2);
    Comlink.expose(api, port1 as unknown as Comlink.Endpoint);
    return { remote: Comlink.wrap<ScanImportApi>(port2 as unknown as Comlink.Endpoint), sent };
  }

  it('moves the Float64Arrays intact and brings progress through Comlink.proxy', async () => {
    const { remote, sent } = connect();
    const reported: number[] = [];
    let reachedOne!: () => void;
    const one = new Promise<void>((resolve) => (reachedOne = resolve));
    const onProgress = (fraction: number): void => {
      reported.push(fraction);
      if (fraction === 1) reachedOne();
    };
    const reply = success(await remote.importScan({ text: scanText, options: { tag: 'line1' } }, Comlink.proxy(onProgress)));
    await one;

    const expected = readScanText(scanText, { tag: 'line1' });
    if (!expected.ok) throw new Error(expected.error.message);
    expect(reply.scan.frequencyHz).toBeInstanceOf(Float64Array);
    expect(reply.scan.frequencyHz).toEqual(expected.scan.frequencyHz);
    for (const [i, trace] of reply.scan.traces.entries()) {
      expect(trace.levelDbuV).toBeInstanceOf(Float64Array);
      expect(trace.levelDbuV).toEqual(expected.scan.traces[i]!.levelDbuV);
      expect(trace.levelDbuV.buffer).toBe(reply.scan.frequencyHz.buffer);
    }
    expect(reply.scan.notes).toEqual(expected.scan.notes);
    for (let i = 1; i < reported.length; i += 1) expect(reported[i]!).toBeGreaterThan(reported[i - 1]!);
    expect(reported.at(-1)).toBe(1);

    // Transferred, not copied: the buffer is detached on the sending side.
    const original = sent[0];
    if (!original?.ok) throw new Error('the API should have produced a scan');
    expect(original.scan.frequencyHz.byteLength).toBe(0);
    expect(original.scan.traces[0]!.levelDbuV.byteLength).toBe(0);
  });

  it('brings a refusal back as a value, not a rejected promise', async () => {
    const { remote } = connect();
    const reply = failure(await remote.importScan({ text: 'no numbers here\n' }));
    expect(reply.error.message).toMatch(/^no data lines found/u);
    const bad = failure(await remote.importScan({ text: 5 } as unknown as { text: string }));
    expect(bad.error.message).toMatch(/^invalid scan import request: text/u);
  });
});

describe('scanImportApi.importMeasuredPart: a measured part read as the command line reads it', () => {
  const bytes = (path: string) => new Uint8Array(readFileSync(new URL(`../../fixtures/measured/${path}`, import.meta.url)));

  it('a |Z| table becomes a measured part with its origin', () => {
    const reply = scanImportApi.importMeasuredPart({ bytes: bytes('invented-bead.csv'), name: 'invented-bead.csv' });
    expect(reply.ok).toBe(true);
    if (reply.ok) {
      expect(reply.kind).toBe('impedance-table');
      expect(reply.part.kind).toBe('measured');
      expect(reply.part.table.frequencyHz.length).toBeGreaterThan(10);
      expect(reply.part.origin?.fileName).toBe('invented-bead.csv');
    }
  });

  it('a two-port Touchstone file needs its fixture; with it, the same table as the command line gives', () => {
    const refused = scanImportApi.importMeasuredPart({ bytes: bytes('invented-winding-series-thru.s2p'), name: 'invented-winding-series-thru.s2p' });
    expect(refused.ok).toBe(false);
    if (!refused.ok) expect(refused.issues.join(' ')).toMatch(/series-thru or --fixture shunt-thru/u);
    const reply = scanImportApi.importMeasuredPart({ bytes: bytes('invented-winding-series-thru.s2p'), name: 'invented-winding-series-thru.s2p', fixture: 'series-thru' });
    expect(reply.ok && reply.part.origin?.format).toBe('touchstone-series-thru');
  });

  it('bytes that are not UTF-8 are refused by name', () => {
    const utf16 = new Uint8Array(Buffer.from('\uFEFFfrequency,|Z|,phase\n1e6,10,0\n', 'utf16le'));
    const reply = scanImportApi.importMeasuredPart({ bytes: utf16, name: 'z.csv' });
    expect(reply.ok).toBe(false);
    if (!reply.ok) expect(reply.message).toMatch(/UTF-16 LE/u);
  });
});
