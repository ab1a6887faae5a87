import { css, html, LitElement, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { formatFrequency } from '../../drawing/frequency-ticks.ts';
import type { FrequencyUnit } from '../../io/frequency-unit.ts';
import type { Design } from '../../model/design.ts';
import type { LevelUnitName } from '../../spectrum/level-units.ts';
import { DEFAULT_SCAN_TAG, SCAN_TAGS, type RejectedLine, type ScanTag } from '../../spectrum/spectrum-types.ts';
import { MAX_SCAN_FILE_BYTES, scanFileTooLarge } from '../../io/scan-limits.ts';
import type { ScanImportOptions, ScanImportReply } from '../../../workers/scan-import-api.ts';
import type { ScanEntry, Workspace } from '../../planner/workspace.ts';
import { sendIntent } from '../app/intent-event.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import { sharedStyles } from '../styles/theme.ts';
import type { Scan } from '../../spectrum/spectrum-types.ts';

/**
 * Where the noise comes from: the design's estimate, or a scan read from a file (CSV or a table,
 * read in its own worker with progress; a failed read changes nothing and says why, with the lines it
 * could not use). Loaded scans are kept with the work; choose which one the emissions are judged from.
 */

/** What the panel needs of the page: read a scan's text, and keep a scan's columns (returning its entry). */
export interface ScanPanelHost {
  /** A file's bytes (decoded in the worker, which says why when they are not UTF-8 text) or text. */
  importScan(content: string | Uint8Array, options: ScanImportOptions, onProgress: (fractionDone: number) => void): Promise<ScanImportReply>;
  keepScan(scan: Scan, invented: boolean): Promise<ScanEntry>;
  /** The invented demo scan's text. */
  demoScanText(): Promise<string>;
}

export const TAG_TEXT: Readonly<Record<ScanTag, string>> = {
  line1: 'line 1',
  line2: 'line 2',
  'common-mode': 'common mode (from a CM/DM separator)',
  'differential-mode': 'differential mode (from a CM/DM separator)',
  total: 'one line, mode unknown',
};

const FREQUENCY_CHOICES: readonly FrequencyUnit[] = ['Hz', 'kHz', 'MHz', 'GHz'];
const LEVEL_CHOICES: readonly { value: LevelUnitName; text: string }[] = [
  { value: 'dBuV', text: 'dBµV' },
  { value: 'dBm', text: 'dBm (50 Ω)' },
  { value: 'dBuA', text: 'dBµA (current probe)' },
  { value: 'dBV', text: 'dBV' },
  { value: 'V', text: 'V' },
];


type ImportState =
  | { readonly kind: 'idle' }
  | { readonly kind: 'reading'; readonly fileName: string; readonly fractionDone: number }
  | { readonly kind: 'failed'; readonly fileName: string; readonly message: string; readonly rejected: readonly RejectedLine[]; readonly notes: readonly string[] };

@customElement('chokepoint-scan-panel')
export class ScanPanel extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
      }
      h3 {
        margin: 0 0 6px;
      }
      .choice {
        display: flex;
        gap: 6px;
        align-items: baseline;
        margin: 3px 0;
        font-size: 13px;
      }
      .choice input {
        margin: 0;
      }
      .scan-meta {
        font-size: 11.5px;
        color: var(--cp-muted);
        display: block;
      }
      .options {
        display: grid;
        grid-template-columns: repeat(auto-fill, minmax(150px, 1fr));
        gap: 6px 10px;
        margin: 8px 0;
      }
      .load {
        display: flex;
        flex-wrap: wrap;
        gap: 6px;
        align-items: center;
      }
      .file {
        position: relative;
        display: inline-block;
        padding: 3px 10px;
        border: 1px solid var(--cp-accent);
        border-radius: 4px;
        color: var(--cp-accent);
        font-size: 13px;
        font-weight: 600;
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
      .invented {
        font-size: 10.5px;
        font-weight: 700;
        text-transform: uppercase;
        padding: 0 5px;
        border-radius: 999px;
        background: var(--cp-invented-bg);
        color: var(--cp-invented-text);
        border: 1px solid var(--cp-invented-border);
      }
      progress {
        width: 100%;
      }
      .failed {
        padding: 6px 8px;
        border: 1px solid var(--cp-error-border);
        border-left-width: 4px;
        border-radius: var(--cp-radius);
        background: var(--cp-error-bg);
        color: var(--cp-error-text);
        font-size: 12.5px;
        margin-top: 6px;
      }
      .failed p {
        margin: 0 0 4px;
        font-weight: 600;
      }
      .lines {
        max-height: 180px;
        overflow: auto;
        font-family: var(--cp-mono);
        font-size: 11.5px;
        margin: 2px 0 0;
      }
      .remove {
        font-size: 11.5px;
        padding: 0 6px;
      }
      .notes {
        font-size: 11.5px;
        color: var(--cp-muted);
        margin: 2px 0 0 20px;
      }
      .notes-wrap {
        margin: 0 0 4px 20px;
      }
      .warnings {
        font-size: 12px;
        color: var(--cp-error-text);
        margin: 2px 0 4px 20px;
      }
    `,
  ];

  @property({ attribute: false }) workspace: Workspace | undefined;
  @property({ attribute: false }) design: Design | undefined;
  @property({ attribute: false }) host: ScanPanelHost | undefined;

  @state() private tag: ScanTag = DEFAULT_SCAN_TAG;
  @state() private frequencyUnit: FrequencyUnit | undefined;
  @state() private levelUnit: LevelUnitName | undefined;
  @state() private transferImpedanceOhm: number | undefined;
  @state() private importState: ImportState = { kind: 'idle' };
  private count = 0;

  /** Read a scan file (picked, or dropped on the page): its bytes, refused unread when too large. */
  async importFile(file: File): Promise<void> {
    if (file.size > MAX_SCAN_FILE_BYTES) {
      // Refused unread, as the command line does: reading it could take the page's memory.
      this.importState = { kind: 'failed', fileName: file.name, message: scanFileTooLarge(file.size), rejected: [], notes: [] };
      return;
    }
    // The bytes, not file.text(): the worker decodes them as UTF-8 or says why it cannot (a Latin-1 or
    // UTF-16 export), where file.text() would replace what does not read without a word.
    let bytes: Uint8Array;
    try {
      bytes = new Uint8Array(await file.arrayBuffer());
    } catch (cause) {
      this.importState = { kind: 'failed', fileName: file.name, message: `the file could not be read: ${cause instanceof Error ? cause.message : String(cause)}`, rejected: [], notes: [] };
      return;
    }
    await this.importText(bytes, file.name, false);
  }

  override render() {
    const workspace = this.workspace;
    if (!workspace) return nothing;
    const estimate = this.design?.emissions?.estimate;
    const hasEstimate = estimate !== undefined && (estimate.commonMode !== undefined || estimate.differentialMode !== undefined);
    const noise = workspace.noise;
    const reading = this.importState.kind === 'reading';
    return html`
      <h3>Noise to judge</h3>
      <div role="radiogroup" aria-label="Noise to judge">
        <label class="choice">
          <input type="radio" name="noise" .checked=${noise.kind === 'estimate'} ?disabled=${!hasEstimate && noise.kind !== 'estimate'} @change=${() => sendIntent(this, { type: 'choose-noise', noise: { kind: 'estimate' } })} />
          <span>The design’s noise estimate${hasEstimate ? '' : html` <span class="muted">(none yet: add one below)</span>`}</span>
        </label>
        ${workspace.scans.map((scan) => this.renderScan(scan, noise.kind === 'scan' && noise.scanId === scan.id))}
      </div>
      <details>
        <summary class="small">How the next scan file is read</summary>
        <div class="options">
          <label class="field"><span>What it measured</span>
            <select name="scan-tag" @change=${(event: Event) => (this.tag = (event.target as HTMLSelectElement).value as ScanTag)}>
              ${SCAN_TAGS.map((tag) => html`<option value=${tag} ?selected=${tag === this.tag}>${TAG_TEXT[tag]}</option>`)}
            </select>
          </label>
          <label class="field"><span>Frequency unit, if the file does not say</span>
            <select name="frequency-unit" @change=${(event: Event) => (this.frequencyUnit = FREQUENCY_CHOICES.find((u) => u === (event.target as HTMLSelectElement).value))}>
              <option value="" ?selected=${this.frequencyUnit === undefined}>Hz (assumed)</option>
              ${FREQUENCY_CHOICES.map((unit) => html`<option value=${unit} ?selected=${unit === this.frequencyUnit}>${unit}</option>`)}
            </select>
          </label>
          <label class="field"><span>Level unit, if the file does not say</span>
            <select name="level-unit" @change=${(event: Event) => (this.levelUnit = LEVEL_CHOICES.find((c) => c.value === (event.target as HTMLSelectElement).value)?.value)}>
              <option value="" ?selected=${this.levelUnit === undefined}>dBµV (assumed)</option>
              ${LEVEL_CHOICES.map((choice) => html`<option value=${choice.value} ?selected=${choice.value === this.levelUnit}>${choice.text}</option>`)}
            </select>
          </label>
          <label class="field"><span>Probe transfer impedance, for dBµA (Ω)</span>
            <input type="text" inputmode="decimal" name="transfer-impedance" .value=${this.transferImpedanceOhm === undefined ? '' : String(this.transferImpedanceOhm)}
              @change=${(event: Event) => {
                const value = Number((event.target as HTMLInputElement).value);
                this.transferImpedanceOhm = value > 0 ? value : undefined;
              }} />
          </label>
        </div>
      </details>
      <div class="load">
        <label class="file" title="A CSV or text table: frequency, then one level column per detector">
          Load a scan…
          <input type="file" name="scan-file" aria-label="Load a scan file" accept=".csv,.txt,.tsv,.dat,.asc,text/plain,text/csv" ?disabled=${reading} @change=${this.onFile} />
        </label>
        <button type="button" data-action="demo-scan" ?disabled=${reading} @click=${() => void this.loadDemo()}>Load the invented demo scan</button>
      </div>
      ${this.renderImport()}
    `;
  }

  private renderScan(scan: ScanEntry, chosen: boolean) {
    return html`<label class="choice" data-scan=${scan.id}>
        <input type="radio" name="noise" .checked=${chosen} @change=${() => sendIntent(this, { type: 'choose-noise', noise: { kind: 'scan', scanId: scan.id } })} />
        <span>
          Scan “${scan.name}” ${scan.invented ? html`<span class="invented">invented</span>` : nothing}
          <span class="scan-meta">${TAG_TEXT[scan.tag]}; ${scan.points} points; ${scan.detectors.join(', ')}${scan.rejectedLines > 0 ? `; ${scan.rejectedLines} lines left out` : ''}</span>
        </span>
        <button type="button" class="remove" aria-label="Remove the scan ${scan.name}" @click=${(event: Event) => (event.preventDefault(), sendIntent(this, { type: 'remove-scan', scanId: scan.id }))}>remove</button>
      </label>
      ${scan.warnings.length > 0 ? html`<ul class="warnings">${scan.warnings.map((warning) => html`<li>Warning: ${warning}</li>`)}</ul>` : nothing}
      ${scan.notes.length > 0 ? html`<details class="notes-wrap"><summary class="small">How the file was read</summary><ul class="notes">${scan.notes.map((note) => html`<li>${note}</li>`)}</ul></details>` : nothing}`;
  }

  private renderImport() {
    const state = this.importState;
    if (state.kind === 'reading') {
      return html`<div class="small" data-state="reading"><label>Reading ${state.fileName}… ${Math.round(state.fractionDone * 100)} %<progress max="1" .value=${state.fractionDone}></progress></label></div>`;
    }
    if (state.kind === 'failed') {
      return html`<div class="failed" role="alert" data-state="failed">
        <p>${state.fileName} could not be used: ${state.message}</p>
        <span>Nothing was changed.</span>
        ${state.rejected.length > 0
          ? html`<details><summary>Rejected lines: ${state.rejected.length}</summary><ul class="lines">${state.rejected.slice(0, 200).map((r) => html`<li>line ${r.line}: ${r.reason}</li>`)}</ul></details>`
          : nothing}
        ${state.notes.length > 0 ? html`<ul>${state.notes.map((note) => html`<li>${note}</li>`)}</ul>` : nothing}
      </div>`;
    }
    return nothing;
  }

  private async onFile(event: Event): Promise<void> {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (file) await this.importFile(file);
  }

  private async loadDemo(): Promise<void> {
    const host = this.host;
    if (!host) return;
    const name = 'invented-adapter-no-filter.csv';
    this.importState = { kind: 'reading', fileName: name, fractionDone: 0 };
    let text: string;
    try {
      text = await host.demoScanText();
    } catch (cause) {
      this.importState = { kind: 'failed', fileName: name, message: `the demo scan could not be loaded: ${cause instanceof Error ? cause.message : String(cause)}`, rejected: [], notes: [] };
      return;
    }
    // The invented scan was taken on line 1 (docs/emissions.md).
    await this.importText(text, name, true, 'line1');
  }

  private async importText(content: string | Uint8Array, fileName: string, invented: boolean, tag: ScanTag = this.tag): Promise<void> {
    const host = this.host;
    this.count += 1;
    const count = this.count;
    if (!host) {
      this.importState = { kind: 'failed', fileName, message: 'no scan reader is connected', rejected: [], notes: [] };
      return;
    }
    const options: ScanImportOptions = {
      name: fileName,
      tag,
      ...(this.frequencyUnit ? { frequencyUnit: this.frequencyUnit } : {}),
      ...(this.levelUnit ? { levelUnit: this.levelUnit } : {}),
      ...(this.transferImpedanceOhm !== undefined ? { transferImpedanceOhm: this.transferImpedanceOhm } : {}),
    };
    this.importState = { kind: 'reading', fileName, fractionDone: 0 };
    const reply = await host.importScan(content, options, (fractionDone) => {
      if (count === this.count && this.importState.kind === 'reading') this.importState = { kind: 'reading', fileName, fractionDone };
    });
    if (count !== this.count) return;
    if (!reply.ok) {
      this.importState = { kind: 'failed', fileName, message: reply.error.message, rejected: reply.error.rejected, notes: reply.error.notes };
      return;
    }
    const entry = await host.keepScan(reply.scan, invented);
    this.importState = { kind: 'idle' };
    sendIntent(this, { type: 'add-scan', entry, use: true });
  }
}

/** "150 kHz to 30 MHz" for a scan's span. */
export function scanSpan(scan: Scan): string {
  const f = scan.frequencyHz;
  return f.length > 0 ? `${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)}` : 'no points';
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-scan-panel': ScanPanel;
  }
}
