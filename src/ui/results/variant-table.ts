import { css, html, LitElement, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import type { AnalysisState, VariantResult } from '../../client/planner-results.ts';
import { formatQuantity } from '../../model/units.ts';
import { summarizeVariant } from '../../planner/variant-summary.ts';
import { checkDocument } from '../../planner/validation.ts';
import { MAX_OVERLAYS, variantName, type Workspace } from '../../planner/workspace.ts';
import { sendIntent } from '../app/intent-event.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import { sharedStyles } from '../styles/theme.ts';

/**
 * The variants side by side: worst margin in each band (from each variant's own analysis against
 * its own limits), the verdict, parts in circuit, total CM choke inductance and total Y capacitance;
 * and what can be done with each: edit it, overlay it on the plots (up to four, each with its own dash),
 * use it as the baseline, rename, delete. A new variant is a copy of the one being edited.
 */
@customElement('chokepoint-variant-table')
export class VariantTable extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
      }
      .scroll {
        overflow-x: auto;
      }
      table {
        font-size: 12.5px;
        min-width: 560px;
      }
      tr.active td {
        background: var(--cp-selected-bg);
      }
      td.name {
        min-width: 12em;
      }
      td.name input {
        min-width: 10em;
      }
      .fail {
        color: var(--cp-error-text);
        font-weight: 600;
      }
      .pass {
        color: var(--cp-ok);
        font-weight: 600;
      }
      .keep {
        display: flex;
        gap: 6px;
        margin-top: 8px;
        flex-wrap: wrap;
      }
      .keep input {
        flex: 1 1 200px;
        width: auto;
      }
      .message {
        color: var(--cp-error-text);
        font-size: 12.5px;
        margin: 4px 0 0;
      }
      .actions {
        display: flex;
        gap: 4px;
        flex-wrap: wrap;
      }
      .actions button {
        font-size: 12px;
        padding: 1px 6px;
      }
      .badge {
        font-size: 11px;
        color: var(--cp-muted);
      }
    `,
  ];

  @property({ attribute: false }) workspace: Workspace | undefined;
  @property({ attribute: false }) results: ReadonlyMap<string, VariantResult | undefined> = new Map();

  @state() private newName = '';
  @state() private message: string | undefined;

  override render() {
    const workspace = this.workspace;
    if (!workspace) return nothing;
    const active = workspace.variants.find((v) => v.id === workspace.activeId);
    const activeBaseline = active ? checkDocument(active.validDocument ?? active.document) : undefined;
    const baselineLabel = activeBaseline?.ok && activeBaseline.design.emissions?.baseline.kind === 'stages' ? activeBaseline.design.emissions.baseline.label : undefined;
    const bandNames = this.bandNames();
    return html`
      <div class="scroll">
        <table>
          <thead>
            <tr>
              <th scope="col">Variant</th>
              ${bandNames.map((name) => html`<th scope="col" class="num">Worst margin ${name}</th>`)}
              <th scope="col">Result</th>
              <th scope="col" class="num">Parts</th>
              <th scope="col" class="num">CM choke L, total</th>
              <th scope="col" class="num">Y capacitance, total</th>
              <th scope="col">On the plots</th>
              <th scope="col"></th>
            </tr>
          </thead>
          <tbody>
            ${workspace.variants.map((variant) => {
              const isActive = variant.id === workspace.activeId;
              const checked = checkDocument(variant.validDocument ?? variant.document);
              const summary = checked.ok ? summarizeVariant(checked.design) : undefined;
              const analysis = this.results.get(variant.id)?.analysis;
              const overlaid = workspace.overlayIds.includes(variant.id);
              const name = variantName(variant);
              return html`<tr class=${isActive ? 'active' : ''} data-variant=${variant.id} data-name=${name}>
                <td class="name">
                  <input
                    type="text"
                    aria-label="Name of variant ${name}"
                    .value=${name}
                    @change=${(event: Event) => this.send({ type: 'rename-variant', id: variant.id, name: (event.target as HTMLInputElement).value })}
                  />
                  ${isActive ? html`<span class="badge">being edited</span>` : nothing}
                  ${baselineLabel !== undefined && baselineLabel === name && !isActive ? html`<span class="badge">baseline of the edited one</span>` : nothing}
                </td>
                ${bandNames.map((band) => html`<td class="num">${this.bandCell(analysis, band)}</td>`)}
                <td>${this.verdictCell(analysis)}</td>
                <td class="num">${summary ? summary.partsInCircuit : '–'}</td>
                <td class="num">${summary ? formatQuantity(summary.totalCommonModeInductanceH, 'H', 3) : '–'}</td>
                <td class="num">${summary ? formatQuantity(summary.totalYCapacitanceF, 'F', 3) : '–'}</td>
                <td>
                  ${isActive
                    ? html`<span class="badge">solid lines</span>`
                    : html`<label
                        ><input
                          type="checkbox"
                          .checked=${overlaid}
                          ?disabled=${!overlaid && workspace.overlayIds.length >= MAX_OVERLAYS}
                          @change=${(event: Event) => this.send({ type: 'set-overlay', id: variant.id, shown: (event.target as HTMLInputElement).checked })}
                        />
                        overlay</label
                      >`}
                </td>
                <td>
                  <span class="actions">
                    ${isActive ? nothing : html`<button type="button" @click=${() => this.send({ type: 'switch-variant', id: variant.id })}>Edit</button>`}
                    ${isActive ? nothing : html`<button type="button" title="The filter fitted when the scan was taken" @click=${() => this.send({ type: 'set-baseline', variantId: variant.id })}>Use as baseline</button>`}
                    <button type="button" class="danger" ?disabled=${workspace.variants.length === 1} @click=${() => this.send({ type: 'delete-variant', id: variant.id })}>Delete</button>
                  </span>
                </td>
              </tr>`;
            })}
          </tbody>
        </table>
      </div>
      <form class="keep" @submit=${this.keep}>
        <input type="text" aria-label="Name for a copy of the design being edited" placeholder="Name for a copy of the edited design" .value=${this.newName} @input=${(event: Event) => (this.newName = (event.target as HTMLInputElement).value)} />
        <button type="submit" class="primary">Keep a copy as a variant</button>
        ${baselineLabel !== undefined ? html`<button type="button" @click=${() => this.send({ type: 'set-baseline', variantId: null })}>No baseline (scan without a filter)</button>` : nothing}
      </form>
      ${this.message ? html`<p class="message" role="alert">${this.message}</p>` : nothing}
    `;
  }

  private bandNames(): string[] {
    const names: string[] = [];
    for (const result of this.results.values()) {
      if (result?.analysis.status !== 'done') continue;
      for (const band of result.analysis.analysis.report.bands) if (!names.includes(band.name)) names.push(band.name);
    }
    return names;
  }

  private bandCell(analysis: AnalysisState | undefined, band: string) {
    if (!analysis) return '…';
    if (analysis.status === 'running') return '…';
    if (analysis.status !== 'done') return '–';
    const found = analysis.analysis.report.bands.find((b) => b.name === band);
    if (!found?.worst) return html`<span title="no judged point in this band">not covered</span>`;
    return html`<span class=${found.pass === false ? 'fail' : ''}>${found.worst.marginDb.toFixed(1)} dB</span>`;
  }

  private verdictCell(analysis: AnalysisState | undefined) {
    if (!analysis || analysis.status === 'running') return '…';
    // The reason is a sentence: in a comparison row it is a tooltip (the results panel says it in full).
    if (analysis.status === 'idle') return html`<span class="badge" title=${analysis.reason}>no result</span>`;
    if (analysis.status === 'error') return html`<span class="fail">${analysis.error.message}</span>`;
    const report = analysis.analysis.report;
    if (report.comparisons.length === 0) return html`<span class="badge">not judged</span>`;
    return report.pass ? html`<span class="pass">PASS</span>` : html`<span class="fail">FAIL</span>`;
  }

  private keep(event: Event): void {
    event.preventDefault();
    const applied = this.send({ type: 'keep-copy', name: this.newName || 'Copy' });
    if (applied?.ok) this.newName = '';
  }

  private send(intent: Parameters<typeof sendIntent>[1]) {
    const applied = sendIntent(this, intent);
    this.message = applied && !applied.ok ? applied.reason : undefined;
    return applied;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-variant-table': VariantTable;
  }
}
