import { describe, expect, it } from 'vitest';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';
const files = { [DEMO]: repoFile(DEMO), [SCAN]: repoFile(SCAN) };

describe('chokepoint diagnose', () => {
  it('says the demo’s 260 kHz shortfall is differential mode and that CM inductance cannot fix it (exit 1)', async () => {
    const run = await runInMemory(['diagnose', DEMO, '--scan', SCAN, '--scan-tag', 'line1'], files);
    expect(run.code, run.stderr).toBe(1);
    expect(run.stdout).toMatch(/258\.0 kHz to 262\.0 kHz: margin 4\.6 dB .*differential mode sets it/u);
    expect(run.stdout).toMatch(/more CM inductance cannot fix it/u);
  });

  it('writes JSON with the ranges and the inductance probes', async () => {
    const run = await runInMemory(['diagnose', DEMO, '--scan', SCAN, '--scan-tag', 'line1', '--json'], files);
    const json = JSON.parse(run.stdout) as { ranges: { limitingMode: string; inductanceProbes: { factors: number[] }[] }[] };
    expect(json.ranges[0]!.limitingMode).toBe('differential-mode');
    expect(json.ranges[0]!.inductanceProbes[0]!.factors).toContain(10);
  });

  it('exits 0 when nothing is short (a 3 dB target)', async () => {
    const run = await runInMemory(['diagnose', DEMO, '--scan', SCAN, '--margin', '3'], files);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/nothing to diagnose/u);
  });

  it('exits 2 without noise, or with both a scan and the estimate', async () => {
    expect((await runInMemory(['diagnose', DEMO], files)).code).toBe(2);
    const both = await runInMemory(['diagnose', DEMO, '--scan', SCAN, '--estimate'], files);
    expect(both.code).toBe(2);
    expect(both.stderr).toMatch(/either scans or --estimate/u);
  });
});
