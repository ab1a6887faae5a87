#!/usr/bin/env node
// npm run bench [-- --json]: runs scripts/bench/bench-main.ts through scripts/run-ts.mjs.
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const run = spawnSync(process.execPath, [join(root, 'scripts', 'run-ts.mjs'), join(root, 'scripts', 'bench', 'bench-main.ts'), ...process.argv.slice(2)], {
  stdio: 'inherit',
});
process.exit(run.status ?? 1);
