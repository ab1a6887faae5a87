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
    [['check', DEMO, '--scan', SCAN, '--margin', 'lots'], /--margin must be a plain decimal number/u],
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

interface EvidenceJson {
  pass: boolean;
  verdict: { status: string; judgedPoints: number; reasons: string[] };
  bands: { name: string; status: string; judgedPoints: number; coveredFromHz?: number; coveredToHz?: number; reason: string }[];
  scanWarnings?: string[];
}

// Limits: the demo design's CISPR 32 class B masks (docs/limits.md gives their source).
describe('chokepoint check: no verdict without evidence', () => {
  // The demo design's noise floor is 20 dBµV: the levels below sit above it, so they carry a margin.
  it('a headerless scan written in MHz is read as Hz: no result (exit 2), saying why and printing the reader’s warning', async () => {
    const mhz = '0.15,90\n0.5,80\n5,75\n30,70\n';
    const result = await run(['check', DEMO, '--scan', 'mhz.csv'], { 'mhz.csv': mhz });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr).toMatch(/chokepoint: warning: mhz\.csv: check the frequency unit/u);
    expect(result.stderr).toMatch(/no result: the scan mhz\.csv gives no evidence to judge/u);
    expect(result.stderr).toMatch(/the scan spans 150 mHz to 30 Hz, the bands span 150 kHz to 30 MHz; is the frequency unit right/u);
    expect(result.stderr).not.toMatch(/PASS/u);
    // Told the unit, the same file is judged (and fails: 90 dBµV is far over class B).
    const told = await run(['check', DEMO, '--scan', 'mhz.csv', '--frequency-unit', 'MHz', '--json'], { 'mhz.csv': mhz });
    expect(told.code).toBe(1);
    expect((JSON.parse(told.stdout) as EvidenceJson).verdict.status).toBe('fail');
  });

  it('a one-row scan passes no band it never touched: every band not covered, exit 1', async () => {
    const result = await run(['check', DEMO, '--scan', 'one.csv'], { 'one.csv': 'Frequency [MHz],Peak [dBuV]\n0.2,30\n' });
    expect(result.code).toBe(1);
    expect(result.stdout).toMatch(/0\.5–5 MHz .*NOT COVERED/u);
    expect(result.stdout).toMatch(/not covered: the scan has no point in this band/u);
    expect(result.stdout).toMatch(/RESULT: FAIL, 3 bands not covered \(1 judged point\)/u);
    expect(result.stdout).not.toMatch(/RESULT: PASS/u);
  });

  it('a scan covering only the 0.15–0.5 MHz band: that band passes, the result fails with the others not covered (JSON)', async () => {
    const rows = Array.from({ length: 36 }, (_, i) => `${(0.15 * (0.5 / 0.15) ** (i / 35)).toFixed(6)},30`);
    const result = await run(['check', DEMO, '--scan', 'low.csv', '--json'], { 'low.csv': `Frequency [MHz],Peak [dBuV]\n${rows.join('\n')}\n` });
    expect(result.code).toBe(1);
    const json = JSON.parse(result.stdout) as EvidenceJson;
    expect(json.bands.map((b) => b.status)).toEqual(['pass', 'not-covered', 'not-covered']);
    expect(json.bands[0]).toMatchObject({ judgedPoints: 36, coveredFromHz: 150e3, coveredToHz: 500e3 });
    expect(json.verdict).toMatchObject({ status: 'fail', judgedPoints: 36 });
    expect(json.pass).toBe(false);
  });

  it('an estimate covers the bands its harmonics were worked out for: a plan that stops at 3 MHz leaves 5–30 MHz not covered', async () => {
    const design = JSON.parse(demoText) as { frequencyPlan: { stopHz: unknown } };
    const full = JSON.parse((await run(['check', DEMO, '--estimate', '--json', '--margin', '-40'])).stdout) as EvidenceJson;
    expect(full.bands.every((b) => b.status === 'pass' && b.judgedPoints > 0)).toBe(true);
    design.frequencyPlan.stopHz = 3e6;
    const short = await run(['check', 'short.json', '--estimate', '--json', '--margin', '-40'], { 'short.json': JSON.stringify(design) });
    expect(short.code).toBe(1);
    const json = JSON.parse(short.stdout) as EvidenceJson;
    expect(json.bands.map((b) => b.status)).toEqual(['pass', 'not-covered', 'not-covered']);
    expect(json.bands[1]!.reason).toMatch(/worked out only up to 3 MHz/u);
    expect(json.bands[2]!.reason).toBe('the estimate has no spectral line in this band');
  });

  it('a mask that covers no band: nothing judged, exit 2', async () => {
    const mask = '# INVENTED mask above the conducted bands\n# detector: quasi-peak\n40000000,60\n100000000,60\n';
    const result = await run(['check', DEMO, '--scan', SCAN, '--limit', 'high.csv'], { 'high.csv': mask });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr).toMatch(/no limit line applies in this band/u);
  });
});
