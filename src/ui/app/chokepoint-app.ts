import { css, html, LitElement, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import demoDesign from '../../../fixtures/demo/adapter-two-stage.design.json';
import type { EmissionsRequester } from '../../client/emissions-client.ts';
import type { SweepRequester } from '../../client/sweep-client.ts';
import { readDesign } from '../../model/index.ts';
import '../charts/insertion-loss-chart.ts';
import type { PlotFactory } from '../charts/chart-controller.ts';
import '../design/stage-list.ts';
import '../emissions/emissions-section.ts';
import type { DesignEditEvent, ScanImporter } from '../emissions/emissions-section.ts';
import '../sweep/resonance-list.ts';
import '../sweep/warning-list.ts';
import { sharedStyles, themeTokens } from '../styles/theme.ts';
import { type DesignState, designFromHash, statusLine, type SweepState } from './planner-state.ts';
import './safety-note.ts';

/**
 * The planner page: which design is shown (the invented demo, or one from the link's #design=),
 * the state of its sweep, and the panels that draw them. It sends designs to the sweep client
 * and renders what comes back; it computes nothing itself.
 */
@customElement('chokepoint-app')
export class ChokepointApp extends LitElement {
  static override styles = [
    themeTokens,
    sharedStyles,
    css`
      :host {
        display: block;
        min-height: 100vh;
        background: var(--cp-page);
      }
      header {
        background: var(--cp-panel);
        border-bottom: 1px solid var(--cp-border);
        padding: 12px 24px;
        display: flex;
        align-items: baseline;
        gap: 16px;
        flex-wrap: wrap;
      }
      h1 {
        margin: 0;
        font-size: 21px;
        font-weight: 700;
        letter-spacing: 0.01em;
        color: var(--cp-accent);
      }
      .purpose {
        margin: 0;
        color: var(--cp-muted);
      }
      main {
        padding: 16px 24px 32px;
        max-width: 1480px;
        margin: 0 auto;
      }
      .design-bar {
        display: flex;
        flex-wrap: wrap;
        align-items: center;
        gap: 6px 12px;
        margin-bottom: 4px;
      }
      .design-name {
        font-size: 18px;
        margin: 0;
      }
      .origin {
        font-size: 12px;
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
      .description {
        max-width: 110ch;
        margin: 0 0 10px;
      }
      .status {
        margin: 0 0 var(--cp-gap);
        padding: 6px 10px;
        border-radius: var(--cp-radius);
        border: 1px solid var(--cp-border);
        background: var(--cp-panel);
      }
      .status.done {
        border-left: 4px solid var(--cp-ok);
      }
      .status.busy {
        border-left: 4px solid var(--cp-accent);
      }
      .status.error {
        background: var(--cp-error-bg);
        border-color: var(--cp-error-border);
        border-left-width: 4px;
        color: var(--cp-error-text);
      }
      .status p {
        margin: 0;
        font-weight: 600;
      }
      .status ul {
        margin-top: 4px;
        font-family: var(--cp-mono);
        font-size: 12.5px;
      }
      .layout {
        display: grid;
        grid-template-columns: minmax(0, 1fr);
        gap: var(--cp-gap);
      }
      @media (min-width: 1100px) {
        .layout {
          grid-template-columns: minmax(0, 1fr) minmax(340px, 420px);
          align-items: start;
        }
      }
      .column {
        display: grid;
        gap: var(--cp-gap);
        min-width: 0;
      }
      .panel {
        background: var(--cp-panel);
        border: 1px solid var(--cp-border);
        border-radius: var(--cp-radius);
        padding: 12px 14px;
        min-width: 0;
      }
      .panel-head {
        display: flex;
        flex-wrap: wrap;
        align-items: baseline;
        justify-content: space-between;
        gap: 4px 16px;
        margin-bottom: 6px;
      }
      .panel-head h2 {
        margin: 0;
      }
      .emissions {
        margin-top: var(--cp-gap);
      }
      .pair {
        display: grid;
        gap: var(--cp-gap);
        grid-template-columns: repeat(auto-fit, minmax(300px, 1fr));
        align-items: start;
      }
      a {
        color: var(--cp-accent);
      }
    `,
  ];

  /** Runs the sweeps. Set before the element is put on the page; tests pass a fake. */
  @property({ attribute: false }) sweepClient: SweepRequester | undefined;

  /** Runs the emissions analyses (in the sweep's worker). Tests pass a fake. */
  @property({ attribute: false }) emissionsClient: EmissionsRequester | undefined;

  /** Reads scan files in their own worker. Tests pass a fake. */
  @property({ attribute: false }) scanImporter: ScanImporter | undefined;

  /** The invented demo scan's text: a file of the repository, bundled at build time and fetched on first use. */
  @property({ attribute: false }) loadDemoScan: () => Promise<string> = () =>
    import('../../../fixtures/scans/invented-adapter-no-filter.csv?raw').then((module) => module.default);

  /** The design shown when the link carries none. */
  @property({ attribute: false }) demoDocument: unknown = demoDesign;

  /** How the chart makes its plot; left alone in the browser, replaced where there is no canvas. */
  @property({ attribute: false }) createPlot: PlotFactory | undefined;

  @state() private designState: DesignState | undefined;
  @state() private sweepState: SweepState = { kind: 'idle' };

  /** Bumped for every design shown, so a sweep that returns after a newer design was loaded is dropped. */
  private loadCount = 0;

  /** The hash last shown, so that a hashchange naming the same design does not sweep it again. */
  private shownHash: string | undefined;

  private readonly onHashChange = (): void => {
    if (window.location.hash !== this.shownHash) this.showDesignFromHash(window.location.hash);
  };

  override connectedCallback(): void {
    super.connectedCallback();
    window.addEventListener('hashchange', this.onHashChange);
    this.showDesignFromHash(window.location.hash);
  }

  override disconnectedCallback(): void {
    window.removeEventListener('hashchange', this.onHashChange);
    this.loadCount += 1;
    super.disconnectedCallback();
  }

  /** Show the design a location hash names (or the demo) and sweep it. */
  showDesignFromHash(hash: string): void {
    this.shownHash = hash;
    const design = designFromHash(hash, this.demoDocument);
    this.designState = design;
    this.loadCount += 1;
    if (design.kind !== 'ready') {
      this.sweepState = { kind: 'idle' };
      return;
    }
    void this.sweep(design.document, this.loadCount);
  }

  private async sweep(document: unknown, load: number): Promise<void> {
    const client = this.sweepClient;
    if (!client) {
      this.sweepState = { kind: 'failed', error: { kind: 'worker-failure', message: 'no sweep worker is connected', issues: [] } };
      return;
    }
    this.sweepState = { kind: 'running' };
    const outcome = await client.request(document);
    if (load !== this.loadCount || outcome.status === 'superseded') return;
    this.sweepState =
      outcome.status === 'done' ? { kind: 'done', result: outcome.result, elapsedMs: outcome.elapsedMs } : { kind: 'failed', error: outcome.error };
  }

  /**
   * The emissions section changed the design (a mask, the target margin, the floor, the attribution).
   * None of these changes the filter, so the sweep stands; the design on screen is replaced.
   */
  private readonly onDesignEdit = (event: DesignEditEvent): void => {
    const current = this.designState;
    if (current?.kind !== 'ready') return;
    const read = readDesign(event.detail.document);
    if (!read.ok) return;
    this.designState = { kind: 'ready', origin: current.origin, document: event.detail.document, design: read.value };
  };

  override render() {
    const design = this.designState;
    const result = this.sweepState.kind === 'done' ? this.sweepState.result : undefined;
    return html`
      <header>
        <h1>chokepoint</h1>
        <p class="purpose">
          Plan a two-line mains or DC input filter for conducted-emission tests: common- and differential-mode insertion loss with
          parasitics.
        </p>
      </header>
      <main>
        ${this.renderDesignBar(design)} ${this.renderStatus(design)}
        <div class="layout">
          <div class="column">
            <section class="panel" aria-labelledby="chart-title">
              <div class="panel-head">
                <h2 id="chart-title">Insertion loss, common and differential mode</h2>
                <span class="muted small">Drag across the chart to zoom in; double-click to zoom out.</span>
              </div>
              <p class="muted small caption">
                Solid: in circuit, between this design's noise source and the LISNs. Dashed: 50 Ω source and load. ▼ element
                self-resonance, ○ located peak or notch. The model has no coupling between parts or across the board; on real
                hardware that coupling usually caps attenuation well below the highest values here.
              </p>
              <chokepoint-insertion-loss-chart
                .result=${result}
                .createPlot=${this.createPlot}
                .emptyText=${this.sweepState.kind === 'running' ? 'Sweeping…' : 'Nothing drawn.'}
              ></chokepoint-insertion-loss-chart>
            </section>
            <div class="pair">
              <section class="panel" aria-labelledby="resonance-title">
                <h2 id="resonance-title">Resonances</h2>
                ${result
                  ? html`<chokepoint-resonance-list .result=${result}></chokepoint-resonance-list>`
                  : html`<p class="muted small">None yet.</p>`}
              </section>
              <section class="panel" aria-labelledby="warning-title">
                <h2 id="warning-title">Sweep warnings</h2>
                ${result
                  ? html`<chokepoint-warning-list .warnings=${result.warnings}></chokepoint-warning-list>`
                  : html`<p class="muted small">None yet.</p>`}
              </section>
            </div>
          </div>
          <div class="column">
            <section class="panel" aria-labelledby="filter-title">
              <h2 id="filter-title">Filter, from noise source to LISN</h2>
              ${design?.kind === 'ready'
                ? html`<chokepoint-stage-list .design=${design.design}></chokepoint-stage-list>`
                : html`<p class="muted small">No design.</p>`}
            </section>
            <chokepoint-safety-note></chokepoint-safety-note>
          </div>
        </div>
        ${design?.kind === 'ready'
          ? html`<section class="panel emissions" aria-labelledby="emissions-title">
              <div class="panel-head">
                <h2 id="emissions-title">Emissions and margin</h2>
                <span class="muted small">The levels this filter should give at the LISN, against the limits.</span>
              </div>
              <chokepoint-emissions
                .document=${design.document}
                .design=${design.design}
                .demo=${design.origin === 'demo'}
                .analyzer=${this.emissionsClient}
                .scanImporter=${this.scanImporter}
                .loadDemoScan=${this.loadDemoScan}
                .createPlot=${this.createPlot}
                @design-edit=${this.onDesignEdit}
              ></chokepoint-emissions>
            </section>`
          : nothing}
      </main>
    `;
  }

  private renderDesignBar(design: DesignState | undefined) {
    if (!design) return nothing;
    if (design.kind === 'unreadable') {
      return html`<div class="design-bar">
        <h2 class="design-name">No design shown</h2>
        ${design.origin === 'link' ? html`<a href="#">Open the invented demo instead</a>` : nothing}
      </div>`;
    }
    const invented = design.origin === 'demo';
    return html`
      <div class="design-bar">
        <h2 class="design-name">${design.design.name}</h2>
        ${invented
          ? html`<span class="origin invented" title="This design and its parts are made up for demonstration">Invented demo, not a real product</span>`
          : html`<span class="origin">From the link</span>`}
      </div>
      ${design.design.description ? html`<p class="description muted small">${design.design.description}</p>` : nothing}
    `;
  }

  private renderStatus(design: DesignState | undefined) {
    if (!design) return nothing;
    const status = statusLine(design, this.sweepState);
    return html`
      <div class="status ${status.tone}" role="status" aria-live="polite" data-tone=${status.tone}>
        <p>${status.text}</p>
        ${status.issues.length > 0 ? html`<ul>${status.issues.map((issue) => html`<li>${issue}</li>`)}</ul>` : nothing}
      </div>
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-app': ChokepointApp;
  }
}
