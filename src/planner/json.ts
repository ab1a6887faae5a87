/**
 * The design document as the planner holds it: plain JSON, exactly what a design file holds (values
 * may be engineering text such as "4m7", written as the user typed them). Edits never mutate: each
 * returns a new document that shares every untouched branch with the old one, so undo history and
 * "did this variant change?" are cheap reference comparisons.
 */

export type Json = null | boolean | number | string | readonly Json[] | JsonObject;
export interface JsonObject {
  readonly [key: string]: Json;
}

/** A step into a document: an object key or a list index. */
export type PathStep = string | number;
export type JsonPath = readonly PathStep[];

export function isJsonObject(value: unknown): value is JsonObject {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** The value at `path`, or undefined where the path leads nowhere. */
export function getAt(root: Json | undefined, path: JsonPath): Json | undefined {
  let here: Json | undefined = root;
  for (const step of path) {
    if (typeof step === 'number') {
      if (!Array.isArray(here)) return undefined;
      here = (here as readonly Json[])[step];
    } else {
      if (!isJsonObject(here)) return undefined;
      here = Object.hasOwn(here, step) ? here[step] : undefined;
    }
  }
  return here;
}

/**
 * A copy of `root` with `value` at `path` (undefined deletes an object key). Missing objects on the
 * way are created; a list index may be at most the list's length (which appends).
 */
export function setAt(root: Json, path: JsonPath, value: Json | undefined): Json {
  if (path.length === 0) {
    if (value === undefined) throw new RangeError('cannot delete the whole document');
    return value;
  }
  const [step, ...rest] = path as [PathStep, ...PathStep[]];
  if (typeof step === 'number') {
    const list = Array.isArray(root) ? (root as readonly Json[]) : [];
    if (!Number.isInteger(step) || step < 0 || step > list.length) throw new RangeError(`index ${step} is outside a list of ${list.length}`);
    const child = list[step];
    const next = [...list];
    if (rest.length === 0 && value === undefined) next.splice(step, 1);
    else next[step] = setAt(child ?? (typeof rest[0] === 'number' ? [] : {}), rest, value);
    return next;
  }
  const object: JsonObject = isJsonObject(root) ? root : {};
  if (rest.length === 0 && value === undefined) {
    if (!Object.hasOwn(object, step)) return object;
    const { [step]: _removed, ...others } = object;
    return others;
  }
  const child = Object.hasOwn(object, step) ? object[step] : undefined;
  return { ...object, [step]: setAt(child ?? (typeof rest[0] === 'number' ? [] : {}), rest, value) };
}

/** A deep copy made of fresh objects and lists (for a document that must not share with another). */
export function cloneJson<T extends Json>(value: T): T {
  return structuredClone(value);
}

/** Read untrusted parsed JSON as Json, or say where it is not (functions, undefined, NaN, cycles). */
export function asJson(value: unknown, path = '', seen: Set<object> = new Set()): { ok: true; value: Json } | { ok: false; where: string } {
  if (value === null || typeof value === 'boolean' || typeof value === 'string') return { ok: true, value };
  if (typeof value === 'number') return Number.isFinite(value) ? { ok: true, value } : { ok: false, where: path || '(top)' };
  if (typeof value !== 'object') return { ok: false, where: path || '(top)' };
  if (seen.has(value)) return { ok: false, where: path || '(top)' };
  seen.add(value);
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i += 1) {
      const item = asJson(value[i] as unknown, `${path}[${i}]`, seen);
      if (!item.ok) return item;
    }
  } else {
    for (const [key, item] of Object.entries(value)) {
      const checked = asJson(item, path ? `${path}.${key}` : key, seen);
      if (!checked.ok) return checked;
    }
  }
  seen.delete(value);
  return { ok: true, value: value as Json };
}

/** The path of a validation issue ("stages[0].elements[1].part.capacitance") as steps. */
export function parseIssuePath(text: string): JsonPath {
  const steps: PathStep[] = [];
  for (const match of text.matchAll(/([^.[\]]+)|\[(\d+)\]/gu)) {
    if (match[2] !== undefined) steps.push(Number(match[2]));
    else if (match[1] !== undefined) steps.push(match[1]);
  }
  return steps;
}
