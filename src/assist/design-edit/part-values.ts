import type { CommonModeChoke, Design, FilterElement, Part } from '../../model/design.ts';

/**
 * Reading and changing one value of a part, for the assistants that vary values: sizing, maps,
 * tolerances and proposals. Designs are never changed in place: every edit returns a new design
 * that shares the untouched stages and elements.
 *
 * When an inductance changes, the winding's other values follow the stated model
 * (docs/assistants.md, "When a value changes"):
 * - winding capacitance: kept, or scaled with the turns. With L ∝ N² (a fixed core) and C_w ∝ N
 *   (each turn adds a little capacitance across the winding; common practice, no source), C_w
 *   scales as √(L'/L);
 * - a choke's leakage: a fixed fraction of L (k unchanged), or a fixed value in henries.
 * DC resistance, loss resistance and a quality factor are kept.
 */

export const VALUE_QUANTITIES = ['capacitance', 'inductance', 'leakage', 'resistance'] as const;
export type ValueQuantity = (typeof VALUE_QUANTITIES)[number];

export interface ScalingModel {
  readonly windingCapacitance: 'keep' | 'scale-with-turns';
  readonly leakage: 'fixed-fraction' | 'fixed-value';
}

export const DEFAULT_SCALING: ScalingModel = { windingCapacitance: 'scale-with-turns', leakage: 'fixed-fraction' };

export const UNIT_OF: Record<ValueQuantity, 'F' | 'H' | 'Ω'> = { capacitance: 'F', inductance: 'H', leakage: 'H', resistance: 'Ω' };

/** The per-winding leakage L − M of a choke, in henries. */
export function chokeLeakage(part: CommonModeChoke): number {
  return part.coupling.kind === 'leakage-inductance' ? part.coupling.leakageInductance : part.inductance * (1 - part.coupling.couplingFactor);
}

/** The value a quantity names on a part, or undefined when the part has no such value. */
export function readValue(part: Part, quantity: ValueQuantity): number | undefined {
  switch (quantity) {
    case 'capacitance':
      return part.kind === 'capacitor' || part.kind === 'damping-rc' ? part.capacitance : undefined;
    case 'inductance':
      return part.kind === 'inductor' || part.kind === 'common-mode-choke' || part.kind === 'ferrite-bead' || part.kind === 'damping-rl'
        ? part.inductance
        : undefined;
    case 'leakage':
      return part.kind === 'common-mode-choke' ? chokeLeakage(part) : undefined;
    case 'resistance':
      return part.kind === 'resistor' || part.kind === 'damping-rc' || part.kind === 'damping-rl' || part.kind === 'ferrite-bead' ? part.resistance : undefined;
  }
}

/**
 * The part with one value changed, its winding following the scaling model; undefined when the
 * result would not be a part (a leakage at or above the inductance, a value that is not positive).
 */
export function writeValue(part: Part, quantity: ValueQuantity, value: number, scaling: ScalingModel = DEFAULT_SCALING): Part | undefined {
  if (!(value > 0 && Number.isFinite(value))) return undefined;
  switch (quantity) {
    case 'capacitance':
      return part.kind === 'capacitor' || part.kind === 'damping-rc' ? { ...part, capacitance: value } : undefined;
    case 'resistance':
      return part.kind === 'resistor' || part.kind === 'damping-rc' || part.kind === 'damping-rl' || part.kind === 'ferrite-bead'
        ? { ...part, resistance: value }
        : undefined;
    case 'leakage':
      return part.kind === 'common-mode-choke' ? withLeakage(part, value) : undefined;
    case 'inductance':
      if (part.kind === 'ferrite-bead' || part.kind === 'damping-rl') return { ...part, inductance: value };
      if (part.kind === 'inductor') {
        return { ...part, inductance: value, windingCapacitance: scaledWindingCapacitance(part.windingCapacitance, value / part.inductance, scaling) };
      }
      if (part.kind === 'common-mode-choke') return withChokeInductance(part, value, scaling);
      return undefined;
  }
}

function scaledWindingCapacitance(capacitance: number, inductanceRatio: number, scaling: ScalingModel): number {
  return scaling.windingCapacitance === 'keep' ? capacitance : capacitance * Math.sqrt(inductanceRatio);
}

function withLeakage(part: CommonModeChoke, leakage: number): CommonModeChoke | undefined {
  if (!(leakage < part.inductance)) return undefined;
  if (part.coupling.kind === 'leakage-inductance') return { ...part, coupling: { kind: 'leakage-inductance', leakageInductance: leakage } };
  return { ...part, coupling: { kind: 'coupling-factor', couplingFactor: 1 - leakage / part.inductance } };
}

function withChokeInductance(part: CommonModeChoke, inductance: number, scaling: ScalingModel): CommonModeChoke | undefined {
  const ratio = inductance / part.inductance;
  const scaled: CommonModeChoke = { ...part, inductance, windingCapacitance: scaledWindingCapacitance(part.windingCapacitance, ratio, scaling) };
  // A fixed fraction keeps k (coupling-factor) or scales the leakage with L; a fixed value keeps L − M.
  if (scaling.leakage === 'fixed-fraction') {
    return part.coupling.kind === 'leakage-inductance'
      ? { ...scaled, coupling: { kind: 'leakage-inductance', leakageInductance: part.coupling.leakageInductance * ratio } }
      : scaled;
  }
  return withLeakage(scaled, chokeLeakage(part));
}

/** Where an element sits in a design. */
export interface ElementLocation {
  readonly stageIndex: number;
  readonly elementIndex: number;
  readonly element: FilterElement;
}

export function locateElement(design: Design, id: string): ElementLocation | undefined {
  for (let s = 0; s < design.stages.length; s += 1) {
    const elements = design.stages[s]!.elements;
    for (let e = 0; e < elements.length; e += 1) if (elements[e]!.id === id) return { stageIndex: s, elementIndex: e, element: elements[e]! };
  }
  return undefined;
}

/** Every element of a design, in cascade order, with where it sits. */
export function allElements(design: Design): ElementLocation[] {
  return design.stages.flatMap((stage, stageIndex) => stage.elements.map((element, elementIndex) => ({ stageIndex, elementIndex, element })));
}

/**
 * The design with some elements replaced: `change` gets each element whose id is in `ids` and
 * returns its replacement, or undefined to give up (then the whole edit gives undefined).
 */
export function editElements(design: Design, ids: ReadonlySet<string>, change: (element: FilterElement) => FilterElement | undefined): Design | undefined {
  let failed = false;
  const stages = design.stages.map((stage) => {
    if (!stage.elements.some((e) => ids.has(e.id))) return stage;
    return {
      ...stage,
      elements: stage.elements.map((element) => {
        if (!ids.has(element.id)) return element;
        const next = change(element);
        if (!next) failed = true;
        return next ?? element;
      }),
    };
  });
  return failed ? undefined : { ...design, stages };
}

/** A group of elements whose one quantity is set together (both Y capacitors, a pair of line inductors). */
export interface ValueTarget {
  readonly elementIds: readonly string[];
  readonly quantity: ValueQuantity;
}

/**
 * The design with a target's value set: the first element takes `value`, and the others keep
 * their ratio to it (so an unequal pair stays unequal by the same factor).
 */
export function withTargetValue(design: Design, target: ValueTarget, value: number, scaling: ScalingModel = DEFAULT_SCALING): Design | undefined {
  const reference = targetValue(design, target);
  if (reference === undefined) return undefined;
  const factor = value / reference;
  return editElements(design, new Set(target.elementIds), (element) => {
    const own = readValue(element.part, target.quantity);
    if (own === undefined) return undefined;
    const part = writeValue(element.part, target.quantity, own * factor, scaling);
    return part ? ({ ...element, part } as FilterElement) : undefined;
  });
}

/** The target's present value: its first element's. */
export function targetValue(design: Design, target: ValueTarget): number | undefined {
  const first = target.elementIds[0];
  const location = first === undefined ? undefined : locateElement(design, first);
  return location ? readValue(location.element.part, target.quantity) : undefined;
}
