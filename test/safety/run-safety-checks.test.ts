import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { DesignInput } from '../../src/model/design.ts';
import { readDesignJson, requireDesign } from '../../src/model/read-design.ts';
import { CONFIRMATION_WORDS, LEAKAGE_LIMITS, DISCHARGE_REQUIREMENTS, largestYCapacitanceForDesign, runSafetyChecks, SAFETY_CHECK_IDS, safetyCheckOptionsSchema, type SafetyReport } from '../../src/safety/index.ts';
import { DISCHARGE_REQUIREMENT_IDS, LEAKAGE_LIMIT_IDS } from '../../src/model/safety-schema.ts';
import { propertySettings } from '../support/property-settings.ts';
import { randomDesign } from '../support/random-designs.ts';
import { MAINS_250_50, safetyDesign, xCap, yCap } from './safety-designs.ts';

/**
 * The entry point as the page's worker, the report and the command line call it: outcome, skipping,
 * the evidence rule (no verdict without a figure, no "not checked" without what to give), plain
 * data, and the lists of limits and requirements with their sources.
 */

function fixture(path: string): DesignInput {
  return JSON.parse(readFileSync(new URL(`../../fixtures/${path}`, import.meta.url), 'utf8')) as DesignInput;
}

function expectEvidence(report: SafetyReport): void {
  for (const check of report.checks) {
    if (check.status === 'skipped') expect(check.findings).toEqual([]);
    for (const f of check.findings) {
      if (f.status === 'pass' || f.status === 'warn' || f.status === 'fail') expect(f.figures.length).toBeGreaterThan(0);
      if (f.status === 'not-checked') expect(f.missing.length).toBeGreaterThan(0);
      for (const fig of f.figures) expect(Number.isNaN(fig.value)).toBe(false);
      expect(f.summary.length).toBeGreaterThan(0);
    }
  }
}

describe('runSafetyChecks', () => {
  it('runs every check on the invented fixture: no failure, warnings with their reasons, the largest Y capacitance, the cautions', () => {
    const read = readDesignJson(readFileSync(new URL('../../fixtures/safety/adapter-with-safety-data.design.json', import.meta.url), 'utf8'));
    if (!read.ok) throw new Error(read.error.message);
    const report = runSafetyChecks(read.value);
    expect(report.checks.map((c) => c.id)).toEqual([...SAFETY_CHECK_IDS]);
    expect(report.outcome).toBe('pass');
    expect(report.counts.fail).toBe(0);
    expect(report.counts['not-checked']).toBe(0);
    expect(report.counts.warn).toBeGreaterThan(0);
    expect(report.largestYCapacitance?.perLineF).toBeGreaterThan(0);
    expect(report.cautions.map((c) => c.id)).toEqual(['planning-aid', 'certified-parts', 'standards-and-codes', 'stored-charge', 'earth-leakage', 'test-network']);
    expectEvidence(report);
  });

  it('is plain data: survives JSON and structured cloning unchanged', () => {
    const report = runSafetyChecks(safetyDesign({ elements: [yCap('CY1', 'line1-to-ground', 2.2e-9), xCap('CX1', 1e-6)], supply: MAINS_250_50 }));
    expect(structuredClone(report)).toEqual(report);
    expect(JSON.parse(JSON.stringify(report))).toEqual(report);
  });

  it('outcome: a failure beats a missing input, which beats a pass; a skipped check does not count', () => {
    // 4.7 nF per line +20 % at 250 V, 50 Hz: 0.443 mA > 0.25 mA (fail); no discharge requirement (not checked)
    const design = safetyDesign({
      elements: [yCap('CY1', 'line1-to-ground', 4.7e-9), yCap('CY2', 'line2-to-ground', 4.7e-9), xCap('CX1', 1e-6)],
      supply: MAINS_250_50,
      safety: { leakageLimit: { kind: 'listed-limit', id: 'iec60335-1-class-ii' } },
    });
    expect(runSafetyChecks(design).outcome).toBe('fail');
    expect(runSafetyChecks(design, { skip: ['leakage'] }).outcome).toBe('incomplete');
    const skipped = runSafetyChecks(design, { skip: ['leakage', 'discharge'] });
    expect(skipped.outcome).toBe('pass');
    expect(skipped.checks.find((c) => c.id === 'discharge')).toMatchObject({ status: 'skipped', findings: [] });
    expect(skipped.counts.fail).toBe(0);
  });

  it('the caller’s choices override the design’s, field by field', () => {
    const design = safetyDesign({ elements: [yCap('CY1', 'line1-to-ground', 2.2e-9)], supply: MAINS_250_50, safety: { leakageLimit: { kind: 'listed-limit', id: 'iec60335-1-class-ii' }, capacitorTolerance: 0.1 } });
    const report = runSafetyChecks(design, { choices: { capacitorTolerance: 0 } });
    expect(report.choices.capacitorTolerance).toEqual({ value: 0, given: true });
    expect(report.choices.leakageLimit?.id).toBe('iec60335-1-class-ii');
    expect(runSafetyChecks(design).choices.capacitorTolerance).toEqual({ value: 0.1, given: true });
    expect(runSafetyChecks(safetyDesign({ elements: [], supply: MAINS_250_50 })).choices.capacitorTolerance).toEqual({ value: 0.2, given: false });
  });

  it('gives the sizing assistant the largest Y capacitance, or what is missing (0.75 mA, IEC 60335-1 cl. 13.2 class I portable, 250 V 50 Hz: 9.5493 nF per line)', () => {
    const design = safetyDesign({ elements: [], supply: MAINS_250_50, safety: { leakageLimit: { kind: 'listed-limit', id: 'iec60335-1-class-i-portable' }, capacitorTolerance: 0 } });
    const largest = largestYCapacitanceForDesign(design);
    expect(largest.ok && largest.value.perLineF).toBeCloseTo(9.5493e-9, 13);
    expect(largestYCapacitanceForDesign(safetyDesign({ elements: [], supply: MAINS_250_50 }))).toEqual({ ok: false, missing: 'safety.leakageLimit' });
    expect(largestYCapacitanceForDesign(safetyDesign({ elements: [] }))).toEqual({ ok: false, missing: 'operating.supply' });
  });

  it('the options schema validates what a worker receives', () => {
    expect(safetyCheckOptionsSchema.safeParse({ skip: ['leakage'], choices: { capacitorTolerance: 0.1 } }).success).toBe(true);
    expect(safetyCheckOptionsSchema.safeParse({ skip: ['everything'] }).success).toBe(false);
    expect(safetyCheckOptionsSchema.safeParse({ choices: { capacitorTolerance: 2 } }).success).toBe(false);
  });

  it('a DC input shows only the planning-aid caution; mains and an unknown supply show them all', () => {
    expect(runSafetyChecks(safetyDesign({ elements: [], supply: { kind: 'dc', highestVoltage: 12 } })).cautions.map((c) => c.id)).toEqual(['planning-aid']);
    expect(runSafetyChecks(safetyDesign({ elements: [] })).cautions.length).toBe(6);
  });

  it('on random designs with random operating conditions, never throws and keeps the evidence rule', () => {
    const operating = fc.record({
      supply: fc.oneof(
        fc.record({ kind: fc.constant('ac-mains' as const), highestVoltage: fc.double({ min: 1, max: 1000, noNaN: true }), highestFrequencyHz: fc.double({ min: 1, max: 1000, noNaN: true }) }),
        fc.record({ kind: fc.constant('dc' as const), highestVoltage: fc.double({ min: 1, max: 1000, noNaN: true }) }),
      ),
      lineCurrent: fc.double({ min: 0.001, max: 100, noNaN: true }),
    });
    const safety = fc.record(
      {
        leakageLimit: fc.constantFrom(...LEAKAGE_LIMIT_IDS).map((id) => ({ kind: 'listed-limit' as const, id })),
        discharge: fc.constantFrom(...DISCHARGE_REQUIREMENT_IDS).map((id) => ({ kind: 'listed-requirement' as const, id })),
        capacitorTolerance: fc.double({ min: 0, max: 0.5, noNaN: true }),
      },
      { requiredKeys: [] },
    );
    fc.assert(
      fc.property(randomDesign, fc.option(operating, { nil: undefined }), safety, (input, op, choices) => {
        const design = requireDesign({ ...input, ...(op ? { operating: op } : {}), safety: choices });
        expectEvidence(runSafetyChecks(design));
      }),
      propertySettings(60),
    );
  });
});

describe('the lists of limits and requirements', () => {
  it('hold exactly the ids the design format accepts', () => {
    expect(LEAKAGE_LIMITS.map((l) => l.id)).toEqual([...LEAKAGE_LIMIT_IDS]);
    expect(DISCHARGE_REQUIREMENTS.map((r) => r.id)).toEqual([...DISCHARGE_REQUIREMENT_IDS]);
  });

  it('name a standard and a clause for every value, and say how sure it is in plain words', () => {
    for (const l of [...LEAKAGE_LIMITS.map((x) => x.source), ...DISCHARGE_REQUIREMENTS.map((x) => x.source!)]) {
      expect(l.standard).toMatch(/^IEC \d/u);
      expect(l.clause.length).toBeGreaterThan(0);
      expect(l.confirmationText).toBe(CONFIRMATION_WORDS[l.confirmation]);
    }
  });

  it('carry the values of references.md §9 with its confidence (IEC 60335-1 cl. 13.2, IEC 60950-1 Table 5A, IEC 60601-1: secondary sources; IEC 62368-1: from memory)', () => {
    const byId = new Map(LEAKAGE_LIMITS.map((l) => [l.id, l]));
    const mA = 1e-3;
    const expected: [string, number, number | undefined, string][] = [
      ['iec60335-1-class-ii', 0.25, undefined, 'secondary-source'],
      ['iec60335-1-class-0-0i-iii', 0.5, undefined, 'secondary-source'],
      ['iec60335-1-class-i-portable', 0.75, undefined, 'secondary-source'],
      ['iec60335-1-class-i-stationary-motor', 3.5, undefined, 'secondary-source'],
      ['iec60335-1-class-i-stationary-heating', 0.75, undefined, 'secondary-source'],
      ['iec60950-1-not-earthed', 0.25, undefined, 'secondary-source'],
      ['iec60950-1-class-i-hand-held', 0.75, undefined, 'secondary-source'],
      ['iec60950-1-class-i-pluggable-a', 3.5, undefined, 'secondary-source'],
      ['iec62368-1-class-i-pluggable-a', 3.5, undefined, 'not-confirmed'],
      ['iec62368-1-es1', 0.5, undefined, 'not-confirmed'],
      ['iec60601-1-touch', 0.1, 0.5, 'secondary-source'],
      ['iec60601-1-earth-2nd-edition', 0.5, 1, 'secondary-source'],
      ['iec60601-1-2005-earth', 5, 10, 'not-confirmed'],
    ];
    for (const [id, normal, fault, confirmation] of expected) {
      const l = byId.get(id as (typeof LEAKAGE_LIMIT_IDS)[number])!;
      expect(l.normalConditionA).toBeCloseTo(normal * mA, 15);
      if (fault === undefined) expect(l.singleFaultA).toBeUndefined();
      else expect(l.singleFaultA).toBeCloseTo(fault * mA, 15);
      expect(l.source.confirmation).toBe(confirmation);
    }
  });

  it('fixture: the design file with safety data reads', () => {
    expect(() => requireDesign(fixture('safety/adapter-with-safety-data.design.json'))).not.toThrow();
  });
});
