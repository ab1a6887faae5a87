import { describe, expect, it } from 'vitest';
import { largestYCapacitance, leakageCases, runSafetyChecks } from '../../src/safety/index.ts';
import { expectRelative, finding, MAINS_250_50, MAINS_264_60, safetyDesign, value, xCap, yCap } from './safety-designs.ts';

/**
 * The leakage check on invented designs. The currents are I = 2π·f·C·V (references.md §9, check case
 * C13 of domain.md §6: 4.7 nF at 250 V, 50 Hz carries 0.369137 mA); the limits are IEC 60335-1
 * cl. 13.2 and IEC 60950-1 Table 5A (secondary sources) and IEC 60601-1 (secondary source), as the
 * program lists them. Which capacitance each condition sees is worked out in leakage-cases.ts.
 */

const nF = 1e-9;
const mA = 1e-3;
const CLASS_II_60335 = { kind: 'listed-limit', id: 'iec60335-1-class-ii' } as const;

describe('which capacitance each condition sees', () => {
  it('normal condition: the live line’s own; one conductor open: both lines’ (C13: 4.7 nF at 250 V, 50 Hz is 0.369137 mA)', () => {
    const cases = leakageCases({ line1F: 4.7 * nF, line2F: 2.2 * nF, acrossF: 0 }, 250, 50, 0);
    expectRelative(cases.line1LiveA, 0.369137 * mA, 1e-5);
    expectRelative(cases.line2LiveA, 0.172788 * mA, 1e-5);
    expectRelative(cases.normalA, 0.369137 * mA, 1e-5);
    expectRelative(cases.openConductorA, (0.369137 + 0.172788) * mA, 1e-5);
  });

  it('one conductor open with the load not conducting: the floating line’s capacitor in series with the X capacitors', () => {
    // line 1 live: 4.7 nF + (2.2 nF in series with 100 nF) = 4.7 + 2.152641 nF
    const cases = leakageCases({ line1F: 4.7 * nF, line2F: 2.2 * nF, acrossF: 100 * nF }, 250, 50, 0);
    const seriesNf = (2.2 * 100) / (2.2 + 100);
    expectRelative(cases.openConductorLoadOpenA, 2 * Math.PI * 50 * (4.7 + seriesNf) * nF * 250, 1e-12);
    expect(cases.openConductorLoadOpenA).toBeLessThan(cases.openConductorA);
  });
});

describe('the largest Y capacitance within a limit', () => {
  it('0.25 mA (IEC 60335-1 cl. 13.2, class II) at 250 V, 50 Hz: 3.1831 nF per line and, with no single-fault limit, 3.1831 nF in total', () => {
    const largest = largestYCapacitance({ normalConditionA: 0.25 * mA }, 250, 50, 0);
    expectRelative(largest.perLineF, 3.1831 * nF, 1e-5);
    expectRelative(largest.totalF, 3.1831 * nF, 1e-5);
    expect(largest.governedBy).toBe('single-fault');
    expect(largest.singleFaultLimitFromNormal).toBe(true);
  });

  it('0.1 mA normal / 0.5 mA single fault (IEC 60601-1 touch current, secondary source): the normal condition sets the total, 2 × per line', () => {
    const largest = largestYCapacitance({ normalConditionA: 0.1 * mA, singleFaultA: 0.5 * mA }, 250, 50, 0);
    expectRelative(largest.perLineF, (0.1 * mA) / (2 * Math.PI * 50 * 250), 1e-12);
    expectRelative(largest.totalF, 2 * largest.perLineF, 1e-12);
    expect(largest.governedBy).toBe('normal-condition');
  });

  it('C13: 0.25 mA at 264 V, 60 Hz with +20 % allows 2.09 nF per line', () => {
    expectRelative(largestYCapacitance({ normalConditionA: 0.25 * mA }, 264, 60, 0.2).perLineF, 2.09 * nF, 2e-3);
  });
});

describe('the leakage check on a design', () => {
  const twoY = (c: number) => [yCap('CY1', 'line1-to-ground', c), yCap('CY2', 'line2-to-ground', c), xCap('CX1', 100 * nF)];

  it('passes in normal condition within 0.25 mA, warns with a conductor open when the list gives no single-fault limit', () => {
    const report = runSafetyChecks(safetyDesign({ elements: twoY(2.2 * nF), supply: MAINS_250_50, safety: { leakageLimit: CLASS_II_60335, capacitorTolerance: 0 } }));
    const normal = finding(report, 'leakage.normal');
    expect(normal.status).toBe('pass');
    expectRelative(value(normal, 'leakage current, line 1 live'), 0.172788 * mA, 1e-5);
    expect(normal.summary).toContain('from a secondary source: check it against the standard before relying on it');
    expect(normal.summary).toContain('IEC 60335-1');
    expect(normal.summary).toContain('cl. 13.2');
    const fault = finding(report, 'leakage.single-fault');
    expectRelative(value(fault, 'leakage current, one supply conductor open'), 2 * 0.172788 * mA, 1e-5);
    expect(fault.status).toBe('warn');
    expect(fault.summary).toMatch(/no single-fault limit/u);
  });

  it('fails when the live line’s capacitance exceeds the limit, with the tolerance applied (4.7 nF +20 % at 250 V, 50 Hz: 0.443 mA > 0.25 mA)', () => {
    const report = runSafetyChecks(safetyDesign({ elements: twoY(4.7 * nF), supply: MAINS_250_50, safety: { leakageLimit: CLASS_II_60335 } }));
    const normal = finding(report, 'leakage.normal');
    expect(normal.status).toBe('fail');
    expectRelative(value(normal, 'leakage current, line 1 live'), 1.2 * 0.369137 * mA, 1e-5);
    expect(report.outcome).toBe('fail');
  });

  it('judges the single fault against a single-fault limit when the list has one (IEC 60601-1 touch current 0.1 / 0.5 mA)', () => {
    // 1 nF per line at 264 V, 60 Hz, +20 %: 0.1194 mA normal (> 0.1 mA), 0.2389 mA with a conductor open (< 0.5 mA)
    const report = runSafetyChecks(safetyDesign({ elements: twoY(1 * nF), supply: MAINS_264_60, safety: { leakageLimit: { kind: 'listed-limit', id: 'iec60601-1-touch' } } }));
    expect(finding(report, 'leakage.normal').status).toBe('fail');
    const fault = finding(report, 'leakage.single-fault');
    expect(fault.status).toBe('pass');
    expect(value(fault, 'limit, single fault')).toBeCloseTo(0.5 * mA, 12);
  });

  it('an entered limit says it is the user’s value; a single-fault value above it is a fail', () => {
    const report = runSafetyChecks(
      safetyDesign({ elements: twoY(2.2 * nF), supply: MAINS_250_50, safety: { leakageLimit: { kind: 'entered-limit', normalCondition: '0.3 mA', singleFault: '0.3 mA', label: 'from our standard' }, capacitorTolerance: 0 } }),
    );
    expect(finding(report, 'leakage.normal').status).toBe('pass');
    expect(finding(report, 'leakage.normal').summary).toContain('the value you entered');
    expect(finding(report, 'leakage.single-fault').status).toBe('fail');
  });

  it('a limit that is not confirmed says so in plain words, never by a code', () => {
    const report = runSafetyChecks(safetyDesign({ elements: twoY(2.2 * nF), supply: MAINS_264_60, safety: { leakageLimit: { kind: 'listed-limit', id: 'iec62368-1-es1' } } }));
    const normal = finding(report, 'leakage.normal');
    expect(normal.summary).toContain('not confirmed');
    const text = JSON.stringify(report.checks.map((c) => [c.summary, c.findings.map((f) => f.summary), c.assumptions]));
    expect(text).not.toMatch(/\b(V2|CP)\b|status [VMC]\b/u);
  });

  it('without a limit the currents are shown but the check is not checked, naming safety.leakageLimit', () => {
    const report = runSafetyChecks(safetyDesign({ elements: twoY(2.2 * nF), supply: MAINS_250_50 }));
    const normal = finding(report, 'leakage.normal');
    expect(normal.status).toBe('not-checked');
    expect(normal.status === 'not-checked' && normal.missing).toEqual(['safety.leakageLimit']);
    expect(value(normal, 'leakage current, line 1 live')).toBeGreaterThan(0);
    expect(report.outcome).toBe('incomplete');
    expect(report.largestYCapacitance).toBeUndefined();
  });

  it('without a supply it is not checked, naming operating.supply; on a DC input it does not apply', () => {
    expect(finding(runSafetyChecks(safetyDesign({ elements: twoY(2.2 * nF), safety: { leakageLimit: CLASS_II_60335 } })), 'leakage.normal')).toMatchObject({ status: 'not-checked', missing: ['operating.supply'] });
    expect(finding(runSafetyChecks(safetyDesign({ elements: twoY(2.2 * nF), supply: { kind: 'dc', highestVoltage: 48 } })), 'leakage.normal').status).toBe('not-applicable');
  });

  it('a resistor from a line to ground fails with its mains current; a disabled Y capacitor is not counted; a measured part is not checked', () => {
    const report = runSafetyChecks(
      safetyDesign({
        elements: [
          yCap('CY1', 'line1-to-ground', 2.2 * nF),
          { ...yCap('CY9', 'line1-to-ground', 100 * nF), enabled: false },
          { id: 'R1', placement: 'line2-to-ground', part: { kind: 'resistor', resistance: '1 Mohm' } },
          { id: 'M1', placement: 'line2-to-ground', part: { kind: 'measured', table: { frequencyHz: [1e5, 1e6], magnitudeOhm: [100, 10], phaseDeg: [-90, -90] } } },
        ],
        supply: MAINS_250_50,
        safety: { leakageLimit: CLASS_II_60335, capacitorTolerance: 0 },
      }),
    );
    const r1 = finding(report, 'leakage.R1');
    expect(r1.status).toBe('fail');
    expectRelative(value(r1, 'current to ground'), 250 / 1e6, 1e-12);
    expectRelative(value(finding(report, 'leakage.normal'), 'capacitance from line 1 to ground'), 2.2 * nF, 1e-12);
    expect(finding(report, 'leakage.M1').status).toBe('not-checked');
    expect(report.checks.find((c) => c.id === 'leakage')!.assumptions.join(' ')).toContain('Disabled and not counted: CY9');
  });

  it('reports the largest Y capacitance for the sizing assistant', () => {
    const report = runSafetyChecks(safetyDesign({ elements: twoY(2.2 * nF), supply: MAINS_250_50, safety: { leakageLimit: CLASS_II_60335, capacitorTolerance: 0 } }));
    expectRelative(report.largestYCapacitance!.perLineF, 3.1831 * nF, 1e-5);
  });
});
