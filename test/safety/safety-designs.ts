import type { Design, DesignInput } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import type { SafetyFinding, SafetyReport } from '../../src/safety/index.ts';

type ElementInput = DesignInput['stages'][number]['elements'][number];

/** A validated design with the given elements (one stage), supply, line current and safety block; everything invented. */
export function safetyDesign(options: {
  elements: ElementInput[];
  supply?: NonNullable<DesignInput['operating']>['supply'];
  lineCurrent?: number | string;
  safety?: DesignInput['safety'];
}): Design {
  return requireDesign({
    format: 'chokepoint-design',
    version: 2,
    name: 'invented safety test design',
    noiseSource: {
      commonMode: { impedance: { kind: 'capacitor', capacitance: 100e-12 } },
      differentialMode: { impedance: { kind: 'capacitor', capacitance: 100e-6 } },
    },
    receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } },
    stages: [{ id: 'stage1', elements: options.elements }],
    ...(options.supply || options.lineCurrent !== undefined
      ? { operating: { ...(options.supply ? { supply: options.supply } : {}), ...(options.lineCurrent === undefined ? {} : { lineCurrent: options.lineCurrent }) } }
      : {}),
    ...(options.safety ? { safety: options.safety } : {}),
  } satisfies DesignInput);
}

export const MAINS_250_50 = { kind: 'ac-mains', highestVoltage: 250, highestFrequencyHz: 50 } as const;
export const MAINS_264_60 = { kind: 'ac-mains', highestVoltage: 264, highestFrequencyHz: 60 } as const;

export function yCap(id: string, placement: 'line1-to-ground' | 'line2-to-ground', capacitance: number | string, extra: Record<string, unknown> = {}): ElementInput {
  return { id, placement, part: { kind: 'capacitor', capacitance, safetyClass: 'Y2', ratedVoltage: 300, ...extra } };
}

export function xCap(id: string, capacitance: number | string, extra: Record<string, unknown> = {}): ElementInput {
  return { id, placement: 'line-to-line', part: { kind: 'capacitor', capacitance, safetyClass: 'X2', ratedVoltage: 310, ...extra } };
}

export function finding(report: SafetyReport, id: string): SafetyFinding {
  const found = report.checks.flatMap((c) => c.findings).find((f) => f.id === id);
  if (!found) throw new Error(`no finding ${id}; have ${report.checks.flatMap((c) => c.findings.map((f) => f.id)).join(', ')}`);
  return found;
}

/** A figure's value by its label. */
export function value(f: SafetyFinding, label: string): number {
  const fig = f.figures.find((x) => x.label === label);
  if (!fig) throw new Error(`finding ${f.id} has no figure "${label}"; has ${f.figures.map((x) => x.label).join(', ')}`);
  return fig.value;
}

export function expectRelative(actual: number, expected: number, relative: number): void {
  const error = Math.abs(actual - expected) / Math.abs(expected);
  if (!(error < relative)) throw new Error(`expected ${expected}, got ${actual} (relative error ${error})`);
}
