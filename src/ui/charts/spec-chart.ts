import { css, html, LitElement, nothing, type PropertyValues, unsafeCSS } from 'lit';
import { customElement, property, query } from 'lit/decorators.js';
import uPlot from 'uplot';
import uplotCss from 'uplot/dist/uPlot.min.css?inline';
import { formatFrequency } from '../../drawing/frequency-ticks.ts';
import type { PlotTheme } from '../../drawing/plot-palette.ts';
import type { PlotSpec } from '../../drawing/plot-spec.ts';
import { type LiveSpec, shapeKey, specData, specOptions } from './spec-uplot.ts';

/**
 * One plot of the page, drawn by uPlot from a PlotSpec (the same spec the SVG export draws). It
 * follows the page's shared cursor (`cursorHz`) and reports where the user moves it
 * (`cursor-move`), zooms by dragging across it or by keys, and updates in place when new data of
 * the same shape arrives, so typing a value redraws without rebuilding the chart.
 *
 * Keys, with the plot focused: ← and → move the cursor (with Shift, ten times as far), Home and End
 * go to the ends of the view, + and − zoom in and out about the cursor, 0 or Escape shows the whole
 * axis. A legend entry, clicked, hides or shows its curve (`legend-toggle`).
 */

/** What the element needs of a plot; uPlot itself, or a stand-in in a test without a canvas. */
export type SpecPlot = Pick<uPlot, 'setData' | 'setSize' | 'setScale' | 'setCursor' | 'destroy' | 'redraw' | 'valToPos' | 'posToVal' | 'batch'> & {
  readonly scales: uPlot['scales'];
  readonly cursor: uPlot['cursor'];
  readonly bbox: uPlot['bbox'];
};
export type SpecPlotFactory = (options: uPlot.Options, data: uPlot.AlignedData, target: HTMLElement) => SpecPlot;
export const createSpecUPlot: SpecPlotFactory = (options, data, target) => new uPlot(options, data, target);

export type CursorMoveEvent = CustomEvent<{ readonly frequencyHz: number }>;
export type LegendToggleEvent = CustomEvent<{ readonly plotId: string; readonly seriesId: string; readonly shown: boolean }>;

const KEY_STEP_DECADES_FRACTION = 0.01;

@customElement('chokepoint-spec-chart')
export class SpecChart extends LitElement {
  static override styles = [
    unsafeCSS(uplotCss),
    css`
      :host {
        display: block;
        font-family: var(--cp-font);
        color: var(--cp-text);
        font-size: 14px;
      }
      .plot {
        width: 100%;
        min-height: 40px;
        border-radius: 4px;
      }
      .plot:focus-visible {
        outline: 2px solid var(--cp-accent);
        outline-offset: 2px;
      }
      .notes {
        margin: 4px 0 0;
        padding: 0;
        list-style: none;
        font-size: 12px;
        color: var(--cp-muted);
      }
      .empty {
        margin: 0;
        padding: 40px 12px;
        text-align: center;
        color: var(--cp-muted);
        border: 1px dashed var(--cp-border);
        border-radius: var(--cp-radius);
      }
      .uplot {
        font-family: var(--cp-font);
      }
      .u-legend {
        font-size: 12px;
        text-align: left;
        margin: 2px 0 0;
        color: var(--cp-text);
      }
      .u-legend .u-series > * {
        padding: 1px 3px;
      }
      .u-legend .u-series {
        cursor: pointer;
      }
      .u-legend .u-off > * {
        opacity: 0.4;
      }
      .u-legend .u-marker {
        width: 22px;
        height: 0;
        border-top: none !important;
        border-left: none !important;
        border-right: none !important;
        background: none !important;
        margin-right: 6px;
      }
      .u-select {
        background: rgba(31, 95, 168, 0.14);
      }
    `,
  ];

  @property({ attribute: false }) spec: PlotSpec | undefined;
  @property() theme: PlotTheme = 'light';
  /** The page's shared cursor, Hz; undefined hides it. */
  @property({ attribute: false }) cursorHz: number | undefined;
  /** Height as a fraction of width, between the bounds below. */
  @property({ type: Number }) heightRatio = 0.48;
  @property({ type: Number }) minHeight = 260;
  @property({ type: Number }) maxHeight = 440;
  @property() emptyText = 'Nothing to draw yet.';
  @property({ attribute: false }) createPlot: SpecPlotFactory | undefined;

  @query('.plot') private container: HTMLElement | null | undefined;

  private plot: SpecPlot | undefined;
  private live: LiveSpec | undefined;
  private shape = '';
  /** The zoomed window; undefined is the whole axis. */
  private window: [number, number] | undefined;
  private width = 0;
  /** Set while the element itself moves the cursor or the scale, so hooks do not echo it back. */
  private quiet = false;
  private observer: ResizeObserver | undefined;

  /** Whether a plot is drawn now. */
  get drawn(): boolean {
    return this.plot !== undefined;
  }

  /** How many times a spec has been drawn or updated in place (the benchmark waits on it). */
  drawCount = 0;

  /** The zoomed window in Hz, or undefined for the whole axis. */
  get zoomWindow(): readonly [number, number] | undefined {
    return this.window;
  }

  override connectedCallback(): void {
    super.connectedCallback();
    if (typeof ResizeObserver !== 'undefined') this.observer = new ResizeObserver(() => this.followWidth());
    if (this.spec && !this.plot) this.requestUpdate();
  }

  override disconnectedCallback(): void {
    this.observer?.disconnect();
    this.observer = undefined;
    this.destroyPlot();
    super.disconnectedCallback();
  }

  override render() {
    const spec = this.spec;
    return html`
      <div ?hidden=${!spec}>
        <div
          class="plot"
          tabindex="0"
          role="img"
          aria-roledescription="interactive plot"
          aria-label=${spec ? `${spec.title}. ${spec.description}. Arrow keys move the cursor; plus and minus zoom; 0 shows everything.` : ''}
          @keydown=${this.onKey}
        ></div>
        ${spec && spec.notes.length > 0 ? html`<ul class="notes">${spec.notes.map((note) => html`<li>${note}</li>`)}</ul>` : nothing}
      </div>
      ${spec ? nothing : html`<p class="empty">${this.emptyText}</p>`}
    `;
  }

  protected override updated(changed: PropertyValues<this>): void {
    if (changed.has('spec') || changed.has('theme') || changed.has('createPlot')) this.draw();
    if (changed.has('cursorHz')) this.showCursor();
  }

  private sizeFor(width: number): { width: number; height: number } {
    const usable = Math.max(260, Math.floor(width));
    return { width: usable, height: Math.round(Math.min(this.maxHeight, Math.max(this.minHeight, usable * this.heightRatio))) };
  }

  private bins(): number {
    return Math.max(200, Math.round(this.width || 800));
  }

  private windowOrFull(spec: PlotSpec): [number, number] {
    return this.window ?? [spec.x.min, spec.x.max];
  }

  private draw(): void {
    const spec = this.spec;
    const target = this.container;
    if (!spec || !target) {
      this.destroyPlot();
      return;
    }
    const shape = shapeKey(spec, this.theme);
    if (this.window && !(this.window[0] >= spec.x.min * 0.999 && this.window[1] <= spec.x.max * 1.001)) this.window = undefined;
    const [fromHz, toHz] = this.windowOrFull(spec);
    if (this.plot && this.live && shape === this.shape) {
      // Same curves, new numbers: update in place (the hooks read the new spec through `live`).
      this.live.spec = spec;
      this.applyWindow(specData(spec, fromHz, toHz, this.bins()), fromHz, toHz);
      this.drawCount += 1;
      return;
    }
    this.destroyPlot();
    this.width = target.clientWidth;
    this.shape = shape;
    const live: LiveSpec = { spec, theme: this.theme };
    this.live = live;
    const options = specOptions(live, this.sizeFor(this.width), {
      setScale: [(u, key) => (key === 'x' ? this.onScale(u) : undefined)],
      setCursor: [(u) => this.onCursor(u)],
      setSeries: [(_u, index, opts) => this.onSeries(index, opts)],
    });
    options.cursor = { ...options.cursor, bind: { dblclick: () => () => (this.resetZoom(), null) } };
    this.plot = (this.createPlot ?? createSpecUPlot)(options, specData(spec, fromHz, toHz, this.bins()), target);
    this.setScaleQuietly(fromHz, toHz);
    this.observer?.observe(target);
    this.showCursor();
    this.drawCount += 1;
  }

  private applyWindow(data: uPlot.AlignedData, fromHz: number, toHz: number): void {
    const plot = this.plot;
    if (!plot) return;
    this.quiet = true;
    try {
      plot.batch(() => {
        plot.setData(data, false);
        plot.setScale('x', { min: fromHz, max: toHz });
      });
    } finally {
      this.quiet = false;
    }
    this.showCursor();
  }

  private setScaleQuietly(fromHz: number, toHz: number): void {
    this.quiet = true;
    try {
      this.plot?.setScale('x', { min: fromHz, max: toHz });
    } finally {
      this.quiet = false;
    }
  }

  /** A drag across the plot zoomed it: thin the data again for the new window. */
  private onScale(u: uPlot): void {
    if (this.quiet || !this.spec) return;
    const min = u.scales['x']?.min;
    const max = u.scales['x']?.max;
    if (min == null || max == null || !(max > min)) return;
    this.zoomTo(min, max);
  }

  private zoomTo(fromHz: number, toHz: number): void {
    const spec = this.spec;
    if (!spec) return;
    const from = Math.max(spec.x.min, fromHz);
    const to = Math.min(spec.x.max, toHz);
    const whole = from <= spec.x.min * 1.000001 && to >= spec.x.max * 0.999999;
    this.window = whole ? undefined : [from, to];
    const [a, b] = this.windowOrFull(spec);
    // Outside uPlot's own commit of the scale change: the data is set once it has finished.
    queueMicrotask(() => this.applyWindow(specData(spec, a, b, this.bins()), a, b));
    this.dispatchEvent(new CustomEvent('zoom-change', { detail: { window: this.window }, bubbles: true, composed: true }));
  }

  resetZoom(): void {
    const spec = this.spec;
    if (spec) this.zoomTo(spec.x.min, spec.x.max);
  }

  private onCursor(u: uPlot): void {
    if (this.quiet) return;
    const left = u.cursor.left;
    if (left === undefined || left < 0) return;
    const hz = u.posToVal(left, 'x');
    if (Number.isFinite(hz) && hz > 0) this.emitCursor(hz);
  }

  private emitCursor(hz: number): void {
    this.dispatchEvent(new CustomEvent('cursor-move', { detail: { frequencyHz: hz }, bubbles: true, composed: true }));
  }

  private onSeries(index: number | null, opts: uPlot.Series): void {
    const spec = this.spec;
    if (index === null || !spec || opts.show === undefined) return;
    const series = spec.series[index - 1];
    if (!series) return;
    this.dispatchEvent(new CustomEvent('legend-toggle', { detail: { plotId: spec.id, seriesId: series.id, shown: opts.show }, bubbles: true, composed: true }));
  }

  private showCursor(): void {
    const plot = this.plot;
    if (!plot) return;
    const hz = this.cursorHz;
    const ratio = globalThis.devicePixelRatio || 1;
    const left = hz === undefined ? -10 : plot.valToPos(hz, 'x');
    const top = hz === undefined ? -10 : plot.bbox.height / ratio / 2;
    this.quiet = true;
    try {
      plot.setCursor({ left: Number.isFinite(left) ? left : -10, top }, false);
    } finally {
      this.quiet = false;
    }
  }

  private readonly onKey = (event: KeyboardEvent): void => {
    const spec = this.spec;
    if (!spec) return;
    const [from, to] = this.windowOrFull(spec);
    const decades = Math.log10(to / from);
    const here = this.cursorHz !== undefined && this.cursorHz >= from && this.cursorHz <= to ? this.cursorHz : Math.sqrt(from * to);
    const step = decades * KEY_STEP_DECADES_FRACTION * (event.shiftKey ? 10 : 1);
    let handled = true;
    switch (event.key) {
      case 'ArrowRight':
        this.emitCursor(Math.min(to, here * 10 ** step));
        break;
      case 'ArrowLeft':
        this.emitCursor(Math.max(from, here / 10 ** step));
        break;
      case 'Home':
        this.emitCursor(from);
        break;
      case 'End':
        this.emitCursor(to);
        break;
      case '+':
      case '=': {
        const half = decades / 4;
        this.zoomTo(here / 10 ** half, here * 10 ** half);
        break;
      }
      case '-':
      case '_': {
        const half = decades;
        this.zoomTo(here / 10 ** half, here * 10 ** half);
        break;
      }
      case '0':
      case 'Escape':
        this.resetZoom();
        break;
      default:
        handled = false;
    }
    if (handled) event.preventDefault();
  };

  private followWidth(): void {
    const target = this.container;
    if (!this.plot || !target) return;
    const width = target.clientWidth;
    if (width === this.width || width === 0) return;
    this.width = width;
    this.plot.setSize(this.sizeFor(width));
    if (this.spec) {
      const [a, b] = this.windowOrFull(this.spec);
      this.applyWindow(specData(this.spec, a, b, this.bins()), a, b);
    }
  }

  private destroyPlot(): void {
    this.observer?.disconnect();
    this.plot?.destroy();
    this.plot = undefined;
    this.live = undefined;
    this.shape = '';
  }
}

/** "262 kHz" for the cursor's title. */
export function cursorText(hz: number | undefined): string {
  return hz === undefined ? 'no cursor' : formatFrequency(hz, 4);
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-spec-chart': SpecChart;
  }
}
