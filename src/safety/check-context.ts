import type { Design, Supply } from '../model/design.ts';
import { type DesignElements, designElements } from './filter-positions.ts';
import type { ResolvedChoices } from './safety-choices.ts';

/** What every check reads: the design, its elements in circuit order, the supply and the user's choices. */
export interface CheckContext {
  readonly design: Design;
  readonly elements: DesignElements;
  readonly supply: Supply | undefined;
  readonly lineCurrentA: number | undefined;
  readonly choices: ResolvedChoices;
}

export function checkContext(design: Design, choices: ResolvedChoices): CheckContext {
  return {
    design,
    elements: designElements(design),
    supply: design.operating?.supply,
    lineCurrentA: design.operating?.lineCurrent,
    choices,
  };
}

/** "264 V, 60 Hz" or "48 V DC". */
export function describeSupply(supply: Supply): string {
  return supply.kind === 'ac-mains' ? `${supply.highestVoltage} V rms, ${supply.highestFrequencyHz} Hz mains` : `${supply.highestVoltage} V DC`;
}

export function percent(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(3))} %`;
}

/** The sentence every check that uses the capacitor tolerance adds. */
export function toleranceAssumption(choices: ResolvedChoices): string {
  const { value, given } = choices.capacitorTolerance;
  return given
    ? `Capacitors are taken at +${percent(value)} above nominal (safety.capacitorTolerance).`
    : `Capacitors are taken at +${percent(value)} above nominal, the usual tolerance of safety capacitors (common practice, no source); set safety.capacitorTolerance to the parts' own.`;
}
