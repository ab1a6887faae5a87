import type { AddressInfo } from 'node:net';
import { chromium } from 'playwright-core';
import { preview } from 'vite';
import { encodeDesignHash } from '../src/io/design-url.ts';
import { BENCH_DESIGN } from '../scripts/bench/bench-design.ts';
const root = process.cwd();
const server = await preview({ configFile: `${root}/vite.config.ts`, logLevel: 'silent', preview: { host: '127.0.0.1', port: 0 } });
const origin = `http://127.0.0.1:${(server.httpServer.address() as AddressInfo).port}`;
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: ['--no-sandbox'] });
const page = await (await browser.newContext({ viewport: { width: 1280, height: 800 } })).newPage();
await page.goto(`${origin}/${encodeDesignHash(BENCH_DESIGN)}`);
await page.waitForFunction(() => document.querySelector('chokepoint-planner')?.settled === true, undefined, { timeout: 60_000 });
await page.waitForTimeout(1000);
console.log(await page.evaluate(() => {
  const planner = document.querySelector('chokepoint-planner')!;
  return [...planner.shadowRoot!.querySelectorAll('chokepoint-plot-panel')].map((panel) => {
    const chart = panel.shadowRoot!.querySelector('chokepoint-spec-chart') as unknown as { drawn: boolean; spec?: { id: string; series: { points?: unknown }[] } } & HTMLElement;
    const r = chart.getBoundingClientRect();
    const canvases = [...chart.shadowRoot?.querySelectorAll('canvas') ?? chart.querySelectorAll('canvas')].map((c) => `${c.width}x${c.height}`);
    return `${chart.spec?.id} drawn=${chart.drawn} series=${chart.spec?.series.length} top=${Math.round(r.top)} canvases=${canvases.join(',')}`;
  }).join('\n');
}));
await page.screenshot({ path: '/tmp/bench-page.png', fullPage: true });
await browser.close(); await server.close();
