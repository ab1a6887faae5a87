import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { type PlannerRemote, PlannerResults } from '../../src/client/planner-results.ts';
import { readScanText } from '../../src/io/scan-csv.ts';
import type { JsonObject } from '../../src/planner/json.ts';
import { PlannerStore } from '../../src/planner/planner-store.ts';
import { workspaceOf } from '../../src/planner/workspace.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { sweepApi } from '../../workers/sweep-api.ts';

/**
 * The page's results per variant, against the worker's real API run in-process: each variant is
 * swept and judged for its last valid document, an unchanged variant is not swept again, a scan is
 * handed over once, and an answer for a document no longer shown is dropped.
 */

const demo = JSON.parse(readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8')) as JsonObject;
const scanRead = readScanText(readFileSync(new URL('../../fixtures/scans/invented-adapter-no-filter.csv', import.meta.url), 'utf8'), { tag: 'line1' });
if (!scanRead.ok) throw new Error(scanRead.error.message);
const scan: Scan = scanRead.scan;

function countingRemote() {
  const calls = { sweep: 0, analyze: 0, store: 0 };
  const remote: PlannerRemote = {
    sweep: async (request) => ((calls.sweep += 1), sweepApi.sweep(request)),
    analyzeEmissions: async (request) => ((calls.analyze += 1), sweepApi.analyzeEmissions(request)),
    storeScan: async (request) => ((calls.store += 1), sweepApi.storeScan(request)),
    safetyChecks: async (request) => sweepApi.safetyChecks(request),
  };
  return { remote, calls };
}

/** Wait until every result has settled. */
async function settled(results: PlannerResults, ids: readonly string[]): Promise<void> {
  for (let i = 0; i < 200; i += 1) {
    const done = ids.every((id) => {
      const r = results.resultFor(id);
      return r && r.sweep.status !== 'running' && r.analysis.status !== 'running' && r.safety.status !== 'running';
    });
    if (done) return;
    await new Promise((resolve) => setTimeout(resolve, 5));
  }
  throw new Error('results did not settle');
}

describe('results per variant', () => {
  it('sweeps and judges every variant, the edited one with its own numbers', async () => {
    const { remote, calls } = countingRemote();
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    store.dispatch({ type: 'keep-copy', name: 'one stage' });
    const copy = store.workspace.variants[1]!.id;
    store.dispatch({ type: 'switch-variant', id: copy });
    store.dispatch({ type: 'remove-stage', stageId: 'mains-side' });
    const changed: string[] = [];
    const results = new PlannerResults(remote, () => undefined, (id) => changed.push(id));
    results.update(store.workspace);
    await settled(results, ['v1', copy]);
    const one = results.resultFor(copy)!;
    const two = results.resultFor('v1')!;
    expect(one.sweep.status).toBe('done');
    expect(two.sweep.status).toBe('done');
    if (one.sweep.status === 'done' && two.sweep.status === 'done') {
      expect(one.sweep.result.elements.length).toBeLessThan(two.sweep.result.elements.length);
    }
    // The demo has a noise estimate: both are judged from it.
    expect(one.analysis.status).toBe('done');
    expect(calls.sweep).toBe(2);
    expect(changed).toContain(copy);
    // And its safety checks, which say what they need (the demo gives no supply).
    const safety = one.safety.status === 'done' ? one.safety.report : undefined;
    expect(safety?.checks.find((c) => c.id === 'leakage')?.status).toBe('not-checked');

    // Nothing changed: nothing is asked of the worker again.
    results.update(store.workspace);
    await settled(results, ['v1', copy]);
    expect(calls.sweep).toBe(2);
  });

  it('an invalid edit keeps the last valid results; undo finds the earlier ones without a sweep', async () => {
    const { remote, calls } = countingRemote();
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    const results = new PlannerResults(remote, () => undefined, () => undefined);
    results.update(store.workspace);
    await settled(results, ['v1']);
    const first = results.resultFor('v1')!;
    store.dispatch({ type: 'set-field', path: ['stages', 0, 'elements', 0, 'part', 'capacitance'], value: 'oops' });
    results.update(store.workspace);
    expect(results.resultFor('v1')).toBe(first);
    store.dispatch({ type: 'set-field', path: ['stages', 0, 'elements', 0, 'part', 'capacitance'], value: '220n' });
    results.update(store.workspace);
    await settled(results, ['v1']);
    expect(calls.sweep).toBe(2);
    store.undo();
    store.undo();
    results.update(store.workspace);
    expect(results.resultFor('v1')!.sweep).toEqual(first.sweep);
    expect(calls.sweep).toBe(2);
  });

  it('a scan is handed to the worker once and judged by name; an unknown scan is said, not thrown', async () => {
    const { remote, calls } = countingRemote();
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    store.dispatch({ type: 'add-scan', entry: { id: 'demo-scan', name: scan.name, tag: scan.tag, points: scan.frequencyHz.length, detectors: ['peak', 'quasi-peak', 'average'], notes: [], warnings: [], rejectedLines: 0, invented: true }, use: true });
    const results = new PlannerResults(remote, (id) => (id === 'demo-scan' ? scan : undefined), () => undefined);
    results.update(store.workspace);
    await settled(results, ['v1']);
    const analysis = results.resultFor('v1')!.analysis;
    expect(analysis.status).toBe('done');
    if (analysis.status === 'done') expect(analysis.analysis.input).toBe('scan');
    store.dispatch({ type: 'set-field', path: ['emissions', 'targetMarginDb'], value: 3 });
    results.update(store.workspace);
    await settled(results, ['v1']);
    expect(calls.store).toBe(1);
    expect(calls.analyze).toBe(2);

    const lost = new PlannerResults(remote, () => undefined, () => undefined);
    lost.update({ ...store.workspace, noise: { kind: 'scan', scanId: 'gone' } });
    await settled(lost, ['v1']);
    expect(lost.resultFor('v1')!.analysis).toMatchObject({ status: 'idle', reason: expect.stringMatching(/not loaded/u) });
  });

  it('hands back only the storage of results evicted from the kept ones and held by nothing shown', async () => {
    const { remote } = countingRemote();
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    const released: ArrayBuffer[] = [];
    const results = new PlannerResults(remote, () => undefined, () => undefined, (buffer) => released.push(buffer));
    const sweepsSeen: ArrayBuffer[] = [];
    const edit = async (nanofarads: number): Promise<void> => {
      store.dispatch({ type: 'set-field', path: ['stages', 0, 'elements', 0, 'part', 'capacitance'], value: `${nanofarads}n` });
      results.update(store.workspace);
      await settled(results, ['v1']);
      const sweep = results.resultFor('v1')!.sweep;
      if (sweep.status === 'done') sweepsSeen.push(sweep.result.frequencyHz.buffer as ArrayBuffer);
    };
    results.update(store.workspace);
    await settled(results, ['v1']);
    // Eight results are kept per variant (undo finds them): nothing is released before a ninth.
    for (let k = 1; k <= 7; k += 1) await edit(100 + k);
    expect(released).toEqual([]);
    for (let k = 8; k <= 10; k += 1) await edit(100 + k);
    expect(released.length).toBe(3);
    const shown = results.resultFor('v1')!.sweep;
    for (const buffer of released) {
      // The oldest results, never the one shown.
      expect(sweepsSeen.indexOf(buffer)).toBeLessThan(3);
      if (shown.status === 'done') expect(buffer).not.toBe(shown.result.frequencyHz.buffer);
    }
  });
});
