import { cloneJson, isJsonObject, type Json, type JsonObject } from '../json.ts';
import { MAX_OVERLAYS, MAX_VARIANTS, type Variant, variantById, variantName, type Workspace } from '../workspace.ts';
import { withEmissions } from './emissions-edits.ts';

/**
 * Edits of the workspace's variants: keep a copy of the design under a name, switch which one is
 * edited, rename, delete, overlay on the plots, and use one as the baseline (the filter fitted when a
 * scan was taken). Each returns a new workspace or a reason.
 */

export type WorkspaceResult = { readonly ok: true; readonly workspace: Workspace } | { readonly ok: false; readonly reason: string };

const MAX_NAME = 200;

function cleanName(name: string): string | undefined {
  const trimmed = name.trim();
  return trimmed === '' || trimmed.length > MAX_NAME ? undefined : trimmed;
}

/** Add a variant holding `document`; `activate` makes it the one edited. */
export function addVariant(
  workspace: Workspace,
  document: JsonObject,
  validDocument: JsonObject | undefined,
  origin: Variant['origin'],
  activate: boolean,
): WorkspaceResult {
  if (workspace.variants.length >= MAX_VARIANTS) return { ok: false, reason: `at most ${MAX_VARIANTS} variants are kept; delete one first` };
  const id = `v${workspace.nextVariantNumber}`;
  const variant: Variant = { id, document, validDocument, origin };
  return {
    ok: true,
    workspace: {
      ...workspace,
      variants: [...workspace.variants, variant],
      nextVariantNumber: workspace.nextVariantNumber + 1,
      activeId: activate ? id : workspace.activeId,
      selection: activate ? undefined : workspace.selection,
    },
  };
}

/**
 * Keep a copy of the variant being edited under a new name (the copy's design is renamed); editing
 * carries on in the original.
 */
export function keepCopy(workspace: Workspace, name: string): WorkspaceResult {
  const active = variantById(workspace, workspace.activeId);
  if (!active) return { ok: false, reason: 'no variant is being edited' };
  const clean = cleanName(name);
  if (clean === undefined) return { ok: false, reason: `a variant name is 1 to ${MAX_NAME} characters` };
  const named = uniqueName(workspace, clean);
  const document = { ...cloneJson(active.document), name: named };
  const valid = active.validDocument && { ...cloneJson(active.validDocument), name: named };
  return addVariant(workspace, document, valid, 'copy', false);
}

export function switchVariant(workspace: Workspace, id: string): WorkspaceResult {
  if (!variantById(workspace, id)) return { ok: false, reason: `no variant "${id}"` };
  if (id === workspace.activeId) return { ok: true, workspace };
  // The variant now edited is not also an overlay of itself; the one left behind may be overlaid.
  return { ok: true, workspace: { ...workspace, activeId: id, selection: undefined, overlayIds: workspace.overlayIds.filter((o) => o !== id) } };
}

/** Rename a variant: its design's `name`, which must stay unique among the variants. */
export function renameVariant(workspace: Workspace, id: string, name: string): WorkspaceResult {
  const clean = cleanName(name);
  if (clean === undefined) return { ok: false, reason: `a variant name is 1 to ${MAX_NAME} characters` };
  if (!variantById(workspace, id)) return { ok: false, reason: `no variant "${id}"` };
  if (workspace.variants.some((v) => v.id !== id && variantName(v) === clean)) return { ok: false, reason: `a variant is already called "${clean}"` };
  return {
    ok: true,
    workspace: {
      ...workspace,
      variants: workspace.variants.map((v) =>
        v.id === id ? { ...v, document: { ...v.document, name: clean }, validDocument: v.validDocument && { ...v.validDocument, name: clean } } : v,
      ),
    },
  };
}

export function deleteVariant(workspace: Workspace, id: string): WorkspaceResult {
  if (!variantById(workspace, id)) return { ok: false, reason: `no variant "${id}"` };
  if (workspace.variants.length === 1) return { ok: false, reason: 'the last variant cannot be deleted' };
  const variants = workspace.variants.filter((v) => v.id !== id);
  const activeId = workspace.activeId === id ? variants[0]!.id : workspace.activeId;
  return {
    ok: true,
    workspace: {
      ...workspace,
      variants,
      activeId,
      overlayIds: workspace.overlayIds.filter((o) => o !== id),
      selection: workspace.activeId === id ? undefined : workspace.selection,
    },
  };
}

/** Draw a variant on every plot beside the one edited (up to MAX_OVERLAYS), or stop drawing it. */
export function setOverlay(workspace: Workspace, id: string, shown: boolean): WorkspaceResult {
  if (!variantById(workspace, id)) return { ok: false, reason: `no variant "${id}"` };
  if (id === workspace.activeId) return { ok: false, reason: 'the variant being edited is always drawn' };
  const without = workspace.overlayIds.filter((o) => o !== id);
  if (!shown) return { ok: true, workspace: { ...workspace, overlayIds: without } };
  if (without.length >= MAX_OVERLAYS) return { ok: false, reason: `at most ${MAX_OVERLAYS} variants are overlaid; hide one first` };
  return { ok: true, workspace: { ...workspace, overlayIds: [...without, id] } };
}

/**
 * The baseline of the edited design: none, or a copy of another variant's stages (the filter that was
 * fitted when the scan was taken). A copy, not a reference: the scan was taken with hardware that
 * does not change when the variant is edited later.
 */
export function baselineDocument(document: JsonObject, baseline: Variant | undefined): JsonObject {
  if (!baseline) return withEmissions(document, { baseline: { kind: 'none' } });
  const source = baseline.validDocument ?? baseline.document;
  const stages = source['stages'];
  const copied: Json = Array.isArray(stages) ? cloneJson(stages as Json) : [];
  return withEmissions(document, { baseline: { kind: 'stages', label: variantName(baseline).slice(0, 200), stages: copied } });
}

/** A name no other variant has: the wanted one, else with " (2)", " (3)" … appended. */
export function uniqueName(workspace: Workspace, wanted: string): string {
  const taken = new Set(workspace.variants.map(variantName));
  if (!taken.has(wanted)) return wanted;
  for (let n = 2; ; n += 1) {
    const candidate = `${wanted.slice(0, MAX_NAME - 6)} (${n})`;
    if (!taken.has(candidate)) return candidate;
  }
}

export function isDesignLike(value: Json | undefined): value is JsonObject {
  return isJsonObject(value) && value['format'] === 'chokepoint-design';
}
