import { css, html, LitElement, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { Design, FilterElement } from '../../model/design.ts';
import { sharedStyles } from '../styles/theme.ts';
import { describePlacement, describeReceiver, summarizePart } from './part-summary.ts';

/**
 * The filter as a read-only list: the noise source, each stage's elements in order from the source
 * side to the LISN side, and the receiving networks. Later an editor takes this place.
 */
@customElement('chokepoint-stage-list')
export class StageList extends LitElement {
  static override styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      .ends {
        display: grid;
        grid-template-columns: max-content 1fr;
        gap: 2px 10px;
        margin: 0 0 4px;
      }
      .ends dt {
        color: var(--cp-muted);
      }
      .ends dd {
        margin: 0;
      }
      section + section {
        margin-top: 4px;
      }
      td.id {
        font-family: var(--cp-mono);
        font-size: 12.5px;
        white-space: nowrap;
      }
      td.value {
        white-space: nowrap;
        font-weight: 600;
      }
      .details {
        display: block;
        color: var(--cp-muted);
        font-size: 12px;
      }
      tr.off td {
        color: var(--cp-muted);
        text-decoration: line-through;
      }
      .empty-stage {
        color: var(--cp-muted);
        font-style: italic;
      }
    `,
  ];

  @property({ attribute: false }) design: Design | undefined;

  override render() {
    const design = this.design;
    if (!design) return nothing;
    const source = design.noiseSource;
    const cm = summarizePart(source.commonMode.impedance);
    const dm = summarizePart(source.differentialMode.impedance);
    const line1 = describeReceiver(design.receivers.line1);
    const line2 = describeReceiver(design.receivers.line2);
    return html`
      <dl class="ends small">
        <dt>Source, CM</dt>
        <dd>${cm.kind} ${cm.value}${cm.details ? html` <span class="muted">(${cm.details})</span>` : nothing}</dd>
        <dt>Source, DM</dt>
        <dd>${dm.kind} ${dm.value}${dm.details ? html` <span class="muted">(${dm.details})</span>` : nothing}</dd>
        <dt>Receivers</dt>
        <dd>${line1 === line2 ? `${line1}, each line` : `line 1: ${line1}; line 2: ${line2}`}</dd>
      </dl>
      ${design.stages.map(
        (stage, index) => html`
          <section aria-label=${stage.label ?? stage.id}>
            <h3>${stage.label ?? `Stage ${index + 1}`} <span class="muted small">(${stage.id})</span></h3>
            ${stage.elements.length === 0
              ? html`<p class="empty-stage small">No elements.</p>`
              : html`<table>
                  <thead>
                    <tr>
                      <th scope="col">Id</th>
                      <th scope="col">Value</th>
                      <th scope="col">Part and placement</th>
                    </tr>
                  </thead>
                  <tbody>
                    ${stage.elements.map((element) => this.renderElement(element))}
                  </tbody>
                </table>`}
          </section>
        `,
      )}
    `;
  }

  private renderElement(element: FilterElement) {
    const part = summarizePart(element.part);
    return html`
      <tr class=${element.enabled ? '' : 'off'} title=${element.label ?? nothing}>
        <td class="id">${element.id}</td>
        <td class="value">${part.value}</td>
        <td>
          ${part.kind}, ${describePlacement(element.placement)}${element.enabled ? nothing : ' (switched off)'}
          ${part.details ? html`<span class="details">${part.details}</span>` : nothing}
        </td>
      </tr>
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-stage-list': StageList;
  }
}
