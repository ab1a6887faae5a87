import type { Design } from '../../model/design.ts';
import { allElements, editElements, readValue, writeValue } from '../design-edit/part-values.ts';
import { AssistInputError, type AssistProblem } from '../margin/assist-problem.ts';
import { compileMarginEvaluator } from '../margin/margin-evaluator.ts';
import type { Steps } from '../run/steps.ts';
import { leakageCurrent, maximumYCapacitance } from './leakage-limit.ts';

/**
 * The largest total Y capacitance a chosen leakage-current limit allows (references.md §9):
 * C_Y,max = I / (2π·f·V·(1 + tol)) at the highest line voltage and frequency and the capacitors'
 * upper tolerance. What counts is the capacitance from one line to earth, in the normal condition
 * (one line live to the touched or earthed part): the line with the most capacitance to ground, all
 * stages added. Some fault conditions and some standards count both lines; the standard decides.
 * With every Y capacitor scaled so that the larger line total sits at that limit, the design is
 * judged once more with the engine: the margin the leakage limit leaves room for.
 */

export interface YCapacitanceOptions {
  /** The touch/leakage-current limit, A (e.g. 0.75e-3 for a class I portable appliance). */
  readonly leakageLimitA: number;
  /** Default: design.operating.supply (ac-mains). */
  readonly lineVoltageV?: number;
  readonly lineFrequencyHz?: number;
  /** Upper tolerance of the Y capacitors as a fraction (default: their own, else 0.1). */
  readonly tolerance?: number;
}

export interface YCapacitanceResult {
  readonly leakageLimitA: number;
  readonly lineVoltageV: number;
  readonly lineFrequencyHz: number;
  readonly tolerance: number;
  /** The largest capacitance one line may have to earth, F. */
  readonly maximumPerLineF: number;
  /** The design's capacitance from each line to earth, F, and the elements that make it up. */
  readonly line1F: number;
  readonly line2F: number;
  readonly elementIds: readonly string[];
  /** Leakage current of the larger line as designed, A. */
  readonly presentLeakageA: number;
  /** maximum / present: above 1 there is room, below 1 the design exceeds the limit. */
  readonly headroomRatio: number;
  readonly presentMarginDb: number;
  /** The worst margin with every Y capacitor scaled so the larger line sits at the limit (NaN without Y capacitors). */
  readonly marginAtMaximumDb: number;
  readonly meetsTargetAtMaximum: boolean;
  readonly cautions: readonly string[];
}

export const Y_CAUTIONS: readonly string[] = [
  'use Y-class safety capacitors (IEC 60384-14) of the right subclass and voltage between line and earth, never an ordinary capacitor',
  'the leakage limit depends on the product standard and the equipment class; check it there, and at the highest rated voltage and frequency',
  'large leakage current makes a reliable protective-earth connection a safety requirement, and can trip residual-current devices',
];

export function* yCapacitance(problem: AssistProblem, options: YCapacitanceOptions): Steps<YCapacitanceResult> {
  const design = problem.design;
  const supply = design.operating?.supply;
  if (supply?.kind === 'dc' && options.lineFrequencyHz === undefined) {
    throw new AssistInputError('the supply is DC: there is no mains-frequency leakage current to limit the Y capacitance (give a line frequency to work it out anyway)');
  }
  const lineVoltageV = options.lineVoltageV ?? supply?.highestVoltage;
  const lineFrequencyHz = options.lineFrequencyHz ?? (supply?.kind === 'ac-mains' ? supply.highestFrequencyHz : undefined);
  if (lineVoltageV === undefined || lineFrequencyHz === undefined) {
    throw new AssistInputError('the leakage limit needs the highest line voltage and frequency: add operating.supply to the design or give them');
  }
  if (!(options.leakageLimitA > 0)) throw new AssistInputError('the leakage-current limit must be above zero');

  const ys = allElements(design).filter(
    (l) => l.element.enabled && l.element.part.kind === 'capacitor' && (l.element.placement === 'line1-to-ground' || l.element.placement === 'line2-to-ground'),
  );
  const sum = (placement: string): number =>
    ys.filter((l) => l.element.placement === placement).reduce((total, l) => total + (readValue(l.element.part, 'capacitance') ?? 0), 0);
  const line1F = sum('line1-to-ground');
  const line2F = sum('line2-to-ground');
  const tolerance = options.tolerance ?? Math.max(0.1, ...ys.map((l) => (l.element.tolerance?.percent ?? 10) / 100));
  const maximumPerLineF = maximumYCapacitance(options.leakageLimitA, lineVoltageV, lineFrequencyHz, tolerance);
  const larger = Math.max(line1F, line2F);
  const presentLeakageA = leakageCurrent(larger, lineVoltageV, lineFrequencyHz, tolerance);

  const evaluator = compileMarginEvaluator(problem);
  const presentMarginDb = evaluator.evaluate(design).worstMarginDb;
  yield { done: 1, total: 2, stage: 'judging the Y capacitance at the limit' };
  let marginAtMaximumDb = Number.NaN;
  let meetsTargetAtMaximum = false;
  if (larger > 0) {
    const scaled = scaleYs(design, ys.map((l) => l.element.id), maximumPerLineF / larger);
    if (scaled) {
      const outcome = evaluator.evaluate(scaled);
      marginAtMaximumDb = outcome.worstMarginDb;
      meetsTargetAtMaximum = evaluator.meetsTarget(outcome);
    }
  }
  yield { done: 2, total: 2, stage: 'judging the Y capacitance at the limit' };
  return {
    leakageLimitA: options.leakageLimitA,
    lineVoltageV,
    lineFrequencyHz,
    tolerance,
    maximumPerLineF,
    line1F,
    line2F,
    elementIds: ys.map((l) => l.element.id),
    presentLeakageA,
    headroomRatio: larger > 0 ? maximumPerLineF / larger : Number.POSITIVE_INFINITY,
    presentMarginDb,
    marginAtMaximumDb,
    meetsTargetAtMaximum,
    cautions: Y_CAUTIONS,
  };
}

function scaleYs(design: Design, ids: readonly string[], factor: number): Design | undefined {
  return editElements(design, new Set(ids), (element) => {
    const value = readValue(element.part, 'capacitance');
    const part = value === undefined ? undefined : writeValue(element.part, 'capacitance', value * factor);
    return part ? { ...element, part } : undefined;
  });
}
