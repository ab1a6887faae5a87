import { css, html, LitElement, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { readoutAt, readoutHeading } from '../../drawing/plot-readout.ts';
import type { PlotSpec } from '../../drawing/plot-spec.ts';
import { sharedStyles } from '../styles/theme.ts';

/**
 * Every value of every plot at the shared cursor, grouped by plot: what an engineer reads off the
 * charts, as text (and announced politely to a screen reader as the cursor moves by keys).
 */
@customElement('chokepoint-cursor-readout')
export class CursorReadout extends LitElement {
  static override styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      .head {
        font-weight: 650;
        margin: 0 0 4px;
      }
      details {
        margin: 2px 0;
      }
      summary {
        cursor: pointer;
        font-size: 12.5px;
        font-weight: 600;
      }
      table {
        font-size: 12px;
      }
      td.value {
        text-align: right;
        white-space: nowrap;
        font-variant-numeric: tabular-nums;
      }
      .hint {
        font-size: 12px;
        color: var(--cp-muted);
        margin: 0;
      }
    `,
  ];

  @property({ attribute: false }) specs: readonly PlotSpec[] = [];
  @property({ attribute: false }) cursorHz: number | undefined;

  override render() {
    const hz = this.cursorHz;
    if (hz === undefined) return html`<p class="hint">Move over a plot, or focus one and press ← or →, to read every value at one frequency.</p>`;
    return html`
      <p class="head" aria-live="polite">${readoutHeading(hz)}</p>
      ${this.specs.map((spec) => {
        const lines = readoutAt(spec, hz).filter((line) => line.text !== '–');
        if (lines.length === 0) return nothing;
        return html`<details open>
          <summary>${spec.title}</summary>
          <table>
            <tbody>
              ${lines.map((line) => html`<tr data-series=${line.id}><td>${line.label}</td><td class="value">${line.text}</td></tr>`)}
            </tbody>
          </table>
        </details>`;
      })}
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-cursor-readout': CursorReadout;
  }
}
