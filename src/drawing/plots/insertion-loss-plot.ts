import type { SweepColumnId, SweepResult } from '../../engine/sweep/sweep-result.ts';
import { formatFrequency } from '../frequency-ticks.ts';
import type { PlotBand, PlotColor, PlotMarker, PlotSeries, PlotSpec } from '../plot-spec.ts';
import { allAtOrBelow, extentOf, line, type Overlay, overlayDash, visibleColumns } from './plot-helpers.ts';

/**
 * CM and DM insertion loss of a design: in circuit (between its own noise source and LISNs, the
 * prediction), in the 50 Ω/50 Ω test of catalogues, the spread of the approximate worst-case
 * terminations (0.1 Ω/100 Ω and 100 Ω/0.1 Ω) as a band, and mode conversion where the filter is not
 * symmetric. Element self-resonances and located peaks and notches are marked. Other variants add
 * their in-circuit curves with their own dash.
 */

export interface InsertionLossPlotOptions {
  readonly overlays?: readonly Overlay<SweepResult>[];
  /** Names of the curves the legend has switched off. */
  readonly hidden?: ReadonlySet<string>;
}

interface ModeCurves {
  readonly mode: 'CM' | 'DM';
  readonly color: PlotColor;
  readonly inCircuit: SweepColumnId;
  readonly fifty: SweepColumnId;
  readonly lowHigh: SweepColumnId;
  readonly highLow: SweepColumnId;
}

const MODES: readonly ModeCurves[] = [
  { mode: 'CM', color: 'common-mode', inCircuit: 'insertionLossInCircuitCm', fifty: 'insertionLoss50Cm', lowHigh: 'insertionLossLowHighCm', highLow: 'insertionLossHighLowCm' },
  { mode: 'DM', color: 'differential-mode', inCircuit: 'insertionLossInCircuitDm', fifty: 'insertionLoss50Dm', lowHigh: 'insertionLossLowHighDm', highLow: 'insertionLossHighLowDm' },
];

/** Below this the engine reports "no conversion at all" (a symmetric filter gives −400 dB). */
const NO_CONVERSION_DB = -300;

/**
 * The y range: always reaching below 0 dB with room (negative insertion loss, the filter resonating
 * with its terminations, is the finding that matters most) and never clipping a value.
 */
export function insertionLossRange(minDb: number | null, maxDb: number | null): [number, number] {
  const low = minDb !== null && Number.isFinite(minDb) ? minDb : 0;
  const high = maxDb !== null && Number.isFinite(maxDb) ? maxDb : 0;
  return [Math.min(-10, Math.floor((low - 2) / 10) * 10), Math.max(10, Math.ceil((high + 2) / 10) * 10)];
}

export function insertionLossPlot(result: SweepResult, options: InsertionLossPlotOptions = {}): PlotSpec {
  const f = result.frequencyHz;
  const hidden = options.hidden ?? new Set<string>();
  const series: PlotSeries[] = [];
  const bands: PlotBand[] = [];
  const notes: string[] = [];
  const add = (s: Omit<PlotSeries, 'hidden' | 'reduce'> & { reduce?: PlotSeries['reduce'] }): void => {
    series.push({ reduce: 'min', ...s, ...(hidden.has(s.id) ? { hidden: true } : {}) });
  };

  for (const mode of MODES) {
    const lowHigh = result.columns[mode.lowHigh];
    const highLow = result.columns[mode.highLow];
    const lower = new Float64Array(f.length);
    const upper = new Float64Array(f.length);
    for (let i = 0; i < f.length; i += 1) {
      lower[i] = Math.min(lowHigh[i]!, highLow[i]!);
      upper[i] = Math.max(lowHigh[i]!, highLow[i]!);
    }
    const bandId = `worst-case-${mode.mode.toLowerCase()}`;
    bands.push({
      id: bandId,
      label: `${mode.mode} between the 0.1 Ω/100 Ω and 100 Ω/0.1 Ω tests`,
      frequencyHz: f,
      lower,
      upper,
      color: mode.color,
      ...(hidden.has(bandId) ? { hidden: true } : {}),
    });
    add({ id: `in-circuit-${mode.mode.toLowerCase()}`, label: `${mode.mode} in circuit`, frequencyHz: f, values: result.columns[mode.inCircuit], style: line(mode.color, 2) });
    add({ id: `fifty-${mode.mode.toLowerCase()}`, label: `${mode.mode} 50 Ω/50 Ω`, frequencyHz: f, values: result.columns[mode.fifty], style: line(mode.color, 1.5, 'dash') });
  }

  // Conversion: how far below the source the other mode appears at the receivers (a dB loss, like the rest).
  for (const [column, label, id] of [
    ['conversionCmToDm', 'CM → DM conversion (dB below the CM source)', 'conversion-cm-dm'],
    ['conversionDmToCm', 'DM → CM conversion (dB below the DM source)', 'conversion-dm-cm'],
  ] as const) {
    const values = result.columns[column];
    if (allAtOrBelow(values, NO_CONVERSION_DB)) continue;
    const loss = new Float64Array(values.length);
    for (let i = 0; i < values.length; i += 1) loss[i] = -values[i]!;
    add({ id, label, frequencyHz: f, values: loss, style: line('conversion', 1.25, id === 'conversion-cm-dm' ? 'dot' : 'dash-dot') });
  }
  if (!series.some((s) => s.id.startsWith('conversion'))) notes.push('No mode conversion: the filter is symmetric between the lines.');

  (options.overlays ?? []).forEach((overlay, index) => {
    for (const mode of MODES) {
      add({
        id: `${overlay.variantId}:in-circuit-${mode.mode.toLowerCase()}`,
        label: `${mode.mode} in circuit, ${overlay.name}`,
        frequencyHz: overlay.result.frequencyHz,
        values: overlay.result.columns[mode.inCircuit],
        style: line(mode.color, 1.5, overlayDash(index)),
        variantId: overlay.variantId,
      });
    }
  });

  const markers = resonanceMarkers(result);
  const extent = extentOf([...visibleColumns(series), ...bands.filter((b) => !b.hidden).flatMap((b) => [b.lower, b.upper])]);
  const [min, max] = insertionLossRange(extent.min, extent.max);
  const span = f.length > 0 ? `from ${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)}` : 'with no points';
  return {
    id: 'insertion-loss',
    title: 'Insertion loss, common and differential mode',
    description: `Insertion loss of ${result.designName}, CM and DM, in circuit, in the 50 Ω test and the worst-case test band, ${span}`,
    x: { label: 'Frequency', min: f[0] ?? 1e4, max: f[f.length - 1] ?? 1e8 },
    y: { label: 'Insertion loss', unit: 'dB', min, max, scale: 'linear' },
    series,
    bands,
    regions: [],
    levels: [{ value: 0, label: 'below 0 dB the filter makes the level worse than no filter', color: 'worst', dash: 'solid' }],
    markers,
    notes,
  };
}

/** ▼ at each element self-resonance (top edge), ○ at each located peak or notch of an in-circuit or 50 Ω curve. */
export function resonanceMarkers(result: SweepResult): PlotMarker[] {
  const labels = new Map(result.elements.map((element) => [element.id, element.label]));
  const drawn = new Set<SweepColumnId>(MODES.flatMap((mode) => [mode.inCircuit, mode.fifty]));
  const markers: PlotMarker[] = [];
  for (const mark of result.resonances) {
    if (mark.kind === 'element') {
      const view = mark.view === 'impedance' ? '' : mark.view === 'common-mode' ? ' (CM)' : ' (DM)';
      markers.push({
        frequencyHz: mark.frequencyHz,
        value: undefined,
        label: `${labels.get(mark.elementId) ?? mark.elementId}${view} self-resonance, ${formatFrequency(mark.frequencyHz, 4)}`,
        shape: 'triangle-down',
        color: 'neutral',
      });
    } else if (drawn.has(mark.column)) {
      const mode = mark.column.endsWith('Cm') ? 'CM' : 'DM';
      markers.push({
        frequencyHz: mark.frequencyHz,
        value: mark.valueDb,
        label: `${mode} ${mark.type} ${mark.valueDb.toFixed(1)} dB at ${formatFrequency(mark.frequencyHz, 4)}`,
        shape: 'circle',
        color: mode === 'CM' ? 'common-mode' : 'differential-mode',
      });
    }
  }
  return markers.sort((a, b) => a.frequencyHz - b.frequencyHz);
}
