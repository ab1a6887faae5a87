import { boundedHistory, EMPTY_HISTORY, type HistoryState, recordEdit, redo, undo, type Recorded } from './history.ts';
import { type Applied, applyIntent, type Intent, isEdit } from './intents.ts';
import { formatPath } from '../model/validation-error.ts';
import { usedIds } from './edits/design-edits.ts';
import { activeVariant, type Variant, type Workspace } from './workspace.ts';

/**
 * The page's one store: the workspace (variants, the one edited, overlays, selection, scans, noise)
 * and its undo history. Elements read it and send intents; nothing else changes it. Undo and redo
 * restore the variants and overlays; what is shown (selection, loaded scans, chosen noise) stays, as
 * it is not an edit. Listeners hear of every change with what caused it, so the page can autosave,
 * update the link and sweep what changed.
 */

export type ChangeCause = 'edit' | 'view' | 'undo' | 'redo' | 'restore';

export interface StoreChange {
  readonly cause: ChangeCause;
  readonly workspace: Workspace;
  readonly previous: Workspace;
  /** The intent behind an edit or view change. */
  readonly intent?: Intent;
  /** The edit's (or the undone/redone edit's) label. */
  readonly label?: string;
}

export type StoreListener = (change: StoreChange) => void;

export interface StoreOptions {
  readonly now?: () => number;
  readonly historyLimit?: number;
  readonly history?: HistoryState;
}

export class PlannerStore {
  private current: Workspace;
  private history: HistoryState;
  private last: Recorded['last'] = { key: undefined, at: -Infinity };
  private readonly listeners = new Set<StoreListener>();
  private readonly now: () => number;
  private readonly historyLimit: number | undefined;

  constructor(initial: Workspace, options: StoreOptions = {}) {
    this.current = initial;
    this.history = options.history ?? EMPTY_HISTORY;
    this.now = options.now ?? (() => Date.now());
    this.historyLimit = options.historyLimit;
  }

  get workspace(): Workspace {
    return this.current;
  }

  get active(): Variant {
    return activeVariant(this.current);
  }

  get canUndo(): boolean {
    return this.history.past.length > 0;
  }

  get canRedo(): boolean {
    return this.history.future.length > 0;
  }

  /** What undo would take back, for the button's title. */
  get undoLabel(): string | undefined {
    return this.history.past[this.history.past.length - 1]?.label;
  }

  get redoLabel(): string | undefined {
    return this.history.future[this.history.future.length - 1]?.label;
  }

  /** The history, at most `count` steps each way, for saving. */
  historyForSaving(count: number): HistoryState {
    return boundedHistory(this.history, count);
  }

  /** Apply an intent. A refused intent changes nothing and says why. */
  dispatch(intent: Intent): Applied {
    const applied = applyIntent(this.current, intent);
    if (!applied.ok || applied.workspace === this.current) return applied;
    const previous = this.current;
    if (isEdit(intent)) {
      const recorded = recordEdit(this.history, previous, applied.label, coalesceKey(intent, previous), this.now(), this.last, this.historyLimit);
      this.history = recorded.history;
      this.last = recorded.last;
    }
    this.current = applied.workspace;
    this.emit({ cause: isEdit(intent) ? 'edit' : 'view', workspace: this.current, previous, intent, label: applied.label });
    return applied;
  }

  undo(): boolean {
    const step = undo(this.history, this.current);
    if (!step) return false;
    this.jump(step, 'undo');
    return true;
  }

  redo(): boolean {
    const step = redo(this.history, this.current);
    if (!step) return false;
    this.jump(step, 'redo');
    return true;
  }

  /** Replace everything (work restored from storage, or taken over from another tab). */
  restore(workspace: Workspace, history: HistoryState = EMPTY_HISTORY): void {
    const previous = this.current;
    this.current = workspace;
    this.history = history;
    this.last = { key: undefined, at: -Infinity };
    this.emit({ cause: 'restore', workspace, previous });
  }

  subscribe(listener: StoreListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private jump(step: { workspace: Workspace; history: HistoryState; label: string }, cause: 'undo' | 'redo'): void {
    const previous = this.current;
    // What is shown is not part of the history: keep the scans, the noise and (if it still exists) the selection.
    const restored = { ...step.workspace, scans: previous.scans, noise: previous.noise };
    const selection = previous.selection && usedIds(activeVariant(restored).document).has(previous.selection.id) ? previous.selection : undefined;
    this.current = { ...restored, selection };
    this.history = step.history;
    this.last = { key: undefined, at: -Infinity };
    this.emit({ cause, workspace: this.current, previous, label: step.label });
  }

  private emit(change: StoreChange): void {
    for (const listener of [...this.listeners]) listener(change);
  }
}

/** Typing into one field of one variant joins one history entry; other edits never join. */
function coalesceKey(intent: Intent, workspace: Workspace): string | undefined {
  if (intent.type === 'set-field') return `${workspace.activeId}:${formatPath(intent.path)}`;
  if (intent.type === 'set-mask-point') return `${workspace.activeId}:mask:${intent.maskId}:${intent.point}:${intent.frequencyHz === undefined ? 'level' : 'frequency'}`;
  return undefined;
}
