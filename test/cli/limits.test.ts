import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { type CliRun, runInMemory } from '../support/cli-harness.ts';
import { readMaskCsv } from '../../src/io/mask-csv.ts';
import { copyPreset, LIMIT_PRESETS } from '../../src/spectrum/limit-presets.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const BAD = 'fixtures/masks/invented-with-errors.csv';
const file = (path: string): string => readFileSync(new URL(`../../${path}`, import.meta.url), 'utf8');

async function run(argv: string[]): Promise<CliRun> {
  return runInMemory(argv, { [DEMO]: file(DEMO), [BAD]: file(BAD) });
}

describe('chokepoint limits', () => {
  it('lists every preset', async () => {
    const result = await run(['limits']);
    expect(result.code).toBe(0);
    for (const preset of LIMIT_PRESETS) expect(result.stdout).toContain(preset.id);
  });

  it('writes a preset as a mask file that reads back to the same mask', async () => {
    const result = await run(['limits', '--preset', 'fcc-15.107-class-b-av']);
    expect(result.code).toBe(0);
    const read = readMaskCsv(result.stdout);
    if (!read.ok) throw new Error(read.issues.map((i) => i.message).join('; '));
    const preset = copyPreset('fcc-15.107-class-b-av');
    expect(read.value.mask.frequencyHz).toEqual(preset.frequencyHz);
    expect(read.value.mask.levelDbuV).toEqual(preset.levelDbuV);
    expect(read.value.mask.detector).toBe('average');
  });

  it('writes a design’s own mask', async () => {
    const result = await run(['limits', '--design', DEMO, '--mask', 'class-b-qp']);
    expect(result.code).toBe(0);
    expect(result.stdout).toMatch(/# id: class-b-qp/u);
  });

  it('reports every wrong line of a mask file with its number, exit 2', async () => {
    const result = await run(['limits', '--read', BAD]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/line 9: frequency "abc" is not a number/u);
    expect(result.stderr).toMatch(/line 12: .*must not fall/u);
  });

  it('an unknown preset or mask is refused by name', async () => {
    expect((await run(['limits', '--preset', 'cispr25-class-5'])).stderr).toMatch(/no preset "cispr25-class-5"/u);
    expect((await run(['limits', '--design', DEMO, '--mask', 'nope'])).stderr).toMatch(/has no mask "nope"/u);
  });
});
