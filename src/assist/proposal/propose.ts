import type { Design, FilterElement, Stage } from '../../model/design.ts';
import { AssistInputError, type AssistProblem } from '../margin/assist-problem.ts';
import { compileMarginEvaluator } from '../margin/margin-evaluator.ts';
import { ProgressCounter, type Steps } from '../run/steps.ts';
import { maximumYCapacitance } from '../sizing/leakage-limit.ts';
import { PREFERRED_SERIES, type PreferredSeries, snapDown, snapUp } from '../sizing/preferred-values.ts';
import { converterStability, type StabilityResult } from '../stability/stability.ts';

/**
 * A proposed filter (docs/assistants.md, "A proposed filter"): from the noise, the limits, the
 * target margin and the constraints, up to three filters of different topology that keep the
 * margin with the least total inductance, every one checked by the engine.
 *
 * Search: for each topology (1 to maxStages common-mode stages, the DM inductance from each choke's
 * leakage or from a pair of line inductors), the Y capacitance is the largest preferred value the
 * leakage limit allows (more Y is more CM attenuation for free), every X capacitor takes one value
 * from the series over 47 nF … 4.7 µF, and for each X value the smallest preferred choke inductance
 * (all chokes alike) over 10 µH … 47 mH that keeps the margin is found by walking the series from the
 * previous X value's answer (X from the largest down, so the answer only grows; each probe a full
 * engine evaluation; the walk stops at the first failing value below). The candidates are ranked by total
 * inductance, then total capacitance; the best of each topology is checked for converter stability
 * when a converter is given, and the best three topologies are returned.
 *
 * New parts get default parasitics by stated models (common practice, no source): a choke's
 * winding capacitance 5 pF·√(L/1 mH) (C_w ∝ N with L ∝ N²), its leakage 1 % of L, its DC resistance
 * 50 mΩ·√(L/1 mH); a line inductor 3 pF·√(L/100 µH) and 20 mΩ·√(L/100 µH); X capacitors 15 nH
 * and 20 mΩ, Y capacitors 5 nH and 0.2 Ω.
 */

export interface ProposalConstraints {
  /** The touch/leakage-current limit, A, with the highest line voltage and frequency; absent: Y capacitors of 2.2 nF per line. */
  readonly leakage?: { readonly leakageLimitA: number; readonly lineVoltageV: number; readonly lineFrequencyHz: number; readonly tolerance?: number };
  /** At most this many CM stages (default 2, 1 to 3). */
  readonly maxStages?: number;
  /** The converter behind the filter: its output impedance must stay `stabilityMarginDb` below V²/P. */
  readonly converter?: { readonly lowestInputVoltageV: number; readonly highestInputPowerW: number; readonly stabilityMarginDb?: number };
  readonly series?: PreferredSeries;
  /** Parts the user has chosen already: every choke, every X capacitor or the Y capacitors take this value. */
  readonly fixed?: { readonly chokeInductanceH?: number; readonly xCapacitanceF?: number; readonly yCapacitanceF?: number };
}

export interface ProposedPart {
  readonly elementId: string;
  readonly role: 'X capacitor' | 'Y capacitor' | 'CM choke' | 'DM inductor';
  readonly value: number;
  readonly unit: 'F' | 'H';
}

export interface Proposal {
  readonly topology: string;
  readonly description: string;
  readonly stages: number;
  readonly parts: readonly ProposedPart[];
  /** Σ choke inductance + Σ line inductance, H: the proxy for size and cost. */
  readonly totalInductanceH: number;
  readonly totalCapacitanceF: number;
  readonly marginDb: number;
  readonly worstFrequencyHz: number;
  readonly yPerLineF: number;
  readonly stability: StabilityResult | undefined;
  /** The whole design with the proposed stages: apply it as a new variant. */
  readonly design: Design;
}

export interface ProposalReport {
  readonly proposals: readonly Proposal[];
  readonly evaluations: number;
  readonly targetMarginDb: number;
  readonly notes: readonly string[];
}

interface Topology {
  readonly id: string;
  readonly stages: number;
  readonly dmInductors: boolean;
  readonly description: string;
}

const X_RANGE: readonly [number, number] = [47e-9, 4.7e-6];
const L_RANGE: readonly [number, number] = [10e-6, 47e-3];
const DM_INDUCTANCE_RATIO = 0.05;

function seriesValues(series: PreferredSeries, low: number, high: number): number[] {
  const out: number[] = [];
  for (let decade = Math.floor(Math.log10(low)) - 1; decade <= Math.ceil(Math.log10(high)); decade += 1) {
    for (const mantissa of PREFERRED_SERIES[series]) {
      const value = decade >= 0 ? mantissa * 10 ** decade : mantissa / 10 ** -decade;
      if (value >= low * (1 - 1e-9) && value <= high * (1 + 1e-9)) out.push(value);
    }
  }
  return out;
}

function topologies(maxStages: number): Topology[] {
  const out: Topology[] = [];
  for (let stages = 1; stages <= maxStages; stages += 1) {
    for (const dmInductors of [false, true]) {
      out.push({
        id: `${stages}-stage${dmInductors ? '-dm-inductors' : ''}`,
        stages,
        dmInductors,
        description: `${stages} CM stage${stages > 1 ? 's' : ''} (X capacitor, ${stages > 1 ? 'then per stage ' : ''}CM choke and X capacitor; Y capacitors at the converter side)${dmInductors ? ', with a line inductor pair at the converter side for DM' : ', DM inductance from the chokes’ leakage'}`,
      });
    }
  }
  return out;
}

function chokePart(inductance: number): FilterElement['part'] {
  const scale = Math.sqrt(inductance / 1e-3);
  return {
    kind: 'common-mode-choke',
    inductance,
    coupling: { kind: 'leakage-inductance', leakageInductance: 0.01 * inductance },
    dcr: 0.05 * scale,
    windingCapacitance: 5e-12 * scale,
    permeability: { kind: 'constant' },
  };
}

function capacitorPart(capacitance: number, role: 'X' | 'Y'): FilterElement['part'] {
  return role === 'X'
    ? { kind: 'capacitor', capacitance, esr: 0.02, esl: 15e-9, safetyClass: 'X2' }
    : { kind: 'capacitor', capacitance, esr: 0.2, esl: 5e-9, safetyClass: 'Y2' };
}

function inductorPart(inductance: number): FilterElement['part'] {
  const scale = Math.sqrt(inductance / 100e-6);
  return { kind: 'inductor', inductance, dcr: 0.02 * scale, windingCapacitance: 3e-12 * scale, coreLoss: { kind: 'none' }, permeability: { kind: 'constant' } };
}

const element = (id: string, placement: FilterElement['placement'], part: FilterElement['part'], label: string): FilterElement => ({ id, label, placement, enabled: true, part });

/** The stages of a topology with its values, converter side first. */
function buildStages(topology: Topology, chokeH: number, xF: number, yF: number, series: PreferredSeries): { stages: Stage[]; parts: ProposedPart[] } {
  const parts: ProposedPart[] = [];
  const stages: Stage[] = [];
  for (let s = 1; s <= topology.stages; s += 1) {
    const elements: FilterElement[] = [];
    if (s === 1) {
      elements.push(element('CX1', 'line-to-line', capacitorPart(xF, 'X'), 'CX1 X2'));
      parts.push({ elementId: 'CX1', role: 'X capacitor', value: xF, unit: 'F' });
      if (topology.dmInductors) {
        const dm = snapUp(DM_INDUCTANCE_RATIO * chokeH, series);
        elements.push(element('LD1', 'series-line1', inductorPart(dm), 'LD1 line 1'), element('LD2', 'series-line2', inductorPart(dm), 'LD2 line 2'));
        parts.push({ elementId: 'LD1', role: 'DM inductor', value: dm, unit: 'H' }, { elementId: 'LD2', role: 'DM inductor', value: dm, unit: 'H' });
      }
      elements.push(element('CY1', 'line1-to-ground', capacitorPart(yF, 'Y'), 'CY1 Y2 (line 1)'), element('CY2', 'line2-to-ground', capacitorPart(yF, 'Y'), 'CY2 Y2 (line 2)'));
      parts.push({ elementId: 'CY1', role: 'Y capacitor', value: yF, unit: 'F' }, { elementId: 'CY2', role: 'Y capacitor', value: yF, unit: 'F' });
    }
    elements.push(element(`LCM${s}`, 'both-lines-coupled', chokePart(chokeH), `LCM${s} CM choke`));
    parts.push({ elementId: `LCM${s}`, role: 'CM choke', value: chokeH, unit: 'H' });
    elements.push(element(`CX${s + 1}`, 'line-to-line', capacitorPart(xF, 'X'), `CX${s + 1} X2`));
    parts.push({ elementId: `CX${s + 1}`, role: 'X capacitor', value: xF, unit: 'F' });
    stages.push({ id: `stage${s}`, label: s === 1 ? `Stage 1, converter side` : `Stage ${s}`, elements });
  }
  return { stages, parts };
}

export function* proposeFilters(problem: AssistProblem, constraints: ProposalConstraints = {}): Steps<ProposalReport> {
  const maxStages = constraints.maxStages ?? 2;
  if (!(Number.isInteger(maxStages) && maxStages >= 1 && maxStages <= 3)) throw new AssistInputError('the number of stages is 1, 2 or 3');
  const series = constraints.series ?? 'E6';
  const evaluator = compileMarginEvaluator(problem);
  const notes: string[] = evaluator.coverage.reasons.map((reason) => `${reason}: no filter can pass until this band is covered`);

  let yF: number;
  if (constraints.fixed?.yCapacitanceF !== undefined) yF = constraints.fixed.yCapacitanceF;
  else if (constraints.leakage) {
    const limit = maximumYCapacitance(constraints.leakage.leakageLimitA, constraints.leakage.lineVoltageV, constraints.leakage.lineFrequencyHz, constraints.leakage.tolerance ?? 0.1);
    yF = snapDown(limit, series);
    notes.push(`Y capacitors: the largest ${series} value the leakage limit allows per line, ${(yF * 1e9).toPrecision(3)} nF (limit ${(limit * 1e9).toPrecision(4)} nF)`);
  } else {
    yF = 2.2e-9;
    notes.push('no leakage-current limit given: Y capacitors of 2.2 nF per line were assumed; give the limit to size them');
  }
  const xValues = constraints.fixed?.xCapacitanceF !== undefined ? [constraints.fixed.xCapacitanceF] : seriesValues(series, X_RANGE[0], X_RANGE[1]);
  const lValues = constraints.fixed?.chokeInductanceH !== undefined ? [constraints.fixed.chokeInductanceH] : seriesValues(series, L_RANGE[0], L_RANGE[1]);
  const tops = topologies(maxStages);
  const progress = new ProgressCounter(tops.length * (xValues.length * 3 + lValues.length) + tops.length, 'searching the filters');
  let evaluations = 0;

  const judge = (topology: Topology, chokeH: number, xF: number): { marginDb: number; worstFrequencyHz: number; pass: boolean } => {
    const { stages } = buildStages(topology, chokeH, xF, yF, series);
    const outcome = evaluator.evaluate({ ...problem.design, stages });
    evaluations += 1;
    return { marginDb: outcome.worstMarginDb, worstFrequencyHz: outcome.worstFrequencyHz, pass: evaluator.meetsTarget(outcome) };
  };

  interface Candidate {
    readonly topology: Topology;
    readonly chokeH: number;
    readonly xF: number;
    readonly marginDb: number;
    readonly worstFrequencyHz: number;
    readonly totalInductanceH: number;
    readonly totalCapacitanceF: number;
  }
  const best = new Map<string, Candidate[]>();
  for (const topology of tops) {
    const found: Candidate[] = [];
    // X values from the largest down: the inductance needed only grows, so each search starts from
    // the previous answer and walks (a few probes) instead of bisecting from scratch.
    let start = lValues.length - 1;
    for (const xF of [...xValues].reverse()) {
      let high = start;
      let atHigh = judge(topology, lValues[high]!, xF);
      yield progress.step();
      while (!atHigh.pass && high < lValues.length - 1) {
        high = Math.min(lValues.length - 1, high + 2);
        atHigh = judge(topology, lValues[high]!, xF);
        yield progress.step();
      }
      if (!atHigh.pass) break;
      while (high > 0) {
        const probe = judge(topology, lValues[high - 1]!, xF);
        yield progress.step();
        if (!probe.pass) break;
        high -= 1;
        atHigh = probe;
      }
      start = high;
      const chokeH = lValues[high]!;
      const chokes = topology.stages * chokeH;
      const dm = topology.dmInductors ? 2 * snapUp(DM_INDUCTANCE_RATIO * chokeH, series) : 0;
      found.push({
        topology,
        chokeH,
        xF,
        marginDb: atHigh.marginDb,
        worstFrequencyHz: atHigh.worstFrequencyHz,
        totalInductanceH: chokes + dm,
        totalCapacitanceF: (topology.stages + 1) * xF + 2 * yF,
      });
    }
    found.sort((a, b) => a.totalInductanceH - b.totalInductanceH || a.totalCapacitanceF - b.totalCapacitanceF);
    best.set(topology.id, found);
  }

  // The best candidate of each topology that also keeps the converter stable, then the best three.
  const chosen: Proposal[] = [];
  for (const topology of tops) {
    progress.enter('checking the best of each topology');
    for (const candidate of best.get(topology.id) ?? []) {
      const { stages, parts } = buildStages(topology, candidate.chokeH, candidate.xF, yF, series);
      const design: Design = { ...problem.design, name: `${problem.design.name} (proposed: ${topology.id})`, stages };
      let stability: StabilityResult | undefined;
      if (constraints.converter) {
        stability = yield* converterStability(design, {
          lowestInputVoltageV: constraints.converter.lowestInputVoltageV,
          highestInputPowerW: constraints.converter.highestInputPowerW,
          requiredMarginDb: constraints.converter.stabilityMarginDb ?? 6,
        });
        if (!stability.pass) continue;
      }
      chosen.push({
        topology: topology.id,
        description: topology.description,
        stages: topology.stages,
        parts,
        totalInductanceH: candidate.totalInductanceH,
        totalCapacitanceF: candidate.totalCapacitanceF,
        marginDb: candidate.marginDb,
        worstFrequencyHz: candidate.worstFrequencyHz,
        yPerLineF: yF,
        stability,
        design,
      });
      break;
    }
    yield progress.step();
  }
  chosen.sort((a, b) => a.totalInductanceH - b.totalInductanceH || a.totalCapacitanceF - b.totalCapacitanceF);
  if (chosen.length === 0) notes.push(`no filter of up to ${maxStages} stage${maxStages > 1 ? 's' : ''} with these parts keeps the target margin${constraints.converter ? ' and the converter stable' : ''}`);
  notes.push('X capacitors above 0.1 µF need a discharge resistor (see the safety checks); use X- and Y-class safety capacitors only');
  return { proposals: chosen.slice(0, 3), evaluations, targetMarginDb: problem.targetMarginDb, notes };
}

