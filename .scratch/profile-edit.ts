import type { AddressInfo } from 'node:net';
import { writeFileSync } from 'node:fs';
import { chromium } from 'playwright-core';
import { preview } from 'vite';
import { encodeDesignHash } from '../src/io/design-url.ts';
import { BENCH_DESIGN } from '../scripts/bench/bench-design.ts';

const root = process.cwd();
const outDir = process.argv[2] ?? '/tmp/dist-prof';
const server = await preview({ configFile: `${root}/vite.config.ts`, logLevel: 'silent', build: { outDir }, preview: { host: '127.0.0.1', port: 0 } });
const origin = `http://127.0.0.1:${(server.httpServer.address() as AddressInfo).port}`;
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: ['--no-sandbox', '--disable-gpu'] });
const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
const page = await context.newPage();
await page.addInitScript(() => {
  const w = window as unknown as { posts: string[] };
  w.posts = [];
  const orig = Worker.prototype.postMessage;
  Worker.prototype.postMessage = function (this: Worker, message: unknown, ...rest: unknown[]) {
    const m = message as { type?: string; name?: string; path?: string[] };
    w.posts.push(`${m?.type ?? '?'}:${(m?.path ?? []).join('.')}`);
    return (orig as (...a: unknown[]) => void).call(this, message, ...rest);
  } as typeof Worker.prototype.postMessage;
});
await page.goto(`${origin}/${encodeDesignHash(BENCH_DESIGN)}`);
await page.waitForFunction(() => document.querySelector('chokepoint-planner')?.settled === true, undefined, { timeout: 60_000 });
await page.locator('chokepoint-stage-editor li.element[data-element="CX2"]').click();
await page.waitForTimeout(500);
let k0 = 0;
await browser.startTracing(page, { path: '/tmp/edit-trace.json', categories: ['devtools.timeline', 'disabled-by-default-devtools.timeline'] });
page.on('console', (m) => { if (k0++ < 6) console.log('page:', m.text()); });
const cdp = await context.newCDPSession(page);
await cdp.send('Profiler.enable');
await cdp.send('Profiler.setSamplingInterval', { interval: 100 });
await cdp.send('Profiler.start');
const times: number[] = [];
for (let k = 0; k < 30; k += 1) {
  const value = `${(0.5 + (k % 7) * 0.1).toFixed(1)} uF`;
  times.push(await page.evaluate(async (text) => {
    const planner = document.querySelector('chokepoint-planner')!;
    const charts = () => [...planner.shadowRoot!.querySelectorAll('chokepoint-plot-panel')].map((panel) => panel.shadowRoot!.querySelector('chokepoint-spec-chart')!).filter((chart) => chart.drawn);
    const before = charts().map((chart) => chart.drawCount);
    const editor = planner.shadowRoot!.querySelector('chokepoint-part-editor')!;
    const fields = editor.shadowRoot!.querySelector('chokepoint-object-fields')!;
    const input = fields.shadowRoot!.querySelector<HTMLInputElement>('input.quantity')!;
    const t0 = performance.now();
    (window as unknown as { posts: string[] }).posts = [];
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
    await new Promise((resolve) => requestAnimationFrame(resolve));
    const el = performance.now() - t0;
    const status = [...planner.shadowRoot!.querySelectorAll('p.status')].map((p) => p.textContent).join(' / ');
    console.log(el.toFixed(1), JSON.stringify((window as unknown as { posts: string[] }).posts), status);
    return el;
  }, value));
}
const { profile } = await cdp.send('Profiler.stop');
await browser.stopTracing();
writeFileSync('/tmp/edit.cpuprofile', JSON.stringify(profile));
times.sort((a, b) => a - b);
console.log('edit ms p50', times[15]?.toFixed(1), 'p95', times[28]?.toFixed(1), 'min', times[0]?.toFixed(1));
// Self time by function.
const self = new Map<string, number>();
const byId = new Map(profile.nodes.map((n) => [n.id, n]));
const dt = profile.timeDeltas ?? [];
profile.samples?.forEach((id, i) => {
  const n = byId.get(id)!;
  const key = `${n.callFrame.functionName || '(anon)'} ${n.callFrame.url.split('/').pop()}:${n.callFrame.lineNumber}`;
  self.set(key, (self.get(key) ?? 0) + (dt[i] ?? 0) / 1000);
});
const total = [...self.values()].reduce((a, b) => a + b, 0);
console.log('total sampled ms', total.toFixed(0));
for (const [k, v] of [...self].sort((a, b) => b[1] - a[1]).slice(0, 40)) console.log(v.toFixed(1).padStart(8), k);
await browser.close();
await server.close();
