import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { type CliRun, runInMemory } from '../support/cli-harness.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';
const read = (path: string): string => readFileSync(new URL(`../../${path}`, import.meta.url), 'utf8');
const demoText = read(DEMO);
const scanText = read(SCAN);

async function run(argv: string[], files: Record<string, string> = {}): Promise<CliRun> {
  return runInMemory(argv, { [DEMO]: demoText, [SCAN]: scanText, ...files });
}

interface CheckJson {
  pass: boolean;
  targetMarginDb: number;
  bands: { name: string; pass: boolean | undefined; worst: { marginDb: number; frequencyHz: number } | undefined }[];
  failingRanges: { startHz: number; stopHz: number }[];
  comparisons: { conservative: boolean; mask: string }[];
  notes: string[];
}

describe('chokepoint check: the margin table of the invented demo against its invented scan', () => {
  it('fails in 0.15–0.5 MHz only (a differential-mode resonance near 260 kHz) and exits 1', async () => {
    const result = await run(['check', DEMO, '--scan', SCAN, '--scan-tag', 'line1']);
    expect(result.code).toBe(1);
    expect(result.stdout).toMatch(/0\.15–0\.5 MHz .*BELOW TARGET/u);
    expect(result.stdout).toMatch(/0\.5–5 MHz .*meets target/u);
    expect(result.stdout).toMatch(/5–30 MHz .*meets target/u);
    expect(result.stdout).toMatch(/RESULT: FAIL, 1 band below the 6 dB target/u);
    expect(result.stdout).toMatch(/mode unknown: the filter is credited with the smaller/u);
  });

  it('JSON output: the failing ranges sit in the low band, and a looser target passes', async () => {
    const json = JSON.parse((await run(['check', DEMO, '--scan', SCAN, '--json'])).stdout) as CheckJson;
    expect(json.pass).toBe(false);
    expect(json.bands.map((b) => b.pass)).toEqual([false, true, true]);
    expect(json.failingRanges.every((r) => r.startHz >= 150e3 && r.stopHz <= 500e3)).toBe(true);
    const lowWorst = json.bands[0]!.worst!;
    expect(lowWorst.frequencyHz).toBeGreaterThan(180e3);
    expect(lowWorst.frequencyHz).toBeLessThan(300e3);
    // A looser target is met in the mid and high bands by a wide margin, but not in the low band.
    const loose = JSON.parse((await run(['check', DEMO, '--scan', SCAN, '--json', '--margin', '-20'])).stdout) as CheckJson;
    expect(loose.pass).toBe(true);
  });

  it('limits from presets on the command line; a peak-only scan against QP and AV limits is conservative and says so', async () => {
    const peakOnly = scanText
      .split('\n')
      .map((line) => (line.startsWith('#') || line === '' ? line : line.split(',').slice(0, 2).join(',')))
      .join('\n');
    const result = await run(['check', DEMO, '--scan', 'peak.csv', '--limit', 'fcc-15.107-class-b-qp,fcc-15.107-class-b-av', '--json'], { 'peak.csv': peakOnly });
    const json = JSON.parse(result.stdout) as CheckJson;
    expect(json.comparisons.length).toBe(2);
    expect(json.comparisons.every((c) => c.conservative)).toBe(true);
    expect(json.notes.join(' ')).toMatch(/conservative/u);
  });

  it('the design’s noise estimate stands in for a scan before hardware exists', async () => {
    const result = await run(['check', DEMO, '--estimate']);
    expect(result.code).toBe(1);
    expect(result.stdout).toMatch(/the design’s noise estimate/u);
  });

  it('exits 0 when every band keeps the target', async () => {
    expect((await run(['check', DEMO, '--scan', SCAN, '--margin', '-20'])).code).toBe(0);
  });

  it.each([
    [['check', DEMO], /either --scan <file> or --estimate/u],
    [['check', DEMO, '--scan', 'missing.csv'], /cannot read the scan missing\.csv/u],
    [['check', DEMO, '--scan', SCAN, '--limit', 'no-such-limit'], /neither a preset/u],
    [['check', DEMO, '--scan', SCAN, '--margin', 'lots'], /--margin must be a number/u],
    [['check', DEMO, '--scan', SCAN, '--attribution', 'sideways'], /--attribution must be one of/u],
    [['check', DEMO, '--scan', 'bad.csv'], /bad\.csv/u],
  ])('bad input %j exits 2 naming the problem', async (argv, message) => {
    const result = await run(argv, { 'bad.csv': 'Frequency [MHz],Peak [dBuV]\nabc,def\n' });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(message);
    expect(result.stderr).not.toMatch(/at .*\.ts:\d+/u); // no stack trace
  });

  it('a design with no masks and no --limit is refused with a pointer to both ways', async () => {
    const design = JSON.parse(demoText) as { emissions: { masks: unknown[] } };
    design.emissions.masks = [];
    const result = await run(['check', 'nomask.json', '--scan', SCAN], { 'nomask.json': JSON.stringify(design) });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/--limit .* or add emissions\.masks/u);
  });
});
