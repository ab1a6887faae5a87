import type uPlot from 'uplot';
import { formatFrequency, logSplits, pixelsPerDecade } from '../../drawing/frequency-ticks.ts';
import { DASH_PATTERN, PLOT_PALETTE, type PlotTheme } from '../../drawing/plot-palette.ts';
import type { PlotMarker, PlotSpec } from '../../drawing/plot-spec.ts';
import { logTickLabels } from './log-frequency-axis.ts';
import { type Aligned, alignSpec } from './spec-align.ts';

/**
 * uPlot options for a PlotSpec: the page's interactive view of the same plot the SVG renderer draws
 * for export and the report. Styling comes from the spec's palette names and dashes for the theme;
 * regions, levels and markers are drawn in hooks from a live reference to the spec, so new data of
 * the same shape updates in place (setData) without rebuilding the chart.
 */

export interface ChartLook {
  readonly axis: string;
  readonly grid: string;
  readonly text: string;
  readonly panel: string;
}

export const CHART_LOOK: Readonly<Record<PlotTheme, ChartLook>> = {
  light: { axis: '#3d4652', grid: '#e2e6eb', text: '#1b222a', panel: 'rgba(255, 255, 255, 0.78)' },
  dark: { axis: '#b9c2cc', grid: '#323a44', text: '#e6eaef', panel: 'rgba(24, 28, 34, 0.8)' },
};

const AXIS_FONT = '12px system-ui, sans-serif';
const LABEL_FONT = '600 12px system-ui, sans-serif';

/** The spec being drawn and its window, read by the hooks at draw time. */
export interface LiveSpec {
  spec: PlotSpec;
  theme: PlotTheme;
}

/** Which uPlot series index draws which spec series or band edge. */
export function seriesIndexOf(spec: PlotSpec, id: string): number {
  const at = spec.series.findIndex((s) => s.id === id);
  return at < 0 ? -1 : at + 1;
}

/** A key that changes whenever the chart must be rebuilt rather than given new data. */
export function shapeKey(spec: PlotSpec, theme: PlotTheme): string {
  return JSON.stringify([
    theme,
    spec.id,
    spec.y,
    spec.series.map((s) => [s.id, s.label, s.style, s.hidden === true]),
    spec.bands.map((b) => [b.id, b.color, b.hidden === true]),
  ]);
}

export function specData(spec: PlotSpec, fromHz: number, toHz: number, bins: number): uPlot.AlignedData {
  const aligned: Aligned = alignSpec(spec, fromHz, toHz, bins);
  return [aligned.x, ...aligned.columns] as unknown as uPlot.AlignedData;
}

export function specOptions(live: LiveSpec, size: { width: number; height: number }, hooks: uPlot.Hooks.Arrays): uPlot.Options {
  const { spec, theme } = live;
  const palette = PLOT_PALETTE[theme];
  const look = CHART_LOOK[theme];
  const firstHz = spec.x.min;
  const lastHz = spec.x.max;
  const bandBase = spec.series.length + 1;
  const bandSeries: uPlot.Series[] = spec.bands.flatMap((band) => {
    const stroke = palette[band.color];
    const common = { stroke, width: 0.75, alpha: 0.5, points: { show: false }, spanGaps: false, show: !band.hidden, value: (_u: uPlot, v: number | null) => formatValue(v, spec.y.unit) };
    return [
      { ...common, label: `${band.label}, low` },
      { ...common, label: `${band.label}, high` },
    ];
  });
  const yLog = spec.y.scale === 'log';
  return {
    width: size.width,
    height: size.height,
    legend: {
      show: true,
      live: false,
      markers: {
        width: (_u, index) => (spec.series[index - 1]?.style.draw === 'dots' ? 4 : 2),
        dash: (_u, index) => {
          const s = spec.series[index - 1];
          if (!s) return 'solid';
          return s.style.draw === 'dots' || s.style.dash === 'dot' ? 'dotted' : s.style.dash === 'solid' ? 'solid' : 'dashed';
        },
      },
    },
    cursor: { drag: { x: true, y: false }, focus: { prox: 24 }, points: { show: false } },
    focus: { alpha: 0.35 },
    scales: {
      x: { distr: 3, log: 10, range: (_u, min, max) => [min ?? firstHz, max ?? lastHz] },
      y: yLog
        ? { distr: 3, log: 10, range: () => [live.spec.y.min ?? 1e-3, live.spec.y.max ?? 1e6] }
        : { range: (_u, min, max) => [live.spec.y.min ?? min ?? 0, live.spec.y.max ?? max ?? 1] },
    },
    axes: [
      {
        label: spec.x.label,
        stroke: look.axis,
        font: AXIS_FONT,
        labelFont: LABEL_FONT,
        size: 30,
        labelSize: 22,
        gap: 4,
        splits: (_u, _axis, min, max) => logSplits(min, max),
        filter: (_u, splits) => splits,
        grid: { stroke: look.grid, width: 1 },
        ticks: { stroke: look.grid, width: 1, size: 4 },
        values: (u, splits) => {
          const plotWidthCss = u.bbox.width / (globalThis.devicePixelRatio || 1);
          const min = u.scales['x']?.min ?? firstHz;
          const max = u.scales['x']?.max ?? lastHz;
          return logTickLabels(splits, min, pixelsPerDecade(min, max, plotWidthCss));
        },
      },
      {
        label: `${spec.y.label} (${spec.y.unit})`,
        stroke: look.axis,
        font: AXIS_FONT,
        labelFont: LABEL_FONT,
        size: yLog ? 60 : 52,
        space: 28,
        ...(yLog ? {} : { incrs: [1, 2, 5, 10, 20, 25, 50, 100, 200] }),
        grid: { stroke: look.grid, width: 1 },
        ticks: { stroke: look.grid, width: 1, size: 4 },
        values: (_u, splits) => splits.map((value) => (value === null ? '' : yLog ? formatOhmTick(value) : String(value))),
      },
    ],
    series: [
      { label: 'Frequency', value: (_u, hz) => (hz === null ? '–' : formatFrequency(hz, 4)) },
      ...spec.series.map((s): uPlot.Series => {
        const stroke = palette[s.style.color];
        const dash = DASH_PATTERN[s.style.dash];
        const base = { label: s.label, stroke, width: s.style.width, dash: [...dash], show: !s.hidden, value: (_u: uPlot, v: number | null) => formatValue(v, spec.y.unit) };
        return s.style.draw === 'dots'
          ? { ...base, paths: () => null, points: { show: true, size: 5, width: 1, stroke, fill: stroke } }
          : { ...base, spanGaps: false, points: { show: false } };
      }),
      ...bandSeries,
    ],
    bands: spec.bands.map((band, b) => ({ series: [bandBase + 2 * b + 1, bandBase + 2 * b] as [number, number], fill: withAlpha(palette[band.color], 0.13) })),
    hooks: {
      ...hooks,
      drawClear: [...(hooks.drawClear ?? []), (u) => drawRegions(u, live)],
      draw: [...(hooks.draw ?? []), (u) => drawLevels(u, live), (u) => drawMarkers(u, live)],
    },
  };
}

function formatValue(value: number | null, unit: string): string {
  if (value === null) return '–';
  return unit === 'Ω' ? `${value.toPrecision(3)} Ω` : `${value.toFixed(1)} ${unit}`;
}

function formatOhmTick(value: number): string {
  if (value >= 1e6) return `${value / 1e6}M`;
  if (value >= 1e3) return `${value / 1e3}k`;
  if (value >= 1) return String(value);
  return value >= 1e-3 ? `${Math.round(value * 1e3)}m` : value.toExponential(0);
}

/** A colour with its opacity scaled, for fills (hex or rgba). */
export function withAlpha(colour: string, alpha: number): string {
  const hex = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/iu.exec(colour);
  if (hex) return `rgba(${parseInt(hex[1]!, 16)}, ${parseInt(hex[2]!, 16)}, ${parseInt(hex[3]!, 16)}, ${alpha})`;
  return colour;
}

/** Canvas pixels per CSS pixel: uPlot sizes its canvas by the device pixel ratio (no layout read per draw). */
function ratioOf(_u: uPlot): number {
  return globalThis.devicePixelRatio || 1;
}

function drawRegions(u: uPlot, live: LiveSpec): void {
  const { ctx, bbox } = u;
  const ratio = ratioOf(u);
  ctx.save();
  for (const region of live.spec.regions) {
    let x0 = u.valToPos(region.startHz, 'x', true);
    let x1 = u.valToPos(region.stopHz, 'x', true);
    const least = 3 * ratio;
    if (x1 - x0 < least) {
      const middle = (x0 + x1) / 2;
      x0 = middle - least / 2;
      x1 = middle + least / 2;
    }
    x0 = Math.max(x0, bbox.left);
    x1 = Math.min(x1, bbox.left + bbox.width);
    if (!(x1 > x0)) continue;
    ctx.fillStyle = PLOT_PALETTE[live.theme][region.color];
    ctx.fillRect(x0, bbox.top, x1 - x0, bbox.height);
  }
  ctx.restore();
}

function drawLevels(u: uPlot, live: LiveSpec): void {
  const { ctx, bbox } = u;
  const ratio = ratioOf(u);
  const palette = PLOT_PALETTE[live.theme];
  for (const level of live.spec.levels) {
    const y = u.valToPos(level.value, 'y', true);
    if (!(y > bbox.top && y < bbox.top + bbox.height)) continue;
    ctx.save();
    ctx.strokeStyle = palette[level.color];
    ctx.lineWidth = 1.25 * ratio;
    ctx.setLineDash(DASH_PATTERN[level.dash].map((d) => d * ratio));
    ctx.beginPath();
    ctx.moveTo(bbox.left, y);
    ctx.lineTo(bbox.left + bbox.width, y);
    ctx.stroke();
    ctx.setLineDash([]);
    ctx.font = `${11 * ratio}px system-ui, sans-serif`;
    const right = bbox.left + bbox.width - 6 * ratio;
    const width = ctx.measureText(level.label).width;
    const below = y + 16 * ratio < bbox.top + bbox.height;
    const top = below ? y + 2 * ratio : y - 16 * ratio;
    ctx.fillStyle = CHART_LOOK[live.theme].panel;
    ctx.fillRect(right - width - 3 * ratio, top, width + 6 * ratio, 14 * ratio);
    ctx.fillStyle = palette[level.color];
    ctx.textAlign = 'right';
    ctx.textBaseline = 'top';
    ctx.fillText(level.label, right, top + ratio);
    ctx.restore();
  }
}

function drawMarkers(u: uPlot, live: LiveSpec): void {
  const { ctx, bbox } = u;
  const ratio = ratioOf(u);
  const palette = PLOT_PALETTE[live.theme];
  ctx.save();
  ctx.beginPath();
  ctx.rect(bbox.left, bbox.top, bbox.width, bbox.height);
  ctx.clip();
  for (const marker of live.spec.markers) {
    const x = u.valToPos(marker.frequencyHz, 'x', true);
    if (!(x >= bbox.left && x <= bbox.left + bbox.width)) continue;
    drawMarker(u, ctx, marker, x, palette[marker.color], ratio, CHART_LOOK[live.theme].panel);
  }
  ctx.restore();
}

function drawMarker(u: uPlot, ctx: CanvasRenderingContext2D, marker: PlotMarker, x: number, colour: string, ratio: number, backing: string): void {
  const { bbox } = u;
  if (marker.value === undefined) {
    // A frequency-only mark (a self-resonance): a faint dotted line and a ▼ on the top edge.
    ctx.strokeStyle = colour;
    ctx.globalAlpha = 0.45;
    ctx.lineWidth = ratio;
    ctx.setLineDash([2 * ratio, 3 * ratio]);
    ctx.beginPath();
    ctx.moveTo(x, bbox.top);
    ctx.lineTo(x, bbox.top + bbox.height);
    ctx.stroke();
    ctx.setLineDash([]);
    ctx.globalAlpha = 1;
    const size = 5 * ratio;
    ctx.fillStyle = colour;
    ctx.beginPath();
    ctx.moveTo(x - size, bbox.top);
    ctx.lineTo(x + size, bbox.top);
    ctx.lineTo(x, bbox.top + 1.6 * size);
    ctx.closePath();
    ctx.fill();
    return;
  }
  const y = u.valToPos(marker.value, 'y', true);
  if (!(y >= bbox.top && y <= bbox.top + bbox.height)) return;
  ctx.setLineDash([]);
  ctx.strokeStyle = colour;
  ctx.fillStyle = backing;
  ctx.lineWidth = (marker.color === 'worst' ? 2 : 1.5) * ratio;
  const r = (marker.color === 'worst' ? 7 : 4) * ratio;
  ctx.beginPath();
  if (marker.shape === 'diamond') {
    ctx.moveTo(x, y - r);
    ctx.lineTo(x + r, y);
    ctx.lineTo(x, y + r);
    ctx.lineTo(x - r, y);
    ctx.closePath();
  } else if (marker.shape === 'cross') {
    ctx.moveTo(x - r, y - r);
    ctx.lineTo(x + r, y + r);
    ctx.moveTo(x + r, y - r);
    ctx.lineTo(x - r, y + r);
  } else ctx.arc(x, y, r, 0, 2 * Math.PI);
  if (marker.shape !== 'cross' && marker.color !== 'worst') ctx.fill();
  ctx.stroke();
}
