import { formatFrequency } from './frequency-ticks.ts';
import type { PlotSeries, PlotSpec } from './plot-spec.ts';

/**
 * What a plot shows at one frequency, for the cursor readout: each series' value at its own point
 * nearest to the frequency (on the log axis), and each band's bounds. A point further than
 * `toleranceDecades` from the frequency (outside a series' range, or in a gap of its grid) reads as
 * nothing rather than as a neighbour's value.
 */

export interface ReadoutLine {
  readonly id: string;
  readonly label: string;
  readonly text: string;
  /** The frequency of the point read (the series' own grid point nearest the cursor). */
  readonly atHz: number | undefined;
}

/** The index of the point of a rising axis nearest to `hz` on a log scale, or −1 for an empty axis. */
export function nearestIndex(frequencyHz: Float64Array, hz: number): number {
  const n = frequencyHz.length;
  if (n === 0) return -1;
  let low = 0;
  let high = n;
  while (low < high) {
    const mid = (low + high) >>> 1;
    if (frequencyHz[mid]! < hz) low = mid + 1;
    else high = mid;
  }
  if (low === 0) return 0;
  if (low === n) return n - 1;
  return Math.log(hz / frequencyHz[low - 1]!) <= Math.log(frequencyHz[low]! / hz) ? low - 1 : low;
}

export function valueAt(series: Pick<PlotSeries, 'frequencyHz' | 'values'>, hz: number, toleranceDecades: number): { value: number; atHz: number } | undefined {
  const i = nearestIndex(series.frequencyHz, hz);
  if (i < 0) return undefined;
  const atHz = series.frequencyHz[i]!;
  if (Math.abs(Math.log10(atHz / hz)) > toleranceDecades) return undefined;
  const value = series.values[i]!;
  return Number.isFinite(value) ? { value, atHz } : undefined;
}

function formatValue(value: number, unit: string): string {
  if (unit === 'Ω') {
    const abs = Math.abs(value);
    const digits = abs >= 100 ? 0 : abs >= 10 ? 1 : abs >= 1 ? 2 : 3;
    return abs >= 1e4 || (abs > 0 && abs < 1e-3) ? `${value.toExponential(2)} Ω` : `${value.toFixed(digits)} Ω`;
  }
  return `${value.toFixed(1)} ${unit}`;
}

/** Every series and band of a plot read at `hz`; hidden series are listed too (the legend only hides the line). */
export function readoutAt(spec: PlotSpec, hz: number, toleranceDecades = 0.02): ReadoutLine[] {
  const lines: ReadoutLine[] = [];
  for (const series of spec.series) {
    const read = valueAt(series, hz, toleranceDecades);
    lines.push({ id: series.id, label: series.label, text: read ? formatValue(read.value, spec.y.unit) : '–', atHz: read?.atHz });
  }
  for (const band of spec.bands) {
    const low = valueAt({ frequencyHz: band.frequencyHz, values: band.lower }, hz, toleranceDecades);
    const high = valueAt({ frequencyHz: band.frequencyHz, values: band.upper }, hz, toleranceDecades);
    lines.push({
      id: band.id,
      label: band.label,
      text: low && high ? `${formatValue(low.value, spec.y.unit)} to ${formatValue(high.value, spec.y.unit)}` : '–',
      atHz: low?.atHz,
    });
  }
  return lines;
}

/** "At 262 kHz" for the readout's heading. */
export function readoutHeading(hz: number): string {
  return `At ${formatFrequency(hz, 4)}`;
}
