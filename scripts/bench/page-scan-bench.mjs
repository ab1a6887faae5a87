#!/usr/bin/env node
// node scripts/bench/page-scan-bench.mjs <scan.csv> [runs]: the built page (dist/, built first if
// missing) in headless Chromium, one fresh browser per run: the time from choosing the scan file to
// its verdict on screen (measured in the page), and the peak RSS (VmHWM, Linux /proc) of the page's
// renderer process, which runs the page and its workers. Prints one JSON line. Plain JavaScript so
// that vite and playwright load from node_modules as they are (scripts/bench/sections/scan-import.ts).
import { readdirSync, readFileSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import process from 'node:process';
import { chromium } from 'playwright-core';
import { build, preview } from 'vite';

const [scanPath, runsText] = process.argv.slice(2);
const runs = Number(runsText ?? 3);
const root = process.cwd();
const config = join(root, 'vite.config.ts');
const args = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

/** The largest VmHWM of the processes below `pid` of one Chromium type (renderer, gpu-process, …). */
function peakOf(pid, wanted) {
  const children = new Map();
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/u.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, 'utf8');
      const parent = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      children.set(parent, [...(children.get(parent) ?? []), Number(entry)]);
    } catch {
      // gone meanwhile
    }
  }
  let peak = 0;
  const visit = (p) => {
    for (const child of children.get(p) ?? []) {
      try {
        const type = /--type=([a-z-]+)/u.exec(readFileSync(`/proc/${child}/cmdline`, 'utf8'))?.[1];
        const hwm = /VmHWM:\s+(\d+) kB/u.exec(readFileSync(`/proc/${child}/status`, 'utf8'));
        if (type === wanted && hwm) peak = Math.max(peak, Number(hwm[1]) / 1e3);
      } catch {
        // gone meanwhile
      }
      visit(child);
    }
  };
  visit(pid);
  return peak;
}

if (!existsSync(join(root, 'dist', 'index.html'))) await build({ configFile: config, logLevel: 'warn' });
const server = await preview({ configFile: config, logLevel: 'silent', preview: { host: '127.0.0.1', port: 0, strictPort: true, open: false } });
const origin = `http://127.0.0.1:${server.httpServer.address().port}`;
const times = [];
const peaks = [];
let status = '';
try {
  for (let run = 0; run < runs; run += 1) {
    const browserServer = await chromium.launchServer({ executablePath: '/usr/bin/chromium', headless: true, args });
    try {
      const browser = await chromium.connect(browserServer.wsEndpoint());
      const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
      await page.goto(`${origin}/`);
      await page.locator('chokepoint-emissions .analysis-status[data-state="done"]').waitFor({ timeout: 60_000 });
      // Watch from inside the page, from before the file is chosen until its verdict is on screen.
      await page.evaluate(() => {
        const section = () => document.querySelector('chokepoint-app')?.shadowRoot?.querySelector('chokepoint-emissions')?.shadowRoot;
        const input = section()?.querySelector('input[type="file"]');
        window.benchTiming = new Promise((resolve) => {
          input.addEventListener(
            'change',
            () => {
              const started = performance.now();
              const poll = () => {
                const done = section()?.querySelector('.analysis-status[data-state="done"]')?.textContent ?? '';
                if (done.includes('bench-scan')) resolve(performance.now() - started);
                else setTimeout(poll, 5);
              };
              poll();
            },
            { once: true, capture: true },
          );
        });
      });
      await page.locator('chokepoint-emissions input[type="file"]').setInputFiles(scanPath);
      times.push(await page.evaluate(() => window.benchTiming));
      status = (await page.locator('chokepoint-emissions .analysis-status[data-state="done"]').innerText()).replace(/\s+/gu, ' ').trim();
      peaks.push(peakOf(browserServer.process().pid, 'renderer'));
      await browser.close();
    } finally {
      await browserServer.close();
    }
  }
} finally {
  await server.close();
}
times.sort((a, b) => a - b);
process.stdout.write(`${JSON.stringify({ ms: times[Math.floor(times.length / 2)], rendererPeakRssMb: Math.round(Math.max(...peaks) * 10) / 10, status })}\n`);
