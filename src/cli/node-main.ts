/**
 * The Node adapter of the command line: the only file of src/cli that touches node:*. It wires
 * process.argv, the file system and the standard streams into runCli and sets the exit code.
 * vite.cli.config.ts bundles it into dist-cli/chokepoint.mjs; bin/chokepoint.mjs runs that.
 *
 * The same bundle is also the assistants' worker thread: started with POOL_ROLE as its workerData,
 * it answers the pool's messages (prepare a job, run a chunk, release) instead of running a command.
 */
import { createWriteStream } from 'node:fs';
import { readFile, stat, writeFile } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import process from 'node:process';
import type { Writable } from 'node:stream';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { version } from '../../package.json';
import { type ChunkRange, scheduleRanges, type SplitChunk, type SplitJob, type SplitRunner } from '../assist/pool/split-jobs.ts';
import { createSplitHost, type HostReply } from '../../workers/split-host.ts';
import { collectTransferables } from '../../workers/transferables.ts';
import { type CliIo, runCli } from './run-cli.ts';

const POOL_ROLE = 'chokepoint-assistants-pool';

type PoolRequest =
  | { readonly type: 'prepare'; readonly jobId: number; readonly request: unknown }
  | { readonly type: 'run'; readonly jobId: number; readonly range: ChunkRange }
  | { readonly type: 'release'; readonly jobId: number };
type PoolMessage = PoolRequest & { readonly id: number };

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


/** Worker threads running this same bundle in POOL_ROLE, one message at a time each. */
function threadRunner(count: number): SplitRunner {
  let nextJob = 1;
  let nextMessage = 1;
  const threads = Array.from({ length: count }, () => new Worker(new URL(import.meta.url), { workerData: POOL_ROLE }));
  const pending = new Map<number, { resolve: (reply: HostReply<unknown>) => void; reject: (error: Error) => void }>();
  for (const thread of threads) {
    thread.on('message', (reply: { id: number; reply: HostReply<unknown> }) => {
      pending.get(reply.id)?.resolve(reply.reply);
      pending.delete(reply.id);
    });
    thread.on('error', (error) => {
      for (const waiting of pending.values()) waiting.reject(error);
      pending.clear();
    });
  }
  const call = <T>(thread: Worker, message: PoolRequest): Promise<T> =>
    new Promise<HostReply<unknown>>((resolve, reject) => {
      const id = nextMessage;
      nextMessage += 1;
      pending.set(id, { resolve, reject });
      thread.postMessage({ ...message, id });
    }).then((reply) => {
      if (!reply.ok) throw new Error(reply.error.message);
      return reply.value as T;
    });
  return {
    workerCount: count,
    async run(job: SplitJob, ranges: readonly ChunkRange[], onChunk?: (finished: number) => void): Promise<SplitChunk[]> {
      const jobId = nextJob;
      nextJob += 1;
      const request = { requestId: jobId, ...job };
      await Promise.all(threads.map((thread) => call(thread, { type: 'prepare', jobId, request })));
      try {
        return await scheduleRanges(
          ranges,
          threads.map((thread) => (range: ChunkRange) => call<SplitChunk>(thread, { type: 'run', jobId, range })),
          onChunk,
        );
      } finally {
        for (const thread of threads) thread.postMessage({ id: 0, type: 'release', jobId });
      }
    },
    close() {
      for (const thread of threads) void thread.terminate();
    },
  };
}

if (!isMainThread && workerData === POOL_ROLE) {
  const host = createSplitHost();
  parentPort!.on('message', (message: PoolMessage) => {
    if (message.type === 'release') {
      host.release(message.jobId);
      return;
    }
    const reply = message.type === 'prepare' ? host.prepare(message.jobId, message.request) : host.run(message.jobId, message.range);
    parentPort!.postMessage({ id: message.id, reply }, reply.ok ? collectTransferables(reply.value) : []);
  });
} else {
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
    splitRunner: threadRunner,
    cores: availableParallelism(),
  };

  process.exitCode = await runCli(process.argv.slice(2), io);
}
