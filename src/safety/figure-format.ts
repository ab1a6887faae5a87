import { formatQuantity } from '../model/units.ts';
import type { FigureUnit, SafetyFigure } from './safety-finding.ts';

/** Significant digits shown in figure texts; the value itself is kept at full precision. */
const DIGITS = 4;

/** The text of a value: engineering prefixes for SI units, mA for currents below 1 A (as leakage is quoted). */
export function formatFigure(value: number, unit: FigureUnit): string {
  if (!Number.isFinite(value)) return value > 0 ? '∞' : String(value);
  switch (unit) {
    case '%':
      return `${Number(value.toPrecision(3))} %`;
    case 'mm²':
      return `${Number(value.toPrecision(DIGITS))} mm²`;
    case 'T':
      return `${Number((value * 1e3).toPrecision(DIGITS))} mT`;
    case 'A':
      return Math.abs(value) < 1 && value !== 0 ? `${Number((value * 1e3).toPrecision(DIGITS))} mA` : formatQuantity(value, 'A', DIGITS);
    default:
      return formatQuantity(value, unit, DIGITS);
  }
}

export function figure(label: string, value: number, unit: FigureUnit): SafetyFigure {
  return { label, value, unit, text: formatFigure(value, unit) };
}

/** value as a share of limit, in percent. */
export function shareOf(value: number, limit: number): number {
  return (100 * value) / limit;
}
