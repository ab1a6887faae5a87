import type { AddressInfo } from 'node:net';
import { chromium } from 'playwright-core';
import { preview } from 'vite';
import { encodeDesignHash } from '../src/io/design-url.ts';
import { BENCH_DESIGN } from '../scripts/bench/bench-design.ts';

const root = process.cwd();
const outDir = process.argv[2] ?? '/tmp/dist-prof';
const server = await preview({ configFile: `${root}/vite.config.ts`, logLevel: 'silent', build: { outDir }, preview: { host: '127.0.0.1', port: 0 } });
const origin = `http://127.0.0.1:${(server.httpServer.address() as AddressInfo).port}`;
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: (process.argv[3] ?? '--no-sandbox,--disable-gpu').split(',') });
const page = await (await browser.newContext()).newPage();
const workerUrls: string[] = [];
page.on('request', (r) => { if (r.url().includes('sweep.worker')) workerUrls.push(r.url()); });
await page.goto(`${origin}/${encodeDesignHash(BENCH_DESIGN)}`);
await page.waitForFunction(() => document.querySelector('chokepoint-planner')?.settled === true, undefined, { timeout: 60_000 });
const out = await page.evaluate(async ([url, design]) => {
  const w = new Worker(url!, { type: 'module' });
  const call = (id: number) => new Promise<{ ms: number; rt: number }>((resolve) => {
    const t0 = performance.now();
    const on = (e: MessageEvent) => { if (e.data?.id === String(id)) { w.removeEventListener('message', on); resolve({ ms: e.data.value?.elapsedMs, rt: performance.now() - t0 }); } };
    w.addEventListener('message', on);
    w.postMessage({ id: String(id), type: 'APPLY', path: ['sweep'], argumentList: [{ type: 'RAW', value: { requestId: id, design } }] });
  });
  const res: string[] = [];
  for (let i = 1; i <= 40; i += 1) { const r = await call(i); if (i % 5 === 0) res.push(`${r.ms?.toFixed(1)}/${r.rt.toFixed(1)}`); }
  return res.join(' ');
}, [workerUrls[0], BENCH_DESIGN] as const);
console.log('worker sweep elapsed/roundtrip ms every 5th call:', out);
await browser.close();
await server.close();
