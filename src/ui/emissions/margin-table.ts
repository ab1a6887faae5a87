import { css, html, LitElement, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { sharedStyles } from '../styles/theme.ts';
import type { MarginPointView, MarginTableView } from './margin-view.ts';

/**
 * The margin report as tables: the overall result against the target margin with its reasons, the
 * worst margin in each band with the evidence behind it (judged points, covered span), the worst peaks, the ranges short of the target, the attenuation still needed per mode
 * (with a small chart) and the analysis' notes. Renders a MarginTableView; computes nothing.
 */
@customElement('chokepoint-margin-table')
export class MarginTable extends LitElement {
  static override styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      .verdict {
        display: flex;
        align-items: baseline;
        gap: 10px;
        flex-wrap: wrap;
        padding: 8px 12px;
        border-radius: var(--cp-radius);
        border: 1px solid var(--cp-border);
        border-left-width: 5px;
        margin-bottom: 10px;
      }
      .verdict strong {
        font-size: 17px;
        letter-spacing: 0.04em;
      }
      .verdict.pass {
        border-left-color: var(--cp-ok);
        background: #eef7f0;
      }
      .verdict.pass strong {
        color: var(--cp-ok);
      }
      .verdict.fail {
        border-left-color: var(--cp-error-border);
        background: var(--cp-error-bg);
      }
      .verdict.fail strong {
        color: var(--cp-error-text);
      }
      .verdict.none strong {
        color: var(--cp-muted);
      }
      .verdict.none {
        border-left-color: var(--cp-muted);
      }
      .reasons {
        flex-basis: 100%;
        margin: 2px 0 0;
        padding-left: 18px;
      }
      h3:first-of-type {
        margin-top: 0;
      }
      table {
        margin-bottom: 6px;
      }
      td.band {
        font-weight: 600;
        white-space: nowrap;
      }
      .which {
        display: block;
        color: var(--cp-muted);
        font-size: 12px;
      }
      tr.short td.margin,
      td.margin.short {
        color: var(--cp-error-text);
        font-weight: 650;
      }
      .result {
        display: inline-block;
        padding: 0 7px;
        border-radius: 999px;
        font-size: 12px;
        font-weight: 650;
        white-space: nowrap;
        border: 1px solid transparent;
      }
      .result.pass {
        color: var(--cp-ok);
        border-color: #9cc9a9;
        background: #eef7f0;
      }
      .result.fail {
        color: var(--cp-error-text);
        border-color: var(--cp-error-border);
        background: var(--cp-error-bg);
      }
      .result.none {
        color: var(--cp-muted);
        border-color: var(--cp-border);
      }
      .grid {
        display: grid;
        gap: 6px 24px;
        grid-template-columns: repeat(auto-fit, minmax(min(360px, 100%), 1fr));
        align-items: start;
      }
      .grid > section {
        min-width: 0;
      }
      /* On a narrow window a wide table scrolls sideways inside the panel instead of widening the page. */
      .scroll {
        overflow-x: auto;
        max-width: 100%;
      }
      .required {
        display: grid;
        grid-template-columns: max-content max-content 1fr;
        gap: 2px 12px;
        margin: 0 0 6px;
      }
      .required dt {
        color: var(--cp-muted);
      }
      .required dd {
        margin: 0;
      }
      .notes li + li {
        margin-top: 3px;
      }
      .star {
        color: var(--cp-muted);
      }
      button.at {
        font: inherit;
        font-variant-numeric: tabular-nums;
        padding: 0;
        border: none;
        background: none;
        color: var(--cp-accent);
        text-decoration: underline dotted;
        cursor: pointer;
      }
    `,
  ];

  @property({ attribute: false }) view: MarginTableView | undefined;

  override render() {
    const view = this.view;
    if (!view) return nothing;
    return html`
      <div class="verdict ${view.verdict}" data-verdict=${view.verdict} role="status">
        <strong>${view.verdictWord}</strong>
        <span>${view.summary}</span>
        <span class="muted small">Target margin ${view.targetText} below every limit.</span>
        ${view.reasons.length > 0 ? html`<ul class="reasons small">${view.reasons.map((reason) => html`<li>${reason}</li>`)}</ul>` : nothing}
      </div>

      <h3>Worst margin in each band</h3>
      <div class="scroll">
      <table class="bands">
        <thead>
          <tr>
            <th scope="col">Band</th>
            <th scope="col">Worst margin</th>
            <th scope="col">At</th>
            <th scope="col">Level</th>
            <th scope="col">Limit</th>
            <th scope="col">Limit line and trace</th>
            <th scope="col" title="Points with a limit and a margin (points at the noise floor are counted apart)">Judged points</th>
            <th scope="col" title="The lowest and highest frequency of the band where a limit applies and the noise was seen">Covered</th>
            <th scope="col">Result</th>
          </tr>
        </thead>
        <tbody>
          ${view.bands.map(
            (band) => html`
              <tr class=${band.verdict} data-band=${band.name} data-status=${band.verdict === 'none' ? 'not-covered' : band.verdict}>
                <td class="band">${band.name}</td>
                ${band.worst ? this.pointCells(band.worst) : html`<td colspan="5" class="muted">no judged point</td>`}
                <td class="num judged">${band.judged}</td>
                <td class="num covered">${band.covered}</td>
                <td>
                  <span class="result ${band.verdict}" title=${band.reason}>${band.verdictText}</span>
                  ${band.verdict === 'none' ? html`<span class="which why">${band.reason}</span>` : nothing}
                  ${band.limitedBy
                    ? html`<span class="which limited" data-limited-by=${band.limitedBy.mode}>limited by <strong>${band.limitedBy.mode}</strong>: ${band.limitedBy.reason}</span>`
                    : nothing}
                </td>
              </tr>
            `,
          )}
        </tbody>
      </table>
      </div>

      <div class="grid">
        <section aria-labelledby="peaks-title">
          <h3 id="peaks-title">Worst peaks, lowest margin first</h3>
          ${view.peaks.length === 0
            ? html`<p class="muted small">None.</p>`
            : html`<div class="scroll"><table class="peaks small">
                <thead>
                  <tr>
                    <th scope="col">Margin</th>
                    <th scope="col">At</th>
                    <th scope="col">Level</th>
                    <th scope="col">Limit</th>
                    <th scope="col">Limit line and trace</th>
                  </tr>
                </thead>
                <tbody>
                  ${view.peaks.map((peak) => html`<tr>${this.pointCells(peak)}</tr>`)}
                </tbody>
              </table></div>`}
        </section>
        <section aria-labelledby="ranges-title">
          <h3 id="ranges-title">Ranges short of the ${view.targetText} target</h3>
          ${view.failingRanges.length === 0
            ? html`<p class="muted small">None: the target margin is kept everywhere a limit applies.</p>`
            : html`<div class="scroll"><table class="ranges small">
                <thead>
                  <tr>
                    <th scope="col">From</th>
                    <th scope="col">To</th>
                    <th scope="col">Worst</th>
                    <th scope="col">At</th>
                    <th scope="col">Limit line and trace</th>
                  </tr>
                </thead>
                <tbody>
                  ${view.failingRanges.map(
                    (range) => html`<tr>
                      <td class="num">${range.from}</td>
                      <td class="num">${range.to}</td>
                      <td class="num margin ${range.worst.short ? 'short' : ''}">${range.worst.margin}</td>
                      <td class="num">${this.at(range.worst)}</td>
                      <td>${this.which(range.worst)}</td>
                    </tr>`,
                  )}
                </tbody>
              </table></div>`}
        </section>
      </div>

      <section aria-labelledby="required-title">
        <h3 id="required-title">Attenuation still needed with no filter (limit less the target margin)</h3>
        <dl class="required small">
          ${view.required.map(
            (row) => html`<dt>${row.mode}</dt>
              <dd class="num" data-mode=${row.mode}><strong>${row.most}</strong></dd>
              <dd class="muted">${row.where}</dd>`,
          )}
        </dl>
      </section>

      ${view.notes.length > 0 || view.anyConservative
        ? html`<section aria-labelledby="notes-title">
            <h3 id="notes-title">Notes</h3>
            <ul class="notes small">
              ${view.anyConservative
                ? html`<li>
                    <span class="star">*</span> a higher-reading detector judged against this limit (for example a peak trace
                    against a quasi-peak limit): conservative
                  </li>`
                : nothing}
              ${view.notes.map((note) => html`<li>${note}</li>`)}
            </ul>
          </section>`
        : nothing}
    `;
  }

  private pointCells(point: MarginPointView) {
    return html`
      <td class="num margin ${point.short ? 'short' : ''}">${point.margin}</td>
      <td class="num">${this.at(point)}</td>
      <td class="num">${point.level}</td>
      <td class="num">${point.limit}</td>
      <td>${this.which(point)}</td>
    `;
  }

  /** The frequency as a button: it moves the plots' shared cursor there. */
  private at(point: MarginPointView) {
    return html`<button
      type="button"
      class="at"
      title="Show ${point.frequency} on the plots"
      @click=${() => this.dispatchEvent(new CustomEvent('cursor-move', { detail: { frequencyHz: point.frequencyHz }, bubbles: true, composed: true }))}
    >
      ${point.frequency}
    </button>`;
  }

  private which(point: MarginPointView) {
    return html`${point.mask}${point.conservative ? html` <span class="star" title="conservative comparison">*</span>` : nothing}
      <span class="which">${point.series}</span>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-margin-table': MarginTable;
  }
}
