import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readDesign } from '../../src/model/read-design.ts';
import { getAt, type JsonObject } from '../../src/planner/json.ts';
import { PlannerStore } from '../../src/planner/planner-store.ts';
import { checkDocument } from '../../src/planner/validation.ts';
import { activeVariant, variantName, workspaceOf } from '../../src/planner/workspace.ts';

/**
 * The planner store as the page uses it: every edit goes through an intent, is validated like a
 * file, can be undone and redone, and never loses the last design that validated.
 */

const demo = JSON.parse(readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8')) as JsonObject;

function storeAt(clock: { t: number }): PlannerStore {
  return new PlannerStore(workspaceOf(demo, 'demo', true), { now: () => clock.t });
}

const design = (store: PlannerStore) => {
  const checked = checkDocument(store.active.document);
  if (!checked.ok) throw new Error(checked.issues.map((i) => `${i.path}: ${i.message}`).join('; '));
  return checked.design;
};

describe('editing a field', () => {
  it('engineering text is stored as typed and read by the schema', () => {
    const store = storeAt({ t: 0 });
    store.dispatch({ type: 'set-field', path: ['stages', 0, 'elements', 3, 'part', 'inductance'], value: '4m7' });
    expect(getAt(store.active.document, ['stages', 0, 'elements', 3, 'part', 'inductance'])).toBe('4m7');
    const choke = design(store).stages[0]!.elements[3]!.part;
    expect(choke.kind === 'common-mode-choke' && choke.inductance).toBeCloseTo(4.7e-3, 15);
  });

  it('an invalid value is kept where it was typed, named by path, and the last valid design stays', () => {
    const store = storeAt({ t: 0 });
    const before = store.active.validDocument;
    store.dispatch({ type: 'set-field', path: ['stages', 0, 'elements', 0, 'part', 'capacitance'], value: '4x7' });
    const checked = checkDocument(store.active.document);
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(checked.issues.map((i) => i.path)).toContain('stages[0].elements[0].part.capacitance');
    expect(store.active.validDocument).toBe(before);
    // Fixing it makes the new document the valid one.
    store.dispatch({ type: 'set-field', path: ['stages', 0, 'elements', 0, 'part', 'capacitance'], value: '220n' });
    expect(store.active.validDocument).toBe(store.active.document);
  });

  it('format and version cannot be edited', () => {
    const store = storeAt({ t: 0 });
    expect(store.dispatch({ type: 'set-field', path: ['version'], value: 9 })).toMatchObject({ ok: false });
  });
});

describe('stages and elements', () => {
  it('add, duplicate, move and remove a stage; ids stay unique and every result validates', () => {
    const store = storeAt({ t: 0 });
    const added = store.dispatch({ type: 'add-stage' });
    expect(added.ok).toBe(true);
    const stageId = added.ok ? added.created![0]! : '';
    expect(store.workspace.selection).toEqual({ kind: 'stage', id: stageId });
    store.dispatch({ type: 'add-element', stageId, placement: 'ground-pair', kind: 'capacitor' });
    store.dispatch({ type: 'duplicate-stage', stageId });
    store.dispatch({ type: 'move-stage', stageId, to: 0 });
    const d = design(store);
    expect(d.stages.map((s) => s.id)[0]).toBe(stageId);
    expect(d.stages).toHaveLength(4);
    const ids = d.stages.flatMap((s) => [s.id, ...s.elements.map((e) => e.id)]);
    expect(new Set(ids).size).toBe(ids.length);
    store.dispatch({ type: 'remove-stage', stageId });
    expect(design(store).stages).toHaveLength(3);
  });

  it('a matched pair is two elements in both lines, of one part', () => {
    const store = storeAt({ t: 0 });
    const applied = store.dispatch({ type: 'add-element', stageId: 'mains-side', placement: 'series-pair', kind: 'inductor' });
    expect(applied.ok && applied.created).toHaveLength(2);
    const stage = design(store).stages[1]!;
    const pair = stage.elements.slice(-2);
    expect(pair.map((e) => e.placement)).toEqual(['series-line1', 'series-line2']);
    expect(pair[0]!.part).toEqual(pair[1]!.part);
  });

  it('a choke goes only across both lines', () => {
    const store = storeAt({ t: 0 });
    expect(store.dispatch({ type: 'add-element', stageId: 'mains-side', placement: 'line-to-line', kind: 'common-mode-choke' }).ok).toBe(false);
    expect(store.dispatch({ type: 'add-element', stageId: 'mains-side', placement: 'common-mode-choke', kind: 'common-mode-choke' }).ok).toBe(true);
    expect(design(store).stages[1]!.elements.at(-1)!.placement).toBe('both-lines-coupled');
  });

  it('disable, rename (id unique, pattern checked), duplicate and move an element', () => {
    const store = storeAt({ t: 0 });
    store.dispatch({ type: 'set-element-enabled', elementId: 'CX1', enabled: false });
    expect(design(store).stages[0]!.elements[0]!.enabled).toBe(false);
    expect(store.dispatch({ type: 'rename', id: 'CX1', newId: 'CY1' })).toMatchObject({ ok: false, reason: expect.stringMatching(/already used/u) });
    expect(store.dispatch({ type: 'rename', id: 'CX1', newId: '1bad' })).toMatchObject({ ok: false });
    store.dispatch({ type: 'rename', id: 'CX1', newId: 'CXin', label: 'inlet X capacitor' });
    expect(design(store).stages[0]!.elements[0]).toMatchObject({ id: 'CXin', label: 'inlet X capacitor' });
    store.dispatch({ type: 'duplicate-element', elementId: 'CXin' });
    store.dispatch({ type: 'move-element', elementId: 'CXin-copy', stageId: 'mains-side', index: 0 });
    expect(design(store).stages[1]!.elements[0]!.id).toBe('CXin-copy');
  });

  it('changing a part kind gives a default part of that kind, at a placement that suits it', () => {
    const store = storeAt({ t: 0 });
    store.dispatch({ type: 'change-part-kind', elementId: 'LCM1', kind: 'inductor' });
    const element = design(store).stages[0]!.elements[3]!;
    expect(element.placement).toBe('series-line1');
    expect(element.part.kind).toBe('inductor');
  });

  it('a refused edit changes nothing', () => {
    const store = storeAt({ t: 0 });
    const before = store.workspace;
    expect(store.dispatch({ type: 'remove-element', elementId: 'nope' }).ok).toBe(false);
    expect(store.workspace).toBe(before);
    expect(store.canUndo).toBe(false);
  });
});

describe('undo and redo', () => {
  it('every edit can be undone and redone, stage moves and variant actions included', () => {
    const clock = { t: 0 };
    const store = storeAt(clock);
    const original = store.active.document;
    store.dispatch({ type: 'move-stage', stageId: 'mains-side', to: 0 });
    clock.t += 5000;
    store.dispatch({ type: 'keep-copy', name: 'stages swapped' });
    expect(store.workspace.variants).toHaveLength(2);
    expect(store.undo()).toBe(true);
    expect(store.workspace.variants).toHaveLength(1);
    expect(store.undo()).toBe(true);
    expect(store.active.document).toBe(original);
    expect(store.undo()).toBe(false);
    expect(store.redo()).toBe(true);
    expect(design(store).stages[0]!.id).toBe('mains-side');
    expect(store.redo()).toBe(true);
    expect(store.workspace.variants.map(variantName)).toContain('stages swapped');
  });

  it('typing into one field is one history entry; another field or a pause starts a new one', () => {
    const clock = { t: 0 };
    const store = storeAt(clock);
    const path = ['stages', 0, 'elements', 0, 'part', 'capacitance'];
    for (const text of ['2', '22', '220', '220n']) {
      clock.t += 200;
      store.dispatch({ type: 'set-field', path, value: text });
    }
    clock.t += 200;
    store.dispatch({ type: 'set-field', path: ['name'], value: 'renamed' });
    clock.t += 5000;
    store.dispatch({ type: 'set-field', path, value: '330n' });
    store.undo();
    expect(getAt(store.active.document, path)).toBe('220n');
    store.undo();
    expect(store.active.document['name']).toBe(demo['name']);
    store.undo();
    expect(getAt(store.active.document, path)).toBe('100 nF');
    expect(store.canUndo).toBe(false);
  });

  it('a new edit after undo clears what could be redone', () => {
    const store = storeAt({ t: 0 });
    store.dispatch({ type: 'add-stage' });
    store.undo();
    store.dispatch({ type: 'set-field', path: ['name'], value: 'other' });
    expect(store.canRedo).toBe(false);
  });

  it('undo keeps the loaded scans and the chosen noise (they are not edits)', () => {
    const store = storeAt({ t: 0 });
    store.dispatch({ type: 'add-stage' });
    store.dispatch({ type: 'add-scan', entry: { id: 's1', name: 'scan.csv', tag: 'total', points: 10, detectors: ['peak'], notes: [], warnings: [], rejectedLines: 0, invented: false }, use: true });
    store.undo();
    expect(store.workspace.scans).toHaveLength(1);
    expect(store.workspace.noise).toEqual({ kind: 'scan', scanId: 's1' });
  });
});

describe('variants', () => {
  it('keep a copy, switch, rename, overlay (at most four), delete; the last one stays', () => {
    const store = storeAt({ t: 0 });
    for (const name of ['A', 'B', 'C', 'D', 'E']) store.dispatch({ type: 'keep-copy', name });
    const ids = store.workspace.variants.map((v) => v.id);
    expect(ids).toHaveLength(6);
    for (const id of ids.slice(1, 5)) expect(store.dispatch({ type: 'set-overlay', id, shown: true }).ok).toBe(true);
    expect(store.dispatch({ type: 'set-overlay', id: ids[5]!, shown: true })).toMatchObject({ ok: false });
    store.dispatch({ type: 'switch-variant', id: ids[1]! });
    expect(store.workspace.overlayIds).not.toContain(ids[1]);
    expect(variantName(store.active)).toBe('A');
    expect(store.dispatch({ type: 'rename-variant', id: ids[1]!, name: 'B' })).toMatchObject({ ok: false });
    store.dispatch({ type: 'rename-variant', id: ids[1]!, name: 'A prime' });
    expect(design(store).name).toBe('A prime');
    for (const id of ids) store.dispatch({ type: 'delete-variant', id });
    expect(store.workspace.variants).toHaveLength(1);
  });

  it('a variant as the baseline: a copy of its stages in emissions.baseline, which validates', () => {
    const store = storeAt({ t: 0 });
    store.dispatch({ type: 'keep-copy', name: 'as scanned' });
    const scanned = store.workspace.variants[1]!;
    store.dispatch({ type: 'remove-stage', stageId: 'mains-side' });
    store.dispatch({ type: 'set-baseline', variantId: scanned.id });
    const baseline = design(store).emissions?.baseline;
    expect(baseline?.kind).toBe('stages');
    if (baseline?.kind === 'stages') {
      expect(baseline.label).toBe('as scanned');
      expect(baseline.stages.map((s) => s.id)).toEqual(['converter-side', 'mains-side']);
    }
    expect(store.dispatch({ type: 'set-baseline', variantId: store.workspace.activeId }).ok).toBe(false);
    store.dispatch({ type: 'set-baseline', variantId: null });
    expect(design(store).emissions?.baseline).toEqual({ kind: 'none' });
  });

  it('an opened design becomes a new variant and never replaces stored work', () => {
    const store = storeAt({ t: 0 });
    const other = { ...demo, name: 'from a colleague' };
    store.dispatch({ type: 'open-design', document: other, origin: 'link', label: 'open a link' });
    expect(store.workspace.variants).toHaveLength(2);
    expect(variantName(activeVariant(store.workspace))).toBe('from a colleague');
    expect(store.workspace.variants[0]!.document).toBe(demo);
  });
});

describe('limit masks', () => {
  it('a preset copy, its points edited in a table, added and removed; a bad point is named by path', () => {
    const store = storeAt({ t: 0 });
    const masks = () => design(store).emissions?.masks ?? [];
    const before = masks().length;
    const added = store.dispatch({ type: 'add-preset-mask', presetId: 'fcc-15.107-class-b-qp' });
    expect(added.ok).toBe(true);
    const maskId = added.ok ? added.created![0]! : '';
    expect(masks()).toHaveLength(before + 1);
    expect(maskId).toBe('fcc-15.107-class-b-qp');
    const again = store.dispatch({ type: 'add-preset-mask', presetId: 'fcc-15.107-class-b-qp' });
    expect(again.ok && again.created![0]).toBe('fcc-15.107-class-b-qp-2');
    store.undo();
    const points = masks().at(-1)!.frequencyHz.length;
    store.dispatch({ type: 'insert-mask-point', maskId, point: 0 });
    expect(masks().at(-1)!.frequencyHz).toHaveLength(points + 1);
    // Halfway on the log axis between 150 kHz and 500 kHz, level halfway too (the line is straight on log f).
    expect(masks().at(-1)!.frequencyHz[1]).toBeCloseTo(Math.sqrt(150e3 * 500e3), -1);
    store.dispatch({ type: 'set-mask-point', maskId, point: 1, frequencyHz: 1e9 });
    const checked = checkDocument(store.active.document);
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(checked.issues[0]!.path).toMatch(/^emissions\.masks\[\d+\]\.frequencyHz\[2\]$/u);
    store.dispatch({ type: 'remove-mask-point', maskId, point: 1 });
    expect(checkDocument(store.active.document).ok).toBe(true);
    store.dispatch({ type: 'remove-mask', maskId });
    expect(masks()).toHaveLength(before);
  });
});

describe('listeners', () => {
  it('hear every change with its cause', () => {
    const store = storeAt({ t: 0 });
    const causes: string[] = [];
    store.subscribe((change) => causes.push(change.cause));
    store.dispatch({ type: 'select', selection: { kind: 'element', id: 'CX1' } });
    store.dispatch({ type: 'add-stage' });
    store.undo();
    store.redo();
    expect(causes).toEqual(['view', 'edit', 'undo', 'redo']);
  });

  it('the demo document itself validates (the store starts from a good design)', () => {
    expect(readDesign(demo).ok).toBe(true);
  });
});
