import type uPlot from 'uplot';
import type { Detector } from '../../model/emissions-schema.ts';
import type { EmissionsAnalysis } from '../../spectrum/emissions-analysis.ts';
import type { MarginPoint } from '../../spectrum/margin.ts';
import { decimateLogMaxHold, type Reduce } from './decimate.ts';
import { formatFrequency } from '../../drawing/frequency-ticks.ts';
import { columnExtent } from './insertion-loss-options.ts';
import { MODE_COLOURS } from './insertion-loss-series.ts';
import { type ChartSize, dbAxis, logFrequencyAxis, pixelRatio } from './log-frequency-axis.ts';

/**
 * What the emissions chart draws, taken from an analysis the worker made: the scan as measured,
 * the predicted levels per detector, the limit lines exactly as the analysis evaluated them (the
 * `limitOnGrid` columns of its comparisons, so a step or a log-f slope looks the way it was judged),
 * the level with no filter, where the margin falls short of the target, and, for a scan of unknown
 * mode, how the filter was credited. Nothing here computes a level: it picks, labels and thins.
 */

export type LevelSeriesKind = 'predicted' | 'scan' | 'unfiltered' | 'limit';

export interface LevelSeriesSpec {
  readonly id: string;
  readonly kind: LevelSeriesKind;
  readonly label: string;
  readonly stroke: string;
  readonly width: number;
  readonly dash: readonly number[];
  /** Levels are max-held when thinned; a limit is min-held (the stricter value in a pixel). */
  readonly reduce: Reduce;
  /**
   * How the values are drawn: joined by a line (a scan, a limit), or as a dot per value with no
   * line between them (the estimate is a line spectrum: one value per harmonic, nothing between).
   */
  readonly style: 'line' | 'dots';
  readonly values: Float64Array;
}

export interface FrequencyRange {
  readonly startHz: number;
  readonly stopHz: number;
}

export interface EmissionsChartModel {
  readonly input: 'scan' | 'estimate';
  readonly frequencyHz: Float64Array;
  /** In drawing order: the last is drawn on top. Limits come last. */
  readonly series: readonly LevelSeriesSpec[];
  /** Where the margin is below the target for some limit and trace (the report's failing ranges, merged). */
  readonly belowTarget: readonly FrequencyRange[];
  readonly targetMarginDb: number;
  /** Drawn for a scan only: the level at which the scan shows the receiver, not the equipment. */
  readonly noiseFloorDbuV: number | undefined;
  /** For a scan of unknown mode: how the filter's improvement was credited. */
  readonly attributionNote: string | undefined;
  /** The lowest margin found, ringed on the chart. */
  readonly worst: MarginPoint | undefined;
  readonly yRangeDbuV: readonly [number, number];
  readonly description: string;
}

export interface EmissionsChartContext {
  /** Whether the scan was taken with a filter fitted (emissions.baseline); without one the scan is the unfiltered level. */
  readonly baselineFitted: boolean;
  /** The design's receiver noise floor, dBµV. */
  readonly noiseFloorDbuV: number | undefined;
}

export const DETECTOR_SHORT: Readonly<Record<Detector, string>> = { peak: 'peak', 'quasi-peak': 'QP', average: 'AV' };

/** Predicted levels: one hue per detector (none of them the CM blue or DM amber of the mode curves). */
export const PREDICTED_COLOURS: Readonly<Record<Detector, string>> = { peak: '#4b5563', 'quasi-peak': '#0d7a6f', average: '#6a3d9a' };
/** The scan as measured: light tints of the same hues, drawn underneath. */
export const SCAN_COLOURS: Readonly<Record<Detector, string>> = { peak: '#c3c9d1', 'quasi-peak': '#a6d3cc', average: '#d3c3e4' };
/** Limit lines: dark, thick, one colour per mask; the detector sets the dash. */
export const LIMIT_COLOURS = ['#9b1c1c', '#3d4652', '#8a5a00', '#1d4f91'] as const;
const LIMIT_DASH: Readonly<Record<Detector, readonly number[]>> = { 'quasi-peak': [], average: [9, 4], peak: [2, 3] };
export const BELOW_TARGET_FILL = 'rgba(200, 40, 40, 0.11)';
const FLOOR_COLOUR = '#6b7480';
const WORST_COLOUR = '#9b1c1c';

export const ATTRIBUTION_NOTES = {
  both: 'Mode unknown: the filter is credited with the smaller of its CM and DM improvements (worst case)',
  'common-mode': 'Mode unknown: the scan is treated as common-mode noise (CM improvement only)',
  'differential-mode': 'Mode unknown: the scan is treated as differential-mode noise (DM improvement only)',
} as const;

/** Build the chart's content from an analysis. */
export function emissionsChartModel(analysis: EmissionsAnalysis, context: EmissionsChartContext): EmissionsChartModel {
  const series: LevelSeriesSpec[] = [];
  const scan = analysis.scanPrediction;

  if (scan) {
    for (const trace of scan.traces) {
      series.push({
        id: `scan-${trace.detector}`,
        kind: 'scan',
        label: `scan as measured, ${DETECTOR_SHORT[trace.detector]}`,
        stroke: SCAN_COLOURS[trace.detector],
        width: 1,
        dash: [],
        reduce: 'max',
        style: 'line',
        values: trace.scanDbuV,
      });
    }
  }

  // Without a baseline filter the scan is itself the level with no filter: do not draw it twice.
  const showUnfiltered = analysis.input === 'estimate' || context.baselineFitted;
  const style = analysis.input === 'estimate' ? 'dots' : 'line';
  if (showUnfiltered) {
    const mode = (id: 'cm' | 'dm', values: Float64Array | undefined, label: string, stroke: string): void => {
      if (values) series.push({ id: `unfiltered-${id}`, kind: 'unfiltered', label, stroke, width: 1.25, dash: [5, 4], reduce: 'max', style, values });
    };
    mode('cm', analysis.unfilteredCommonModeDbuV, 'no filter, CM', MODE_COLOURS.CM);
    mode('dm', analysis.unfilteredDifferentialModeDbuV, 'no filter, DM', MODE_COLOURS.DM);
  }

  if (analysis.input === 'estimate') {
    // The estimate reads the same on every detector: the analysis hands one column per line to all
    // three detectors, so each line is drawn once; and once for both lines when they read alike
    // (a balanced filter).
    const lines: { label: string; values: Float64Array }[] = [];
    for (const predicted of analysis.predicted) {
      if (!lines.some((line) => line.values === predicted.levelDbuV || line.label === predicted.label)) {
        lines.push({ label: predicted.label, values: predicted.levelDbuV });
      }
    }
    const alike = lines.length === 2 && sameValues(lines[0]!.values, lines[1]!.values);
    const drawn = alike ? [{ label: 'lines 1 and 2, estimate', values: lines[0]!.values }] : lines;
    drawn.forEach((line, i) => {
      series.push({
        id: `predicted-line-${i + 1}`,
        kind: 'predicted',
        label: `${line.label} (any detector)`,
        stroke: i === 0 ? PREDICTED_COLOURS['quasi-peak'] : PREDICTED_COLOURS.average,
        width: 1.5,
        dash: [],
        reduce: 'max',
        style: 'dots',
        values: line.values,
      });
    });
  } else {
    for (const predicted of analysis.predicted) {
      series.push({
        id: `predicted-${predicted.detector}`,
        kind: 'predicted',
        label: `${predicted.label}, ${DETECTOR_SHORT[predicted.detector]}`,
        stroke: PREDICTED_COLOURS[predicted.detector],
        width: predicted.detector === 'peak' ? 1.25 : 1.75,
        dash: [],
        reduce: 'max',
        style: 'line',
        values: predicted.levelDbuV,
      });
    }
  }

  // One line per mask, as the analysis evaluated it on its own grid.
  analysis.masks.forEach((mask, m) => {
    const comparison = analysis.report.comparisons.find((c) => c.maskId === mask.id);
    if (!comparison) return;
    series.push({
      id: `limit-${mask.id}`,
      kind: 'limit',
      label: `limit: ${mask.name}`,
      stroke: LIMIT_COLOURS[m % LIMIT_COLOURS.length]!,
      width: 2,
      dash: LIMIT_DASH[mask.detector],
      reduce: 'min',
      style: 'line',
      values: comparison.limitDbuV,
    });
  });

  const extent = columnExtent(series.map((s) => s.values));
  const f = analysis.frequencyHz;
  const source = scan ? `the scan “${scan.scanName}”` : 'the design’s noise estimate';
  const span = f.length > 0 ? `from ${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)}` : 'with no points';
  const worst = analysis.report.worst;
  const worstText = worst ? `; lowest margin ${worst.marginDb.toFixed(1)} dB at ${formatFrequency(worst.frequencyHz, 4)}` : '';
  return {
    input: analysis.input,
    frequencyHz: f,
    series,
    belowTarget: mergeRanges(analysis.report.failingRanges),
    targetMarginDb: analysis.report.targetMarginDb,
    noiseFloorDbuV: analysis.input === 'scan' ? context.noiseFloorDbuV : undefined,
    attributionNote: scan?.attribution === undefined ? undefined : ATTRIBUTION_NOTES[scan.attribution],
    worst,
    yRangeDbuV: levelRange(extent.min, extent.max),
    description: `Predicted levels from ${source} against ${analysis.masks.length} limit line${analysis.masks.length === 1 ? '' : 's'}, ${span}${worstText}`,
  };
}

/** Whether two columns hold the same numbers (NaN equal to NaN). */
export function sameValues(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i += 1) if (!Object.is(a[i], b[i])) return false;
  return true;
}

/** Overlapping or touching ranges joined, rising. */
export function mergeRanges(ranges: readonly FrequencyRange[]): FrequencyRange[] {
  const sorted = [...ranges].sort((a, b) => a.startHz - b.startHz);
  const merged: { startHz: number; stopHz: number }[] = [];
  for (const range of sorted) {
    const last = merged[merged.length - 1];
    if (last && range.startHz <= last.stopHz) last.stopHz = Math.max(last.stopHz, range.stopHz);
    else merged.push({ startHz: range.startHz, stopHz: range.stopHz });
  }
  return merged;
}

/**
 * The dBµV range shown: with room above the highest level and limit (where the plot's note sits
 * without hiding a peak), and down to the lowest but no more than 110 dB below the top (a prediction
 * far under the receiver's floor says nothing more).
 */
export function levelRange(minDbuV: number | null, maxDbuV: number | null): [number, number] {
  const high = maxDbuV !== null && Number.isFinite(maxDbuV) ? maxDbuV : 80;
  const low = minDbuV !== null && Number.isFinite(minDbuV) ? minDbuV : 0;
  const top = Math.ceil((high + 12) / 10) * 10;
  const bottom = Math.max(Math.floor((low - 3) / 10) * 10, top - 110);
  return [Math.min(bottom, top - 20), top];
}

export type FrequencyWindow = readonly [number, number];

/** The chart's data for a window of the axis, thinned to about `bins` points (max-hold, min-hold for limits). */
export function emissionsPlotData(model: EmissionsChartModel, window: FrequencyWindow, bins: number): uPlot.AlignedData {
  const thinned = decimateLogMaxHold(
    model.frequencyHz,
    model.series.map((s) => s.values),
    { bins, fromX: window[0], toX: window[1], reduce: model.series.map((s) => s.reduce), keepEnds: true },
  );
  return [thinned.x, ...thinned.columns];
}

/** Taller than the insertion-loss chart: limits, scan and prediction share it, with a note on top. */
export function emissionsChartSize(width: number): ChartSize {
  const usable = Math.max(280, Math.floor(width));
  return { width: usable, height: Math.round(Math.min(540, Math.max(300, usable * 0.58))) };
}

/** About one bin per pixel of plot width. */
export function binsFor(plotWidthCss: number): number {
  return Math.max(200, Math.round(plotWidthCss));
}

function sameWindow(a: FrequencyWindow, b: FrequencyWindow): boolean {
  return Math.abs(a[0] - b[0]) <= 1e-9 * b[0] && Math.abs(a[1] - b[1]) <= 1e-9 * b[1];
}

const formatLevel = (value: number | null): string => (value === null ? '–' : `${value.toFixed(1)} dBµV`);

export interface EmissionsPlot {
  readonly options: uPlot.Options;
  readonly data: uPlot.AlignedData;
}

/** How the chart defers work until uPlot has finished the change it is reporting. */
export type Scheduler = (task: () => void) => void;
const nextTask: Scheduler = (task) => {
  setTimeout(task, 0);
};

/**
 * uPlot options and data for the emissions chart. Zooming (drag across the plot) thins the data again
 * for the new window, so a million-point scan shows its own points once zoomed in far enough; a
 * double-click goes back to the whole axis (the thinned data always keeps the axis' two ends).
 */
export function buildEmissionsPlot(model: EmissionsChartModel, size: ChartSize, schedule: Scheduler = nextTask): EmissionsPlot {
  const f = model.frequencyHz;
  const firstHz = f[0] ?? 1e5;
  const lastHz = f[f.length - 1] ?? 3e7;
  let shown: FrequencyWindow = [firstHz, lastHz];
  const data = emissionsPlotData(model, shown, binsFor(size.width));

  const rethin = (u: uPlot): void => {
    const min = u.scales['x']?.min;
    const max = u.scales['x']?.max;
    if (min == null || max == null || sameWindow([min, max], shown)) return;
    const wanted: FrequencyWindow = [min, max];
    shown = wanted;
    // Not inside uPlot's own commit: set the data once it has finished drawing this scale change.
    schedule(() => {
      if (shown !== wanted) return;
      const widthCss = u.bbox.width / (globalThis.devicePixelRatio || 1);
      u.batch(() => {
        u.setData(emissionsPlotData(model, wanted, binsFor(widthCss)));
        u.setScale('x', { min: wanted[0], max: wanted[1] });
      });
    });
  };

  const [yLow, yHigh] = model.yRangeDbuV;
  const options: uPlot.Options = {
    width: size.width,
    height: size.height,
    legend: {
      live: true,
      // Legend swatches drawn as line samples (see plot-element.ts): solid, dashed, or dotted for dots.
      markers: {
        width: (_u, index) => (model.series[index - 1]?.style === 'dots' ? 4 : 2),
        dash: (_u, index) => {
          const spec = model.series[index - 1];
          return spec?.style === 'dots' ? 'dotted' : (spec?.dash.length ?? 0) > 0 ? 'dashed' : 'solid';
        },
      },
    },
    cursor: { drag: { x: true, y: false }, focus: { prox: 24 } },
    focus: { alpha: 0.35 },
    scales: {
      x: { distr: 3, log: 10, range: (_u, min, max) => [min ?? firstHz, max ?? lastHz] },
      // A fixed level range: zooming in on frequency keeps the limits in the same place.
      y: { range: () => [yLow, yHigh] },
    },
    axes: [logFrequencyAxis(firstHz, lastHz), dbAxis('Level (dBµV)')],
    series: [
      { label: 'Frequency', value: (_u, hz) => (hz === null ? '–' : formatFrequency(hz, 4)) },
      ...model.series.map(
        (spec): uPlot.Series => ({
          label: spec.label,
          stroke: spec.stroke,
          width: spec.width,
          dash: [...spec.dash],
          spanGaps: false,
          ...(spec.style === 'dots'
            ? { paths: () => null, points: { show: true, size: spec.kind === 'predicted' ? 5 : 4, width: 1, stroke: spec.stroke, fill: spec.kind === 'predicted' ? spec.stroke : '#ffffff' } }
            : { points: { show: false } }),
          value: (_u, v) => formatLevel(v),
        }),
      ),
    ],
    hooks: { setScale: [(u, key) => (key === 'x' ? rethin(u) : undefined)] },
    plugins: [marginOverlay(model)],
  };
  return { options, data };
}

/** Shading where the margin is below target (under the curves), the noise floor and a ring at the worst margin (over them). */
function marginOverlay(model: EmissionsChartModel): uPlot.Plugin {
  return {
    hooks: {
      drawClear: [(u) => drawBelowTarget(u, model.belowTarget)],
      draw: [(u) => drawFloor(u, model.noiseFloorDbuV), (u) => drawWorst(u, model.worst)],
    },
  };
}

function drawBelowTarget(u: uPlot, ranges: readonly FrequencyRange[]): void {
  const { ctx, bbox } = u;
  const ratio = pixelRatio(u);
  const left = bbox.left;
  const right = bbox.left + bbox.width;
  ctx.save();
  ctx.fillStyle = BELOW_TARGET_FILL;
  for (const range of ranges) {
    let x0 = u.valToPos(range.startHz, 'x', true);
    let x1 = u.valToPos(range.stopHz, 'x', true);
    // A range of one point would be invisible: give it three pixels.
    const least = 3 * ratio;
    if (x1 - x0 < least) {
      const middle = (x0 + x1) / 2;
      x0 = middle - least / 2;
      x1 = middle + least / 2;
    }
    x0 = Math.max(x0, left);
    x1 = Math.min(x1, right);
    if (x1 > x0) ctx.fillRect(x0, bbox.top, x1 - x0, bbox.height);
  }
  ctx.restore();
}

function drawFloor(u: uPlot, floorDbuV: number | undefined): void {
  if (floorDbuV === undefined) return;
  const { ctx, bbox } = u;
  const y = u.valToPos(floorDbuV, 'y', true);
  if (!(y > bbox.top && y < bbox.top + bbox.height)) return;
  const ratio = pixelRatio(u);
  ctx.save();
  ctx.strokeStyle = FLOOR_COLOUR;
  ctx.lineWidth = ratio;
  ctx.setLineDash([2 * ratio, 3 * ratio]);
  ctx.beginPath();
  ctx.moveTo(bbox.left, y);
  ctx.lineTo(bbox.left + bbox.width, y);
  ctx.stroke();
  ctx.setLineDash([]);
  const text = `receiver noise floor ${floorDbuV} dBµV`;
  ctx.font = `${11 * ratio}px system-ui, sans-serif`;
  const width = ctx.measureText(text).width;
  const right = bbox.left + bbox.width - 6 * ratio;
  ctx.fillStyle = 'rgba(255, 255, 255, 0.75)';
  ctx.fillRect(right - width - 3 * ratio, y + 2 * ratio, width + 6 * ratio, 14 * ratio);
  ctx.fillStyle = FLOOR_COLOUR;
  ctx.textAlign = 'right';
  ctx.textBaseline = 'top';
  ctx.fillText(text, right, y + 3 * ratio);
  ctx.restore();
}

function drawWorst(u: uPlot, worst: MarginPoint | undefined): void {
  if (!worst) return;
  const { ctx, bbox } = u;
  const x = u.valToPos(worst.frequencyHz, 'x', true);
  const y = u.valToPos(worst.levelDbuV, 'y', true);
  if (!(x >= bbox.left && x <= bbox.left + bbox.width && y >= bbox.top && y <= bbox.top + bbox.height)) return;
  const ratio = pixelRatio(u);
  ctx.save();
  ctx.strokeStyle = WORST_COLOUR;
  ctx.lineWidth = 2 * ratio;
  ctx.beginPath();
  ctx.arc(x, y, 7 * ratio, 0, 2 * Math.PI);
  ctx.stroke();
  ctx.restore();
}

// ---------------------------------------------------------------------------------------------
// Required attenuation

export interface RequiredAttenuationModel {
  readonly frequencyHz: Float64Array;
  /** Dots for a line spectrum (the estimate), lines for a scan. */
  readonly style: 'line' | 'dots';
  readonly series: readonly { readonly label: string; readonly stroke: string; readonly values: Float64Array }[];
  readonly yMaxDb: number;
  readonly targetMarginDb: number;
  readonly description: string;
}

/** The attenuation still missing per mode with no filter (limit less the target margin), or undefined when there is none to draw. */
export function requiredAttenuationModel(analysis: EmissionsAnalysis): RequiredAttenuationModel | undefined {
  const series: { label: string; stroke: string; values: Float64Array }[] = [];
  if (analysis.requiredAttenuationCmDb) series.push({ label: 'CM needed', stroke: MODE_COLOURS.CM, values: analysis.requiredAttenuationCmDb });
  if (analysis.requiredAttenuationDmDb) series.push({ label: 'DM needed', stroke: MODE_COLOURS.DM, values: analysis.requiredAttenuationDmDb });
  if (series.length === 0) return undefined;
  const { max } = columnExtent(series.map((s) => s.values));
  return {
    frequencyHz: analysis.frequencyHz,
    style: analysis.input === 'estimate' ? 'dots' : 'line',
    series,
    yMaxDb: Math.max(10, Math.ceil(((max ?? 0) + 2) / 10) * 10),
    targetMarginDb: analysis.report.targetMarginDb,
    description: `Attenuation needed per mode with no filter, for every limit less the ${analysis.report.targetMarginDb} dB target margin`,
  };
}

export function buildRequiredAttenuationPlot(model: RequiredAttenuationModel, size: ChartSize): EmissionsPlot {
  const f = model.frequencyHz;
  const firstHz = f[0] ?? 1e5;
  const lastHz = f[f.length - 1] ?? 3e7;
  const thinned = decimateLogMaxHold(
    f,
    model.series.map((s) => s.values),
    { bins: binsFor(size.width) },
  );
  const options: uPlot.Options = {
    width: size.width,
    height: size.height,
    legend: { live: true, markers: { width: model.style === 'dots' ? 4 : 2, dash: model.style === 'dots' ? 'dotted' : 'solid' } },
    cursor: { drag: { x: false, y: false }, focus: { prox: 24 } },
    scales: {
      x: { distr: 3, log: 10, range: (_u, min, max) => [min ?? firstHz, max ?? lastHz] },
      y: { range: () => [0, model.yMaxDb] },
    },
    axes: [logFrequencyAxis(firstHz, lastHz), dbAxis('Needed (dB)', 46)],
    series: [
      { label: 'Frequency', value: (_u, hz) => (hz === null ? '–' : formatFrequency(hz, 4)) },
      ...model.series.map(
        (s): uPlot.Series => ({
          label: s.label,
          stroke: s.stroke,
          width: 1.5,
          spanGaps: false,
          // Where the noise floor or a missing limit leaves single points between gaps, they still show.
          ...(model.style === 'dots' ? { paths: () => null } : {}),
          points: { show: true, size: model.style === 'dots' ? 4 : 3, width: 1, stroke: s.stroke, fill: s.stroke },
          value: (_u, v) => (v === null ? '–' : `${v.toFixed(1)} dB`),
        }),
      ),
    ],
  };
  return { options, data: [thinned.x, ...thinned.columns] };
}
