import type { CommonModeChoke, Inductor, Part, Placement, Receiver } from '../model/design.ts';
import { formatQuantity, type UnitSymbol } from '../model/units.ts';

/**
 * How parts read in words, for the drawn filter and the report: what a part is, its main value in
 * engineering notation, and its parasitics and ratings. Pure, so the page (src/ui/design) can use the
 * same words as the drawing and the printed report.
 */

const q = (value: number, unit: UnitSymbol): string => formatQuantity(value, unit, 3);
const joined = (...parts: (string | false | undefined)[]): string => parts.filter((p): p is string => typeof p === 'string' && p !== '').join(', ');

/** "X2 capacitor", "common-mode choke", "measured impedance". */
export function partKindText(part: Part): string {
  switch (part.kind) {
    case 'capacitor':
      return part.safetyClass === 'none' ? 'capacitor' : `${part.safetyClass} capacitor`;
    case 'inductor':
      return 'inductor';
    case 'common-mode-choke':
      return 'common-mode choke';
    case 'resistor':
      return 'resistor';
    case 'ferrite-bead':
      return 'ferrite bead';
    case 'damping-rc':
      return 'R–C damper';
    case 'damping-rl':
      return 'R–L damper';
    case 'measured':
      return 'measured impedance';
  }
}

/** The value a schematic prints beside the symbol: "470 nF", "2.2 mH", "1.5 Ω + 1 µF". */
export function partValueText(part: Part): string {
  switch (part.kind) {
    case 'capacitor':
      return q(part.capacitance, 'F');
    case 'inductor':
    case 'common-mode-choke':
      return q(part.inductance, 'H');
    case 'resistor':
      return q(part.resistance, 'Ω');
    case 'ferrite-bead':
      return `${q(part.resistance, 'Ω')} peak`;
    case 'damping-rc':
      return `${q(part.resistance, 'Ω')} + ${q(part.capacitance, 'F')}`;
    case 'damping-rl':
      return `${q(part.resistance, 'Ω')} ∥ ${q(part.inductance, 'H')}`;
    case 'measured':
      return `|Z| table, ${part.table.frequencyHz.length} points`;
  }
}

/** Parasitics of a part, in words: "ESR 30 mΩ, ESL 10 nH"; empty for an ideal part. */
export function partParasiticsText(part: Part): string {
  switch (part.kind) {
    case 'capacitor':
      return joined(part.esr > 0 && `ESR ${q(part.esr, 'Ω')}`, part.esl > 0 && `ESL ${q(part.esl, 'H')}`);
    case 'inductor':
      return joined(...windingText(part));
    case 'common-mode-choke':
      return joined(
        part.coupling.kind === 'leakage-inductance' ? `leakage ${q(part.coupling.leakageInductance, 'H')}` : `coupling k = ${part.coupling.couplingFactor}`,
        ...windingText(part),
      );
    case 'resistor':
      return joined(part.seriesInductance > 0 && `series L ${q(part.seriesInductance, 'H')}`);
    case 'ferrite-bead':
      return joined(`L ${q(part.inductance, 'H')}`, part.capacitance > 0 && `C ${q(part.capacitance, 'F')}`, part.dcResistance > 0 && `DC resistance ${q(part.dcResistance, 'Ω')}`);
    case 'damping-rc':
      return 'R and C in series';
    case 'damping-rl':
      return 'R and L in parallel';
    case 'measured': {
      const f = part.table.frequencyHz;
      return joined(`${q(f[0]!, 'Hz')} to ${q(f[f.length - 1]!, 'Hz')}`, part.origin?.fileName && `from ${part.origin.fileName}`);
    }
  }
}

function windingText(part: Inductor | CommonModeChoke): string[] {
  const found: string[] = [];
  if (part.dcr > 0) found.push(`DCR ${q(part.dcr, 'Ω')}`);
  if (part.windingCapacitance > 0) found.push(`winding C ${q(part.windingCapacitance, 'F')}`);
  if (part.permeability.kind === 'first-order-relaxation') found.push(`core rolls off at ${q(part.permeability.relaxationFrequencyHz, 'Hz')}`);
  if ('coreLoss' in part && part.coreLoss.kind === 'parallel-resistance') found.push(`core loss ${q(part.coreLoss.resistance, 'Ω')}`);
  if ('coreLoss' in part && part.coreLoss.kind === 'quality-factor') found.push(`Q ${part.coreLoss.qualityFactor} at ${q(part.coreLoss.atFrequencyHz, 'Hz')}`);
  if ('parallelResistance' in part && part.parallelResistance !== undefined) found.push(`loss ${q(part.parallelResistance, 'Ω')} across each winding`);
  return found;
}

/** Ratings the design states: "rated 310 V", "rated 2 A"; empty when none is known. */
export function partRatingsText(part: Part): string {
  const voltage = 'ratedVoltage' in part && part.ratedVoltage !== undefined ? `${q(part.ratedVoltage, 'V')}` : undefined;
  const current = 'ratedCurrent' in part && part.ratedCurrent !== undefined ? `${q(part.ratedCurrent, 'A')}` : undefined;
  return joined(voltage && `rated ${voltage}`, current && `rated ${current}`);
}

/** The safety class of a capacitor ("X2", "Y2"), or undefined for other parts and class "none". */
export function partSafetyClass(part: Part): string | undefined {
  return part.kind === 'capacitor' && part.safetyClass !== 'none' ? part.safetyClass : undefined;
}

const PLACEMENT_TEXT: Readonly<Record<Placement, string>> = {
  'series-line1': 'in series, line 1',
  'series-line2': 'in series, line 2',
  'line-to-line': 'line to line',
  'line1-to-ground': 'line 1 to ground',
  'line2-to-ground': 'line 2 to ground',
  'both-lines-coupled': 'both lines, coupled',
};

export function placementText(placement: Placement): string {
  return PLACEMENT_TEXT[placement];
}

/** A receiving network in words: "LISN, 50 Ω ∥ (50 µH + 5 Ω)". */
export function receiverText(receiver: Receiver): string {
  switch (receiver.kind) {
    case 'cispr16-mains-50uh':
      return 'LISN, 50 Ω ∥ (50 µH + 5 Ω)';
    case 'vehicle-5uh':
      return 'LISN, 50 Ω ∥ 5 µH';
    case 'resistive':
      return `${q(receiver.resistance, 'Ω')} resistive`;
    case 'custom':
      return receiver.label ?? `${partKindText(receiver.impedance)} ${partValueText(receiver.impedance)}`;
  }
}

/** A source impedance in words: "capacitor 100 µF (ESR 0.3 Ω, ESL 20 nH)". */
export function impedanceText(part: Part): string {
  const details = partParasiticsText(part);
  return `${partKindText(part)} ${partValueText(part)}${details === '' ? '' : ` (${details})`}`;
}
