import { describe, expect, it } from 'vitest';
import { readDesignJson } from '../../src/model/read-design.ts';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';
const files = { [DEMO]: repoFile(DEMO), [SCAN]: repoFile(SCAN) };
const axes = ['--x', 'LCM1', '--x-range', '0.5mH,10mH', '--y', 'CY1,CY2', '--y-range', '0.47nF,10nF', '--steps', '8'];

describe('chokepoint map', () => {
  it('maps CM choke against Y capacitance on the demo, with the leakage limit', async () => {
    const run = await runInMemory(['map', DEMO, '--scan', SCAN, ...axes, '--leakage-limit', '0.75mA', '--line-voltage', '264V', '--line-frequency', '60Hz', '--json'], files);
    expect(run.code, run.stderr).toBe(0);
    const json = JSON.parse(run.stdout) as { worstMarginDb: number[]; xValues: number[]; leakageBoundary: { axis: string; value: number }; current: { x: number; y: number } };
    expect(json.worstMarginDb).toHaveLength(64);
    expect(json.xValues[0]).toBeCloseTo(0.5e-3, 12);
    expect(json.leakageBoundary.axis).toBe('y');
    // 0.75 mA at 264 V, 60 Hz, +10 %: I/(2π f V (1 + tol)) (references.md §9).
    expect(json.leakageBoundary.value).toBeCloseTo(0.75e-3 / (2 * Math.PI * 60 * 264 * 1.1), 15);
    expect(json.current).toEqual({ x: 2.2e-3, y: 2.2e-9, marginDb: expect.any(Number) as number });
  });

  it('writes a cell as a new design', async () => {
    const run = await runInMemory(['map', DEMO, '--scan', SCAN, ...axes, '--cell', '7,0', '--variant', 'cell.json'], files);
    expect(run.code, run.stderr).toBe(0);
    const cell = readDesignJson(run.written.get('cell.json')!);
    if (!cell.ok) throw new Error(cell.error.message);
    const choke = cell.value.stages[0]!.elements.find((e) => e.id === 'LCM1')!.part;
    expect(choke.kind === 'common-mode-choke' && choke.inductance).toBeCloseTo(10e-3, 12);
    expect(run.stdout).toMatch(/@/u);
  });

  it('refuses a missing range, a bad quantity and a cell outside the grid (exit 2)', async () => {
    expect((await runInMemory(['map', DEMO, '--scan', SCAN, '--x', 'LCM1', '--y', 'CX2', '--y-range', '1u,2u'], files)).code).toBe(2);
    const badQuantity = await runInMemory(['map', DEMO, '--scan', SCAN, '--x', 'LCM1:volume', ...axes.slice(2)], files);
    expect(badQuantity.code).toBe(2);
    expect(badQuantity.stderr).toMatch(/quantity must be one of/u);
    expect((await runInMemory(['map', DEMO, '--scan', SCAN, ...axes, '--cell', '9,9', '--variant', 'x.json'], files)).code).toBe(2);
  });
});
