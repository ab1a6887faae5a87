import type { Design, DischargeRequirementChoice, LeakageLimitChoice, SafetyChoices } from '../model/design.ts';
import type { LeakageLimitId } from '../model/safety-schema.ts';
import { type DischargeRequirement, findDischargeRequirement } from './discharge-requirements.ts';
import { findLeakageLimit } from './leakage-limits.ts';
import type { SourceNote } from './source-confirmation.ts';

/**
 * The user's safety choices as the checks use them: the design's `safety` block, overridden field
 * by field by the caller (the command line's options, the page's controls), with the stated
 * defaults filled in and flagged as defaults so that every result can say which numbers were given.
 */

export interface ResolvedLeakageLimit {
  /** Set when the limit comes from the list. */
  readonly id?: LeakageLimitId;
  readonly name: string;
  readonly normalConditionA: number;
  readonly singleFaultA?: number;
  /** The list's source; absent for an entered value. */
  readonly source?: SourceNote;
  /** What the user wrote about an entered value. */
  readonly label?: string;
  readonly note?: string;
}

export interface ChosenValue {
  readonly value: number;
  /** False when the value is this program's default. */
  readonly given: boolean;
}

export interface ResolvedChoices {
  readonly leakageLimit?: ResolvedLeakageLimit;
  readonly discharge?: DischargeRequirement;
  readonly capacitorTolerance: ChosenValue;
  readonly saturationMargin: ChosenValue;
  readonly lineCurrentCrestFactor: ChosenValue;
  readonly externalBleedResistanceOhm?: number;
}

/** +20 %: the usual tolerance of ceramic and film safety capacitors (common practice, no source). */
export const DEFAULT_CAPACITOR_TOLERANCE = 0.2;
/** 20 % below B_sat (common practice, no source). */
export const DEFAULT_SATURATION_MARGIN = 0.2;

export function resolveLeakageLimit(choice: LeakageLimitChoice): ResolvedLeakageLimit {
  if (choice.kind === 'listed-limit') {
    const listed = findLeakageLimit(choice.id);
    return {
      id: listed.id,
      name: listed.name,
      normalConditionA: listed.normalConditionA,
      ...(listed.singleFaultA === undefined ? {} : { singleFaultA: listed.singleFaultA }),
      source: listed.source,
      ...(listed.note === undefined ? {} : { note: listed.note }),
    };
  }
  return {
    name: choice.label ?? 'entered limit',
    normalConditionA: choice.normalCondition,
    ...(choice.singleFault === undefined ? {} : { singleFaultA: choice.singleFault }),
    ...(choice.label === undefined ? {} : { label: choice.label }),
  };
}

export function resolveDischarge(choice: DischargeRequirementChoice): DischargeRequirement {
  switch (choice.kind) {
    case 'listed-requirement':
      return findDischargeRequirement(choice.id);
    case 'time-constant':
      return {
        name: choice.label ?? 'entered requirement',
        rule: { kind: 'time-constant', maxTimeConstantS: choice.maxTimeConstant },
      };
    case 'residual-voltage':
      return {
        name: choice.label ?? 'entered requirement',
        rule: { kind: 'residual-voltage', maxVoltageV: choice.maxVoltage, afterS: choice.after },
      };
  }
}

export function resolveChoices(design: Design, overrides: SafetyChoices = {}): ResolvedChoices {
  const chosen: SafetyChoices = { ...design.safety, ...definedOnly(overrides) };
  const dc = design.operating?.supply?.kind === 'dc';
  return {
    ...(chosen.leakageLimit ? { leakageLimit: resolveLeakageLimit(chosen.leakageLimit) } : {}),
    ...(chosen.discharge ? { discharge: resolveDischarge(chosen.discharge) } : {}),
    capacitorTolerance: given(chosen.capacitorTolerance, DEFAULT_CAPACITOR_TOLERANCE),
    saturationMargin: given(chosen.saturationMargin, DEFAULT_SATURATION_MARGIN),
    lineCurrentCrestFactor: given(chosen.lineCurrentCrestFactor, dc ? 1 : Math.SQRT2),
    ...(chosen.externalBleedResistance === undefined ? {} : { externalBleedResistanceOhm: chosen.externalBleedResistance }),
  };
}

function given(value: number | undefined, fallback: number): ChosenValue {
  return value === undefined ? { value: fallback, given: false } : { value, given: true };
}

function definedOnly(choices: SafetyChoices): SafetyChoices {
  return Object.fromEntries(Object.entries(choices).filter(([, value]) => value !== undefined)) as SafetyChoices;
}
