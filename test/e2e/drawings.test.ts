import { mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { type Browser, chromium, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import demoJson from '../../fixtures/demo/adapter-two-stage.design.json';
import { PLOT_PALETTE } from '../../src/drawing/plot-palette.ts';
import { ladderToSvg } from '../../src/drawing/ladder-svg.ts';
import { drawPlot, plotToSvg } from '../../src/drawing/plot-svg.ts';
import { requireDesign } from '../../src/model/index.ts';
import { svgToPngBlob } from '../../src/ui/drawing/svg-to-png.ts';
import { oneElementDesign, twentyElementDesign } from '../support/ladder-designs.ts';
import { emissionsSpec, impedanceSpec, insertionLossSpec, lineSpectrumSpec } from '../support/sample-plots.ts';
import { repoRoot, screenshots } from './harness.ts';

const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-default-apps'];

// The SVG drawings (plots and the drawn filter) rendered by Debian's Chromium: each is screenshot
// into screenshots/drawing-*.png for a person to look at, and painted on a canvas to check that
// the curves and parts were really drawn (their colours cover enough pixels), not a blank frame.

let browser: Browser | undefined;
let page: Page;

beforeAll(async () => {
  mkdirSync(screenshots, { recursive: true });
  browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: CHROMIUM_ARGS });
  page = await browser.newPage({ viewport: { width: 1280, height: 800 }, deviceScaleFactor: 1 });
  // No request leaves the page: anything but the inline content fails the test.
  await page.route('**/*', (route) => route.abort());
});

afterAll(async () => {
  await browser?.close();
});

/** Shows one SVG alone on the page, screenshots it, and counts pixels near each colour on a canvas. */
async function render(name: string, svgText: string, colours: readonly string[]): Promise<number[]> {
  await page.setContent(`<!doctype html><html><body style="margin:0;background:#fff"><div id="drawing" style="display:inline-block">${svgText}</div></body></html>`);
  await page.locator('#drawing').screenshot({ path: join(screenshots, `drawing-${name}.png`) });
  return await page.evaluate(
    async ({ text, wanted }) => {
      const image = new Image();
      image.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(text)}`;
      await image.decode();
      const canvas = document.createElement('canvas');
      canvas.width = image.naturalWidth;
      canvas.height = image.naturalHeight;
      const context = canvas.getContext('2d')!;
      context.drawImage(image, 0, 0);
      const data = context.getImageData(0, 0, canvas.width, canvas.height).data;
      const rgb = wanted.map((hex) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16)));
      const counts = wanted.map(() => 0);
      for (let p = 0; p < data.length; p += 4) {
        rgb.forEach((c, k) => {
          if (Math.abs(data[p]! - c[0]!) + Math.abs(data[p + 1]! - c[1]!) + Math.abs(data[p + 2]! - c[2]!) < 90) counts[k]! += 1;
        });
      }
      return counts;
    },
    { text: svgText, wanted: colours },
  );
}

const light = PLOT_PALETTE.light;

describe('plots drawn by Chromium', () => {
  it('emissions: the limits and the prediction are drawn', async () => {
    const [limit, predicted] = await render('plot-emissions', plotToSvg(emissionsSpec(), { width: 900, height: 420 }), [light['limit-1'], light.peak]);
    expect(limit).toBeGreaterThan(800);
    expect(predicted).toBeGreaterThan(800);
  });

  it('insertion loss with a band, variants and marks; and in the dark theme', async () => {
    const [cm, dm] = await render('plot-insertion-loss', plotToSvg(insertionLossSpec(), { width: 900, height: 420 }), [light['common-mode'], light['differential-mode']]);
    expect(cm).toBeGreaterThan(1000);
    expect(dm).toBeGreaterThan(1000);
    const dark = PLOT_PALETTE.dark;
    const [darkCm] = await render('plot-insertion-loss-dark', plotToSvg(insertionLossSpec(), { width: 900, height: 420, theme: 'dark' }), [dark['common-mode']]);
    expect(darkCm).toBeGreaterThan(1000);
  });

  it('part impedances on a log axis, and a line spectrum of dots', async () => {
    const [capacitor] = await render('plot-part-impedance', plotToSvg(impedanceSpec(), { width: 900, height: 420 }), [light['series-1']]);
    expect(capacitor).toBeGreaterThan(600);
    const [dots] = await render('plot-line-spectrum', plotToSvg(lineSpectrumSpec(), { width: 900, height: 420 }), [light['quasi-peak']]);
    expect(dots).toBeGreaterThan(600);
  });

  it('a PNG made from the SVG has the drawing’s size and is not blank', async () => {
    const spec = insertionLossSpec();
    const { layout } = drawPlot(spec, { width: 600, height: 300 });
    const text = plotToSvg(spec, { width: 600, height: 300 });
    await page.setContent('<!doctype html><html><body></body></html>');
    // The function's own source, put in the page as a script (it imports nothing, so it runs as it stands).
    await page.addScriptTag({ content: `window.svgToPngBlob = ${svgToPngBlob.toString()};` });
    const result = await page.evaluate(
      async ({ svgText, width, height }) => {
        const convert = (window as unknown as { svgToPngBlob: (t: string, w: number, h: number, s: number) => Promise<Blob> }).svgToPngBlob;
        const blob = await convert(svgText, width, height, 2);
        const bitmap = await createImageBitmap(blob);
        const canvas = new OffscreenCanvas(bitmap.width, bitmap.height);
        const context = canvas.getContext('2d')!;
        context.drawImage(bitmap, 0, 0);
        const data = context.getImageData(0, 0, bitmap.width, bitmap.height).data;
        let ink = 0;
        for (let p = 0; p < data.length; p += 4) if (data[p]! + data[p + 1]! + data[p + 2]! < 600) ink += 1;
        return { type: blob.type, width: bitmap.width, height: bitmap.height, ink };
      },
      { svgText: text, width: layout.width, height: layout.height },
    );
    expect(result.type).toBe('image/png');
    expect(result.width).toBe(layout.width * 2);
    expect(result.height).toBe(layout.height * 2);
    expect(result.ink).toBeGreaterThan(20_000);
  });
});

describe('the drawn filter in Chromium', () => {
  const demo = requireDesign(demoJson);
  const example = requireDesign(JSON.parse(readFileSync(join(repoRoot, 'fixtures/examples/engineering-notation.design.json'), 'utf8')));

  it.each([
    ['ladder-demo', () => ladderToSvg(demo, { selectedElementId: 'LCM1' })],
    ['ladder-example', () => ladderToSvg(example)],
    ['ladder-one-element', () => ladderToSvg(oneElementDesign())],
    ['ladder-twenty-elements', () => ladderToSvg(twentyElementDesign(), { maxRowWidth: 1100, selectedElementId: 'E5' })],
  ])('%s is drawn: wires and parts in ink, the selection in the accent colour', async (name, make) => {
    const [ink, accent] = await render(name, make(), ['#27303a', '#1f5fa8']);
    expect(ink).toBeGreaterThan(800);
    if (name === 'ladder-demo' || name === 'ladder-twenty-elements') expect(accent).toBeGreaterThan(100);
  });



  it('an interactive drawing lets the keyboard reach every part, in design order', async () => {
    await page.setContent(`<!doctype html><html><body>${ladderToSvg(demo, { interactive: true })}</body></html>`);
    const reached: (string | null)[] = [];
    for (let i = 0; i < 7; i += 1) {
      await page.keyboard.press('Tab');
      reached.push(await page.evaluate(() => document.activeElement?.getAttribute('data-element-id') ?? null));
    }
    expect(reached).toEqual(['CX1', 'CY1', 'CY2', 'LCM1', 'CX2', 'LCM2', 'CX3']);
  });
});
