import type { Supply } from '../model/design.ts';

/**
 * The cautions shown with the checks. The first holds everywhere; the others wherever mains voltage
 * is involved (an AC mains supply, or a supply not yet given).
 */

export interface Caution {
  readonly id: string;
  readonly text: string;
}

const PLANNING_AID: Caution = {
  id: 'planning-aid',
  text: 'These checks are a planning aid, not a certification. They use the numbers in the design and the stated assumptions; the product safety standard that applies to the product, and its test laboratory, decide.',
};

const MAINS: readonly Caution[] = [
  {
    id: 'certified-parts',
    text: 'Use safety-certified parts: X and Y capacitors of the right subclass and voltage rating, chokes rated for the mains working voltage and current. Never substitute an ordinary capacitor of similar nominal voltage.',
  },
  {
    id: 'standards-and-codes',
    text: 'Follow the product safety standard (for example IEC 62368-1, IEC 60335-1, IEC 61010-1 or IEC 60601-1), local codes and licensed practice. Work on mains only where you are qualified to.',
  },
  {
    id: 'stored-charge',
    text: 'X capacitors hold a charge after the plug is pulled: keep a discharge path that no switch can isolate, and treat the pins as live until measured.',
  },
  {
    id: 'earth-leakage',
    text: 'Y capacitance passes mains current to protective earth: a reliable earth connection becomes a safety requirement, and the current can trip residual-current devices.',
  },
  {
    id: 'test-network',
    text: 'A LISN has large capacitors to earth: bond it to protective earth before applying mains, and expect its own leakage to trip a residual-current device (an isolating transformer is often used on the bench).',
  },
];

export function cautionsFor(supply: Supply | undefined): readonly Caution[] {
  return supply?.kind === 'dc' ? [PLANNING_AID] : [PLANNING_AID, ...MAINS];
}
