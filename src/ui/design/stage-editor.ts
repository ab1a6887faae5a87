import { css, html, LitElement, nothing, type TemplateResult } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import type { Design, FilterElement, PartKind, Placement } from '../../model/design.ts';
import { isJsonObject, type Json, type JsonObject } from '../../planner/json.ts';
import { ADD_PLACEMENT_TEXT, ADD_PLACEMENTS, type AddPlacement, KINDS_AT, PART_KIND_TEXT } from '../../planner/part-defaults.ts';
import type { Selection } from '../../planner/workspace.ts';
import { sendIntent } from '../app/intent-event.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import { sharedStyles } from '../styles/theme.ts';
import { summarizePart } from './part-summary.ts';

/**
 * The filter as a list, from the noise source to the LISN: its stages, each with its parts. Stages
 * are added, named, duplicated, removed and moved (buttons, or Alt+↑/↓ on a focused stage); parts are
 * added by placement and kind, switched off and on, duplicated, removed and moved (Alt+↑/↓ on a
 * focused part). Clicking or pressing Enter on a part selects it for the part editor.
 */

const PLACEMENT_TEXT: Readonly<Record<Placement, string>> = {
  'series-line1': 'series, line 1',
  'series-line2': 'series, line 2',
  'line-to-line': 'line to line',
  'line1-to-ground': 'line 1 to ground',
  'line2-to-ground': 'line 2 to ground',
  'both-lines-coupled': 'both lines, coupled',
};

interface StageRow {
  readonly id: string;
  readonly label: string;
  readonly elements: readonly ElementRow[];
}

interface ElementRow {
  readonly id: string;
  readonly label: string;
  readonly placement: string;
  readonly enabled: boolean;
  readonly summary: string;
  readonly invalid: boolean;
}

function text(value: Json | undefined): string {
  return typeof value === 'string' ? value : '';
}

/** The rows to show: structure from the document (as edited), part values from the last valid design. */
export function stageRows(document: JsonObject, valid: Design | undefined, invalidPaths: ReadonlySet<string>): StageRow[] {
  const byId = new Map<string, FilterElement>();
  for (const stage of valid?.stages ?? []) for (const element of stage.elements) byId.set(element.id, element);
  const stages = Array.isArray(document['stages']) ? (document['stages'] as readonly Json[]) : [];
  return stages.filter(isJsonObject).map((stage, s) => {
    const elements = Array.isArray(stage['elements']) ? (stage['elements'] as readonly Json[]).filter(isJsonObject) : [];
    return {
      id: text(stage['id']),
      label: text(stage['label']),
      elements: elements.map((element, e): ElementRow => {
        const id = text(element['id']);
        const known = byId.get(id);
        const summary = known ? summarizePart(known.part) : undefined;
        const prefix = `stages[${s}].elements[${e}]`;
        return {
          id,
          label: text(element['label']),
          placement: PLACEMENT_TEXT[element['placement'] as Placement] ?? text(element['placement']),
          enabled: element['enabled'] !== false,
          summary: summary ? `${summary.kind} ${summary.value}` : 'not valid yet',
          invalid: [...invalidPaths].some((path) => path === prefix || path.startsWith(`${prefix}.`)),
        };
      }),
    };
  });
}

@customElement('chokepoint-stage-editor')
export class StageEditor extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
      }
      ol.stages {
        list-style: none;
        margin: 0;
        padding: 0;
        display: grid;
        gap: 10px;
      }
      li.stage {
        border: 1px solid var(--cp-border);
        border-radius: var(--cp-radius);
        padding: 6px 8px 8px;
        background: var(--cp-panel);
      }
      li.stage.selected {
        border-color: var(--cp-accent);
      }
      .stage-head {
        display: flex;
        align-items: center;
        gap: 6px;
        flex-wrap: wrap;
      }
      .stage-head .stage-name {
        flex: 1 1 140px;
        font-weight: 600;
      }
      .stage-head .index {
        font-size: 12px;
        color: var(--cp-muted);
        white-space: nowrap;
      }
      .icon {
        padding: 1px 6px;
        min-width: 26px;
      }
      ul.elements {
        list-style: none;
        margin: 6px 0 0;
        padding: 0;
      }
      li.element {
        display: grid;
        grid-template-columns: auto minmax(0, 1fr) auto;
        align-items: center;
        gap: 4px 8px;
        padding: 3px 4px;
        border-radius: 4px;
        cursor: pointer;
      }
      li.element:hover {
        background: var(--cp-button-hover);
      }
      li.element.selected {
        background: var(--cp-selected-bg);
        outline: 1px solid var(--cp-accent);
      }
      li.element.off .what {
        opacity: 0.5;
        text-decoration: line-through;
      }
      li.element:focus-visible {
        outline: 2px solid var(--cp-accent);
      }
      .what {
        min-width: 0;
      }
      .what .id {
        font-weight: 600;
        font-family: var(--cp-mono);
        font-size: 12.5px;
      }
      .what .sum {
        font-size: 12.5px;
      }
      .what .where {
        display: block;
        font-size: 11.5px;
        color: var(--cp-muted);
      }
      .bad {
        color: var(--cp-error-text);
        font-size: 11.5px;
      }
      .actions {
        display: flex;
        gap: 2px;
      }
      .add {
        display: flex;
        flex-wrap: wrap;
        gap: 6px;
        margin-top: 6px;
        align-items: center;
      }
      .add select {
        width: auto;
        flex: 1 1 120px;
      }
      .empty {
        font-size: 12.5px;
        color: var(--cp-muted);
        margin: 4px 0 0;
      }
      .message {
        font-size: 12.5px;
        color: var(--cp-error-text);
        margin: 6px 0 0;
      }
      .bar {
        margin-top: 10px;
      }
    `,
  ];

  @property({ attribute: false }) document: JsonObject | undefined;
  @property({ attribute: false }) design: Design | undefined;
  @property({ attribute: false }) selection: Selection;
  @property({ attribute: false }) invalidPaths: ReadonlySet<string> = new Set();

  /** Per stage: the placement and kind chosen in its "add a part" row. */
  @state() private adding: Readonly<Record<string, { placement: AddPlacement; kind: PartKind }>> = {};
  @state() private message: string | undefined;

  override render() {
    if (!this.document) return nothing;
    const rows = stageRows(this.document, this.design, this.invalidPaths);
    return html`
      <ol class="stages" aria-label="Stages, from the noise source to the LISN">
        ${rows.map((stage, s) => this.renderStage(stage, s, rows.length))}
      </ol>
      ${rows.length === 0 ? html`<p class="empty">No stages: the noise source is wired straight to the LISNs.</p>` : nothing}
      <div class="bar">
        <button type="button" @click=${() => this.send({ type: 'add-stage' })}>Add a stage</button>
      </div>
      ${this.message ? html`<p class="message" role="alert">${this.message}</p>` : nothing}
    `;
  }

  private renderStage(stage: StageRow, index: number, count: number): TemplateResult {
    const selected = this.selection?.kind === 'stage' && this.selection.id === stage.id;
    const adding = this.adding[stage.id] ?? { placement: 'line-to-line' as AddPlacement, kind: 'capacitor' as PartKind };
    const kinds = KINDS_AT[adding.placement];
    return html`
      <li class="stage ${selected ? 'selected' : ''}" data-stage=${stage.id} @keydown=${(event: KeyboardEvent) => this.stageKey(event, stage.id, index)}>
        <div class="stage-head">
          <span class="index">Stage ${index + 1}</span>
          <input
            class="stage-name"
            type="text"
            aria-label="Name of stage ${index + 1}"
            .value=${stage.label}
            placeholder=${stage.id}
            @input=${(event: Event) => this.send({ type: 'rename', id: stage.id, label: (event.target as HTMLInputElement).value })}
          />
          <button type="button" class="icon" title="Move this stage toward the noise source (Alt+↑)" aria-label="Move stage ${index + 1} up" ?disabled=${index === 0} @click=${() => this.send({ type: 'move-stage', stageId: stage.id, to: index - 1 })}>↑</button>
          <button type="button" class="icon" title="Move this stage toward the LISN (Alt+↓)" aria-label="Move stage ${index + 1} down" ?disabled=${index === count - 1} @click=${() => this.send({ type: 'move-stage', stageId: stage.id, to: index + 1 })}>↓</button>
          <button type="button" class="icon" title="Duplicate this stage" aria-label="Duplicate stage ${index + 1}" @click=${() => this.send({ type: 'duplicate-stage', stageId: stage.id })}>copy</button>
          <button type="button" class="icon danger" title="Remove this stage" aria-label="Remove stage ${index + 1}" @click=${() => this.send({ type: 'remove-stage', stageId: stage.id })}>✕</button>
        </div>
        <ul class="elements" aria-label="Parts of stage ${index + 1}">
          ${stage.elements.map((element, e) => this.renderElement(stage.id, element, e, stage.elements.length))}
        </ul>
        ${stage.elements.length === 0 ? html`<p class="empty">No parts yet.</p>` : nothing}
        <div class="add">
          <select aria-label="Where the new part goes, stage ${index + 1}" @change=${(event: Event) => this.choosePlacement(stage.id, (event.target as HTMLSelectElement).value as AddPlacement)}>
            ${ADD_PLACEMENTS.map((placement) => html`<option value=${placement} ?selected=${placement === adding.placement}>${ADD_PLACEMENT_TEXT[placement]}</option>`)}
          </select>
          <select aria-label="Kind of the new part, stage ${index + 1}" @change=${(event: Event) => this.chooseKind(stage.id, (event.target as HTMLSelectElement).value as PartKind)}>
            ${kinds.map((kind) => html`<option value=${kind} ?selected=${kind === adding.kind}>${PART_KIND_TEXT[kind]}</option>`)}
          </select>
          <button type="button" class="primary" @click=${() => this.send({ type: 'add-element', stageId: stage.id, placement: adding.placement, kind: kinds.includes(adding.kind) ? adding.kind : kinds[0]! })}>Add part</button>
        </div>
      </li>
    `;
  }

  private renderElement(stageId: string, element: ElementRow, index: number, count: number): TemplateResult {
    const selected = this.selection?.kind === 'element' && this.selection.id === element.id;
    const name = element.label || element.id;
    return html`
      <li
        class="element ${selected ? 'selected' : ''} ${element.enabled ? '' : 'off'}"
        data-element=${element.id}
        tabindex="0"
        aria-current=${selected ? 'true' : 'false'}
        aria-label="${name}: ${element.summary}, ${element.placement}${element.enabled ? '' : ', switched off'}"
        @click=${() => this.select(element.id)}
        @keydown=${(event: KeyboardEvent) => this.elementKey(event, stageId, element.id, index, count)}
      >
        <input
          type="checkbox"
          title="In the circuit"
          aria-label="${name} in the circuit"
          .checked=${element.enabled}
          @click=${(event: Event) => event.stopPropagation()}
          @change=${(event: Event) => this.send({ type: 'set-element-enabled', elementId: element.id, enabled: (event.target as HTMLInputElement).checked })}
        />
        <span class="what">
          <span class="id">${element.id}</span>
          <span class="sum">${element.summary}</span>
          ${element.invalid ? html`<span class="bad">· needs a fix</span>` : nothing}
          <span class="where">${element.placement}${element.label ? ` · ${element.label}` : ''}</span>
        </span>
        <span class="actions">
          <button type="button" class="icon" title="Duplicate" aria-label="Duplicate ${name}" @click=${(event: Event) => (event.stopPropagation(), this.send({ type: 'duplicate-element', elementId: element.id }))}>copy</button>
          <button type="button" class="icon danger" title="Remove" aria-label="Remove ${name}" @click=${(event: Event) => (event.stopPropagation(), this.send({ type: 'remove-element', elementId: element.id }))}>✕</button>
        </span>
      </li>
    `;
  }

  private choosePlacement(stageId: string, placement: AddPlacement): void {
    const current = this.adding[stageId];
    const kinds = KINDS_AT[placement];
    const kind = current && kinds.includes(current.kind) ? current.kind : kinds[0]!;
    this.adding = { ...this.adding, [stageId]: { placement, kind } };
  }

  private chooseKind(stageId: string, kind: PartKind): void {
    const current = this.adding[stageId] ?? { placement: 'line-to-line' as AddPlacement, kind };
    this.adding = { ...this.adding, [stageId]: { ...current, kind } };
  }

  private select(elementId: string): void {
    this.send({ type: 'select', selection: { kind: 'element', id: elementId } });
  }

  private stageKey(event: KeyboardEvent, stageId: string, index: number): void {
    if (!event.altKey || (event.key !== 'ArrowUp' && event.key !== 'ArrowDown')) return;
    if ((event.target as HTMLElement).closest('li.element')) return;
    event.preventDefault();
    this.send({ type: 'move-stage', stageId, to: index + (event.key === 'ArrowUp' ? -1 : 1) });
    void this.updateComplete.then(() => this.focusIn(`li.stage[data-stage="${CSS.escape(stageId)}"] input.stage-name`));
  }

  private elementKey(event: KeyboardEvent, stageId: string, elementId: string, index: number, count: number): void {
    if (event.target !== event.currentTarget) return;
    if (event.key === 'Enter' || event.key === ' ') {
      event.preventDefault();
      this.select(elementId);
      return;
    }
    if (event.altKey && (event.key === 'ArrowUp' || event.key === 'ArrowDown')) {
      event.preventDefault();
      const to = index + (event.key === 'ArrowUp' ? -1 : 1);
      if (to < 0 || to >= count) return;
      this.send({ type: 'move-element', elementId, stageId, index: to });
      void this.updateComplete.then(() => this.focusIn(`li.element[data-element="${CSS.escape(elementId)}"]`));
      return;
    }
    if (event.key === 'Delete') {
      event.preventDefault();
      this.send({ type: 'remove-element', elementId });
    }
  }

  private focusIn(selector: string): void {
    const found = this.renderRoot.querySelector<HTMLElement>(selector);
    found?.focus();
  }

  private send(intent: Parameters<typeof sendIntent>[1]): void {
    const applied = sendIntent(this, intent);
    this.message = applied && !applied.ok ? applied.reason : undefined;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-stage-editor': StageEditor;
  }
}
