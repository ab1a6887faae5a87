#!/usr/bin/env node
// npm test: every check that says "good to merge", in order, continuing past failures so one run
// reports everything. Type-check (DOM and DOM-free configs), lint, build (the e2e tests load the
// built app, and one CLI test runs the built command), then every vitest project. The last line
// is a plain "N passed, N failed" (the static steps count as one check each); exit code 1 if
// anything failed.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, rmSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const bin = (name) => join(root, 'node_modules', '.bin', name);
const outDir = join(root, '.ci-out');
mkdirSync(outDir, { recursive: true });
const env = { ...process.env, NO_COLOR: '1', FORCE_COLOR: '0' };

// The browser tests need Debian's Chromium and the simulator oracle needs ngspice. On a fresh
// machine, as root (CI), install them; otherwise say what is missing and carry on.
// Each tool and the Debian package that brings it (poppler-utils: pdftoppm and pdftotext for the printed report).
const TOOLS = { chromium: 'chromium', ngspice: 'ngspice', pdftoppm: 'poppler-utils' };
const missing = Object.entries(TOOLS)
  .filter(([tool]) => spawnSync('sh', ['-c', `command -v ${tool}`]).status !== 0)
  .map(([, pkg]) => pkg);
if (missing.length > 0) {
  if (process.getuid?.() === 0) {
    process.stdout.write(`=== installing ${missing.join(' and ')} (apt-get)\n`);
    spawnSync('sh', ['-c', `apt-get update -q && apt-get install -y -q ${missing.join(' ')}`], {
      stdio: 'inherit',
      env: { ...env, DEBIAN_FRONTEND: 'noninteractive' },
    });
  } else {
    process.stdout.write(`note: ${missing.join(' and ')} not installed; run: sudo apt-get install -y ${missing.join(' ')}\n`);
  }
}

let passed = 0;
let failed = 0;
const failures = [];

function step(label, command, args) {
  process.stdout.write(`\n=== ${label}: ${[command.replace(`${root}/`, ''), ...args].join(' ')}\n`);
  const run = spawnSync(command, args, { cwd: root, stdio: 'inherit', env });
  const ok = run.status === 0;
  if (ok) passed += 1;
  else {
    failed += 1;
    failures.push(label);
  }
  return ok;
}

step('type-check (app, tests, scripts)', bin('tsc'), ['-p', 'tsconfig.json']);
step('type-check (DOM-free layers)', bin('tsc'), ['-p', 'tsconfig.engine.json']);
step('lint', bin('eslint'), ['--max-warnings', '0', '.']);
const built = step('build (app)', bin('vite'), ['build']) && step('build (command line)', bin('vite'), ['build', '-c', 'vite.cli.config.ts']);

const report = join(outDir, 'vitest.json');
rmSync(report, { force: true });
process.stdout.write('\n=== tests: vitest run (unit, ui, e2e)\n');
const vitest = spawnSync(bin('vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`], {
  cwd: root,
  stdio: 'inherit',
  env,
});
try {
  const summary = JSON.parse(readFileSync(report, 'utf8'));
  passed += summary.numPassedTests;
  failed += summary.numFailedTests + summary.numPendingTests + summary.numTodoTests;
  if (summary.numFailedTests > 0) failures.push(`${summary.numFailedTests} test(s)`);
  // A suite that failed to load has no tests to count; count it so it cannot pass silently.
  const brokenSuites = summary.testResults.filter((suite) => suite.status === 'failed' && suite.assertionResults.length === 0).length;
  failed += brokenSuites;
  if (brokenSuites > 0) failures.push(`${brokenSuites} test file(s) that did not load`);
} catch {
  failed += 1;
  failures.push('vitest produced no report');
}
if (vitest.status !== 0 && !failures.some((f) => f.includes('test'))) {
  failed += 1;
  failures.push(`vitest exited ${vitest.status}`);
}
if (!built) process.stdout.write('\n(the build failed, so the browser tests ran against a stale or missing build)\n');
if (failures.length > 0) process.stdout.write(`\nfailed: ${failures.join('; ')}\n`);
process.stdout.write(`${passed} passed, ${failed} failed\n`);
process.exit(failed === 0 ? 0 : 1);
