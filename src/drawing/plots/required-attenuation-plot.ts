import type { SweepResult } from '../../engine/sweep/sweep-result.ts';
import type { EmissionsAnalysis } from '../../spectrum/emissions-analysis.ts';
import { formatFrequency } from '../frequency-ticks.ts';
import type { PlotSeries, PlotSpec } from '../plot-spec.ts';
import { mergeRanges } from './emissions-plot.ts';
import { extentOf, line, visibleColumns } from './plot-helpers.ts';

/**
 * The attenuation still needed per mode (the level with no filter less the limit and the target
 * margin) drawn over what the filter gives in circuit, so the shortfall shows where the needed curve
 * rises above the filter's: shaded where the analysis finds the margin short of the target. Drawn
 * only when the analysis has a required attenuation (a mask and noise to judge).
 */
export function requiredAttenuationPlot(analysis: EmissionsAnalysis, sweep: SweepResult | undefined, hidden: ReadonlySet<string> = new Set()): PlotSpec | undefined {
  const f = analysis.frequencyHz;
  const draw = analysis.input === 'estimate' ? 'dots' : 'line';
  const series: PlotSeries[] = [];
  const push = (s: PlotSeries): void => {
    series.push(hidden.has(s.id) ? { ...s, hidden: true } : s);
  };
  if (analysis.requiredAttenuationCmDb) push({ id: 'needed-cm', label: 'CM needed', frequencyHz: f, values: analysis.requiredAttenuationCmDb, style: { color: 'common-mode', width: 2, dash: 'solid', draw }, reduce: 'max' });
  if (analysis.requiredAttenuationDmDb) push({ id: 'needed-dm', label: 'DM needed', frequencyHz: f, values: analysis.requiredAttenuationDmDb, style: { color: 'differential-mode', width: 2, dash: 'solid', draw }, reduce: 'max' });
  if (series.length === 0) return undefined;
  if (sweep) {
    push({ id: 'given-cm', label: 'CM given in circuit', frequencyHz: sweep.frequencyHz, values: sweep.columns.insertionLossInCircuitCm, style: line('common-mode', 1.25, 'dash'), reduce: 'min' });
    push({ id: 'given-dm', label: 'DM given in circuit', frequencyHz: sweep.frequencyHz, values: sweep.columns.insertionLossInCircuitDm, style: line('differential-mode', 1.25, 'dash'), reduce: 'min' });
  }
  const needed = extentOf(series.filter((s) => s.id.startsWith('needed')).map((s) => s.values));
  const all = extentOf(visibleColumns(series));
  // The needed attenuation decides the scale; the filter's curve may run far above it (clipped at the top).
  const max = Math.max(20, Math.ceil(((needed.max ?? 0) + 15) / 10) * 10);
  const min = Math.min(0, Math.floor(((all.min ?? 0) - 2) / 10) * 10);
  const span = f.length > 0 ? `from ${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)}` : '';
  return {
    id: 'required-attenuation',
    title: 'Attenuation needed and given',
    description: `Attenuation needed per mode with no filter for every limit less the ${analysis.report.targetMarginDb} dB target margin, against the filter's in-circuit insertion loss, ${span}`,
    x: { label: 'Frequency', min: f[0] ?? 150e3, max: f[f.length - 1] ?? 30e6 },
    y: { label: 'Attenuation', unit: 'dB', min, max, scale: 'linear' },
    series,
    bands: [],
    regions: mergeRanges(analysis.report.failingRanges).map((range) => ({ ...range, label: `short of the target, ${formatFrequency(range.startHz, 4)} to ${formatFrequency(range.stopHz, 4)}`, color: 'shortfall' })),
    levels: [],
    markers: [],
    notes: analysis.input === 'estimate' ? ['A line spectrum: one value per harmonic.'] : [],
  };
}
