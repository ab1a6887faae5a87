import type uPlot from 'uplot';
import { formatFrequency, frequencyTickLabels, pixelsPerDecade } from './frequency-ticks.ts';

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
 * multiples such as 105 kHz and 210 kHz; these stay on the decades wherever the axis starts. Zoomed
 * in so far that fewer than four of those fall inside, the steps become 1.0, 1.1 … 9.9 × 10^k, and so on.
 */
export function logSplits(min: number, max: number): number[] {
  if (!(min > 0 && max >= min && Number.isFinite(max))) return [];
  let splits: number[] = [];
  for (let digits = 0; digits <= 3; digits += 1) {
    splits = splitsWithDigits(min, max, digits);
    if (splits.length >= 4) break;
  }
  return splits;
}

/** k × 10^(e − digits) for k = 10^digits … 10^(digits+1) − 1, written so that 3 × 10^5 is exactly 300000. */
function splitsWithDigits(min: number, max: number, digits: number): number[] {
  const splits: number[] = [];
  const first = 10 ** digits;
  for (let exponent = Math.floor(Math.log10(min)); exponent <= Math.ceil(Math.log10(max)); exponent += 1) {
    const power = exponent - digits;
    for (let k = first; k < 10 * first; k += 1) {
      const value = power >= 0 ? k * 10 ** power : k / 10 ** -power;
      if (value >= min * (1 - 1e-12) && value <= max * (1 + 1e-12)) splits.push(value);
    }
  }
  return splits;
}

/**
 * Labels for log-axis ticks: 1, 2 and 5 (or fewer) per decade on whole mantissas, as the
 * insertion-loss chart does; on the finer ticks of a zoomed-in axis, every tick that is at least
 * 64 pixels from the last labelled one.
 */
export function logTickLabels(splits: readonly (number | null)[], min: number, pixelsPerDecadeCss: number): string[] {
  const fine = splits.some((hz) => hz !== null && hz > 0 && Math.abs(hz / 10 ** Math.floor(Math.log10(hz) + 1e-9) - Math.round(hz / 10 ** Math.floor(Math.log10(hz) + 1e-9))) > 1e-9);
  if (!fine) return frequencyTickLabels(splits, pixelsPerDecadeCss);
  let lastPx = -Infinity;
  return splits.map((hz) => {
    if (hz === null || !(hz > 0)) return '';
    const px = Math.log10(hz / min) * pixelsPerDecadeCss;
    if (px - lastPx < 64) return '';
    lastPx = px;
    return formatFrequency(hz, 4);
  });
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
      return logTickLabels(splits, min, pixelsPerDecade(min, max, plotWidthCss));
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
