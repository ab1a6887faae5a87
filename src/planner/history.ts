import type { Workspace } from './workspace.ts';

/**
 * Undo and redo as the store's own history: a bounded list of earlier workspaces (each shares every
 * unchanged document with its neighbours, so a long history costs little) and the ones undone.
 * Typing into one field makes one entry, not one per keystroke: an edit of the same field soon
 * after the last one joins it.
 */

export interface HistoryEntry {
  /** The workspace before the edit (for undo) or after it (for redo). */
  readonly workspace: Workspace;
  /** What the edit was, for the undo and redo buttons' titles. */
  readonly label: string;
}

export interface HistoryState {
  readonly past: readonly HistoryEntry[];
  readonly future: readonly HistoryEntry[];
}

export const EMPTY_HISTORY: HistoryState = { past: [], future: [] };

/** Edits of one field closer together than this join one history entry. */
export const COALESCE_MS = 1200;
export const HISTORY_LIMIT = 200;

export interface Recorded {
  readonly history: HistoryState;
  /** The key and time of the last edit, to know whether the next one joins it. */
  readonly last: { readonly key: string | undefined; readonly at: number };
}

/** Record that an edit took `before` to a new workspace. */
export function recordEdit(
  history: HistoryState,
  before: Workspace,
  label: string,
  key: string | undefined,
  at: number,
  last: Recorded['last'],
  limit = HISTORY_LIMIT,
): Recorded {
  const joins = key !== undefined && key === last.key && at - last.at < COALESCE_MS && history.past.length > 0;
  if (joins) return { history: { past: history.past, future: [] }, last: { key, at } };
  const past = [...history.past, { workspace: before, label }];
  if (past.length > limit) past.splice(0, past.length - limit);
  return { history: { past, future: [] }, last: { key, at } };
}

/** Step back: the workspace to show and the history after it; undefined when there is nothing to undo. */
export function undo(history: HistoryState, current: Workspace): { workspace: Workspace; history: HistoryState; label: string } | undefined {
  const entry = history.past[history.past.length - 1];
  if (!entry) return undefined;
  return {
    workspace: entry.workspace,
    history: { past: history.past.slice(0, -1), future: [...history.future, { workspace: current, label: entry.label }] },
    label: entry.label,
  };
}

export function redo(history: HistoryState, current: Workspace): { workspace: Workspace; history: HistoryState; label: string } | undefined {
  const entry = history.future[history.future.length - 1];
  if (!entry) return undefined;
  return {
    workspace: entry.workspace,
    history: { past: [...history.past, { workspace: current, label: entry.label }], future: history.future.slice(0, -1) },
    label: entry.label,
  };
}

/** The most recent `count` steps each way, for saving (older ones are dropped). */
export function boundedHistory(history: HistoryState, count: number): HistoryState {
  return { past: history.past.slice(-count), future: history.future.slice(-count) };
}
