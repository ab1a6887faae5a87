import type { SplitRunner } from '../assist/pool/split-jobs.ts';

/**
 * Everything the command line needs from its surroundings, injected so that the commands run the
 * same in Node (src/cli/node-main.ts) and in tests (a fake that keeps files in a Map).
 */
export interface CliIo {
  /**
   * Read a file's bytes (src/io/text-bytes.ts makes them text, or says why not). When it cannot,
   * reject with an Error that carries a Node-style `code` ("ENOENT", "EISDIR", "EACCES", …): the
   * command line turns the code into words. With `maxBytes`, a larger file is not read: reject with
   * code "EFBIG" and its `size`.
   */
  readFile(path: string, maxBytes?: number): Promise<Uint8Array>;
  /** Write (create or replace) a UTF-8 text file; reject like readFile. */
  writeTextFile(path: string, text: string): Promise<void>;
  /**
   * Write text made piece by piece, to a file (created or replaced) or, with no path, to standard
   * output, taking the next piece only when the last has gone (so a million-row output never sits in
   * memory whole); reject like writeTextFile. Optional: without it the pieces are joined and written.
   */
  writeChunks?(path: string | undefined, chunks: Iterable<string>): Promise<void>;
  /** Write to standard output as is (no newline added). */
  stdout(text: string): void;
  /** Write to standard error as is (no newline added). */
  stderr(text: string): void;
  /** The tool's version ("0.1.0"). */
  readonly version: string;
  /**
   * Worker threads for the assistants' split work (tolerance yield, maps), `workers` of them; absent
   * (tests, or a host without threads), the work runs in this thread with the same result.
   */
  readonly splitRunner?: (workers: number) => SplitRunner;
  /** Cores available, for the default number of workers (1 when absent). */
  readonly cores?: number;
}

const FILE_ERRORS: Readonly<Record<string, string>> = {
  ENOENT: 'no such file',
  ENOTDIR: 'a folder on the path does not exist',
  EISDIR: 'it is a folder, not a file',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EROFS: 'the file system is read-only',
  ENOSPC: 'no space left on the device',
  EMFILE: 'too many open files',
  ENAMETOOLONG: 'the name is too long',
};

/** Words for why a file could not be read or written. */
export function describeFileError(error: unknown, action: 'read' | 'write' = 'read'): string {
  if (typeof error === 'object' && error !== null) {
    const code = (error as { code?: unknown }).code;
    if (action === 'write' && code === 'ENOENT') return 'its folder does not exist';
    if (typeof code === 'string' && FILE_ERRORS[code]) return FILE_ERRORS[code];
    const message = (error as { message?: unknown }).message;
    if (typeof message === 'string' && message !== '') return message;
  }
  return String(error);
}
