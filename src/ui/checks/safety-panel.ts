import { css, html, LitElement, nothing, type TemplateResult } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { SafetyState } from '../../client/planner-results.ts';
import { designSchema } from '../../model/design-schema.ts';
import type { JsonObject } from '../../planner/json.ts';
import type { CheckStatus, SafetyCheckResult, SafetyFinding } from '../../safety/index.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import '../editors/object-fields.ts';
import { sharedStyles } from '../styles/theme.ts';

/**
 * The safety and practical checks of the design being edited (computed in the worker, docs/safety.md):
 * leakage current, X-capacitor discharge, capacitor class, voltage stress, copper loss and saturation,
 * each pass / warning / fail with its numbers, its assumptions and its standard, or "not checked" with
 * what to give. The inputs they need (supply, line current, the leakage limit chosen, core data) are
 * edited here too. The cautions are always shown: these are planning aids, not a certification.
 */

const STATUS_TEXT: Readonly<Record<CheckStatus, string>> = {
  pass: 'pass',
  warn: 'warning',
  fail: 'FAIL',
  'not-checked': 'not checked',
  'not-applicable': 'does not apply',
  skipped: 'skipped',
};

@customElement('chokepoint-safety-panel')
export class SafetyPanel extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
      }
      .outcome {
        padding: 6px 10px;
        border-radius: var(--cp-radius);
        border: 1px solid var(--cp-border);
        border-left-width: 4px;
        margin-bottom: 8px;
        font-size: 13px;
      }
      .outcome.fail {
        border-left-color: var(--cp-error-border);
        background: var(--cp-error-bg);
      }
      .outcome.pass {
        border-left-color: var(--cp-ok);
        background: var(--cp-ok-bg);
      }
      .outcome.incomplete {
        border-left-color: var(--cp-caution-border);
        background: var(--cp-caution-bg);
      }
      details.check {
        border-top: 1px solid var(--cp-rule);
        padding: 4px 0;
      }
      details.check > summary {
        cursor: pointer;
        display: flex;
        gap: 8px;
        align-items: baseline;
      }
      .badge {
        font-size: 11px;
        font-weight: 700;
        text-transform: uppercase;
        letter-spacing: 0.03em;
        padding: 0 6px;
        border-radius: 999px;
        border: 1px solid var(--cp-border);
        white-space: nowrap;
      }
      .badge.pass {
        color: var(--cp-ok);
        border-color: var(--cp-ok);
      }
      .badge.warn {
        color: var(--cp-caution-border);
        border-color: var(--cp-caution-border);
      }
      .badge.fail {
        color: var(--cp-error-text);
        border-color: var(--cp-error-border);
        background: var(--cp-error-bg);
      }
      .badge.not-checked {
        color: var(--cp-muted);
        border-style: dashed;
      }
      .finding {
        margin: 6px 0 8px 12px;
        font-size: 12.5px;
      }
      .finding p {
        margin: 2px 0;
      }
      .figures {
        font-size: 12px;
        margin: 2px 0;
      }
      .figures td:last-child {
        white-space: nowrap;
        font-variant-numeric: tabular-nums;
      }
      .small-list {
        margin: 2px 0 0;
        font-size: 11.5px;
        color: var(--cp-muted);
      }
      .missing {
        font-family: var(--cp-mono);
        font-size: 11.5px;
      }
      .cautions {
        background: var(--cp-caution-bg);
        border: 1px solid var(--cp-caution-border);
        border-left-width: 4px;
        border-radius: var(--cp-radius);
        padding: 8px 10px;
        margin-top: 10px;
        font-size: 12.5px;
      }
      .cautions h3 {
        margin: 0 0 4px;
      }
      .cautions li + li {
        margin-top: 3px;
      }
      h3 {
        margin: 10px 0 4px;
      }
    `,
  ];

  @property({ attribute: false }) state: SafetyState | undefined;
  @property({ attribute: false }) document: JsonObject | undefined;
  @property({ attribute: false }) issues: ReadonlyMap<string, string> = new Map();
  /** The listed limits' and requirements' names (from the worker), for their choice lists. */
  @property({ attribute: false }) choiceLabels: ReadonlyMap<string, string> = new Map();

  override render() {
    const state = this.state;
    const report = state?.status === 'done' ? state.report : undefined;
    return html`
      ${state === undefined || state.status === 'running'
        ? html`<p class="muted small">Checking…</p>`
        : state.status === 'error'
          ? html`<p class="outcome fail" role="status">${state.message}</p>`
          : html`<p class="outcome ${report!.outcome}" role="status" data-outcome=${report!.outcome}>${this.outcomeText()}</p>`}
      ${report ? report.checks.map((check) => this.renderCheck(check)) : nothing}
      <details>
        <summary class="small">What the checks are run for: supply, line current, limit chosen, tolerances</summary>
        ${this.document
          ? html`<chokepoint-object-fields .document=${this.document} .path=${[]} .schema=${designSchema} .issues=${this.issues} .only=${['operating', 'safety']} .choiceLabels=${this.choiceLabels}></chokepoint-object-fields>`
          : nothing}
      </details>
      <aside class="cautions" aria-labelledby="cautions-title">
        <h3 id="cautions-title">Mains safety</h3>
        <ul>
          ${(report?.cautions ?? []).map((caution) => html`<li>${caution.text}</li>`)}
          ${report ? nothing : html`<li>These are planning aids, not a certification: use safety-certified X and Y parts, follow the product safety standard, local codes and licensed practice.</li>`}
        </ul>
      </aside>
    `;
  }

  private outcomeText(): string {
    const report = this.state?.status === 'done' ? this.state.report : undefined;
    if (!report) return '';
    const { counts } = report;
    const parts = [`${counts.fail} failed`, `${counts.warn} warnings`, `${counts['not-checked']} not checked`, `${counts.pass} passed`];
    const head = report.outcome === 'pass' ? 'No check failed' : report.outcome === 'fail' ? 'A check failed' : 'Some checks could not run: give what they need below';
    return `${head} (${parts.join(', ')}).`;
  }

  private renderCheck(check: SafetyCheckResult): TemplateResult {
    const open = check.status === 'fail' || check.status === 'warn';
    return html`<details class="check" data-check=${check.id} ?open=${open}>
      <summary><span class="badge ${check.status}">${STATUS_TEXT[check.status]}</span><span>${check.title}</span></summary>
      <p class="small">${check.summary}</p>
      ${check.findings.filter((f) => f.status !== 'not-applicable').map((finding) => this.renderFinding(finding))}
    </details>`;
  }

  private renderFinding(finding: SafetyFinding): TemplateResult {
    return html`<div class="finding" data-finding=${finding.id}>
      <p><span class="badge ${finding.status}">${STATUS_TEXT[finding.status]}</span> <strong>${finding.title}</strong></p>
      <p>${finding.summary}</p>
      ${finding.status === 'not-checked' ? html`<p>Give: ${finding.missing.map((m, i) => html`${i > 0 ? ', ' : ''}<span class="missing">${m}</span>`)}</p>` : nothing}
      ${finding.figures.length > 0
        ? html`<table class="figures"><tbody>${finding.figures.map((figure) => html`<tr><td>${figure.label}</td><td>${figure.text}</td></tr>`)}</tbody></table>`
        : nothing}
      ${finding.sources.length > 0
        ? html`<ul class="small-list">${finding.sources.map((source) => html`<li>${source.standard}${source.clause ? ` ${source.clause}` : ''}: ${source.confirmationText}</li>`)}</ul>`
        : nothing}
      ${finding.assumptions.length > 0
        ? html`<details><summary class="small-list">Assumptions</summary><ul class="small-list">${finding.assumptions.map((a) => html`<li>${a}</li>`)}</ul></details>`
        : nothing}
    </div>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-safety-panel': SafetyPanel;
  }
}
