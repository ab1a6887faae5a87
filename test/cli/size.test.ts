import { describe, expect, it } from 'vitest';
import { maximumYCapacitance } from '../../src/assist/sizing/leakage-limit.ts';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';
const files = { [DEMO]: repoFile(DEMO), [SCAN]: repoFile(SCAN) };

describe('chokepoint size', () => {
  it('sizes the demo’s inlet X capacitor: a little more than its 1 µF, snapped to E12 and checked', async () => {
    const run = await runInMemory(['size', DEMO, '--scan', SCAN, '--scan-tag', 'line1', '--part', 'CX2', '--json'], files);
    expect(run.code, run.stderr).toBe(0);
    const json = JSON.parse(run.stdout) as { parts: { result: { answer: { value: number; marginDb: number }; preferred: { value: number; marginDb: number; series: string } } }[] };
    const { answer, preferred } = json.parts[0]!.result;
    expect(answer.value).toBeGreaterThan(1e-6);
    expect(answer.value).toBeLessThan(1.5e-6);
    expect(answer.marginDb).toBeGreaterThanOrEqual(6);
    expect(preferred.series).toBe('E12');
    expect([1.2e-6, 1.5e-6]).toContainEqual(preferred.value);
  });

  it('gives the Y limit of references.md §9 (0.75 mA at 250 V, 50 Hz, no tolerance: 9.54930 nF)', async () => {
    const run = await runInMemory(
      ['size', DEMO, '--estimate', '--part', 'CX2', '--leakage-limit', '0.75 mA', '--line-voltage', '250 V', '--line-frequency', '50 Hz', '--y-tolerance', '0', '--json'],
      files,
    );
    expect(run.code, run.stderr).toBe(0);
    const json = JSON.parse(run.stdout) as { yCapacitance: { maximumPerLineF: number; line1F: number } };
    expect(json.yCapacitance.maximumPerLineF * 1e9).toBeCloseTo(9.5493, 4);
    expect(json.yCapacitance.line1F).toBeCloseTo(2.2e-9, 20);
    // And the formula itself at 264 V, 60 Hz, +20 %: 2.09 nF for 0.25 mA (domain.md C13, arithmetic checked).
    expect(maximumYCapacitance(0.25e-3, 264, 60, 0.2) * 1e9).toBeCloseTo(2.093, 3);
  });

  it('refuses the leakage limit without a supply, and an unknown part (exit 2)', async () => {
    const noSupply = await runInMemory(['size', DEMO, '--estimate', '--part', 'CX2', '--leakage-limit', '0.75mA'], files);
    expect(noSupply.code).toBe(2);
    expect(noSupply.stderr).toMatch(/operating\.supply/u);
    const unknown = await runInMemory(['size', DEMO, '--estimate', '--part', 'CX9'], files);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/CX9/u);
  });
});
