import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import type { RandomGenerator } from 'pure-rand/types/RandomGenerator';
import type { Design, FilterElement, Part, Tolerance } from '../../model/design.ts';
import { allElements, editElements } from '../design-edit/part-values.ts';

/**
 * What varies from one unit to the next, and how one sample of the whole design is drawn
 * (docs/assistants.md, "Tolerance yield").
 *
 * Each enabled part's main value moves by its tolerance (the element's `tolerance`, else the default
 * for its kind): uniform over ±percent, or normal with ±percent as 3σ, cut at the band. Magnetic
 * parts with a permeability band also move with temperature: one temperature position per sample,
 * shared by every part (they sit in one product), mapped linearly into each part's own band.
 *
 * Reproducibility: sample k draws from its own generator, xoroshiro128+ (pure-rand) seeded with a
 * hash of (seed, k), in a fixed order (the temperature, then the parts in cascade order). So a
 * sample is the same whichever worker draws it and however the run is split.
 */

/** Defaults by part kind when an element gives no tolerance: common practice, no source. */
export const DEFAULT_TOLERANCE_PERCENT: Record<Part['kind'], number> = {
  capacitor: 10,
  inductor: 30,
  'common-mode-choke': 30,
  'ferrite-bead': 25,
  resistor: 5,
  'damping-rc': 10,
  'damping-rl': 5,
  measured: 0,
};

export interface VariedPart {
  readonly elementId: string;
  readonly label: string;
  readonly kind: Part['kind'];
  readonly tolerance: Tolerance;
  /** Where the tolerance came from: the element's own field, or the default for its kind. */
  readonly source: 'element' | 'default';
}

export interface ToleranceSettings {
  /** Use the defaults by kind for elements without a tolerance (default true); false: only elements with their own vary. */
  readonly useDefaults?: boolean;
  /** A permeability band (percent, low ≤ 0 ≤ high) for every magnetic part that has none of its own. */
  readonly permeabilityBand?: { readonly lowPercent: number; readonly highPercent: number };
}

export function variedParts(design: Design, settings: ToleranceSettings = {}): VariedPart[] {
  const useDefaults = settings.useDefaults ?? true;
  const out: VariedPart[] = [];
  for (const { element } of allElements(design)) {
    if (!element.enabled) continue;
    const own = element.tolerance;
    const percent = own?.percent ?? (useDefaults ? DEFAULT_TOLERANCE_PERCENT[element.part.kind] : 0);
    const magnetic = element.part.kind === 'inductor' || element.part.kind === 'common-mode-choke';
    const band =
      own?.permeabilityLowPercent !== undefined
        ? { permeabilityLowPercent: own.permeabilityLowPercent, permeabilityHighPercent: own.permeabilityHighPercent ?? 0 }
        : magnetic && settings.permeabilityBand
          ? { permeabilityLowPercent: settings.permeabilityBand.lowPercent, permeabilityHighPercent: settings.permeabilityBand.highPercent }
          : {};
    const tolerance: Tolerance = { percent, distribution: own?.distribution ?? 'uniform', ...band };
    if (percent === 0 && tolerance.permeabilityLowPercent === undefined) continue;
    out.push({ elementId: element.id, label: element.label ?? element.id, kind: element.part.kind, tolerance, source: own ? 'element' : 'default' });
  }
  return out;
}

/** A 32-bit seed for sample `index` of a run seeded `seed` (MurmurHash3's finaliser over both). */
export function sampleSeed(seed: number, index: number): number {
  let h = Math.imul(seed | 0, 0x9e3779b1) ^ Math.imul(index | 0, 0x85ebca6b);
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h | 0;
}

/** A standard normal draw cut at ±3 (rejection; Box–Muller on two uniforms). */
function normalWithinThree(rng: RandomGenerator): number {
  for (;;) {
    const u1 = uniformFloat64(rng);
    const u2 = uniformFloat64(rng);
    const z = Math.sqrt(-2 * Math.log(1 - u1)) * Math.cos(2 * Math.PI * u2);
    if (Math.abs(z) <= 3) return z;
  }
}

/**
 * Sample `index`: each varied part's factor on its main value (written into `factors`, one per part,
 * the manufacturing deviation and the temperature together) and the temperature position in [0, 1).
 */
export function drawSample(parts: readonly VariedPart[], seed: number, index: number, factors: Float64Array): number {
  const rng = xoroshiro128plus(sampleSeed(seed, index));
  const temperature = uniformFloat64(rng);
  for (let p = 0; p < parts.length; p += 1) {
    const t = parts[p]!.tolerance;
    const spread = t.percent / 100;
    const deviation = t.distribution === 'normal' ? (spread / 3) * normalWithinThree(rng) : spread * (2 * uniformFloat64(rng) - 1);
    const low = t.permeabilityLowPercent;
    const thermal = low === undefined ? 1 : 1 + (low + temperature * ((t.permeabilityHighPercent ?? 0) - low)) / 100;
    factors[p] = (1 + deviation) * thermal;
  }
  return temperature;
}

/** The design with every varied part's main value multiplied by its factor. */
export function applyFactors(design: Design, parts: readonly VariedPart[], factors: Float64Array): Design {
  const factorOf = new Map(parts.map((part, p) => [part.elementId, factors[p]!]));
  return editElements(design, new Set(factorOf.keys()), (element) => scaledElement(element, factorOf.get(element.id)!))!;
}

/** One element's main value times a factor (docs/design-format.md, `stages[].elements[].tolerance`). */
export function scaledElement(element: FilterElement, factor: number): FilterElement {
  const part = element.part;
  switch (part.kind) {
    case 'capacitor':
    case 'damping-rc':
      return { ...element, part: { ...part, capacitance: part.capacitance * factor } };
    case 'inductor':
      return { ...element, part: { ...part, inductance: part.inductance * factor } };
    case 'common-mode-choke':
      // The leakage follows in proportion: a coupling factor is kept, a leakage inductance scaled.
      return {
        ...element,
        part: {
          ...part,
          inductance: part.inductance * factor,
          coupling: part.coupling.kind === 'leakage-inductance' ? { kind: 'leakage-inductance', leakageInductance: part.coupling.leakageInductance * factor } : part.coupling,
        },
      };
    case 'ferrite-bead':
      return { ...element, part: { ...part, inductance: part.inductance * factor } };
    case 'resistor':
    case 'damping-rl':
      return { ...element, part: { ...part, resistance: part.resistance * factor } } as FilterElement;
    case 'measured':
      return { ...element, part: { ...part, table: { ...part.table, magnitudeOhm: part.table.magnitudeOhm.map((m) => m * factor) } } };
  }
}
