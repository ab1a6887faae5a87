import { compileNetwork, evaluateNetworkOnce, sweepDesign } from '../../engine/index.ts';
import type { Design } from '../../model/design.ts';
import { AssistInputError } from '../margin/assist-problem.ts';
import type { Steps } from '../run/steps.ts';

/**
 * Converter stability with its input filter, by Middlebrook's criterion (R. D. Middlebrook, "Input
 * filter considerations in design and application of switching regulators", IEEE IAS 1976;
 * Erickson & Maksimović, Fundamentals of Power Electronics, 2nd ed., input filter design): within
 * its loop bandwidth a tightly regulated converter draws constant power, so its incremental input
 * resistance is negative, Z_N = −V²/P at its lowest input voltage and highest power. The filter's
 * output impedance Z_o seen by the converter (the engine's DM input impedance from the source side,
 * line to line, supply connected) must stay well below |Z_N|: the margin is 20·log10(|Z_N| / |Z_o|)
 * at every frequency, and the check passes when its minimum (the closest approach) keeps the
 * user's margin (default 6 dB). A check with no converter data is refused, never passed.
 */

export interface StabilityOptions {
  /** Default: design.operating.converter. */
  readonly lowestInputVoltageV?: number;
  readonly highestInputPowerW?: number;
  /** The margin |Z_N| must keep above |Z_o|, dB (default 6). */
  readonly requiredMarginDb?: number;
  /** Judge only up to here (the converter's loop bandwidth, above which −V²/P no longer holds); default the plan's stop. */
  readonly upToHz?: number;
}

export interface FlaggedRange {
  readonly startHz: number;
  readonly stopHz: number;
  readonly worstMarginDb: number;
}

export interface StabilityResult {
  readonly lowestInputVoltageV: number;
  readonly highestInputPowerW: number;
  /** −V²/P, Ω (negative). */
  readonly negativeResistanceOhm: number;
  readonly requiredMarginDb: number;
  readonly frequencyHz: Float64Array;
  /** |Z_o|, the filter's DM output impedance seen by the converter, Ω. */
  readonly outputImpedanceOhm: Float64Array;
  /** 20·log10(|Z_N| / |Z_o|) per frequency, dB. */
  readonly marginDb: Float64Array;
  /** The closest approach: the highest |Z_o| relative to |Z_N|, located between grid points. */
  readonly closest: { readonly frequencyHz: number; readonly outputImpedanceOhm: number; readonly marginDb: number };
  /** Every range where the margin is below the required one. */
  readonly flagged: readonly FlaggedRange[];
  readonly pass: boolean;
  readonly notes: readonly string[];
}

/** −V²/P: the incremental input resistance of a constant-power load. */
export function negativeInputResistance(voltageV: number, powerW: number): number {
  return -(voltageV * voltageV) / powerW;
}

/** |Z_o| (DM, from the converter side) at each frequency. */
export function outputImpedanceDm(design: Design, frequencyHz: Float64Array): Float64Array {
  const response = evaluateNetworkOnce(compileNetwork(design, []), frequencyHz);
  return Float64Array.from(frequencyHz, (_, i) => Math.hypot(response.inputImpedanceDm.re[i]!, response.inputImpedanceDm.im[i]!));
}

export function* converterStability(design: Design, options: StabilityOptions = {}): Steps<StabilityResult> {
  const converter = design.operating?.converter;
  const voltage = options.lowestInputVoltageV ?? converter?.lowestInputVoltage;
  const power = options.highestInputPowerW ?? converter?.highestInputPower;
  if (voltage === undefined || power === undefined) {
    throw new AssistInputError('no converter to judge against: add operating.converter (lowest input voltage, highest input power) to the design or give them');
  }
  if (!(voltage > 0 && power > 0)) throw new AssistInputError('the converter voltage and power must be above zero');
  const required = options.requiredMarginDb ?? 6;
  const zN = negativeInputResistance(voltage, power);
  const limit = Math.abs(zN);
  const stop = Math.min(options.upToHz ?? design.frequencyPlan.stopHz, design.frequencyPlan.stopHz);
  if (!(stop > design.frequencyPlan.startHz)) throw new AssistInputError('the judged range is empty: the upper frequency is below the plan’s start');

  const sweep = sweepDesign({ ...design, frequencyPlan: { ...design.frequencyPlan, stopHz: stop } });
  yield { done: 1, total: 2, stage: 'sweeping the output impedance' };
  const f = sweep.frequencyHz;
  const z = sweep.columns.inputImpedanceDmOhm;
  const marginDb = Float64Array.from(z, (value) => 20 * Math.log10(limit / value));

  // The closest approach on the grid, then located between its neighbours (three zooms of 41 points).
  let at = 0;
  for (let i = 1; i < z.length; i += 1) if (z[i]! > z[at]!) at = i;
  let closest = { frequencyHz: f[at]!, outputImpedanceOhm: z[at]! };
  if (at > 0 && at + 1 < f.length) {
    let low = f[at - 1]!;
    let high = f[at + 1]!;
    for (let pass = 0; pass < 3; pass += 1) {
      const grid = Float64Array.from({ length: 41 }, (_, k) => low * (high / low) ** (k / 40));
      const local = outputImpedanceDm(design, grid);
      let best = 0;
      for (let k = 1; k < local.length; k += 1) if (local[k]! > local[best]!) best = k;
      if (local[best]! > closest.outputImpedanceOhm) closest = { frequencyHz: grid[best]!, outputImpedanceOhm: local[best]! };
      low = grid[Math.max(0, best - 1)]!;
      high = grid[Math.min(40, best + 1)]!;
    }
  }
  yield { done: 2, total: 2, stage: 'locating the closest approach' };

  const flagged: FlaggedRange[] = [];
  let start = -1;
  let worst = Number.POSITIVE_INFINITY;
  for (let i = 0; i <= f.length; i += 1) {
    const short = i < f.length && marginDb[i]! < required;
    if (short) {
      if (start < 0) start = i;
      worst = Math.min(worst, marginDb[i]!);
    } else if (start >= 0) {
      flagged.push({ startHz: f[start]!, stopHz: f[i - 1]!, worstMarginDb: worst });
      start = -1;
      worst = Number.POSITIVE_INFINITY;
    }
  }
  const closestMargin = 20 * Math.log10(limit / closest.outputImpedanceOhm);
  const notes = [
    'the converter is modelled as a constant-power load, −V²/P, which holds within its control loop’s bandwidth; above it the converter’s own input impedance applies',
    'Middlebrook’s criterion keeps the loop gain unchanged; it is sufficient, not necessary: a filter that fails it may still be stable, but its loop gain is altered',
  ];
  if (options.upToHz === undefined) notes.push('judged over the whole plan (no loop bandwidth given): conservative');
  return {
    lowestInputVoltageV: voltage,
    highestInputPowerW: power,
    negativeResistanceOhm: zN,
    requiredMarginDb: required,
    frequencyHz: f,
    outputImpedanceOhm: z,
    marginDb,
    closest: { ...closest, marginDb: closestMargin },
    flagged,
    pass: closestMargin >= required,
    notes,
  };
}
