import { css, html, LitElement, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { designSchema, noiseSourceModeSchema } from '../../model/design-schema.ts';
import { NOISE_SOURCE_PRESETS, type NoiseSourcePresetId } from '../../model/noise-source-presets.ts';
import { getAt, isJsonObject, type Json, type JsonObject } from '../../planner/json.ts';
import { sendIntent } from '../app/intent-event.ts';
import { editorStyles } from '../editors/editor-styles.ts';
import '../editors/object-fields.ts';
import { sharedStyles } from '../styles/theme.ts';

/**
 * What surrounds the filter: the equipment's noise source per mode (from a preset or any part as its
 * impedance), the receiving network on each line (the LISN), and the frequencies swept.
 */

const PRESET_TEXT: Readonly<Record<NoiseSourcePresetId, string>> = {
  'capacitive-coupling-to-chassis': 'switch node coupled to chassis (a capacitance)',
  'bulk-capacitor': 'bulk or input capacitor (C with ESR and ESL)',
  resistive: 'a resistance',
};

const MODE_TEXT = { commonMode: 'Common-mode source (line midpoint to ground)', differentialMode: 'Differential-mode source (line to line)' } as const;

@customElement('chokepoint-circuit-settings')
export class CircuitSettings extends LitElement {
  static override styles = [
    sharedStyles,
    editorStyles,
    css`
      :host {
        display: block;
      }
      h3 {
        margin: 12px 0 6px;
      }
      h3:first-child {
        margin-top: 0;
      }
      .preset {
        display: flex;
        gap: 6px;
        align-items: center;
        margin-bottom: 6px;
        font-size: 12.5px;
      }
      .preset select {
        width: auto;
        flex: 1;
      }
    `,
  ];

  @property({ attribute: false }) document: JsonObject | undefined;
  @property({ attribute: false }) issues: ReadonlyMap<string, string> = new Map();

  override render() {
    const document = this.document;
    if (!document) return nothing;
    return html`
      ${(['commonMode', 'differentialMode'] as const).map((mode) => {
        const current = getAt(document, ['noiseSource', mode]);
        const preset = isJsonObject(current) && typeof current['preset'] === 'string' ? current['preset'] : '';
        return html`
          <h3>${MODE_TEXT[mode]}</h3>
          <div class="preset">
            <label for="preset-${mode}">Start from</label>
            <select id="preset-${mode}" @change=${(event: Event) => this.applyPreset(mode, (event.target as HTMLSelectElement).value)}>
              <option value="" ?selected=${preset === ''}>—</option>
              ${(Object.keys(NOISE_SOURCE_PRESETS) as NoiseSourcePresetId[]).map((id) => html`<option value=${id} ?selected=${id === preset}>${PRESET_TEXT[id]}</option>`)}
            </select>
          </div>
          <chokepoint-object-fields .document=${document} .path=${['noiseSource', mode]} .schema=${noiseSourceModeSchema} .issues=${this.issues} .skip=${['preset']}></chokepoint-object-fields>
        `;
      })}
      <h3>Receiving networks (LISN)</h3>
      <chokepoint-object-fields .document=${document} .path=${[]} .schema=${designSchema} .issues=${this.issues} .only=${['receivers']}></chokepoint-object-fields>
      <h3>Frequencies swept</h3>
      <chokepoint-object-fields .document=${document} .path=${[]} .schema=${designSchema} .issues=${this.issues} .only=${['frequencyPlan']}></chokepoint-object-fields>
    `;
  }

  private applyPreset(mode: 'commonMode' | 'differentialMode', id: string): void {
    if (!(id in NOISE_SOURCE_PRESETS)) return;
    const value = NOISE_SOURCE_PRESETS[id as NoiseSourcePresetId]() as unknown as Json;
    sendIntent(this, { type: 'set-field', path: ['noiseSource', mode], value });
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-circuit-settings': CircuitSettings;
  }
}
