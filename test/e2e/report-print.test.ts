import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { type Browser, chromium, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import demoJson from '../../fixtures/demo/adapter-two-stage.design.json';
import { readScanText } from '../../src/io/scan-csv.ts';
import { requireDesign } from '../../src/model/index.ts';
import { makeReport } from '../../src/report/index.ts';
import { repoFile } from '../support/cli-harness.ts';
import { twentyElementDesign } from '../support/ladder-designs.ts';
import { screenshots } from './harness.ts';

// The printable report in Debian's Chromium: it loads with no request at all, its plots are drawn,
// and printed to PDF (A4 and Letter) no table is split across pages. The PDF pages are turned into
// PNG files with poppler's pdftoppm (screenshots/report-*-page-N.png) for a person to look at, and
// the page of each table's first and last row is read with poppler's pdftotext.

const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-default-apps'];

let browser: Browser | undefined;
let work = '';

beforeAll(async () => {
  mkdirSync(screenshots, { recursive: true });
  work = mkdtempSync(join(tmpdir(), 'chokepoint-report-'));
  browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: CHROMIUM_ARGS });
});

afterAll(async () => {
  await browser?.close();
  if (work) rmSync(work, { recursive: true, force: true });
});

function demoReport(): string {
  const read = readScanText(repoFile('fixtures/scans/invented-adapter-no-filter.csv'), { name: 'invented-adapter-no-filter.csv' });
  if (!read.ok) throw new Error('the demo scan does not read');
  return makeReport({ design: requireDesign(demoJson), noise: { kind: 'scan', scan: read.scan }, origin: { program: 'chokepoint', version: 'e2e', generatedAt: '2026-12-04' } }).html;
}

/** Opens the report with every request recorded and refused. */
async function open(html: string): Promise<{ page: Page; requests: string[]; errors: string[] }> {
  const page = await browser!.newPage({ viewport: { width: 1000, height: 1300 }, deviceScaleFactor: 1 });
  const requests: string[] = [];
  const errors: string[] = [];
  page.on('request', (request) => requests.push(request.url()));
  page.on('console', (message) => {
    if (message.type() === 'error' || message.type() === 'warning') errors.push(message.text());
  });
  page.on('pageerror', (error) => errors.push(error.message));
  await page.route('**/*', (route) => route.abort());
  await page.setContent(html, { waitUntil: 'load' });
  return { page, requests, errors };
}

/** Pixels of each colour (within a small distance) in each figure's SVG painted on a canvas. */
async function figureInk(page: Page, colours: readonly string[]): Promise<Record<string, number[]>> {
  return page.evaluate(async (wanted) => {
    const out: Record<string, number[]> = {};
    for (const figure of document.querySelectorAll('figure')) {
      const svg = figure.querySelector('svg');
      if (!svg) continue;
      const image = new Image();
      image.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(new XMLSerializer().serializeToString(svg))}`;
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
      out[figure.getAttribute('data-plot-id') ?? figure.className] = counts;
    }
    return out;
  }, colours);
}

/**
 * Prints the page and says, for every table, on which PDF pages its caption and its last row fell.
 * A marker word is put into each table's caption and last row before printing, and found again in
 * the text pdftotext reads from each page.
 */
async function printedTablePages(page: Page, name: string, format: 'A4' | 'Letter'): Promise<{ pages: number; tables: { caption: string; first: number; last: number }[] }> {
  const captions = await page.evaluate(() =>
    [...document.querySelectorAll('table')].map((table, t) => {
      const caption = table.querySelector('caption');
      const rows = table.querySelectorAll('tbody tr');
      const mark = (where: Element | null | undefined, word: string) => {
        if (!where) return;
        const span = document.createElement('span');
        span.textContent = ` ${word}`;
        span.style.fontSize = '6pt';
        where.append(span);
      };
      mark(caption, `XQT${t}START`);
      mark(rows[rows.length - 1]?.querySelector('td'), `XQT${t}END`);
      return caption?.textContent ?? `table ${t}`;
    }),
  );
  const pdf = join(work, `${name}.pdf`);
  await page.pdf({ path: pdf, format, printBackground: true });
  const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
  const pageTexts = text.split('\f');
  const pageOf = (word: string) => pageTexts.findIndex((p) => p.includes(word));
  for (const old of readdirSync(screenshots).filter((f) => f.startsWith(`${name}-page-`))) rmSync(join(screenshots, old));
  execFileSync('pdftoppm', ['-r', '60', '-png', pdf, join(screenshots, `${name}-page`)]);
  return {
    pages: pageTexts.filter((p) => p.trim() !== '').length,
    tables: captions.map((caption, t) => ({ caption, first: pageOf(`XQT${t}START`), last: pageOf(`XQT${t}END`) })),
  };
}

describe('the printable report in Chromium', () => {
  it('loads with no request, shows every section and draws its plots and the filter', async () => {
    const html = demoReport();
    writeFileSync(join(screenshots, 'report-demo.html'), html);
    const { page, requests, errors } = await open(html);
    expect(requests).toEqual([]);
    expect(errors).toEqual([]);
    await page.screenshot({ path: join(screenshots, 'report-demo-screen.png'), fullPage: true });
    const ink = await figureInk(page, ['#1f5fa8', '#b45f06', '#9b1c1c', '#27303a']);
    // Emissions: the limit (dark red); insertion loss: CM blue and DM amber; the ladder: ink.
    expect(ink['emissions']![2]).toBeGreaterThan(800);
    expect(ink['insertion-loss']![0]).toBeGreaterThan(800);
    expect(ink['insertion-loss']![1]).toBeGreaterThan(800);
    // CM and DM needed coincide for a scan of unknown mode; either colour shows the curve.
    expect(ink['required-attenuation']![0]! + ink['required-attenuation']![1]!).toBeGreaterThan(800);
    expect(ink['part-impedance']![0]).toBeGreaterThan(300);
    expect(ink['ladder']![3]).toBeGreaterThan(800);
    const headings = await page.locator('h2').allInnerTexts();
    expect(headings).toEqual(['Summary', 'The design', 'Plots', 'Margins', 'Assumptions', 'Safety and practical checks', 'Cautions']);
    await page.close();
  });

  it.each(['A4', 'Letter'] as const)('printed on %s, keeps every table whole on one page', async (format) => {
    const { page } = await open(demoReport());
    const printed = await printedTablePages(page, `report-demo-${format.toLowerCase()}`, format);
    expect(printed.pages).toBeGreaterThan(3);
    expect(printed.tables.length).toBeGreaterThanOrEqual(8);
    for (const table of printed.tables) {
      expect(table.first, table.caption).toBeGreaterThanOrEqual(0);
      expect(table.last, table.caption).toBe(table.first);
    }
    await page.close();
  });

  it('a twenty-element stage prints whole as well, its drawing on rows', async () => {
    const html = makeReport({ design: twentyElementDesign(), origin: { program: 'chokepoint', version: 'e2e', generatedAt: '2026-12-04' } }).html;
    const { page, requests } = await open(html);
    expect(requests).toEqual([]);
    await page.locator('figure.ladder').screenshot({ path: join(screenshots, 'report-twenty-elements-ladder.png') });
    const printed = await printedTablePages(page, 'report-twenty-a4', 'A4');
    for (const table of printed.tables) expect(table.last, table.caption).toBe(table.first);
    await page.close();
  });
});
