import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { packRecord, unpackRecord } from '../../../src/client/storage/workspace-record.ts';
import type { JsonObject } from '../../../src/planner/json.ts';
import { PlannerStore } from '../../../src/planner/planner-store.ts';
import { workspaceOf } from '../../../src/planner/workspace.ts';

/** The saved form of the work: everything comes back as it was; a damaged record is refused with a reason. */

const demo = JSON.parse(readFileSync(new URL('../../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8')) as JsonObject;

function editedStore(): PlannerStore {
  let t = 0;
  const store = new PlannerStore(workspaceOf(demo, 'demo', true), { now: () => (t += 5000) });
  store.dispatch({ type: 'keep-copy', name: 'as it was' });
  store.dispatch({ type: 'set-field', path: ['stages', 0, 'elements', 0, 'part', 'capacitance'], value: '4x7' });
  store.dispatch({ type: 'add-stage' });
  store.dispatch({ type: 'set-overlay', id: store.workspace.variants[1]!.id, shown: true });
  store.dispatch({ type: 'select', selection: { kind: 'element', id: 'CX1' } });
  store.dispatch({ type: 'add-scan', entry: { id: 's1', name: 'scan.csv', tag: 'total', points: 3, detectors: ['peak'], notes: ['read as dBµV'], warnings: [], rejectedLines: 0, invented: false }, use: true });
  store.undo();
  return store;
}

describe('the saved workspace record', () => {
  it('brings back the variants, the edit in progress, overlays, selection, scans and the history', () => {
    const store = editedStore();
    const record = packRecord(store.workspace, store.historyForSaving(40), { revision: 3, writer: 'tab-a', savedAt: 1 });
    const back = unpackRecord(structuredClone(record));
    if (!back.ok) throw new Error(back.reason);
    expect(back.workspace).toEqual(store.workspace);
    expect(back.history.past.map((p) => p.label)).toEqual(store.historyForSaving(40).past.map((p) => p.label));
    expect(back.history.future).toHaveLength(1);
    // Restored, the store undoes as it would have.
    const restored = new PlannerStore(back.workspace, { history: back.history });
    expect(restored.redo()).toBe(true);
    expect(restored.workspace.variants[0]!.document['stages']).toHaveLength(3);
  });

  it('stores each document once, however many history steps share it', () => {
    const store = editedStore();
    const record = packRecord(store.workspace, store.historyForSaving(40), { revision: 1, writer: 'a', savedAt: 1 });
    expect(record.documents.length).toBeLessThan(8);
  });

  it('refuses a damaged record with a reason instead of half-reading it', () => {
    const store = editedStore();
    const record = packRecord(store.workspace, store.historyForSaving(40), { revision: 1, writer: 'a', savedAt: 1 });
    const cases: unknown[] = [
      null,
      'text',
      { ...record, version: 99 },
      { ...record, workspace: { ...record.workspace, activeId: 'nope' } },
      { ...record, documents: record.documents.slice(0, 1) },
      { ...record, documents: [42, ...record.documents.slice(1)] },
    ];
    for (const damaged of cases) {
      const read = unpackRecord(damaged);
      expect(read.ok).toBe(false);
      if (!read.ok) expect(read.reason.length).toBeGreaterThan(10);
    }
  });
});
