#!/usr/bin/env node
// npm run bench [-- --json]: bundles scripts/bench/bench-main.ts for Node with vite (Node 20
// cannot run TypeScript itself) into node_modules/.cache and runs it in a fresh process.
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'vite';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const outDir = join(root, 'node_modules', '.cache', 'chokepoint-bench');
await build({
  configFile: false,
  root,
  logLevel: 'warn',
  publicDir: false,
  ssr: { target: 'node', noExternal: true },
  build: {
    ssr: join(root, 'scripts', 'bench', 'bench-main.ts'),
    outDir,
    emptyOutDir: true,
    target: 'node20',
    minify: false,
    reportCompressedSize: false,
    rolldownOptions: { output: { format: 'es', entryFileNames: 'bench.mjs' } },
  },
});
const run = spawnSync(process.execPath, [join(outDir, 'bench.mjs'), ...process.argv.slice(2)], { stdio: 'inherit' });
process.exit(run.status ?? 1);
