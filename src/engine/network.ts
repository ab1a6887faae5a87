import type { CommonModeChoke, Design, FilterElement, Placement, TwoTerminalPart } from '../model/design.ts';
import type { ComplexColumns } from './complex-columns.ts';
import { chokeEigenImpedances, twoTerminalEvaluator, type TwoTerminalEvaluator } from './parts/part-impedance.ts';
import { receiverEvaluator } from './parts/receiver-impedance.ts';

/**
 * A design compiled for sweeping: the enabled elements in cascade order (source side first) with
 * their impedance evaluators, and the terminations. Compiling once lets many sweeps (grids,
 * refinement passes, Monte Carlo samples of one topology) reuse the prepared parts.
 */
export interface Network {
  readonly elements: readonly NetworkElement[];
  readonly commonModeSource: TwoTerminalEvaluator;
  readonly differentialModeSource: TwoTerminalEvaluator;
  readonly receiverLine1: TwoTerminalEvaluator;
  readonly receiverLine2: TwoTerminalEvaluator;
  /** Resistive source/load pairs for the CISPR 17 style insertion loss, in ohms. */
  readonly resistiveSystems: readonly ResistiveSystem[];
}

export interface ResistiveSystem {
  readonly id: string;
  readonly sourceOhm: number;
  readonly loadOhm: number;
}

/** CISPR 17: the 50 Ω reference system and the approximate worst cases 0.1 Ω/100 Ω and 100 Ω/0.1 Ω. */
export const CISPR17_SYSTEMS: readonly ResistiveSystem[] = [
  { id: '50-50', sourceOhm: 50, loadOhm: 50 },
  { id: '0.1-100', sourceOhm: 0.1, loadOhm: 100 },
  { id: '100-0.1', sourceOhm: 100, loadOhm: 0.1 },
];

export type TwoTerminalPlacement = Exclude<Placement, 'both-lines-coupled'>;

export type NetworkElement =
  | {
      readonly kind: 'two-terminal';
      readonly id: string;
      readonly stageId: string;
      readonly label: string;
      readonly placement: TwoTerminalPlacement;
      readonly part: TwoTerminalPart;
      readonly impedance: TwoTerminalEvaluator;
    }
  | {
      readonly kind: 'coupled-pair';
      readonly id: string;
      readonly stageId: string;
      readonly label: string;
      readonly placement: 'both-lines-coupled';
      readonly part: CommonModeChoke;
      /** Writes the even (common-mode path) and odd (leakage path) per-winding impedances. */
      readonly eigenImpedances: (f: Float64Array, even: ComplexColumns, odd: ComplexColumns, flags: Uint8Array) => void;
    };

export function compileNetwork(design: Design, resistiveSystems: readonly ResistiveSystem[] = CISPR17_SYSTEMS): Network {
  const elements: NetworkElement[] = [];
  for (const stage of design.stages) {
    for (const element of stage.elements) {
      if (!element.enabled) continue;
      elements.push(compileElement(element, stage.id));
    }
  }
  return {
    elements,
    commonModeSource: twoTerminalEvaluator(design.noiseSource.commonMode.impedance),
    differentialModeSource: twoTerminalEvaluator(design.noiseSource.differentialMode.impedance),
    receiverLine1: receiverEvaluator(design.receivers.line1),
    receiverLine2: receiverEvaluator(design.receivers.line2),
    resistiveSystems,
  };
}

function compileElement(element: FilterElement, stageId: string): NetworkElement {
  const label = element.label ?? element.id;
  const part = element.part;
  if (part.kind === 'common-mode-choke') {
    return {
      kind: 'coupled-pair',
      id: element.id,
      stageId,
      label,
      placement: 'both-lines-coupled',
      part,
      eigenImpedances: (f, even, odd, flags) => chokeEigenImpedances(part, f, even, odd, flags),
    };
  }
  if (element.placement === 'both-lines-coupled') {
    // The schema forbids this; a hand-built design that slips past it is a programming error.
    throw new Error(`element ${element.id}: only a common-mode choke can be placed in both lines`);
  }
  return {
    kind: 'two-terminal',
    id: element.id,
    stageId,
    label,
    placement: element.placement,
    part,
    impedance: twoTerminalEvaluator(part),
  };
}
