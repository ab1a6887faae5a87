import { z } from 'zod';
import type { Design, SafetyChoices } from '../model/design.ts';
import { safetySchema } from '../model/safety-schema.ts';
import { type Caution, cautionsFor } from './cautions.ts';
import { checkContext, describeSupply } from './check-context.ts';
import { classCheck } from './checks/class-check.ts';
import { dischargeCheck } from './checks/discharge-check.ts';
import { leakageCheck } from './checks/leakage-check.ts';
import { saturationCheck } from './checks/saturation-check.ts';
import { voltageCheck } from './checks/voltage-check.ts';
import { windingsCheck } from './checks/windings-check.ts';
import { type LargestYCapacitance, largestYCapacitance } from './leakage-cases.ts';
import { type ResolvedChoices, resolveChoices } from './safety-choices.ts';
import { CHECK_TITLES, type FindingStatus, SAFETY_CHECK_IDS, type SafetyCheckId, type SafetyCheckResult } from './safety-finding.ts';

/**
 * The safety checks' one entry point: pure, synchronous, plain data in and out, so the page's
 * worker, the report and the command line call it alike.
 */

export interface SafetyCheckOptions {
  /** Choices that override the design's `safety` block, field by field. */
  readonly choices?: SafetyChoices;
  /** Checks to leave out: they are listed as skipped and do not count towards the outcome. */
  readonly skip?: readonly SafetyCheckId[];
}

/** For a worker or any other caller that receives the options from outside. */
export const safetyCheckOptionsSchema = z.strictObject({
  choices: safetySchema.optional(),
  skip: z.array(z.enum(SAFETY_CHECK_IDS)).max(SAFETY_CHECK_IDS.length).optional(),
});

export interface SafetySupplySummary {
  readonly kind: 'ac-mains' | 'dc';
  readonly highestVoltageV: number;
  readonly highestFrequencyHz?: number;
  readonly text: string;
}

/**
 * pass: every check ran and none failed (warnings allowed); fail: at least one failed;
 * incomplete: none failed but at least one could not run for a missing input.
 */
export type SafetyOutcome = 'pass' | 'fail' | 'incomplete';

export interface SafetyReport {
  readonly kind: 'chokepoint-safety-report';
  readonly version: 1;
  readonly designName: string;
  readonly supply?: SafetySupplySummary;
  readonly lineCurrentA?: number;
  readonly choices: ResolvedChoices;
  readonly checks: readonly SafetyCheckResult[];
  readonly outcome: SafetyOutcome;
  /** Findings by status over the checks that ran. */
  readonly counts: Readonly<Record<FindingStatus, number>>;
  /** The largest Y capacitance within the chosen leakage limit (for the sizing assistant), when a limit and the mains supply are given. */
  readonly largestYCapacitance?: LargestYCapacitance;
  readonly cautions: readonly Caution[];
}


export function runSafetyChecks(design: Design, options: SafetyCheckOptions = {}): SafetyReport {
  const choices = resolveChoices(design, options.choices);
  const ctx = checkContext(design, choices);
  const skip = new Set(options.skip ?? []);
  let largestY: LargestYCapacitance | undefined;
  const run = (id: SafetyCheckId): SafetyCheckResult => {
    if (skip.has(id)) return { id, title: CHECK_TITLES[id], status: 'skipped', summary: 'Skipped at your request.', findings: [], figures: [], assumptions: [] };
    switch (id) {
      case 'leakage': {
        const outcome = leakageCheck(ctx);
        largestY = outcome.largestY;
        return outcome.result;
      }
      case 'discharge':
        return dischargeCheck(ctx);
      case 'class':
        return classCheck(ctx);
      case 'voltage':
        return voltageCheck(ctx);
      case 'windings':
        return windingsCheck(ctx);
      case 'saturation':
        return saturationCheck(ctx);
    }
  };
  const checks = SAFETY_CHECK_IDS.map(run);
  const counts: Record<FindingStatus, number> = { pass: 0, warn: 0, fail: 0, 'not-checked': 0, 'not-applicable': 0 };
  for (const check of checks) for (const finding of check.findings) counts[finding.status] += 1;
  const outcome: SafetyOutcome = counts.fail > 0 ? 'fail' : counts['not-checked'] > 0 ? 'incomplete' : 'pass';
  const supply = ctx.supply;
  return {
    kind: 'chokepoint-safety-report',
    version: 1,
    designName: design.name,
    ...(supply
      ? {
          supply: {
            kind: supply.kind,
            highestVoltageV: supply.highestVoltage,
            ...(supply.kind === 'ac-mains' ? { highestFrequencyHz: supply.highestFrequencyHz } : {}),
            text: describeSupply(supply),
          },
        }
      : {}),
    ...(ctx.lineCurrentA === undefined ? {} : { lineCurrentA: ctx.lineCurrentA }),
    choices,
    checks,
    outcome,
    counts,
    ...(largestY ? { largestYCapacitance: largestY } : {}),
    cautions: cautionsFor(supply),
  };
}

/**
 * The largest Y capacitance within the design's leakage limit at its highest mains voltage and
 * frequency, for the sizing assistant: undefined (with the reason) when the supply is not AC mains or
 * no limit is chosen. `choices` override the design's safety block as for runSafetyChecks.
 */
export function largestYCapacitanceForDesign(
  design: Design,
  choices?: SafetyChoices,
): { readonly ok: true; readonly value: LargestYCapacitance } | { readonly ok: false; readonly missing: string } {
  const resolved = resolveChoices(design, choices);
  const supply = design.operating?.supply;
  if (supply === undefined) return { ok: false, missing: 'operating.supply' };
  if (supply.kind !== 'ac-mains') return { ok: false, missing: 'operating.supply of kind "ac-mains" (a DC input has no mains leakage)' };
  if (resolved.leakageLimit === undefined) return { ok: false, missing: 'safety.leakageLimit' };
  return { ok: true, value: largestYCapacitance(resolved.leakageLimit, supply.highestVoltage, supply.highestFrequencyHz, resolved.capacitorTolerance.value) };
}
