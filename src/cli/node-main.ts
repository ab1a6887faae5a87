/**
 * The Node adapter of the command line: the only file of src/cli that touches node:*. It wires
 * process.argv, the file system and the standard streams into runCli and sets the exit code.
 * vite.cli.config.ts bundles it into dist-cli/chokepoint.mjs; bin/chokepoint.mjs runs that.
 */
import { createWriteStream } from 'node:fs';
import { readFile, stat, writeFile } from 'node:fs/promises';
import process from 'node:process';
import type { Writable } from 'node:stream';
import { version } from '../../package.json';
import { type CliIo, runCli } from './run-cli.ts';

/** Whether standard output's reader went away (`chokepoint sweep x | head`): not an error, just the end. */
let stdoutClosed = false;

/** Write to a stream; a reader that went away is not an error. */
function writer(stream: NodeJS.WriteStream, isStdout: boolean): (text: string) => void {
  let closed = false;
  stream.on('error', (error: NodeJS.ErrnoException) => {
    if (error.code === 'EPIPE') {
      closed = true;
      if (isStdout) stdoutClosed = true;
    } else throw error;
  });
  return (text) => {
    if (!closed) stream.write(text);
  };
}

/** Wait until a stream wants more, it closes, or it fails. */
function drained(stream: Writable): Promise<void> {
  return new Promise((resolve, reject) => {
    const done = (): void => {
      stream.off('drain', done);
      stream.off('close', done);
      stream.off('error', failed);
      resolve();
    };
    const failed = (error: Error): void => {
      stream.off('drain', done);
      stream.off('close', done);
      reject(error);
    };
    stream.once('drain', done);
    stream.once('close', done);
    stream.once('error', failed);
  });
}

/** Write pieces one after another, waiting whenever the stream's buffer is full: memory stays bounded. */
async function writePieces(stream: Writable, chunks: Iterable<string>, closed: () => boolean): Promise<void> {
  for (const chunk of chunks) {
    if (closed()) return;
    if (!stream.write(chunk)) await drained(stream);
  }
}

async function writeChunks(path: string | undefined, chunks: Iterable<string>): Promise<void> {
  if (path === undefined) {
    await writePieces(process.stdout, chunks, () => stdoutClosed);
    return;
  }
  const file = createWriteStream(path);
  // Open first, so that a file that cannot be written fails with its code before anything is made.
  await new Promise<void>((resolve, reject) => {
    file.once('open', () => resolve());
    file.once('error', reject);
  });
  let failure: Error | undefined;
  file.on('error', (error) => {
    failure = error;
  });
  await writePieces(file, chunks, () => failure !== undefined);
  await new Promise<void>((resolve) => file.end(resolve));
  if (failure) throw failure;
}

const io: CliIo = {
  readFile: async (path, maxBytes) => {
    if (maxBytes !== undefined) {
      const { size } = await stat(path);
      if (size > maxBytes) throw Object.assign(new Error(`${path} holds ${size} bytes`), { code: 'EFBIG', size });
    }
    return readFile(path);
  },
  writeTextFile: (path, text) => writeFile(path, text, 'utf8'),
  writeChunks,
  stdout: writer(process.stdout, true),
  stderr: writer(process.stderr, false),
  version,
};

process.exitCode = await runCli(process.argv.slice(2), io);
