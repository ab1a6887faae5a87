import { sweepDesign, type SweepResult } from '../../engine/index.ts';
import type { Design, FilterElement } from '../../model/design.ts';
import { allElements, locateElement, readValue } from '../design-edit/part-values.ts';
import { AssistInputError, type AssistProblem } from '../margin/assist-problem.ts';
import { compileMarginEvaluator } from '../margin/margin-evaluator.ts';
import { findResonances, type FilterResonance, locateDip, type ResonanceReport } from '../resonance/resonances.ts';
import { ProgressCounter, type Steps } from '../run/steps.ts';
import { dampedPeakFrequency, dampedPeakImpedance, optimalDampingQ } from './optimal-damping.ts';

/**
 * A damping leg for one differential-mode filter resonance (docs/assistants.md, "Damping"):
 *
 * - parallel R–C_b across the filter capacitor that the resonance depends on most (the line-to-line
 *   capacitor with the largest frequency sensitivity). The section's C is that capacitor, its
 *   effective L = 1/((2π f0)²·C) from the located resonance, R0 = √(L/C) = 1/(2π f0 C); with
 *   C_b = n·C the resistance is Erickson & Maksimović's optimum R = R0·Q_opt(n), and the predicted
 *   peak output impedance R0·√(2(2+n))/n (optimal-damping.ts). Placed across the lines right after
 *   that capacitor.
 * - series R–L_b (R ∥ L_b in series with each line, right after the inductive part the resonance
 *   depends on most): L_b = n·L/2 per line; no closed form is used for R, which is chosen by a
 *   golden-section search on log R minimising the resonance's peak output impedance with the engine.
 *
 * The result carries the design with the leg added (a new variant, the document as is) and the
 * in-circuit DM insertion loss and DM output impedance before and after, and, with noise, the margin.
 */

export interface DampingOptions {
  /** 'parallel-rc' (default) or 'series-rl'. */
  readonly leg?: 'parallel-rc' | 'series-rl';
  /** n = C_b/C (parallel R–C) or L_b/L (series R–L); default 2. */
  readonly ratio?: number;
  /** Which resonance: the DM filter resonance nearest this frequency (default: the one with the lowest insertion loss). */
  readonly resonanceHz?: number;
}

export interface DampingCurves {
  readonly frequencyHz: Float64Array;
  readonly insertionLossDmDb: Float64Array;
  readonly outputImpedanceDmOhm: Float64Array;
}

export interface DampingSuggestion {
  readonly resonance: FilterResonance;
  readonly leg: 'parallel-rc' | 'series-rl';
  /** The part the leg is placed beside. */
  readonly besideElementId: string;
  readonly ratio: number;
  /** The undamped section as the engine's resonance gives it. */
  readonly sectionCapacitanceF: number;
  readonly sectionInductanceH: number;
  readonly characteristicOhm: number;
  readonly resistanceOhm: number;
  /** C_b (parallel R–C) or L_b per line (series R–L). */
  readonly legValue: number;
  /** Closed-form peak output impedance and its frequency (parallel R–C only; NaN otherwise). */
  readonly predictedPeakOhm: number;
  readonly predictedPeakHz: number;
  /** The highest DM output impedance (seen from the converter) near the resonance, before and after. */
  readonly peakBeforeOhm: number;
  readonly peakAfterOhm: number;
  /** The in-circuit DM insertion loss at the bottom of the dip, before and after (dB). */
  readonly dipBeforeDb: number;
  readonly dipAfterDb: number;
  readonly addedElementIds: readonly string[];
  /** The design with the leg: apply it as a new variant. */
  readonly design: Design;
  readonly before: DampingCurves;
  readonly after: DampingCurves;
  /** With noise: the worst margin before and after (dB). */
  readonly marginBeforeDb: number | undefined;
  readonly marginAfterDb: number | undefined;
  readonly notes: readonly string[];
}

export interface DampingReport {
  readonly resonances: ResonanceReport;
  readonly suggestion: DampingSuggestion | undefined;
  readonly notes: readonly string[];
}

export function* suggestDamping(design: Design, options: DampingOptions = {}, problem?: AssistProblem): Steps<DampingReport> {
  const resonances = yield* findResonances(design);
  const notes: string[] = [];
  const dm = resonances.filter.filter((r) => r.mode === 'differential-mode');
  if (dm.length === 0) {
    notes.push('no differential-mode filter resonance to damp');
    if (resonances.filter.some((r) => r.mode === 'common-mode')) {
      notes.push('common-mode resonances: an R–C leg to earth would add leakage current; damp them with a lossy choke core or a series resistance instead');
    }
    return { resonances, suggestion: undefined, notes };
  }
  // The resonance asked for; else, with noise, the one nearest the worst margin; else the lowest loss.
  const near = options.resonanceHz ?? (problem ? compileMarginEvaluator(problem).evaluate(design).worstFrequencyHz : undefined);
  const target =
    near === undefined || !Number.isFinite(near)
      ? dm.reduce((a, b) => (b.insertionLossDb < a.insertionLossDb ? b : a))
      : dm.reduce((a, b) => (Math.abs(Math.log(b.frequencyHz / near)) < Math.abs(Math.log(a.frequencyHz / near)) ? b : a));
  if (near !== undefined && options.resonanceHz === undefined) notes.push(`damping the differential-mode resonance nearest the worst margin (${Math.round(near)} Hz)`);
  const suggestion = yield* dampOne(design, target, options, problem);
  return { resonances, suggestion, notes };
}

function* dampOne(design: Design, resonance: FilterResonance, options: DampingOptions, problem: AssistProblem | undefined): Steps<DampingSuggestion> {
  const leg = options.leg ?? 'parallel-rc';
  const n = options.ratio ?? 2;
  if (!(n > 0)) throw new AssistInputError('the damping ratio n must be above zero');
  const progress = new ProgressCounter(24, 'sizing the damping leg');
  // The capacitor across the lines the resonance depends on most.
  const capacitor = resonance.responsible.find((s) => s.quantity === 'capacitance' && lineToLineCapacitor(design, s.elementId));
  if (!capacitor) throw new AssistInputError('the resonance does not depend on any capacitor across the lines: no R–C leg can be placed for it');
  const c = readValue(locateElement(design, capacitor.elementId)!.element.part, 'capacitance')!;
  const omega = 2 * Math.PI * resonance.frequencyHz;
  const l = 1 / (omega * omega * c);
  const r0 = Math.sqrt(l / c);
  const notes: string[] = [];

  let changed: Design;
  let added: string[];
  let resistance: number;
  let legValue: number;
  let beside: string;
  if (leg === 'parallel-rc') {
    resistance = r0 * optimalDampingQ(n);
    legValue = n * c;
    beside = capacitor.elementId;
    const id = freeId(design, 'RD');
    ({ design: changed } = insertAfter(design, beside, [{ id, label: `${id} damping ${formatOhm(resistance)} + C_b`, placement: 'line-to-line', enabled: true, part: { kind: 'damping-rc', resistance, capacitance: legValue } }]));
    added = [id];
  } else {
    const inductive = resonance.responsible.find((s) => s.quantity === 'leakage' || (s.quantity === 'inductance' && locateElement(design, s.elementId)?.element.part.kind === 'inductor'));
    if (!inductive) throw new AssistInputError('the resonance does not depend on a line inductance or a choke leakage: no series R–L leg can be placed for it');
    beside = inductive.elementId;
    legValue = (n * l) / 2;
    const first = freeId(design, 'RLD');
    const ids = [first, freeId(design, 'RLD', [first])];
    const build = (r: number): Design =>
      insertAfter(design, beside, [
        { id: ids[0]!, label: `${ids[0]} damping R ∥ L_b, line 1`, placement: 'series-line1', enabled: true, part: { kind: 'damping-rl', resistance: r, inductance: legValue } },
        { id: ids[1]!, label: `${ids[1]} damping R ∥ L_b, line 2`, placement: 'series-line2', enabled: true, part: { kind: 'damping-rl', resistance: r, inductance: legValue } },
      ]).design;
    // Golden-section on log R over R0/30 … 30·R0: the shallowest dip of the in-circuit loss near the resonance.
    let low = Math.log(r0 / 30);
    let high = Math.log(r0 * 30);
    const golden = (Math.sqrt(5) - 1) / 2;
    const peakOf = (logR: number): number => -dipNear(build(Math.exp(logR)), resonance.frequencyHz);
    let x1 = high - golden * (high - low);
    let x2 = low + golden * (high - low);
    let f1 = peakOf(x1);
    let f2 = peakOf(x2);
    for (let step = 0; step < 22; step += 1) {
      if (f1 < f2) {
        high = x2;
        x2 = x1;
        f2 = f1;
        x1 = high - golden * (high - low);
        f1 = peakOf(x1);
      } else {
        low = x1;
        x1 = x2;
        f1 = f2;
        x2 = low + golden * (high - low);
        f2 = peakOf(x2);
      }
      yield progress.step();
    }
    resistance = Math.exp((low + high) / 2);
    changed = build(resistance);
    added = ids;
    notes.push('series R–L leg: R chosen by the engine (the highest insertion loss at the bottom of the dip); no closed form is used');
  }

  const beforeSweep = sweepDesign(design);
  const afterSweep = sweepDesign(changed);
  yield progress.step();
  let marginBeforeDb: number | undefined;
  let marginAfterDb: number | undefined;
  if (problem) {
    const evaluator = compileMarginEvaluator(problem);
    marginBeforeDb = evaluator.evaluate(design).worstMarginDb;
    marginAfterDb = evaluator.evaluate(changed).worstMarginDb;
  }
  notes.push('a damping resistor dissipates little at mains frequency when it sits in series with C_b, but check its pulse and voltage rating, and that C_b is X-rated across the mains');
  return {
    resonance,
    leg,
    besideElementId: beside,
    ratio: n,
    sectionCapacitanceF: c,
    sectionInductanceH: l,
    characteristicOhm: r0,
    resistanceOhm: resistance,
    legValue,
    predictedPeakOhm: leg === 'parallel-rc' ? dampedPeakImpedance(r0, n) : Number.NaN,
    predictedPeakHz: leg === 'parallel-rc' ? dampedPeakFrequency(resonance.frequencyHz, n) : Number.NaN,
    peakBeforeOhm: peakNear(design, resonance.frequencyHz),
    peakAfterOhm: peakNear(changed, resonance.frequencyHz),
    dipBeforeDb: dipNear(design, resonance.frequencyHz),
    dipAfterDb: dipNear(changed, resonance.frequencyHz),
    addedElementIds: added,
    design: changed,
    before: curvesOf(beforeSweep),
    after: curvesOf(afterSweep),
    marginBeforeDb,
    marginAfterDb,
    notes,
  };
}

function lineToLineCapacitor(design: Design, id: string): boolean {
  const location = locateElement(design, id);
  return location !== undefined && location.element.placement === 'line-to-line' && location.element.part.kind === 'capacitor';
}

function curvesOf(sweep: SweepResult): DampingCurves {
  return { frequencyHz: sweep.frequencyHz, insertionLossDmDb: sweep.columns.insertionLossInCircuitDm, outputImpedanceDmOhm: sweep.columns.inputImpedanceDmOhm };
}

/** The largest DM input impedance (seen from the converter) within a factor 3 of a frequency, on a dense local grid. */
export function peakNear(design: Design, frequencyHz: number): number {
  const sweep = sweepDesign({ ...design, frequencyPlan: { startHz: frequencyHz / 3, stopHz: frequencyHz * 3, pointsPerDecade: 2000 } }, { refine: false });
  let peak = 0;
  for (const z of sweep.columns.inputImpedanceDmOhm) if (z > peak) peak = z;
  return peak;
}

/** The lowest in-circuit DM loss within a factor 1.5 of a frequency. */
export function dipNear(design: Design, frequencyHz: number): number {
  return locateDip(design, 'differential-mode', frequencyHz / 1.5, frequencyHz * 1.5).insertionLossDb;
}

/** The first free id "RD1", "RD2", … */
function freeId(design: Design, prefix: string, taken: readonly string[] = []): string {
  const used = new Set([...allElements(design).map((l) => l.element.id), ...taken]);
  for (const stage of design.stages) used.add(stage.id);
  for (let k = 1; ; k += 1) if (!used.has(`${prefix}${k}`)) return `${prefix}${k}`;
}

function insertAfter(design: Design, id: string, elements: FilterElement[]): { design: Design } {
  const location = locateElement(design, id)!;
  const stages = design.stages.map((stage, s) => {
    if (s !== location.stageIndex) return stage;
    const list = [...stage.elements];
    list.splice(location.elementIndex + 1, 0, ...elements);
    return { ...stage, elements: list };
  });
  return { design: { ...design, stages } };
}

function formatOhm(r: number): string {
  return `${r.toPrecision(3)} Ω`;
}
