#!/usr/bin/env node
// npm run fuzz [-- --runs N] [--only scan,mask] [--seed S] [--path P]
// Fuzzes every way in (test/fuzz/fuzz-targets.ts): at least 10 000 seeded cases per format by
// default, one format at a time, each in a worker thread watched by a watchdog: a case that takes
// longer than CASE_LIMIT_MS is reported as a hang with its input, and the worker is stopped. Prints
// one summary line per format and, for a failure, the seed, the fast-check path and the shrunk input
// to replay it (DEVELOPERS.md, "Fuzzing"). Exit code 1 if any format failed.
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { build } from 'vite';

const TARGETS = ['scan', 'mask', 'impedance-table', 'touchstone', 'design-json', 'share-link', 'cli-arguments'];
const CASE_LIMIT_MS = 10_000;

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const args = process.argv.slice(2);
const option = (name) => {
  const at = args.indexOf(`--${name}`);
  return at >= 0 ? args[at + 1] : undefined;
};
const runs = Number(option('runs') ?? 10_000);
const seed = Number(option('seed') ?? process.env.CHOKEPOINT_SEED ?? 20261201);
const path = option('path');
const only = option('only')?.split(',') ?? TARGETS;
const unknown = only.filter((name) => !TARGETS.includes(name));
if (!Number.isInteger(runs) || runs < 1 || !Number.isInteger(seed) || unknown.length > 0) {
  process.stderr.write(`usage: npm run fuzz -- [--runs N] [--seed S] [--path P] [--only ${TARGETS.join(',')}]\n`);
  process.exit(2);
}

const outDir = join(root, 'node_modules', '.cache', 'chokepoint-fuzz');
await build({
  configFile: false,
  root,
  logLevel: 'warn',
  publicDir: false,
  ssr: { target: 'node', noExternal: true },
  build: {
    ssr: resolve(root, 'scripts/fuzz/fuzz-worker.ts'),
    outDir,
    emptyOutDir: true,
    target: 'node20',
    minify: false,
    reportCompressedSize: false,
    rolldownOptions: { output: { format: 'es', entryFileNames: 'fuzz-worker.mjs' } },
  },
});

function fuzz(target) {
  return new Promise((finish) => {
    const started = performance.now();
    const worker = new Worker(join(outDir, 'fuzz-worker.mjs'), { workerData: { target, runs, seed, path }, cwd: root });
    let last = { index: 0, shown: '', at: performance.now() };
    let slowest = { ms: 0, index: 0 };
    const watchdog = setInterval(() => {
      const waited = performance.now() - last.at;
      if (waited > CASE_LIMIT_MS) {
        clearInterval(watchdog);
        void worker.terminate();
        finish({ target, failed: true, hang: true, seconds: (performance.now() - started) / 1000, cases: last.index, slowest, detail: `case ${last.index} ran for more than ${CASE_LIMIT_MS / 1000} s: ${last.shown}` });
      }
    }, 250);
    worker.on('message', (message) => {
      const now = performance.now();
      if (message.type === 'case') {
        if (last.index > 0 && now - last.at > slowest.ms) slowest = { ms: now - last.at, index: last.index };
        last = { index: message.index, shown: message.shown, at: now };
        return;
      }
      clearInterval(watchdog);
      void worker.terminate();
      finish({ target, ...message, seconds: (now - started) / 1000, cases: last.index, slowest });
    });
    worker.on('error', (error) => {
      clearInterval(watchdog);
      finish({ target, failed: true, seconds: (performance.now() - started) / 1000, cases: last.index, slowest, detail: `the worker failed: ${error.message}` });
    });
  });
}

let failures = 0;
let total = 0;
const began = performance.now();
for (const target of only) {
  const result = await fuzz(target);
  total += result.cases;
  const slow = `slowest case ${result.slowest.ms.toFixed(0)} ms`;
  if (!result.failed) {
    process.stdout.write(`${target}: ${result.numRuns} cases, 0 failures, ${result.seconds.toFixed(1)} s (${slow}), seed ${seed}\n`);
    continue;
  }
  failures += 1;
  process.stdout.write(`${target}: FAILED after ${result.cases} cases, ${result.seconds.toFixed(1)} s, seed ${seed}\n`);
  if (result.detail) process.stdout.write(`  ${result.detail}\n`);
  if (result.error) process.stdout.write(`  ${result.error.split('\n')[0]}\n`);
  if (result.counterexample) process.stdout.write(`  input: ${result.counterexample}\n`);
  if (result.path) process.stdout.write(`  replay: npm run fuzz -- --only ${target} --seed ${seed} --path ${result.path}\n`);
}
process.stdout.write(`fuzz: ${only.length} formats, ${total} cases, ${failures} failed, ${((performance.now() - began) / 1000).toFixed(1)} s\n`);
process.exit(failures === 0 ? 0 : 1);
