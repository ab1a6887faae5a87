import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import type { SweepJson } from '../../src/io/sweep-export.ts';
import { runInMemory } from '../support/cli-harness.ts';

const root = fileURLToPath(new URL('../..', import.meta.url));
const run = promisify(execFile);

/** The real program in a real process: bin/chokepoint.mjs (which builds dist-cli/ when it is stale). */
async function chokepoint(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, ['bin/chokepoint.mjs', ...args], { cwd: root, maxBuffer: 64 * 1024 * 1024 });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const failed = error as { code?: unknown; stdout?: string; stderr?: string };
    if (typeof failed.code !== 'number') throw error;
    return { code: failed.code, stdout: failed.stdout ?? '', stderr: failed.stderr ?? '' };
  }
}

describe('bin/chokepoint.mjs as a process', () => {
  it('sweeps the demo design to JSON and exits 0', { timeout: 120_000 }, async () => {
    const { code, stdout, stderr } = await chokepoint('sweep', 'fixtures/demo/adapter-two-stage.design.json', '--json');
    expect(code, stderr).toBe(0);
    // Only the one-line build notice may appear, when the bundle was stale.
    expect(stderr).toMatch(/^(chokepoint: building the command line…\n)?$/u);
    const json = JSON.parse(stdout) as SweepJson;
    const version = (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version;
    expect(json).toMatchObject({ format: 'chokepoint-sweep', version: 1, generator: `chokepoint ${version}` });
    expect(json.pointCount).toBeGreaterThan(700);
    expect(json.data['frequency_Hz']).toHaveLength(json.pointCount);
    expect(json.data['frequency_Hz']![0]).toBe(9e3);
  });

  it('streams a long sweep to a file and to standard output, the same text as in memory', { timeout: 120_000 }, async () => {
    const dir = mkdtempSync(join(tmpdir(), 'chokepoint-bin-'));
    try {
      const args = ['sweep', 'fixtures/demo/adapter-two-stage.design.json', '--points-per-decade', '2000', '--no-refine', '--columns', 'all'];
      const file = join(dir, 'sweep.csv');
      const toFile = await chokepoint(...args, '-o', file);
      expect(toFile.code, toFile.stderr).toBe(0);
      const toStdout = await chokepoint(...args);
      const inMemory = await runInMemory(args, { 'fixtures/demo/adapter-two-stage.design.json': readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8') });
      expect(inMemory.pieces.get('-')).toBeGreaterThan(3);
      expect(readFileSync(file, 'utf8')).toBe(inMemory.stdout);
      expect(toStdout.stdout).toBe(inMemory.stdout);
      const unwritable = await chokepoint(...args, '-o', join(dir, 'missing', 'sweep.csv'));
      expect(unwritable.code).toBe(2);
      expect(unwritable.stderr).toMatch(/cannot write .*sweep\.csv: its folder does not exist/u);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('exits 2 with a one-line message for a missing file', { timeout: 120_000 }, async () => {
    const { code, stdout, stderr } = await chokepoint('sweep', 'no-such.design.json');
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr.replace(/^chokepoint: building the command line…\n/u, '')).toBe(
      'chokepoint: cannot read the design no-such.design.json: no such file\n',
    );
  });
});
