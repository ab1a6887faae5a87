import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { type BrowserContext, chromium, type Page } from 'playwright-core';
import { preview, type PreviewServer } from 'vite';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import demo from '../../fixtures/demo/adapter-two-stage.design.json';
import { encodeDesignHash } from '../../src/io/design-url.ts';

// The built app (dist/, from `npx vite build`) served by vite preview and driven in Debian's
// Chromium. Nothing may leave the machine: every request must go to the local server.

const repoRoot = fileURLToPath(new URL('../../', import.meta.url));
const screenshots = join(repoRoot, 'screenshots');
const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-default-apps',
];

let server: PreviewServer | undefined;
let context: BrowserContext | undefined;
let userDataDir: string | undefined;
let origin = '';

/** Everything a page did that a test must check: console errors, uncaught errors, requests. */
interface PageRecord {
  readonly page: Page;
  readonly consoleErrors: string[];
  readonly requests: string[];
}
const openPages: PageRecord[] = [];

beforeAll(async () => {
  if (!existsSync(join(repoRoot, 'dist', 'index.html'))) {
    throw new Error('dist/index.html is missing: run `npx vite build` before the e2e tests');
  }
  mkdirSync(screenshots, { recursive: true });
  server = await preview({
    configFile: resolve(repoRoot, 'vite.config.ts'),
    logLevel: 'silent',
    preview: { host: '127.0.0.1', port: 0, strictPort: true, open: false },
  });
  const address = server.httpServer.address() as AddressInfo;
  origin = `http://127.0.0.1:${address.port}`;
  userDataDir = mkdtempSync(join(tmpdir(), 'chokepoint-e2e-'));
  context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: CHROMIUM_ARGS,
    viewport: { width: 1280, height: 800 },
    deviceScaleFactor: 1,
  });
});

afterEach(async () => {
  for (const record of openPages.splice(0)) await record.page.close();
});

afterAll(async () => {
  await context?.close();
  await server?.close();
  if (userDataDir) rmSync(userDataDir, { recursive: true, force: true });
});

async function openPlanner(hash = ''): Promise<PageRecord> {
  if (!context) throw new Error('the browser did not start');
  const page = await context.newPage();
  const record: PageRecord = { page, consoleErrors: [], requests: [] };
  openPages.push(record);
  page.on('console', (message) => {
    if (message.type() === 'error' || message.type() === 'warning') record.consoleErrors.push(`${message.type()}: ${message.text()}`);
  });
  page.on('pageerror', (error) => record.consoleErrors.push(`uncaught: ${error.message}`));
  page.on('request', (request) => record.requests.push(request.url()));
  page.on('worker', (worker) => record.requests.push(worker.url()));
  await page.goto(`${origin}/${hash}`);
  return record;
}

/** Wait until the status line leaves "sweeping" and return its tone and text. */
/** The visible text inside a component's shadow root (a host's innerText leaves it out). */
async function shadowText(page: Page, host: string): Promise<string> {
  return (await page.locator(host).locator(':scope > *').allInnerTexts()).join('\n');
}

async function finalStatus(page: Page): Promise<{ tone: string; text: string }> {
  const status = page.locator('.status:not([data-tone="busy"]):not([data-tone="idle"])');
  await status.waitFor({ timeout: 30_000 });
  return { tone: (await status.getAttribute('data-tone')) ?? '', text: await status.innerText() };
}

function expectOnlyLocalTraffic(record: PageRecord): void {
  const foreign = record.requests.filter((url) => !url.startsWith(`${origin}/`) && !url.startsWith('data:') && !url.startsWith('blob:'));
  expect(foreign).toEqual([]);
  expect(record.requests.length).toBeGreaterThan(0);
}

/** Count canvas pixels near each colour, reading the plot canvas inside the chart's shadow root. */
async function canvasInk(page: Page): Promise<{ width: number; height: number; cm: number; dm: number; nonWhite: number }> {
  return page.locator('chokepoint-insertion-loss-chart canvas').first().evaluate((canvas: HTMLCanvasElement) => {
    const ctx = canvas.getContext('2d');
    if (!ctx) throw new Error('no 2D context');
    const { width, height } = canvas;
    const pixels = ctx.getImageData(0, 0, width, height).data;
    const near = (i: number, r: number, g: number, b: number): boolean =>
      Math.abs(pixels[i]! - r) + Math.abs(pixels[i + 1]! - g) + Math.abs(pixels[i + 2]! - b) < 60 && pixels[i + 3]! > 200;
    let cm = 0;
    let dm = 0;
    let nonWhite = 0;
    for (let i = 0; i < pixels.length; i += 4) {
      if (pixels[i + 3]! > 0 && pixels[i]! + pixels[i + 1]! + pixels[i + 2]! < 700) nonWhite += 1;
      if (near(i, 0x1f, 0x5f, 0xa8)) cm += 1;
      if (near(i, 0xb3, 0x59, 0x00)) dm += 1;
    }
    return { width, height, cm, dm, nonWhite };
  });
}

describe('the planner page', () => {
  it('sweeps and draws the invented demo: status, chart, legend, lists, caution', async () => {
    const record = await openPlanner();
    const { page } = record;
    const status = await finalStatus(page);
    expect(status.tone).toBe('done');
    const points = Number(/Swept (\d+) points/u.exec(status.text)?.[1]);
    expect(points).toBeGreaterThan(0);
    expect(status.text).toMatch(/in [\d.]+ m?s in the worker/u);

    await expect(page.locator('h1').innerText()).resolves.toBe('chokepoint');
    await expect(page.locator('.design-name').innerText()).resolves.toBe(demo.name);
    await expect(page.locator('.origin.invented').innerText()).resolves.toMatch(/invented demo/iu);

    const ink = await canvasInk(page);
    expect(ink.width).toBeGreaterThan(300);
    expect(ink.height).toBeGreaterThan(200);
    expect(ink.nonWhite).toBeGreaterThan(2000);
    expect(ink.cm).toBeGreaterThan(300);
    expect(ink.dm).toBeGreaterThan(300);

    const legend = await page.locator('chokepoint-insertion-loss-chart .u-legend').innerText();
    for (const label of ['CM in circuit', 'CM 50 Ω/50 Ω', 'DM in circuit', 'DM 50 Ω/50 Ω']) expect(legend).toContain(label);

    const stages = await shadowText(page, 'chokepoint-stage-list');
    for (const text of ['Stage 1, converter side', 'Stage 2, mains inlet', 'CX1', 'LCM1', '100 nF', '2.2 mH', 'value per winding', 'line to line', 'line 1 to ground']) {
      expect(stages).toContain(text);
    }
    expect(await shadowText(page, 'chokepoint-resonance-list')).toMatch(/LCM1 2\.2 mH choke, CM impedance: parallel self-resonance/u);
    await expect(page.locator('chokepoint-warning-list').isVisible()).resolves.toBe(true);
    expect(await shadowText(page, 'chokepoint-safety-note')).toMatch(/Y capacitors[\s\S]*X capacitors[\s\S]*local electrical codes/u);

    await page.screenshot({ path: join(screenshots, 'planner-demo-1280x800.png') });
    await page.screenshot({ path: join(screenshots, 'planner-demo-full.png'), fullPage: true });
    expect(record.consoleErrors).toEqual([]);
    expectOnlyLocalTraffic(record);
  });

  it('reads out values under the cursor in the legend', async () => {
    const record = await openPlanner();
    const { page } = record;
    await finalStatus(page);
    const box = await page.locator('chokepoint-insertion-loss-chart .u-over').boundingBox();
    if (!box) throw new Error('no plot area');
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
    const legend = await page.locator('chokepoint-insertion-loss-chart .u-legend').innerText();
    expect(legend).toMatch(/\d+(\.\d+)? [kM]Hz/u);
    expect(legend).toMatch(/-?\d+\.\d dB/u);
    expect(record.consoleErrors).toEqual([]);
  });

  it('uses a design passed in the URL hash', async () => {
    const linked = structuredClone(demo);
    linked.name = 'Linked design: one stage only';
    linked.stages = linked.stages.slice(0, 1);
    const record = await openPlanner(encodeDesignHash(linked));
    const { page } = record;
    const status = await finalStatus(page);
    expect(status.tone).toBe('done');
    await expect(page.locator('.design-name').innerText()).resolves.toBe('Linked design: one stage only');
    await expect(page.locator('.origin').innerText()).resolves.toMatch(/from the link/iu);
    expect(await page.locator('.origin.invented').count()).toBe(0);
    const stages = await shadowText(page, 'chokepoint-stage-list');
    expect(stages).toContain('Stage 1, converter side');
    expect(stages).not.toContain('Stage 2, mains inlet');
    expect((await canvasInk(page)).cm).toBeGreaterThan(300);
    expect(record.consoleErrors).toEqual([]);
    expectOnlyLocalTraffic(record);
  });

  it('shows a clear error for a hash that is not a design, draws nothing, and recovers to the demo', async () => {
    const record = await openPlanner('#design=not*base64');
    const { page } = record;
    const status = await finalStatus(page);
    expect(status.tone).toBe('error');
    expect(status.text).toContain('The design in the link cannot be used, so nothing is drawn.');
    expect(status.text).toContain('not base64url text: character "*" at position 4');
    expect(await page.locator('chokepoint-insertion-loss-chart canvas').count()).toBe(0);
    expect(await shadowText(page, 'chokepoint-insertion-loss-chart')).toContain('Nothing drawn.');
    await page.screenshot({ path: join(screenshots, 'planner-bad-link.png') });

    await page.getByText('Open the invented demo instead').click();
    expect((await finalStatus(page)).tone).toBe('done');
    expect((await canvasInk(page)).dm).toBeGreaterThan(300);
    expect(record.consoleErrors).toEqual([]);
    expectOnlyLocalTraffic(record);
  });

  it('names the bad field of an invalid design in the hash', async () => {
    const broken = structuredClone(demo);
    broken.stages[1]!.elements[0]!.part.capacitance = '330 nH';
    const record = await openPlanner(encodeDesignHash(broken));
    const status = await finalStatus(record.page);
    expect(status.tone).toBe('error');
    expect(status.text).toContain('stages[1].elements[0].part.capacitance: cannot read "330 nH": expected F, got H');
    expect(await record.page.locator('chokepoint-insertion-loss-chart canvas').count()).toBe(0);
    await record.page.screenshot({ path: join(screenshots, 'planner-invalid-design.png') });
    expect(record.consoleErrors).toEqual([]);
  });

  it('stays readable on a narrow window', async () => {
    const record = await openPlanner();
    const { page } = record;
    await page.setViewportSize({ width: 420, height: 900 });
    await finalStatus(page);
    const ink = await canvasInk(page);
    expect(ink.width).toBeLessThanOrEqual(420);
    expect(ink.cm).toBeGreaterThan(100);
    await page.screenshot({ path: join(screenshots, 'planner-narrow-420.png'), fullPage: true });
    expect(record.consoleErrors).toEqual([]);
  });
});
