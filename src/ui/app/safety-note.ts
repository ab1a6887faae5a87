import { css, html, LitElement } from 'lit';
import { customElement } from 'lit/decorators.js';
import { sharedStyles } from '../styles/theme.ts';

/** A short mains-safety caution: the planner predicts attenuation and checks nothing about safety. */
@customElement('chokepoint-safety-note')
export class SafetyNote extends LitElement {
  static override styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      aside {
        background: var(--cp-caution-bg);
        border: 1px solid var(--cp-caution-border);
        border-left-width: 4px;
        border-radius: var(--cp-radius);
        padding: 10px 12px;
      }
      h2 {
        font-size: 14px;
        margin-bottom: 4px;
      }
      li + li {
        margin-top: 3px;
      }
    `,
  ];

  override render() {
    return html`
      <aside aria-labelledby="safety-title" class="small">
        <h2 id="safety-title">Mains safety</h2>
        <p>These curves predict attenuation only; nothing here checks safety.</p>
        <ul>
          <li>Y capacitors (line to protective earth) pass leakage current to earth: keep the total within your product's limit.</li>
          <li>X capacitors (line to line) stay charged after unplugging: give them a discharge path.</li>
          <li>Use safety-rated X and Y capacitors for the working voltage; never ordinary parts in their place.</li>
          <li>Defer to the applicable standards, local electrical codes and licensed practice.</li>
        </ul>
      </aside>
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-safety-note': SafetyNote;
  }
}
