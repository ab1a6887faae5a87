import { compileNetwork, evaluateNetworkOnce, sweepDesign, type SweepResult } from '../../engine/index.ts';
import type { Design, FilterElement } from '../../model/design.ts';
import { allElements, editElements, readValue, type ValueQuantity, withTargetValue } from '../design-edit/part-values.ts';
import type { Mode } from '../limiting-mode/limiting-mode.ts';
import { ProgressCounter, type Steps } from '../run/steps.ts';

/**
 * Every resonance in circuit (docs/assistants.md, "Resonances and damping"):
 *
 * - part self-resonances, from the engine's reactance sign changes of each part's impedance (each
 *   mode of a choke);
 * - filter resonances: local minima of the in-circuit insertion loss (the filter between the
 *   design's own noise source and receivers), per mode, at least 3 dB deep or below 0 dB (a gain),
 *   located to 0.1 % in frequency.
 *
 * The parts responsible for a filter resonance come from the sensitivity of its frequency to each
 * part value, S = ∂ln f / ∂ln p, by a central difference of ±2 % on every value of every part
 * (capacitance, inductance, a choke's leakage, resistance, a capacitor's ESL, a winding
 * capacitance): an LC pair gives S = −½ for both, a part that does not take part gives 0, and for
 * any resonance of inductances with capacitances the sensitivities add up to −1. Nothing is guessed
 * from names.
 */

/** A part value, or one of the parasitics that set self-resonances. */
export type PerturbedQuantity = ValueQuantity | 'esl' | 'winding-capacitance';

export interface Sensitivity {
  readonly elementId: string;
  readonly label: string;
  readonly quantity: PerturbedQuantity;
  /** ∂ln f / ∂ln p. */
  readonly frequencySensitivity: number;
  /** ∂(insertion loss at the dip, dB) / ∂ln p. */
  readonly depthSensitivityDb: number;
}

export interface FilterResonance {
  readonly kind: 'filter';
  readonly mode: Mode;
  readonly frequencyHz: number;
  /** In-circuit insertion loss at the dip, dB; negative is a gain (the filter makes it worse). */
  readonly insertionLossDb: number;
  /** How far the dip lies below the lower of the highest points within half a decade on either side, dB. */
  readonly depthDb: number;
  /** Parts whose value moves it, |S| ≥ 0.05, largest first. */
  readonly responsible: readonly Sensitivity[];
}

export interface PartResonance {
  readonly kind: 'part';
  readonly elementId: string;
  readonly label: string;
  readonly view: 'impedance' | 'common-mode' | 'differential-mode';
  readonly type: 'series' | 'parallel';
  readonly frequencyHz: number;
}

export interface ResonanceReport {
  readonly filter: readonly FilterResonance[];
  readonly parts: readonly PartResonance[];
}

export interface ResonanceOptions {
  /** Dips shallower than this are not listed unless they are a gain (default 3 dB). */
  readonly minimumDepthDb?: number;
  /** Only within this range (default: the design's frequency plan). */
  readonly startHz?: number;
  readonly stopHz?: number;
}

const PERTURBATION = 0.02;
const HALF_DECADE = Math.sqrt(10);
const RESPONSIBLE = 0.05;

/** 10·log10 |T_bare / T_with|² per frequency, in one mode: the in-circuit insertion loss. */
export function inCircuitLossDb(design: Design, frequencyHz: Float64Array, mode: Mode): Float64Array {
  const response = evaluateNetworkOnce(compileNetwork(design, []), frequencyHz);
  const out = new Float64Array(frequencyHz.length);
  const t = mode === 'common-mode' ? response.cmFromCm : response.dmFromDm;
  const bare = mode === 'common-mode' ? response.bareCmFromCm : response.bareDmFromDm;
  for (let i = 0; i < out.length; i += 1) {
    const with2 = t.re[i]! * t.re[i]! + t.im[i]! * t.im[i]!;
    const without2 = bare.re[i]! * bare.re[i]! + bare.im[i]! * bare.im[i]!;
    out[i] = with2 === 0 ? 400 : 10 * Math.log10(without2 / with2);
  }
  return out;
}

/** The lowest in-circuit loss between two frequencies, to 0.1 % in frequency: three zooms of a 41-point log grid. */
export function locateDip(design: Design, mode: Mode, lowHz: number, highHz: number): { frequencyHz: number; insertionLossDb: number } {
  let low = lowHz;
  let high = highHz;
  let best = { frequencyHz: Math.sqrt(lowHz * highHz), insertionLossDb: Number.POSITIVE_INFINITY };
  for (let pass = 0; pass < 3; pass += 1) {
    const n = 41;
    const grid = Float64Array.from({ length: n }, (_, k) => low * (high / low) ** (k / (n - 1)));
    const loss = inCircuitLossDb(design, grid, mode);
    let at = 0;
    for (let k = 1; k < n; k += 1) if (loss[k]! < loss[at]!) at = k;
    best = { frequencyHz: grid[at]!, insertionLossDb: loss[at]! };
    low = grid[Math.max(0, at - 1)]!;
    high = grid[Math.min(n - 1, at + 1)]!;
  }
  return best;
}

export function* findResonances(design: Design, options: ResonanceOptions = {}): Steps<ResonanceReport> {
  const sweep = sweepDesign(design);
  const start = options.startHz ?? design.frequencyPlan.startHz;
  const stop = options.stopHz ?? design.frequencyPlan.stopHz;
  const minimumDepth = options.minimumDepthDb ?? 3;
  const parts: PartResonance[] = sweep.elements.flatMap((element) =>
    element.views.flatMap((view) =>
      view.selfResonances
        .filter((r) => r.frequencyHz >= start && r.frequencyHz <= stop)
        .map((r): PartResonance => ({ kind: 'part', elementId: element.id, label: element.label, view: view.name, type: r.type, frequencyHz: r.frequencyHz })),
    ),
  );

  const dips = (['common-mode', 'differential-mode'] as const).flatMap((mode) => dipsOf(sweep, mode, start, stop, minimumDepth).map((dip) => ({ mode, ...dip })));
  const values = perturbableValues(design);
  const progress = new ProgressCounter(Math.max(1, dips.length * values.length), 'finding the parts behind each resonance');
  const filter: FilterResonance[] = [];
  for (const dip of dips) {
    const located = locateDip(design, dip.mode, dip.lowHz, dip.highHz);
    const window = (f: number): [number, number] => [f / 1.15, f * 1.15];
    const sensitivities: Sensitivity[] = [];
    for (const value of values) {
      const up = perturbed(design, value, 1 + PERTURBATION);
      const down = perturbed(design, value, 1 - PERTURBATION);
      yield progress.step();
      if (!up || !down) continue;
      const a = locateDip(up, dip.mode, ...window(located.frequencyHz));
      const b = locateDip(down, dip.mode, ...window(located.frequencyHz));
      const span = Math.log((1 + PERTURBATION) / (1 - PERTURBATION));
      sensitivities.push({
        elementId: value.elementId,
        label: value.label,
        quantity: value.quantity,
        frequencySensitivity: Math.log(a.frequencyHz / b.frequencyHz) / span,
        depthSensitivityDb: (a.insertionLossDb - b.insertionLossDb) / span,
      });
    }
    filter.push({
      kind: 'filter',
      mode: dip.mode,
      frequencyHz: located.frequencyHz,
      insertionLossDb: located.insertionLossDb,
      depthDb: dip.depthDb + (dip.valueDb - located.insertionLossDb),
      responsible: sensitivities.filter((s) => Math.abs(s.frequencySensitivity) >= RESPONSIBLE).sort((x, y) => Math.abs(y.frequencySensitivity) - Math.abs(x.frequencySensitivity)),
    });
  }
  filter.sort((a, b) => a.frequencyHz - b.frequencyHz);
  return { filter, parts };
}

/** Only the value itself moves: winding capacitance and leakage (henries) held, so each sensitivity is one part value's. */
const SENSITIVITY_SCALING = { windingCapacitance: 'keep', leakage: 'fixed-value' } as const;

interface PerturbableValue {
  readonly elementId: string;
  readonly label: string;
  readonly quantity: PerturbedQuantity;
  readonly value: number;
}

function perturbableValues(design: Design): PerturbableValue[] {
  const out: PerturbableValue[] = [];
  for (const { element } of allElements(design)) {
    if (!element.enabled) continue;
    const label = element.label ?? element.id;
    for (const quantity of ['capacitance', 'inductance', 'leakage', 'resistance'] as const) {
      const value = readValue(element.part, quantity);
      if (value !== undefined && value > 0) out.push({ elementId: element.id, label, quantity, value });
    }
    const part = element.part;
    if (part.kind === 'capacitor' && part.esl > 0) out.push({ elementId: element.id, label, quantity: 'esl', value: part.esl });
    if ((part.kind === 'inductor' || part.kind === 'common-mode-choke') && part.windingCapacitance > 0) {
      out.push({ elementId: element.id, label, quantity: 'winding-capacitance', value: part.windingCapacitance });
    }
  }
  return out;
}

function perturbed(design: Design, value: PerturbableValue, factor: number): Design | undefined {
  if (value.quantity === 'esl' || value.quantity === 'winding-capacitance') {
    return editElements(design, new Set([value.elementId]), (element) => {
      const part = element.part;
      if (value.quantity === 'esl' && part.kind === 'capacitor') return { ...element, part: { ...part, esl: part.esl * factor } };
      if (value.quantity === 'winding-capacitance' && (part.kind === 'inductor' || part.kind === 'common-mode-choke')) {
        return { ...element, part: { ...part, windingCapacitance: part.windingCapacitance * factor } } as FilterElement;
      }
      return undefined;
    });
  }
  return withTargetValue(design, { elementIds: [value.elementId], quantity: value.quantity }, value.value * factor, SENSITIVITY_SCALING);
}

/** Local minima of a mode's in-circuit loss on the sweep's grid, deep enough, with a bracket around each. */
function dipsOf(sweep: SweepResult, mode: Mode, startHz: number, stopHz: number, minimumDepthDb: number): { lowHz: number; highHz: number; valueDb: number; depthDb: number }[] {
  const f = sweep.frequencyHz;
  const il = mode === 'common-mode' ? sweep.columns.insertionLossInCircuitCm : sweep.columns.insertionLossInCircuitDm;
  const out: { lowHz: number; highHz: number; valueDb: number; depthDb: number }[] = [];
  for (let i = 1; i + 1 < f.length; i += 1) {
    if (f[i]! < startHz || f[i]! > stopHz) continue;
    if (!(il[i]! < il[i - 1]! && il[i]! <= il[i + 1]!)) continue;
    // Depth: below the lower of the highest points within half a decade on either side.
    let left = il[i]!;
    for (let j = i - 1; j >= 0 && f[j]! >= f[i]! / HALF_DECADE; j -= 1) left = Math.max(left, il[j]!);
    let right = il[i]!;
    for (let j = i + 1; j < f.length && f[j]! <= f[i]! * HALF_DECADE; j += 1) right = Math.max(right, il[j]!);
    const depthDb = Math.min(left, right) - il[i]!;
    if (depthDb >= minimumDepthDb || il[i]! < 0) out.push({ lowHz: f[i - 1]!, highHz: f[i + 1]!, valueDb: il[i]!, depthDb });
  }
  return out;
}
