import type { CommonModeChoke, Inductor, Part, Placement, Receiver } from '../../model/design.ts';
import { formatQuantity, type UnitSymbol } from '../../model/units.ts';

/** How a part reads in a compact list: what it is, its main value, and its parasitics and ratings. */
export interface PartSummary {
  readonly kind: string;
  readonly value: string;
  readonly details: string;
}

const q = (value: number, unit: UnitSymbol): string => formatQuantity(value, unit, 3);
const details = (...parts: (string | false | undefined)[]): string => parts.filter(Boolean).join(', ');
const rated = (value: number | undefined, unit: UnitSymbol): string | undefined =>
  value === undefined ? undefined : `rated ${q(value, unit)}`;

export function summarizePart(part: Part): PartSummary {
  switch (part.kind) {
    case 'capacitor':
      return {
        kind: part.safetyClass === 'none' ? 'capacitor' : `${part.safetyClass} capacitor`,
        value: q(part.capacitance, 'F'),
        details: details(part.esr > 0 && `ESR ${q(part.esr, 'Ω')}`, part.esl > 0 && `ESL ${q(part.esl, 'H')}`, rated(part.ratedVoltage, 'V')),
      };
    case 'inductor':
      return {
        kind: 'inductor',
        value: q(part.inductance, 'H'),
        details: details(...windingDetails(part), rated(part.ratedCurrent, 'A')),
      };
    case 'common-mode-choke':
      return {
        kind: 'common-mode choke',
        value: q(part.inductance, 'H'),
        details: details(
          'value per winding',
          part.coupling.kind === 'leakage-inductance'
            ? `leakage ${q(part.coupling.leakageInductance, 'H')}`
            : `coupling k = ${part.coupling.couplingFactor}`,
          ...windingDetails(part),
          rated(part.ratedCurrent, 'A'),
        ),
      };
    case 'resistor':
      return {
        kind: 'resistor',
        value: q(part.resistance, 'Ω'),
        details: details(part.seriesInductance > 0 && `series L ${q(part.seriesInductance, 'H')}`),
      };
    case 'ferrite-bead':
      return {
        kind: 'ferrite bead',
        value: `${q(part.resistance, 'Ω')} peak`,
        details: details(
          `L ${q(part.inductance, 'H')}`,
          part.capacitance > 0 && `C ${q(part.capacitance, 'F')}`,
          part.dcResistance > 0 && `DC ${q(part.dcResistance, 'Ω')}`,
          rated(part.ratedCurrent, 'A'),
        ),
      };
    case 'damping-rc':
      return { kind: 'RC damper', value: `${q(part.resistance, 'Ω')} + ${q(part.capacitance, 'F')}`, details: 'R and C in series' };
    case 'damping-rl':
      return { kind: 'RL damper', value: `${q(part.resistance, 'Ω')} ∥ ${q(part.inductance, 'H')}`, details: 'R and L in parallel' };
    case 'measured': {
      const f = part.table.frequencyHz;
      return {
        kind: 'measured impedance',
        value: `${f.length} points`,
        details: details(`${q(f[0]!, 'Hz')} to ${q(f[f.length - 1]!, 'Hz')}`, part.origin?.fileName),
      };
    }
  }
}

function windingDetails(part: Inductor | CommonModeChoke): string[] {
  const found: string[] = [];
  if (part.dcr > 0) found.push(`DCR ${q(part.dcr, 'Ω')}`);
  if (part.windingCapacitance > 0) found.push(`winding C ${q(part.windingCapacitance, 'F')}`);
  if (part.permeability.kind === 'first-order-relaxation') found.push(`core rolls off at ${q(part.permeability.relaxationFrequencyHz, 'Hz')}`);
  if ('coreLoss' in part && part.coreLoss.kind === 'parallel-resistance') found.push(`core loss ${q(part.coreLoss.resistance, 'Ω')}`);
  if ('coreLoss' in part && part.coreLoss.kind === 'quality-factor') {
    found.push(`Q ${part.coreLoss.qualityFactor} at ${q(part.coreLoss.atFrequencyHz, 'Hz')}`);
  }
  return found;
}

const PLACEMENT_TEXT: Readonly<Record<Placement, string>> = {
  'series-line1': 'in series, line 1',
  'series-line2': 'in series, line 2',
  'line-to-line': 'line to line',
  'line1-to-ground': 'line 1 to ground',
  'line2-to-ground': 'line 2 to ground',
  'both-lines-coupled': 'both lines, coupled',
};

export function describePlacement(placement: Placement): string {
  return PLACEMENT_TEXT[placement];
}

export function describeReceiver(receiver: Receiver): string {
  switch (receiver.kind) {
    case 'cispr16-mains-50uh':
      return 'LISN, 50 Ω ∥ (50 µH + 5 Ω)';
    case 'vehicle-5uh':
      return 'LISN, 50 Ω ∥ 5 µH';
    case 'resistive':
      return `${q(receiver.resistance, 'Ω')} resistive`;
    case 'custom': {
      const part = summarizePart(receiver.impedance);
      return receiver.label ?? `${part.kind} ${part.value}`;
    }
  }
}
