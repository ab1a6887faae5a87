import { css, html, LitElement, nothing, type PropertyValues } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import type { PlannerResults, VariantResult } from '../../client/planner-results.ts';
import type { PlotTheme } from '../../drawing/plot-palette.ts';
import type { PlotSpec } from '../../drawing/plot-spec.ts';
import { emissionsPlot } from '../../drawing/plots/emissions-plot.ts';
import { insertionLossPlot } from '../../drawing/plots/insertion-loss-plot.ts';
import { partImpedancePlot } from '../../drawing/plots/part-impedance-plot.ts';
import type { Overlay } from '../../drawing/plots/plot-helpers.ts';
import { requiredAttenuationPlot } from '../../drawing/plots/required-attenuation-plot.ts';
import type { SweepResult } from '../../engine/index.ts';
import type { EmissionsAnalysis } from '../../spectrum/emissions-analysis.ts';
import { emissionsSchema } from '../../model/design-schema.ts';
import { formatIssue } from '../../model/validation-error.ts';
import { formatFrequency } from '../../drawing/frequency-ticks.ts';
import type { PlannerStore, StoreChange } from '../../planner/planner-store.ts';
import { checkDocument, issuesByPath } from '../../planner/validation.ts';
import { activeVariant, variantById, variantName, type Workspace } from '../../planner/workspace.ts';
import type { CursorMoveEvent } from '../charts/spec-chart.ts';
import '../design/circuit-settings.ts';
import '../design/filter-drawing.ts';
import '../design/part-editor.ts';
import type { MeasuredPartReader } from '../design/measured-import.ts';
import '../design/stage-editor.ts';
import '../editors/object-fields.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import '../emissions/limit-editor.ts';
import '../emissions/margin-table.ts';
import { marginTableView } from '../emissions/margin-view.ts';
import '../emissions/scan-panel.ts';
import type { ScanPanelHost } from '../emissions/scan-panel.ts';
import '../results/cursor-readout.ts';
import '../results/plot-panel.ts';
import type { PlotExportEvent } from '../results/plot-panel.ts';
import '../results/variant-table.ts';
import '../sweep/resonance-list.ts';
import '../sweep/warning-list.ts';
import { sharedStyles, themeTokens } from '../styles/theme.ts';
import { INTENT_EVENT, type PlannerIntentEvent } from './intent-event.ts';
import '../checks/safety-panel.ts';

/**
 * The planner page. It holds the one store (the workspace of design variants and its history) and
 * the results the worker computes for them, and lays out the elements that show and edit them. Every
 * change an element wants arrives here as an intent (`planner-intent`) and goes to the store; every
 * store change goes on to the results, the saved copy and the link. Numbers are never made here:
 * the plots are built from the worker's results by the pure plot builders.
 */

export type ThemeChoice = 'system' | 'light' | 'dark';

/** What the page does with plot exports (download a file); tests pass a recorder. */
export type ExportHandler = (spec: PlotSpec, format: 'csv' | 'svg' | 'png', theme: PlotTheme) => void | Promise<void>;

interface Specs {
  readonly emissions: PlotSpec | undefined;
  readonly required: PlotSpec | undefined;
  readonly insertionLoss: PlotSpec | undefined;
  readonly impedance: PlotSpec | undefined;
}

@customElement('chokepoint-planner')
export class ChokepointPlanner extends LitElement {
  static override styles = [
    themeTokens,
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
        min-height: 100vh;
        background: var(--cp-page);
        color: var(--cp-text);
      }
      header {
        background: var(--cp-panel);
        border-bottom: 1px solid var(--cp-border);
        padding: 8px 20px;
        display: flex;
        align-items: center;
        gap: 8px 16px;
        flex-wrap: wrap;
        position: sticky;
        top: 0;
        z-index: 5;
      }
      @media (max-width: 700px) {
        /* On a phone-sized window the header's buttons wrap: let it scroll away with the page. */
        header {
          position: static;
          padding: 8px 12px;
        }
        main {
          padding: 10px 10px 24px;
        }
      }
      h1 {
        margin: 0;
        font-size: 19px;
        font-weight: 700;
        color: var(--cp-accent);
      }
      .variant-pick {
        display: flex;
        align-items: center;
        gap: 6px;
        min-width: 0;
        flex: 1 1 260px;
      }
      .variant-pick select {
        width: auto;
        max-width: 100%;
        font-weight: 600;
      }
      .toolbar {
        display: flex;
        gap: 4px;
        flex-wrap: wrap;
        align-items: center;
      }
      .origin {
        font-size: 11px;
        font-weight: 700;
        text-transform: uppercase;
        letter-spacing: 0.04em;
        padding: 2px 8px;
        border-radius: 999px;
        border: 1px solid var(--cp-border);
        color: var(--cp-muted);
        white-space: nowrap;
      }
      .origin.invented {
        background: var(--cp-invented-bg);
        color: var(--cp-invented-text);
        border-color: var(--cp-invented-border);
      }
      main {
        padding: 14px 20px 32px;
        max-width: 1880px;
        margin: 0 auto;
      }
      .notices {
        display: grid;
        gap: 6px;
        margin-bottom: 10px;
      }
      .notice {
        padding: 6px 10px;
        border-radius: var(--cp-radius);
        border: 1px solid var(--cp-border);
        border-left-width: 4px;
        background: var(--cp-panel);
        font-size: 13px;
      }
      .notice.error {
        background: var(--cp-error-bg);
        border-color: var(--cp-error-border);
        color: var(--cp-error-text);
      }
      .notice.info {
        border-left-color: var(--cp-accent);
      }
      .notice ul {
        margin: 4px 0 0;
        font-family: var(--cp-mono);
        font-size: 12px;
      }
      .layout {
        display: grid;
        grid-template-columns: minmax(0, 1fr);
        gap: var(--cp-gap);
      }
      @media (min-width: 1180px) {
        .layout {
          grid-template-columns: minmax(380px, 460px) minmax(0, 1fr);
          align-items: start;
        }
        .editing {
          position: sticky;
          top: 58px;
          max-height: calc(100vh - 70px);
          overflow-y: auto;
          padding-right: 4px;
        }
      }
      .column {
        display: grid;
        gap: 12px;
        min-width: 0;
        align-content: start;
      }
      .panel {
        background: var(--cp-panel);
        border: 1px solid var(--cp-border);
        border-radius: var(--cp-radius);
        padding: 10px 12px;
        min-width: 0;
      }
      details.panel > summary {
        cursor: pointer;
        font-weight: 650;
        font-size: 14px;
      }
      details.panel[open] > summary {
        margin-bottom: 8px;
      }
      .status {
        font-size: 13px;
        margin: 0;
      }
      .status.error,
      .reader-warnings {
        color: var(--cp-error-text);
      }
      .reader-warnings {
        margin: 4px 0 0;
        font-size: 13px;
      }
      .verdict-line {
        margin: 0 0 2px;
        font-size: 14px;
      }
      .verdict-word {
        font-weight: 800;
        letter-spacing: 0.03em;
        padding: 1px 8px;
        border-radius: 4px;
        border: 1px solid var(--cp-border);
      }
      .verdict-word.pass {
        color: var(--cp-ok);
        border-color: var(--cp-ok);
        background: var(--cp-ok-bg);
      }
      .verdict-word.fail {
        color: var(--cp-error-text);
        border-color: var(--cp-error-border);
        background: var(--cp-error-bg);
      }
      .pair {
        display: grid;
        gap: 12px;
        grid-template-columns: repeat(auto-fit, minmax(320px, 1fr));
        align-items: start;
      }
      .plots {
        display: grid;
        gap: 12px;
      }
      @media (min-width: 1700px) {
        .plots {
          grid-template-columns: 1fr 1fr;
        }
      }
      .description {
        font-size: 12.5px;
        color: var(--cp-muted);
        margin: 0;
        max-width: 110ch;
      }
    `,
  ];

  /** The store; set before the element goes on the page. */
  @property({ attribute: false }) store: PlannerStore | undefined;
  /** The worker's results for the variants. */
  @property({ attribute: false }) results: PlannerResults | undefined;
  /** Reads scan files (in their own worker) and keeps their columns. */
  @property({ attribute: false }) scanHost: ScanPanelHost | undefined;
  @property({ attribute: false }) onExport: ExportHandler | undefined;
  /** Things the page wants said once at the top (work restored, a link opened, a damaged record set aside). */
  @property({ attribute: false }) notices: readonly { readonly tone: 'info' | 'error'; readonly text: string; readonly details?: readonly string[] }[] = [];
  @property({ attribute: 'data-theme', reflect: true }) shownTheme: PlotTheme = 'light';
  @property({ attribute: false }) themeChoice: ThemeChoice = 'system';
  /** Reads a measured part's file (a |Z| table or Touchstone) in the file-reading worker. */
  @property({ attribute: false }) measuredReader: MeasuredPartReader | undefined;
  /** Names for choices whose values are ids (listed leakage limits, discharge requirements), from the worker. */
  @property({ attribute: false }) choiceLabels: ReadonlyMap<string, string> = new Map();
  /** The saving of the work, when the browser keeps it: its revision is what was last written. */
  autosave: { readonly revision: number } | undefined;

  @state() private workspace: Workspace | undefined;
  @state() private cursorHz: number | undefined;
  @state() private resultsVersion = 0;
  @state() private hiddenSeries: Readonly<Record<string, ReadonlySet<string>>> = {};

  private unsubscribe: (() => void) | undefined;
  private specMemo: { key: readonly unknown[]; specs: Specs } | undefined;
  /** Derived values kept while their inputs are the same objects, so unchanged elements do not re-render. */
  private readonly derived = new WeakMap<object, unknown>();
  private derivedKeyed<K extends object, V>(key: K, make: (key: K) => V): V {
    if (this.derived.has(key)) return this.derived.get(key) as V;
    const value = make(key);
    this.derived.set(key, value);
    return value;
  }
  private resultsMapMemo: { key: readonly unknown[]; map: ReadonlyMap<string, VariantResult | undefined> } | undefined;
  private media: MediaQueryList | undefined;

  /** Called by the page's wiring when the worker has new results. */
  resultsChanged(): void {
    this.resultsVersion += 1;
  }

  /** Whether the design being edited has its sweep and its analysis (or a reason there is none): nothing is pending. */
  get settled(): boolean {
    const workspace = this.workspace;
    if (!workspace) return false;
    const result = this.resultOf(workspace.activeId);
    const active = activeVariant(workspace);
    return result !== undefined && result.document === active.validDocument && result.sweep.status !== 'running' && result.analysis.status !== 'running';
  }

  /** Read a scan file dropped on the page, as the scan panel's own picker would. */
  async importScanFile(file: File): Promise<void> {
    await this.updateComplete;
    await this.renderRoot.querySelector('chokepoint-scan-panel')?.importFile(file);
  }

  /** The uPlot canvas a plot is drawn on, for a picture of what is on screen. */
  plotCanvas(plotId: string): HTMLCanvasElement | undefined {
    for (const panel of this.renderRoot.querySelectorAll('chokepoint-plot-panel')) {
      if (panel.spec?.id !== plotId) continue;
      const chart = panel.renderRoot.querySelector('chokepoint-spec-chart');
      return chart?.renderRoot.querySelector('canvas') ?? undefined;
    }
    return undefined;
  }

  override connectedCallback(): void {
    super.connectedCallback();
    this.addEventListener(INTENT_EVENT, this.onIntent);
    this.addEventListener('cursor-move', this.onCursorMove as EventListener);
    this.addEventListener('legend-toggle', this.onLegendToggle as EventListener);
    this.addEventListener('plot-export', this.onPlotExport as EventListener);
    window.addEventListener('keydown', this.onKeyDown);
    this.media = typeof window.matchMedia === 'function' ? window.matchMedia('(prefers-color-scheme: dark)') : undefined;
    this.media?.addEventListener('change', this.onSystemTheme);
    this.applyTheme();
  }

  override disconnectedCallback(): void {
    this.removeEventListener(INTENT_EVENT, this.onIntent);
    this.removeEventListener('cursor-move', this.onCursorMove as EventListener);
    this.removeEventListener('legend-toggle', this.onLegendToggle as EventListener);
    this.removeEventListener('plot-export', this.onPlotExport as EventListener);
    window.removeEventListener('keydown', this.onKeyDown);
    this.media?.removeEventListener('change', this.onSystemTheme);
    this.unsubscribe?.();
    this.unsubscribe = undefined;
    super.disconnectedCallback();
  }

  protected override willUpdate(changed: PropertyValues<this>): void {
    if (changed.has('store')) {
      this.unsubscribe?.();
      this.unsubscribe = this.store?.subscribe(this.onStoreChange);
      this.workspace = this.store?.workspace;
      if (this.workspace) this.results?.update(this.workspace);
    }
    if (changed.has('themeChoice')) this.applyTheme();
  }

  private readonly onStoreChange = (change: StoreChange): void => {
    this.workspace = change.workspace;
    this.results?.update(change.workspace);
  };

  private readonly onIntent = (event: PlannerIntentEvent): void => {
    event.stopPropagation();
    if (!this.store) return;
    event.detail.applied = this.store.dispatch(event.detail.intent);
  };

  private readonly onCursorMove = (event: CursorMoveEvent): void => {
    this.cursorHz = event.detail.frequencyHz;
  };

  private readonly onLegendToggle = (event: CustomEvent<{ plotId: string; seriesId: string; shown: boolean }>): void => {
    const { plotId, seriesId, shown } = event.detail;
    const current = new Set(this.hiddenSeries[plotId] ?? []);
    if (shown) current.delete(seriesId);
    else current.add(seriesId);
    this.hiddenSeries = { ...this.hiddenSeries, [plotId]: current };
  };

  private readonly onPlotExport = (event: PlotExportEvent): void => {
    this.onExport?.(event.detail.spec, event.detail.format, this.shownTheme);
  };

  /** Ctrl+Z undoes, Ctrl+Shift+Z and Ctrl+Y redo: the store's history, in every field too. */
  private readonly onKeyDown = (event: KeyboardEvent): void => {
    if (!(event.ctrlKey || event.metaKey) || event.altKey || !this.store) return;
    const key = event.key.toLowerCase();
    if (key === 'z' && !event.shiftKey) {
      event.preventDefault();
      this.store.undo();
    } else if ((key === 'z' && event.shiftKey) || key === 'y') {
      event.preventDefault();
      this.store.redo();
    }
  };

  private readonly onSystemTheme = (): void => this.applyTheme();

  private applyTheme(): void {
    const dark = this.themeChoice === 'dark' || (this.themeChoice === 'system' && this.media?.matches === true);
    this.shownTheme = dark ? 'dark' : 'light';
  }

  private cycleTheme(): void {
    const next: Record<ThemeChoice, ThemeChoice> = { system: 'light', light: 'dark', dark: 'system' };
    this.themeChoice = next[this.themeChoice];
    this.dispatchEvent(new CustomEvent('theme-change', { detail: { choice: this.themeChoice }, bubbles: true, composed: true }));
  }

  private resultOf(id: string): VariantResult | undefined {
    return this.results?.resultFor(id);
  }

  /** Each variant's results, as one map that stays the same object while none of them changed. */
  private resultsMap(workspace: Workspace): ReadonlyMap<string, VariantResult | undefined> {
    const key = workspace.variants.flatMap((v) => [v.id, this.resultOf(v.id)]);
    if (this.resultsMapMemo && this.resultsMapMemo.key.length === key.length && this.resultsMapMemo.key.every((k, i) => k === key[i])) return this.resultsMapMemo.map;
    const map = new Map(workspace.variants.map((v) => [v.id, this.resultOf(v.id)]));
    this.resultsMapMemo = { key, map };
    return map;
  }

  private specs(workspace: Workspace): Specs {
    const active = this.resultOf(workspace.activeId);
    // What was last finished stays drawn while the worker computes the newest edit.
    const sweep = active?.shown.sweep;
    const analysis = active?.shown.analysis;
    const overlaySweeps: Overlay<SweepResult>[] = [];
    const overlayAnalyses: Overlay<EmissionsAnalysis>[] = [];
    for (const id of workspace.overlayIds) {
      const variant = variantById(workspace, id);
      const result = this.resultOf(id);
      if (!variant || !result) continue;
      if (result.shown.sweep) overlaySweeps.push({ variantId: id, name: variantName(variant), result: result.shown.sweep });
      if (result.shown.analysis) overlayAnalyses.push({ variantId: id, name: variantName(variant), result: result.shown.analysis });
    }
    const selected = workspace.selection?.kind === 'element' ? workspace.selection.id : undefined;
    const valid = checkDocument(activeVariant(workspace).validDocument ?? activeVariant(workspace).document);
    const baselineFitted = valid.ok && valid.design.emissions?.baseline.kind === 'stages';
    const floor = valid.ok ? valid.design.emissions?.noiseFloorDbuV : undefined;
    const key = [sweep, analysis, ...overlaySweeps.flatMap((o) => [o.result, o.name]), ...overlayAnalyses.flatMap((o) => [o.result, o.name]), selected, baselineFitted, floor, this.hiddenSeries];
    if (this.specMemo && this.specMemo.key.length === key.length && this.specMemo.key.every((k, i) => k === key[i])) return this.specMemo.specs;
    const hidden = (id: string) => this.hiddenSeries[id] ?? new Set<string>();
    const specs: Specs = {
      emissions: analysis ? emissionsPlot(analysis, { baselineFitted, noiseFloorDbuV: floor, overlays: overlayAnalyses, hidden: hidden('emissions') }) : undefined,
      required: analysis ? requiredAttenuationPlot(analysis, sweep, hidden('required-attenuation')) : undefined,
      insertionLoss: sweep ? insertionLossPlot(sweep, { overlays: overlaySweeps, hidden: hidden('insertion-loss') }) : undefined,
      impedance: sweep ? partImpedancePlot(sweep, { ...(selected === undefined ? {} : { selectedId: selected }), hidden: hidden('part-impedance') }) : undefined,
    };
    this.specMemo = { key, specs };
    return specs;
  }

  override render() {
    const workspace = this.workspace;
    if (!workspace) return html`<main><p>Loading…</p></main>`;
    void this.resultsVersion;
    const active = activeVariant(workspace);
    const checked = checkDocument(active.document);
    const issues = this.derivedKeyed(checked, issuesByPath);
    const invalidPaths = this.derivedKeyed(issues, (map) => new Set(map.keys()));
    const valid = checkDocument(active.validDocument ?? active.document);
    const validDesign = valid.ok ? valid.design : undefined;
    const result = this.resultOf(active.id);
    const specs = this.specs(workspace);
    const selected = workspace.selection?.kind === 'element' ? workspace.selection.id : undefined;
    const allResults = this.resultsMap(workspace);
    const analysis = result?.shown.analysis;
    const sweep = result?.shown.sweep;
    const plotSpecs = [specs.emissions, specs.required, specs.insertionLoss, specs.impedance].filter((s): s is PlotSpec => s !== undefined);
    return html`
      ${this.renderHeader(workspace)}
      <main>
        <div class="notices">
          ${this.notices.map(
            (notice) => html`<div class="notice ${notice.tone}" role=${notice.tone === 'error' ? 'alert' : 'status'}>
              ${notice.text}${notice.details?.length ? html`<ul>${notice.details.map((d) => html`<li>${d}</li>`)}</ul>` : nothing}
            </div>`,
          )}
          ${checked.ok
            ? nothing
            : html`<div class="notice error" role="status" data-role="invalid">
                ${checked.issues.length === 1 ? 'One value needs a fix' : `${checked.issues.length} values need a fix`}; the plots show the design as it
                was last valid.
                <ul>${checked.issues.slice(0, 6).map((issue) => html`<li>${formatIssue(issue)}</li>`)}</ul>
              </div>`}
        </div>
        <div class="layout">
          <div class="column editing" aria-label="The design">
            ${validDesign?.description ? html`<p class="description">${validDesign.description}</p>` : nothing}
            <section class="panel" aria-labelledby="filter-title">
              <h2 id="filter-title">Filter, from the noise source to the LISN</h2>
              <chokepoint-stage-editor .document=${active.document} .design=${validDesign} .selection=${workspace.selection} .invalidPaths=${invalidPaths}></chokepoint-stage-editor>
            </section>
            <section class="panel" aria-labelledby="part-title">
              <h2 id="part-title">${selected ? `Part ${selected}` : 'Part'}</h2>
              <chokepoint-part-editor .document=${active.document} .elementId=${selected} .issues=${issues} .measuredReader=${this.measuredReader}></chokepoint-part-editor>
            </section>
            <details class="panel" open>
              <summary>Noise and limits</summary>
              <chokepoint-scan-panel .workspace=${workspace} .host=${this.scanHost} .design=${validDesign}></chokepoint-scan-panel>
              <chokepoint-limit-editor .document=${active.document} .issues=${issues}></chokepoint-limit-editor>
            </details>
            <details class="panel">
              <summary>Noise estimate from the switching waveform</summary>
              <chokepoint-object-fields .document=${active.document} .path=${['emissions']} .schema=${emissionsSchema} .issues=${issues} .only=${['estimate']}></chokepoint-object-fields>
            </details>
            <details class="panel">
              <summary>Noise source, LISNs and frequencies</summary>
              <chokepoint-circuit-settings .document=${active.document} .issues=${issues}></chokepoint-circuit-settings>
            </details>
            <section class="panel" aria-labelledby="safety-title">
              <h2 id="safety-title">Safety and practical checks</h2>
              <chokepoint-safety-panel .state=${result?.safety} .document=${active.document} .issues=${issues} .choiceLabels=${this.choiceLabels}></chokepoint-safety-panel>
            </section>
          </div>
          <div class="column" aria-label="Results">
            ${this.renderStatus(result)}
            <section class="panel" aria-labelledby="drawing-title">
              <h2 id="drawing-title" class="visually-hidden">The filter drawn</h2>
              <chokepoint-filter-drawing .design=${validDesign} .selectedId=${selected} .theme=${this.shownTheme}></chokepoint-filter-drawing>
            </section>
            <div class="plots">
              <div class="panel">
                <chokepoint-plot-panel
                  heading="Emission at the LISN"
                  .caption=${analysis ? 'Predicted levels against the limit lines; shaded where the margin falls short of the target.' : ''}
                  .spec=${specs.emissions}
                  .theme=${this.shownTheme}
                  .cursorHz=${this.cursorHz}
                  .heightRatio=${0.52}
                  .emptyText=${result?.analysis.status === 'idle' ? result.analysis.reason : result?.analysis.status === 'error' ? result.analysis.error.message : 'Working…'}
                ></chokepoint-plot-panel>
              </div>
              <div class="panel">
                <chokepoint-plot-panel
                  heading="Attenuation needed and given"
                  caption="Solid: what the filter must give per mode (no filter, less the limit and the target margin). Dashed: what it gives in circuit."
                  .spec=${specs.required}
                  .theme=${this.shownTheme}
                  .cursorHz=${this.cursorHz}
                  .emptyText=${'Needs a limit line and noise to judge.'}
                ></chokepoint-plot-panel>
              </div>
              <div class="panel">
                <chokepoint-plot-panel
                  heading="Insertion loss, CM and DM"
                  caption="Solid: in circuit, between this design's noise source and LISNs. Dashed: 50 Ω/50 Ω. Band: between the 0.1 Ω/100 Ω and 100 Ω/0.1 Ω tests. ▼ part self-resonance, ○ located peak or notch."
                  .spec=${specs.insertionLoss}
                  .theme=${this.shownTheme}
                  .cursorHz=${this.cursorHz}
                  .emptyText=${result?.sweep.status === 'error' ? result.sweep.error.message : 'Sweeping…'}
                ></chokepoint-plot-panel>
              </div>
              <div class="panel">
                <chokepoint-plot-panel
                  heading="Impedance of each part"
                  caption="|Z| of every part in circuit (a choke: CM solid, DM dashed), the selected part bold; ▼ self-resonance."
                  .spec=${specs.impedance}
                  .theme=${this.shownTheme}
                  .cursorHz=${this.cursorHz}
                  .emptyText=${'Sweeping…'}
                ></chokepoint-plot-panel>
              </div>
            </div>
            <section class="panel readout" aria-labelledby="readout-title">
              <h2 id="readout-title">At the cursor</h2>
              <chokepoint-cursor-readout .specs=${plotSpecs} .cursorHz=${this.cursorHz}></chokepoint-cursor-readout>
            </section>
            <section class="panel" aria-labelledby="margin-title">
              <h2 id="margin-title">Margin</h2>
              ${analysis ? html`<chokepoint-margin-table .view=${this.derivedKeyed(analysis, (a) => marginTableView(a, result?.analysis.status === 'done' && result.analysis.analysis === a ? result.analysis.limitingModes : []))}></chokepoint-margin-table>` : html`<p class="muted small">Nothing judged yet.</p>`}
            </section>
            <section class="panel" aria-labelledby="variants-title">
              <h2 id="variants-title">Variants</h2>
              <chokepoint-variant-table .workspace=${workspace} .results=${allResults}></chokepoint-variant-table>
            </section>
            <div class="pair">
              <section class="panel" aria-labelledby="resonance-title">
                <h2 id="resonance-title">Resonances</h2>
                ${sweep ? html`<chokepoint-resonance-list .result=${sweep}></chokepoint-resonance-list>` : html`<p class="muted small">None yet.</p>`}
              </section>
              <section class="panel" aria-labelledby="warning-title">
                <h2 id="warning-title">Sweep warnings</h2>
                ${sweep ? html`<chokepoint-warning-list .warnings=${sweep.warnings}></chokepoint-warning-list>` : html`<p class="muted small">None yet.</p>`}
              </section>
            </div>
          </div>
        </div>
      </main>
    `;
  }

  private renderHeader(workspace: Workspace) {
    const active = activeVariant(workspace);
    const store = this.store;
    return html`<header>
      <h1>chokepoint</h1>
      <div class="variant-pick">
        <label class="visually-hidden" for="variant-pick">Design being edited</label>
        <select id="variant-pick" @change=${(event: Event) => store?.dispatch({ type: 'switch-variant', id: (event.target as HTMLSelectElement).value })}>
          ${workspace.variants.map((variant) => html`<option value=${variant.id} ?selected=${variant.id === active.id}>${variantName(variant)}</option>`)}
        </select>
        ${active.origin === 'demo' ? html`<span class="origin invented" title="This design and its parts are made up for demonstration">Invented demo</span>` : nothing}
      </div>
      <div class="toolbar">
        <button type="button" data-action="undo" ?disabled=${!store?.canUndo} title=${store?.undoLabel ? `Undo: ${store.undoLabel} (Ctrl+Z)` : 'Nothing to undo'} @click=${() => store?.undo()}>Undo</button>
        <button type="button" data-action="redo" ?disabled=${!store?.canRedo} title=${store?.redoLabel ? `Redo: ${store.redoLabel} (Ctrl+Shift+Z)` : 'Nothing to redo'} @click=${() => store?.redo()}>Redo</button>
        <slot name="file-actions"></slot>
        <button type="button" data-action="theme" title="Colours: follow the system, light or dark" @click=${() => this.cycleTheme()}>Theme: ${this.themeChoice}</button>
      </div>
    </header>`;
  }

  private renderStatus(result: VariantResult | undefined) {
    if (!result) return html`<p class="status" role="status">Waiting for a valid design…</p>`;
    if (result.sweep.status === 'error') return html`<p class="status error" role="status">The sweep failed: ${result.sweep.error.message}</p>`;
    if (result.sweep.status === 'running') return html`<p class="status" role="status" data-state="sweeping">Sweeping the change…</p>`;
    const f = result.sweep.result.frequencyHz;
    const analysis = result.analysis.status === 'done' ? result.analysis.analysis : undefined;
    // A long scan is judged at the receiver's resolution (docs/emissions.md, "Large scans"): say so.
    const points = analysis?.scanPoints;
    const judged = analysis
      ? `; judged ${analysis.input === 'scan' ? `the scan “${analysis.scanPrediction?.scanName ?? ''}”` : 'the noise estimate'}${
          points && points.analysed < points.read ? ` (${points.read} points, judged at ${points.analysed}, binned to the receiver’s resolution)` : ''
        } in ${result.analysis.status === 'done' ? result.analysis.elapsedMs.toFixed(1) : '–'} ms`
      : '';
    // The reader's warnings ("check the frequency unit …") belong beside the verdict they may explain.
    const noise = this.workspace?.noise;
    const scan = noise?.kind === 'scan' ? this.workspace?.scans.find((entry) => entry.id === noise.scanId) : undefined;
    const warnings = analysis?.input === 'scan' ? (scan?.warnings ?? []) : [];
    const view = analysis ? this.derivedKeyed(analysis, (a) => marginTableView(a, result.analysis.status === 'done' ? result.analysis.limitingModes : [])) : undefined;
    const worst = analysis?.report.worst;
    return html`<div class="status" role="status" data-state="swept">
      ${view
        ? html`<p class="verdict-line" data-verdict=${view.verdict}>
            <span class="verdict-word ${view.verdict}">${view.verdictWord}</span> ${view.summary}${worst ? ` Lowest margin ${worst.marginDb.toFixed(1)} dB at ${formatFrequency(worst.frequencyHz, 4)}.` : ''}
          </p>`
        : nothing}
      <p class="status">Swept ${f.length} points in ${result.sweep.elapsedMs.toFixed(1)} ms in the worker${judged}.</p>
      ${warnings.length > 0 ? html`<ul class="reader-warnings">${warnings.map((warning) => html`<li>Warning: ${warning}</li>`)}</ul>` : nothing}
    </div>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-planner': ChokepointPlanner;
  }
}
