import type uPlot from 'uplot';
import { formatFrequency, frequencyTickLabels, logSplits, pixelsPerDecade } from '../../drawing/frequency-ticks.ts';

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
