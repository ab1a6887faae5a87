import { join } from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import demo from '../../fixtures/demo/adapter-two-stage.design.json';
import { finalStatus, Planner, screenshots, shadowText } from './harness.ts';

// The emissions section of the built page, in Debian's Chromium: the estimate's margin table, the
// invented demo scan read in its worker with a progress bar, the attribution note on the plot, and a
// bad scan file that is refused line by line without disturbing anything else.

const planner = new Planner();
beforeAll(() => planner.start());
afterEach(() => planner.closePages());
afterAll(() => planner.stop());

/** An invented file of which no line can be used: each one is refused with its line number. */
const BAD_SCAN = ['# INVENTED bad scan for the browser test, not a measurement', 'Frequency [MHz],Peak [dBuV]', '0,40.5', '-0.2,41', '0.3,abc', '0.4,', 'the end'].join('\n');

const section = (page: Page): Locator => page.locator('chokepoint-emissions');
const bandRow = (page: Page, band: string): Locator => page.locator(`chokepoint-margin-table tr[data-band="${band}"]`);
const plotNote = (page: Page): Locator => page.locator('chokepoint-plot.levels [data-role="plot-note"]');

async function analysisDone(page: Page, what: RegExp): Promise<string> {
  const status = page.locator('chokepoint-emissions .analysis-status[data-state="done"]');
  await expect.poll(async () => ((await status.count()) > 0 ? await status.innerText() : ''), { timeout: 30_000 }).toMatch(what);
  return status.innerText();
}

/** Pixels of the levels chart near a colour, and how many are not white. */
async function levelsInk(page: Page, hex: string): Promise<{ width: number; near: number; nonWhite: number }> {
  return page.locator('chokepoint-plot.levels canvas').first().evaluate((canvas: HTMLCanvasElement, colour: string) => {
    // Read a copy: reading the plot's own canvas again and again makes Chromium warn.
    const copy = document.createElement('canvas');
    copy.width = canvas.width;
    copy.height = canvas.height;
    const ctx = copy.getContext('2d', { willReadFrequently: true });
    if (!ctx) throw new Error('no 2D context');
    ctx.drawImage(canvas, 0, 0);
    const r = Number.parseInt(colour.slice(1, 3), 16);
    const g = Number.parseInt(colour.slice(3, 5), 16);
    const b = Number.parseInt(colour.slice(5, 7), 16);
    const pixels = ctx.getImageData(0, 0, canvas.width, canvas.height).data;
    let near = 0;
    let nonWhite = 0;
    for (let i = 0; i < pixels.length; i += 4) {
      if (pixels[i + 3]! > 0 && pixels[i]! + pixels[i + 1]! + pixels[i + 2]! < 700) nonWhite += 1;
      if (Math.abs(pixels[i]! - r) + Math.abs(pixels[i + 1]! - g) + Math.abs(pixels[i + 2]! - b) < 60 && pixels[i + 3]! > 200) near += 1;
    }
    return { width: canvas.width, near, nonWhite };
  }, hex);
}

/** Record every value the import's progress bar shows, from inside the section's shadow root. */
async function watchProgress(page: Page): Promise<void> {
  await page.evaluate(() => {
    const root = document.querySelector('chokepoint-app')?.shadowRoot?.querySelector('chokepoint-emissions')?.shadowRoot;
    if (!root) throw new Error('no emissions section');
    const seen: number[] = [];
    (window as unknown as { progressSeen: number[] }).progressSeen = seen;
    const look = (): void => {
      const bar = root.querySelector('progress');
      if (bar) seen.push(bar.value);
    };
    new MutationObserver(look).observe(root, { subtree: true, childList: true, attributes: true, characterData: true });
  });
}

/** "2.118 MHz" → 2118000. */
function hertz(text: string): number {
  const match = /^([\d.]+) (Hz|kHz|MHz)$/u.exec(text.trim());
  if (!match) throw new Error(`not a frequency: ${text}`);
  return Number(match[1]) * { Hz: 1, kHz: 1e3, MHz: 1e6 }[match[2] as 'Hz' | 'kHz' | 'MHz'];
}

async function scrollToSection(page: Page): Promise<void> {
  await page.locator('#emissions-title').scrollIntoViewIfNeeded();
  await page.evaluate(() => {
    const title = document.querySelector('chokepoint-app')?.shadowRoot?.querySelector('#emissions-title');
    title?.scrollIntoView({ block: 'start' });
  });
}

describe('the emissions section of the planner', () => {
  it('starts from the demo’s noise estimate and shows its margin table, chart and attenuation needed', async () => {
    const record = await planner.open();
    const { page } = record;
    expect((await finalStatus(page)).tone).toBe('done');
    const status = await analysisDone(page, /^Predicted from the design’s noise estimate: \d+ points/u);
    expect(status).toMatch(/in \d+ ms in the worker\.$/u);
    await expect(page.locator('#emissions-title').innerText()).resolves.toBe('Emissions and margin');
    await expect(page.locator('chokepoint-emissions input[value="estimate"]').isChecked()).resolves.toBe(true);

    const verdict = await page.locator('chokepoint-margin-table .verdict strong').innerText();
    expect(['PASS', 'FAIL']).toContain(verdict);
    expect(await page.locator('chokepoint-margin-table tr[data-band]').count()).toBe(3);
    for (const band of ['0.15–0.5 MHz', '0.5–5 MHz', '5–30 MHz']) {
      expect(await bandRow(page, band).innerText()).toMatch(/-?\d+\.\d dB[\s\S]*(k|M)Hz[\s\S]*dBµV[\s\S]*(PASS|FAIL)/u);
    }
    const table = await shadowText(page, 'chokepoint-margin-table');
    expect(table).toMatch(/Worst peaks, lowest margin first/u);
    expect(table).toMatch(/common mode\s+\d+\.\d dB\s+at /u);
    expect(table).toContain('estimate: a line spectrum');
    // The estimate is credited by mode already: no attribution note on the plot.
    expect(await plotNote(page).count()).toBe(0);

    const ink = await levelsInk(page, '#9b1c1c');
    expect(ink.width).toBeGreaterThan(500);
    expect(ink.near).toBeGreaterThan(300);
    expect(await page.locator('chokepoint-margin-table chokepoint-plot canvas').count()).toBeGreaterThan(0);
    const masks = await section(page).locator('.masks li').allInnerTexts();
    expect(masks).toHaveLength(demo.emissions.masks.length);
    expect(masks[0]).toContain(demo.emissions.masks[0]!.name);

    await scrollToSection(page);
    await page.screenshot({ path: join(screenshots, 'emissions-estimate-1280x800.png') });
    await page.screenshot({ path: join(screenshots, 'emissions-estimate-full.png'), fullPage: true });
    expect(record.consoleErrors).toEqual([]);
    planner.expectOnlyLocalTraffic(record);
  });

  it('reads the invented demo scan with a progress bar, fails 0.15–0.5 MHz and passes the rest, and notes the attribution on the plot', async () => {
    const record = await planner.open();
    const { page } = record;
    await analysisDone(page, /noise estimate/u);
    await watchProgress(page);
    await page.getByRole('button', { name: 'Load the invented demo scan' }).click();
    const status = await analysisDone(page, /^Predicted from the scan “invented-adapter-no-filter\.csv”: \d+ points, 150 kHz to 30 MHz/u);
    expect(status).toContain('in the worker');
    const progress = await page.evaluate(() => (window as unknown as { progressSeen: number[] }).progressSeen);
    expect(progress.length).toBeGreaterThan(0);
    expect(Math.min(...progress)).toBeLessThan(1);

    await expect(page.locator('chokepoint-emissions input[value="scan"]').isChecked()).resolves.toBe(true);
    await expect(section(page).locator('label.choice').nth(1).innerText()).resolves.toMatch(/Scan: invented-adapter-no-filter\.csv\s+invented/iu);
    await expect(section(page).locator('.import[data-state="loaded"]').innerText()).resolves.toMatch(/^line 1; \d+ points, 150 kHz to 30 MHz; peak, QP, AV/u);

    expect(await bandRow(page, '0.15–0.5 MHz').innerText()).toContain('FAIL');
    expect(await bandRow(page, '0.5–5 MHz').innerText()).toContain('PASS');
    expect(await bandRow(page, '5–30 MHz').innerText()).toContain('PASS');
    await expect(page.locator('chokepoint-margin-table .verdict strong').innerText()).resolves.toBe('FAIL');
    const table = await shadowText(page, 'chokepoint-margin-table');
    expect(table).toMatch(/scan taken with no filter fitted/u);
    expect(table).toMatch(/at or below the noise floor/u);

    await expect(plotNote(page).innerText()).resolves.toBe('Mode unknown: the filter is credited with the smaller of its CM and DM improvements (worst case)');
    expect((await levelsInk(page, '#9b1c1c')).near).toBeGreaterThan(300);
    await scrollToSection(page);
    await page.screenshot({ path: join(screenshots, 'emissions-demo-scan-1280x800.png') });
    await page.screenshot({ path: join(screenshots, 'emissions-demo-scan-full.png'), fullPage: true });

    // Credit the whole scan to common mode: the worker runs again and the note says so.
    await section(page).locator('select[name="attribution"]').selectOption('common-mode');
    await expect.poll(() => plotNote(page).innerText(), { timeout: 30_000 }).toBe('Mode unknown: the scan is treated as common-mode noise (CM improvement only)');
    await section(page).locator('select[name="attribution"]').selectOption('differential-mode');
    await expect.poll(() => plotNote(page).innerText(), { timeout: 30_000 }).toBe('Mode unknown: the scan is treated as differential-mode noise (DM improvement only)');
    await expect(page.locator('chokepoint-emissions .analysis-status[data-state="done"]').count()).resolves.toBe(1);

    // Zoom in by dragging across the chart and back out with a double-click: the legend reads the
    // frequency under the cursor, so it shows which stretch of the axis is drawn.
    await page.locator('chokepoint-plot.levels').scrollIntoViewIfNeeded();
    const box = await page.locator('chokepoint-plot.levels .u-over').boundingBox();
    if (!box) throw new Error('no plot area');
    const y = box.y + box.height * 0.5;
    const at = async (fraction: number): Promise<number> => {
      await page.mouse.move(box.x + box.width * fraction, y);
      return hertz(await page.locator('chokepoint-plot.levels .u-legend tr').first().locator('.u-value').innerText());
    };
    const [f30, f45, f50] = [await at(0.3), await at(0.45), await at(0.5)];
    expect(f30).toBeLessThan(f45);
    await page.mouse.move(box.x + box.width * 0.3, y);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.45, y, { steps: 5 });
    await page.mouse.up();
    await expect.poll(() => at(0.5), { timeout: 10_000 }).toBeLessThan(f45);
    const zoomed = await at(0.5);
    expect(zoomed).toBeGreaterThan(f30);
    expect((await levelsInk(page, '#9b1c1c')).nonWhite).toBeGreaterThan(2000);
    await page.mouse.dblclick(box.x + box.width * 0.5, y);
    await expect.poll(() => at(0.5), { timeout: 10_000 }).toBeGreaterThan(f45);
    expect(Math.abs(Math.log10((await at(0.5)) / f50))).toBeLessThan(0.01);

    expect(record.consoleErrors).toEqual([]);
    planner.expectOnlyLocalTraffic(record);
  });

  it('refuses a bad scan file line by line and leaves the insertion-loss chart and the design untouched', async () => {
    const record = await planner.open();
    const { page } = record;
    await finalStatus(page);
    await analysisDone(page, /noise estimate/u);
    const insertionLoss = (): Promise<string> => page.locator('chokepoint-insertion-loss-chart canvas').first().evaluate((canvas: HTMLCanvasElement) => canvas.toDataURL());
    const before = {
      chart: await insertionLoss(),
      stages: await shadowText(page, 'chokepoint-stage-list'),
      name: await page.locator('.design-name').innerText(),
      status: await page.locator('.status').innerText(),
      table: await shadowText(page, 'chokepoint-margin-table'),
      masks: await section(page).locator('.masks li').allInnerTexts(),
    };

    await section(page).locator('input[type="file"]').setInputFiles({ name: 'invented-bad-scan.csv', mimeType: 'text/csv', buffer: Buffer.from(BAD_SCAN) });
    const error = section(page).locator('.import-error');
    await error.waitFor({ timeout: 30_000 });
    await expect(error.locator('p').innerText()).resolves.toMatch(/^invented-bad-scan\.csv could not be used: nothing usable in the file: all 4 data lines were rejected/u);
    await expect(error.innerText()).resolves.toContain('Nothing was loaded. The design is unchanged.');
    await error.locator('details.rejected summary').click();
    expect(await error.locator('details.rejected li').allInnerTexts()).toEqual([
      'line 3: frequency must be positive, got 0',
      'line 4: frequency must be positive, got -0.2',
      'line 5: peak level "abc" is not a number',
      'line 6: missing column: 1 value, expected 2 (frequency, peak)',
    ]);
    await scrollToSection(page);
    await page.screenshot({ path: join(screenshots, 'emissions-bad-scan-1280x800.png') });

    expect(await insertionLoss()).toBe(before.chart);
    expect(await shadowText(page, 'chokepoint-stage-list')).toBe(before.stages);
    expect(await page.locator('.design-name').innerText()).toBe(before.name);
    expect(await page.locator('.status').innerText()).toBe(before.status);
    expect(await shadowText(page, 'chokepoint-margin-table')).toBe(before.table);
    expect(await section(page).locator('.masks li').allInnerTexts()).toEqual(before.masks);
    await expect(page.locator('chokepoint-emissions input[value="estimate"]').isChecked()).resolves.toBe(true);
    await expect(page.locator('chokepoint-emissions input[value="scan"]').isDisabled()).resolves.toBe(true);
    expect(record.consoleErrors).toEqual([]);
    planner.expectOnlyLocalTraffic(record);
  });

  it('gives no result for a headerless scan in MHz read as Hz, and shows the reader’s warning beside it', async () => {
    const record = await planner.open();
    const { page } = record;
    await analysisDone(page, /noise estimate/u);
    const file = { name: 'invented-headerless-mhz.csv', mimeType: 'text/csv', buffer: Buffer.from('0.15,80\n0.5,70\n5,60\n30,55\n') };
    await section(page).locator('input[type="file"]').setInputFiles(file);
    await analysisDone(page, /^Predicted from the scan “invented-headerless-mhz\.csv”: 4 points, 150 mHz to 30 Hz/u);
    await expect(section(page).locator('.analysis-status .reader-warnings').innerText()).resolves.toMatch(/^Warning: check the frequency unit/u);
    await expect(page.locator('chokepoint-margin-table .verdict strong').innerText()).resolves.toBe('NO RESULT');
    await expect(page.locator('chokepoint-margin-table .verdict .reasons').innerText()).resolves.toMatch(/the scan spans 150 mHz to 30 Hz/u);
    for (const band of ['0.15–0.5 MHz', '0.5–5 MHz', '5–30 MHz']) expect(await bandRow(page, band).innerText()).toContain('NOT COVERED');
    expect(record.consoleErrors).toEqual([]);
    planner.expectOnlyLocalTraffic(record);
  });

  it('refuses a UTF-16 scan file by name instead of reading replaced bytes', async () => {
    const record = await planner.open();
    const { page } = record;
    await analysisDone(page, /noise estimate/u);
    const utf16 = Buffer.from('\uFEFF# INVENTED\nFrequency [MHz],Peak [dBµV]\n0.15,60\n30,40\n', 'utf16le');
    await section(page).locator('input[type="file"]').setInputFiles({ name: 'invented-utf16.csv', mimeType: 'text/csv', buffer: utf16 });
    const error = section(page).locator('.import-error');
    await error.waitFor({ timeout: 30_000 });
    await expect(error.locator('p').innerText()).resolves.toBe(
      'invented-utf16.csv could not be used: not UTF-8 text: the file is UTF-16 LE text (its byte-order mark says so): save it as UTF-8',
    );
    expect(record.consoleErrors).toEqual([]);
    planner.expectOnlyLocalTraffic(record);
  });

  it('reads and judges a million-point scan in the workers while the page stays responsive', { timeout: 120_000 }, async () => {
    const record = await planner.open();
    const { page } = record;
    await finalStatus(page);
    await analysisDone(page, /noise estimate/u);
    await watchProgress(page);
    // Made in the page and handed to the file input as a user's file would be: an invented line-1
    // scan, 150 kHz to 30 MHz in 29.85 Hz steps, lobes at harmonics of 65 kHz over a 16 dBµV floor.
    await page.evaluate(() => {
      const n = 1_000_000;
      const lines: string[] = ['# INVENTED million-point scan for the browser test', 'Frequency [MHz],Peak [dBuV],QP [dBuV],AV [dBuV]'];
      for (let i = 0; i < n; i += 1) {
        const f = 0.15 + ((30 - 0.15) * i) / (n - 1);
        const harmonic = Math.round(f / 0.065);
        const lobe = Math.abs(f - harmonic * 0.065) < 0.004 ? 90 - 20 * Math.log10(harmonic) : 16 + (i % 7) * 0.1;
        lines.push(`${f.toFixed(7)},${lobe.toFixed(2)},${(lobe - 2).toFixed(2)},${(lobe - 5).toFixed(2)}`);
      }
      const input = document.querySelector('chokepoint-app')?.shadowRoot?.querySelector('chokepoint-emissions')?.shadowRoot?.querySelector('input[type="file"]');
      if (!(input instanceof HTMLInputElement)) throw new Error('no file input');
      const transfer = new DataTransfer();
      transfer.items.add(new File([lines.join('\n')], 'invented-million.csv', { type: 'text/csv' }));
      input.files = transfer.files;
      input.dispatchEvent(new Event('change', { bubbles: true }));
    });

    // While the workers read and analyse, the main thread keeps answering: the insertion-loss
    // legend follows the mouse.
    await section(page).locator('.import[data-state="loaded"], .analysis-status[data-state="running"]').first().waitFor({ timeout: 60_000 });
    await page.locator('chokepoint-insertion-loss-chart').scrollIntoViewIfNeeded();
    const box = await page.locator('chokepoint-insertion-loss-chart .u-over').boundingBox();
    if (!box) throw new Error('no insertion-loss plot');
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
    await expect(page.locator('chokepoint-insertion-loss-chart .u-legend').innerText()).resolves.toMatch(/\d+(\.\d+)? [kM]Hz/u);

    const status = await analysisDone(page, /^Predicted from the scan “invented-million\.csv”: 1000000 points, 150 kHz to 30 MHz/u);
    expect(status).toContain('in the worker');
    const progress = await page.evaluate(() => (window as unknown as { progressSeen: number[] }).progressSeen);
    // The progress bar moved while the file was read, in steps between 0 and 1.
    expect(progress.filter((value) => value > 0 && value < 1).length).toBeGreaterThan(3);
    expect(await bandRow(page, '0.15–0.5 MHz').innerText()).toMatch(/FAIL|PASS/u);
    expect((await levelsInk(page, '#9b1c1c')).near).toBeGreaterThan(300);
    await scrollToSection(page);
    await page.screenshot({ path: join(screenshots, 'emissions-million-1280x800.png') });
    expect(record.consoleErrors).toEqual([]);
    planner.expectOnlyLocalTraffic(record);
  });
});

