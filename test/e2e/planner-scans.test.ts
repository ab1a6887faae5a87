import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { Planner } from './harness.ts';
import { activeDocument, settle, shoot } from './planner-driver.ts';

/**
 * Scans in the planner, in Debian's Chromium: a bad file refused line by line with nothing changed,
 * a scan that judges nothing giving no result (never a pass) with the reader's warning beside it, a
 * UTF-16 file refused by name, and a million-point scan read and judged in the workers while the page
 * keeps answering.
 */

const planner = new Planner();
const profiles: Planner[] = [];

beforeAll(async () => {
  await planner.start();
});

afterEach(async () => {
  for (const profile of profiles.splice(0)) await profile.stop();
});

afterAll(async () => {
  await planner.stop();
});

async function freshPage() {
  const profile = await planner.otherProfile();
  profiles.push(profile);
  return { profile, record: await profile.open() };
}

/** An invented file of which no line can be used: each one is refused with its line number. */
const BAD_SCAN = ['# INVENTED bad scan for the browser test, not a measurement', 'Frequency [MHz],Peak [dBuV]', '0,40.5', '-0.2,41', '0.3,abc', '0.4,', 'the end'].join('\n');

describe('scans in the planner', () => {
  it('refuses a bad scan file line by line and changes nothing', async () => {
    const { profile, record } = await freshPage();
    const { page } = record;
    await settle(page);
    const before = { document: await activeDocument(page), table: await page.locator('chokepoint-margin-table').locator('table.bands').innerText() };
    await page.locator('chokepoint-scan-panel input[type="file"]').setInputFiles({ name: 'invented-bad-scan.csv', mimeType: 'text/csv', buffer: Buffer.from(BAD_SCAN) });
    const failed = page.locator('chokepoint-scan-panel .failed');
    await failed.waitFor({ timeout: 30_000 });
    expect(await failed.locator('p').innerText()).toMatch(/^invented-bad-scan\.csv could not be used: nothing usable in the file: all 4 data lines were rejected/u);
    await failed.locator('details summary').click();
    expect(await failed.locator('details li').allInnerTexts()).toEqual([
      'line 3: frequency must be positive, got 0',
      'line 4: frequency must be positive, got -0.2',
      'line 5: peak level "abc" is not a number',
      'line 6: missing column: 1 value, expected 2 (frequency, peak)',
    ]);
    await shoot(page, 'scans-bad-file');
    expect(await activeDocument(page)).toEqual(before.document);
    expect(await page.locator('chokepoint-scan-panel [data-scan]').count()).toBe(0);
    expect(await page.locator('chokepoint-margin-table').locator('table.bands').innerText()).toBe(before.table);
    expect(record.consoleErrors).toEqual([]);
    profile.expectOnlyLocalTraffic(record);
  });

  it('gives no result for a headerless scan in MHz read as Hz, with the reader’s warning beside it', async () => {
    const { record } = await freshPage();
    const { page } = record;
    await settle(page);
    const file = { name: 'invented-headerless-mhz.csv', mimeType: 'text/csv', buffer: Buffer.from('0.15,80\n0.5,70\n5,60\n30,55\n') };
    await page.locator('chokepoint-scan-panel input[type="file"]').setInputFiles(file);
    await expect.poll(async () => page.locator('chokepoint-scan-panel [data-scan]').count()).toBe(1);
    await settle(page);
    await expect.poll(() => page.locator('chokepoint-planner .reader-warnings').innerText()).toMatch(/^Warning: check the frequency unit/u);
    expect(await page.locator('chokepoint-margin-table .verdict strong').innerText()).toBe('NO RESULT');
    expect(await page.locator('chokepoint-margin-table .verdict').innerText()).toMatch(/the scan spans 150 mHz to 30 Hz/u);
    for (const band of ['0.15–0.5 MHz', '0.5–5 MHz', '5–30 MHz']) expect(await page.locator(`chokepoint-margin-table tr[data-band="${band}"]`).innerText()).toContain('NOT COVERED');
    // And the variants table does not call it a pass either.
    expect(await page.locator('chokepoint-variant-table tbody tr').first().innerText()).not.toMatch(/PASS/u);
    await shoot(page, 'scans-no-result', ['insertion-loss']);
    expect(record.consoleErrors).toEqual([]);
  });

  it('refuses a UTF-16 scan file by name instead of reading replaced bytes', async () => {
    const { record } = await freshPage();
    const { page } = record;
    await settle(page);
    const utf16 = Buffer.from('\uFEFF# INVENTED\nFrequency [MHz],Peak [dBµV]\n0.15,60\n30,40\n', 'utf16le');
    await page.locator('chokepoint-scan-panel input[type="file"]').setInputFiles({ name: 'invented-utf16.csv', mimeType: 'text/csv', buffer: utf16 });
    const failed = page.locator('chokepoint-scan-panel .failed');
    await failed.waitFor({ timeout: 30_000 });
    expect(await failed.locator('p').innerText()).toBe('invented-utf16.csv could not be used: not UTF-8 text: the file is UTF-16 LE text (its byte-order mark says so): save it as UTF-8');
    expect(record.consoleErrors).toEqual([]);
  });

  it('reads and judges a million-point scan in the workers while the page keeps answering', { timeout: 180_000 }, async () => {
    const { record } = await freshPage();
    const { page } = record;
    await settle(page);
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
      const planner = document.querySelector('chokepoint-planner')!;
      const input = planner.shadowRoot!.querySelector('chokepoint-scan-panel')!.shadowRoot!.querySelector<HTMLInputElement>('input[type="file"]')!;
      const transfer = new DataTransfer();
      transfer.items.add(new File([lines.join('\n')], 'invented-million.csv', { type: 'text/csv' }));
      input.files = transfer.files;
      input.dispatchEvent(new Event('change', { bubbles: true }));
    });
    // While the worker reads, the page answers: the cursor readout follows a key on a plot.
    await page.locator('chokepoint-scan-panel [data-state="reading"]').waitFor({ timeout: 60_000 });
    await page.locator('chokepoint-plot-panel').nth(2).locator('.plot').focus();
    await page.keyboard.press('ArrowRight');
    await expect.poll(() => page.locator('chokepoint-cursor-readout .head').innerText(), { timeout: 10_000 }).toMatch(/^At \d/u);
    await expect.poll(async () => page.locator('chokepoint-scan-panel [data-scan]').count(), { timeout: 120_000 }).toBe(1);
    await settle(page);
    await expect.poll(() => page.locator('chokepoint-planner .status[data-state="swept"]').innerText(), { timeout: 60_000 }).toMatch(/1000000 points, judged at \d+, binned to the receiver’s resolution/u);
    expect(await page.locator('chokepoint-margin-table tr[data-band="0.15–0.5 MHz"]').innerText()).toMatch(/FAIL|PASS/u);
    await shoot(page, 'scans-million');
    expect(record.consoleErrors).toEqual([]);
  });
});
