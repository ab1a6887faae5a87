import { css, html, LitElement, nothing } from 'lit';
import { customElement, property, query } from 'lit/decorators.js';
import type { PlotTheme } from '../../drawing/plot-palette.ts';
import type { PlotSpec } from '../../drawing/plot-spec.ts';
import '../charts/spec-chart.ts';
import type { SpecChart, SpecPlotFactory } from '../charts/spec-chart.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import { sharedStyles } from '../styles/theme.ts';

/**
 * One plot with its title, what it shows, and its exports: the curves as CSV and the picture as SVG
 * and PNG (`plot-export` events: the planner builds the files from the spec, so an export is the
 * same plot at full resolution, not a copy of the screen).
 */
export type PlotExportFormat = 'csv' | 'svg' | 'png';
export type PlotExportEvent = CustomEvent<{ readonly spec: PlotSpec; readonly format: PlotExportFormat }>;

@customElement('chokepoint-plot-panel')
export class PlotPanel extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
      }
      .head {
        display: flex;
        flex-wrap: wrap;
        align-items: baseline;
        justify-content: space-between;
        gap: 4px 12px;
        margin-bottom: 4px;
      }
      h2 {
        margin: 0;
      }
      .exports {
        display: flex;
        gap: 4px;
      }
      .exports button {
        font-size: 12px;
        padding: 2px 8px;
      }
      .caption {
        margin: 0 0 6px;
      }
    `,
  ];

  @property({ attribute: false }) spec: PlotSpec | undefined;
  @property() heading = '';
  @property() caption = '';
  @property() theme: PlotTheme = 'light';
  @property({ attribute: false }) cursorHz: number | undefined;
  @property({ type: Number }) heightRatio = 0.48;
  @property() emptyText = 'Nothing to draw yet.';
  @property({ attribute: false }) createPlot: SpecPlotFactory | undefined;
  /** The exports offered. */
  @property({ attribute: false }) formats: readonly PlotExportFormat[] = ['csv', 'svg', 'png'];

  @query('chokepoint-spec-chart') chart: SpecChart | null | undefined;

  override render() {
    const id = `${this.spec?.id ?? 'plot'}-title`;
    return html`
      <section aria-labelledby=${id}>
        <div class="head">
          <h2 id=${id}>${this.heading || this.spec?.title || ''}</h2>
          ${this.spec
            ? html`<div class="exports" role="group" aria-label="Export ${this.heading}">
                ${this.formats.map(
                  (format) => html`<button type="button" data-export=${format} @click=${() => this.export(format)}>${format.toUpperCase()}</button>`,
                )}
              </div>`
            : nothing}
        </div>
        ${this.caption ? html`<p class="caption muted small">${this.caption}</p>` : nothing}
        <chokepoint-spec-chart
          .spec=${this.spec}
          .theme=${this.theme}
          .cursorHz=${this.cursorHz}
          .heightRatio=${this.heightRatio}
          .emptyText=${this.emptyText}
          .createPlot=${this.createPlot}
        ></chokepoint-spec-chart>
      </section>
    `;
  }

  private export(format: PlotExportFormat): void {
    if (!this.spec) return;
    this.dispatchEvent(new CustomEvent('plot-export', { detail: { spec: this.spec, format }, bubbles: true, composed: true }));
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-plot-panel': PlotPanel;
  }
}
