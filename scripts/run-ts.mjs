#!/usr/bin/env node
// node scripts/run-ts.mjs <entry.ts> [args…]: bundle a TypeScript entry for Node with vite (Node 20
// cannot run TypeScript itself) into node_modules/.cache and run it in a fresh process.
import { spawnSync } from 'node:child_process';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'vite';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const [entry, ...rest] = process.argv.slice(2);
if (!entry) {
  process.stderr.write('usage: node scripts/run-ts.mjs <entry.ts> [args…]\n');
  process.exit(2);
}
const name = basename(entry).replace(/\.ts$/u, '');
const outDir = join(root, 'node_modules', '.cache', 'chokepoint-scripts', name);
await build({
  configFile: false,
  root,
  logLevel: 'warn',
  publicDir: false,
  // Bundle the project's own code and its libraries; leave the tools that load files of their own
  // (vite, playwright-core) as packages, found in node_modules at run time.
  ssr: { target: 'node', noExternal: true, external: ['vite', 'playwright-core'] },
  build: {
    ssr: resolve(entry),
    outDir,
    emptyOutDir: true,
    target: 'node20',
    minify: false,
    reportCompressedSize: false,
    rolldownOptions: { output: { format: 'es', entryFileNames: `${name}.mjs` } },
  },
});
const run = spawnSync(process.execPath, [join(outDir, `${name}.mjs`), ...rest], { stdio: 'inherit', cwd: root });
process.exit(run.status ?? 1);
