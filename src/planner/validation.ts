import type { Design } from '../model/design.ts';
import { readDesign } from '../model/read-design.ts';
import type { ValidationIssue } from '../model/validation-error.ts';
import type { JsonObject } from './json.ts';

/**
 * A document validated exactly as a file is read (readDesign), remembered per document object:
 * documents never change in place, so the same object always has the same answer, and a redraw
 * does not validate again.
 */
export type Checked = { readonly ok: true; readonly design: Design } | { readonly ok: false; readonly issues: readonly ValidationIssue[] };

const memo = new WeakMap<JsonObject, Checked>();

export function checkDocument(document: JsonObject): Checked {
  const known = memo.get(document);
  if (known) return known;
  const read = readDesign(document);
  const checked: Checked = read.ok ? { ok: true, design: read.value } : { ok: false, issues: read.error.issues };
  memo.set(document, checked);
  return checked;
}

/** The problems of a document by field path ("stages[0].elements[1].part.capacitance"), first message per path. */
export function issuesByPath(checked: Checked): ReadonlyMap<string, string> {
  const byPath = new Map<string, string>();
  if (checked.ok) return byPath;
  for (const issue of checked.issues) if (!byPath.has(issue.path)) byPath.set(issue.path, issue.message);
  return byPath;
}
