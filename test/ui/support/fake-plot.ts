import type uPlot from 'uplot';
import type { PlotFactory, PlotHandle } from '../../../src/ui/charts/chart-controller.ts';

/** One plot the chart asked for, and what happened to it since. */
export interface FakePlot extends PlotHandle {
  readonly options: uPlot.Options;
  readonly data: uPlot.AlignedData;
  readonly target: HTMLElement;
  readonly sizes: { width: number; height: number }[];
  destroyed: boolean;
}

/**
 * happy-dom has no canvas, so uPlot cannot draw there: the chart gets this factory instead and
 * the tests check what it was asked to draw and when it was resized or destroyed.
 */
export function fakePlotFactory(): { create: PlotFactory; plots: FakePlot[] } {
  const plots: FakePlot[] = [];
  const create: PlotFactory = (options, data, target) => {
    const plot: FakePlot = {
      options,
      data,
      target,
      sizes: [],
      destroyed: false,
      setSize(size) {
        plot.sizes.push(size);
      },
      destroy() {
        plot.destroyed = true;
      },
    };
    plots.push(plot);
    return plot;
  };
  return { create, plots };
}
