import type { Design } from '../../model/design.ts';
import { allElements, readValue, type ValueQuantity, type ValueTarget } from '../design-edit/part-values.ts';

/**
 * What "size the filter" means when no part is named: the smallest CM inductance of every choke,
 * the smallest DM inductance (each choke's leakage, and each discrete line inductor, paired with its
 * mirror in the other line of the same stage), the smallest capacitance of every X capacitor.
 * Y capacitors are bounded by the leakage current instead (y-capacitance.ts).
 */
export interface NamedTarget extends ValueTarget {
  /** "CM inductance of LCM1", "DM inductance of L1+L2", "X capacitance of CX2". */
  readonly description: string;
}

export function defaultTargets(design: Design): NamedTarget[] {
  const elements = allElements(design).filter((l) => l.element.enabled);
  const targets: NamedTarget[] = [];
  for (const { element } of elements) {
    if (element.part.kind === 'common-mode-choke') targets.push({ elementIds: [element.id], quantity: 'inductance', description: `CM inductance of ${element.id}` });
  }
  for (const { element } of elements) {
    if (element.part.kind === 'common-mode-choke') targets.push({ elementIds: [element.id], quantity: 'leakage', description: `DM inductance (leakage) of ${element.id}` });
  }
  const paired = new Set<string>();
  for (const { element, stageIndex } of elements) {
    if (element.part.kind !== 'inductor' || paired.has(element.id)) continue;
    if (element.placement !== 'series-line1' && element.placement !== 'series-line2') continue;
    const mirror = element.placement === 'series-line1' ? 'series-line2' : 'series-line1';
    const partner = elements.find((l) => l.stageIndex === stageIndex && l.element.placement === mirror && l.element.part.kind === 'inductor' && !paired.has(l.element.id));
    const ids = partner ? [element.id, partner.element.id] : [element.id];
    for (const id of ids) paired.add(id);
    targets.push({ elementIds: ids, quantity: 'inductance', description: `DM inductance of ${ids.join('+')}` });
  }
  for (const { element } of elements) {
    if (element.part.kind === 'capacitor' && element.placement === 'line-to-line') targets.push({ elementIds: [element.id], quantity: 'capacitance', description: `X capacitance of ${element.id}` });
  }
  return targets;
}

/** The quantity a part is sized by when none is named: its main value. */
export function mainQuantity(design: Design, id: string): ValueQuantity | undefined {
  const location = allElements(design).find((l) => l.element.id === id);
  if (!location) return undefined;
  for (const quantity of ['capacitance', 'inductance', 'resistance'] as const) if (readValue(location.element.part, quantity) !== undefined) return quantity;
  return undefined;
}
