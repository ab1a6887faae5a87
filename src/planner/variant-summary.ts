import type { Design } from '../model/design.ts';

/**
 * What the comparison table says about a variant's filter itself, read off the validated design:
 * how many parts are in the circuit, the total common-mode choke inductance (per winding, summed over
 * the chokes in circuit) and the total Y capacitance (every enabled capacitor from a line to ground,
 * the capacitance that carries leakage current). The margins come from the variant's own analysis.
 */
export interface VariantSummary {
  readonly stages: number;
  readonly partsInCircuit: number;
  readonly totalCommonModeInductanceH: number;
  readonly totalYCapacitanceF: number;
  /** Line-to-line capacitance in circuit (X capacitors and damping legs). */
  readonly totalXCapacitanceF: number;
}

export function summarizeVariant(design: Design): VariantSummary {
  let parts = 0;
  let chokeH = 0;
  let yF = 0;
  let xF = 0;
  for (const stage of design.stages) {
    for (const element of stage.elements) {
      if (!element.enabled) continue;
      parts += 1;
      const part = element.part;
      if (part.kind === 'common-mode-choke') chokeH += part.inductance;
      if (part.kind === 'capacitor' || part.kind === 'damping-rc') {
        if (element.placement === 'line1-to-ground' || element.placement === 'line2-to-ground') yF += part.capacitance;
        if (element.placement === 'line-to-line') xF += part.capacitance;
      }
    }
  }
  return { stages: design.stages.length, partsInCircuit: parts, totalCommonModeInductanceH: chokeH, totalYCapacitanceF: yF, totalXCapacitanceF: xF };
}
