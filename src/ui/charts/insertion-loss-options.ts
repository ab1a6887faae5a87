import type uPlot from 'uplot';
import type { SweepResult } from '../../engine/index.ts';
import { overlayPlugin } from './chart-overlays.ts';
import { formatFrequency, frequencyTickLabels, pixelsPerDecade } from '../../drawing/frequency-ticks.ts';
import { INSERTION_LOSS_SERIES } from './insertion-loss-series.ts';
import { resonanceNotes } from './resonance-marks.ts';

export interface ChartSize {
  readonly width: number;
  readonly height: number;
}

export interface InsertionLossPlot {
  readonly options: uPlot.Options;
  /** The frequency axis and one column per drawn series, shared with the result (not copied). */
  readonly data: uPlot.AlignedData;
  /** The y range for the whole sweep, in dB. */
  readonly yRangeDb: readonly [number, number];
}

const AXIS_COLOUR = '#3d4652';
const GRID_COLOUR = '#e2e6eb';
const AXIS_FONT = '12px system-ui, sans-serif';
const LABEL_FONT = '600 12px system-ui, sans-serif';

/**
 * The y range for insertion-loss curves from the lowest and highest value shown. Negative insertion
 * loss (the filter resonating with the source or LISN) is the finding that matters most, so the
 * range always reaches below the lowest value and below 0 dB with room to spare; it is never clipped.
 */
export function insertionLossRange(minDb: number | null, maxDb: number | null): [number, number] {
  const low = minDb !== null && Number.isFinite(minDb) ? minDb : 0;
  const high = maxDb !== null && Number.isFinite(maxDb) ? maxDb : 0;
  return [Math.min(-10, Math.floor((low - 2) / 10) * 10), Math.max(10, Math.ceil((high + 2) / 10) * 10)];
}

/** Lowest and highest finite values over some columns. */
export function columnExtent(columns: readonly Float64Array[]): { min: number | null; max: number | null } {
  let min = Infinity;
  let max = -Infinity;
  for (const column of columns) {
    for (const value of column) {
      if (!Number.isFinite(value)) continue;
      if (value < min) min = value;
      if (value > max) max = value;
    }
  }
  return min <= max ? { min, max } : { min: null, max: null };
}

/** One line saying what the chart shows, for screen readers and the element's label. */
export function describeInsertionLossChart(result: SweepResult): string {
  const f = result.frequencyHz;
  const { min, max } = columnExtent(INSERTION_LOSS_SERIES.map((series) => result.columns[series.column]));
  const span = f.length > 0 ? `from ${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)}` : 'with no points';
  const range = min === null || max === null ? '' : `; values from ${min.toFixed(1)} dB to ${max.toFixed(1)} dB`;
  return `Insertion loss of ${result.designName}, common and differential mode, in circuit and 50 Ω/50 Ω, ${span}${range}`;
}

/** uPlot options and data for the CM and DM insertion-loss chart of one sweep. */
export function buildInsertionLossPlot(result: SweepResult, size: ChartSize): InsertionLossPlot {
  const frequencyHz = result.frequencyHz;
  const columns = INSERTION_LOSS_SERIES.map((series) => result.columns[series.column]);
  const extent = columnExtent(columns);
  const firstHz = frequencyHz[0] ?? 1;
  const lastHz = frequencyHz[frequencyHz.length - 1] ?? 10;

  const options: uPlot.Options = {
    width: size.width,
    height: size.height,
    legend: {
      live: true,
      // Legend swatches drawn as line samples (see the chart's CSS): solid or dashed like the curve.
      markers: { width: 2, dash: (_u, index) => ((INSERTION_LOSS_SERIES[index - 1]?.dash.length ?? 0) > 0 ? 'dashed' : 'solid') },
    },
    cursor: { drag: { x: true, y: false }, focus: { prox: 24 } },
    focus: { alpha: 0.3 },
    scales: {
      // Fit the sweep exactly: uPlot's default widens a log axis to whole decades.
      x: { distr: 3, log: 10, range: (_u, min, max) => [min ?? firstHz, max ?? lastHz] },
      // Recomputed on zoom, so a zoomed-in view fits its own curves.
      y: { range: (_u, min, max) => insertionLossRange(min, max) },
    },
    axes: [
      {
        label: 'Frequency',
        stroke: AXIS_COLOUR,
        font: AXIS_FONT,
        labelFont: LABEL_FONT,
        size: 30,
        labelSize: 22,
        gap: 4,
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
      },
      {
        label: 'Insertion loss (dB)',
        stroke: AXIS_COLOUR,
        font: AXIS_FONT,
        labelFont: LABEL_FONT,
        size: 52,
        space: 28,
        incrs: [5, 10, 20, 25, 50, 100, 200],
        grid: { stroke: GRID_COLOUR, width: 1 },
        ticks: { stroke: GRID_COLOUR, width: 1, size: 4 },
        values: (_u, splits) => splits.map((value) => (value === null ? '' : String(value))),
      },
    ],
    series: [
      { label: 'Frequency', value: (_u, hz) => (hz === null ? '–' : formatFrequency(hz, 4)) },
      ...INSERTION_LOSS_SERIES.map(
        (series): uPlot.Series => ({
          label: series.label,
          stroke: series.stroke,
          width: series.width,
          dash: [...series.dash],
          points: { show: false },
          value: (_u, db) => (db === null ? '–' : `${db.toFixed(1)} dB`),
        }),
      ),
    ],
    plugins: [overlayPlugin(resonanceNotes(result))],
  };

  return {
    options,
    data: [frequencyHz, ...columns],
    yRangeDb: insertionLossRange(extent.min, extent.max),
  };
}
