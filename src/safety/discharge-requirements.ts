import type { DischargeRequirementId } from '../model/safety-schema.ts';
import { type SourceNote, sourceNote } from './source-confirmation.ts';

/**
 * X-capacitor discharge requirements: how fast the charge left across the plug pins after
 * disconnection must decay. Two forms occur: a largest time constant R·C, or a largest voltage a
 * stated time after the plug is pulled at the peak of the mains. Clause texts as reproduced in
 * safety forums and test-report layouts; the 60 V threshold of IEC 62368-1 is quoted from memory.
 */

export type DischargeRule =
  | { readonly kind: 'time-constant'; readonly maxTimeConstantS: number }
  | { readonly kind: 'residual-voltage'; readonly maxVoltageV: number; readonly afterS: number };

export interface DischargeRequirement {
  /** Absent for a requirement entered in the design. */
  readonly id?: DischargeRequirementId;
  readonly name: string;
  readonly rule: DischargeRule;
  /** Total capacitance across the pins at or below which the clause asks for no discharge; absent: none. */
  readonly exemptUpToF?: number;
  /** Undefined for an entered requirement whose source the user names in its label. */
  readonly source?: SourceNote;
  readonly thresholdSource?: SourceNote;
  readonly note?: string;
}

/** 0.1 µF: the capacitance up to which IEC 60335-1 cl. 22.5 and IEC 60950-1 cl. 2.1.1.7 ask for no discharge. */
export const DISCHARGE_EXEMPTION_F = 0.1e-6;

export const DISCHARGE_REQUIREMENTS: readonly DischargeRequirement[] = [
  {
    id: 'iec60950-1-pluggable-a',
    name: 'IT equipment, pluggable type A',
    rule: { kind: 'time-constant', maxTimeConstantS: 1 },
    exemptUpToF: DISCHARGE_EXEMPTION_F,
    source: sourceNote('IEC 60950-1', 'cl. 2.1.1.7', 'published-text'),
  },
  {
    id: 'iec60950-1-pluggable-b',
    name: 'IT equipment, pluggable type B',
    rule: { kind: 'time-constant', maxTimeConstantS: 10 },
    exemptUpToF: DISCHARGE_EXEMPTION_F,
    source: sourceNote('IEC 60950-1', 'cl. 2.1.1.7', 'published-text'),
  },
  {
    id: 'iec60335-1',
    name: 'household appliance, plug pins',
    rule: { kind: 'residual-voltage', maxVoltageV: 34, afterS: 1 },
    exemptUpToF: DISCHARGE_EXEMPTION_F,
    source: sourceNote('IEC 60335-1', 'cl. 22.5', 'published-text'),
  },
  {
    id: 'iec62368-1',
    name: 'audio/video and IT equipment, plug voltage at ES1',
    rule: { kind: 'residual-voltage', maxVoltageV: 60, afterS: 2 },
    source: sourceNote('IEC 62368-1', 'cl. 5.5.2.2', 'published-text'),
    thresholdSource: sourceNote('IEC 62368-1', 'Table 4 (ES1 limit, and that ES1 is the pass criterion)', 'not-confirmed'),
    note: 'the clause measures 2 s after disconnection in normal condition and with a bleeder resistor open (single fault), the latter waived for bleeders that meet Annex G.10; no exemption value is recorded here, so every X capacitance is checked',
  },
];

export function findDischargeRequirement(id: DischargeRequirementId): DischargeRequirement {
  const found = DISCHARGE_REQUIREMENTS.find((r) => r.id === id);
  if (!found) throw new Error(`no discharge requirement "${id}"`);
  return found;
}
