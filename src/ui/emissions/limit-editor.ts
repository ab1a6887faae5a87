import { css, html, LitElement, nothing, type TemplateResult } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { formatLineIssue } from '../../io/text-issues.ts';
import { decodeText } from '../../io/text-bytes.ts';
import { emissionsSchema } from '../../model/design-schema.ts';
import { DETECTORS, limitMaskSchema } from '../../model/emissions-schema.ts';
import { masksOf } from '../../planner/edits/emissions-edits.ts';
import { isJsonObject, type Json, type JsonObject } from '../../planner/json.ts';
import { LIMIT_PRESETS, type LimitPreset, presetSourceText } from '../../spectrum/limit-presets.ts';
import { sendIntent } from '../app/intent-event.ts';
import { loadMaskCsv } from '../app/later-code.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import '../editors/object-fields.ts';
import { sharedStyles } from '../styles/theme.ts';

/**
 * The limits the design is judged against and how: the target margin, the receiver's floor, how a
 * scan of unknown mode is credited, and the limit lines, each with its points in a table that can be
 * edited, grown and shortened, exported as CSV, or read from a mask CSV file. Presets are copied in
 * and say in plain words where their values come from.
 */


export type DownloadRequest = CustomEvent<{ readonly fileName: string; readonly mimeType: string; readonly text: string }>;

@customElement('chokepoint-limit-editor')
export class LimitEditor extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
        margin-top: 12px;
      }
      h3 {
        margin: 12px 0 6px;
      }
      ul.masks {
        list-style: none;
        padding: 0;
        margin: 0;
        display: grid;
        gap: 8px;
      }
      li.mask {
        border: 1px solid var(--cp-border);
        border-radius: var(--cp-radius);
        padding: 6px 8px;
      }
      .mask-head {
        display: grid;
        grid-template-columns: minmax(0, 1fr) auto auto;
        gap: 6px;
        align-items: center;
      }
      .mask-head select {
        width: auto;
      }
      .origin {
        font-size: 11.5px;
        color: var(--cp-muted);
        margin: 4px 0 0;
      }
      .row-actions {
        display: flex;
        gap: 6px;
        margin-top: 4px;
        flex-wrap: wrap;
      }
      .row-actions button {
        font-size: 12px;
        padding: 2px 8px;
      }
      table.points {
        font-size: 12.5px;
        margin-top: 6px;
      }
      table.points input {
        font-family: var(--cp-mono);
        font-size: 12px;
        width: 8.5em;
      }
      table.points td.i {
        color: var(--cp-muted);
        font-size: 11px;
        width: 2em;
      }
      .add {
        display: flex;
        gap: 6px;
        margin-top: 8px;
        flex-wrap: wrap;
      }
      .add select {
        flex: 1 1 200px;
        width: auto;
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
        cursor: pointer;
        width: 100%;
      }
      .message {
        font-size: 12.5px;
        color: var(--cp-error-text);
        margin: 6px 0 0;
      }
      .message ul {
        margin: 2px 0 0;
        font-family: var(--cp-mono);
        font-size: 12px;
      }
      .preset-source {
        font-size: 11.5px;
        color: var(--cp-muted);
        margin: 2px 0 0;
      }
    `,
  ];

  @property({ attribute: false }) document: JsonObject | undefined;
  @property({ attribute: false }) issues: ReadonlyMap<string, string> = new Map();

  @state() private openMask: string | undefined;
  @state() private presetChoice = '';
  @state() private message: { text: string; details: readonly string[] } | undefined;

  override render() {
    const document = this.document;
    if (!document) return nothing;
    const masks = masksOf(document);
    const preset = LIMIT_PRESETS.find((p) => p.id === this.presetChoice);
    return html`
      <h3>Judging</h3>
      <chokepoint-object-fields .document=${document} .path=${['emissions']} .schema=${emissionsSchema} .issues=${this.issues} .only=${['targetMarginDb', 'noiseFloorDbuV', 'attribution']}></chokepoint-object-fields>
      <h3>Limit lines</h3>
      ${masks.length === 0 ? html`<p class="muted small">None: add one, or nothing is judged.</p>` : nothing}
      <ul class="masks">
        ${masks.map((mask, m) => this.renderMask(mask, m))}
      </ul>
      <div class="add">
        <select aria-label="Limit preset to add" @change=${(event: Event) => (this.presetChoice = (event.target as HTMLSelectElement).value)}>
          <option value="" ?selected=${this.presetChoice === ''}>Add a preset…</option>
          ${groupsOf(LIMIT_PRESETS).map(
            (group) => html`<optgroup label=${group.standard}>${group.presets.map((p) => html`<option value=${p.id} ?selected=${p.id === this.presetChoice}>${p.name}</option>`)}</optgroup>`,
          )}
        </select>
        <button type="button" data-action="add-preset" ?disabled=${!preset || masks.length >= 16} @click=${this.addPreset}>Add</button>
        <label class="file" title="A mask CSV: frequency and level columns, optionally name, detector and origin lines">
          Read a mask file…
          <input type="file" accept=".csv,.txt,text/csv,text/plain" aria-label="Read a limit mask from a CSV file" @change=${this.onMaskFile} />
        </label>
      </div>
      ${preset ? html`<p class="preset-source">${preset.standard}, ${preset.clause}: ${presetSourceText(preset)}.</p>` : nothing}
      ${this.message
        ? html`<div class="message" role="alert">${this.message.text}${this.message.details.length ? html`<ul>${this.message.details.map((d) => html`<li>${d}</li>`)}</ul>` : nothing}</div>`
        : nothing}
    `;
  }

  private renderMask(mask: JsonObject, m: number): TemplateResult {
    const id = typeof mask['id'] === 'string' ? mask['id'] : `mask-${m}`;
    const base = ['emissions', 'masks', m];
    const open = this.openMask === id;
    const frequencies = Array.isArray(mask['frequencyHz']) ? (mask['frequencyHz'] as readonly Json[]) : [];
    const levels = Array.isArray(mask['levelDbuV']) ? (mask['levelDbuV'] as readonly Json[]) : [];
    const problems = [...this.issues.entries()].filter(([path]) => path.startsWith(`emissions.masks[${m}]`));
    const origin = typeof mask['origin'] === 'string' ? mask['origin'] : undefined;
    return html`<li class="mask" data-mask=${id}>
      <div class="mask-head">
        <input type="text" aria-label="Name of limit ${id}" .value=${typeof mask['name'] === 'string' ? mask['name'] : ''} @input=${(event: Event) => this.set([...base, 'name'], (event.target as HTMLInputElement).value)} />
        <select aria-label="Detector of limit ${id}" @change=${(event: Event) => this.set([...base, 'detector'], (event.target as HTMLSelectElement).value)}>
          ${DETECTORS.map((d) => html`<option value=${d} ?selected=${mask['detector'] === d}>${d}</option>`)}
        </select>
        <button type="button" class="danger" aria-label="Remove limit ${id}" @click=${() => this.send({ type: 'remove-mask', maskId: id })}>Remove</button>
      </div>
      <p class="origin">${origin ?? 'where the values come from is not given'} · ${frequencies.length} points</p>
      ${problems.length > 0 ? html`<p class="message">${problems.map(([path, message]) => `${path.replace(`emissions.masks[${m}].`, '')}: ${message}`).join('; ')}</p>` : nothing}
      <div class="row-actions">
        <button type="button" aria-expanded=${open ? 'true' : 'false'} @click=${() => (this.openMask = open ? undefined : id)}>${open ? 'Hide the points' : 'Edit the points'}</button>
        <button type="button" @click=${() => void this.exportMask(id, m)}>Export CSV</button>
      </div>
      ${open
        ? html`<table class="points">
            <thead><tr><th></th><th scope="col">Frequency (Hz)</th><th scope="col">Level (dBµV)</th><th></th></tr></thead>
            <tbody>
              ${frequencies.map(
                (f, i) => html`<tr>
                  <td class="i">${i + 1}</td>
                  <td><input type="text" inputmode="decimal" aria-label="Frequency of point ${i + 1}, Hz" .value=${String(f)} aria-invalid=${this.issues.has(`emissions.masks[${m}].frequencyHz[${i}]`) ? 'true' : 'false'} @input=${(event: Event) => this.point(id, i, 'frequencyHz', (event.target as HTMLInputElement).value)} /></td>
                  <td><input type="text" inputmode="decimal" aria-label="Level of point ${i + 1}, dBµV" .value=${String(levels[i] ?? '')} aria-invalid=${this.issues.has(`emissions.masks[${m}].levelDbuV[${i}]`) ? 'true' : 'false'} @input=${(event: Event) => this.point(id, i, 'levelDbuV', (event.target as HTMLInputElement).value)} /></td>
                  <td>
                    <button type="button" title="Add a point after this one" aria-label="Add a point after point ${i + 1}" @click=${() => this.send({ type: 'insert-mask-point', maskId: id, point: i })}>+</button>
                    <button type="button" title="Remove this point" aria-label="Remove point ${i + 1}" ?disabled=${frequencies.length <= 2} @click=${() => this.send({ type: 'remove-mask-point', maskId: id, point: i })}>−</button>
                  </td>
                </tr>`,
              )}
            </tbody>
          </table>`
        : nothing}
    </li>`;
  }

  /** A number as typed: a plain number (decimal comma accepted) is stored as one; anything else is kept for the schema to name. */
  private point(maskId: string, point: number, column: 'frequencyHz' | 'levelDbuV', text: string): void {
    const trimmed = text.trim().replace(',', '.');
    const value = trimmed !== '' && /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/u.test(trimmed) ? Number(trimmed) : text;
    this.send({ type: 'set-mask-point', maskId, point, [column]: value });
  }

  private set(path: readonly (string | number)[], value: Json): void {
    this.send({ type: 'set-field', path, value });
  }

  private addPreset(): void {
    if (this.presetChoice === '') return;
    if (this.send({ type: 'add-preset-mask', presetId: this.presetChoice })?.ok) this.presetChoice = '';
  }

  private async exportMask(maskId: string, index: number): Promise<void> {
    const raw = masksOf(this.document ?? {})[index];
    const parsed = limitMaskSchema.safeParse(raw);
    if (!parsed.success) {
      this.message = { text: `The limit “${maskId}” has a value that needs a fix before it can be exported.`, details: [] };
      return;
    }
    this.message = undefined;
    let maskToCsv: Awaited<ReturnType<typeof loadMaskCsv>>['maskToCsv'];
    try {
      ({ maskToCsv } = await loadMaskCsv());
    } catch (cause) {
      this.message = { text: `The CSV writer could not load: ${cause instanceof Error ? cause.message : String(cause)}.`, details: [] };
      return;
    }
    this.dispatchEvent(new CustomEvent('download-request', { detail: { fileName: `${maskId}.csv`, mimeType: 'text/csv', text: maskToCsv(parsed.data) }, bubbles: true, composed: true }));
  }

  private async onMaskFile(event: Event): Promise<void> {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    let text: string;
    try {
      const decoded = decodeText(new Uint8Array(await file.arrayBuffer()));
      if (!decoded.ok) {
        this.message = { text: `${file.name} cannot be read: ${decoded.error.message}. Nothing changed.`, details: [] };
        return;
      }
      text = decoded.text;
    } catch (cause) {
      this.message = { text: `${file.name} could not be read: ${cause instanceof Error ? cause.message : String(cause)}. Nothing changed.`, details: [] };
      return;
    }
    let readMaskCsv: Awaited<ReturnType<typeof loadMaskCsv>>['readMaskCsv'];
    try {
      ({ readMaskCsv } = await loadMaskCsv());
    } catch (cause) {
      this.message = { text: `The CSV reader could not load: ${cause instanceof Error ? cause.message : String(cause)}. Nothing changed.`, details: [] };
      return;
    }
    const read = readMaskCsv(text, { name: file.name.replace(/\.[^.]+$/u, '') });
    if (!read.ok) {
      this.message = { text: `${file.name} is not a mask the program can use; nothing changed.`, details: read.issues.slice(0, 12).map(formatLineIssue) };
      return;
    }
    const mask = read.value.mask;
    const json: JsonObject = { ...mask, frequencyHz: [...mask.frequencyHz], levelDbuV: [...mask.levelDbuV] };
    const applied = this.send({ type: 'add-masks', masks: [json] });
    if (applied?.ok) this.message = read.notes.length > 0 ? { text: `${file.name} read, with notes:`, details: read.notes.map(formatLineIssue) } : undefined;
  }

  private send(intent: Parameters<typeof sendIntent>[1]) {
    const applied = sendIntent(this, intent);
    if (applied && !applied.ok) this.message = { text: applied.reason, details: [] };
    return applied;
  }
}

function groupsOf(presets: readonly LimitPreset[]): { standard: string; presets: LimitPreset[] }[] {
  const groups: { standard: string; presets: LimitPreset[] }[] = [];
  for (const preset of presets) {
    const group = groups.find((g) => g.standard === preset.standard);
    if (group) group.presets.push(preset);
    else groups.push({ standard: preset.standard, presets: [preset] });
  }
  return groups;
}

export function isMaskDocument(value: Json | undefined): value is JsonObject {
  return isJsonObject(value) && Array.isArray(value['frequencyHz']);
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-limit-editor': LimitEditor;
  }
  interface HTMLElementEventMap {
    'download-request': DownloadRequest;
  }
}
