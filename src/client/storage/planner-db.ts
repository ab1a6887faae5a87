import { type DBSchema, type IDBPDatabase, openDB } from 'idb';
import type { ScanEntry } from '../../planner/workspace.ts';
import type { Scan } from '../../spectrum/spectrum-types.ts';
import { unpackRecord, type UnpackResult, type WorkspaceRecord } from './workspace-record.ts';

/**
 * The page's saved work in IndexedDB (through `idb`): the workspace record (variants, history,
 * selection, which scans are loaded), the scans' columns, and backups of records that could not be
 * read. A record that does not validate is copied to the backups before anything else happens, and
 * the last record that did read at start-up is kept as a fallback, so damage never costs all the work.
 */

export const DATABASE_NAME = 'chokepoint';
const DATABASE_VERSION = 1;

export interface StoredScan {
  readonly id: string;
  readonly entry: ScanEntry;
  readonly scan: Scan;
}

export interface Backup {
  readonly savedAt: number;
  readonly reason: string;
  readonly value: unknown;
}

interface PlannerSchema extends DBSchema {
  /** 'current': what the page saves after every change; 'last-good': the record that read at start-up. */
  workspace: { key: 'current' | 'last-good'; value: unknown };
  scans: { key: string; value: StoredScan };
  backups: { key: number; value: Backup; autoIncrement: true };
}

export type LoadOutcome =
  | { readonly kind: 'empty' }
  | { readonly kind: 'restored'; readonly result: Extract<UnpackResult, { ok: true }>; readonly notices: readonly string[] }
  | { readonly kind: 'unreadable'; readonly reason: string };

export type SaveOutcome = { readonly kind: 'saved'; readonly revision: number } | { readonly kind: 'conflict'; readonly theirRevision: number; readonly theirWriter: string };

export class PlannerDatabase {
  private constructor(private readonly db: IDBPDatabase<PlannerSchema>) {}

  static async open(name = DATABASE_NAME): Promise<PlannerDatabase> {
    const db = await openDB<PlannerSchema>(name, DATABASE_VERSION, {
      upgrade(database) {
        database.createObjectStore('workspace');
        database.createObjectStore('scans', { keyPath: 'id' });
        database.createObjectStore('backups', { autoIncrement: true });
      },
    });
    return new PlannerDatabase(db);
  }

  close(): void {
    this.db.close();
  }

  /**
   * The saved workspace. A damaged current record goes to the backups and the last good one is used
   * (said in the notices); if neither reads, the outcome says why and the page starts afresh.
   */
  async load(): Promise<LoadOutcome> {
    const current = await this.db.get('workspace', 'current');
    if (current === undefined) return { kind: 'empty' };
    const read = unpackRecord(current);
    if (read.ok) {
      await this.db.put('workspace', current, 'last-good');
      return { kind: 'restored', result: read, notices: [] };
    }
    await this.backup(current, read.reason);
    const fallback = await this.db.get('workspace', 'last-good');
    const previous = fallback === undefined ? undefined : unpackRecord(fallback);
    if (previous?.ok) {
      await this.db.put('workspace', fallback, 'current');
      return {
        kind: 'restored',
        result: previous,
        notices: [`The last saved work could not be read (${read.reason}); it was kept aside as a backup, and the work as it was when this page was last opened is shown instead.`],
      };
    }
    return { kind: 'unreadable', reason: read.reason };
  }

  /** Save unless another tab has saved since `expectedRevision` (then nothing is written and the conflict is named). */
  async save(record: WorkspaceRecord, expectedRevision: number): Promise<SaveOutcome> {
    const tx = this.db.transaction('workspace', 'readwrite');
    const stored = (await tx.store.get('current')) as { revision?: unknown; writer?: unknown } | undefined;
    const theirs = typeof stored?.revision === 'number' ? stored.revision : 0;
    if (stored !== undefined && theirs !== expectedRevision) {
      tx.abort();
      await tx.done.catch(() => undefined);
      return { kind: 'conflict', theirRevision: theirs, theirWriter: typeof stored.writer === 'string' ? stored.writer : 'another tab' };
    }
    await tx.store.put({ ...record, revision: theirs + 1 }, 'current');
    await tx.done;
    return { kind: 'saved', revision: theirs + 1 };
  }

  /** The revision saved now (0 when nothing is). */
  async revision(): Promise<number> {
    const stored = (await this.db.get('workspace', 'current')) as { revision?: unknown } | undefined;
    return typeof stored?.revision === 'number' ? stored.revision : 0;
  }

  async backup(value: unknown, reason: string): Promise<void> {
    await this.db.add('backups', { savedAt: Date.now(), reason, value });
  }

  async backups(): Promise<Backup[]> {
    return this.db.getAll('backups');
  }

  async putScan(stored: StoredScan): Promise<void> {
    await this.db.put('scans', stored);
  }

  async getScan(id: string): Promise<StoredScan | undefined> {
    return this.db.get('scans', id);
  }

  async deleteScan(id: string): Promise<void> {
    await this.db.delete('scans', id);
  }

  async scanIds(): Promise<string[]> {
    return this.db.getAllKeys('scans');
  }
}
