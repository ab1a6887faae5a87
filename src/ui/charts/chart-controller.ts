import type { ReactiveController, ReactiveControllerHost } from 'lit';
import uPlot from 'uplot';
import type { SweepResult } from '../../engine/index.ts';
import { buildInsertionLossPlot, type ChartSize } from './insertion-loss-options.ts';

/** What the controller needs of a plot: uPlot itself, or a stand-in where there is no canvas. */
export type PlotHandle = Pick<uPlot, 'setSize' | 'destroy'>;
export type PlotFactory = (options: uPlot.Options, data: uPlot.AlignedData, target: HTMLElement) => PlotHandle;

export const createUPlot: PlotFactory = (options, data, target) => new uPlot(options, data, target);

/** Height from width: wide enough to read a 3–4 decade sweep, short enough to keep the page in view. */
export function chartSizeFor(width: number): ChartSize {
  const usable = Math.max(280, Math.floor(width));
  return { width: usable, height: Math.round(Math.min(440, Math.max(260, usable * 0.48))) };
}

/** What the host hands the controller on every update. */
export interface ChartInput {
  readonly result: SweepResult | undefined;
  readonly createPlot: PlotFactory;
}

/**
 * Owns the uPlot instance of a chart element: creates it after the host renders a result,
 * recreates it for a new result (the options carry per-result markers), follows the container's
 * width, and destroys it when the element leaves the page so no canvas or listener outlives it.
 * An element put back on the page draws its result again.
 */
export class InsertionLossChartController implements ReactiveController {
  private plot: PlotHandle | undefined;
  private shown: ChartInput | undefined;
  private shownWidth = 0;
  private observer: ResizeObserver | undefined;

  constructor(
    private readonly host: ReactiveControllerHost,
    private readonly input: () => ChartInput,
    /** Where the plot goes; undefined until the host has rendered. */
    private readonly container: () => HTMLElement | undefined,
  ) {
    host.addController(this);
  }

  hostConnected(): void {
    if (typeof ResizeObserver !== 'undefined') this.observer = new ResizeObserver(() => this.followWidth());
    // Put back on the page after a removal: hostUpdated redraws what was shown.
    if (this.shown?.result && !this.plot) this.host.requestUpdate();
  }

  hostUpdated(): void {
    const input = this.input();
    const unchanged = input.result === this.shown?.result && input.createPlot === this.shown?.createPlot;
    if (unchanged && (this.plot !== undefined || input.result === undefined)) return;
    this.draw(input);
  }

  hostDisconnected(): void {
    this.observer?.disconnect();
    this.observer = undefined;
    this.destroyPlot();
  }

  get hasPlot(): boolean {
    return this.plot !== undefined;
  }

  private draw(input: ChartInput): void {
    this.destroyPlot();
    this.shown = input;
    const target = this.container();
    if (!input.result || !target) return;
    this.shownWidth = target.clientWidth;
    const { options, data } = buildInsertionLossPlot(input.result, chartSizeFor(this.shownWidth));
    this.plot = input.createPlot(options, data, target);
    this.observer?.observe(target);
  }

  private followWidth(): void {
    const target = this.container();
    if (!this.plot || !target) return;
    // Only width drives the size: reacting to height would loop, as the plot sets the height.
    const width = target.clientWidth;
    if (width === this.shownWidth || width === 0) return;
    this.shownWidth = width;
    this.plot.setSize(chartSizeFor(width));
  }

  private destroyPlot(): void {
    this.observer?.disconnect();
    this.plot?.destroy();
    this.plot = undefined;
  }
}
