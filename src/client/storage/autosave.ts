import type { PlannerStore } from '../../planner/planner-store.ts';
import type { PlannerDatabase, SaveOutcome } from './planner-db.ts';
import { packRecord, SAVED_HISTORY_STEPS } from './workspace-record.ts';

/**
 * Saves the workspace after every change: the write starts at once (at most one runs; changes made
 * while it runs are saved by the next), so closing or killing the page mid-edit loses at most the
 * keystroke being written. `flush` waits for what is pending (the page calls it on pagehide and when
 * hidden). Before each write the saved revision is compared with the one this tab last saw: if another
 * tab saved in between, nothing is overwritten; the page is told and asks the user which to keep.
 */
export class Autosave {
  private writing: Promise<void> | undefined;
  private dirty = false;
  private stopped = false;
  private unsubscribe: (() => void) | undefined;

  constructor(
    private readonly db: PlannerDatabase,
    private readonly store: PlannerStore,
    private readonly writer: string,
    /** The revision this tab knows is saved (from the load, or 0 for a new database). */
    private knownRevision: number,
    private readonly on: {
      readonly conflict: (outcome: Extract<SaveOutcome, { kind: 'conflict' }>) => void;
      readonly saved?: (revision: number) => void;
      readonly error: (message: string) => void;
    },
  ) {}

  start(): void {
    this.unsubscribe = this.store.subscribe(() => this.schedule());
  }

  stop(): void {
    this.stopped = true;
    this.unsubscribe?.();
  }

  get revision(): number {
    return this.knownRevision;
  }

  /** Save now (another tab's conflict was settled in favour of this one): take the saved revision as known first. */
  async overwrite(): Promise<void> {
    this.knownRevision = await this.db.revision();
    this.stopped = false;
    if (!this.unsubscribe) this.start();
    this.schedule();
    await this.flush();
  }

  schedule(): void {
    if (this.stopped) return;
    if (this.writing) {
      this.dirty = true;
      return;
    }
    this.writing = this.write().finally(() => {
      this.writing = undefined;
      if (this.dirty && !this.stopped) {
        this.dirty = false;
        this.schedule();
      }
    });
  }

  async flush(): Promise<void> {
    while (this.writing) await this.writing;
  }

  private async write(): Promise<void> {
    const record = packRecord(this.store.workspace, this.store.historyForSaving(SAVED_HISTORY_STEPS), { revision: this.knownRevision + 1, writer: this.writer, savedAt: Date.now() });
    let outcome: SaveOutcome;
    try {
      outcome = await this.db.save(record, this.knownRevision);
    } catch (cause) {
      this.on.error(`the work could not be saved in this browser: ${cause instanceof Error ? cause.message : String(cause)}`);
      return;
    }
    if (outcome.kind === 'conflict') {
      this.stopped = true;
      this.on.conflict(outcome);
      return;
    }
    this.knownRevision = outcome.revision;
    this.on.saved?.(outcome.revision);
  }
}
