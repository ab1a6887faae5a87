import { css, html, LitElement, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import type { MeasuredPartReply } from '../../../workers/scan-import-api.ts';
import { FREQUENCY_UNITS, type FrequencyUnit } from '../../io/frequency-unit.ts';
import type { MeasurementFixture } from '../../io/touchstone.ts';
import { formatQuantity } from '../../model/units.ts';
import { isJsonObject, type Json, type JsonObject, type JsonPath } from '../../planner/json.ts';
import { sendIntent } from '../app/intent-event.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import { sharedStyles } from '../styles/theme.ts';

/**
 * A measured part for the selected element: a |Z|/phase table or a Touchstone file, read in the
 * file-reading worker exactly as `chokepoint measured-part` reads it (src/io/measurement-file.ts).
 * A two-port file needs to know how the part sat between the ports; a table whose header names no
 * frequency unit is read in the unit chosen. Lines it cannot use are left out and listed; a file it
 * cannot use changes nothing and says why.
 */

export type MeasuredPartReader = (bytes: Uint8Array, name: string, options: { fixture?: MeasurementFixture; frequencyUnit?: FrequencyUnit }) => Promise<MeasuredPartReply>;

const FIXTURE_TEXT: Readonly<Record<MeasurementFixture, string>> = {
  reflection: 'one port: measured by reflection',
  'series-thru': 'two ports: in series between port 1 and port 2',
  'shunt-thru': 'two ports: from the through line to ground',
};

@customElement('chokepoint-measured-import')
export class MeasuredImport extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
        margin-top: 10px;
      }
      .row {
        display: flex;
        gap: 6px;
        flex-wrap: wrap;
        align-items: center;
      }
      .row select {
        width: auto;
        flex: 1 1 160px;
      }
      .file {
        position: relative;
        display: inline-block;
        padding: 3px 10px;
        border: 1px solid var(--cp-input-border);
        border-radius: 4px;
        font-size: 13px;
        background: var(--cp-button-bg);
        cursor: pointer;
      }
      .file:focus-within {
        outline: 2px solid var(--cp-accent);
      }
      .file input {
        position: absolute;
        inset: 0;
        opacity: 0;
        width: 100%;
        cursor: pointer;
      }
      .said {
        font-size: 12.5px;
        margin: 6px 0 0;
      }
      .said.error {
        color: var(--cp-error-text);
      }
      .said ul {
        margin: 2px 0 0;
        font-family: var(--cp-mono);
        font-size: 11.5px;
        max-height: 140px;
        overflow: auto;
      }
      .summary {
        font-size: 12.5px;
        margin: 0 0 6px;
      }
    `,
  ];

  /** Where the element's part sits in the document. */
  @property({ attribute: false }) partPath: JsonPath = [];
  /** The part as written in the document (its table is summarised when it is measured). */
  @property({ attribute: false }) partValue: Json | undefined;
  @property({ attribute: false }) reader: MeasuredPartReader | undefined;

  @state() private fixture: MeasurementFixture | '' = '';
  @state() private frequencyUnit: FrequencyUnit | '' = '';
  @state() private said: { tone: 'info' | 'error'; text: string; lines: readonly string[] } | undefined;

  override render() {
    const part = this.partValue;
    const measured = isJsonObject(part) && part['kind'] === 'measured' ? part : undefined;
    return html`
      <h3>Measured part</h3>
      ${measured ? html`<p class="summary">${this.summary(measured)}</p>` : html`<p class="summary muted">Use a measurement of the real part instead of its model.</p>`}
      <div class="row">
        <select aria-label="How a two-port Touchstone part was connected" @change=${(event: Event) => (this.fixture = (event.target as HTMLSelectElement).value as MeasurementFixture | '')}>
          <option value="" ?selected=${this.fixture === ''}>Touchstone: from the file (one-port: reflection)</option>
          ${(Object.keys(FIXTURE_TEXT) as MeasurementFixture[]).map((f) => html`<option value=${f} ?selected=${f === this.fixture}>${FIXTURE_TEXT[f]}</option>`)}
        </select>
        <select aria-label="Frequency unit of a table whose header names none" @change=${(event: Event) => (this.frequencyUnit = (event.target as HTMLSelectElement).value as FrequencyUnit | '')}>
          <option value="" ?selected=${this.frequencyUnit === ''}>table frequency in Hz unless it says</option>
          ${FREQUENCY_UNITS.map((unit) => html`<option value=${unit} ?selected=${unit === this.frequencyUnit}>table frequency in ${unit}</option>`)}
        </select>
        <label class="file">
          Read a measurement…
          <input type="file" aria-label="Read a measured |Z| table or Touchstone file for this part" accept=".csv,.txt,.tsv,.dat,.s1p,.s2p,.z1p,.z2p,.y1p,.y2p,.ts,text/plain,text/csv" @change=${this.onFile} />
        </label>
      </div>
      ${this.said
        ? html`<div class="said ${this.said.tone}" role=${this.said.tone === 'error' ? 'alert' : 'status'}>
            ${this.said.text}${this.said.lines.length > 0 ? html`<ul>${this.said.lines.map((line) => html`<li>${line}</li>`)}</ul>` : nothing}
          </div>`
        : nothing}
    `;
  }

  private summary(part: JsonObject): string {
    const table = part['table'];
    const f = isJsonObject(table) && Array.isArray(table['frequencyHz']) ? (table['frequencyHz'] as readonly Json[]).filter((v): v is number => typeof v === 'number') : [];
    const origin = isJsonObject(part['origin']) ? part['origin'] : undefined;
    const file = typeof origin?.['fileName'] === 'string' ? ` from ${origin['fileName']}` : '';
    const span = f.length > 1 ? `, ${formatQuantity(f[0]!, 'Hz')} to ${formatQuantity(f[f.length - 1]!, 'Hz')}` : '';
    return `A measured |Z| table of ${f.length} points${span}${file}; held at its ends and flagged outside them.`;
  }

  private async onFile(event: Event): Promise<void> {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file || !this.reader) return;
    const bytes = new Uint8Array(await file.arrayBuffer());
    const reply = await this.reader(bytes, file.name, { ...(this.fixture ? { fixture: this.fixture } : {}), ...(this.frequencyUnit ? { frequencyUnit: this.frequencyUnit } : {}) });
    if (!reply.ok) {
      this.said = { tone: 'error', text: `${reply.message}; nothing changed.`, lines: reply.issues };
      return;
    }
    const applied = sendIntent(this, { type: 'set-field', path: this.partPath, value: reply.part as unknown as Json });
    if (applied && !applied.ok) {
      this.said = { tone: 'error', text: applied.reason, lines: [] };
      return;
    }
    const left = reply.rejected.length > 0 ? `; ${reply.rejected.length} line${reply.rejected.length === 1 ? '' : 's'} left out` : '';
    this.said = { tone: 'info', text: `${file.name} read${left}.`, lines: [...reply.rejected, ...reply.notes] };
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-measured-import': MeasuredImport;
  }
}
