import { afterEach, describe, expect, it } from 'vitest';
import { chartSizeFor } from '../../../src/ui/charts/chart-controller.ts';
import { InsertionLossChart } from '../../../src/ui/charts/insertion-loss-chart.ts';
import { syntheticSweep } from '../support/synthetic-sweep.ts';
import { fakePlotFactory } from '../support/fake-plot.ts';

afterEach(() => {
  document.body.replaceChildren();
});

async function mountChart(): Promise<{ chart: InsertionLossChart; plots: ReturnType<typeof fakePlotFactory>['plots'] }> {
  const { create, plots } = fakePlotFactory();
  const chart = document.createElement('chokepoint-insertion-loss-chart');
  chart.createPlot = create;
  document.body.append(chart);
  await chart.updateComplete;
  return { chart, plots };
}

describe('<chokepoint-insertion-loss-chart>', () => {
  it('is registered under its prefixed tag', () => {
    expect(customElements.get('chokepoint-insertion-loss-chart')).toBe(InsertionLossChart);
    expect(document.createElement('chokepoint-insertion-loss-chart')).toBeInstanceOf(InsertionLossChart);
  });

  it('says there is nothing to draw until a result arrives, and makes no plot', async () => {
    const { chart, plots } = await mountChart();
    expect(chart.shadowRoot?.querySelector('.empty')?.textContent).toBe('Nothing to draw yet.');
    chart.emptyText = 'Sweeping…';
    await chart.updateComplete;
    expect(chart.shadowRoot?.querySelector('.empty')?.textContent).toBe('Sweeping…');
    expect(plots).toHaveLength(0);
    expect(chart.drawn).toBe(false);
  });

  it('draws a result into its plot container with a describing label', async () => {
    const { chart, plots } = await mountChart();
    const result = syntheticSweep();
    chart.result = result;
    await chart.updateComplete;
    expect(plots).toHaveLength(1);
    const container = chart.shadowRoot?.querySelector('.plot');
    expect(plots[0]?.target).toBe(container);
    expect(plots[0]?.options.series.map((series) => series.label)).toContain('DM in circuit');
    expect(plots[0]?.data[0]).toBe(result.frequencyHz);
    expect(container?.getAttribute('aria-label')).toMatch(/^Insertion loss of Synthetic filter, /u);
    expect(chart.shadowRoot?.querySelector('.empty')).toBeNull();
    expect(chart.drawn).toBe(true);
  });

  it('replaces the plot for a new result and destroys the old one', async () => {
    const { chart, plots } = await mountChart();
    chart.result = syntheticSweep();
    await chart.updateComplete;
    chart.result = syntheticSweep({ name: 'second', startHz: 150e3 });
    await chart.updateComplete;
    expect(plots).toHaveLength(2);
    expect(plots[0]?.destroyed).toBe(true);
    expect(plots[1]?.destroyed).toBe(false);
    // An unrelated update does not rebuild the plot.
    chart.emptyText = 'other';
    await chart.updateComplete;
    expect(plots).toHaveLength(2);
  });

  it('destroys the plot when the result goes away or the element leaves the page, and redraws when put back', async () => {
    const { chart, plots } = await mountChart();
    chart.result = syntheticSweep();
    await chart.updateComplete;
    chart.remove();
    expect(plots[0]?.destroyed).toBe(true);
    expect(chart.drawn).toBe(false);

    document.body.append(chart);
    await chart.updateComplete;
    expect(plots).toHaveLength(2);
    expect(chart.drawn).toBe(true);

    chart.result = undefined;
    await chart.updateComplete;
    expect(plots[1]?.destroyed).toBe(true);
    expect(chart.drawn).toBe(false);
  });

  it('sizes the plot from the width it is given', () => {
    expect(chartSizeFor(800)).toEqual({ width: 800, height: 384 });
    expect(chartSizeFor(0)).toEqual({ width: 280, height: 260 });
    expect(chartSizeFor(2000).height).toBe(440);
  });
});
