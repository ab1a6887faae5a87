import { css, html, LitElement, nothing, unsafeCSS } from 'lit';
import { customElement, property, query } from 'lit/decorators.js';
import uplotCss from 'uplot/dist/uPlot.min.css?inline';
import type { SweepResult } from '../../engine/index.ts';
import { createUPlot, InsertionLossChartController, type PlotFactory } from './chart-controller.ts';
import { describeInsertionLossChart } from './insertion-loss-options.ts';

/**
 * CM and DM insertion loss of one sweep on a log-frequency axis, with a legend that reads out
 * the values under the cursor. The element only draws: the numbers arrive in `result`.
 */
@customElement('chokepoint-insertion-loss-chart')
export class InsertionLossChart extends LitElement {
  static override styles = [
    // uPlot's own stylesheet must live in this shadow root, or its legend and cursor lose their layout.
    unsafeCSS(uplotCss),
    // Not the shared table styles: they would restyle uPlot's legend table.
    css`
      :host {
        display: block;
        container: chart / inline-size;
        font-family: var(--cp-font);
        color: var(--cp-text);
        font-size: 14px;
      }
      .plot {
        width: 100%;
        min-height: 40px;
      }
      .empty {
        margin: 0;
        padding: 48px 12px;
        text-align: center;
        color: var(--cp-muted);
        border: 1px dashed var(--cp-border);
        border-radius: var(--cp-radius);
      }
      .uplot {
        font-family: var(--cp-font);
      }
      .u-legend {
        font-size: 12.5px;
        text-align: left;
        margin: 2px 0 0;
      }
      .u-legend .u-series > * {
        padding: 2px 3px;
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
        min-width: 4.8em;
      }
      /* Wide enough: frequency, then a CM column and a DM column, in circuit above 50 Ω/50 Ω.
         The row placement follows the series order in insertion-loss-series.ts. */
      @container chart (min-width: 600px) {
        .u-legend.u-inline tbody {
          display: grid;
          grid-template-columns: auto auto auto;
          justify-content: start;
          column-gap: 20px;
        }
        .u-legend.u-inline tr {
          margin: 0;
        }
        .u-legend tr:nth-child(1) {
          grid-area: 1 / 1 / 3 / 2;
          align-self: center;
        }
        .u-legend tr:nth-child(2) {
          grid-area: 1 / 2;
        }
        .u-legend tr:nth-child(3) {
          grid-area: 2 / 2;
        }
        .u-legend tr:nth-child(4) {
          grid-area: 1 / 3;
        }
        .u-legend tr:nth-child(5) {
          grid-area: 2 / 3;
        }
      }
      .u-select {
        background: rgba(31, 95, 168, 0.12);
      }
    `,
  ];

  /** The sweep to draw; undefined draws nothing. */
  @property({ attribute: false }) result: SweepResult | undefined;

  /** Builds the plot: uPlot unless set; a test without a canvas passes a stand-in. */
  @property({ attribute: false }) createPlot: PlotFactory | undefined;

  /** Said when there is nothing to draw. */
  @property() emptyText = 'Nothing to draw yet.';

  @query('.plot') private plotContainer: HTMLElement | null | undefined;

  private readonly chart = new InsertionLossChartController(
    this,
    () => ({ result: this.result, createPlot: this.createPlot ?? createUPlot }),
    () => this.plotContainer ?? undefined,
  );

  /** Whether a plot is on the page now. */
  get drawn(): boolean {
    return this.chart.hasPlot;
  }

  override render() {
    const label = this.result ? describeInsertionLossChart(this.result) : nothing;
    return html`
      <div class="plot" role="figure" aria-label=${label} ?hidden=${!this.result}></div>
      ${this.result ? nothing : html`<p class="empty">${this.emptyText}</p>`}
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-insertion-loss-chart': InsertionLossChart;
  }
}
