#!/usr/bin/env node
// The chokepoint command. Runs dist-cli/chokepoint.mjs, first rebuilding it with vite (and
// vite.cli.config.ts) when it is missing or older than anything under src/ or the build inputs.
import { mkdirSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import process from 'node:process';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const outDir = join(root, 'dist-cli');
const output = join(outDir, 'chokepoint.mjs');
const buildInputs = ['src', 'workers', 'package.json', 'package-lock.json', 'vite.cli.config.ts'].map((name) => join(root, name));

/** Newest modification time of a file or of anything in a folder (folders count: a deleted file changes its folder). */
function newestChange(path) {
  let stats;
  try {
    stats = statSync(path);
  } catch {
    return 0;
  }
  let newest = stats.mtimeMs;
  if (stats.isDirectory()) {
    for (const entry of readdirSync(path)) newest = Math.max(newest, newestChange(join(path, entry)));
  }
  return newest;
}

function builtAt() {
  try {
    return statSync(output).mtimeMs;
  } catch {
    return undefined;
  }
}

/** Every file under a folder, as paths relative to it. */
function filesUnder(folder, prefix = '') {
  return readdirSync(join(folder, prefix), { withFileTypes: true }).flatMap((entry) => {
    const path = join(prefix, entry.name);
    return entry.isDirectory() ? filesUnder(folder, path) : [path];
  });
}

async function rebuild() {
  let vite;
  try {
    vite = await import('vite');
  } catch {
    return false;
  }
  process.stderr.write('chokepoint: building the command line…\n');
  // Build beside the output and move the files in: a rename is atomic, so a run that starts
  // meanwhile sees the old file or the new one, never half of one.
  const staging = join(outDir, `.build-${process.pid}-${Date.now()}`);
  try {
    await vite.build({
      configFile: join(root, 'vite.cli.config.ts'),
      logLevel: 'warn',
      build: { outDir: staging, emptyOutDir: true },
    });
    for (const file of filesUnder(staging)) {
      mkdirSync(dirname(join(outDir, file)), { recursive: true });
      renameSync(join(staging, file), join(outDir, file));
    }
  } finally {
    rmSync(staging, { recursive: true, force: true });
  }
  return true;
}

const built = builtAt();
if (built === undefined || buildInputs.some((path) => newestChange(path) > built)) {
  let rebuilt;
  try {
    rebuilt = await rebuild();
  } catch (error) {
    process.stderr.write(`chokepoint: could not build the command line: ${error instanceof Error ? error.message : String(error)}\n`);
    process.exit(3);
  }
  if (!rebuilt && built === undefined) {
    process.stderr.write(
      `chokepoint: ${relative(process.cwd(), output) || output} is missing and vite is not installed to build it: run "npm install" in ${root}\n`,
    );
    process.exit(3);
  }
}

// The bundle reads process.argv and sets process.exitCode itself.
await import(pathToFileURL(output).href);
