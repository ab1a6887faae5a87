import type { Detector } from '../model/emissions-schema.ts';
import type { ScanTag } from '../spectrum/spectrum-types.ts';
import type { JsonObject } from './json.ts';

/**
 * What the engineer works on in the page, in one value: the design variants (one of them being
 * edited), which others are overlaid on the plots, what is selected, the loaded scans and which
 * noise the emissions are judged from. Everything here is plain data, saved as it is and restored
 * exactly; the scans' own columns are kept beside it (they can hold a million rows).
 */

/** Variants overlaid on every plot besides the one being edited, at most. */
export const MAX_OVERLAYS = 4;
/** Variants kept in one workspace, at most. */
export const MAX_VARIANTS = 24;

export interface Variant {
  /** Stable for the variant's life; "v1", "v2", … Its name is the design's own `name`. */
  readonly id: string;
  /** The design as edited, which may hold a value that does not validate yet. */
  readonly document: JsonObject;
  /** The last document of this variant that validated: what is swept and drawn while `document` does not. */
  readonly validDocument: JsonObject | undefined;
  /** Where it came from, for the page's badge: the built-in invented demo, a file, a link, or made here. */
  readonly origin: 'demo' | 'file' | 'link' | 'copy' | 'new';
}

export type Selection =
  | { readonly kind: 'element'; readonly id: string }
  | { readonly kind: 'stage'; readonly id: string }
  | undefined;

/** A scan read into the page: what the margin table says about it; its columns live in the scan store. */
export interface ScanEntry {
  readonly id: string;
  readonly name: string;
  readonly tag: ScanTag;
  readonly points: number;
  readonly detectors: readonly Detector[];
  readonly notes: readonly string[];
  /** What the reader suspects ("check the frequency unit"): shown beside the verdict they may explain. */
  readonly warnings: readonly string[];
  /** Data lines the reader left out, counted (their details stay with the scan). */
  readonly rejectedLines: number;
  /** The built-in invented demo scan, labelled as such wherever it is shown. */
  readonly invented: boolean;
}

export type NoiseChoice = { readonly kind: 'estimate' } | { readonly kind: 'scan'; readonly scanId: string };

export interface Workspace {
  readonly variants: readonly Variant[];
  readonly activeId: string;
  /** Other variants drawn on every plot with their own dash, in the order chosen. */
  readonly overlayIds: readonly string[];
  readonly selection: Selection;
  readonly scans: readonly ScanEntry[];
  readonly noise: NoiseChoice;
  /** Counter for new variant ids, so an id is never reused after a delete. */
  readonly nextVariantNumber: number;
}

/** A workspace holding one design. */
export function workspaceOf(document: JsonObject, origin: Variant['origin'], valid: boolean): Workspace {
  return {
    variants: [{ id: 'v1', document, validDocument: valid ? document : undefined, origin }],
    activeId: 'v1',
    overlayIds: [],
    selection: undefined,
    scans: [],
    noise: { kind: 'estimate' },
    nextVariantNumber: 2,
  };
}

export function activeVariant(workspace: Workspace): Variant {
  const found = workspace.variants.find((variant) => variant.id === workspace.activeId);
  // The reducer keeps activeId pointing at a variant; a stored workspace is validated on load.
  if (!found) throw new RangeError(`no variant "${workspace.activeId}"`);
  return found;
}

export function variantById(workspace: Workspace, id: string): Variant | undefined {
  return workspace.variants.find((variant) => variant.id === id);
}

/** A variant's name: its design's `name`, or what was last valid while the name field is being typed. */
export function variantName(variant: Variant): string {
  const name = variant.document['name'];
  if (typeof name === 'string' && name.trim() !== '') return name;
  const valid = variant.validDocument?.['name'];
  return typeof valid === 'string' && valid !== '' ? valid : 'Unnamed design';
}
