import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { spawnSync } from 'node:child_process';
import type { AddressInfo } from 'node:net';
import { chromium } from 'playwright-core';
import { preview } from 'vite';
import { encodeDesignHash } from '../../../src/io/design-url.ts';
import { BENCH_DESIGN } from '../bench-design.ts';
import { type BenchSection, percentile, type SectionResult } from '../bench-section.ts';

/**
 * The page as an engineer meets it, in Debian's headless Chromium on the built app: cold load to the
 * first drawn plot, and the time from typing a value in the part editor to every plot redrawn with
 * the new numbers (edit to plot), for the benchmark's ten-element design at 2001 points; and the size
 * of the JavaScript the page loads, gzipped. Skipped with a note when Chromium is not installed.
 */

const CHROMIUM = '/usr/bin/chromium';
const ARGS = ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];
const EDITS = 40;

/** The gzipped size of the named JavaScript files in dist/assets, in kB. */
function gzippedKbOf(dist: string, names: readonly string[]): number {
  let total = 0;
  for (const name of names) total += gzipSync(readFileSync(join(dist, 'assets', name)), { level: 9 }).length;
  return total / 1024;
}

function gzippedJsKb(dist: string): { total: number; main: number } {
  const assets = join(dist, 'assets');
  let total = 0;
  let main = 0;
  for (const name of readdirSync(assets)) {
    if (!name.endsWith('.js')) continue;
    const size = gzipSync(readFileSync(join(assets, name)), { level: 9 }).length;
    total += size;
    if (name.startsWith('index-')) main += size;
  }
  return { total: total / 1024, main: main / 1024 };
}

export const plannerPageSection: BenchSection = {
  id: 'page',
  title: 'the planner page in headless Chromium (built app)',
  async run(): Promise<SectionResult> {
    const root = process.cwd();
    const dist = join(root, 'dist');
    // Always the current sources: build the app first.
    const build = spawnSync(join(root, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn'], { cwd: root, stdio: 'inherit' });
    if (build.status !== 0) return { figures: { editToPlotMsP50: null, editToPlotMsP95: null, coldLoadToPlotMs: null }, rows: [], notes: ['the app did not build'] };
    const sizes = gzippedJsKb(dist);
    const sizeRows: [string, string][] = [
      ['JavaScript, gzipped (page, workers, chunks)', `${sizes.total.toFixed(1)} kB`],
      ['  of which the main bundle', `${sizes.main.toFixed(1)} kB`],
    ];
    const haveChromium = (() => {
      try {
        return statSync(CHROMIUM).isFile();
      } catch {
        return false;
      }
    })();
    if (!haveChromium) {
      return { figures: { bundleGzipKb: sizes.total, mainBundleGzipKb: sizes.main, editToPlotMsP50: null, editToPlotMsP95: null, coldLoadToPlotMs: null }, rows: sizeRows, notes: ['Chromium not installed: no page timings'] };
    }
    const server = await preview({ configFile: join(root, 'vite.config.ts'), logLevel: 'silent', preview: { host: '127.0.0.1', port: 0, open: false } });
    const origin = `http://127.0.0.1:${(server.httpServer.address() as AddressInfo).port}`;
    const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ARGS });
    try {
      // Cold load: a fresh context each time (no saved work, no cache), to the first drawn plot.
      const cold: number[] = [];
      // The scripts fetched (by the page and its workers) before the first plot was drawn.
      const scriptsBeforePlot = new Set<string>();
      for (let k = 0; k < 5; k += 1) {
        const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
        const page = await context.newPage();
        let drawn = false;
        if (k === 0) {
          page.on('request', (request) => {
            const name = /\/assets\/([^/?#]+\.js)/u.exec(request.url())?.[1];
            if (name && !drawn) scriptsBeforePlot.add(name);
          });
        }
        await page.goto(`${origin}/${encodeDesignHash(BENCH_DESIGN)}`);
        await page.waitForFunction(() => {
          const planner = document.querySelector('chokepoint-planner');
          const panels = planner?.shadowRoot?.querySelectorAll('chokepoint-plot-panel') ?? [];
          return [...panels].some((panel) => (panel.shadowRoot?.querySelector('chokepoint-spec-chart')?.drawCount ?? 0) > 0);
        }, undefined, { timeout: 60_000 });
        drawn = true;
        cold.push(await page.evaluate(() => performance.now()));
        await context.close();
      }
      // Edit to plot: type a value, wait for every drawn plot to take the new numbers, then one frame.
      const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
      const page = await context.newPage();
      await page.goto(`${origin}/${encodeDesignHash(BENCH_DESIGN)}`);
      await page.waitForFunction(() => document.querySelector('chokepoint-planner')?.settled === true, undefined, { timeout: 60_000 });
      await page.locator('chokepoint-stage-editor li.element[data-element="CX2"]').click();
      await page.waitForTimeout(500);
      const times: number[] = [];
      for (let k = 0; k < EDITS + 5; k += 1) {
        const value = `${(0.5 + (k % 7) * 0.1).toFixed(1)} uF`;
        const elapsed = await page.evaluate(async (text) => {
          const planner = document.querySelector('chokepoint-planner')!;
          const charts = () => [...planner.shadowRoot!.querySelectorAll('chokepoint-plot-panel')].map((panel) => panel.shadowRoot!.querySelector('chokepoint-spec-chart')!).filter((chart) => chart.drawn);
          const before = charts().map((chart) => chart.drawCount);
          const editor = planner.shadowRoot!.querySelector('chokepoint-part-editor')!;
          const fields = editor.shadowRoot!.querySelector('chokepoint-object-fields')!;
          const input = fields.shadowRoot!.querySelector<HTMLInputElement>('input.quantity')!;
          const t0 = performance.now();
          input.value = text;
          input.dispatchEvent(new Event('input', { bubbles: true, composed: true }));
          await new Promise<void>((resolve) => {
            const check = (): void => {
              const now = charts();
              if (planner.settled && now.length === before.length && now.every((chart, i) => chart.drawCount > before[i]!)) resolve();
              else requestAnimationFrame(check);
            };
            requestAnimationFrame(check);
          });
          // The frame that paints it.
          await new Promise((resolve) => requestAnimationFrame(resolve));
          return performance.now() - t0;
        }, value);
        if (k >= 5) times.push(elapsed);
      }
      await context.close();
      const p50 = percentile(times, 50);
      const p95 = percentile(times, 95);
      const coldMedian = percentile(cold, 50);
      const firstPlotKb = gzippedKbOf(dist, [...scriptsBeforePlot]);
      return {
        figures: { bundleGzipKb: sizes.total, mainBundleGzipKb: sizes.main, firstPlotJsGzipKb: firstPlotKb, editToPlotMsP50: p50, editToPlotMsP95: p95, coldLoadToPlotMs: coldMedian, editSamples: times.length },
        rows: [
          ...sizeRows,
          [`JavaScript fetched before the first plot, gzipped (${scriptsBeforePlot.size} files)`, `${firstPlotKb.toFixed(1)} kB`],
          ['cold load to the first drawn plot (median of 5)', `${coldMedian.toFixed(0)} ms`],
          [`edit to every plot redrawn (${times.length} edits)`, `p50 ${p50.toFixed(1)} ms, p95 ${p95.toFixed(1)} ms`],
        ],
      };
    } finally {
      await browser.close();
      await server.close();
    }
  },
};
