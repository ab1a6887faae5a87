import { describe, expect, it } from 'vitest';
import demoJson from '../../fixtures/demo/adapter-two-stage.design.json';
import { readDate } from '../../src/cli/commands/report.ts';
import { readScanText } from '../../src/io/scan-csv.ts';
import { requireDesign } from '../../src/model/index.ts';
import { makeReport } from '../../src/report/index.ts';
import { type CliRun, repoFile, runInMemory } from '../support/cli-harness.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';
const files = { [DEMO]: repoFile(DEMO), [SCAN]: repoFile(SCAN) };
const run = (argv: string[]): Promise<CliRun> => runInMemory(argv, files);

describe('chokepoint report', () => {
  it('writes the same page the page’s worker makes from the same design, scan and date', async () => {
    const result = await run(['report', DEMO, '--scan', SCAN, '--out', 'report.html', '--date', '2026-12-04']);
    expect(result.code).toBe(0);
    expect(result.stderr).toMatch(/wrote report\.html: below the target in some band; design hash [0-9a-f]{12}…/u);
    const read = readScanText(repoFile(SCAN), { name: 'invented-adapter-no-filter.csv' });
    if (!read.ok) throw new Error('scan');
    const direct = makeReport({
      design: requireDesign(demoJson),
      noise: { kind: 'scan', scan: read.scan },
      analysisOptions: {},
      origin: { program: 'chokepoint', version: 'test', generatedAt: '2026-12-04', designFile: 'adapter-two-stage.design.json', scanFile: 'invented-adapter-no-filter.csv' },
    });
    expect(result.written.get('report.html')).toBe(direct.html);
  });

  it('writes every CSV file beside the page with --csv', async () => {
    const result = await run(['report', DEMO, '--estimate', '--limit', 'cispr32-class-b-qp,cispr32-class-b-av', '-o', 'e.html', '--csv', 'out/e', '--date', '2026-12-04']);
    expect(result.code).toBe(0);
    const names = [...result.written.keys()];
    expect(names).toContain('e.html');
    expect(names).toEqual(expect.arrayContaining(['out/e-design-parts.csv', 'out/e-margin-bands.csv', 'out/e-curves-insertion-loss.csv', 'out/e-curves-emissions.csv']));
    expect(result.written.get('out/e-margin-bands.csv')?.split('\n')[0]).toBe('band,worst_margin_dB,at_Hz,level_dBuV,limit_dBuV,limit,trace,verdict,conservative,limited_by,why,cm_needed_dB,dm_needed_dB');
    expect(result.written.get('e.html')).toContain('CISPR 32 / EN 55032 class B');
  });

  it('writes a report with no verdict for a design without limits, and says why', async () => {
    const bare = JSON.stringify({ ...demoJson, emissions: undefined });
    const result = await runInMemory(['report', 'bare.json', '-o', 'r.html', '--date', '2026-12-04'], { 'bare.json': bare });
    expect(result.code).toBe(0);
    expect(result.stderr).toContain('not judged (no limit mask');
    expect(result.written.get('r.html')).toContain('Not judged: no limit mask');
  });

  it('refuses bad input with exit code 2 and a message that names it', async () => {
    expect((await run(['report', DEMO])).stderr).toContain('give --out <file>');
    expect((await run(['report', DEMO, '-o', 'x.html', '--scan', SCAN, '--estimate'])).code).toBe(2);
    const badDate = await run(['report', DEMO, '-o', 'x.html', '--date', 'yesterday']);
    expect(badDate.code).toBe(2);
    expect(badDate.stderr).toContain('--date must be a date such as 2026-12-04');
    const badLimit = await run(['report', DEMO, '-o', 'x.html', '--limit', 'no-such-preset']);
    expect(badLimit.code).toBe(2);
    expect(badLimit.stderr).toContain('neither a preset');
    expect((await run(['report', 'missing.json', '-o', 'x.html'])).stderr).toContain('cannot read the design missing.json: no such file');
  });

  it('is listed in the help with its options', async () => {
    const help = await run(['help', 'report']);
    expect(help.stdout).toContain('Usage: chokepoint report <design.json> [options]');
    expect(help.stdout).toContain('--csv <prefix>');
    expect((await run(['--help'])).stdout).toMatch(/\n {2}report +write the hand-over report/u);
  });

  it('prints the date as given, or now in UTC to the minute', () => {
    expect(readDate('2026-12-04T09:30:00Z')).toBe('2026-12-04T09:30:00Z');
    expect(readDate(undefined, new Date(Date.UTC(2026, 11, 4, 9, 5, 59)))).toBe('2026-12-04 09:05 UTC');
    expect(() => readDate('2026-13-45')).toThrow('--date');
  });
});
