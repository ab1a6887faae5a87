import { css, html, LitElement, nothing, type TemplateResult } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { z } from 'zod';
import { formatQuantity } from '../../model/units.ts';
import { type FieldDescription, fieldsOf, type FieldType } from '../../model/schema-fields.ts';
import { formatPath } from '../../model/validation-error.ts';
import { getAt, isJsonObject, type Json, type JsonObject, type JsonPath } from '../../planner/json.ts';
import { defaultForKind, OBJECT_DEFAULTS } from '../../planner/part-defaults.ts';
import { sendIntent } from '../app/intent-event.ts';
import { sharedStyles } from '../styles/theme.ts';
import { fieldHint, fieldText, kindText } from './field-text.ts';
import { editorStyles } from './editor-styles.ts';

/**
 * Every field of one object of the design file, generated from the schema (src/model/schema-fields.ts):
 * physical values as engineering text with their unit ("4m7", "2.2 nF"), numbers, choices, switches,
 * nested objects, and a choice of kind with that kind's own fields under it. What is typed is stored
 * as typed; a value the schema refuses is marked at its field with the schema's own message, while
 * the last valid design stays swept and drawn. Lists (tables) have their own editors and are skipped.
 */
@customElement('chokepoint-object-fields')
export class ObjectFields extends LitElement {
  static override styles = [sharedStyles, editorStyles, css`:host { display: block; }`];

  /** The design document being edited. */
  @property({ attribute: false }) document: JsonObject | undefined;
  /** Where the object sits in the document. */
  @property({ attribute: false }) path: JsonPath = [];
  /** The object's schema (an object schema, as the design schema defines it). */
  @property({ attribute: false }) schema: z.core.$ZodType | undefined;
  /** Validation problems by path text, first message per path. */
  @property({ attribute: false }) issues: ReadonlyMap<string, string> = new Map();
  /** Field names not to show (drawn elsewhere). */
  @property({ attribute: false }) skip: readonly string[] = [];
  /** When set, only these fields, in this order. */
  @property({ attribute: false }) only: readonly string[] | undefined;
  /** What to show for a choice's value where the value itself is an id (a listed limit), by value. */
  @property({ attribute: false }) choiceLabels: ReadonlyMap<string, string> = new Map();

  override render() {
    if (!this.schema || !this.document) return nothing;
    const all = fieldsOf(this.schema).filter((f) => !this.skip.includes(f.name) && f.field.type !== 'literal' && f.field.type !== 'list' && f.field.type !== 'other');
    const fields = this.only ? this.only.flatMap((name) => all.filter((f) => f.name === name)) : all;
    return html`<div class="fields">${fields.map((f) => this.renderField(f, [...this.path, f.name]))}</div>`;
  }

  private renderField(field: FieldDescription, path: JsonPath): TemplateResult {
    const raw = getAt(this.document, path);
    const id = `f-${formatPath(path).replace(/[^A-Za-z0-9_-]/gu, '_')}`;
    const problem = this.issues.get(formatPath(path)) ?? this.nestedProblem(field, path);
    const hint = fieldHint(field.name);
    const type = field.field;
    switch (type.type) {
      case 'kinds':
        return this.renderKinds(field, path, raw, type.options, id, problem);
      case 'object':
        return this.renderObject(field, path, raw, type.schema, id);
      default:
        return html`
          <div class="field ${type.type === 'boolean' ? 'check' : ''}">
            <label for=${id}>${fieldText(field.name)}${field.presence.kind === 'optional' ? html` <span class="opt">optional</span>` : nothing}</label>
            <div class="input-row">
              ${this.renderInput(field, type, path, raw, id, problem !== undefined)}
              ${type.type === 'quantity' && type.unit !== '' ? html`<span class="unit">${type.unit}</span>` : nothing}
            </div>
            ${problem ? html`<p class="field-error" id="${id}-error" role="alert">${problem}</p>` : hint ? html`<p class="hint">${hint}</p>` : nothing}
          </div>
        `;
    }
  }

  /** A refusal of a nested kind object's discriminator is reported at the object's path. */
  private nestedProblem(field: FieldDescription, path: JsonPath): string | undefined {
    if (field.field.type !== 'kinds') return undefined;
    return this.issues.get(`${formatPath(path)}.kind`);
  }

  private renderInput(field: FieldDescription, type: FieldType, path: JsonPath, raw: Json | undefined, id: string, invalid: boolean): TemplateResult {
    const described = invalid ? `${id}-error` : nothing;
    switch (type.type) {
      case 'quantity': {
        const text = typeof raw === 'string' ? raw : typeof raw === 'number' ? formatQuantity(raw, type.unit, 6) : '';
        const fallback = field.presence.kind === 'default' && typeof field.presence.value === 'number' ? formatQuantity(field.presence.value, type.unit) : field.presence.kind === 'optional' ? 'not given' : '';
        return html`<input
          id=${id}
          class="quantity"
          type="text"
          inputmode="decimal"
          autocomplete="off"
          spellcheck="false"
          .value=${text}
          placeholder=${fallback}
          aria-invalid=${invalid ? 'true' : 'false'}
          aria-describedby=${described}
          @input=${(event: Event) => this.setText(field, path, (event.target as HTMLInputElement).value)}
        />`;
      }
      case 'number': {
        const text = typeof raw === 'number' ? String(raw) : typeof raw === 'string' ? raw : '';
        const fallback = field.presence.kind === 'default' && typeof field.presence.value === 'number' ? String(field.presence.value) : '';
        return html`<input
          id=${id}
          class="number"
          type="text"
          inputmode="decimal"
          autocomplete="off"
          .value=${text}
          placeholder=${fallback}
          aria-invalid=${invalid ? 'true' : 'false'}
          aria-describedby=${described}
          @input=${(event: Event) => this.setNumber(field, path, (event.target as HTMLInputElement).value)}
        />`;
      }
      case 'boolean': {
        const checked = typeof raw === 'boolean' ? raw : field.presence.kind === 'default' ? field.presence.value === true : false;
        return html`<input id=${id} type="checkbox" .checked=${checked} @change=${(event: Event) => this.set(path, (event.target as HTMLInputElement).checked)} />`;
      }
      case 'choice': {
        const current = typeof raw === 'string' ? raw : field.presence.kind === 'default' ? String(field.presence.value) : '';
        return html`<select id=${id} aria-invalid=${invalid ? 'true' : 'false'} @change=${(event: Event) => this.set(path, (event.target as HTMLSelectElement).value)}>
          ${field.presence.kind === 'optional' ? html`<option value="" ?selected=${current === ''}>—</option>` : nothing}
          ${field.presence.kind === 'required' && current === '' ? html`<option value="" selected disabled>choose…</option>` : nothing}
          ${type.values.map((value) => html`<option value=${value} ?selected=${value === current}>${this.choiceLabels.get(value) ?? kindText(value)}</option>`)}
        </select>`;
      }
      case 'text': {
        const text = typeof raw === 'string' ? raw : '';
        return html`<input
          id=${id}
          type="text"
          .value=${text}
          maxlength=${type.maxLength ?? nothing}
          aria-invalid=${invalid ? 'true' : 'false'}
          @input=${(event: Event) => this.setText(field, path, (event.target as HTMLInputElement).value)}
        />`;
      }
      default:
        return html``;
    }
  }

  private renderKinds(field: FieldDescription, path: JsonPath, raw: Json | undefined, options: ReadonlyMap<string, z.core.$ZodType>, id: string, problem: string | undefined): TemplateResult {
    const current = isJsonObject(raw) && typeof raw['kind'] === 'string' ? raw['kind'] : undefined;
    const optional = field.presence.kind === 'optional';
    const shown = current ?? (field.presence.kind === 'default' && isJsonObject(field.presence.value as Json) ? ((field.presence.value as JsonObject)['kind'] as string) : undefined);
    const schema = shown === undefined ? undefined : options.get(shown);
    return html`
      <fieldset class="kinds">
        <legend>
          <label for=${id}>${fieldText(field.name)}</label>
          <select
            id=${id}
            aria-invalid=${problem ? 'true' : 'false'}
            @change=${(event: Event) => {
              const kind = (event.target as HTMLSelectElement).value;
              this.set(path, kind === '' ? undefined : defaultForKind(kind));
            }}
          >
            ${optional ? html`<option value="" ?selected=${shown === undefined}>none</option>` : nothing}
            ${[...options.keys()].map((kind) => html`<option value=${kind} ?selected=${kind === shown}>${this.choiceLabels.get(kind) ?? kindText(kind)}</option>`)}
          </select>
        </legend>
        ${problem ? html`<p class="field-error" role="alert">${problem}</p>` : nothing}
        ${schema && current !== undefined
          ? html`<chokepoint-object-fields .document=${this.document} .path=${path} .schema=${schema} .issues=${this.issues} .choiceLabels=${this.choiceLabels}></chokepoint-object-fields>`
          : nothing}
      </fieldset>
    `;
  }

  private renderObject(field: FieldDescription, path: JsonPath, raw: Json | undefined, schema: z.core.$ZodType, id: string): TemplateResult {
    const present = isJsonObject(raw);
    const optional = field.presence.kind === 'optional';
    if (!present && optional) {
      return html`<div class="field add-object">
        <span>${fieldText(field.name)}</span>
        <button type="button" id=${id} @click=${() => this.set(path, OBJECT_DEFAULTS[formatPath(path)] ?? {})}>Add</button>
      </div>`;
    }
    return html`
      <fieldset class="object">
        <legend>
          ${fieldText(field.name)}
          ${optional ? html`<button type="button" class="link" @click=${() => this.set(path, undefined)}>remove</button>` : nothing}
        </legend>
        <chokepoint-object-fields .document=${this.document} .path=${path} .schema=${schema} .issues=${this.issues} .choiceLabels=${this.choiceLabels}></chokepoint-object-fields>
      </fieldset>
    `;
  }

  private set(path: JsonPath, value: Json | undefined): void {
    sendIntent(this, { type: 'set-field', path, value });
  }

  /** Text as typed; empty means "not given" for an optional field and "the default" for one with a default. */
  private setText(field: FieldDescription, path: JsonPath, text: string): void {
    this.set(path, text.trim() === '' && field.presence.kind !== 'required' ? undefined : text);
  }

  /** A plain number (a decimal comma is accepted); anything else is kept as typed for the schema to name. */
  private setNumber(field: FieldDescription, path: JsonPath, text: string): void {
    const trimmed = text.trim();
    if (trimmed === '') {
      this.set(path, field.presence.kind === 'required' ? '' : undefined);
      return;
    }
    const value = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/u.test(trimmed) ? Number(trimmed.replace(',', '.')) : Number.NaN;
    this.set(path, Number.isFinite(value) ? value : text);
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-object-fields': ObjectFields;
  }
}
