import type { PlotDash, PlotSeries, SeriesStyle } from '../plot-spec.ts';
import { VARIANT_DASHES } from '../plot-palette.ts';

/** Shared small pieces of the plot builders. */

/** A curve of another variant overlaid: its name, and what was computed for it. */
export interface Overlay<T> {
  readonly variantId: string;
  readonly name: string;
  readonly result: T;
}

/** The dash of the i-th overlaid variant (the design being edited is solid). */
export function overlayDash(index: number): PlotDash {
  return VARIANT_DASHES[index % VARIANT_DASHES.length]!;
}

export function line(color: SeriesStyle['color'], width: number, dash: PlotDash = 'solid'): SeriesStyle {
  return { color, width, dash, draw: 'line' };
}

export function dots(color: SeriesStyle['color'], width = 1.5): SeriesStyle {
  return { color, width, dash: 'solid', draw: 'dots' };
}

/** Lowest and highest finite values of some columns (NaN and ±∞ skipped). */
export function extentOf(columns: readonly Float64Array[]): { min: number | null; max: number | null } {
  let min = Infinity;
  let max = -Infinity;
  for (const column of columns) {
    for (let i = 0; i < column.length; i += 1) {
      const value = column[i]!;
      if (!Number.isFinite(value)) continue;
      if (value < min) min = value;
      if (value > max) max = value;
    }
  }
  return min <= max ? { min, max } : { min: null, max: null };
}

export function visibleColumns(series: readonly PlotSeries[]): Float64Array[] {
  return series.filter((s) => !s.hidden).map((s) => s.values);
}

/** The frequency span of some axes, or a default when they are empty. */
export function spanOf(axes: readonly Float64Array[], fallback: readonly [number, number] = [150e3, 30e6]): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (const f of axes) {
    if (f.length === 0) continue;
    min = Math.min(min, f[0]!);
    max = Math.max(max, f[f.length - 1]!);
  }
  return min < max ? { min, max } : { min: fallback[0], max: fallback[1] };
}

/** Whether every value of a column is at or below `floor` (a quantity the engine reports as absent, −400 dB). */
export function allAtOrBelow(column: Float64Array, floor: number): boolean {
  for (let i = 0; i < column.length; i += 1) if (column[i]! > floor) return false;
  return true;
}
