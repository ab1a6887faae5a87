import demoFile from '../../../fixtures/demo/adapter-two-stage.design.json';
import { afterEach, describe, expect, it } from 'vitest';
import { capacitorSchema } from '../../../src/model/design-schema.ts';
import type { Intent } from '../../../src/planner/intents.ts';
import type { JsonObject } from '../../../src/planner/json.ts';
import { PlannerStore } from '../../../src/planner/planner-store.ts';
import { checkDocument, issuesByPath } from '../../../src/planner/validation.ts';
import { workspaceOf } from '../../../src/planner/workspace.ts';
import { INTENT_EVENT, type PlannerIntentEvent } from '../../../src/ui/app/intent-event.ts';
import '../../../src/ui/design/part-editor.ts';
import '../../../src/ui/design/stage-editor.ts';
import '../../../src/ui/editors/object-fields.ts';
import '../../../src/ui/emissions/limit-editor.ts';
import { LIMIT_PRESETS, presetSourceText } from '../../../src/spectrum/limit-presets.ts';

/**
 * The editors send intents and show what the store says: a field typed as text, a unit beside it,
 * the schema's own message at a field it refuses, parts added and removed by button or key.
 * A store stands in for the planner, so each element meets the real edits.
 */

const demo = structuredClone(demoFile) as unknown as JsonObject;

/** Mount an element inside a host that applies its intents to a store, as the planner does. */
function mount<T extends HTMLElement>(tag: string, store: PlannerStore, setup: (element: T) => void): { element: T; sent: Intent[] } {
  const host = document.createElement('div');
  const sent: Intent[] = [];
  host.addEventListener(INTENT_EVENT, (event) => {
    const e = event as PlannerIntentEvent;
    sent.push(e.detail.intent);
    e.detail.applied = store.dispatch(e.detail.intent);
  });
  const element = document.createElement(tag) as T;
  setup(element);
  host.append(element);
  document.body.append(host);
  return { element, sent };
}

afterEach(() => {
  document.body.replaceChildren();
});

const root = (element: HTMLElement): ShadowRoot => element.shadowRoot!;
async function settled(element: HTMLElement): Promise<void> {
  await (element as unknown as { updateComplete: Promise<unknown> }).updateComplete;
}

function type(input: HTMLInputElement, text: string): void {
  input.value = text;
  input.dispatchEvent(new Event('input', { bubbles: true, composed: true }));
}

describe('the fields of a part, from the schema', () => {
  it('every capacitor field, with its unit; typed text goes to the store as typed', async () => {
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    const path = ['stages', 0, 'elements', 0, 'part'];
    const { element, sent } = mount<HTMLElement & { document: JsonObject; path: unknown; schema: unknown; issues: unknown }>('chokepoint-object-fields', store, (e) => {
      e.document = store.active.document;
      e.path = path;
      e.schema = capacitorSchema;
    });
    await settled(element);
    const labels = [...root(element).querySelectorAll('label')].map((l) => l.textContent?.replace(/\s+/gu, ' ').trim());
    expect(labels).toEqual(['Capacitance', 'ESR', 'ESL', 'Safety class', 'Rated voltage optional']);
    const units = [...root(element).querySelectorAll('.unit')].map((u) => u.textContent);
    expect(units).toEqual(['F', 'Ω', 'H', 'V']);
    const capacitance = root(element).querySelector<HTMLInputElement>('input.quantity')!;
    expect(capacitance.value).toBe('100 nF');
    type(capacitance, '4n7');
    expect(sent.at(-1)).toEqual({ type: 'set-field', path: [...path, 'capacitance'], value: '4n7' });
    const checked = checkDocument(store.active.document);
    expect(checked.ok && checked.design.stages[0]!.elements[0]!.part.kind === 'capacitor' && checked.design.stages[0]!.elements[0]!.part.capacitance).toBeCloseTo(4.7e-9, 18);
  });

  it('a value the schema refuses is marked at its field with the schema’s message', async () => {
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    store.dispatch({ type: 'set-field', path: ['stages', 0, 'elements', 0, 'part', 'esl'], value: '10 nX' });
    const issues = issuesByPath(checkDocument(store.active.document));
    const { element } = mount<HTMLElement & { document: JsonObject; path: unknown; schema: unknown; issues: unknown }>('chokepoint-object-fields', store, (e) => {
      e.document = store.active.document;
      e.path = ['stages', 0, 'elements', 0, 'part'];
      e.schema = capacitorSchema;
      e.issues = issues;
    });
    await settled(element);
    const invalid = [...root(element).querySelectorAll('input[aria-invalid="true"]')];
    expect(invalid).toHaveLength(1);
    expect((invalid[0] as HTMLInputElement).value).toBe('10 nX');
    expect(root(element).querySelector('.field-error')?.textContent).toBe(issues.get('stages[0].elements[0].part.esl'));
    expect(root(element).querySelector('.field-error')?.textContent).toMatch(/cannot read "10 nX"/u);
  });
});

describe('the stage editor', () => {
  it('adds a matched pair of parts by placement and kind, selects it, and removes a stage', async () => {
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    const { element, sent } = mount<HTMLElement & { document: JsonObject; design: unknown }>('chokepoint-stage-editor', store, (e) => {
      e.document = store.active.document;
    });
    await settled(element);
    const stage = root(element).querySelectorAll('li.stage')[1]!;
    const [placement, kind] = stage.querySelectorAll('.add select') as NodeListOf<HTMLSelectElement>;
    placement!.value = 'ground-pair';
    placement!.dispatchEvent(new Event('change'));
    await settled(element);
    kind!.value = 'capacitor';
    kind!.dispatchEvent(new Event('change'));
    (stage.querySelector('.add button') as HTMLButtonElement).click();
    expect(sent.at(-1)).toEqual({ type: 'add-element', stageId: 'mains-side', placement: 'ground-pair', kind: 'capacitor' });
    expect(store.workspace.selection).toEqual({ kind: 'element', id: 'CY3' });
    (root(element).querySelector('button[aria-label="Remove stage 1"]') as HTMLButtonElement).click();
    expect(checkDocument(store.active.document).ok && (store.active.document['stages'] as unknown[]).length).toBe(1);
  });

  it('Alt+↓ on a part moves it down its stage; Delete removes it', async () => {
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    const { element } = mount<HTMLElement & { document: JsonObject }>('chokepoint-stage-editor', store, (e) => {
      e.document = store.active.document;
    });
    await settled(element);
    const row = root(element).querySelector<HTMLElement>('li.element[data-element="CX1"]')!;
    row.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowDown', altKey: true, bubbles: true }));
    const ids = () => ((store.active.document['stages'] as { elements: { id: string }[] }[])[0]!.elements).map((e) => e.id);
    expect(ids()).toEqual(['CY1', 'CX1', 'CY2', 'LCM1']);
    row.dispatchEvent(new KeyboardEvent('keydown', { key: 'Delete', bubbles: true }));
    expect(ids()).toEqual(['CY1', 'CY2', 'LCM1']);
  });
});

describe('the part editor', () => {
  it('refuses an id already used, at the field, and keeps the old one', async () => {
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    const { element } = mount<HTMLElement & { document: JsonObject; elementId: string }>('chokepoint-part-editor', store, (e) => {
      e.document = store.active.document;
      e.elementId = 'CX1';
    });
    await settled(element);
    const id = root(element).querySelector<HTMLInputElement>('#part-id')!;
    id.value = 'CY1';
    id.dispatchEvent(new Event('change'));
    await settled(element);
    expect(root(element).querySelector('#rename-error')?.textContent).toMatch(/already used/u);
    expect(JSON.stringify(store.active.document)).toContain('"id":"CX1"');
  });
});

describe('the limit editor', () => {
  it('says where a preset’s values come from in plain words, not in status codes', () => {
    const texts = new Set(LIMIT_PRESETS.map(presetSourceText));
    expect([...texts].sort()).toEqual(['from a secondary source: check against the standard before relying on it', 'from the published table']);
  });

  it('edits a point of a limit in its table; a point that breaks the rising order is marked', async () => {
    const store = new PlannerStore(workspaceOf(demo, 'demo', true));
    const { element } = mount<HTMLElement & { document: JsonObject; issues: unknown }>('chokepoint-limit-editor', store, (e) => {
      e.document = store.active.document;
    });
    await settled(element);
    const open = [...root(element).querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent === 'Edit the points')!;
    open.click();
    await settled(element);
    const first = root(element).querySelector<HTMLInputElement>('table.points input[aria-label="Level of point 1, dBµV"]')!;
    type(first, '64,5');
    const mask = (store.active.document['emissions'] as { masks: { levelDbuV: unknown[] }[] }).masks[0]!;
    expect(mask.levelDbuV[0]).toBe(64.5);
    const frequency = root(element).querySelector<HTMLInputElement>('table.points input[aria-label="Frequency of point 2, Hz"]')!;
    type(frequency, '1e9');
    const checked = checkDocument(store.active.document);
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(checked.issues[0]!.path).toMatch(/^emissions\.masks\[0\]\.frequencyHz\[\d\]$/u);
  });
});
