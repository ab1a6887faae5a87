import { css, html, LitElement, nothing, type PropertyValues } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import type { EmissionsRequester } from '../../client/emissions-client.ts';
import type { ScanImportClient } from '../../client/scan-import-client.ts';
import type { FrequencyUnit } from '../../io/frequency-unit.ts';
import { MAX_SCAN_FILE_BYTES, scanFileTooLarge } from '../../io/scan-limits.ts';
import type { Design } from '../../model/design.ts';
import { ATTRIBUTIONS, type Attribution } from '../../model/emissions-schema.ts';
import { formatIssue, readDesign } from '../../model/index.ts';
import type { EmissionsAnalysis } from '../../spectrum/emissions-analysis.ts';
import type { LevelUnitName } from '../../spectrum/level-units.ts';
import { DEFAULT_SCAN_TAG, SCAN_TAGS, type ScanTag } from '../../spectrum/spectrum-types.ts';
import type { EmissionsNoise } from '../../../workers/emissions-protocol.ts';
import type { ScanImportOptions } from '../../../workers/scan-import-api.ts';
import type { PlotFactory } from '../charts/chart-controller.ts';
import {
  BELOW_TARGET_FILL,
  buildEmissionsPlot,
  emissionsChartSize,
  buildRequiredAttenuationPlot,
  DETECTOR_SHORT,
  emissionsChartModel,
  requiredAttenuationModel,
} from '../charts/emissions-options.ts';
import { formatFrequency } from '../../drawing/frequency-ticks.ts';
import type { PlotSource } from '../charts/plot-controller.ts';
import '../charts/plot-element.ts';
import { sharedStyles } from '../styles/theme.ts';
import {
  addPresetMask,
  type AnalysisState,
  type ImportState,
  type LoadedScan,
  type NoiseChoice,
  presetGroups,
  readNumberInput,
  removeMask,
  setAttribution,
  withEmissions,
} from './emissions-state.ts';
import './margin-table.ts';
import { marginTableView, type MarginTableView } from './margin-view.ts';

/** What the section needs of the scan-import client; tests pass a fake. */
export type ScanImporter = Pick<ScanImportClient, 'importScan'>;

/** Sent up when the section changes the design (masks, target margin, floor, attribution). */
export type DesignEditEvent = CustomEvent<{ readonly document: unknown }>;

export const TAG_TEXT: Readonly<Record<ScanTag, string>> = {
  line1: 'line 1',
  line2: 'line 2',
  'common-mode': 'common mode (from a CM/DM separator)',
  'differential-mode': 'differential mode (from a CM/DM separator)',
  total: 'total, mode unknown',
};

const ATTRIBUTION_TEXT: Readonly<Record<Attribution, string>> = {
  both: 'the smaller of CM and DM (worst case)',
  'common-mode': 'its CM improvement only',
  'differential-mode': 'its DM improvement only',
};

const FREQUENCY_CHOICES: readonly FrequencyUnit[] = ['Hz', 'kHz', 'MHz', 'GHz'];
/** dBµA (a current probe's reading) also asks for the probe's transfer impedance. */
const LEVEL_CHOICES: readonly { value: LevelUnitName; text: string }[] = [
  { value: 'dBuV', text: 'dBµV' },
  { value: 'dBm', text: 'dBm (50 Ω)' },
  { value: 'dBuA', text: 'dBµA (current probe)' },
  { value: 'dBV', text: 'dBV' },
  { value: 'V', text: 'V' },
];

const DEMO_SCAN_NAME = 'invented-adapter-no-filter.csv';

/** What the charts and the table show for one analysis, built once per analysis. */
interface Shown {
  readonly analysis: EmissionsAnalysis;
  readonly chart: PlotSource;
  readonly chartLabel: string;
  readonly note: string | undefined;
  readonly lineSpectrum: boolean;
  readonly required: PlotSource | undefined;
  readonly requiredLabel: string;
  readonly view: MarginTableView;
}

/**
 * "Emissions and margin": where the noise comes from (a scan read in the scan-import worker, or the
 * design's noise estimate), how it is judged (attribution, target margin, noise floor, limit lines),
 * and what comes out (the chart, the margin table, the attenuation still needed). It sends the design
 * and the noise to the worker and renders the analysis that comes back; edits to the design go up to
 * the app as `design-edit` events, after they have been validated like a file.
 */
@customElement('chokepoint-emissions')
export class EmissionsSection extends LitElement {
  static override styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      .layout {
        display: grid;
        grid-template-columns: minmax(0, 1fr);
        gap: var(--cp-gap);
      }
      @media (min-width: 1100px) {
        .layout {
          grid-template-columns: minmax(0, 1fr) minmax(320px, 380px);
          align-items: start;
        }
      }
      .main {
        min-width: 0;
      }
      .caption {
        margin-bottom: 6px;
      }
      .key {
        display: inline-block;
        width: 14px;
        height: 10px;
        vertical-align: -1px;
        border: 1px solid rgba(200, 40, 40, 0.35);
      }
      .ring {
        display: inline-block;
        width: 9px;
        height: 9px;
        border: 2px solid #9b1c1c;
        border-radius: 50%;
        vertical-align: -1px;
      }
      .analysis-status {
        margin: 4px 0 10px;
      }
      .analysis-status.error,
      .reader-warnings {
        color: var(--cp-error-text);
      }
      .analysis-status p,
      .reader-warnings {
        margin: 0;
      }
      .stale {
        opacity: 0.55;
        transition: opacity 0.2s;
      }
      .controls {
        display: grid;
        gap: 12px;
        min-width: 0;
      }
      fieldset {
        margin: 0;
        padding: 8px 12px 12px;
        border: 1px solid var(--cp-border);
        border-radius: var(--cp-radius);
        min-width: 0;
      }
      legend {
        font-weight: 650;
        padding: 0 4px;
      }
      .choice {
        display: flex;
        gap: 6px;
        align-items: baseline;
        margin: 2px 0;
      }
      .choice input {
        margin: 0;
      }
      .field {
        display: grid;
        gap: 2px;
        margin-top: 8px;
      }
      .field > span {
        font-size: 12.5px;
        color: var(--cp-muted);
      }
      .inline {
        display: flex;
        align-items: center;
        gap: 6px;
      }
      .pair {
        display: grid;
        grid-template-columns: 1fr 1fr;
        gap: 8px;
      }
      select,
      input[type='number'],
      button {
        font: inherit;
        font-size: 13px;
      }
      select,
      input[type='number'] {
        padding: 3px 5px;
        border: 1px solid #b9c0c8;
        border-radius: 4px;
        background: #fff;
        min-width: 0;
      }
      input[type='number'] {
        width: 7em;
      }
      input[aria-invalid='true'] {
        border-color: var(--cp-error-border);
        background: var(--cp-error-bg);
      }
      button {
        padding: 4px 10px;
        border: 1px solid #b9c0c8;
        border-radius: 4px;
        background: #f7f9fb;
        color: var(--cp-text);
        cursor: pointer;
      }
      button:hover:not(:disabled) {
        background: #eaf0f6;
      }
      button:disabled {
        cursor: default;
        opacity: 0.55;
      }
      .load {
        display: flex;
        flex-wrap: wrap;
        gap: 8px;
        align-items: center;
        margin-top: 10px;
      }
      .file {
        position: relative;
        display: inline-block;
        padding: 4px 10px;
        border: 1px solid var(--cp-accent);
        border-radius: 4px;
        color: var(--cp-accent);
        font-size: 13px;
        font-weight: 600;
        background: #f2f7fc;
        cursor: pointer;
      }
      .file:focus-within {
        outline: 2px solid var(--cp-accent);
        outline-offset: 1px;
      }
      .file input {
        position: absolute;
        inset: 0;
        opacity: 0;
        cursor: pointer;
        width: 100%;
      }
      .invented {
        font-size: 11px;
        font-weight: 700;
        text-transform: uppercase;
        letter-spacing: 0.04em;
        padding: 1px 6px;
        border-radius: 999px;
        background: var(--cp-invented-bg);
        color: var(--cp-invented-text);
        border: 1px solid var(--cp-invented-border);
        white-space: nowrap;
      }
      .import {
        margin-top: 10px;
      }
      progress {
        width: 100%;
        height: 10px;
        accent-color: var(--cp-accent);
      }
      .import-error {
        padding: 6px 8px;
        border: 1px solid var(--cp-error-border);
        border-left-width: 4px;
        border-radius: var(--cp-radius);
        background: var(--cp-error-bg);
        color: var(--cp-error-text);
      }
      .import-error p {
        margin: 0 0 4px;
        font-weight: 600;
      }
      details {
        margin-top: 4px;
      }
      summary {
        cursor: pointer;
      }
      .lines {
        max-height: 220px;
        overflow: auto;
        margin: 4px 0 0;
        padding: 0;
        list-style: none;
        font-family: var(--cp-mono);
        font-size: 12px;
        color: var(--cp-text);
      }
      .masks {
        list-style: none;
        padding: 0;
        margin: 0 0 8px;
      }
      .masks li {
        display: grid;
        grid-template-columns: 1fr auto;
        gap: 2px 8px;
        padding: 6px 0;
        border-bottom: 1px solid var(--cp-rule);
      }
      .mask-name {
        font-weight: 600;
      }
      .mask-origin {
        grid-column: 1 / -1;
        font-size: 12px;
        color: var(--cp-muted);
      }
      .hint {
        font-size: 12px;
        color: var(--cp-muted);
        margin: 2px 0 0;
      }
      .field-error {
        font-size: 12px;
        color: var(--cp-error-text);
        margin: 4px 0 0;
      }
      .add {
        display: flex;
        gap: 6px;
      }
      .add select {
        flex: 1;
      }
      .idle {
        margin: 0;
        padding: 40px 12px;
        text-align: center;
        color: var(--cp-muted);
        border: 1px dashed var(--cp-border);
        border-radius: var(--cp-radius);
      }
      .table-wrap {
        margin-top: 14px;
      }
    `,
  ];

  /** The design document as the page holds it (sent to the worker as is). */
  @property({ attribute: false }) document: unknown;
  /** The same design, validated. */
  @property({ attribute: false }) design: Design | undefined;
  /** Whether the design is the invented demo (which offers its invented scan). */
  @property({ attribute: false }) demo = false;
  @property({ attribute: false }) analyzer: EmissionsRequester | undefined;
  @property({ attribute: false }) scanImporter: ScanImporter | undefined;
  /** The invented demo scan's text, fetched when asked for. */
  @property({ attribute: false }) loadDemoScan: (() => Promise<string>) | undefined;
  @property({ attribute: false }) createPlot: PlotFactory | undefined;

  @state() private noiseChoice: NoiseChoice = 'estimate';
  @state() private loaded: LoadedScan | undefined;
  @state() private importState: ImportState = { kind: 'idle' };
  /** What the next scan measured: the same default as the command line's (DEFAULT_SCAN_TAG says why). */
  @state() private scanTag: ScanTag = DEFAULT_SCAN_TAG;
  @state() private frequencyUnit: FrequencyUnit | undefined;
  @state() private levelUnit: LevelUnitName | undefined;
  /** The current probe's transfer impedance, Ω, for levels in dBµA. */
  @state() private transferImpedanceOhm: number | undefined;
  @state() private analysisState: AnalysisState = { kind: 'idle', reason: 'No design.' };
  @state() private shown: Shown | undefined;
  @state() private marginError: string | undefined;
  @state() private floorError: string | undefined;
  @state() private editError: string | undefined;
  @state() private presetChoice = '';

  /** Bumped for every analysis asked for (or given up), so an answer for an older state is dropped. */
  private analysisCount = 0;
  private importCount = 0;

  get hasEstimate(): boolean {
    const estimate = this.design?.emissions?.estimate;
    return estimate !== undefined && (estimate.commonMode !== undefined || estimate.differentialMode !== undefined);
  }

  /** The analysis on screen, if any (for tests and for the app's status). */
  get analysis(): EmissionsAnalysis | undefined {
    return this.shown?.analysis;
  }

  protected override willUpdate(changed: PropertyValues<this>): void {
    if (changed.has('document') || changed.has('design') || changed.has('analyzer')) void this.analyse();
  }

  /** The noise to analyse now, or why there is none. */
  private noise(): { noise: EmissionsNoise } | { reason: string } {
    if (this.noiseChoice === 'scan' && this.loaded) {
      const { scan } = this.loaded;
      // Name, mode, columns and the reader's warnings (hints for the verdict); rejected lines and notes stay on the page.
      const warnings = scan.warnings && scan.warnings.length > 0 ? { warnings: [...scan.warnings] } : {};
      return {
        noise: { kind: 'scan', scan: { name: scan.name, tag: scan.tag, frequencyHz: scan.frequencyHz, traces: scan.traces.map((t) => ({ ...t })), ...warnings } },
      };
    }
    if (this.hasEstimate) {
      if (this.noiseChoice !== 'estimate') this.noiseChoice = 'estimate';
      return { noise: { kind: 'estimate' } };
    }
    if (this.loaded) {
      this.noiseChoice = 'scan';
      return this.noise();
    }
    return { reason: 'No noise to judge yet: load a scan (this design has no noise estimate, emissions.estimate).' };
  }

  private async analyse(): Promise<void> {
    this.analysisCount += 1;
    const count = this.analysisCount;
    const document = this.document;
    if (!this.design) {
      this.analysisState = { kind: 'idle', reason: 'No design.' };
      this.shown = undefined;
      return;
    }
    const wanted = this.noise();
    if ('reason' in wanted) {
      this.analysisState = { kind: 'idle', reason: wanted.reason };
      this.shown = undefined;
      return;
    }
    const analyzer = this.analyzer;
    if (!analyzer) {
      this.analysisState = { kind: 'failed', error: { kind: 'worker-failure', message: 'no analysis worker is connected', issues: [] } };
      return;
    }
    this.analysisState = { kind: 'running' };
    const outcome = await analyzer.analyze(document, wanted.noise);
    if (count !== this.analysisCount || outcome.status === 'superseded') return;
    if (outcome.status === 'error') {
      this.analysisState = { kind: 'failed', error: outcome.error };
      return;
    }
    this.analysisState = { kind: 'done', analysis: outcome.analysis, elapsedMs: outcome.elapsedMs };
    this.shown = this.show(outcome.analysis);
  }

  private show(analysis: EmissionsAnalysis): Shown {
    const emissions = this.design?.emissions;
    const model = emissionsChartModel(analysis, {
      baselineFitted: emissions?.baseline.kind === 'stages',
      noiseFloorDbuV: emissions?.noiseFloorDbuV,
    });
    const requiredModel = requiredAttenuationModel(analysis);
    return {
      analysis,
      chart: { build: (size) => buildEmissionsPlot(model, size), sizeFor: emissionsChartSize },
      chartLabel: model.description,
      note: model.attributionNote,
      lineSpectrum: analysis.input === 'estimate',
      required: requiredModel
        ? {
            build: (size) => buildRequiredAttenuationPlot(requiredModel, size),
            sizeFor: (width) => ({ width: Math.max(280, Math.floor(width)), height: 190 }),
          }
        : undefined,
      requiredLabel: requiredModel?.description ?? '',
      view: marginTableView(analysis),
    };
  }

  // -------------------------------------------------------------------------------------------
  // Intents

  private chooseNoise(choice: NoiseChoice): void {
    if (choice === this.noiseChoice) return;
    this.noiseChoice = choice;
    void this.analyse();
  }

  private async onFileChosen(event: Event): Promise<void> {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    if (!file) return;
    if (file.size > MAX_SCAN_FILE_BYTES) {
      // Refused unread, as the command line does: reading it could take the page's memory.
      input.value = '';
      this.importState = { kind: 'failed', fileName: file.name, message: scanFileTooLarge(file.size), rejected: [], notes: [] };
      return;
    }
    // The bytes, not file.text(): the worker decodes them as UTF-8 or says why it cannot (a Latin-1
    // or UTF-16 export), where file.text() would replace what does not read without a word.
    let bytes: Uint8Array;
    try {
      bytes = new Uint8Array(await file.arrayBuffer());
    } catch (cause) {
      const reason = cause instanceof Error ? cause.message : String(cause);
      this.importState = { kind: 'failed', fileName: file.name, message: `the file could not be read: ${reason}`, rejected: [], notes: [] };
      return;
    } finally {
      // Choosing the same file again must read it again.
      input.value = '';
    }
    await this.importText(bytes, file.name, false);
  }

  private async loadDemo(): Promise<void> {
    if (!this.loadDemoScan) return;
    this.scanTag = 'line1';
    this.importState = { kind: 'reading', fileName: DEMO_SCAN_NAME, fractionDone: 0 };
    let text: string;
    try {
      text = await this.loadDemoScan();
    } catch (cause) {
      const reason = cause instanceof Error ? cause.message : String(cause);
      this.importState = { kind: 'failed', fileName: DEMO_SCAN_NAME, message: `the demo scan could not be loaded: ${reason}`, rejected: [], notes: [] };
      return;
    }
    await this.importText(text, DEMO_SCAN_NAME, true);
  }

  /** Read a scan (a file's bytes, or text) in the scan-import worker. A failure changes nothing but the message shown. */
  private async importText(content: string | Uint8Array, fileName: string, invented: boolean): Promise<void> {
    this.importCount += 1;
    const count = this.importCount;
    const importer = this.scanImporter;
    if (!importer) {
      this.importState = { kind: 'failed', fileName, message: 'no scan reader is connected', rejected: [], notes: [] };
      return;
    }
    const options: ScanImportOptions = {
      name: fileName,
      tag: this.scanTag,
      ...(this.frequencyUnit ? { frequencyUnit: this.frequencyUnit } : {}),
      ...(this.levelUnit ? { levelUnit: this.levelUnit } : {}),
      ...(this.transferImpedanceOhm !== undefined ? { transferImpedanceOhm: this.transferImpedanceOhm } : {}),
    };
    this.importState = { kind: 'reading', fileName, fractionDone: 0 };
    const reply = await importer.importScan(content, options, (fractionDone) => {
      if (count === this.importCount && this.importState.kind === 'reading') this.importState = { kind: 'reading', fileName, fractionDone };
    });
    if (count !== this.importCount) return;
    if (!reply.ok) {
      this.importState = { kind: 'failed', fileName, message: reply.error.message, rejected: reply.error.rejected, notes: reply.error.notes };
      return;
    }
    this.loaded = { scan: reply.scan, fileName, invented, elapsedMs: reply.elapsedMs };
    this.importState = { kind: 'idle' };
    this.noiseChoice = 'scan';
    void this.analyse();
  }

  /**
   * What the scan measured: used for the next file read, and applied to the scan already loaded
   * (its columns are the same whatever they measured; only how the filter is credited changes).
   */
  private onScanTag(event: Event): void {
    const value = (event.target as HTMLSelectElement).value;
    const tag = SCAN_TAGS.find((t) => t === value);
    if (!tag) return;
    this.scanTag = tag;
    const loaded = this.loaded;
    if (loaded && loaded.scan.tag !== tag) {
      this.loaded = { ...loaded, scan: { ...loaded.scan, tag } };
      if (this.noiseChoice === 'scan') void this.analyse();
    }
  }

  /** Validate an edited design like a file, then hand it to the app. */
  private edit(document: unknown): boolean {
    const read = readDesign(document);
    if (!read.ok) {
      this.editError = `That change would make the design invalid: ${read.error.issues.map(formatIssue).join('; ')}`;
      return false;
    }
    this.editError = undefined;
    this.dispatchEvent(new CustomEvent('design-edit', { detail: { document }, bubbles: true, composed: true }));
    return true;
  }

  private onAttribution(event: Event): void {
    const value = (event.target as HTMLSelectElement).value;
    const attribution = ATTRIBUTIONS.find((a) => a === value);
    if (attribution) this.edit(setAttribution(this.document, attribution));
  }

  private onMargin(event: Event): void {
    const input = event.target as HTMLInputElement;
    const read = readNumberInput(input.value, 'Target margin', { min: -40, max: 60, optional: false });
    if (!read.ok) {
      this.marginError = read.message;
      return;
    }
    this.marginError = undefined;
    this.edit(withEmissions(this.document, { targetMarginDb: read.value }));
  }

  private onFloor(event: Event): void {
    const input = event.target as HTMLInputElement;
    const read = readNumberInput(input.value, 'Noise floor', { min: -200, max: 300, optional: true });
    if (!read.ok) {
      this.floorError = read.message;
      return;
    }
    this.floorError = undefined;
    this.edit(withEmissions(this.document, { noiseFloorDbuV: read.value }));
  }

  private addPreset(): void {
    if (this.presetChoice === '') return;
    if (this.edit(addPresetMask(this.document, this.presetChoice))) this.presetChoice = '';
  }

  private removeMask(maskId: string): void {
    this.edit(removeMask(this.document, maskId));
  }

  // -------------------------------------------------------------------------------------------
  // Rendering

  override render() {
    if (!this.design) return nothing;
    const shown = this.shown;
    const stale = this.analysisState.kind === 'running' && shown !== undefined;
    return html`
      <div class="layout">
        <div class="main">
          ${this.renderAnalysisStatus()}
          ${shown
            ? html`<div class=${stale ? 'stale' : ''}>
                <p class="muted small caption">
                  ${shown.lineSpectrum
                    ? 'The estimate is a line spectrum: one dot per harmonic of the switching frequency, as a receiver reads it. '
                    : 'Light lines: the scan as measured; dark lines: predicted with this design’s filter. '}
                  Thick lines: the limits where the analysis evaluated them.
                  <span class="key" style="background:${BELOW_TARGET_FILL}"></span> margin below the ${shown.view.targetText} target;
                  <span class="ring"></span> lowest margin. Drag across the chart to zoom in; double-click to zoom out.
                </p>
                <chokepoint-plot
                  class="levels"
                  .source=${shown.chart}
                  .createPlot=${this.createPlot}
                  .note=${shown.note}
                  label=${shown.chartLabel}
                ></chokepoint-plot>
              </div>`
            : html`<p class="idle">${this.analysisState.kind === 'idle' ? this.analysisState.reason : this.analysisState.kind === 'running' ? 'Analysing…' : 'Nothing to show.'}</p>`}
        </div>
        <div class="controls">${this.renderNoise()} ${this.renderJudging()} ${this.renderMasks()}</div>
      </div>
      ${shown
        ? html`<div class="table-wrap ${stale ? 'stale' : ''}">
            <chokepoint-margin-table
              .view=${shown.view}
              .required=${shown.required}
              .requiredLabel=${shown.requiredLabel}
              .createPlot=${this.createPlot}
            ></chokepoint-margin-table>
          </div>`
        : nothing}
    `;
  }

  private renderAnalysisStatus() {
    const state = this.analysisState;
    switch (state.kind) {
      case 'idle':
        return nothing;
      case 'running':
        return html`<p class="analysis-status small muted" role="status" data-state="running">Analysing in the worker…</p>`;
      case 'done': {
        const a = state.analysis;
        const f = a.frequencyHz;
        const what = a.input === 'scan' ? `the scan “${a.scanPrediction?.scanName ?? ''}”` : 'the design’s noise estimate';
        const span = f.length > 0 ? `, ${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)}` : '';
        // A long scan is judged at the receiver's resolution (docs/emissions.md, "Large scans"): say so.
        const points = a.scanPoints;
        const count = points && points.analysed < points.read ? `${points.read} points${span} (judged at ${points.analysed}, binned to the receiver’s resolution)` : `${f.length} points${span}`;
        // The reader's warnings ("check the frequency unit …") belong beside the verdict they may explain.
        const warnings = a.input === 'scan' ? (this.loaded?.scan.warnings ?? []) : [];
        return html`<div class="analysis-status small" role="status" data-state="done">
          <p class="muted">Predicted from ${what}: ${count}, in ${Math.round(state.elapsedMs)} ms in the worker.</p>
          ${warnings.length > 0 ? html`<ul class="reader-warnings">${warnings.map((warning) => html`<li>Warning: ${warning}</li>`)}</ul>` : nothing}
        </div>`;
      }
      case 'failed':
        return html`<div class="analysis-status small error" role="status" data-state="failed">
          <p>The analysis failed: ${state.error.message}</p>
        </div>`;
    }
  }

  private renderNoise() {
    const loaded = this.loaded;
    const reading = this.importState.kind === 'reading';
    return html`
      <fieldset class="noise">
        <legend>Noise</legend>
        <label class="choice">
          <input
            type="radio"
            name="noise"
            value="estimate"
            .checked=${this.noiseChoice === 'estimate' && this.hasEstimate}
            ?disabled=${!this.hasEstimate}
            @change=${() => this.chooseNoise('estimate')}
          />
          <span>The design’s noise estimate${this.hasEstimate ? '' : html` <span class="muted">(none in this design)</span>`}</span>
        </label>
        <label class="choice">
          <input
            type="radio"
            name="noise"
            value="scan"
            .checked=${this.noiseChoice === 'scan' && loaded !== undefined}
            ?disabled=${!loaded}
            @change=${() => this.chooseNoise('scan')}
          />
          <span
            >${loaded
              ? html`Scan: ${loaded.fileName} ${loaded.invented ? html`<span class="invented">invented</span>` : nothing}`
              : html`A scan <span class="muted">(none loaded)</span>`}</span
          >
        </label>
        <div class="pair">
          <label class="field">
            <span>What the scan measured</span>
            <select name="scan-tag" .value=${this.scanTag} @change=${this.onScanTag}>
              ${SCAN_TAGS.map((tag) => html`<option value=${tag} ?selected=${tag === this.scanTag}>${TAG_TEXT[tag]}</option>`)}
            </select>
          </label>
          <span></span>
          <label class="field">
            <span>Frequency unit, if the file does not say</span>
            <select name="frequency-unit" @change=${(event: Event) => (this.frequencyUnit = unitOrUndefined(event, FREQUENCY_CHOICES))}>
              <option value="" ?selected=${this.frequencyUnit === undefined}>Hz (assumed)</option>
              ${FREQUENCY_CHOICES.map((unit) => html`<option value=${unit} ?selected=${unit === this.frequencyUnit}>${unit}</option>`)}
            </select>
          </label>
          <label class="field">
            <span>Level unit, if the file does not say</span>
            <select
              name="level-unit"
              @change=${(event: Event) =>
                (this.levelUnit = unitOrUndefined(
                  event,
                  LEVEL_CHOICES.map((c) => c.value),
                ))}
            >
              <option value="" ?selected=${this.levelUnit === undefined}>dBµV (assumed)</option>
              ${LEVEL_CHOICES.map((choice) => html`<option value=${choice.value} ?selected=${choice.value === this.levelUnit}>${choice.text}</option>`)}
            </select>
          </label>
          <label class="field">
            <span>Probe transfer impedance, for dBµA</span>
            <input
              type="number"
              name="transfer-impedance"
              min="0"
              step="any"
              placeholder="Ω"
              .value=${this.transferImpedanceOhm === undefined ? '' : String(this.transferImpedanceOhm)}
              @change=${(event: Event) => {
                const value = Number((event.target as HTMLInputElement).value);
                this.transferImpedanceOhm = (event.target as HTMLInputElement).value !== '' && value > 0 ? value : undefined;
              }}
            />
          </label>
        </div>
        <div class="load">
          <label class="file" title="A CSV or text table: frequency, then one level column per detector">
            Load a scan…
            <input type="file" name="scan-file" accept=".csv,.txt,.tsv,.dat,.asc,text/plain,text/csv" ?disabled=${reading} @change=${this.onFileChosen} />
          </label>
          ${this.demo && this.loadDemoScan
            ? html`<button type="button" class="demo-scan" ?disabled=${reading} @click=${() => void this.loadDemo()}>Load the invented demo scan</button>`
            : nothing}
        </div>
        ${this.renderImport()}
      </fieldset>
    `;
  }

  private renderImport() {
    const state = this.importState;
    if (state.kind === 'reading') {
      const percent = Math.round(state.fractionDone * 100);
      return html`<div class="import small" data-state="reading">
        <label>Reading ${state.fileName}… ${percent} %<progress max="1" value=${state.fractionDone}></progress></label>
      </div>`;
    }
    if (state.kind === 'failed') {
      return html`<div class="import import-error small" role="alert" data-state="failed">
        <p>${state.fileName} could not be used: ${state.message}</p>
        <span>${this.loaded ? `The scan shown is still ${this.loaded.fileName}.` : 'Nothing was loaded.'} The design is unchanged.</span>
        ${this.renderRejected(state.rejected, 'Rejected lines')} ${this.renderNotes(state.notes)}
      </div>`;
    }
    const loaded = this.loaded;
    if (!loaded) return nothing;
    const scan = loaded.scan;
    const f = scan.frequencyHz;
    return html`<div class="import small" data-state="loaded">
      <p class="muted">
        ${TAG_TEXT[scan.tag]}; ${f.length} points, ${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)};
        ${scan.traces.map((t) => DETECTOR_SHORT[t.detector]).join(', ')}; read in ${Math.round(loaded.elapsedMs)} ms.
      </p>
      ${scan.rejected.length > 0 ? this.renderRejected(scan.rejected, 'Lines left out') : nothing} ${this.renderNotes(scan.notes)}
    </div>`;
  }

  private renderRejected(rejected: readonly { line: number; reason: string }[], title: string) {
    if (rejected.length === 0) return nothing;
    return html`<details class="rejected">
      <summary>${title}: ${rejected.length}</summary>
      <ul class="lines">
        ${rejected.map((r) => html`<li>line ${r.line}: ${r.reason}</li>`)}
      </ul>
    </details>`;
  }

  private renderNotes(notes: readonly string[]) {
    if (notes.length === 0) return nothing;
    return html`<details class="read-notes">
      <summary>How the file was read</summary>
      <ul>
        ${notes.map((note) => html`<li>${note}</li>`)}
      </ul>
    </details>`;
  }

  private renderJudging() {
    const emissions = this.design?.emissions;
    const attribution = emissions?.attribution ?? 'both';
    const target = emissions?.targetMarginDb ?? 6;
    const floor = emissions?.noiseFloorDbuV;
    const tag = this.noiseChoice === 'scan' ? this.loaded?.scan.tag : undefined;
    const attributionApplies = tag !== undefined && tag !== 'common-mode' && tag !== 'differential-mode';
    return html`
      <fieldset class="judging">
        <legend>Judging</legend>
        <label class="field">
          <span>For a scan of unknown mode, credit the filter with</span>
          <select name="attribution" @change=${this.onAttribution}>
            ${ATTRIBUTIONS.map((a) => html`<option value=${a} ?selected=${a === attribution}>${ATTRIBUTION_TEXT[a]}</option>`)}
          </select>
          <p class="hint">
            ${attributionApplies
              ? 'Applies to the scan shown (a line or total level).'
              : 'Applies to scans of line 1, line 2 or total only; not to the estimate or a CM/DM scan.'}
          </p>
        </label>
        <div class="pair">
          <label class="field">
            <span>Target margin</span>
            <span class="inline">
              <input
                type="number"
                name="target-margin"
                step="0.5"
                min="-40"
                max="60"
                .value=${String(target)}
                aria-invalid=${this.marginError ? 'true' : 'false'}
                @change=${this.onMargin}
              />
              dB
            </span>
          </label>
          <label class="field">
            <span>Receiver noise floor</span>
            <span class="inline">
              <input
                type="number"
                name="noise-floor"
                step="1"
                placeholder="none"
                .value=${floor === undefined ? '' : String(floor)}
                aria-invalid=${this.floorError ? 'true' : 'false'}
                @change=${this.onFloor}
              />
              dBµV
            </span>
          </label>
        </div>
        <p class="hint">Scan points at or below the floor show the receiver, not the equipment: they are left out of the attenuation needed.</p>
        ${this.marginError ? html`<p class="field-error" role="alert">${this.marginError}</p>` : nothing}
        ${this.floorError ? html`<p class="field-error" role="alert">${this.floorError}</p>` : nothing}
      </fieldset>
    `;
  }

  private renderMasks() {
    const masks = this.design?.emissions?.masks ?? [];
    return html`
      <fieldset class="limits">
        <legend>Limit lines</legend>
        ${masks.length === 0
          ? html`<p class="muted small">None: add one, or nothing is judged.</p>`
          : html`<ul class="masks">
              ${masks.map(
                (mask) => html`<li data-mask=${mask.id}>
                  <span><span class="mask-name">${mask.name}</span> <span class="muted small">${mask.detector}</span></span>
                  <button type="button" class="remove" aria-label="Remove ${mask.name}" @click=${() => this.removeMask(mask.id)}>Remove</button>
                  <span class="mask-origin">${mask.origin ?? 'origin not given'}</span>
                </li>`,
              )}
            </ul>`}
        <div class="add">
          <select
            name="preset"
            aria-label="Limit preset to add"
            @change=${(event: Event) => (this.presetChoice = (event.target as HTMLSelectElement).value)}
          >
            <option value="" ?selected=${this.presetChoice === ''}>Add a preset…</option>
            ${presetGroups().map(
              (group) => html`<optgroup label=${group.standard}>
                ${group.presets.map(
                  (preset) => html`<option value=${preset.id} ?selected=${preset.id === this.presetChoice}>${preset.name} (status ${preset.status})</option>`,
                )}
              </optgroup>`,
            )}
          </select>
          <button type="button" class="add-preset" ?disabled=${this.presetChoice === '' || masks.length >= 16} @click=${this.addPreset}>Add</button>
        </div>
        <p class="hint">A preset is copied into the design; the catalogue itself never changes.</p>
        ${this.editError ? html`<p class="field-error" role="alert">${this.editError}</p>` : nothing}
      </fieldset>
    `;
  }
}

function unitOrUndefined<T extends string>(event: Event, choices: readonly T[]): T | undefined {
  const value = (event.target as HTMLSelectElement).value;
  return choices.find((choice) => choice === value);
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-emissions': EmissionsSection;
  }
  interface HTMLElementEventMap {
    'design-edit': DesignEditEvent;
  }
}
