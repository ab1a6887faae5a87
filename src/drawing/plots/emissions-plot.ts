import type { Attribution, Detector } from '../../model/emissions-schema.ts';
import type { EmissionsAnalysis } from '../../spectrum/emissions-analysis.ts';
import type { FailingRange } from '../../spectrum/margin.ts';
import { formatFrequency } from '../frequency-ticks.ts';
import type { PlotColor, PlotDash, PlotLevel, PlotMarker, PlotRegion, PlotSeries, PlotSpec } from '../plot-spec.ts';
import { dots, extentOf, line, type Overlay, overlayDash, visibleColumns } from './plot-helpers.ts';

/**
 * The emission plot: the scan as measured, the levels with no filter (when a baseline filter was
 * fitted, or for an estimate), the predicted levels per detector, and every limit line exactly as the
 * analysis evaluated it (its `limitDbuV` column, so a step or a log-f slope looks the way it was
 * judged); shaded where the margin falls short of the target, the receiver's floor, the worst margin
 * ringed. Other variants add their predicted levels with their own dash. Nothing here computes a level.
 */

export const DETECTOR_SHORT: Readonly<Record<Detector, string>> = { peak: 'peak', 'quasi-peak': 'QP', average: 'AV' };

const LIMIT_COLORS: readonly PlotColor[] = ['limit-1', 'limit-2', 'limit-3', 'limit-4'];
const LIMIT_DASH: Readonly<Record<Detector, PlotDash>> = { 'quasi-peak': 'solid', average: 'dash', peak: 'dot' };
const SCAN_COLOR: Readonly<Record<Detector, PlotColor>> = { peak: 'scan-peak', 'quasi-peak': 'scan-quasi-peak', average: 'scan-average' };

export const ATTRIBUTION_NOTES: Readonly<Record<Attribution, string>> = {
  both: 'Mode unknown: the filter is credited with the smaller of its CM and DM improvements (worst case).',
  'common-mode': 'Mode unknown: the scan is treated as common-mode noise (CM improvement only).',
  'differential-mode': 'Mode unknown: the scan is treated as differential-mode noise (DM improvement only).',
};

export interface EmissionsPlotOptions {
  /** Whether the scan was taken with a filter fitted; without one the scan is itself the level with no filter. */
  readonly baselineFitted: boolean;
  readonly noiseFloorDbuV: number | undefined;
  readonly overlays?: readonly Overlay<EmissionsAnalysis>[];
  readonly hidden?: ReadonlySet<string>;
}

/** The dBµV range: room above the highest level and limit, down to the lowest but no more than 110 dB below the top. */
export function levelRange(minDbuV: number | null, maxDbuV: number | null): [number, number] {
  const high = maxDbuV !== null && Number.isFinite(maxDbuV) ? maxDbuV : 80;
  const low = minDbuV !== null && Number.isFinite(minDbuV) ? minDbuV : 0;
  const top = Math.ceil((high + 12) / 10) * 10;
  const bottom = Math.max(Math.floor((low - 3) / 10) * 10, top - 110);
  return [Math.min(bottom, top - 20), top];
}

/** Overlapping or touching ranges joined, rising. */
export function mergeRanges(ranges: readonly Pick<FailingRange, 'startHz' | 'stopHz'>[]): { startHz: number; stopHz: number }[] {
  const sorted = [...ranges].sort((a, b) => a.startHz - b.startHz);
  const merged: { startHz: number; stopHz: number }[] = [];
  for (const range of sorted) {
    const last = merged[merged.length - 1];
    if (last && range.startHz <= last.stopHz) last.stopHz = Math.max(last.stopHz, range.stopHz);
    else merged.push({ startHz: range.startHz, stopHz: range.stopHz });
  }
  return merged;
}

/** Whether two columns hold the same numbers (NaN equal to NaN). */
export function sameValues(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i += 1) if (!Object.is(a[i], b[i])) return false;
  return true;
}

/** The predicted series of an analysis: per detector for a scan; per line (one for both when alike) for an estimate. */
function predictedSeries(analysis: EmissionsAnalysis, idPrefix: string, suffix: string, dash: PlotDash | undefined, variantId: string | undefined): PlotSeries[] {
  const f = analysis.frequencyHz;
  const out: PlotSeries[] = [];
  const variant = variantId === undefined ? {} : { variantId };
  if (analysis.input === 'estimate') {
    const lines: { label: string; values: Float64Array }[] = [];
    for (const predicted of analysis.predicted) {
      if (!lines.some((l) => l.values === predicted.levelDbuV || l.label === predicted.label)) lines.push({ label: predicted.label, values: predicted.levelDbuV });
    }
    const alike = lines.length === 2 && sameValues(lines[0]!.values, lines[1]!.values);
    const drawn = alike ? [{ label: 'lines 1 and 2, estimate', values: lines[0]!.values }] : lines;
    drawn.forEach((l, i) => {
      const color: PlotColor = i === 0 ? 'quasi-peak' : 'average';
      out.push({
        id: `${idPrefix}predicted-line-${i + 1}`,
        label: `${l.label} (any detector)${suffix}`,
        frequencyHz: f,
        values: l.values,
        style: dash ? { ...dots(color), dash } : dots(color),
        reduce: 'max',
        ...variant,
      });
    });
    return out;
  }
  for (const predicted of analysis.predicted) {
    out.push({
      id: `${idPrefix}predicted-${predicted.detector}`,
      label: `${predicted.label}, ${DETECTOR_SHORT[predicted.detector]}${suffix}`,
      frequencyHz: f,
      values: predicted.levelDbuV,
      style: line(predicted.detector, predicted.detector === 'peak' ? 1.25 : 1.75, dash ?? 'solid'),
      reduce: 'max',
      ...variant,
    });
  }
  return out;
}

export function emissionsPlot(analysis: EmissionsAnalysis, options: EmissionsPlotOptions): PlotSpec {
  const hidden = options.hidden ?? new Set<string>();
  const f = analysis.frequencyHz;
  const series: PlotSeries[] = [];
  const push = (s: PlotSeries): void => {
    series.push(hidden.has(s.id) ? { ...s, hidden: true } : s);
  };
  const scan = analysis.scanPrediction;

  if (scan) {
    for (const trace of scan.traces) {
      push({ id: `scan-${trace.detector}`, label: `scan as measured, ${DETECTOR_SHORT[trace.detector]}`, frequencyHz: f, values: trace.scanDbuV, style: line(SCAN_COLOR[trace.detector], 1), reduce: 'max' });
    }
  }
  // Without a baseline filter the scan is itself the level with no filter: not drawn twice.
  if (analysis.input === 'estimate' || options.baselineFitted) {
    const draw = analysis.input === 'estimate' ? 'dots' : 'line';
    for (const [id, values, label, color] of [
      ['unfiltered-cm', analysis.unfilteredCommonModeDbuV, 'no filter, CM', 'common-mode'],
      ['unfiltered-dm', analysis.unfilteredDifferentialModeDbuV, 'no filter, DM', 'differential-mode'],
    ] as const) {
      if (values) push({ id, label, frequencyHz: f, values, style: { color, width: 1.25, dash: 'dash', draw }, reduce: 'max' });
    }
  }
  for (const s of predictedSeries(analysis, '', '', undefined, undefined)) push(s);
  (options.overlays ?? []).forEach((overlay, index) => {
    for (const s of predictedSeries(overlay.result, `${overlay.variantId}:`, `, ${overlay.name}`, overlayDash(index), overlay.variantId)) push(s);
  });
  analysis.masks.forEach((mask, m) => {
    const comparison = analysis.report.comparisons.find((c) => c.maskId === mask.id);
    if (!comparison) return;
    push({
      id: `limit-${mask.id}`,
      label: `limit: ${mask.name}`,
      frequencyHz: comparison.frequencyHz,
      values: comparison.limitDbuV,
      style: line(LIMIT_COLORS[m % LIMIT_COLORS.length]!, 2, LIMIT_DASH[mask.detector]),
      reduce: 'min',
    });
  });

  const regions: PlotRegion[] = mergeRanges(analysis.report.failingRanges).map((range) => ({
    ...range,
    label: `margin below the ${analysis.report.targetMarginDb} dB target, ${formatFrequency(range.startHz, 4)} to ${formatFrequency(range.stopHz, 4)}`,
    color: 'shortfall',
  }));
  const levels: PlotLevel[] =
    analysis.input === 'scan' && options.noiseFloorDbuV !== undefined
      ? [{ value: options.noiseFloorDbuV, label: `receiver noise floor ${options.noiseFloorDbuV} dBµV`, color: 'floor', dash: 'dot' }]
      : [];
  const worst = analysis.report.worst;
  const markers: PlotMarker[] = worst
    ? [{ frequencyHz: worst.frequencyHz, value: worst.levelDbuV, label: `lowest margin ${worst.marginDb.toFixed(1)} dB at ${formatFrequency(worst.frequencyHz, 4)} (${worst.maskName})`, shape: 'circle', color: 'worst' }]
    : [];
  const notes = scan?.attribution === undefined ? [] : [ATTRIBUTION_NOTES[scan.attribution]];
  const extent = extentOf(visibleColumns(series));
  const [min, max] = levelRange(extent.min, extent.max);
  const source = scan ? `the scan “${scan.scanName}”` : 'the design’s noise estimate';
  const span = f.length > 0 ? `from ${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)}` : 'with no points';
  const worstText = worst ? `; lowest margin ${worst.marginDb.toFixed(1)} dB at ${formatFrequency(worst.frequencyHz, 4)}` : '';
  return {
    id: 'emissions',
    title: 'Emission at the LISN against the limits',
    description: `Predicted levels from ${source} against ${analysis.masks.length} limit line${analysis.masks.length === 1 ? '' : 's'}, ${span}${worstText}`,
    x: { label: 'Frequency', min: f[0] ?? 150e3, max: f[f.length - 1] ?? 30e6 },
    y: { label: 'Level', unit: 'dBµV', min, max, scale: 'linear' },
    series,
    bands: [],
    regions,
    levels,
    markers,
    notes,
  };
}
