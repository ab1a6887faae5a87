import type { PartKind } from '../model/design.ts';
import {
  addElement,
  addStage,
  changePartKind,
  duplicateElement,
  duplicateStage,
  type EditResult,
  findStage,
  moveElement,
  moveStage,
  removeElement,
  removeStage,
  renameItem,
  setElementEnabled,
  setField,
  usedIds,
} from './edits/design-edits.ts';
import { addMasks, addPresetMask, insertMaskPoint, removeMask, removeMaskPoint, setMaskPoint } from './edits/emissions-edits.ts';
import { addVariant, baselineDocument, deleteVariant, keepCopy, renameVariant, setOverlay, switchVariant, type WorkspaceResult } from './edits/variant-edits.ts';
import type { Json, JsonObject, JsonPath } from './json.ts';
import type { AddPlacement } from './part-defaults.ts';
import { checkDocument } from './validation.ts';
import { activeVariant, type NoiseChoice, type ScanEntry, type Selection, variantById, type Workspace } from './workspace.ts';

/**
 * Everything the page can ask of the planner, as data. Elements send intents; the store applies
 * them here, in one pure function, and keeps the history. `design` intents edit the variant being
 * edited; the rest change the workspace. Each applied intent has a label for the undo button.
 */
export type DesignIntent =
  | { readonly type: 'set-field'; readonly path: JsonPath; readonly value: Json | undefined }
  | { readonly type: 'add-stage'; readonly afterStageId?: string }
  | { readonly type: 'remove-stage'; readonly stageId: string }
  | { readonly type: 'duplicate-stage'; readonly stageId: string }
  | { readonly type: 'move-stage'; readonly stageId: string; readonly to: number }
  | { readonly type: 'add-element'; readonly stageId: string; readonly placement: AddPlacement; readonly kind: PartKind; readonly part?: JsonObject }
  | { readonly type: 'remove-element'; readonly elementId: string }
  | { readonly type: 'duplicate-element'; readonly elementId: string }
  | { readonly type: 'move-element'; readonly elementId: string; readonly stageId: string; readonly index: number }
  | { readonly type: 'set-element-enabled'; readonly elementId: string; readonly enabled: boolean }
  | { readonly type: 'rename'; readonly id: string; readonly newId?: string; readonly label?: string }
  | { readonly type: 'change-part-kind'; readonly elementId: string; readonly kind: PartKind }
  | { readonly type: 'add-preset-mask'; readonly presetId: string }
  | { readonly type: 'add-masks'; readonly masks: readonly JsonObject[] }
  | { readonly type: 'remove-mask'; readonly maskId: string }
  | { readonly type: 'set-mask-point'; readonly maskId: string; readonly point: number; readonly frequencyHz?: Json; readonly levelDbuV?: Json }
  | { readonly type: 'insert-mask-point'; readonly maskId: string; readonly point: number }
  | { readonly type: 'remove-mask-point'; readonly maskId: string; readonly point: number }
  | { readonly type: 'set-baseline'; readonly variantId: string | null }
  | { readonly type: 'replace-document'; readonly document: JsonObject; readonly label: string };

export type WorkspaceIntent =
  | { readonly type: 'keep-copy'; readonly name: string }
  | { readonly type: 'switch-variant'; readonly id: string }
  | { readonly type: 'rename-variant'; readonly id: string; readonly name: string }
  | { readonly type: 'delete-variant'; readonly id: string }
  | { readonly type: 'set-overlay'; readonly id: string; readonly shown: boolean }
  /** A design from a file, a link or an assistant, opened as a new variant (never over stored work). */
  | { readonly type: 'open-design'; readonly document: JsonObject; readonly origin: 'file' | 'link' | 'copy' | 'new'; readonly label: string };

/** Not edits: they do not enter the undo history. */
export type ViewIntent =
  | { readonly type: 'select'; readonly selection: Selection }
  | { readonly type: 'add-scan'; readonly entry: ScanEntry; readonly use: boolean }
  | { readonly type: 'remove-scan'; readonly scanId: string }
  | { readonly type: 'choose-noise'; readonly noise: NoiseChoice };

export type Intent = DesignIntent | WorkspaceIntent | ViewIntent;

export type Applied = { readonly ok: true; readonly workspace: Workspace; readonly label: string; readonly created?: readonly string[] } | { readonly ok: false; readonly reason: string };

const VIEW_TYPES: ReadonlySet<Intent['type']> = new Set(['select', 'add-scan', 'remove-scan', 'choose-noise']);

/** Whether an intent is an edit (kept in the undo history) or only changes what is shown. */
export function isEdit(intent: Intent): intent is DesignIntent | WorkspaceIntent {
  return !VIEW_TYPES.has(intent.type);
}

export function applyIntent(workspace: Workspace, intent: Intent): Applied {
  switch (intent.type) {
    case 'select':
      return { ok: true, workspace: { ...workspace, selection: intent.selection }, label: 'select' };
    case 'add-scan': {
      const scans = [...workspace.scans.filter((scan) => scan.id !== intent.entry.id), intent.entry];
      const noise: NoiseChoice = intent.use ? { kind: 'scan', scanId: intent.entry.id } : workspace.noise;
      return { ok: true, workspace: { ...workspace, scans, noise }, label: `load scan “${intent.entry.name}”` };
    }
    case 'remove-scan': {
      const scans = workspace.scans.filter((scan) => scan.id !== intent.scanId);
      const noise: NoiseChoice = workspace.noise.kind === 'scan' && workspace.noise.scanId === intent.scanId ? { kind: 'estimate' } : workspace.noise;
      return { ok: true, workspace: { ...workspace, scans, noise }, label: 'remove scan' };
    }
    case 'choose-noise':
      if (intent.noise.kind === 'scan') {
        const scanId = intent.noise.scanId;
        if (!workspace.scans.some((scan) => scan.id === scanId)) return { ok: false, reason: `no scan "${scanId}"` };
      }
      return { ok: true, workspace: { ...workspace, noise: intent.noise }, label: 'choose noise' };
    case 'keep-copy':
      return fromWorkspace(keepCopy(workspace, intent.name), `keep a copy as “${intent.name.trim()}”`);
    case 'switch-variant':
      return fromWorkspace(switchVariant(workspace, intent.id), 'switch variant');
    case 'rename-variant':
      return fromWorkspace(renameVariant(workspace, intent.id, intent.name), 'rename variant');
    case 'delete-variant':
      return fromWorkspace(deleteVariant(workspace, intent.id), 'delete variant');
    case 'set-overlay':
      return fromWorkspace(setOverlay(workspace, intent.id, intent.shown), intent.shown ? 'overlay a variant' : 'hide an overlay');
    case 'open-design': {
      const checked = checkDocument(intent.document);
      return fromWorkspace(addVariant(workspace, intent.document, checked.ok ? intent.document : undefined, intent.origin, true), intent.label);
    }
    default:
      return applyDesignIntent(workspace, intent);
  }
}

function applyDesignIntent(workspace: Workspace, intent: DesignIntent): Applied {
  const active = activeVariant(workspace);
  const document = active.document;
  let result: EditResult;
  let label: string;
  switch (intent.type) {
    case 'set-field':
      result = setField(document, intent.path, intent.value);
      label = `edit ${String(intent.path[intent.path.length - 1] ?? 'field')}`;
      break;
    case 'add-stage':
      result = addStage(document, intent.afterStageId === undefined ? undefined : stageIndex(document, intent.afterStageId));
      label = 'add a stage';
      break;
    case 'remove-stage':
      result = removeStage(document, intent.stageId);
      label = `remove stage ${intent.stageId}`;
      break;
    case 'duplicate-stage':
      result = duplicateStage(document, intent.stageId);
      label = `duplicate stage ${intent.stageId}`;
      break;
    case 'move-stage':
      result = moveStage(document, intent.stageId, intent.to);
      label = `move stage ${intent.stageId}`;
      break;
    case 'add-element':
      result = addElement(document, intent.stageId, intent.placement, intent.kind, intent.part);
      label = `add ${intent.kind}`;
      break;
    case 'remove-element':
      result = removeElement(document, intent.elementId);
      label = `remove ${intent.elementId}`;
      break;
    case 'duplicate-element':
      result = duplicateElement(document, intent.elementId);
      label = `duplicate ${intent.elementId}`;
      break;
    case 'move-element':
      result = moveElement(document, intent.elementId, intent.stageId, intent.index);
      label = `move ${intent.elementId}`;
      break;
    case 'set-element-enabled':
      result = setElementEnabled(document, intent.elementId, intent.enabled);
      label = `${intent.enabled ? 'enable' : 'disable'} ${intent.elementId}`;
      break;
    case 'rename':
      result = renameItem(document, intent.id, { ...(intent.newId === undefined ? {} : { id: intent.newId }), ...(intent.label === undefined ? {} : { label: intent.label }) });
      label = `rename ${intent.id}`;
      break;
    case 'change-part-kind':
      result = changePartKind(document, intent.elementId, intent.kind);
      label = `make ${intent.elementId} a ${intent.kind}`;
      break;
    case 'add-preset-mask':
      result = addPresetMask(document, intent.presetId);
      label = 'add a limit';
      break;
    case 'add-masks':
      result = addMasks(document, intent.masks);
      label = intent.masks.length === 1 ? 'add a limit from a file' : 'add limits from a file';
      break;
    case 'remove-mask':
      result = removeMask(document, intent.maskId);
      label = 'remove a limit';
      break;
    case 'set-mask-point':
      result = setMaskPoint(document, intent.maskId, intent.point, {
        ...(intent.frequencyHz === undefined ? {} : { frequencyHz: intent.frequencyHz }),
        ...(intent.levelDbuV === undefined ? {} : { levelDbuV: intent.levelDbuV }),
      });
      label = 'edit a limit point';
      break;
    case 'insert-mask-point':
      result = insertMaskPoint(document, intent.maskId, intent.point);
      label = 'add a limit point';
      break;
    case 'remove-mask-point':
      result = removeMaskPoint(document, intent.maskId, intent.point);
      label = 'remove a limit point';
      break;
    case 'set-baseline': {
      const baseline = intent.variantId === null ? undefined : variantById(workspace, intent.variantId);
      if (intent.variantId !== null && !baseline) return { ok: false, reason: `no variant "${intent.variantId}"` };
      if (baseline?.id === active.id) return { ok: false, reason: 'a design cannot be its own baseline' };
      result = { ok: true, document: baselineDocument(document, baseline) };
      label = 'set the baseline';
      break;
    }
    case 'replace-document':
      result = { ok: true, document: intent.document };
      label = intent.label;
      break;
  }
  if (!result.ok) return result;
  if (result.document === document) return { ok: true, workspace, label };
  const checked = checkDocument(result.document);
  const variant = { ...active, document: result.document, validDocument: checked.ok ? result.document : active.validDocument };
  const next: Workspace = { ...workspace, variants: workspace.variants.map((v) => (v.id === active.id ? variant : v)) };
  return { ok: true, workspace: keepSelectionValid(next, result.created), label, ...(result.created ? { created: result.created } : {}) };
}

function stageIndex(document: JsonObject, stageId: string): number | undefined {
  const at = findStage(document, stageId);
  return at < 0 ? undefined : at;
}

/** After an edit: select what was just created, and drop a selection whose item is gone. */
function keepSelectionValid(workspace: Workspace, created: readonly string[] | undefined): Workspace {
  const document = activeVariant(workspace).document;
  const ids = usedIds(document);
  const first = created?.[0];
  if (first !== undefined && ids.has(first)) {
    return { ...workspace, selection: { kind: findStage(document, first) >= 0 ? 'stage' : 'element', id: first } };
  }
  const selection = workspace.selection;
  if (selection && !ids.has(selection.id)) return { ...workspace, selection: undefined };
  return workspace;
}

function fromWorkspace(result: WorkspaceResult, label: string): Applied {
  return result.ok ? { ok: true, workspace: result.workspace, label } : result;
}
