import type { PartKind, Placement } from '../model/design.ts';
import type { JsonObject } from './json.ts';

/**
 * Where a new part can be put, as the engineer thinks of it (a matched pair in both lines is two
 * elements created together), and what a new part holds before it is edited. The values are
 * plausible starting points for a mains filter, invented, never a real part's data; every one is
 * meant to be replaced.
 */

export const ADD_PLACEMENTS = [
  'series-line1',
  'series-line2',
  'series-pair',
  'common-mode-choke',
  'line-to-line',
  'line1-to-ground',
  'line2-to-ground',
  'ground-pair',
] as const;
export type AddPlacement = (typeof ADD_PLACEMENTS)[number];

export const ADD_PLACEMENT_TEXT: Readonly<Record<AddPlacement, string>> = {
  'series-line1': 'in series, line 1',
  'series-line2': 'in series, line 2',
  'series-pair': 'in series, a matched pair in both lines',
  'common-mode-choke': 'common-mode choke across both lines',
  'line-to-line': 'line to line',
  'line1-to-ground': 'line 1 to ground',
  'line2-to-ground': 'line 2 to ground',
  'ground-pair': 'line to ground, a matched pair (both lines)',
};

/** The placements of the elements one "add" creates. */
export const ELEMENT_PLACEMENTS: Readonly<Record<AddPlacement, readonly Placement[]>> = {
  'series-line1': ['series-line1'],
  'series-line2': ['series-line2'],
  'series-pair': ['series-line1', 'series-line2'],
  'common-mode-choke': ['both-lines-coupled'],
  'line-to-line': ['line-to-line'],
  'line1-to-ground': ['line1-to-ground'],
  'line2-to-ground': ['line2-to-ground'],
  'ground-pair': ['line1-to-ground', 'line2-to-ground'],
};

/** Part kinds that make sense at a placement (the schema allows any two-terminal part anywhere but a choke). */
export const KINDS_AT: Readonly<Record<AddPlacement, readonly PartKind[]>> = {
  'series-line1': ['inductor', 'ferrite-bead', 'resistor', 'capacitor'],
  'series-line2': ['inductor', 'ferrite-bead', 'resistor', 'capacitor'],
  'series-pair': ['inductor', 'ferrite-bead', 'resistor'],
  'common-mode-choke': ['common-mode-choke'],
  'line-to-line': ['capacitor', 'damping-rc', 'damping-rl', 'resistor', 'inductor'],
  'line1-to-ground': ['capacitor', 'damping-rc', 'resistor'],
  'line2-to-ground': ['capacitor', 'damping-rc', 'resistor'],
  'ground-pair': ['capacitor', 'damping-rc', 'resistor'],
};

export const PART_KIND_TEXT: Readonly<Record<PartKind, string>> = {
  capacitor: 'capacitor',
  inductor: 'inductor',
  resistor: 'resistor',
  'ferrite-bead': 'ferrite bead',
  'damping-rc': 'damping R–C leg',
  'damping-rl': 'damping R–L leg',
  measured: 'measured part (|Z| table)',
  'common-mode-choke': 'common-mode choke',
};

/** A new part of a kind at a placement, as design-file JSON with engineering text. */
export function defaultPart(kind: PartKind, placement: Placement): JsonObject {
  switch (kind) {
    case 'capacitor':
      if (placement === 'line-to-line') return { kind, capacitance: '100 nF', esr: '30 mOhm', esl: '10 nH', safetyClass: 'X2' };
      if (placement === 'line1-to-ground' || placement === 'line2-to-ground') return { kind, capacitance: '2.2 nF', esr: '0.2', esl: '6 nH', safetyClass: 'Y2' };
      return { kind, capacitance: '100 nF', esr: '30 mOhm', esl: '10 nH' };
    case 'inductor':
      return { kind, inductance: '100 uH', dcr: '50 mOhm', windingCapacitance: '5 pF' };
    case 'resistor':
      return { kind, resistance: '10', seriesInductance: '5 nH' };
    case 'ferrite-bead':
      return { kind, resistance: '100', inductance: '1 uH', capacitance: '1 pF', dcResistance: '20 mOhm' };
    case 'damping-rc':
      return { kind, resistance: '1', capacitance: '1 uF' };
    case 'damping-rl':
      return { kind, resistance: '1', inductance: '10 uH' };
    case 'common-mode-choke':
      return { kind, inductance: '1 mH', coupling: { kind: 'leakage-inductance', leakageInductance: '10 uH' }, dcr: '50 mOhm', windingCapacitance: '5 pF' };
    case 'measured':
      // A measured part comes from a file; this flat 1 Ω table only stands in until one is read.
      return { kind, table: { frequencyHz: [1e3, 1e9], magnitudeOhm: [1, 1], phaseDeg: [0, 0] } };
  }
}

/** The id prefix a new element of a kind gets: CX3 across the line, CY5 to ground, LCM2 for a choke. */
export function idPrefix(kind: PartKind, placement: Placement): string {
  switch (kind) {
    case 'capacitor':
      return placement === 'line-to-line' ? 'CX' : placement === 'line1-to-ground' || placement === 'line2-to-ground' ? 'CY' : 'C';
    case 'inductor':
      return 'L';
    case 'common-mode-choke':
      return 'LCM';
    case 'resistor':
      return 'R';
    case 'ferrite-bead':
      return 'FB';
    case 'damping-rc':
      return 'RC';
    case 'damping-rl':
      return 'RL';
    case 'measured':
      return 'Z';
  }
}

/**
 * What a nested object of a kind holds when the engineer picks that kind in an editor (a new
 * permeability model, a coupling, a receiving network, a supply). Plausible starting values, invented.
 * Kinds not listed here start with only their `kind` (their required fields are then marked until filled).
 */
const KIND_DEFAULTS: Readonly<Record<string, JsonObject>> = {
  constant: { kind: 'constant' },
  'first-order-relaxation': { kind: 'first-order-relaxation', relaxationFrequencyHz: '1 MHz' },
  none: { kind: 'none' },
  'parallel-resistance': { kind: 'parallel-resistance', resistance: '10 kOhm' },
  'quality-factor': { kind: 'quality-factor', qualityFactor: 50, atFrequencyHz: '100 kHz' },
  'leakage-inductance': { kind: 'leakage-inductance', leakageInductance: '10 uH' },
  'coupling-factor': { kind: 'coupling-factor', couplingFactor: 0.99 },
  'cispr16-mains-50uh': { kind: 'cispr16-mains-50uh' },
  'vehicle-5uh': { kind: 'vehicle-5uh' },
  resistive: { kind: 'resistive', resistance: '50' },
  custom: { kind: 'custom', impedance: { kind: 'resistor', resistance: '50' } },
  pulsed: { kind: 'pulsed', pulse: { amplitude: '3 A', frequencyHz: '100 kHz', duty: 0.5, riseTime: '20 ns' } },
  'triangular-ripple': { kind: 'triangular-ripple', peakToPeak: '1 A', frequencyHz: '100 kHz', riseFraction: 0.5 },
  'ac-mains': { kind: 'ac-mains', highestVoltage: '264 V', highestFrequencyHz: '60 Hz' },
  dc: { kind: 'dc', highestVoltage: '48 V' },
  stages: { kind: 'stages', stages: [] },
};

const PART_KINDS: readonly PartKind[] = ['capacitor', 'inductor', 'resistor', 'ferrite-bead', 'damping-rc', 'damping-rl', 'measured', 'common-mode-choke'];

/** A new object of `kind` for an editor's kind choice; a part kind gets its default part. */
export function defaultForKind(kind: string): JsonObject {
  if ((PART_KINDS as readonly string[]).includes(kind)) return defaultPart(kind as PartKind, 'series-line1');
  return KIND_DEFAULTS[kind] ?? { kind };
}

/** A new optional object an editor adds (a noise estimate's CM or DM part, a converter). */
export const OBJECT_DEFAULTS: Readonly<Record<string, JsonObject>> = {
  'emissions.estimate.commonMode': { switchNode: { amplitude: '400 V', frequencyHz: '65 kHz', duty: 0.4, riseTime: '20 ns' }, parasiticCapacitance: '30 pF' },
  'emissions.estimate.differentialMode': { current: { kind: 'triangular-ripple', peakToPeak: '1 A', frequencyHz: '65 kHz', riseFraction: 0.4 }, inputCapacitance: '100 uF', esr: '0.2' },
  'operating.converter': { lowestInputVoltage: '90 V', highestInputPower: '100 W' },
  'operating.supply': { kind: 'ac-mains', highestVoltage: '264 V', highestFrequencyHz: '60 Hz' },
};
