import { css, html, LitElement, nothing, unsafeCSS } from 'lit';
import { customElement, property, query } from 'lit/decorators.js';
import uplotCss from 'uplot/dist/uPlot.min.css?inline';
import { createUPlot, type PlotFactory } from './chart-controller.ts';
import { PlotController, type PlotSource } from './plot-controller.ts';

/**
 * A uPlot chart of any PlotSource, with a legend that reads out the values under the cursor and,
 * optionally, a note laid over the top left of the plot area (it stays crisp text and can be read
 * by assistive technology, unlike text painted on the canvas). The element only draws.
 */
@customElement('chokepoint-plot')
export class PlotElement extends LitElement {
  static override styles = [
    // uPlot's own stylesheet must live in this shadow root, or its legend and cursor lose their layout.
    unsafeCSS(uplotCss),
    css`
      :host {
        display: block;
        font-family: var(--cp-font);
        color: var(--cp-text);
        font-size: 14px;
      }
      .frame {
        position: relative;
      }
      .plot {
        width: 100%;
        min-height: 40px;
      }
      .note {
        position: absolute;
        top: 6px;
        left: var(--plot-note-left, 78px);
        right: 14px;
        max-width: 62ch;
        margin: 0;
        padding: 4px 8px;
        font-size: 12px;
        line-height: 1.35;
        background: rgba(255, 255, 255, 0.9);
        border: 1px solid var(--cp-border);
        border-left: 3px solid var(--cp-accent);
        border-radius: 4px;
        pointer-events: none;
        width: fit-content;
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
      }
      .u-legend .u-series > * {
        padding: 1px 3px;
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
      .u-legend .u-value {
        font-variant-numeric: tabular-nums;
        min-width: 5.6em;
        display: inline-block;
      }
      .u-select {
        background: rgba(31, 95, 168, 0.12);
      }
    `,
  ];

  /** What to draw; undefined draws nothing. A new object rebuilds the plot. */
  @property({ attribute: false }) source: PlotSource | undefined;

  /** Builds the plot: uPlot unless set; a test without a canvas passes a stand-in. */
  @property({ attribute: false }) createPlot: PlotFactory | undefined;

  /** What the plot shows, in one line, for assistive technology. */
  @property() label = '';

  /** Laid over the plot's top left when set. */
  @property() note: string | undefined;

  /** Said when there is nothing to draw. */
  @property() emptyText = 'Nothing to draw yet.';

  @query('.plot') private plotContainer: HTMLElement | null | undefined;

  private readonly controller = new PlotController(
    this,
    () => ({ source: this.source, createPlot: this.createPlot ?? createUPlot }),
    () => this.plotContainer ?? undefined,
  );

  /** Whether a plot is on the page now. */
  get drawn(): boolean {
    return this.controller.hasPlot;
  }

  override render() {
    return html`
      <div class="frame" ?hidden=${!this.source}>
        <div class="plot" role="figure" aria-label=${this.label}></div>
        ${this.note ? html`<p class="note" data-role="plot-note">${this.note}</p>` : nothing}
      </div>
      ${this.source ? nothing : html`<p class="empty">${this.emptyText}</p>`}
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-plot': PlotElement;
  }
}
