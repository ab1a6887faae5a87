import type { Design, FilterElement, Part } from '../model/design.ts';

/**
 * The design's elements as the safety checks see them: in circuit order (noise-source side first,
 * as the file lists them), with where each sits in the file for messages. At mains frequency every
 * series part is close to a plain connection (2.2 mH is 0.8 Ω at 60 Hz against the 600 kΩ of a 4.7 nF
 * Y capacitor), so a shunt part acts on its line wherever it sits in the chain.
 */

export interface PlacedElement {
  readonly element: FilterElement;
  readonly stageId: string;
  /** Position in circuit order over all stages, from 0 at the noise-source side. */
  readonly order: number;
  /** "stages[1].elements[0]": where it is in the file. */
  readonly path: string;
}

export interface DesignElements {
  readonly enabled: readonly PlacedElement[];
  readonly disabled: readonly PlacedElement[];
}

export function designElements(design: Design): DesignElements {
  const enabled: PlacedElement[] = [];
  const disabled: PlacedElement[] = [];
  let order = 0;
  design.stages.forEach((stage, s) => {
    stage.elements.forEach((element, e) => {
      const placed: PlacedElement = { element, stageId: stage.id, order, path: `stages[${s}].elements[${e}]` };
      (element.enabled ? enabled : disabled).push(placed);
      order += 1;
    });
  });
  return { enabled, disabled };
}

export type Line = 'line1' | 'line2';

export function isToGround(placement: FilterElement['placement']): placement is 'line1-to-ground' | 'line2-to-ground' {
  return placement === 'line1-to-ground' || placement === 'line2-to-ground';
}

export function lineOf(placement: 'line1-to-ground' | 'line2-to-ground' | 'series-line1' | 'series-line2'): Line {
  return placement === 'line1-to-ground' || placement === 'series-line1' ? 'line1' : 'line2';
}

export function isSeries(placement: FilterElement['placement']): boolean {
  return placement === 'series-line1' || placement === 'series-line2' || placement === 'both-lines-coupled';
}

/** The capacitance a part holds between its terminals at mains frequency (and at DC, for the charge it stores). */
export function storedCapacitanceF(part: Part): number | undefined {
  if (part.kind === 'capacitor' || part.kind === 'damping-rc') return part.capacitance;
  return undefined;
}

/** A part that conducts at DC and mains frequency: between a line and ground it is a path for mains current. */
export function conductsAtMainsFrequency(part: Part): boolean {
  return part.kind === 'resistor' || part.kind === 'inductor' || part.kind === 'ferrite-bead' || part.kind === 'damping-rl';
}

/**
 * |Z| of a conducting part at mains frequency, from the same formulas as the engine's models with
 * the parts that do not matter at 50/60 Hz left out (winding capacitance, core relaxation).
 */
export function mainsImpedanceOhm(part: Part, frequencyHz: number): number | undefined {
  const omega = 2 * Math.PI * frequencyHz;
  switch (part.kind) {
    case 'resistor':
      return Math.hypot(part.resistance, omega * part.seriesInductance);
    case 'inductor':
      return Math.hypot(part.dcr, omega * part.inductance);
    case 'ferrite-bead': {
      // Rdc + R ∥ jωL
      const xl = omega * part.inductance;
      const denominator = part.resistance * part.resistance + xl * xl;
      const re = part.dcResistance + (part.resistance * xl * xl) / denominator;
      const im = (part.resistance * part.resistance * xl) / denominator;
      return Math.hypot(re, im);
    }
    case 'damping-rl': {
      const xl = omega * part.inductance;
      return (part.resistance * xl) / Math.hypot(part.resistance, xl);
    }
    default:
      return undefined;
  }
}

/** "CY1", "CY1 (label)", or the label alone when it starts with the id ("CY1 Y2 2.2 nF"). */
export function nameOf(element: FilterElement): string {
  const label = element.label;
  if (label === undefined || label === element.id) return element.id;
  return label.startsWith(`${element.id} `) ? label : `${element.id} (${label})`;
}
