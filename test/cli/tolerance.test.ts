import { execFile } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';
const files = { [DEMO]: repoFile(DEMO), [SCAN]: repoFile(SCAN) };
const root = fileURLToPath(new URL('../..', import.meta.url));
const run = promisify(execFile);

interface YieldJson {
  samples: number;
  yieldFraction: number;
  pass: boolean;
  worstMarginDb: number[];
  histogram: { counts: number[] };
  curve: { levelP95DbuV: (number | null)[] };
}

describe('chokepoint tolerance', () => {
  it('gives the demo’s yield on its scan, below 95 %: exit 1', async () => {
    const result = await runInMemory(['tolerance', DEMO, '--scan', SCAN, '--scan-tag', 'line1', '--samples', '60', '--json'], files);
    expect(result.code, result.stderr).toBe(1);
    const json = JSON.parse(result.stdout) as YieldJson;
    expect(json.samples).toBe(60);
    expect(json.yieldFraction).toBeGreaterThan(0);
    expect(json.yieldFraction).toBeLessThan(0.95);
    expect(json.histogram.counts.reduce((a, b) => a + b, 0)).toBe(60);
    expect(json.curve.levelP95DbuV.length).toBeGreaterThan(100);
  });

  it('passes (exit 0) when the required yield is met, and refuses a bad option (exit 2)', async () => {
    const ok = await runInMemory(['tolerance', DEMO, '--scan', SCAN, '--samples', '40', '--required-yield', '0'], files);
    expect(ok.code, ok.stderr).toBe(0);
    expect(ok.stdout).toMatch(/RESULT: PASS/u);
    expect((await runInMemory(['tolerance', DEMO, '--scan', SCAN, '--samples', '0'], files)).code).toBe(2);
    expect((await runInMemory(['tolerance', DEMO, '--scan', SCAN, '--permeability-band', '10,20'], files)).code).toBe(2);
  });

  it('a seeded run on real worker threads equals the single-thread run', { timeout: 180_000 }, async () => {
    const once = async (workers: string): Promise<YieldJson> => {
      const { stdout } = await run(process.execPath, ['bin/chokepoint.mjs', 'tolerance', DEMO, '--estimate', '--samples', '80', '--seed', '3', '--workers', workers, '--json'], {
        cwd: root,
        maxBuffer: 64 * 1024 * 1024,
      }).catch((error: { stdout?: string; code?: number }) => {
        if (error.code === 1 && error.stdout) return { stdout: error.stdout };
        throw error;
      });
      return JSON.parse(stdout) as YieldJson;
    };
    const one = await once('1');
    const two = await once('2');
    expect(two.worstMarginDb).toEqual(one.worstMarginDb);
    expect(two.yieldFraction).toBe(one.yieldFraction);
  });
});
