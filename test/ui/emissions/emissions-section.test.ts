import { afterEach, describe, expect, it } from 'vitest';
import { readDesign } from '../../../src/model/index.ts';
import { readScanText } from '../../../src/io/scan-csv.ts';
import { findPreset } from '../../../src/spectrum/limit-presets.ts';
import { DEFAULT_SCAN_TAG } from '../../../src/spectrum/spectrum-types.ts';
import type { PlotElement } from '../../../src/ui/charts/plot-element.ts';
import { type DesignEditEvent, EmissionsSection } from '../../../src/ui/emissions/emissions-section.ts';
import type { MarginTable } from '../../../src/ui/emissions/margin-table.ts';
import { emissionsDesignDocument } from '../support/emissions-fixtures.ts';
import { FakeEmissionsClient } from '../support/fake-emissions-client.ts';
import { fakePlotFactory } from '../support/fake-plot.ts';
import { FakeScanImporter } from '../support/fake-scan-importer.ts';

afterEach(() => {
  document.body.replaceChildren();
});

/** An invented line-1 scan with lobes at harmonics of 100 kHz, and two lines the reader cannot use. */
function scanText(): string {
  const lines = ['# INVENTED test scan', 'Frequency [MHz],Peak [dBuV],QP [dBuV],AV [dBuV]'];
  for (let i = 0; i < 200; i += 1) {
    const f = 0.15 * (200 ** (i / 199));
    const lobe = Math.abs(f * 10 - Math.round(f * 10)) < 0.03 ? 85 - 15 * Math.log10(f * 10) : 18;
    lines.push(`${f.toFixed(6)},${lobe.toFixed(2)},${(lobe - 3).toFixed(2)},${(lobe - 8).toFixed(2)}`);
    if (i === 20) lines.push('0.2,oops,1,1');
    if (i === 150) lines.push('1.5,12,x,3');
  }
  lines.push('end of data');
  return `${lines.join('\n')}\n`;
}

/** An invented file of which no line can be used. */
const BAD_SCAN = ['# INVENTED bad scan', 'Frequency [MHz],Peak [dBuV]', '0,40.5', '-0.2,41', '0.3,abc', '0.4,', 'the end'].join('\n');

function designOf(doc: unknown): NonNullable<EmissionsSection['design']> {
  const read = readDesign(doc);
  if (!read.ok) throw read.error;
  return read.value;
}

async function mount(options: { document?: Record<string, unknown>; demo?: boolean; demoText?: string } = {}) {
  const doc = options.document ?? emissionsDesignDocument();
  const analyzer = new FakeEmissionsClient();
  const importer = new FakeScanImporter();
  const { create, plots } = fakePlotFactory();
  const section = document.createElement('chokepoint-emissions');
  const edits: unknown[] = [];
  section.addEventListener('design-edit', (event: DesignEditEvent) => edits.push(event.detail.document));
  section.document = doc;
  section.design = designOf(doc);
  section.demo = options.demo ?? false;
  section.analyzer = analyzer;
  section.scanImporter = importer;
  section.createPlot = create;
  if (options.demoText !== undefined) {
    const text = options.demoText;
    section.loadDemoScan = () => Promise.resolve(text);
  }
  document.body.append(section);
  await settle(section);
  return { section, analyzer, importer, plots, edits };
}

/** Let promise callbacks run and every element in the section finish rendering. */
async function settle(section: EmissionsSection): Promise<void> {
  for (let i = 0; i < 4; i += 1) {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await section.updateComplete;
    for (const child of section.shadowRoot?.querySelectorAll('chokepoint-plot, chokepoint-margin-table') ?? []) {
      await (child as PlotElement | MarginTable).updateComplete;
    }
    const table = section.shadowRoot?.querySelector('chokepoint-margin-table');
    for (const plot of table?.shadowRoot?.querySelectorAll('chokepoint-plot') ?? []) await (plot as PlotElement).updateComplete;
  }
}

const root = (section: EmissionsSection): ShadowRoot => section.shadowRoot!;
const text = (node: ParentNode | null | undefined, selector: string): string =>
  node?.querySelector(selector)?.textContent?.replace(/\s+/gu, ' ').trim() ?? '';
const tableRoot = (section: EmissionsSection): ShadowRoot | null | undefined => root(section).querySelector('chokepoint-margin-table')?.shadowRoot;
const levelsPlot = (section: EmissionsSection): PlotElement | null => root(section).querySelector('chokepoint-plot.levels');

async function chooseFile(section: EmissionsSection, name: string, content: string): Promise<void> {
  const input = root(section).querySelector<HTMLInputElement>('input[type="file"]')!;
  Object.defineProperty(input, 'files', { configurable: true, value: [new File([content], name, { type: 'text/csv' })] });
  input.dispatchEvent(new Event('change'));
  await settle(section);
}

async function select(section: EmissionsSection, name: string, value: string): Promise<void> {
  const element = root(section).querySelector<HTMLSelectElement>(`select[name="${name}"]`)!;
  element.value = value;
  element.dispatchEvent(new Event('change'));
  await settle(section);
}

describe('<chokepoint-emissions>', () => {
  it('is registered under its tag', () => {
    expect(customElements.get('chokepoint-emissions')).toBe(EmissionsSection);
  });

  it('starts from the design’s noise estimate and renders the chart, the margin table and the attenuation needed', async () => {
    const { section, analyzer, plots } = await mount();
    expect(analyzer.requested).toHaveLength(1);
    expect(analyzer.requested[0]?.noise).toEqual({ kind: 'estimate' });
    expect(analyzer.requested[0]?.design).toBe(section.document);
    expect(text(root(section), '.analysis-status')).toBe('Analysing in the worker…');

    const outcome = analyzer.answer();
    await settle(section);
    if (outcome.status !== 'done') throw new Error('expected an analysis');
    expect(text(root(section), '.analysis-status')).toMatch(/^Predicted from the design’s noise estimate: \d+ points, 100 kHz to 30 MHz, in \d+ ms in the worker\.$/u);
    expect(section.analysis).toBe(outcome.analysis);
    // The levels chart and the small chart of the attenuation still needed.
    expect(plots).toHaveLength(2);
    expect(plots[0]?.options.series.map((s) => s.label)).toContain('limit: FCC Part 15 class B, average');
    expect(plots[1]?.options.series.map((s) => s.label)).toEqual(['Frequency', 'CM needed', 'DM needed']);
    expect(levelsPlot(section)?.note).toBeUndefined();
    expect(levelsPlot(section)?.getAttribute('label')).toMatch(/^Predicted levels from the design’s noise estimate against 2 limit lines/u);

    const table = tableRoot(section);
    expect(text(table, '.verdict strong')).toBe(outcome.analysis.report.pass ? 'PASS' : 'FAIL');
    const rows = [...(table?.querySelectorAll('tbody tr[data-band]') ?? [])].map((row) => row.getAttribute('data-band'));
    expect(rows).toEqual(['0.15–0.5 MHz', '0.5–5 MHz', '5–30 MHz']);
    expect(text(table, 'dd[data-mode="common mode"]')).toMatch(/^\d+\.\d dB$/u);
    expect(text(table, '.notes')).toContain('estimate: a line spectrum');
    expect(root(section).querySelector<HTMLInputElement>('input[value="estimate"]')?.checked).toBe(true);
  });

  it('keeps the last analysis on screen, dimmed, while a newer one runs, and ignores a superseded answer', async () => {
    const { section, analyzer, edits } = await mount();
    analyzer.answer();
    await settle(section);
    await select(section, 'attribution', 'common-mode');
    // The app takes the edit and hands the edited design back.
    section.document = edits[0];
    section.design = designOf(edits[0]);
    await settle(section);
    expect(analyzer.pending).toHaveLength(1);
    expect(root(section).querySelector('.stale chokepoint-plot')).not.toBeNull();
    analyzer.answerWith((requestId) => ({ status: 'superseded', requestId }));
    await settle(section);
    expect(root(section).querySelector('.stale')).not.toBeNull();
  });

  it('levels in dBµA go to the reader with the probe transfer impedance typed on the form', async () => {
    const { section, analyzer, importer } = await mount();
    analyzer.answer();
    await settle(section);
    await select(section, 'level-unit', 'dBuA');
    const impedance = root(section).querySelector<HTMLInputElement>('input[name="transfer-impedance"]')!;
    impedance.value = '5';
    impedance.dispatchEvent(new Event('change'));
    await settle(section);
    await chooseFile(section, 'probe.csv', scanText());
    expect(importer.requested[0]?.options).toMatchObject({ levelUnit: 'dBuA', transferImpedanceOhm: 5 });
  });

  it('reads a chosen scan file in the worker with a progress bar, then judges the scan, noting the attribution on the plot', async () => {
    const { section, analyzer, importer, plots } = await mount();
    analyzer.answer();
    await settle(section);
    await select(section, 'scan-tag', 'total');
    await select(section, 'frequency-unit', 'MHz');
    await chooseFile(section, 'bench scan.csv', scanText());
    expect(importer.requested).toEqual([{ text: scanText(), options: { name: 'bench scan.csv', tag: 'total', frequencyUnit: 'MHz' } }]);
    expect(root(section).querySelector('.import[data-state="reading"] progress')?.getAttribute('value')).toBe('0');
    importer.progress(0.4);
    await settle(section);
    expect(text(root(section), '.import[data-state="reading"]')).toBe('Reading bench scan.csv… 40 %');
    expect(root(section).querySelector('.import progress')?.getAttribute('value')).toBe('0.4');

    importer.answer();
    await settle(section);
    expect(analyzer.requested).toHaveLength(2);
    const noise = analyzer.requested[1]?.noise;
    expect(noise?.kind).toBe('scan');
    if (noise?.kind !== 'scan') throw new Error('expected a scan');
    expect(noise.scan.tag).toBe('total');
    expect(noise.scan.frequencyHz.length).toBe(200);
    expect(root(section).querySelector<HTMLInputElement>('input[value="scan"]')?.checked).toBe(true);
    expect(text(root(section), '.import[data-state="loaded"]')).toMatch(/^total, mode unknown; 200 points, 150 kHz to 30 MHz; peak, QP, AV; read in \d+ ms\./u);
    // The reader left two lines out: listed, collapsed, with their numbers.
    const leftOut = root(section).querySelector('.import details.rejected');
    expect(leftOut?.hasAttribute('open')).toBe(false);
    expect(text(leftOut, 'summary')).toBe('Lines left out: 2');
    expect([...(leftOut?.querySelectorAll('li') ?? [])].map((li) => li.textContent?.trim())).toEqual([
      expect.stringMatching(/^line 24: /u),
      expect.stringMatching(/^line 155: /u),
    ]);

    analyzer.answer();
    await settle(section);
    expect(levelsPlot(section)?.note).toBe('Mode unknown: the filter is credited with the smaller of its CM and DM improvements (worst case)');
    expect(levelsPlot(section)?.shadowRoot?.querySelector('[data-role="plot-note"]')?.textContent).toBe(levelsPlot(section)?.note);
    expect(plots.at(-2)?.options.series.map((s) => s.label)).toContain('scan as measured, QP');
    expect(text(root(section), '.analysis-status')).toMatch(/^Predicted from the scan “bench scan\.csv”: 200 points/u);

    // What the scan measured can be corrected after reading: a CM scan is credited with CM only.
    await select(section, 'scan-tag', 'common-mode');
    const retagged = analyzer.requested.at(-1)?.noise;
    expect(retagged?.kind === 'scan' && retagged.scan.tag).toBe('common-mode');
    analyzer.answer();
    await settle(section);
    expect(levelsPlot(section)?.note).toBeUndefined();

    // Back to the estimate, and to the scan again, without reading the file again.
    root(section).querySelector<HTMLInputElement>('input[value="estimate"]')!.dispatchEvent(new Event('change'));
    await settle(section);
    expect(analyzer.requested.at(-1)?.noise).toEqual({ kind: 'estimate' });
    root(section).querySelector<HTMLInputElement>('input[value="scan"]')!.dispatchEvent(new Event('change'));
    await settle(section);
    expect(analyzer.requested.at(-1)?.noise.kind).toBe('scan');
    expect(importer.requested).toHaveLength(1);
  });

  it('reads an untagged scan with the command line’s defaults: the same tag, units and trace labels', async () => {
    const { section, analyzer, importer } = await mount();
    analyzer.answer();
    await settle(section);
    await chooseFile(section, 'untagged.csv', scanText());
    const options = importer.requested[0]!.options!;
    // Only what the page knows (the file's name) and the shared default tag; units stay "as the file says".
    expect(options).toEqual({ name: 'untagged.csv', tag: DEFAULT_SCAN_TAG });
    const page = importer.answer();
    const cli = readScanText(scanText(), { name: 'untagged.csv' });
    if (!page.ok || !cli.ok) throw new Error('both must read');
    expect(page.scan.tag).toBe(cli.scan.tag);
    expect(page.scan.frequencyHz).toEqual(cli.scan.frequencyHz);
    expect(page.scan.traces).toEqual(cli.scan.traces);
  });

  it('a headerless scan in MHz read as Hz: the reader’s warning in the status area, and no result in the table', async () => {
    const { section, analyzer, importer } = await mount();
    analyzer.answer();
    await settle(section);
    await chooseFile(section, 'headerless.csv', '0.15,80\n0.5,70\n5,60\n30,55\n');
    importer.answer();
    await settle(section);
    const noise = analyzer.requested.at(-1)?.noise;
    if (noise?.kind !== 'scan') throw new Error('expected a scan');
    expect(noise.scan.warnings?.[0]).toMatch(/^check the frequency unit/u);
    analyzer.answer();
    await settle(section);
    expect(text(root(section), '.analysis-status .reader-warnings')).toMatch(/^Warning: check the frequency unit: the highest frequency is 30 Hz/u);
    const table = tableRoot(section);
    expect(text(table, '.verdict strong')).toBe('NO RESULT');
    expect(text(table, '.verdict .reasons')).toMatch(/nothing was judged: no point falls in any band: the scan spans 150 mHz to 30 Hz/u);
  });

  it('lists every rejected line of a file it cannot use, and leaves the design and the previous scan as they were', async () => {
    const { section, analyzer, importer, edits } = await mount();
    analyzer.answer();
    await chooseFile(section, 'good.csv', scanText());
    importer.answer();
    await settle(section);
    analyzer.answer();
    await settle(section);
    const shownBefore = section.analysis;
    const requestsBefore = analyzer.requested.length;

    await chooseFile(section, 'bad.csv', BAD_SCAN);
    importer.answer();
    await settle(section);
    const error = root(section).querySelector('.import-error');
    expect(error?.getAttribute('role')).toBe('alert');
    expect(text(error, 'p')).toMatch(/^bad\.csv could not be used: /u);
    expect(text(error, 'span')).toBe('The scan shown is still good.csv. The design is unchanged.');
    const lines = [...(error?.querySelectorAll('details.rejected li') ?? [])].map((li) => li.textContent?.replace(/\s+/gu, ' ').trim() ?? '');
    expect(text(error, 'details.rejected summary')).toBe('Rejected lines: 4');
    expect(lines).toEqual([
      'line 3: frequency must be positive, got 0',
      'line 4: frequency must be positive, got -0.2',
      'line 5: peak level "abc" is not a number',
      'line 6: missing column: 1 value, expected 2 (frequency, peak)',
    ]);
    expect(error?.querySelector('details.rejected')?.hasAttribute('open')).toBe(false);

    // Nothing else moved: no new analysis, no design edit, the same scan and analysis on screen.
    expect(analyzer.requested).toHaveLength(requestsBefore);
    expect(edits).toEqual([]);
    expect(section.analysis).toBe(shownBefore);
    expect(text(root(section), 'label.choice:nth-of-type(2)')).toContain('Scan: good.csv');
  });

  it('offers the invented demo scan on the demo and reads it through the same import, as line 1', async () => {
    const { section, analyzer, importer } = await mount({ demo: true, demoText: scanText() });
    analyzer.answer();
    await select(section, 'scan-tag', 'line2');
    const button = root(section).querySelector<HTMLButtonElement>('button.demo-scan');
    expect(button?.textContent?.trim()).toBe('Load the invented demo scan');
    button!.click();
    await settle(section);
    expect(importer.requested[0]?.options).toEqual({ name: 'invented-adapter-no-filter.csv', tag: 'line1' });
    importer.answer();
    await settle(section);
    expect(text(root(section), 'label.choice:nth-of-type(2)')).toBe('Scan: invented-adapter-no-filter.csv invented');
    expect(analyzer.requested.at(-1)?.noise.kind).toBe('scan');
  });

  it('does not offer the demo scan for a design that is not the demo', async () => {
    const { section } = await mount({ demoText: scanText() });
    expect(root(section).querySelector('button.demo-scan')).toBeNull();
  });

  it('sends the attribution, the target margin and the noise floor up as design edits, checked like a file', async () => {
    const { section, edits } = await mount();
    await select(section, 'attribution', 'differential-mode');
    expect(edits).toHaveLength(1);
    expect((edits[0] as { emissions: { attribution: string } }).emissions.attribution).toBe('differential-mode');

    const margin = root(section).querySelector<HTMLInputElement>('input[name="target-margin"]')!;
    margin.value = '75';
    margin.dispatchEvent(new Event('change'));
    await settle(section);
    expect(text(root(section), '.field-error')).toBe('Target margin: from -40 to 60');
    expect(margin.getAttribute('aria-invalid')).toBe('true');
    expect(edits).toHaveLength(1);

    margin.value = '3';
    margin.dispatchEvent(new Event('change'));
    await settle(section);
    expect(root(section).querySelector('.field-error')).toBeNull();
    expect((edits[1] as { emissions: { targetMarginDb: number } }).emissions.targetMarginDb).toBe(3);

    const floor = root(section).querySelector<HTMLInputElement>('input[name="noise-floor"]')!;
    expect(floor.value).toBe('20');
    floor.value = '';
    floor.dispatchEvent(new Event('change'));
    await settle(section);
    expect((edits[2] as { emissions: Record<string, unknown> }).emissions).not.toHaveProperty('noiseFloorDbuV');
    for (const edit of edits) expect(readDesign(edit).ok).toBe(true);
  });

  it('lists the design’s masks with detector and origin, adds a preset copy and removes a mask', async () => {
    const { section, edits } = await mount();
    const items = [...root(section).querySelectorAll('.masks li')];
    expect(items.map((li) => li.getAttribute('data-mask'))).toEqual(['fcc-15.107-class-b-qp', 'fcc-15.107-class-b-av']);
    expect(text(items[0], '.mask-name')).toBe('FCC Part 15 class B, quasi-peak');
    expect(text(items[0], '.mask-origin')).toContain('47 CFR Part 15 (FCC), §15.107');
    expect(items[1]?.textContent).toContain('average');

    const add = root(section).querySelector<HTMLButtonElement>('button.add-preset')!;
    expect(add.disabled).toBe(true);
    await select(section, 'preset', 'cispr11-group-1-class-a-qp');
    expect(add.disabled).toBe(false);
    add.click();
    await settle(section);
    const added = (edits[0] as { emissions: { masks: { id: string; name: string }[] } }).emissions.masks;
    expect(added.map((m) => m.id)).toEqual(['fcc-15.107-class-b-qp', 'fcc-15.107-class-b-av', 'cispr11-group-1-class-a-qp']);
    expect(added[2]?.name).toBe(findPreset('cispr11-group-1-class-a-qp')?.name);

    root(section).querySelector<HTMLButtonElement>('li[data-mask="fcc-15.107-class-b-qp"] button.remove')!.click();
    await settle(section);
    expect((edits[1] as { emissions: { masks: { id: string }[] } }).emissions.masks.map((m) => m.id)).toEqual(['fcc-15.107-class-b-av']);
  });

  it('asks for a scan when the design has no estimate, and sends nothing', async () => {
    const document = emissionsDesignDocument({ estimate: undefined });
    delete (document['emissions'] as Record<string, unknown>)['estimate'];
    const { section, analyzer } = await mount({ document });
    expect(analyzer.requested).toEqual([]);
    expect(text(root(section), '.idle')).toBe('No noise to judge yet: load a scan (this design has no noise estimate, emissions.estimate).');
    expect(root(section).querySelector<HTMLInputElement>('input[value="estimate"]')?.disabled).toBe(true);
  });

  it('shows the worker’s refusal', async () => {
    const { section, analyzer } = await mount();
    analyzer.answerWith((requestId) => ({
      status: 'error',
      requestId,
      error: { kind: 'invalid-design', message: 'invalid design: emissions.masks[0].id: bad', issues: [] },
    }));
    await settle(section);
    expect(text(root(section), '.analysis-status.error')).toBe('The analysis failed: invalid design: emissions.masks[0].id: bad');
  });

  it('says so when no analysis worker is connected', async () => {
    const doc = emissionsDesignDocument();
    const section = document.createElement('chokepoint-emissions');
    section.document = doc;
    section.design = designOf(doc);
    document.body.append(section);
    await settle(section);
    expect(text(root(section), '.analysis-status.error')).toBe('The analysis failed: no analysis worker is connected');
  });
});
