import { css, html, LitElement, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { editorStyles } from '../editors/editor-styles.ts';

/**
 * The header's file actions: open a design file (or drop one on the page), save the design being
 * edited as a file, and copy its share link. What each does is the page's wiring; this only asks.
 */
@customElement('chokepoint-file-actions')
export class FileActions extends LitElement {
  static override styles = [
    editorStyles,
    css`
      :host {
        display: inline-flex;
        gap: 4px;
        align-items: center;
        flex-wrap: wrap;
        font-family: var(--cp-font);
      }
      .file {
        position: relative;
        display: inline-block;
        padding: 3px 10px;
        border: 1px solid var(--cp-input-border);
        border-radius: 4px;
        font-size: 13px;
        background: var(--cp-button-bg);
        color: var(--cp-text);
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
      .said {
        font-size: 12px;
        color: var(--cp-muted);
        max-width: 28ch;
      }
    `,
  ];

  @property({ attribute: false }) onOpenFile: ((file: File) => Promise<void>) | undefined;
  @property({ attribute: false }) onSave: (() => void) | undefined;
  @property({ attribute: false }) onCopyLink: (() => Promise<string>) | undefined;
  @property({ attribute: false }) onReport: (() => Promise<string>) | undefined;

  @state() private said: string | undefined;

  override render() {
    return html`
      <label class="file" title="Open a design file (.json) as a new variant; you can also drop it on the page">
        Open…
        <input type="file" accept=".json,application/json" aria-label="Open a design file" @change=${this.onFile} />
      </label>
      <button type="button" data-action="save-design" title="Save the design being edited as a .design.json file" @click=${() => this.onSave?.()}>Save file</button>
      <button type="button" data-action="copy-link" title="Copy a link that carries the design being edited" @click=${() => void this.copy()}>Copy link</button>
      <button type="button" data-action="report" title="The printable hand-over report of the design being edited (an HTML file to print or keep)" @click=${() => void this.report()}>Report</button>
      ${this.said ? html`<span class="said" role="status">${this.said}</span>` : nothing}
    `;
  }

  private async onFile(event: Event): Promise<void> {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (file) await this.onOpenFile?.(file);
  }

  private async report(): Promise<void> {
    this.said = 'Making the report…';
    this.said = this.onReport ? await this.onReport() : undefined;
  }

  private async copy(): Promise<void> {
    this.said = this.onCopyLink ? await this.onCopyLink() : undefined;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-file-actions': FileActions;
  }
}
