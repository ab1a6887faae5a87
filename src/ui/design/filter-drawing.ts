import { css, html, LitElement, type PropertyValues } from 'lit';
import { customElement, property, query } from 'lit/decorators.js';
import { drawLadder } from '../../drawing/ladder-svg.ts';
import type { PlotTheme } from '../../drawing/plot-palette.ts';
import type { Design } from '../../model/design.ts';
import { sendIntent } from '../app/intent-event.ts';
import { patchSvgDom } from '../drawing/svg-patch.ts';
import { svgToDom } from '../drawing/svg-to-dom.ts';

/**
 * The filter drawn as a two-line ladder (src/drawing/ladder-svg.ts, the same drawing as the report):
 * each part is a focusable button; clicking it, or Enter or Space on it, selects it for the editor.
 * The selected part is highlighted and parts taken out of the circuit are grey and dashed.
 */
@customElement('chokepoint-filter-drawing')
export class FilterDrawing extends LitElement {
  static override styles = css`
    :host {
      display: block;
    }
    .frame {
      overflow-x: auto;
      border: 1px solid var(--cp-rule);
      border-radius: var(--cp-radius);
    }
    .frame svg {
      display: block;
    }
    .frame [data-element-id] {
      cursor: pointer;
    }
    .frame [data-element-id]:focus-visible {
      outline: 2px solid var(--cp-accent);
    }
  `;

  @property({ attribute: false }) design: Design | undefined;
  @property({ attribute: false }) selectedId: string | undefined;
  @property() theme: PlotTheme = 'light';
  /** Wrap onto further rows beyond this width, CSS pixels; follows the element's own width. */
  @property({ type: Number }) maxRowWidth = 760;

  @query('.frame') private frame: HTMLElement | null | undefined;
  private observer: ResizeObserver | undefined;

  override connectedCallback(): void {
    super.connectedCallback();
    if (typeof ResizeObserver === 'undefined') return;
    this.observer = new ResizeObserver(() => {
      const width = Math.floor(this.getBoundingClientRect().width) - 4;
      // Redraw only for a real change of width, in steps, so a scrollbar's appearance does not loop.
      if (width > 200 && Math.abs(width - this.maxRowWidth) > 40) this.maxRowWidth = width;
    });
    this.observer.observe(this);
  }

  override disconnectedCallback(): void {
    this.observer?.disconnect();
    super.disconnectedCallback();
  }

  override render() {
    return html`<div class="frame" role="group" aria-label="The filter drawn: select a part to edit it" @click=${this.onClick} @keydown=${this.onKey}></div>`;
  }

  protected override updated(changed: PropertyValues<this>): void {
    if (!this.frame || !(changed.has('design') || changed.has('selectedId') || changed.has('theme') || changed.has('maxRowWidth'))) return;
    const focused = (this.renderRoot as ShadowRoot).activeElement?.getAttribute('data-element-id');
    if (!this.design) {
      this.frame.replaceChildren();
      return;
    }
    const { node } = drawLadder(this.design, {
      interactive: true,
      theme: this.theme,
      maxRowWidth: this.maxRowWidth,
      idPrefix: 'filter',
      ...(this.selectedId === undefined ? {} : { selectedElementId: this.selectedId }),
    });
    // A value typed changes a few labels: patch the drawing shown rather than rebuild it.
    const shown = this.frame.firstElementChild;
    if (shown) patchSvgDom(shown, node);
    else this.frame.append(svgToDom(node));
    // A redraw keeps the keyboard where it was.
    if (focused) this.frame.querySelector<SVGElement>(`[data-element-id="${CSS.escape(focused)}"]`)?.focus();
  }

  private readonly onClick = (event: Event): void => {
    const id = (event.target as Element | null)?.closest('[data-element-id]')?.getAttribute('data-element-id');
    if (id) sendIntent(this, { type: 'select', selection: { kind: 'element', id } });
  };

  private readonly onKey = (event: KeyboardEvent): void => {
    if (event.key !== 'Enter' && event.key !== ' ') return;
    const id = (event.target as Element | null)?.closest('[data-element-id]')?.getAttribute('data-element-id');
    if (!id) return;
    event.preventDefault();
    sendIntent(this, { type: 'select', selection: { kind: 'element', id } });
  };
}

declare global {
  interface HTMLElementTagNameMap {
    'chokepoint-filter-drawing': FilterDrawing;
  }
}
