import type { PartKind, Placement } from '../../model/design.ts';
import { cloneJson, getAt, isJsonObject, type Json, type JsonObject, type JsonPath, setAt } from '../json.ts';
import { type AddPlacement, defaultPart, ELEMENT_PLACEMENTS, idPrefix } from '../part-defaults.ts';

/**
 * Edits of one design document: stages and elements added, removed, duplicated, moved, renamed,
 * switched on and off, and any field set by its path. Each takes a document and returns a new one
 * (or a reason it cannot be done), so the store can keep the old one for undo. Ids stay unique
 * across stages and elements, as the format requires.
 */

export type EditResult = { readonly ok: true; readonly document: JsonObject; readonly created?: readonly string[] } | { readonly ok: false; readonly reason: string };

const ID_PATTERN = /^[A-Za-z][A-Za-z0-9_-]{0,63}$/u;
/** The format's limits (design-schema.ts): 32 stages, 64 elements per stage. */
export const MAX_STAGES = 32;
export const MAX_ELEMENTS_PER_STAGE = 64;

function stagesOf(document: JsonObject): readonly JsonObject[] {
  const stages = document['stages'];
  return Array.isArray(stages) ? (stages as readonly Json[]).filter(isJsonObject) : [];
}

function elementsOf(stage: JsonObject): readonly JsonObject[] {
  const elements = stage['elements'];
  return Array.isArray(elements) ? (elements as readonly Json[]).filter(isJsonObject) : [];
}

/** Every id used by a stage or an element of the document. */
export function usedIds(document: JsonObject): Set<string> {
  const ids = new Set<string>();
  for (const stage of stagesOf(document)) {
    if (typeof stage['id'] === 'string') ids.add(stage['id']);
    for (const element of elementsOf(stage)) if (typeof element['id'] === 'string') ids.add(element['id']);
  }
  return ids;
}

/** The first `prefix<n>` not taken, n from 1. */
export function freshId(prefix: string, taken: ReadonlySet<string>): string {
  for (let n = 1; ; n += 1) {
    const id = `${prefix}${n}`;
    if (!taken.has(id)) return id;
  }
}

export function findStage(document: JsonObject, stageId: string): number {
  return stagesOf(document).findIndex((stage) => stage['id'] === stageId);
}

/** Where an element sits: its stage and its index in that stage. */
export function findElement(document: JsonObject, elementId: string): { stage: number; element: number } | undefined {
  const stages = stagesOf(document);
  for (let s = 0; s < stages.length; s += 1) {
    const e = elementsOf(stages[s]!).findIndex((element) => element['id'] === elementId);
    if (e >= 0) return { stage: s, element: e };
  }
  return undefined;
}

function withStages(document: JsonObject, stages: readonly JsonObject[]): JsonObject {
  return { ...document, stages };
}

function withElements(document: JsonObject, stageIndex: number, elements: readonly JsonObject[]): JsonObject {
  const stages = [...stagesOf(document)];
  stages[stageIndex] = { ...stages[stageIndex]!, elements };
  return withStages(document, stages);
}

export function setField(document: JsonObject, path: JsonPath, value: Json | undefined): EditResult {
  if (path.length === 0) return { ok: false, reason: 'no field named' };
  if (path[0] === 'format' || path[0] === 'version') return { ok: false, reason: `"${String(path[0])}" is fixed by the program` };
  const next = setAt(document, path, value);
  return isJsonObject(next) ? { ok: true, document: next } : { ok: false, reason: 'the document must stay an object' };
}

/** A new empty stage after `afterIndex` (at the end when undefined). */
export function addStage(document: JsonObject, afterIndex?: number): EditResult {
  const stages = stagesOf(document);
  if (stages.length >= MAX_STAGES) return { ok: false, reason: `a design holds at most ${MAX_STAGES} stages` };
  const id = freshId('stage-', usedIds(document));
  const at = afterIndex === undefined ? stages.length : Math.min(stages.length, Math.max(0, afterIndex + 1));
  const next = [...stages];
  next.splice(at, 0, { id, label: `Stage ${stages.length + 1}`, elements: [] });
  return { ok: true, document: withStages(document, next), created: [id] };
}

export function removeStage(document: JsonObject, stageId: string): EditResult {
  const at = findStage(document, stageId);
  if (at < 0) return { ok: false, reason: `no stage "${stageId}"` };
  const next = [...stagesOf(document)];
  next.splice(at, 1);
  return { ok: true, document: withStages(document, next) };
}

/** A copy of a stage right after it, with fresh ids for the stage and each of its elements. */
export function duplicateStage(document: JsonObject, stageId: string): EditResult {
  const at = findStage(document, stageId);
  if (at < 0) return { ok: false, reason: `no stage "${stageId}"` };
  const stages = stagesOf(document);
  if (stages.length >= MAX_STAGES) return { ok: false, reason: `a design holds at most ${MAX_STAGES} stages` };
  const taken = usedIds(document);
  const original = stages[at]!;
  const stageCopyId = copyId(typeof original['id'] === 'string' ? original['id'] : 'stage', taken);
  taken.add(stageCopyId);
  const created = [stageCopyId];
  const elements = elementsOf(original).map((element) => {
    const id = copyId(typeof element['id'] === 'string' ? element['id'] : 'E', taken);
    taken.add(id);
    created.push(id);
    return { ...cloneJson(element), id };
  });
  const label = typeof original['label'] === 'string' ? `${original['label']} (copy)` : undefined;
  const copy: JsonObject = { ...cloneJson(original), id: stageCopyId, elements, ...(label === undefined ? {} : { label: label.slice(0, 200) }) };
  const next = [...stages];
  next.splice(at + 1, 0, copy);
  return { ok: true, document: withStages(document, next), created };
}

/** Move a stage to index `to` (clamped); the order runs from the noise source to the LISN. */
export function moveStage(document: JsonObject, stageId: string, to: number): EditResult {
  const from = findStage(document, stageId);
  if (from < 0) return { ok: false, reason: `no stage "${stageId}"` };
  const stages = [...stagesOf(document)];
  const target = Math.min(stages.length - 1, Math.max(0, to));
  if (target === from) return { ok: true, document };
  const [stage] = stages.splice(from, 1);
  stages.splice(target, 0, stage!);
  return { ok: true, document: withStages(document, stages) };
}

/** Add one element, or a matched pair, of a kind at a placement, at the end of a stage. */
export function addElement(document: JsonObject, stageId: string, placement: AddPlacement, kind: PartKind, part?: JsonObject): EditResult {
  const at = findStage(document, stageId);
  if (at < 0) return { ok: false, reason: `no stage "${stageId}"` };
  const placements = ELEMENT_PLACEMENTS[placement];
  if (kind === 'common-mode-choke' && placement !== 'common-mode-choke') return { ok: false, reason: 'a common-mode choke sits across both lines' };
  if (kind !== 'common-mode-choke' && placement === 'common-mode-choke') return { ok: false, reason: 'only a common-mode choke sits across both lines' };
  const elements = [...elementsOf(stagesOf(document)[at]!)];
  if (elements.length + placements.length > MAX_ELEMENTS_PER_STAGE) return { ok: false, reason: `a stage holds at most ${MAX_ELEMENTS_PER_STAGE} elements` };
  const taken = usedIds(document);
  const created: string[] = [];
  for (const where of placements) {
    const id = freshId(idPrefix(kind, where), taken);
    taken.add(id);
    created.push(id);
    elements.push({ id, placement: where, part: part ? cloneJson(part) : defaultPart(kind, where) });
  }
  return { ok: true, document: withElements(document, at, elements), created };
}

export function removeElement(document: JsonObject, elementId: string): EditResult {
  const where = findElement(document, elementId);
  if (!where) return { ok: false, reason: `no element "${elementId}"` };
  const elements = [...elementsOf(stagesOf(document)[where.stage]!)];
  elements.splice(where.element, 1);
  return { ok: true, document: withElements(document, where.stage, elements) };
}

/** A copy of an element right after it, with a fresh id. */
export function duplicateElement(document: JsonObject, elementId: string): EditResult {
  const where = findElement(document, elementId);
  if (!where) return { ok: false, reason: `no element "${elementId}"` };
  const elements = [...elementsOf(stagesOf(document)[where.stage]!)];
  if (elements.length >= MAX_ELEMENTS_PER_STAGE) return { ok: false, reason: `a stage holds at most ${MAX_ELEMENTS_PER_STAGE} elements` };
  const id = copyId(elementId, usedIds(document));
  elements.splice(where.element + 1, 0, { ...cloneJson(elements[where.element]!), id });
  return { ok: true, document: withElements(document, where.stage, elements), created: [id] };
}

/** Move an element to a stage (its own by default) at an index there (clamped). */
export function moveElement(document: JsonObject, elementId: string, toStageId: string, toIndex: number): EditResult {
  const where = findElement(document, elementId);
  if (!where) return { ok: false, reason: `no element "${elementId}"` };
  const target = findStage(document, toStageId);
  if (target < 0) return { ok: false, reason: `no stage "${toStageId}"` };
  const stages = stagesOf(document).map((stage) => ({ ...stage, elements: [...elementsOf(stage)] }));
  const [element] = stages[where.stage]!.elements.splice(where.element, 1);
  const into = stages[target]!.elements;
  if (target !== where.stage && into.length >= MAX_ELEMENTS_PER_STAGE) return { ok: false, reason: `a stage holds at most ${MAX_ELEMENTS_PER_STAGE} elements` };
  into.splice(Math.min(into.length, Math.max(0, toIndex)), 0, element!);
  return { ok: true, document: withStages(document, stages) };
}

export function setElementEnabled(document: JsonObject, elementId: string, enabled: boolean): EditResult {
  const where = findElement(document, elementId);
  if (!where) return { ok: false, reason: `no element "${elementId}"` };
  // `enabled` defaults to true: an enabled element drops the field, as a hand-written file would.
  return setField(document, ['stages', where.stage, 'elements', where.element, 'enabled'], enabled ? undefined : false);
}

/**
 * Rename a stage or an element: a new id (checked: the format's pattern, unique across the design)
 * and/or a new label ('' removes it).
 */
export function renameItem(document: JsonObject, oldId: string, change: { readonly id?: string; readonly label?: string }): EditResult {
  const element = findElement(document, oldId);
  const stage = findStage(document, oldId);
  const base: JsonPath | undefined = element ? ['stages', element.stage, 'elements', element.element] : stage >= 0 ? ['stages', stage] : undefined;
  if (!base) return { ok: false, reason: `no stage or element "${oldId}"` };
  let next = document;
  if (change.id !== undefined && change.id !== oldId) {
    if (!ID_PATTERN.test(change.id)) return { ok: false, reason: 'an id starts with a letter and holds letters, digits, "-" or "_" (64 at most)' };
    if (usedIds(document).has(change.id)) return { ok: false, reason: `id "${change.id}" is already used` };
    next = setAt(next, [...base, 'id'], change.id) as JsonObject;
  }
  const renamed = change.id !== undefined && change.id !== oldId ? [change.id] : undefined;
  if (change.label !== undefined) {
    if (change.label.length > 200) return { ok: false, reason: 'a label holds at most 200 characters' };
    next = setAt(next, [...base, 'label'], change.label.trim() === '' ? undefined : change.label) as JsonObject;
  }
  // A renamed item stays selected under its new id.
  return renamed ? { ok: true, document: next, created: renamed } : { ok: true, document: next };
}

/** Give an element a new part of another kind (default values), moving it to a placement that suits the kind. */
export function changePartKind(document: JsonObject, elementId: string, kind: PartKind): EditResult {
  const where = findElement(document, elementId);
  if (!where) return { ok: false, reason: `no element "${elementId}"` };
  const path: JsonPath = ['stages', where.stage, 'elements', where.element];
  const element = getAt(document, path);
  if (!isJsonObject(element)) return { ok: false, reason: `no element "${elementId}"` };
  let placement = element['placement'] as Placement;
  if (kind === 'common-mode-choke') placement = 'both-lines-coupled';
  else if (placement === 'both-lines-coupled') placement = 'series-line1';
  return setField(document, path, { ...element, placement, part: defaultPart(kind, placement) });
}

/** "CX1" → "CX1-copy", then "CX1-copy2", …, kept within the id length. */
function copyId(id: string, taken: ReadonlySet<string>): string {
  const stem = `${id.slice(0, 55)}-copy`;
  if (!taken.has(stem)) return stem;
  for (let n = 2; ; n += 1) if (!taken.has(`${stem}${n}`)) return `${stem}${n}`;
}
