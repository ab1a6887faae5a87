import { css, html, LitElement, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { SweepWarning } from '../../engine/index.ts';
import { sharedStyles } from '../styles/theme.ts';

/** The sweep's warnings: places where the model is idealised or a value should not be trusted as is. */
@customElement('chokepoint-warning-list')
export class WarningList extends LitElement {
  static override styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      li + li {
        margin-top: 4px;
      }
    `,
  ];

  @property({ attribute: false }) warnings: readonly SweepWarning[] | undefined;

  override render() {
    if (!this.warnings) return nothing;
    if (this.warnings.length === 0) return html`<p class="muted small">None: no idealised parts or flagged points.</p>`;
    // Messages about an element already start with its label.
    return html`<ul class="small">
      ${this.warnings.map((warning) => html`<li>${warning.message}</li>`)}
    </ul>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-warning-list': WarningList;
  }
}
