import { describe, expect, it } from 'vitest';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

const EXAMPLE = 'fixtures/assist/invented-dc-input-converter.design.json';
const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const files = { [EXAMPLE]: repoFile(EXAMPLE), [DEMO]: repoFile(DEMO) };

describe('chokepoint stability', () => {
  it('passes the invented 48 V, 50 W example (exit 0) and reports the closest approach', async () => {
    const run = await runInMemory(['stability', EXAMPLE], files);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/−V²\/P = -25\.92 Ω/u);
    expect(run.stdout).toMatch(/RESULT: PASS/u);
  });

  it('fails behind a 24 V, 100 W converter (|V²/P| = 5.76 Ω, exit 1), JSON with the curves', async () => {
    const run = await runInMemory(['stability', EXAMPLE, '--voltage', '24V', '--power', '100W', '--json'], files);
    expect(run.code, run.stderr).toBe(1);
    const json = JSON.parse(run.stdout) as { negativeResistanceOhm: number; pass: boolean; flagged: unknown[]; frequencyHz: number[]; marginDb: number[] };
    expect(json.negativeResistanceOhm).toBeCloseTo(-5.76, 9);
    expect(json.pass).toBe(false);
    expect(json.flagged.length).toBeGreaterThan(0);
    expect(json.marginDb).toHaveLength(json.frequencyHz.length);
  });

  it('refuses a design without converter data (exit 2), never a pass', async () => {
    const run = await runInMemory(['stability', DEMO], files);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/operating\.converter/u);
  });
});
