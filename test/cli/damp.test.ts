import { describe, expect, it } from 'vitest';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';
import { readDesignJson } from '../../src/model/read-design.ts';
import { demoScan } from '../assist/demo-fixture.ts';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';
const files = { [DEMO]: repoFile(DEMO), [SCAN]: repoFile(SCAN) };

describe('chokepoint damp', () => {
  it('lists the demo’s resonances, damps the one at the worst margin and writes a variant the check command passes', async () => {
    const run = await runInMemory(['damp', DEMO, '--scan', SCAN, '--scan-tag', 'line1', '--variant', 'damped.json'], files);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/DM 279\.\d kHz/u);
    expect(run.stdout).toMatch(/R–C_b leg across CX3/u);
    const variant = readDesignJson(run.written.get('damped.json')!);
    if (!variant.ok) throw new Error('the variant does not read back');
    expect(variant.value.name).toMatch(/damped/u);
    expect(analyzeEmissions(variant.value, { kind: 'scan', scan: demoScan() }).report.pass).toBe(true);
  });

  it('works without noise, and refuses a bad ratio (exit 2)', async () => {
    const run = await runInMemory(['damp', DEMO, '--json'], files);
    expect(run.code, run.stderr).toBe(0);
    const json = JSON.parse(run.stdout) as { suggestion: { marginBeforeDb?: number; resistanceOhm: number } };
    expect(json.suggestion.resistanceOhm).toBeGreaterThan(0);
    expect(json.suggestion.marginBeforeDb).toBeUndefined();
    expect((await runInMemory(['damp', DEMO, '--ratio', '0'], files)).code).toBe(2);
  });
});
