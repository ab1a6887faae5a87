import { DASH_PATTERN, PLOT_PALETTE, type PlotTheme } from './plot-palette.ts';
import type { PlotColor, PlotDash, PlotMarker, PlotSeries, PlotSpec } from './plot-spec.ts';
import {
  formatFrequencyLabel,
  linearScale,
  linearTicks,
  logFrequencyTicks,
  logScale,
  logValueTicks,
  niceLinearRange,
  type Scale,
  type Tick,
} from './axis-ticks.ts';
import { serializeSvg, svg, svgNumber, type SvgNode, svgText } from './svg-node.ts';
import { textWidth, truncateText, wrapText } from './text-metrics.ts';
import { thinBandToColumns, type ThinnedBand, thinToColumns } from './thin-series.ts';

/**
 * A PlotSpec drawn as SVG: the one renderer behind "save as SVG" and "save as PNG" on the page and
 * behind every plot of the printable report, so none of them depends on a canvas. It only places and
 * styles what the spec holds: a log-frequency x axis, a linear (or log) y axis with nice ticks, the
 * grid, bands and regions, reference levels, the curves (each with its own dash, so they are told
 * apart without colour), markers, a legend that shows each curve's dash, and the notes.
 *
 * Long curves are thinned per pixel column by the series' `reduce` (max-hold or min-hold), so a
 * million-point scan makes a drawing of a few thousand points. The output is deterministic.
 */

export interface PlotSvgOptions {
  /** Overall width in CSS pixels (default 760). */
  readonly width?: number;
  /** Height of title, plot area and axes; legend and notes add below it (default 360). */
  readonly height?: number;
  /** 'light' for print and the report (default), 'dark' for a dark page. */
  readonly theme?: PlotTheme;
  /** Prefix for the ids inside the drawing (clip path, title), unique per document; default from the spec id. */
  readonly idPrefix?: string;
  /** Draw the title at the top (default true); it is always in <title> for assistive technology. */
  readonly showTitle?: boolean;
  /** Base font size in CSS pixels (default 12). */
  readonly fontSize?: number;
}

/** Colours that are not data: background, text, axes and grid. */
const CHROME: Readonly<Record<PlotTheme, { background: string; text: string; muted: string; axis: string; grid: string; minorGrid: string }>> = {
  light: { background: '#ffffff', text: '#1b222a', muted: '#56606c', axis: '#3d4652', grid: '#d9dee4', minorGrid: '#eef0f3' },
  dark: { background: '#161b22', text: '#e6e9ed', muted: '#9aa4b1', axis: '#c9d1db', grid: '#3a434e', minorGrid: '#262d36' },
};

const FONT_FAMILY = 'system-ui, -apple-system, Segoe UI, Roboto, Helvetica, Arial, sans-serif';

/** The geometry a drawing was made with, for tests and for a page that puts a cursor over it. */
export interface PlotLayout {
  readonly width: number;
  readonly height: number;
  readonly plot: { readonly left: number; readonly top: number; readonly right: number; readonly bottom: number };
  readonly x: Scale;
  readonly y: Scale;
  readonly xTicks: readonly Tick[];
  readonly yTicks: readonly Tick[];
}

export function plotToSvg(spec: PlotSpec, options: PlotSvgOptions & { readonly standalone?: boolean } = {}): string {
  return serializeSvg(plotToSvgNode(spec, options), { xmlDeclaration: options.standalone ?? false });
}

export function plotToSvgNode(spec: PlotSpec, options: PlotSvgOptions = {}): SvgNode {
  return drawPlot(spec, options).node;
}

/** The drawing and its layout. */
export function drawPlot(spec: PlotSpec, options: PlotSvgOptions = {}): { node: SvgNode; layout: PlotLayout } {
  const theme = options.theme ?? 'light';
  const palette = PLOT_PALETTE[theme];
  const chrome = CHROME[theme];
  const color = (name: PlotColor): string => palette[name];
  const font = options.fontSize ?? 12;
  const width = Math.max(240, options.width ?? 760);
  const baseHeight = Math.max(160, options.height ?? 360);
  const prefix = safeId(options.idPrefix ?? `plot-${spec.id}`);
  const showTitle = options.showTitle ?? true;

  // Vertical extent first (the y tick labels' width sets the left margin).
  const top = (showTitle ? font * 2.4 : 0) + 10;
  const bottom = baseHeight - (font * 1.2 + 6 + font * 1.3 + 8);
  const yRange = yExtent(spec, bottom - top);
  const yScaleProbe = spec.y.scale === 'log' ? logScale(yRange.min, yRange.max, bottom, top) : linearScale(yRange.min, yRange.max, bottom, top);
  const yTicks = spec.y.scale === 'log' ? logValueTicks(yScaleProbe, spec.y.unit) : linearTicks(yScaleProbe, yRange.step);
  const yLabelWidth = Math.max(0, ...yTicks.map((tick) => (tick.label === undefined ? 0 : textWidth(tick.label, font))));
  const left = 8 + font * 1.3 + 8 + yLabelWidth + 6;
  const xMin = spec.x.min > 0 ? spec.x.min : 1;
  const xMax = spec.x.max > xMin ? spec.x.max : xMin * 10;
  // Room for half the end label ("30 MHz") right of the plot.
  const right = width - Math.max(18, textWidth(formatFrequencyLabel(xMax), font) / 2 + 6);
  const x = logScale(xMin, xMax, left, right);
  const y = yScaleProbe;
  const xTicks = logFrequencyTicks(x, font);
  const plotRect = { left, top, right, bottom };
  const clipId = `${prefix}-clip`;

  const body: SvgNode[] = [];
  body.push(svg('rect', { x: 0, y: 0, width, height: 0, fill: chrome.background }));

  // Regions (shaded spans) under the grid lines, so the grid still reads through them.
  const regions = spec.regions.map((region) => {
    let x0 = x.position(Math.max(region.startHz, xMin));
    let x1 = x.position(Math.min(region.stopHz, xMax));
    if (x1 - x0 < 3) {
      const middle = (x0 + x1) / 2;
      x0 = middle - 1.5;
      x1 = middle + 1.5;
    }
    return svg('rect', { x: x0, y: top, width: Math.max(0, x1 - x0), height: bottom - top, ...fillOf(color(region.color), 0.16) }, [svgText('title', {}, region.label)]);
  });
  if (regions.length > 0) body.push(svg('g', { 'clip-path': `url(#${clipId})`, class: 'regions' }, regions));

  body.push(grid(xTicks, yTicks, plotRect, chrome));

  const clipped: SvgNode[] = [];
  for (const band of spec.bands) {
    if (band.hidden) continue;
    const d = bandPath(thinBandToColumns(band.frequencyHz, band.lower, band.upper, x.position, left, right), y);
    if (d !== '') clipped.push(svg('path', { d, ...fillOf(color(band.color), 0.2), stroke: 'none', class: 'band' }, [svgText('title', {}, band.label)]));
  }
  for (const level of spec.levels) {
    if (!Number.isFinite(level.value)) continue;
    const ly = y.position(level.value);
    clipped.push(
      svg('line', { x1: left, y1: ly, x2: right, y2: ly, stroke: color(level.color), 'stroke-width': 1.25, 'stroke-dasharray': dashArray(level.dash, 1.25), class: 'level' }, [
        svgText('title', {}, level.label),
      ]),
    );
  }
  for (const series of spec.series) {
    if (series.hidden) continue;
    clipped.push(drawSeries(series, x, y, left, right, color(series.style.color), chrome.background));
  }
  body.push(svg('g', { 'clip-path': `url(#${clipId})`, class: 'data' }, clipped));

  // Level labels over the curves, on a halo of the background so crossing lines stay visible.
  const levelLabels = spec.levels
    .filter((level) => Number.isFinite(level.value) && level.value >= y.min && level.value <= y.max)
    .map((level) => haloText(level.label, right - 4, y.position(level.value) - 4, font * 0.92, color(level.color), chrome.background, 'end'));
  if (levelLabels.length > 0) body.push(svg('g', { class: 'level-labels' }, levelLabels));

  const levelBoxes = spec.levels
    .filter((level) => Number.isFinite(level.value) && level.value >= y.min && level.value <= y.max)
    .map((level) => {
      const ly = y.position(level.value) - 4;
      return { left: right - 4 - textWidth(level.label, font * 0.92) - 2, right: right, top: ly - font, bottom: ly + 3 };
    });
  body.push(drawMarkers(spec.markers, x, y, plotRect, font, color, chrome, levelBoxes));
  body.push(frame(plotRect, chrome));
  body.push(axisLabels(spec, xTicks, yTicks, plotRect, baseHeight, font, chrome));
  if (showTitle) body.push(svgText('text', { x: 8, y: 10 + font * 1.25, 'font-size': font * 1.17, 'font-weight': 650, fill: chrome.text, class: 'plot-title' }, spec.title));

  // Legend and notes below the axes; they set the final height.
  const legend = drawLegend(spec, left, width - 8, baseHeight + 2, font, color, chrome);
  const notes = drawNotes(spec.notes, left, width - 8, legend.bottom + (spec.notes.length > 0 ? 4 : 0), font, chrome);
  const height = Math.ceil(notes.bottom + 8);
  body.push(legend.node, notes.node);
  body[0] = svg('rect', { x: 0, y: 0, width, height, fill: chrome.background });

  const defs = svg('defs', {}, [svg('clipPath', { id: clipId }, [svg('rect', { x: left, y: top, width: right - left, height: bottom - top })])]);
  const node = svg(
    'svg',
    {
      width,
      height,
      viewBox: `0 0 ${svgNumber(width)} ${svgNumber(height)}`,
      role: 'img',
      'aria-labelledby': `${prefix}-title ${prefix}-desc`,
      'font-family': FONT_FAMILY,
      'font-size': font,
      'data-plot-id': spec.id,
    },
    [svgText('title', { id: `${prefix}-title` }, spec.title), svgText('desc', { id: `${prefix}-desc` }, spec.description), defs, ...body],
  );
  return { node, layout: { width, height, plot: plotRect, x, y, xTicks, yTicks } };
}

/** Only letters, digits, "-" and "_" in ids made from spec ids. */
function safeId(text: string): string {
  const cleaned = text.replace(/[^A-Za-z0-9_-]/gu, '-');
  return /^[A-Za-z]/u.test(cleaned) ? cleaned : `p-${cleaned}`;
}

/** Fill attributes: an rgba palette entry carries its own alpha, a hex one gets `opacity`. */
function fillOf(colour: string, opacity: number): Record<string, string | number> {
  return colour.startsWith('rgba') ? { fill: colour } : { fill: colour, 'fill-opacity': opacity };
}

function dashArray(dash: PlotDash, width: number): string | undefined {
  const pattern = DASH_PATTERN[dash];
  if (pattern.length === 0) return undefined;
  // Thick lines get proportionally longer dashes so the pattern stays readable.
  const scale = Math.max(1, width / 1.5);
  return pattern.map((length) => svgNumber(length * scale)).join(' ');
}

/** The y range: the spec's, or fitted to what is drawn (series, bands, levels, markers). */
function yExtent(spec: PlotSpec, lengthPx: number): { min: number; max: number; step: number } {
  const log = spec.y.scale === 'log';
  let low = Infinity;
  let high = -Infinity;
  const take = (value: number): void => {
    if (!Number.isFinite(value) || (log && !(value > 0))) return;
    if (value < low) low = value;
    if (value > high) high = value;
  };
  const inView = (hz: number): boolean => hz >= spec.x.min && hz <= spec.x.max;
  if (spec.y.min === undefined || spec.y.max === undefined) {
    for (const series of spec.series) {
      if (series.hidden) continue;
      for (let i = 0; i < series.values.length; i += 1) if (inView(series.frequencyHz[i]!)) take(series.values[i]!);
    }
    for (const band of spec.bands) {
      if (band.hidden) continue;
      for (let i = 0; i < band.frequencyHz.length; i += 1) {
        if (!inView(band.frequencyHz[i]!)) continue;
        take(band.lower[i]!);
        take(band.upper[i]!);
      }
    }
    for (const level of spec.levels) take(level.value);
    for (const marker of spec.markers) if (marker.value !== undefined) take(marker.value);
  }
  if (log) {
    const min = spec.y.min ?? (low <= high ? 10 ** Math.floor(Math.log10(low) + 1e-9) : 1);
    let max = spec.y.max ?? (low <= high ? 10 ** Math.ceil(Math.log10(high) - 1e-9) : 10);
    if (!(max > min)) max = min * 10;
    return { min, max, step: 1 };
  }
  if (!(low <= high)) {
    low = 0;
    high = 1;
  }
  const pad = (high - low) * 0.04;
  const nice = niceLinearRange(spec.y.min ?? low - pad, spec.y.max ?? high + pad, lengthPx);
  return { min: spec.y.min ?? nice.min, max: spec.y.max ?? nice.max, step: nice.step };
}

function grid(xTicks: readonly Tick[], yTicks: readonly Tick[], plot: PlotLayout['plot'], chrome: (typeof CHROME)['light']): SvgNode {
  const minor: string[] = [];
  const major: string[] = [];
  for (const tick of xTicks) {
    if (tick.position <= plot.left + 0.5 || tick.position >= plot.right - 0.5) continue;
    (tick.major ? major : minor).push(`M${svgNumber(tick.position)} ${svgNumber(plot.top)}V${svgNumber(plot.bottom)}`);
  }
  for (const tick of yTicks) {
    if (tick.position <= plot.top + 0.5 || tick.position >= plot.bottom - 0.5) continue;
    (tick.major ? major : minor).push(`M${svgNumber(plot.left)} ${svgNumber(tick.position)}H${svgNumber(plot.right)}`);
  }
  return svg('g', { class: 'grid', fill: 'none', 'stroke-width': 1 }, [
    ...(minor.length > 0 ? [svg('path', { d: minor.join(''), stroke: chrome.minorGrid })] : []),
    ...(major.length > 0 ? [svg('path', { d: major.join(''), stroke: chrome.grid })] : []),
  ]);
}

function frame(plot: PlotLayout['plot'], chrome: (typeof CHROME)['light']): SvgNode {
  return svg('rect', { x: plot.left, y: plot.top, width: plot.right - plot.left, height: plot.bottom - plot.top, fill: 'none', stroke: chrome.axis, 'stroke-width': 1, class: 'frame' });
}

function axisTitle(label: string, unit: string): string {
  if (unit === '' || label.includes(`(${unit})`)) return label;
  return `${label} (${unit})`;
}

function axisLabels(spec: PlotSpec, xTicks: readonly Tick[], yTicks: readonly Tick[], plot: PlotLayout['plot'], baseHeight: number, font: number, chrome: (typeof CHROME)['light']): SvgNode {
  const nodes: SvgNode[] = [];
  const tickMarks: string[] = [];
  for (const tick of xTicks) {
    if (tick.label === undefined) continue;
    tickMarks.push(`M${svgNumber(tick.position)} ${svgNumber(plot.bottom)}v4`);
    nodes.push(svgText('text', { x: tick.position, y: plot.bottom + 4 + font * 1.05, 'text-anchor': 'middle', fill: chrome.axis }, tick.label));
  }
  for (const tick of yTicks) {
    if (tick.label === undefined) continue;
    tickMarks.push(`M${svgNumber(plot.left - 4)} ${svgNumber(tick.position)}h4`);
    nodes.push(svgText('text', { x: plot.left - 6, y: tick.position + font * 0.35, 'text-anchor': 'end', fill: chrome.axis }, tick.label));
  }
  const xTitle = spec.x.label === '' ? 'Frequency' : spec.x.label;
  nodes.push(
    svgText('text', { x: (plot.left + plot.right) / 2, y: baseHeight - 8, 'text-anchor': 'middle', 'font-weight': 600, fill: chrome.text, class: 'axis-title' }, xTitle),
  );
  const yTitle = axisTitle(spec.y.label, spec.y.unit);
  const yMiddle = (plot.top + plot.bottom) / 2;
  nodes.push(
    svgText(
      'text',
      { x: 8 + font, y: yMiddle, transform: `rotate(-90 ${svgNumber(8 + font)} ${svgNumber(yMiddle)})`, 'text-anchor': 'middle', 'font-weight': 600, fill: chrome.text, class: 'axis-title' },
      truncateText(yTitle, plot.bottom - plot.top, font),
    ),
  );
  return svg('g', { class: 'axes' }, [svg('path', { d: tickMarks.join(''), stroke: chrome.axis, fill: 'none' }), ...nodes]);
}

/** "M x y L x y …" with a new subpath after each gap; y clamped far outside the plot (the clip hides it). */
function pathData(xs: readonly number[], values: readonly number[], y: Scale): string {
  const parts: string[] = [];
  let pen = false;
  const far = Math.abs(y.from - y.to) * 50;
  for (let i = 0; i < xs.length; i += 1) {
    const value = values[i]!;
    const px = xs[i]!;
    if (!Number.isFinite(value) || !Number.isFinite(px) || (y.kind === 'log' && !(value > 0))) {
      pen = false;
      continue;
    }
    const py = Math.min(Math.max(y.position(value), Math.min(y.from, y.to) - far), Math.max(y.from, y.to) + far);
    parts.push(`${pen ? 'L' : 'M'}${svgNumber(px)} ${svgNumber(py)}`);
    pen = true;
  }
  return parts.join('');
}

function drawSeries(series: PlotSeries, x: Scale, y: Scale, left: number, right: number, colour: string, background: string): SvgNode {
  const thinned = thinToColumns(series.frequencyHz, series.values, series.reduce, x.position, left, right);
  const attributes = { class: `series series-${series.style.draw}`, 'data-series-id': series.id, ...(series.variantId === undefined ? {} : { 'data-variant-id': series.variantId }) };
  if (series.style.draw === 'dots') {
    const fullRadius = Math.max(1.6, series.style.width * 1.2);
    const dots: SvgNode[] = [];
    for (let i = 0; i < thinned.x.length; i += 1) {
      const value = thinned.values[i]!;
      if (!Number.isFinite(value) || (y.kind === 'log' && !(value > 0))) continue;
      const py = y.position(value);
      // Dots shrink where they crowd (a line spectrum's harmonics at high frequency), so they stay dots.
      const radius = Math.max(1, Math.min(fullRadius, nearestGap(thinned.x, i) * 0.42));
      if (py < Math.min(y.from, y.to) - radius || py > Math.max(y.from, y.to) + radius) continue;
      dots.push(svg('circle', { cx: thinned.x[i]!, cy: py, r: radius }));
    }
    // Solid dots for a solid series; a dashed one (a variant) gets hollow dots, told apart without colour.
    const hollow = series.style.dash !== 'solid';
    return svg('g', { ...attributes, fill: hollow ? background : colour, stroke: colour, 'stroke-width': hollow ? 1.2 : 0.6 }, [svgText('title', {}, series.label), ...dots]);
  }
  const d = pathData(thinned.x, thinned.values, y);
  return svg('path', {
    ...attributes,
    d: d === '' ? undefined : d,
    fill: 'none',
    stroke: colour,
    'stroke-width': series.style.width,
    'stroke-dasharray': dashArray(series.style.dash, series.style.width),
    'stroke-linejoin': 'round',
    'stroke-linecap': series.style.dash === 'solid' ? 'round' : 'butt',
  }, [svgText('title', {}, series.label)]);
}

/** The distance in pixels from point i to its nearer neighbour. */
function nearestGap(xs: readonly number[], i: number): number {
  const before = i > 0 ? xs[i]! - xs[i - 1]! : Infinity;
  const after = i + 1 < xs.length ? xs[i + 1]! - xs[i]! : Infinity;
  const gap = Math.min(Number.isFinite(before) ? before : Infinity, Number.isFinite(after) ? after : Infinity);
  return gap > 0 ? gap : Infinity;
}

/** Closed outlines between the upper and lower edges, one per run without gaps. */
function bandPath(band: ThinnedBand, y: Scale): string {
  const parts: string[] = [];
  let run: number[] = [];
  const close = (): void => {
    if (run.length >= 2) {
      const top = run.map((i, k) => `${k === 0 ? 'M' : 'L'}${svgNumber(band.x[i]!)} ${svgNumber(y.position(band.upper[i]!))}`);
      const bottom = [...run].reverse().map((i) => `L${svgNumber(band.x[i]!)} ${svgNumber(y.position(band.lower[i]!))}`);
      parts.push(`${top.join('')}${bottom.join('')}Z`);
    }
    run = [];
  };
  for (let i = 0; i < band.x.length; i += 1) {
    const upper = band.upper[i]!;
    const lower = band.lower[i]!;
    const ok = Number.isFinite(upper) && Number.isFinite(lower) && (y.kind !== 'log' || (upper > 0 && lower > 0));
    if (ok) run.push(i);
    else close();
  }
  close();
  return parts.join('');
}

function haloText(text: string, x: number, y: number, size: number, colour: string, background: string, anchor: 'start' | 'end' | 'middle'): SvgNode {
  return svgText('text', { x, y, 'font-size': size, 'text-anchor': anchor, fill: colour, stroke: background, 'stroke-width': 3, 'stroke-linejoin': 'round', 'paint-order': 'stroke' }, text);
}

function markerShape(marker: PlotMarker, cx: number, cy: number, colour: string, background: string): SvgNode {
  const s = 5;
  switch (marker.shape) {
    case 'triangle-down':
      return svg('path', { d: `M${svgNumber(cx - s)} ${svgNumber(cy - s)}H${svgNumber(cx + s)}L${svgNumber(cx)} ${svgNumber(cy + s * 0.8)}Z`, fill: colour, stroke: background, 'stroke-width': 0.75 });
    case 'circle':
      return svg('circle', { cx, cy, r: s, fill: background, stroke: colour, 'stroke-width': 1.75 });
    case 'diamond':
      return svg('path', { d: `M${svgNumber(cx)} ${svgNumber(cy - s)}L${svgNumber(cx + s)} ${svgNumber(cy)}L${svgNumber(cx)} ${svgNumber(cy + s)}L${svgNumber(cx - s)} ${svgNumber(cy)}Z`, fill: colour, stroke: background, 'stroke-width': 0.75 });
    case 'cross':
      return svg('path', { d: `M${svgNumber(cx - s)} ${svgNumber(cy - s)}L${svgNumber(cx + s)} ${svgNumber(cy + s)}M${svgNumber(cx + s)} ${svgNumber(cy - s)}L${svgNumber(cx - s)} ${svgNumber(cy + s)}`, fill: 'none', stroke: colour, 'stroke-width': 2 });
  }
}

/**
 * Markers over the curves: frequency-only marks sit at the top edge with a faint line down the plot.
 * Labels go beside their mark where they cover no other mark or label, and are left to the mark's
 * tooltip when there is no room.
 */
function drawMarkers(
  markers: readonly PlotMarker[],
  x: Scale,
  y: Scale,
  plot: PlotLayout['plot'],
  font: number,
  color: (name: PlotColor) => string,
  chrome: (typeof CHROME)['light'],
  taken: readonly { left: number; right: number; top: number; bottom: number }[],
): SvgNode {
  const lines: SvgNode[] = [];
  const shapes: SvgNode[] = [];
  const labels: SvgNode[] = [];
  // Boxes no label may cover: other labels (the levels' first), and every mark.
  const placed: { left: number; right: number; top: number; bottom: number }[] = [...taken];
  const size = font * 0.9;
  const sorted = [...markers].sort((a, b) => a.frequencyHz - b.frequencyHz);
  const drawn: { marker: PlotMarker; cx: number; cy: number; onTop: boolean; colour: string }[] = [];
  for (const marker of sorted) {
    if (!(marker.frequencyHz >= x.min && marker.frequencyHz <= x.max)) continue;
    const cx = x.position(marker.frequencyHz);
    const onTop = marker.value === undefined || !Number.isFinite(marker.value);
    if (!onTop && y.kind === 'log' && !(marker.value! > 0)) continue;
    const cy = onTop ? plot.top + 4 : y.position(marker.value!);
    if (cy < plot.top - 1 || cy > plot.bottom + 1) continue;
    const colour = color(marker.color);
    if (onTop) lines.push(svg('path', { d: `M${svgNumber(cx)} ${svgNumber(plot.top)}V${svgNumber(plot.bottom)}`, stroke: colour, 'stroke-opacity': 0.35, 'stroke-dasharray': '2 3', fill: 'none' }));
    shapes.push(svg('g', { class: 'marker', 'data-shape': marker.shape }, [svgText('title', {}, marker.label), markerShape(marker, cx, cy, colour, chrome.background)]));
    // No label may cover a mark.
    placed.push({ left: cx - 6, right: cx + 6, top: cy - 6, bottom: cy + 6 });
    drawn.push({ marker, cx, cy, onTop, colour });
  }
  const free = (box: { left: number; right: number; top: number; bottom: number }): boolean =>
    box.top >= plot.top && box.bottom <= plot.bottom && box.left >= plot.left && box.right <= plot.right && !placed.some((o) => box.left < o.right && box.right > o.left && box.top < o.bottom && box.bottom > o.top);
  for (const { marker, cx, cy, onTop, colour } of drawn) {
    const widthPx = textWidth(marker.label, size);
    // A mark on a curve gets its label beside it, level with it, or none (its tooltip keeps it); a
    // frequency-only mark at the top edge may stack its label in one of three rows below the edge.
    const rows = onTop ? [0, 1, 2].map((row) => plot.top + 16 + row * (size + 3)) : [cy + size * 0.35];
    let done = false;
    for (const ly of rows) {
      for (const side of ['right', 'left'] as const) {
        const lx = side === 'right' ? cx + 8 : cx - 8 - widthPx;
        const box = { left: lx - 2, right: lx + widthPx + 2, top: ly - size, bottom: ly + 3 };
        if (!free(box)) continue;
        placed.push(box);
        labels.push(haloText(marker.label, lx, ly, size, colour, chrome.background, 'start'));
        done = true;
        break;
      }
      if (done) break;
    }
  }
  return svg('g', { class: 'markers' }, [...lines, ...shapes, ...labels]);
}

interface LegendEntry {
  readonly label: string;
  readonly swatch: (x: number, y: number) => SvgNode;
}

function drawLegend(spec: PlotSpec, left: number, right: number, top: number, font: number, color: (name: PlotColor) => string, chrome: (typeof CHROME)['light']): { node: SvgNode; bottom: number } {
  const entries: LegendEntry[] = [];
  const swatchWidth = 30;
  for (const series of spec.series) {
    if (series.hidden) continue;
    const colour = color(series.style.color);
    if (series.style.draw === 'dots') {
      const hollow = series.style.dash !== 'solid';
      entries.push({
        label: series.label,
        swatch: (sx, sy) =>
          svg('g', { fill: hollow ? chrome.background : colour, stroke: colour, 'stroke-width': hollow ? 1.2 : 0.6 }, [6, 15, 24].map((dx) => svg('circle', { cx: sx + dx, cy: sy, r: 2.4 }))),
      });
    } else {
      entries.push({
        label: series.label,
        swatch: (sx, sy) =>
          svg('line', { x1: sx, y1: sy, x2: sx + swatchWidth, y2: sy, stroke: colour, 'stroke-width': Math.max(1.5, series.style.width), 'stroke-dasharray': dashArray(series.style.dash, series.style.width) }),
      });
    }
  }
  for (const band of spec.bands) {
    if (band.hidden) continue;
    entries.push({ label: band.label, swatch: (sx, sy) => svg('rect', { x: sx, y: sy - 5, width: swatchWidth, height: 10, ...fillOf(color(band.color), 0.25) }) });
  }
  for (const region of spec.regions.filter((r, i, all) => all.findIndex((o) => o.label === r.label && o.color === r.color) === i)) {
    entries.push({ label: region.label, swatch: (sx, sy) => svg('rect', { x: sx, y: sy - 6, width: swatchWidth, height: 12, ...fillOf(color(region.color), 0.2) }) });
  }
  for (const level of spec.levels) {
    entries.push({ label: level.label, swatch: (sx, sy) => svg('line', { x1: sx, y1: sy, x2: sx + swatchWidth, y2: sy, stroke: color(level.color), 'stroke-width': 1.25, 'stroke-dasharray': dashArray(level.dash, 1.25) }) });
  }
  if (entries.length === 0) return { node: svg('g', { class: 'legend' }), bottom: top };
  const rowHeight = font * 1.6;
  const nodes: SvgNode[] = [];
  let cx = left;
  let cy = top + rowHeight / 2;
  const maxLabel = right - left - swatchWidth - 8;
  for (const entry of entries) {
    const label = truncateText(entry.label, maxLabel, font);
    const entryWidth = swatchWidth + 6 + textWidth(label, font) + 18;
    if (cx > left && cx + entryWidth - 18 > right) {
      cx = left;
      cy += rowHeight;
    }
    nodes.push(svg('g', { class: 'legend-entry' }, [entry.swatch(cx, cy), svgText('text', { x: cx + swatchWidth + 6, y: cy + font * 0.36, fill: chrome.text }, label)]));
    cx += entryWidth;
  }
  return { node: svg('g', { class: 'legend' }, nodes), bottom: cy + rowHeight / 2 };
}

function drawNotes(notes: readonly string[], left: number, right: number, top: number, font: number, chrome: (typeof CHROME)['light']): { node: SvgNode; bottom: number } {
  const size = font * 0.92;
  const lineHeight = size * 1.35;
  const nodes: SvgNode[] = [];
  let cy = top;
  for (const note of notes) {
    for (const line of wrapText(note, right - left, size)) {
      cy += lineHeight;
      nodes.push(svgText('text', { x: left, y: cy - size * 0.3, 'font-size': size, fill: chrome.muted }, line));
    }
  }
  return { node: svg('g', { class: 'notes' }, nodes), bottom: cy };
}

/** The x-axis labels of a spec as drawn, for a quick check that the axis reads as intended. */
export function frequencyAxisLabels(spec: PlotSpec, options: PlotSvgOptions = {}): string[] {
  return drawPlot(spec, options)
    .layout.xTicks.filter((tick) => tick.label !== undefined)
    .map((tick) => tick.label ?? formatFrequencyLabel(tick.value));
}
