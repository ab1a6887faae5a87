import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

// docs/design-format.md ("More examples") and docs/cli.md promise that `check --estimate` works on every
// example design: each carries limit masks and an invented noise estimate, and gets a verdict on evidence.
const examples = readdirSync(new URL('../../fixtures/examples/', import.meta.url)).filter((name) => name.endsWith('.json'));

interface CheckJson {
  verdict: { status: string; judgedPoints: number };
  bands: { name: string; status: string; judgedPoints: number }[];
}

describe('chokepoint check --estimate on every example design', () => {
  it('finds the examples', () => {
    expect(examples.length).toBeGreaterThanOrEqual(4);
  });

  it.each(examples)('%s: a verdict (exit 0 or 1) with every band covered by judged harmonics', async (name) => {
    const path = `fixtures/examples/${name}`;
    const text = repoFile(path);
    const result = await runInMemory(['check', path, '--estimate', '--json'], { [path]: text });
    expect(result.stderr).toBe('');
    expect([0, 1]).toContain(result.code);
    const json = JSON.parse(result.stdout) as CheckJson;
    expect(json.verdict.status).not.toBe('refused');
    for (const band of json.bands) {
      expect(band.status, band.name).not.toBe('not-covered');
      expect(band.judgedPoints, band.name).toBeGreaterThan(0);
    }
    expect(result.code).toBe(json.verdict.status === 'pass' ? 0 : 1);
    // The estimate is as invented as the rest, and the file says so.
    expect((JSON.parse(text) as { description: string }).description).toMatch(/^INVENTED .*noise estimate .*invented too/su);
  });
});
