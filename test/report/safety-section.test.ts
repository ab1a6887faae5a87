import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { requireDesign } from '../../src/model/read-design.ts';
import { safetySection } from '../../src/report/safety-section.ts';
import { runSafetyChecks } from '../../src/safety/index.ts';

/** The report shows the safety checks' own findings, numbers as printed, without turning a missing input into a pass. */

const withData = requireDesign(JSON.parse(readFileSync(new URL('../../fixtures/safety/adapter-with-safety-data.design.json', import.meta.url), 'utf8')));
const demo = requireDesign(JSON.parse(readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8')));

describe('safety checks in the report', () => {
  it('one row per finding that applies, with its status, figures as printed and its standard', () => {
    const report = runSafetyChecks(withData);
    const section = safetySection(report);
    const findings = report.checks.flatMap((check) => check.findings.filter((f) => f.status !== 'not-applicable'));
    expect(section.checks).toHaveLength(findings.length);
    for (const [i, finding] of findings.entries()) {
      const row = section.checks[i]!;
      expect(row.id).toBe(finding.id);
      expect(row.status).toBe(finding.status === 'not-checked' ? 'not-run' : finding.status);
      expect(row.figures.map((f) => f.value)).toEqual(finding.figures.map((f) => f.text));
    }
    expect(section.conditions).toMatch(/V/u);
    expect(section.notes!.join(' ')).toMatch(/not a certification/u);
  });

  it('a check short of an input says what to give, never passes', () => {
    const section = safetySection(runSafetyChecks(demo));
    const leakage = section.checks.find((row) => row.id.startsWith('leakage'))!;
    expect(leakage.status).toBe('not-run');
    expect(leakage.summary).toMatch(/Give: operating\.supply/u);
    expect(section.checks.some((row) => row.status === 'pass' && row.figures.length === 0)).toBe(false);
  });
});
