import { readFileSync } from 'node:fs';
import { type CliIo, runCli } from '../../src/cli/run-cli.ts';

export interface CliRun {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
  readonly written: ReadonlyMap<string, string>;
  /** How many pieces each streamed output came in ("-" for standard output). */
  readonly pieces: ReadonlyMap<string, number>;
}

/** A repository file's text (paths relative to the repository root). */
export function repoFile(path: string): string {
  return readFileSync(new URL(`../../${path}`, import.meta.url), 'utf8');
}

/**
 * Run the command line in-process: `files` maps paths to contents, text (written as UTF-8) or bytes
 * (anything else is ENOENT), writes are kept in `written`, nothing touches the disk or the real console.
 */
export async function runInMemory(argv: string[], files: Record<string, string | Uint8Array>): Promise<CliRun> {
  const written = new Map<string, string>();
  const pieces = new Map<string, number>();
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    readFile: async (path, maxBytes) => {
      const text = files[path];
      if (text === undefined) throw Object.assign(new Error(`ENOENT: no such file, '${path}'`), { code: 'ENOENT' });
      const bytes = typeof text === 'string' ? new TextEncoder().encode(text) : text;
      // As node-main.ts does: a file above the limit is not read.
      if (maxBytes !== undefined && bytes.length > maxBytes) throw Object.assign(new Error('too large'), { code: 'EFBIG', size: bytes.length });
      return bytes;
    },
    writeTextFile: async (path, text) => {
      written.set(path, text);
    },
    writeChunks: async (path, chunks) => {
      let text = '';
      let count = 0;
      for (const chunk of chunks) {
        text += chunk;
        count += 1;
      }
      pieces.set(path ?? '-', count);
      if (path === undefined) stdout += text;
      else written.set(path, text);
    },
    stdout: (text) => {
      stdout += text;
    },
    stderr: (text) => {
      stderr += text;
    },
    version: 'test',
  };
  return { code: await runCli(argv, io), stdout, stderr, written, pieces };
}
