import type { ElementSweep, SweepResult } from '../../engine/sweep/sweep-result.ts';
import { formatFrequency } from '../frequency-ticks.ts';
import type { PlotColor, PlotMarker, PlotSeries, PlotSpec } from '../plot-spec.ts';
import { line, visibleColumns } from './plot-helpers.ts';

/**
 * Each part's own impedance |Z| against frequency (log-log), with its self-resonances marked: below
 * an inductor's SRF it is inductive, above it capacitive, and the filter loses that part's attenuation.
 * A choke shows its CM and DM impedance. The selected part is drawn bold; `only` limits the plot to
 * some parts.
 */

const COLORS: readonly PlotColor[] = ['series-1', 'series-2', 'series-3', 'series-4', 'series-5', 'series-6'];

export interface PartImpedanceOptions {
  readonly selectedId?: string;
  /** Parts to draw (default: all). */
  readonly only?: readonly string[];
  readonly hidden?: ReadonlySet<string>;
}

function viewLabel(element: ElementSweep, view: ElementSweep['views'][number]): string {
  const name = element.label || element.id;
  return view.name === 'impedance' ? name : `${name}, ${view.name === 'common-mode' ? 'CM' : 'DM'}`;
}

export function partImpedancePlot(result: SweepResult, options: PartImpedanceOptions = {}): PlotSpec {
  const f = result.frequencyHz;
  const hidden = options.hidden ?? new Set<string>();
  const only = options.only ? new Set(options.only) : undefined;
  const series: PlotSeries[] = [];
  const markers: PlotMarker[] = [];
  let colorIndex = 0;
  for (const element of result.elements) {
    if (only && !only.has(element.id)) continue;
    const color = COLORS[colorIndex % COLORS.length]!;
    colorIndex += 1;
    const selected = element.id === options.selectedId;
    element.views.forEach((view, v) => {
      const id = `${element.id}:${view.name}`;
      series.push({
        id,
        label: viewLabel(element, view),
        frequencyHz: f,
        values: view.magnitudeOhm,
        style: line(color, selected ? 2.75 : 1.25, v === 0 ? 'solid' : 'dash'),
        reduce: 'max',
        ...(hidden.has(id) ? { hidden: true } : {}),
      });
      for (const resonance of view.selfResonances) {
        markers.push({
          frequencyHz: resonance.frequencyHz,
          value: undefined,
          label: `${viewLabel(element, view)}: ${resonance.type} self-resonance at ${formatFrequency(resonance.frequencyHz, 4)}`,
          shape: 'triangle-down',
          color,
        });
      }
    });
  }
  // The positive range only (a log axis), without copying the columns.
  let low = Infinity;
  let high = -Infinity;
  for (const column of visibleColumns(series)) {
    for (let i = 0; i < column.length; i += 1) {
      const value = column[i]!;
      if (!(value > 0) || !Number.isFinite(value)) continue;
      if (value < low) low = value;
      if (value > high) high = value;
    }
  }
  const extent = low <= high ? { min: low, max: high } : { min: null, max: null };
  const min = extent.min === null ? 1e-3 : 10 ** Math.floor(Math.log10(Math.max(extent.min, 1e-6)));
  const max = extent.max === null ? 1e6 : 10 ** Math.ceil(Math.log10(Math.max(extent.max, min * 10)));
  return {
    id: 'part-impedance',
    title: 'Impedance of each part',
    description: `Magnitude of each part's impedance in ${result.designName}, with self-resonances marked`,
    x: { label: 'Frequency', min: f[0] ?? 1e4, max: f[f.length - 1] ?? 1e8 },
    y: { label: '|Z|', unit: 'Ω', min, max, scale: 'log' },
    series,
    bands: [],
    regions: [],
    levels: [],
    markers: markers.sort((a, b) => a.frequencyHz - b.frequencyHz),
    notes: [],
  };
}
