import { afterEach, describe, expect, it } from 'vitest';
import demo from '../../../fixtures/demo/adapter-two-stage.design.json';
import type { SweepOutcome } from '../../../src/client/sweep-outcome.ts';
import { encodeDesignHash } from '../../../src/io/design-url.ts';
import { ChokepointApp } from '../../../src/ui/app/chokepoint-app.ts';
import type { InsertionLossChart } from '../../../src/ui/charts/insertion-loss-chart.ts';
import { syntheticSweep } from '../support/synthetic-sweep.ts';
import { fakePlotFactory } from '../support/fake-plot.ts';
import { FakeEmissionsClient } from '../support/fake-emissions-client.ts';
import { FakeSweepClient } from '../support/fake-sweep-client.ts';

afterEach(async () => {
  document.body.replaceChildren();
  await setHash('');
});

/** Set the location hash and let the browser's hashchange event go by. */
async function setHash(hash: string): Promise<void> {
  window.location.hash = hash;
  await new Promise((resolve) => setTimeout(resolve, 0));
}

async function mountApp(hash = '') {
  await setHash(hash);
  const client = new FakeSweepClient();
  const { create, plots } = fakePlotFactory();
  const app = document.createElement('chokepoint-app');
  app.sweepClient = client;
  app.createPlot = create;
  document.body.append(app);
  await settle(app);
  return { app, client, plots };
}

/** Let promise callbacks run and every element in the app finish rendering. */
async function settle(app: ChokepointApp): Promise<void> {
  for (let i = 0; i < 3; i += 1) {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await app.updateComplete;
    const chart = chartOf(app);
    if (chart) await chart.updateComplete;
  }
}

const chartOf = (app: ChokepointApp): InsertionLossChart | null | undefined => app.shadowRoot?.querySelector('chokepoint-insertion-loss-chart');
const text = (app: ChokepointApp, selector: string): string => app.shadowRoot?.querySelector(selector)?.textContent?.replace(/\s+/gu, ' ').trim() ?? '';
const statusTone = (app: ChokepointApp): string | null | undefined => app.shadowRoot?.querySelector('.status')?.getAttribute('data-tone');

const demoResult = syntheticSweep({ name: demo.name });
const done = (result = demoResult) => (requestId: number): SweepOutcome => ({ status: 'done', requestId, result, elapsedMs: 42 });

describe('<chokepoint-app>', () => {
  it('is registered under its tag', () => {
    expect(customElements.get('chokepoint-app')).toBe(ChokepointApp);
  });

  it('shows the invented demo, labelled as invented, and sweeps it', async () => {
    const { app, client, plots } = await mountApp();
    expect(text(app, 'h1')).toBe('chokepoint');
    expect(text(app, '.purpose')).toMatch(/conducted-emission tests/u);
    expect(text(app, '.design-name')).toBe(demo.name);
    expect(text(app, '.origin.invented')).toMatch(/invented demo/iu);
    expect(client.requested).toEqual([demo]);
    expect(statusTone(app)).toBe('busy');
    expect(text(app, '.status')).toContain('Sweeping');

    client.answer(done());
    await settle(app);
    expect(statusTone(app)).toBe('done');
    expect(text(app, '.status')).toBe(`Swept ${demoResult.frequencyHz.length} points, 9 kHz to 30 MHz, in 42 ms in the worker.`);
    expect(plots).toHaveLength(1);
    expect(chartOf(app)?.result).toBe(demoResult);
    expect(app.shadowRoot?.querySelector('chokepoint-resonance-list')?.result).toBe(demoResult);
    expect(app.shadowRoot?.querySelector('chokepoint-warning-list')?.warnings).toBe(demoResult.warnings);
    expect(app.shadowRoot?.querySelector('chokepoint-stage-list')?.design?.name).toBe(demo.name);
    expect(app.shadowRoot?.querySelector('chokepoint-safety-note')).not.toBeNull();
  });

  it('shows a clear error for a hash that is not base64url, draws nothing and asks for no sweep', async () => {
    const { app, client, plots } = await mountApp('#design=%%%');
    expect(statusTone(app)).toBe('error');
    expect(text(app, '.status')).toContain('The design in the link cannot be used, so nothing is drawn.');
    expect(text(app, '.status')).toContain('not base64url text: character "%" at position 1');
    expect(client.requested).toEqual([]);
    expect(plots).toHaveLength(0);
    expect(chartOf(app)?.result).toBeUndefined();
    expect(text(app, '.design-name')).toBe('No design shown');
    expect(app.shadowRoot?.querySelector('a[href="#"]')?.textContent).toBe('Open the invented demo instead');
  });

  it('names the field of an invalid design in the hash', async () => {
    const broken = structuredClone(demo);
    broken.stages[0]!.elements[0]!.placement = 'sideways';
    const { app, client } = await mountApp(encodeDesignHash(broken));
    expect(statusTone(app)).toBe('error');
    expect(text(app, '.status li')).toMatch(/^stages\[0\]\.elements\[0\]\.placement: expected one of "series-line1"/u);
    expect(client.requested).toEqual([]);
  });

  it('uses a design from the hash, marked as coming from the link', async () => {
    const linked = { ...demo, name: 'From a colleague' };
    const { app, client } = await mountApp(encodeDesignHash(linked));
    expect(text(app, '.design-name')).toBe('From a colleague');
    expect(text(app, '.origin')).toBe('From the link');
    expect(app.shadowRoot?.querySelector('.origin.invented')).toBeNull();
    expect(client.requested).toEqual([linked]);
  });

  it('follows the hash when it changes, and drops a sweep that returns for the design it left', async () => {
    const { app, client, plots } = await mountApp();
    const linked = { ...demo, name: 'Second design' };
    app.showDesignFromHash(encodeDesignHash(linked));
    await settle(app);
    expect(client.requested).toHaveLength(2);

    // The demo's sweep comes back late: it must not be drawn under the second design's name.
    client.answer(done());
    await settle(app);
    expect(statusTone(app)).toBe('busy');
    expect(plots).toHaveLength(0);

    const second = syntheticSweep({ name: 'Second design', startHz: 150e3 });
    client.answer(done(second));
    await settle(app);
    expect(statusTone(app)).toBe('done');
    expect(chartOf(app)?.result).toBe(second);
    expect(text(app, '.design-name')).toBe('Second design');
  });

  it('shows a bad link after a good design without crashing, then draws nothing', async () => {
    const { app, client } = await mountApp();
    client.answer(done());
    await settle(app);
    app.showDesignFromHash('#design=abc');
    await settle(app);
    expect(statusTone(app)).toBe('error');
    expect(chartOf(app)?.result).toBeUndefined();
  });

  it('shows the worker’s refusal with its issue paths', async () => {
    const { app, client } = await mountApp();
    client.answer((requestId) => ({
      status: 'error',
      requestId,
      error: {
        kind: 'invalid-design',
        message: 'invalid design: stages[0].id: missing',
        issues: [{ path: 'stages[0].id', code: 'missing-field', message: 'missing' }],
      },
    }));
    await settle(app);
    expect(statusTone(app)).toBe('error');
    expect(text(app, '.status p')).toBe('The design is invalid, so nothing is drawn.');
    expect(text(app, '.status li')).toBe('stages[0].id: missing');
  });

  it('says so when the sweep worker fails', async () => {
    const { app, client } = await mountApp();
    client.answer((requestId) => ({
      status: 'error',
      requestId,
      error: { kind: 'worker-failure', message: 'the sweep worker stopped: out of memory', issues: [] },
    }));
    await settle(app);
    expect(text(app, '.status p')).toBe('The sweep failed, so nothing is drawn: the sweep worker stopped: out of memory');
  });

  it('ignores a superseded outcome', async () => {
    const { app, client } = await mountApp();
    client.answer((requestId) => ({ status: 'superseded', requestId }));
    await settle(app);
    expect(statusTone(app)).toBe('busy');
  });

  it('reports a missing sweep client instead of throwing', async () => {
    const app = document.createElement('chokepoint-app');
    document.body.append(app);
    await settle(app);
    expect(text(app, '.status p')).toBe('The sweep failed, so nothing is drawn: no sweep worker is connected');
  });

  it('follows hashchange events while on the page, once per new hash, and stops once removed', async () => {
    const { app, client } = await mountApp();
    await setHash(encodeDesignHash({ ...demo, name: 'while shown' }));
    await settle(app);
    expect(client.requested).toHaveLength(2);
    expect(text(app, '.design-name')).toBe('while shown');
    window.dispatchEvent(new HashChangeEvent('hashchange'));
    await settle(app);
    expect(client.requested).toHaveLength(2);

    app.remove();
    await setHash(encodeDesignHash({ ...demo, name: 'after removal' }));
    expect(client.requested).toHaveLength(2);
  });

  it('shows the emissions section for a ready design, starting from the demo’s noise estimate', async () => {
    await setHash('');
    const emissions = new FakeEmissionsClient();
    const app = document.createElement('chokepoint-app');
    app.sweepClient = new FakeSweepClient();
    app.emissionsClient = emissions;
    app.createPlot = fakePlotFactory().create;
    document.body.append(app);
    await settle(app);
    expect(text(app, '#emissions-title')).toBe('Emissions and margin');
    const section = app.shadowRoot?.querySelector('chokepoint-emissions');
    expect(section?.demo).toBe(true);
    expect(emissions.requested).toEqual([{ design: demo, noise: { kind: 'estimate' } }]);

    app.showDesignFromHash('#design=abc');
    await settle(app);
    expect(app.shadowRoot?.querySelector('chokepoint-emissions')).toBeNull();
  });

  it('takes a design edit from the emissions section: the design changes, the sweep stands, the analysis runs again', async () => {
    await setHash('');
    const sweeps = new FakeSweepClient();
    const emissions = new FakeEmissionsClient();
    const app = document.createElement('chokepoint-app');
    app.sweepClient = sweeps;
    app.emissionsClient = emissions;
    app.createPlot = fakePlotFactory().create;
    document.body.append(app);
    await settle(app);
    sweeps.answer(done());
    emissions.answer();
    await settle(app);

    const section = app.shadowRoot!.querySelector('chokepoint-emissions')!;
    const attribution = section.shadowRoot!.querySelector<HTMLSelectElement>('select[name="attribution"]')!;
    attribution.value = 'common-mode';
    attribution.dispatchEvent(new Event('change'));
    await settle(app);
    await section.updateComplete;
    await settle(app);

    expect(sweeps.requested).toHaveLength(1);
    expect(statusTone(app)).toBe('done');
    expect(emissions.requested).toHaveLength(2);
    const edited = emissions.requested[1]?.design as typeof demo;
    expect(edited.emissions.attribution).toBe('common-mode');
    expect(edited.stages).toEqual(demo.stages);
    expect(section.design?.emissions?.attribution).toBe('common-mode');
    // The demo object itself is never changed.
    expect(demo.emissions.attribution).toBe('both');
  });
});

