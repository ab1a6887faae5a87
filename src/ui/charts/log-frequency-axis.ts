import type uPlot from 'uplot';
import { frequencyTickLabels, pixelsPerDecade } from './frequency-ticks.ts';

/** The look the page's charts share (the insertion-loss chart's axis colours and fonts). */
export const AXIS_COLOUR = '#3d4652';
export const GRID_COLOUR = '#e2e6eb';
export const AXIS_FONT = '12px system-ui, sans-serif';
export const LABEL_FONT = '600 12px system-ui, sans-serif';

export interface ChartSize {
  readonly width: number;
  readonly height: number;
}

/**
 * Tick positions on a log axis: every 1…9 × 10^k inside [min, max]. uPlot's own log splits start at
 * the scale's minimum, so an axis starting at 65 kHz would be ticked at 65, 75, … and then at odd
 * multiples such as 105 kHz and 210 kHz; these stay on the decades wherever the axis starts.
 */
export function logSplits(min: number, max: number): number[] {
  if (!(min > 0 && max >= min && Number.isFinite(max))) return [];
  const splits: number[] = [];
  for (let exponent = Math.floor(Math.log10(min)); exponent <= Math.ceil(Math.log10(max)); exponent += 1) {
    for (let mantissa = 1; mantissa <= 9; mantissa += 1) {
      // mantissa × 10^k written so that 3 × 10^5 is exactly 300000, not 300000.00000000006.
      const value = exponent >= 0 ? mantissa * 10 ** exponent : mantissa / 10 ** -exponent;
      if (value >= min * (1 - 1e-12) && value <= max * (1 + 1e-12)) splits.push(value);
    }
  }
  return splits;
}

/** The x axis of a log-frequency chart: kHz/MHz labels at 1, 2, 5 (or fewer) per decade, grid at every tick. */
export function logFrequencyAxis(firstHz: number, lastHz: number): uPlot.Axis {
  return {
    label: 'Frequency',
    stroke: AXIS_COLOUR,
    font: AXIS_FONT,
    labelFont: LABEL_FONT,
    size: 30,
    labelSize: 22,
    gap: 4,
    splits: (_u, _axis, min, max) => logSplits(min, max),
    // Every split reaches `values`, which picks the labels; uPlot's own log filter keeps decades only.
    filter: (_u, splits) => splits,
    grid: { stroke: GRID_COLOUR, width: 1 },
    ticks: { stroke: GRID_COLOUR, width: 1, size: 4 },
    values: (u, splits) => {
      const plotWidthCss = u.bbox.width / (globalThis.devicePixelRatio || 1);
      const min = u.scales['x']?.min ?? firstHz;
      const max = u.scales['x']?.max ?? lastHz;
      return frequencyTickLabels(splits, pixelsPerDecade(min, max, plotWidthCss));
    },
  };
}

/** A y axis in dB units with the page's look. */
export function dbAxis(label: string, size = 52): uPlot.Axis {
  return {
    label,
    stroke: AXIS_COLOUR,
    font: AXIS_FONT,
    labelFont: LABEL_FONT,
    size,
    space: 28,
    incrs: [5, 10, 20, 25, 50, 100, 200],
    grid: { stroke: GRID_COLOUR, width: 1 },
    ticks: { stroke: GRID_COLOUR, width: 1, size: 4 },
    values: (_u, splits) => splits.map((value) => (value === null ? '' : String(value))),
  };
}

/** The canvas pixels per CSS pixel of a drawn plot (for line widths and text in hooks). */
export function pixelRatio(u: uPlot): number {
  const cssWidth = u.over.getBoundingClientRect().width;
  return cssWidth > 0 ? u.bbox.width / cssWidth : 1;
}
