import type { ReactiveController, ReactiveControllerHost } from 'lit';
import type uPlot from 'uplot';
import type { PlotFactory, PlotHandle } from './chart-controller.ts';
import type { ChartSize } from './log-frequency-axis.ts';

/** Something a plot can be built from: options and data for a size, and how tall it is for a width. */
export interface PlotSource {
  build(size: ChartSize): { readonly options: uPlot.Options; readonly data: uPlot.AlignedData };
  sizeFor(width: number): ChartSize;
}

/**
 * Owns the uPlot instance of an element for any PlotSource (the insertion-loss chart has its own,
 * older controller): builds the plot after the host renders a source, rebuilds it for a new source,
 * follows the container's width, and destroys it when the element leaves the page so no canvas or
 * listener outlives it. An element put back on the page draws its source again.
 */
export class PlotController implements ReactiveController {
  private plot: PlotHandle | undefined;
  private shownSource: PlotSource | undefined;
  private shownFactory: PlotFactory | undefined;
  private shownWidth = 0;
  private observer: ResizeObserver | undefined;

  constructor(
    private readonly host: ReactiveControllerHost,
    private readonly input: () => { readonly source: PlotSource | undefined; readonly createPlot: PlotFactory },
    /** Where the plot goes; undefined until the host has rendered. */
    private readonly container: () => HTMLElement | undefined,
  ) {
    host.addController(this);
  }

  hostConnected(): void {
    if (typeof ResizeObserver !== 'undefined') this.observer = new ResizeObserver(() => this.followWidth());
    if (this.shownSource && !this.plot) this.host.requestUpdate();
  }

  hostUpdated(): void {
    const { source, createPlot } = this.input();
    const unchanged = source === this.shownSource && createPlot === this.shownFactory;
    if (unchanged && (this.plot !== undefined || source === undefined)) return;
    this.draw(source, createPlot);
  }

  hostDisconnected(): void {
    this.observer?.disconnect();
    this.observer = undefined;
    this.destroyPlot();
  }

  get hasPlot(): boolean {
    return this.plot !== undefined;
  }

  private draw(source: PlotSource | undefined, createPlot: PlotFactory): void {
    this.destroyPlot();
    this.shownSource = source;
    this.shownFactory = createPlot;
    const target = this.container();
    if (!source || !target) return;
    this.shownWidth = target.clientWidth;
    const { options, data } = source.build(source.sizeFor(this.shownWidth));
    this.plot = createPlot(options, data, target);
    this.observer?.observe(target);
  }

  private followWidth(): void {
    const target = this.container();
    if (!this.plot || !target || !this.shownSource) return;
    // Only width drives the size: reacting to height would loop, as the plot sets the height.
    const width = target.clientWidth;
    if (width === this.shownWidth || width === 0) return;
    this.shownWidth = width;
    this.plot.setSize(this.shownSource.sizeFor(width));
  }

  private destroyPlot(): void {
    this.observer?.disconnect();
    this.plot?.destroy();
    this.plot = undefined;
  }
}
