import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readDesign, readDesignJson } from '../../src/model/read-design.ts';
import type { ValidationIssue } from '../../src/model/validation-error.ts';

const demoText = readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8');
const demo = (): Record<string, unknown> => JSON.parse(demoText) as Record<string, unknown>;

/** The demo design with one change made by `edit`, validated; returns the issues. */
function issuesAfter(edit: (design: DemoShape) => void): readonly ValidationIssue[] {
  const design = demo() as unknown as DemoShape;
  edit(design);
  const result = readDesign(design);
  if (result.ok) throw new Error('expected the edited design to be rejected');
  return result.error.issues;
}

interface DemoShape {
  version: unknown;
  name: unknown;
  frequencyPlan: Record<string, unknown>;
  stages: { id: unknown; elements: { id: unknown; placement: unknown; part: Record<string, unknown> }[] }[];
  [key: string]: unknown;
}

function expectIssue(issues: readonly ValidationIssue[], path: string, code: string, message?: RegExp): void {
  const match = issues.find((issue) => issue.path === path);
  expect(match, `no issue at ${path}; got ${JSON.stringify(issues)}`).toBeDefined();
  expect(match!.code).toBe(code);
  if (message) expect(match!.message).toMatch(message);
}

describe('a valid design', () => {
  it('reads the invented demo, turning engineering text into SI numbers', () => {
    const result = readDesignJson(demoText);
    if (!result.ok) throw result.error;
    const design = result.value;
    expect(design.frequencyPlan.startHz).toBe(9e3);
    expect(design.frequencyPlan.stopHz).toBe(30e6);
    const cx1 = design.stages[0]!.elements[0]!.part;
    expect(cx1.kind).toBe('capacitor');
    if (cx1.kind !== 'capacitor') return;
    expect(cx1.capacitance).toBeCloseTo(100e-9, 20);
    expect(cx1.esl).toBeCloseTo(10e-9, 20);
    expect(cx1.safetyClass).toBe('X2');
  });

  it('fills parasitics that are left out with zero and enables elements by default', () => {
    const design = demo() as unknown as DemoShape;
    design.stages[0]!.elements[0]!.part = { kind: 'capacitor', capacitance: '1u' };
    const result = readDesign(design);
    if (!result.ok) throw result.error;
    const element = result.value.stages[0]!.elements[0]!;
    expect(element.enabled).toBe(true);
    expect(element.part).toMatchObject({ kind: 'capacitor', capacitance: 1e-6, esr: 0, esl: 0, safetyClass: 'none' });
  });
});

describe('bad input gets an error naming the field, never a crash', () => {
  it('unit text that means nothing: "4.7 q"', () => {
    const issues = issuesAfter((d) => {
      d.stages[0]!.elements[0]!.part['capacitance'] = '4.7 q';
    });
    expectIssue(issues, 'stages[0].elements[0].part.capacitance', 'bad-quantity', /unknown unit/);
  });

  it('a required choice left out is "missing", not "got undefined" (found by the input fuzzing)', () => {
    const issues = issuesAfter((d) => {
      delete (d.stages[0]!.elements[0] as { placement?: unknown }).placement;
    });
    expectIssue(issues, 'stages[0].elements[0].placement', 'missing-field', /^missing: expected one of "series-line1", /u);
  });

  it('a capacitance written in henries', () => {
    const issues = issuesAfter((d) => {
      d.stages[0]!.elements[0]!.part['capacitance'] = '4.7 mH';
    });
    expectIssue(issues, 'stages[0].elements[0].part.capacitance', 'bad-quantity', /expected F/);
  });

  it.each([
    [0, 'out-of-range'],
    [-1e-9, 'out-of-range'],
    [Number.NaN, 'not-finite'],
    [Number.POSITIVE_INFINITY, 'not-finite'],
    [null, 'wrong-type'],
    [true, 'wrong-type'],
  ])('capacitance %s is rejected (%s)', (bad, code) => {
    const issues = issuesAfter((d) => {
      d.stages[0]!.elements[0]!.part['capacitance'] = bad;
    });
    expectIssue(issues, 'stages[0].elements[0].part.capacitance', code);
  });

  it('a negative parasitic', () => {
    const issues = issuesAfter((d) => {
      d.stages[0]!.elements[1]!.part['esl'] = '-5 nH';
    });
    expectIssue(issues, 'stages[0].elements[1].part.esl', 'out-of-range');
  });

  it('a missing required field', () => {
    const issues = issuesAfter((d) => {
      delete d.stages[0]!.elements[0]!.part['capacitance'];
    });
    expectIssue(issues, 'stages[0].elements[0].part.capacitance', 'missing-field');
  });

  it('an unknown element kind lists the known ones', () => {
    const issues = issuesAfter((d) => {
      d.stages[0]!.elements[0]!.part = { kind: 'flux-capacitor', capacitance: 1 };
    });
    expectIssue(issues, 'stages[0].elements[0].part.kind', 'unknown-kind', /"flux-capacitor".*capacitor/);
  });

  it('a misspelt field is not silently ignored', () => {
    const issues = issuesAfter((d) => {
      d.stages[0]!.elements[0]!.part['capacitence'] = '1u';
    });
    expectIssue(issues, 'stages[0].elements[0].part', 'unknown-field', /capacitence/);
  });

  it('start above stop', () => {
    const issues = issuesAfter((d) => {
      d.frequencyPlan['startHz'] = '30 MHz';
      d.frequencyPlan['stopHz'] = '150 kHz';
    });
    expectIssue(issues, 'frequencyPlan.stopHz', 'invalid-value', /must be above start/);
  });

  it('more than a million points', () => {
    const issues = issuesAfter((d) => {
      // 12 decades at 90 000 per decade: each value allowed, the product is not.
      d.frequencyPlan['startHz'] = 1;
      d.frequencyPlan['stopHz'] = '1 THz';
      d.frequencyPlan['pointsPerDecade'] = 90_000;
    });
    expectIssue(issues, 'frequencyPlan.pointsPerDecade', 'out-of-range', /at most 1000000/);
  });

  it('a fractional number of points per decade', () => {
    const issues = issuesAfter((d) => {
      d.frequencyPlan['pointsPerDecade'] = 20.5;
    });
    expectIssue(issues, 'frequencyPlan.pointsPerDecade', 'wrong-type');
  });

  it('a coupling factor of 1 is accepted (ideal coupling), above 1 is not', () => {
    const ok = demo() as unknown as DemoShape;
    ok.stages[1]!.elements[1]!.part['coupling'] = { kind: 'coupling-factor', couplingFactor: 1 };
    expect(readDesign(ok).ok).toBe(true);
    const issues = issuesAfter((d) => {
      d.stages[1]!.elements[1]!.part['coupling'] = { kind: 'coupling-factor', couplingFactor: 1.01 };
    });
    expectIssue(issues, 'stages[1].elements[1].part.coupling.couplingFactor', 'out-of-range');
  });

  it('leakage inductance not below the winding inductance', () => {
    const issues = issuesAfter((d) => {
      d.stages[0]!.elements[3]!.part['coupling'] = { kind: 'leakage-inductance', leakageInductance: '2.2 mH' };
    });
    expectIssue(issues, 'stages[0].elements[3].part.coupling.leakageInductance', 'invalid-value');
  });

  it('a choke placed in one line only', () => {
    const issues = issuesAfter((d) => {
      d.stages[0]!.elements[3]!.placement = 'series-line1';
    });
    expectIssue(issues, 'stages[0].elements[3].placement', 'invalid-value', /both-lines-coupled/);
  });

  it('duplicate element ids', () => {
    const issues = issuesAfter((d) => {
      d.stages[1]!.elements[0]!.id = 'CX1';
    });
    expectIssue(issues, 'stages[1].elements[0].id', 'duplicate-id', /stages\[0\]\.elements\[0\]/);
  });

  it('a newer version is refused by name, not misread', () => {
    const issues = issuesAfter((d) => {
      d.version = 7;
    });
    expectIssue(issues, 'version', 'unsupported-version', /newer/);
  });

  it('something that is not a design at all', () => {
    for (const input of [null, 42, 'text', [], {}]) {
      const result = readDesign(input);
      expect(result.ok).toBe(false);
      if (!result.ok) expect(result.error.issues[0]!.code).toBe('not-a-design');
    }
  });

  it('text that is not JSON', () => {
    const result = readDesignJson('{"format": "chokepoint-design", ');
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error.issues[0]).toMatchObject({ code: 'bad-json', path: '' });
  });

  it('the error message itself names the path', () => {
    const result = readDesign({ ...demo(), name: '' });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error.message).toMatch(/^invalid design: name: /);
  });
});
