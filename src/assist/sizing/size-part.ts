import { sweepDesign } from '../../engine/index.ts';
import type { Design, FilterElement, Part } from '../../model/design.ts';
import {
  allElements,
  DEFAULT_SCALING,
  editElements,
  locateElement,
  type ScalingModel,
  targetValue,
  UNIT_OF,
  type ValueTarget,
  withTargetValue,
} from '../design-edit/part-values.ts';
import { AssistInputError, type AssistProblem } from '../margin/assist-problem.ts';
import { compileMarginEvaluator, type MarginEvaluator } from '../margin/margin-evaluator.ts';
import { ProgressCounter, type Steps } from '../run/steps.ts';
import { type PreferredSeries, preferredAtOrAbove } from './preferred-values.ts';

/**
 * The smallest value of one part (or a group moved together) that keeps the target margin
 * everywhere, with everything else held (docs/assistants.md, "Smallest parts"):
 *
 * 1. the margin against the value on a log grid from value/range to value·range (the curve);
 * 2. the smallest grid value that passes, bracketed with the grid value below it, then bisection
 *    on log(value) to a relative width of 1e-3 (every step a full engine evaluation);
 * 3. snapped up to the chosen E series (IEC 60063), each candidate checked with the engine, the
 *    next one up taken when a preferred value fails (the margin need not rise monotonically);
 * 4. when no value on the curve passes: the best value's worst frequency, and which part's
 *    self-resonance limits it there, found by halving each part's parasitic (ESL, winding
 *    capacitance, bead capacitance) in turn and seeing which one lifts the margin most.
 */

export interface SizingOptions {
  readonly scaling?: ScalingModel;
  readonly series?: PreferredSeries;
  /** The curve spans value/rangeFactor to value·rangeFactor (default 100). */
  readonly rangeFactor?: number;
  /** Points of the log grid the curve starts from (default 17: four per decade over ±2 decades); bisection and snapping add theirs. */
  readonly curvePoints?: number;
}

export interface SizingCurve {
  readonly value: Float64Array;
  /** Worst judged margin at each value, dB; NaN where the value makes no valid part. */
  readonly worstMarginDb: Float64Array;
  readonly worstFrequencyHz: Float64Array;
}

export interface SizedValue {
  readonly value: number;
  readonly marginDb: number;
  readonly worstFrequencyHz: number;
}

export interface ResonanceLimit {
  readonly elementId: string;
  readonly label: string;
  /** The parasitic that was halved: 'esl', 'winding-capacitance' or 'capacitance' (a bead's). */
  readonly parasitic: string;
  /** The element's self-resonance nearest below the limiting frequency (or nearest at all), Hz. */
  readonly selfResonanceHz: number | undefined;
  /** How much halving that parasitic lifts the best margin, dB. */
  readonly gainDb: number;
}

export interface NoSolution {
  readonly bestValue: number;
  readonly bestMarginDb: number;
  readonly worstFrequencyHz: number;
  /** 'self-resonance': a part's resonance caps the attenuation there; 'insensitive': this value hardly moves the margin there. */
  readonly cause: 'self-resonance' | 'insensitive' | 'other';
  readonly responsible: ResonanceLimit | undefined;
  /** How much any value on the curve lifts the margin at the limiting frequency above the best value's, dB. */
  readonly curveGainAtWorstDb: number;
  readonly summary: string;
}

export interface SizingResult {
  readonly target: ValueTarget;
  readonly unit: 'F' | 'H' | 'Ω';
  readonly targetMarginDb: number;
  readonly scaling: ScalingModel;
  readonly present: SizedValue;
  readonly curve: SizingCurve;
  /** The smallest value meeting the target margin (bisection), or undefined. */
  readonly answer: SizedValue | undefined;
  /** The answer snapped up to the series and checked, or undefined when none of the next values passes. */
  readonly preferred: (SizedValue & { readonly series: PreferredSeries }) | undefined;
  /** Value ranges on the curve that pass (a resonance can make a larger value fail again). */
  readonly passingRanges: readonly { readonly fromValue: number; readonly toValue: number }[];
  readonly noSolution: NoSolution | undefined;
  readonly notes: readonly string[];
}

const BISECTION_WIDTH = 1e-3;
const PREFERRED_TRIES = 6;

export function* sizePart(problem: AssistProblem, target: ValueTarget, options: SizingOptions = {}): Steps<SizingResult> {
  return yield* sizeWithEvaluator(compileMarginEvaluator(problem), problem.design, target, options);
}

/** As sizePart, on an evaluator compiled already (the proposal search sizes many parts on one). */
export function* sizeWithEvaluator(evaluator: MarginEvaluator, design: Design, target: ValueTarget, options: SizingOptions = {}): Steps<SizingResult> {
  const problem = evaluator.problem;
  const scaling = options.scaling ?? DEFAULT_SCALING;
  const series = options.series ?? 'E12';
  const rangeFactor = options.rangeFactor ?? 100;
  const points = options.curvePoints ?? 17;
  checkTarget(design, target);
  const present = targetValue(design, target)!;
  const progress = new ProgressCounter(points + 1 + 12 + PREFERRED_TRIES, `sizing ${target.elementIds.join('+')}`);

  const judged: SizedValue[] = [];
  const judge = (value: number): SizedValue => {
    const candidate = withTargetValue(design, target, value, scaling);
    const outcome = candidate ? evaluator.evaluate(candidate) : undefined;
    const sized = { value, marginDb: outcome?.worstMarginDb ?? Number.NaN, worstFrequencyHz: outcome?.worstFrequencyHz ?? Number.NaN };
    judged.push(sized);
    return sized;
  };
  const covered = evaluator.coverage.uncoveredBands.length === 0;
  const passes = (sized: SizedValue): boolean => covered && sized.marginDb >= problem.targetMarginDb;

  const presentSized = judge(present);
  yield progress.step();
  const curve: SizingCurve = { value: new Float64Array(points), worstMarginDb: new Float64Array(points), worstFrequencyHz: new Float64Array(points) };
  const low = present / rangeFactor;
  const step = Math.log(rangeFactor * rangeFactor) / (points - 1);
  for (let k = 0; k < points; k += 1) {
    const sized = judge(low * Math.exp(step * k));
    curve.value[k] = sized.value;
    curve.worstMarginDb[k] = sized.marginDb;
    curve.worstFrequencyHz[k] = sized.worstFrequencyHz;
    yield progress.step();
  }

  const passingRanges = rangesOf(curve, problem.targetMarginDb);
  const notes: string[] = evaluator.coverage.reasons.map((reason) => `${reason}: no value can pass until this band is covered`);
  const first = covered ? Array.from(curve.worstMarginDb).findIndex((m) => m >= problem.targetMarginDb) : -1;
  let answer: SizedValue | undefined;
  let preferred: SizingResult['preferred'];
  let noSolution: NoSolution | undefined;

  if (first < 0) {
    progress.enter('finding what limits it');
    noSolution = yield* explainNoSolution(evaluator, design, target, scaling, curve, progress);
  } else if (first === 0) {
    answer = { value: curve.value[0]!, marginDb: curve.worstMarginDb[0]!, worstFrequencyHz: curve.worstFrequencyHz[0]! };
    notes.push(`even ${rangeFactor}× below the present value the design keeps the target margin: the answer is at most this, and the part may hardly be needed`);
  } else {
    // Bisection on log(value) between the last failing and the first passing curve point.
    let failing = curve.value[first - 1]!;
    let passing: SizedValue = { value: curve.value[first]!, marginDb: curve.worstMarginDb[first]!, worstFrequencyHz: curve.worstFrequencyHz[first]! };
    while (passing.value / failing > 1 + BISECTION_WIDTH) {
      const middle = judge(Math.sqrt(failing * passing.value));
      if (passes(middle)) passing = middle;
      else failing = middle.value;
      yield progress.step();
    }
    answer = passing;
  }
  if (answer && passingRanges.length > 1) notes.push('a larger value fails again somewhere on the curve (a resonance moves with the value): check the curve before choosing a value far above the answer');

  if (answer) {
    progress.enter(`snapping to ${series}`);
    for (const value of preferredAtOrAbove(answer.value, series, PREFERRED_TRIES)) {
      const sized = judge(value);
      yield progress.step();
      if (passes(sized)) {
        preferred = { ...sized, series };
        break;
      }
    }
    if (!preferred) notes.push(`none of the next ${PREFERRED_TRIES} ${series} values above the answer keeps the target margin`);
  }

  return {
    target,
    unit: UNIT_OF[target.quantity],
    targetMarginDb: problem.targetMarginDb,
    scaling,
    present: presentSized,
    curve: curveOf(judged),
    answer,
    preferred,
    passingRanges,
    noSolution,
    notes,
  };
}

function checkTarget(design: Design, target: ValueTarget): void {
  if (target.elementIds.length === 0) throw new AssistInputError('name at least one element to size');
  for (const id of target.elementIds) {
    const location = locateElement(design, id);
    if (!location) throw new AssistInputError(`no element "${id}" in the design`);
    if (!location.element.enabled) throw new AssistInputError(`element "${id}" is disabled`);
    if (targetValue(design, { elementIds: [id], quantity: target.quantity }) === undefined) {
      throw new AssistInputError(`element "${id}" (${location.element.part.kind}) has no ${target.quantity} to size`);
    }
  }
}

/** Every value judged on the way (grid, bisection, preferred values, the present one), rising: the plot's curve. */
function curveOf(judged: readonly SizedValue[]): SizingCurve {
  const sorted = [...judged].sort((a, b) => a.value - b.value).filter((s, i, all) => i === 0 || s.value !== all[i - 1]!.value);
  return {
    value: Float64Array.from(sorted, (s) => s.value),
    worstMarginDb: Float64Array.from(sorted, (s) => s.marginDb),
    worstFrequencyHz: Float64Array.from(sorted, (s) => s.worstFrequencyHz),
  };
}

function rangesOf(curve: SizingCurve, targetDb: number): { fromValue: number; toValue: number }[] {
  const ranges: { fromValue: number; toValue: number }[] = [];
  let start = -1;
  for (let k = 0; k <= curve.value.length; k += 1) {
    const ok = k < curve.value.length && curve.worstMarginDb[k]! >= targetDb;
    if (ok && start < 0) start = k;
    if (!ok && start >= 0) {
      ranges.push({ fromValue: curve.value[start]!, toValue: curve.value[k - 1]! });
      start = -1;
    }
  }
  return ranges;
}

/** The parasitic each part kind carries that sets a self-resonance, and the part with it halved. */
function halvedParasitic(part: Part): { parasitic: string; part: Part } | undefined {
  switch (part.kind) {
    case 'capacitor':
      return part.esl > 0 ? { parasitic: 'esl', part: { ...part, esl: part.esl / 2 } } : undefined;
    case 'inductor':
    case 'common-mode-choke':
      return part.windingCapacitance > 0 ? { parasitic: 'winding-capacitance', part: { ...part, windingCapacitance: part.windingCapacitance / 2 } } : undefined;
    case 'ferrite-bead':
      return part.capacitance > 0 ? { parasitic: 'capacitance', part: { ...part, capacitance: part.capacitance / 2 } } : undefined;
    default:
      return undefined;
  }
}

function* explainNoSolution(
  evaluator: MarginEvaluator,
  design: Design,
  target: ValueTarget,
  scaling: ScalingModel,
  curve: SizingCurve,
  progress: ProgressCounter,
): Steps<NoSolution> {
  let best = 0;
  for (let k = 1; k < curve.value.length; k += 1) if (curve.worstMarginDb[k]! > curve.worstMarginDb[best]! || Number.isNaN(curve.worstMarginDb[best]!)) best = k;
  const bestValue = curve.value[best]!;
  const bestMarginDb = curve.worstMarginDb[best]!;
  const worstFrequencyHz = curve.worstFrequencyHz[best]!;
  const at = withTargetValue(design, target, bestValue, scaling) ?? design;

  // How the margin at the limiting frequency moves over the curve: the value's own leverage there.
  const k = nearestIndex(evaluator.frequencyHz, worstFrequencyHz);
  const atWorst: number[] = [];
  for (let c = 0; c < curve.value.length; c += 4) {
    const candidate = withTargetValue(design, target, curve.value[c]!, scaling);
    if (!candidate) continue;
    atWorst.push(marginAtPoint(evaluator, evaluator.evaluate(candidate), k));
  }
  const finite = atWorst.filter(Number.isFinite);
  const atBest = marginAtPoint(evaluator, evaluator.evaluate(at), k);
  // How much any value on the curve lifts the margin at that frequency above the best value's.
  const spread = finite.length > 0 && Number.isFinite(atBest) ? Math.max(0, Math.max(...finite) - atBest) : 0;

  // Perturb each part's parasitic in turn (not guessed by name): which one lifts the margin most?
  let responsible: ResonanceLimit | undefined;
  const sweep = sweepDesign(at, { refine: false });
  for (const location of allElements(at)) {
    if (!location.element.enabled) continue;
    const halved = halvedParasitic(location.element.part);
    if (!halved) continue;
    const changed = editElements(at, new Set([location.element.id]), (element) => ({ ...element, part: halved.part }) as FilterElement);
    if (!changed) continue;
    const gainDb = evaluator.evaluate(changed).worstMarginDb - bestMarginDb;
    yield progress.step();
    if (!responsible || gainDb > responsible.gainDb) {
      const resonances = sweep.elements.find((e) => e.id === location.element.id)?.views.flatMap((v) => v.selfResonances.map((r) => r.frequencyHz)) ?? [];
      const below = resonances.filter((f) => f <= worstFrequencyHz * 1.05).sort((a, b) => b - a);
      const nearest = below[0] ?? resonances.sort((a, b) => Math.abs(Math.log(a / worstFrequencyHz)) - Math.abs(Math.log(b / worstFrequencyHz)))[0];
      responsible = { elementId: location.element.id, label: location.element.label ?? location.element.id, parasitic: halved.parasitic, selfResonanceHz: nearest, gainDb };
    }
  }
  const resonanceLimited = responsible !== undefined && responsible.gainDb > 0.5 && responsible.selfResonanceHz !== undefined && responsible.selfResonanceHz <= worstFrequencyHz * 1.05;
  const cause: NoSolution['cause'] = resonanceLimited ? 'self-resonance' : spread < 1 ? 'insensitive' : 'other';
  const name = target.elementIds.join('+');
  const f = formatHz(worstFrequencyHz);
  let summary: string;
  if (cause === 'self-resonance') {
    summary = `no value of ${name} keeps the target margin: at ${f} the self-resonance of ${responsible!.label} (${formatHz(responsible!.selfResonanceHz!)}, its ${responsible!.parasitic.replace('-', ' ')}) limits the attenuation; halving that parasitic would gain ${responsible!.gainDb.toFixed(1)} dB`;
  } else if (cause === 'insensitive') {
    summary = `no value of ${name} keeps the target margin: the shortfall at ${f} hardly depends on it (no value in the range lifts the margin there by more than ${spread.toFixed(2)} dB); look at the other mode or another part (chokepoint diagnose)`;
  } else {
    summary = `no value of ${name} keeps the target margin: the best, ${bestMarginDb.toFixed(1)} dB, is limited at ${f}`;
  }
  return { bestValue, bestMarginDb, worstFrequencyHz, cause, responsible, curveGainAtWorstDb: spread, summary };
}

function nearestIndex(frequencyHz: Float64Array, f: number): number {
  let best = 0;
  for (let i = 1; i < frequencyHz.length; i += 1) if (Math.abs(frequencyHz[i]! - f) < Math.abs(frequencyHz[best]! - f)) best = i;
  return best;
}

/** The lowest judged margin at one grid point over the comparisons that cover it. */
function marginAtPoint(evaluator: MarginEvaluator, outcome: { marginDb: readonly Float64Array[] }, k: number): number {
  let lowest = Number.POSITIVE_INFINITY;
  evaluator.comparisons.forEach((info, c) => {
    const i = k - info.offset;
    if (i >= 0 && i < info.count && info.judged[i]) lowest = Math.min(lowest, outcome.marginDb[c]![i]!);
  });
  return Number.isFinite(lowest) ? lowest : Number.NaN;
}

export function formatHz(f: number): string {
  if (!Number.isFinite(f)) return '–';
  return f >= 1e6 ? `${(f / 1e6).toPrecision(4)} MHz` : f >= 1e3 ? `${(f / 1e3).toPrecision(4)} kHz` : `${f.toPrecision(4)} Hz`;
}
