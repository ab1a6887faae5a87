import { css, html, LitElement, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { commonModeChokeSchema, partSchema, PLACEMENTS } from '../../model/design-schema.ts';
import type { PartKind, Placement } from '../../model/design.ts';
import { describeField } from '../../model/schema-fields.ts';
import { findElement } from '../../planner/edits/design-edits.ts';
import { getAt, isJsonObject, type JsonObject, type JsonPath } from '../../planner/json.ts';
import { PART_KIND_TEXT } from '../../planner/part-defaults.ts';
import { sendIntent } from '../app/intent-event.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import '../editors/object-fields.ts';
import './measured-import.ts';
import type { MeasuredPartReader } from './measured-import.ts';
import { sharedStyles } from '../styles/theme.ts';

/**
 * The selected part: its id (renamed on Enter or when the field is left, checked for clashes), label,
 * placement, kind, whether it is in the circuit, and every field of its part kind, generated from the
 * schema. A value the schema refuses is marked at its field; the design last valid stays drawn.
 */

const PLACEMENT_TEXT: Readonly<Record<Placement, string>> = {
  'series-line1': 'in series, line 1',
  'series-line2': 'in series, line 2',
  'line-to-line': 'line to line',
  'line1-to-ground': 'line 1 to ground',
  'line2-to-ground': 'line 2 to ground',
  'both-lines-coupled': 'across both lines (common-mode choke)',
};

const PART_OPTIONS = (() => {
  const described = describeField(partSchema);
  return described.type === 'kinds' ? described.options : new Map();
})();

@customElement('chokepoint-part-editor')
export class PartEditor extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
      }
      .head {
        display: grid;
        grid-template-columns: repeat(auto-fill, minmax(150px, 1fr));
        gap: 8px 12px;
        margin-bottom: 10px;
      }
      .id-field input {
        font-family: var(--cp-mono);
      }
      .none {
        color: var(--cp-muted);
        font-size: 13px;
        margin: 0;
      }
      .message {
        color: var(--cp-error-text);
        font-size: 12.5px;
        margin: 4px 0;
      }
    `,
  ];

  @property({ attribute: false }) document: JsonObject | undefined;
  @property({ attribute: false }) elementId: string | undefined;
  @property({ attribute: false }) issues: ReadonlyMap<string, string> = new Map();
  /** Reads a measured part's file in the worker; the editor then offers to use a measurement. */
  @property({ attribute: false }) measuredReader: MeasuredPartReader | undefined;

  @state() private renameMessage: string | undefined;

  override render() {
    const document = this.document;
    const id = this.elementId;
    const where = document && id ? findElement(document, id) : undefined;
    if (!document || !id || !where) return html`<p class="none">Select a part in the list or the drawing to edit it.</p>`;
    const path: JsonPath = ['stages', where.stage, 'elements', where.element];
    const element = getAt(document, path);
    if (!isJsonObject(element)) return nothing;
    const part = element['part'];
    const kind = isJsonObject(part) && typeof part['kind'] === 'string' ? (part['kind'] as PartKind) : undefined;
    const schema = kind === undefined ? undefined : kind === 'common-mode-choke' ? commonModeChokeSchema : PART_OPTIONS.get(kind);
    const placement = element['placement'] as Placement;
    const placements = kind === 'common-mode-choke' ? (['both-lines-coupled'] as const) : PLACEMENTS.filter((p) => p !== 'both-lines-coupled');
    const enabled = element['enabled'] !== false;
    const placementProblem = this.issues.get(`stages[${where.stage}].elements[${where.element}].placement`);
    return html`
      <div class="head">
        <div class="field id-field">
          <label for="part-id">Id</label>
          <input
            id="part-id"
            type="text"
            .value=${id}
            spellcheck="false"
            aria-invalid=${this.renameMessage ? 'true' : 'false'}
            aria-describedby=${this.renameMessage ? 'rename-error' : nothing}
            @change=${(event: Event) => this.rename((event.target as HTMLInputElement).value)}
            @keydown=${(event: KeyboardEvent) => event.key === 'Enter' && this.rename((event.target as HTMLInputElement).value)}
          />
          ${this.renameMessage ? html`<p class="field-error" id="rename-error" role="alert">${this.renameMessage}</p>` : nothing}
        </div>
        <div class="field">
          <label for="part-label">Label</label>
          <input
            id="part-label"
            type="text"
            maxlength="200"
            .value=${typeof element['label'] === 'string' ? element['label'] : ''}
            @input=${(event: Event) => sendIntent(this, { type: 'rename', id, label: (event.target as HTMLInputElement).value })}
          />
        </div>
        <div class="field">
          <label for="part-placement">Placement</label>
          <select id="part-placement" aria-invalid=${placementProblem ? 'true' : 'false'} @change=${(event: Event) => sendIntent(this, { type: 'set-field', path: [...path, 'placement'], value: (event.target as HTMLSelectElement).value })}>
            ${placements.map((p) => html`<option value=${p} ?selected=${p === placement}>${PLACEMENT_TEXT[p]}</option>`)}
          </select>
          ${placementProblem ? html`<p class="field-error">${placementProblem}</p>` : nothing}
        </div>
        <div class="field">
          <label for="part-kind">Kind</label>
          <select id="part-kind" @change=${(event: Event) => sendIntent(this, { type: 'change-part-kind', elementId: id, kind: (event.target as HTMLSelectElement).value as PartKind })}>
            ${[...PART_OPTIONS.keys()].map((k) => html`<option value=${k} ?selected=${k === kind}>${PART_KIND_TEXT[k as PartKind] ?? k}</option>`)}
          </select>
        </div>
        <div class="field check">
          <input id="part-enabled" type="checkbox" .checked=${enabled} @change=${(event: Event) => sendIntent(this, { type: 'set-element-enabled', elementId: id, enabled: (event.target as HTMLInputElement).checked })} />
          <label for="part-enabled">In the circuit</label>
        </div>
      </div>
      ${schema
        ? html`<chokepoint-object-fields
            .document=${document}
            .path=${[...path, 'part']}
            .schema=${schema}
            .issues=${this.issues}
            .skip=${kind === 'measured' ? ['table', 'origin'] : []}
          ></chokepoint-object-fields>`
        : html`<p class="message">This part has no kind the program knows.</p>`}
      ${kind !== 'common-mode-choke'
        ? html`<chokepoint-measured-import .partPath=${[...path, 'part']} .partValue=${part} .reader=${this.measuredReader}></chokepoint-measured-import>`
        : nothing}
    `;
  }

  private rename(newId: string): void {
    const id = this.elementId;
    if (!id || newId === id) {
      this.renameMessage = undefined;
      return;
    }
    const applied = sendIntent(this, { type: 'rename', id, newId: newId.trim() });
    this.renameMessage = applied && !applied.ok ? applied.reason : undefined;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-part-editor': PartEditor;
  }
}
