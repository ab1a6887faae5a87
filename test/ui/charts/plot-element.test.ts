import { afterEach, describe, expect, it } from 'vitest';
import type { PlotSource } from '../../../src/ui/charts/plot-controller.ts';
import { PlotElement } from '../../../src/ui/charts/plot-element.ts';
import { fakePlotFactory } from '../support/fake-plot.ts';

afterEach(() => {
  document.body.replaceChildren();
});

function source(name: string): PlotSource & { sizes: number[] } {
  const sizes: number[] = [];
  return {
    sizes,
    build: (size) => ({ options: { width: size.width, height: size.height, series: [{ label: name }] }, data: [[1, 2]] }),
    sizeFor: (width) => {
      sizes.push(width);
      return { width: Math.max(280, width), height: 200 };
    },
  };
}

async function mount(): Promise<{ element: PlotElement; plots: ReturnType<typeof fakePlotFactory>['plots'] }> {
  const { create, plots } = fakePlotFactory();
  const element = document.createElement('chokepoint-plot');
  element.createPlot = create;
  document.body.append(element);
  await element.updateComplete;
  return { element, plots };
}

describe('<chokepoint-plot>', () => {
  it('is registered under its tag', () => {
    expect(customElements.get('chokepoint-plot')).toBe(PlotElement);
  });

  it('says there is nothing to draw until it has a source', async () => {
    const { element, plots } = await mount();
    expect(element.shadowRoot?.querySelector('.empty')?.textContent).toBe('Nothing to draw yet.');
    expect(plots).toHaveLength(0);
    expect(element.drawn).toBe(false);
  });

  it('builds the plot from its source at the container’s width, with a label and an optional note over it', async () => {
    const { element, plots } = await mount();
    element.source = source('first');
    element.label = 'Predicted levels';
    await element.updateComplete;
    expect(plots).toHaveLength(1);
    expect(plots[0]?.options.series[0]?.label).toBe('first');
    expect(plots[0]?.target).toBe(element.shadowRoot?.querySelector('.plot'));
    expect(element.shadowRoot?.querySelector('.plot')?.getAttribute('aria-label')).toBe('Predicted levels');
    expect(element.shadowRoot?.querySelector('[data-role="plot-note"]')).toBeNull();

    element.note = 'Mode unknown: worst case';
    await element.updateComplete;
    expect(element.shadowRoot?.querySelector('[data-role="plot-note"]')?.textContent).toBe('Mode unknown: worst case');
    // A note alone does not rebuild the plot.
    expect(plots).toHaveLength(1);
  });

  it('rebuilds for a new source, and destroys the plot when the source goes or the element leaves', async () => {
    const { element, plots } = await mount();
    element.source = source('first');
    await element.updateComplete;
    element.source = source('second');
    await element.updateComplete;
    expect(plots).toHaveLength(2);
    expect(plots[0]?.destroyed).toBe(true);

    element.remove();
    expect(plots[1]?.destroyed).toBe(true);
    document.body.append(element);
    await element.updateComplete;
    expect(plots).toHaveLength(3);

    element.source = undefined;
    await element.updateComplete;
    expect(plots[2]?.destroyed).toBe(true);
    expect(element.drawn).toBe(false);
  });
});
