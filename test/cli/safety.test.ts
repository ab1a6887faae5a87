import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { SafetyReport } from '../../src/safety/index.ts';
import { type CliRun, runInMemory } from '../support/cli-harness.ts';

/**
 * `chokepoint safety` on the invented fixtures: text and JSON, the exit codes (0 nothing failed and
 * nothing left unchecked, 1 a failure or a missing input, 2 bad input), and options that override
 * the design's choices. The numbers themselves are tested against their sources in test/safety.
 */

const FIXTURE = 'fixtures/safety/adapter-with-safety-data.design.json';
const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const file = (path: string): string => readFileSync(new URL(`../../${path}`, import.meta.url), 'utf8');

async function run(argv: string[]): Promise<CliRun> {
  return runInMemory(argv, { [FIXTURE]: file(FIXTURE), [DEMO]: file(DEMO) });
}

describe('chokepoint safety', () => {
  it('prints every check with its verdict, the cautions and the result; exit 0 when nothing failed', async () => {
    const result = await run(['safety', FIXTURE]);
    expect(result.stderr).toBe('');
    expect(result.code).toBe(0);
    for (const title of ['LEAKAGE (TOUCH) CURRENT', 'X-CAPACITOR DISCHARGE', 'CAPACITOR SAFETY CLASS', 'VOLTAGE STRESS AND RATINGS', 'LINE CURRENT: COPPER LOSS AND CURRENT RATINGS', 'SATURATION AND INDUCTANCE AT FULL LOAD', 'CAUTIONS']) {
      expect(result.stdout).toContain(title);
    }
    expect(result.stdout).toContain('planning aid, not a certification');
    expect(result.stdout).toMatch(/RESULT: PASS, no check failed, \d+ warnings\n$/u);
  });

  it('a stricter limit makes it fail: exit 1 (2 × 2.2 nF at 264 V, 60 Hz, +20 %: 0.263 mA > 0.25 mA)', async () => {
    const result = await run(['safety', FIXTURE, '--leakage-limit', 'iec60335-1-class-ii']);
    expect(result.code).toBe(1);
    expect(result.stdout).toMatch(/RESULT: FAIL/u);
    expect(result.stdout).toContain('from a secondary source');
  });

  it('an entered limit and requirement, as currents and times', async () => {
    const result = await run(['safety', FIXTURE, '--leakage-limit', '0.75mA', '--single-fault-limit', '3.5 mA', '--discharge', '34V@1s', '--json']);
    const report = JSON.parse(result.stdout) as SafetyReport;
    expect(report.choices.leakageLimit).toMatchObject({ normalConditionA: 0.75e-3, singleFaultA: 3.5e-3 });
    expect(report.choices.discharge?.rule).toEqual({ kind: 'residual-voltage', maxVoltageV: 34, afterS: 1 });
    // 34 V after 1 s from 373.35 V needs τ ≤ 0.4175 s; 680 kΩ × 1.378 µF = 0.937 s fails
    expect(report.checks.find((c) => c.id === 'discharge')!.status).toBe('fail');
    expect(result.code).toBe(1);
  });

  it('a design without a supply is incomplete, exit 1, and says what to give; --skip leaves checks out deliberately', async () => {
    const result = await run(['safety', DEMO]);
    expect(result.code).toBe(1);
    expect(result.stdout).toMatch(/give: operating\.supply/u);
    expect(result.stdout).toMatch(/RESULT: INCOMPLETE/u);
    const json = await run(['safety', DEMO, '--skip', 'leakage,discharge,class,voltage,windings,saturation', '--json']);
    const report = JSON.parse(json.stdout) as SafetyReport;
    expect(report.checks.every((c) => c.status === 'skipped')).toBe(true);
    expect(json.code).toBe(0);
  });

  it('writes to a file with --out', async () => {
    const result = await run(['safety', FIXTURE, '--json', '-o', 'safety.json']);
    expect(result.stdout).toBe('');
    expect((JSON.parse(result.written.get('safety.json')!) as SafetyReport).kind).toBe('chokepoint-safety-report');
  });

  it.each([
    [['--leakage-limit', 'class-ii'], /--leakage-limit: "class-ii" is neither a listed limit/u],
    [['--leakage-limit', '0.5 mV'], /--leakage-limit: cannot read "0.5 mV": expected A, got V/u],
    [['--single-fault-limit', '1mA'], /--single-fault-limit needs an entered --leakage-limit/u],
    [['--discharge', 'soon'], /--discharge: "soon" is neither a listed requirement/u],
    [['--tolerance', '120%'], /--tolerance: a capacitor tolerance is a fraction below 1/u],
    [['--tolerance', 'lots'], /--tolerance must be a fraction/u],
    [['--crest-factor', '0.5'], /--crest-factor: a crest factor is at least 1/u],
    [['--skip', 'leakage,colour'], /--skip: "colour" is not a check/u],
  ])('refuses %j with exit 2', async (options, message) => {
    const result = await run(['safety', FIXTURE, ...options]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(message);
  });

  it('the example output in docs/cli.md is what the fixture prints', async () => {
    const doc = file('docs/cli.md');
    const block = /The first example prints, in part:\n\n```text\n([\s\S]*?)```/u.exec(doc)?.[1];
    expect(block).toBeDefined();
    const result = await run(['safety', FIXTURE]);
    const shown = block!.split('\n').filter((line) => line.trim() !== '' && line.trim() !== '…');
    expect(shown.length).toBeGreaterThan(5);
    for (const line of shown) expect(result.stdout).toContain(line.replace(/ …$/u, ''));
  });

  it('the help lists the limits and requirements with their standards', async () => {
    const result = await run(['help', 'safety']);
    expect(result.code).toBe(0);
    expect(result.stdout).toContain('iec60335-1-class-ii');
    expect(result.stdout).toMatch(/IEC\s+60335-1\s+cl\.\s+22\.5/u);
  });
});
