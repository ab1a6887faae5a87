import { describe, expect, it } from 'vitest';
import { readDesign } from '../../src/model/read-design.ts';

/** The `safety` block and the `core` data are validated at the edge, with the field path and a stable code. */

function base(extra: Record<string, unknown>, core?: unknown): Record<string, unknown> {
  return {
    format: 'chokepoint-design',
    version: 2,
    name: 'invented',
    noiseSource: { commonMode: { impedance: { kind: 'resistor', resistance: 50 } }, differentialMode: { impedance: { kind: 'resistor', resistance: 100 } } },
    receivers: { line1: { kind: 'resistive' }, line2: { kind: 'resistive' } },
    stages: [{ id: 's', elements: [{ id: 'L1', placement: 'series-line1', part: { kind: 'inductor', inductance: '1 mH', ...(core === undefined ? {} : { core }) } }] }],
    ...extra,
  };
}

function issues(input: unknown): { path: string; code: string; message: string }[] {
  const read = readDesign(input);
  return read.ok ? [] : read.error.issues.map((i) => ({ path: i.path, code: i.code, message: i.message }));
}

describe('the safety block', () => {
  it('reads every kind of choice, with engineering text in its quantities', () => {
    const read = readDesign(
      base({
        safety: {
          leakageLimit: { kind: 'entered-limit', normalCondition: '0.75 mA', singleFault: '3.5 mA', label: 'ours' },
          discharge: { kind: 'residual-voltage', maxVoltage: '34 V', after: '1 s' },
          externalBleedResistance: '1 Mohm',
          capacitorTolerance: 0.1,
          saturationMargin: 0.25,
          lineCurrentCrestFactor: 2.5,
        },
      }),
    );
    expect(read.ok).toBe(true);
    if (read.ok) {
      expect(read.value.safety?.leakageLimit).toEqual({ kind: 'entered-limit', normalCondition: 0.75e-3, singleFault: 3.5e-3, label: 'ours' });
      expect(read.value.safety?.externalBleedResistance).toBe(1e6);
    }
  });

  it('refuses an unknown listed limit by its path', () => {
    expect(issues(base({ safety: { leakageLimit: { kind: 'listed-limit', id: 'iec99999' } } }))).toEqual([expect.objectContaining({ path: 'safety.leakageLimit.id', code: 'invalid-value' })]);
  });

  it('refuses a tolerance of 1 or more, a crest factor below 1 and a misspelt field', () => {
    expect(issues(base({ safety: { capacitorTolerance: 1 } }))).toEqual([expect.objectContaining({ path: 'safety.capacitorTolerance', code: 'out-of-range' })]);
    expect(issues(base({ safety: { lineCurrentCrestFactor: 0.5 } }))).toEqual([expect.objectContaining({ path: 'safety.lineCurrentCrestFactor', code: 'out-of-range' })]);
    expect(issues(base({ safety: { capacitorTolerence: 0.1 } }))[0]).toMatchObject({ path: 'safety', code: 'unknown-field' });
  });

  it('refuses a discharge requirement without its time', () => {
    expect(issues(base({ safety: { discharge: { kind: 'residual-voltage', maxVoltage: '34 V' } } }))).toEqual([expect.objectContaining({ path: 'safety.discharge.after', code: 'missing-field' })]);
  });
});

describe('core data', () => {
  it('reads on an inductor; turns must be whole', () => {
    expect(readDesign(base({}, { effectiveAreaMm2: 20, turns: 30, saturationFluxDensityTesla: 0.35 })).ok).toBe(true);
    expect(issues(base({}, { turns: 2.5 }))).toEqual([expect.objectContaining({ path: 'stages[0].elements[0].part.core.turns', code: 'wrong-type' })]);
  });

  it('a bias curve needs rising currents and as many ratios', () => {
    expect(issues(base({}, { biasCurve: { currentA: [0, 2, 1], inductanceRatio: [1, 0.9, 0.8] } }))).toEqual([
      expect.objectContaining({ path: 'stages[0].elements[0].part.core.biasCurve.currentA[2]', code: 'invalid-value' }),
    ]);
    expect(issues(base({}, { biasCurve: { currentA: [0, 1], inductanceRatio: [1] } }))[0]).toMatchObject({ path: 'stages[0].elements[0].part.core.biasCurve.inductanceRatio' });
  });

  it('Y4 is a safety class', () => {
    const design = base({});
    (design['stages'] as { elements: unknown[] }[])[0]!.elements.push({ id: 'CY1', placement: 'line1-to-ground', part: { kind: 'capacitor', capacitance: '1n', safetyClass: 'Y4' } });
    expect(readDesign(design).ok).toBe(true);
  });
});
