import type { DesignInput } from '../../src/model/design.ts';
import type { Design } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';

type StageInput = DesignInput['stages'][number];
type ElementInput = StageInput['elements'][number];
type ReceiverInput = DesignInput['receivers']['line1'];
type PartInput = ElementInput['part'];

/** A validated design from the parts that matter to a test; terminations default to resistive 50 Ω. */
export function buildDesign(options: {
  elements?: ElementInput[];
  stages?: StageInput[];
  receivers?: { line1: ReceiverInput; line2: ReceiverInput };
  commonModeSource?: DesignInput['noiseSource']['commonMode']['impedance'];
  differentialModeSource?: DesignInput['noiseSource']['differentialMode']['impedance'];
  frequencyPlan?: DesignInput['frequencyPlan'];
}): Design {
  return requireDesign({
    format: 'chokepoint-design',
    version: 2,
    name: 'test design',
    frequencyPlan: options.frequencyPlan,
    noiseSource: {
      commonMode: { impedance: options.commonModeSource ?? { kind: 'resistor', resistance: 50 } },
      differentialMode: { impedance: options.differentialModeSource ?? { kind: 'resistor', resistance: 100 } },
    },
    receivers: options.receivers ?? { line1: { kind: 'resistive', resistance: 50 }, line2: { kind: 'resistive', resistance: 50 } },
    stages: options.stages ?? [{ id: 'stage1', elements: options.elements ?? [] }],
  } satisfies DesignInput);
}

let counter = 0;
/** An element with a fresh id. */
export function element(placement: ElementInput['placement'], part: PartInput, id?: string): ElementInput {
  counter += 1;
  return { id: id ?? `e${counter}`, placement, part };
}

export const capacitor = (capacitance: number, extra: Partial<{ esr: number; esl: number }> = {}): PartInput => ({
  kind: 'capacitor',
  capacitance,
  ...extra,
});
export const inductor = (inductance: number, extra: Partial<{ dcr: number; windingCapacitance: number }> = {}): PartInput => ({
  kind: 'inductor',
  inductance,
  ...extra,
});
export const resistor = (resistance: number): PartInput => ({ kind: 'resistor', resistance });
