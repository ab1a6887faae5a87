import { css, html, LitElement, nothing, unsafeCSS } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { SweepResult } from '../../engine/index.ts';
import { PLOT_PALETTE } from '../../drawing/plot-palette.ts';
import { formatFrequency } from '../../drawing/frequency-ticks.ts';
import { type ResonanceNote, resonanceNotes } from '../charts/resonance-marks.ts';
import { sharedStyles } from '../styles/theme.ts';

const VIEW_TEXT: Readonly<Record<Extract<ResonanceNote, { kind: 'self-resonance' }>['view'], string>> = {
  impedance: '',
  'common-mode': ', CM impedance',
  'differential-mode': ', DM impedance',
};

/**
 * The resonances marked on the chart, as a table: element self-resonances (▼ on the chart) and
 * the peaks and notches located on the drawn curves (○ on the chart).
 */
@customElement('chokepoint-resonance-list')
export class ResonanceList extends LitElement {
  static override styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      .symbol {
        width: 1.2em;
        text-align: center;
      }
      .srf {
        color: var(--cp-muted);
      }
      /* The mode colours of the plots (common mode blue, differential mode amber); no inline styles (CSP). */
      .cm {
        color: ${unsafeCSS(PLOT_PALETTE.light['common-mode'])};
      }
      .dm {
        color: ${unsafeCSS(PLOT_PALETTE.light['differential-mode'])};
      }
      :host-context([data-theme='dark']) .cm {
        color: ${unsafeCSS(PLOT_PALETTE.dark['common-mode'])};
      }
      :host-context([data-theme='dark']) .dm {
        color: ${unsafeCSS(PLOT_PALETTE.dark['differential-mode'])};
      }
    `,
  ];

  @property({ attribute: false }) result: SweepResult | undefined;

  override render() {
    if (!this.result) return nothing;
    const notes = resonanceNotes(this.result);
    if (notes.length === 0) return html`<p class="muted small">No self-resonances or located peaks in the swept range.</p>`;
    return html`
      <table class="small">
        <thead>
          <tr>
            <th scope="col" class="symbol"><span class="visually-hidden">Mark</span></th>
            <th scope="col">Frequency</th>
            <th scope="col">What</th>
          </tr>
        </thead>
        <tbody>
          ${notes.map((note) => this.renderNote(note))}
        </tbody>
      </table>
    `;
  }

  private renderNote(note: ResonanceNote) {
    if (note.kind === 'self-resonance') {
      return html`<tr>
        <td class="symbol srf" aria-hidden="true">▼</td>
        <td class="num">${formatFrequency(note.frequencyHz)}</td>
        <td>${note.elementLabel}${VIEW_TEXT[note.view]}: ${note.type} self-resonance</td>
      </tr>`;
    }
    return html`<tr>
      <td class="symbol ${note.series.mode === 'CM' ? 'cm' : 'dm'}" aria-hidden="true">○</td>
      <td class="num">${formatFrequency(note.frequencyHz)}</td>
      <td>${note.series.label}: ${note.type}, ${note.valueDb.toFixed(1)} dB</td>
    </tr>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-resonance-list': ResonanceList;
  }
}
