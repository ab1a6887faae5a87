import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { type BrowserContext, chromium, type Page } from 'playwright-core';
import { preview, type PreviewServer } from 'vite';
import { expect } from 'vitest';

/**
 * The built app (dist/, from `npx vite build`) served by vite preview and driven in Debian's
 * Chromium, for the browser tests of the emissions section. Nothing may leave the machine.
 */

export const repoRoot = fileURLToPath(new URL('../../', import.meta.url));
export const screenshots = join(repoRoot, 'screenshots');

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

/** Everything a page did that a test must check: console errors, uncaught errors, requests. */
export interface PageRecord {
  readonly page: Page;
  readonly consoleErrors: string[];
  readonly requests: string[];
}

export class Planner {
  private server: PreviewServer | undefined;
  private context: BrowserContext | undefined;
  private userDataDir: string | undefined;
  private readonly pages: PageRecord[] = [];
  origin = '';

  async start(): Promise<void> {
    if (!existsSync(join(repoRoot, 'dist', 'index.html'))) {
      throw new Error('dist/index.html is missing: run `npx vite build` before the e2e tests');
    }
    mkdirSync(screenshots, { recursive: true });
    this.server = await preview({
      configFile: resolve(repoRoot, 'vite.config.ts'),
      logLevel: 'silent',
      preview: { host: '127.0.0.1', port: 0, strictPort: true, open: false },
    });
    const address = this.server.httpServer.address() as AddressInfo;
    this.origin = `http://127.0.0.1:${address.port}`;
    this.userDataDir = mkdtempSync(join(tmpdir(), 'chokepoint-e2e-'));
    this.context = await chromium.launchPersistentContext(this.userDataDir, {
      executablePath: '/usr/bin/chromium',
      headless: true,
      args: CHROMIUM_ARGS,
      viewport: { width: 1280, height: 800 },
      deviceScaleFactor: 1,
    });
  }

  /** A second browser profile (its own saved work), for opening a link as someone else would. */
  async otherProfile(): Promise<Planner> {
    const other = new Planner();
    other.server = this.server;
    other.origin = this.origin;
    other.userDataDir = mkdtempSync(join(tmpdir(), 'chokepoint-e2e-'));
    other.context = await chromium.launchPersistentContext(other.userDataDir, {
      executablePath: '/usr/bin/chromium',
      headless: true,
      args: CHROMIUM_ARGS,
      viewport: { width: 1280, height: 800 },
      deviceScaleFactor: 1,
    });
    other.sharedServer = true;
    return other;
  }

  async open(hash = ''): Promise<PageRecord> {
    if (!this.context) throw new Error('the browser did not start');
    const page = await this.context.newPage();
    const record: PageRecord = { page, consoleErrors: [], requests: [] };
    this.pages.push(record);
    page.on('console', (message) => {
      if (message.type() === 'error' || message.type() === 'warning') record.consoleErrors.push(`${message.type()}: ${message.text()}`);
    });
    page.on('pageerror', (error) => record.consoleErrors.push(`uncaught: ${error.message}`));
    page.on('request', (request) => record.requests.push(request.url()));
    page.on('worker', (worker) => record.requests.push(worker.url()));
    await page.goto(`${this.origin}/${hash}`);
    return record;
  }

  async closePages(): Promise<void> {
    for (const record of this.pages.splice(0)) await record.page.close();
  }

  private sharedServer = false;

  async stop(): Promise<void> {
    await this.context?.close();
    if (!this.sharedServer) await this.server?.close();
    if (this.userDataDir) rmSync(this.userDataDir, { recursive: true, force: true });
  }

  expectOnlyLocalTraffic(record: PageRecord): void {
    const foreign = record.requests.filter((url) => !url.startsWith(`${this.origin}/`) && !url.startsWith('data:') && !url.startsWith('blob:'));
    expect(foreign).toEqual([]);
    expect(record.requests.length).toBeGreaterThan(0);
  }
}

/** The visible text inside a component's shadow root (a host's innerText leaves it out). */
export async function shadowText(page: Page, host: string): Promise<string> {
  return (await page.locator(host).locator(':scope > *').allInnerTexts()).join('\n');
}
