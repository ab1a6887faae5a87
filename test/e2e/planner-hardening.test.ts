import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { Planner, repoRoot, screenshots } from './harness.ts';
import { activeDocument, savedRevision, selectPart, settle, typeField, variantNames } from './planner-driver.ts';

/**
 * The page is hard to fool and hard to break: names from files are text, never markup (in the page,
 * the drawing, the plots' legends and the report); a damaged saved record is kept aside and the last
 * good work is shown; the built page carries its Content-Security-Policy; and once loaded it works
 * with the network gone.
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

async function profile(): Promise<Planner> {
  const fresh = await planner.otherProfile();
  profiles.push(fresh);
  return fresh;
}

const MARKUP = '<img src=x onerror="window.__pwned=1"><script>window.__pwned=2</script>&amp;';

describe('text from files is text', () => {
  it('markup in every name field stays text: page, drawing, legends and the report', async () => {
    const browser = await profile();
    const { page } = await browser.open();
    await settle(page);
    const demo = JSON.parse(readFileSync(join(repoRoot, 'fixtures/demo/adapter-two-stage.design.json'), 'utf8')) as {
      name: string;
      description: string;
      stages: { label?: string; elements: { label?: string }[] }[];
      emissions: { masks: { name: string }[] };
    };
    demo.name = `Design ${MARKUP}`;
    demo.description = `Notes ${MARKUP}`;
    demo.stages[0]!.label = `Stage ${MARKUP}`;
    demo.stages[0]!.elements[0]!.label = `Part ${MARKUP}`;
    demo.emissions.masks[0]!.name = `Limit ${MARKUP}`;
    const file = join(screenshots, 'markup.design.json');
    writeFileSync(file, JSON.stringify(demo));
    await page.locator('chokepoint-file-actions input[type="file"]').setInputFiles(file);
    await expect.poll(async () => (await variantNames(page)).length).toBe(2);
    await settle(page);
    // Nothing ran, no element was made from the text, and the text is shown as written.
    expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
    const images = await page.evaluate(() => {
      const walk = (root: Document | ShadowRoot): number => {
        let n = root.querySelectorAll('img, script:not([src])').length;
        for (const host of root.querySelectorAll('*')) if (host.shadowRoot) n += walk(host.shadowRoot);
        return n;
      };
      return walk(document);
    });
    expect(images).toBe(0);
    expect(await page.locator('chokepoint-planner header select').innerText()).toContain('<img src=x onerror=');
    expect(await page.locator('chokepoint-filter-drawing svg').textContent()).toContain('<img src=x');
    expect(await page.locator('chokepoint-plot-panel').first().locator('.u-legend').innerText()).toContain('Limit <img src=x');
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), page.locator('chokepoint-file-actions').getByRole('button', { name: 'Report' }).click()]);
    const reportPath = join(screenshots, 'markup.report.html');
    await download.saveAs(reportPath);
    const html = readFileSync(reportPath, 'utf8');
    expect(html).not.toContain('<img src=x');
    expect(html).not.toContain('<script>window');
    expect(html).toContain('&lt;img src=x');
  });
});

describe('saved work that is damaged', () => {
  it('is kept aside as a backup, the user is told, and the last good work is shown', async () => {
    const browser = await profile();
    const first = await browser.open();
    await settle(first.page);
    await selectPart(first.page, 'CX1');
    const before = await savedRevision(first.page);
    await typeField(first.page, 'Capacitance', '220n');
    await expect.poll(() => savedRevision(first.page)).toBeGreaterThan(before);
    await first.page.close();
    // A second visit reads the record (and keeps it as the last good one); then the record is damaged.
    const second = await browser.open();
    await settle(second.page);
    const good = await activeDocument(second.page);
    await second.page.evaluate(
      () =>
        new Promise<void>((resolve, reject) => {
          const open = indexedDB.open('chokepoint');
          open.onsuccess = () => {
            const tx = open.result.transaction('workspace', 'readwrite');
            tx.objectStore('workspace').put({ format: 'chokepoint-workspace', version: 1, revision: 99, damaged: 'yes' }, 'current');
            tx.oncomplete = () => resolve();
            tx.onerror = () => reject(tx.error);
          };
          open.onerror = () => reject(open.error);
        }),
    );
    await second.page.close();
    const third = await browser.open();
    await settle(third.page);
    await expect.poll(async () => (await third.page.locator('chokepoint-planner .notice.error').allInnerTexts()).join(' ')).toMatch(/could not be read.*kept aside as a backup/su);
    expect(await activeDocument(third.page)).toEqual(good);
    const backups = await third.page.evaluate(
      () =>
        new Promise<number>((resolve) => {
          const open = indexedDB.open('chokepoint');
          open.onsuccess = () => {
            const request = open.result.transaction('backups').objectStore('backups').count();
            request.onsuccess = () => resolve(request.result);
          };
        }),
    );
    expect(backups).toBe(1);
  });
});

describe('the built page', () => {
  it('carries its Content-Security-Policy as a meta tag and a header, and runs under it', async () => {
    const browser = await profile();
    const record = await browser.open();
    const response = await record.page.goto(`${browser.origin}/`);
    const header = response?.headers()['content-security-policy'] ?? '';
    expect(header).toMatch(/script-src 'self'/u);
    expect(header).not.toMatch(/unsafe-inline|unsafe-eval/u);
    const meta = await record.page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
    expect(meta).toMatch(/default-src 'none'; script-src 'self'/u);
    await settle(record.page);
    // Any refused script, style or worker would show as a console error.
    expect(record.consoleErrors).toEqual([]);
  });

  it('once loaded, works with the network gone: edits, the demo scan, a report', async () => {
    const browser = await profile();
    const record = await browser.open();
    const { page } = record;
    await settle(page);
    await page.waitForTimeout(2000);
    await page.context().setOffline(true);
    try {
      await selectPart(page, 'CX2');
      await typeField(page, 'Capacitance', '680n');
      await settle(page);
      await page.locator('chokepoint-scan-panel').getByRole('button', { name: 'Load the invented demo scan' }).click();
      await expect.poll(async () => page.locator('chokepoint-scan-panel [data-scan]').count(), { timeout: 30_000 }).toBe(1);
      await settle(page);
      const [download] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), page.locator('chokepoint-file-actions').getByRole('button', { name: 'Report' }).click()]);
      expect(download.suggestedFilename()).toMatch(/\.report\.html$/u);
    } finally {
      await page.context().setOffline(false);
    }
    expect(record.consoleErrors).toEqual([]);
  });
});
