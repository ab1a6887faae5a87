import { describe, expect, it } from 'vitest';
import { readDesignJson } from '../../src/model/read-design.ts';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

const EXAMPLE = 'fixtures/assist/invented-dc-input-converter.design.json';
const files = { [EXAMPLE]: repoFile(EXAMPLE) };

describe('chokepoint propose', () => {
  it('proposes filters behind the example’s converter, keeps it stable and writes the first as a design', { timeout: 60_000 }, async () => {
    const run = await runInMemory(['propose', EXAMPLE, '--estimate', '--fixed-y', '4.7nF', '--stages', '1', '--variant', 'proposed.json'], files);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/1\. 1-stage/u);
    expect(run.stdout).toMatch(/converter stability: closest approach/u);
    const proposed = readDesignJson(run.written.get('proposed.json')!);
    expect(proposed.ok).toBe(true);
  });

  it('exits 1 when nothing fits the constraints (a fixed 1 µH choke), 2 on a bad stage count', { timeout: 60_000 }, async () => {
    const none = await runInMemory(['propose', EXAMPLE, '--estimate', '--fixed-y', '4.7nF', '--fixed-choke', '1uH', '--stages', '1', '--json'], files);
    expect(none.code, none.stderr).toBe(1);
    expect((JSON.parse(none.stdout) as { proposals: unknown[] }).proposals).toEqual([]);
    expect((await runInMemory(['propose', EXAMPLE, '--estimate', '--stages', '4'], files)).code).toBe(2);
  });
});
