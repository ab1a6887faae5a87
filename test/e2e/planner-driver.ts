import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { expect } from 'vitest';
import { screenshots } from './harness.ts';

/**
 * Small steps an engineer takes on the planner page, for the browser tests: wait for the numbers,
 * select a part, type a value, read what the page says, and check a plot was really drawn.
 */

/** Wait until the design being edited has been swept and judged (nothing pending in the worker). */
export async function settle(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelector('chokepoint-planner')?.settled === true, undefined, { timeout: 30_000 });
  // One frame for the charts to take the new data.
  await page.evaluate(() => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve))));
}

export async function selectPart(page: Page, id: string): Promise<void> {
  await page.locator(`chokepoint-stage-editor li.element[data-element="${id}"]`).click();
  await expect.poll(() => page.locator('chokepoint-part-editor #part-id').inputValue()).toBe(id);
}

/** Type into a field of the part editor by its label text, replacing what was there. */
export async function typeField(page: Page, label: string, text: string): Promise<void> {
  const input = page.locator('chokepoint-part-editor').getByLabel(label, { exact: true });
  await input.fill(text);
}

/** The text of the worst-margin cell of a band in the margin table ("-1.9 dB"), as a number. */
export async function bandMargin(page: Page, band: string): Promise<number> {
  const cell = page.locator(`chokepoint-margin-table tr[data-band="${band}"] td.margin`);
  return Number.parseFloat((await cell.innerText()).replace('−', '-'));
}

/**
 * The predicted level at a frequency for the design being edited (the highest of its predicted series
 * at the point nearest `hz`), read from the page's own results.
 */
export async function predictedLevelAt(page: Page, hz: number): Promise<number> {
  return page.evaluate((frequency) => {
    const planner = document.querySelector('chokepoint-planner')!;
    const result = planner.results!.resultFor(planner.store!.workspace.activeId)!;
    if (result.analysis.status !== 'done') return Number.NaN;
    const analysis = result.analysis.analysis;
    const f = analysis.frequencyHz;
    let best = 0;
    for (let i = 1; i < f.length; i += 1) if (Math.abs(Math.log(f[i]! / frequency)) < Math.abs(Math.log(f[best]! / frequency))) best = i;
    return Math.max(...analysis.predicted.map((series) => series.levelDbuV[best]!));
  }, hz);
}

/** The design document being edited, as the page holds it. */
export async function activeDocument(page: Page): Promise<unknown> {
  return page.evaluate(() => {
    const planner = document.querySelector('chokepoint-planner')!;
    const workspace = planner.store!.workspace;
    return workspace.variants.find((v) => v.id === workspace.activeId)!.document;
  });
}

/** The names of the variants in the workspace. */
export async function variantNames(page: Page): Promise<string[]> {
  return page.evaluate(() => document.querySelector('chokepoint-planner')!.store!.workspace.variants.map((v) => String(v.document['name'])));
}

/** How many pixels of a plot's canvas differ from its background: a blank plot has almost none. */
export async function drawnPixels(page: Page, plotId: string): Promise<number> {
  return page.evaluate((id) => {
    const canvas = document.querySelector('chokepoint-planner')!.plotCanvas(id);
    if (!canvas) return 0;
    const context = canvas.getContext('2d');
    if (!context) return 0;
    const { data } = context.getImageData(0, 0, canvas.width, canvas.height);
    let drawn = 0;
    for (let i = 0; i < data.length; i += 4) if (data[i + 3]! > 0) drawn += 1;
    return drawn;
  }, plotId);
}

/** Save a screenshot and check that the plots on it were drawn (curves, not a blank canvas). */
export async function shoot(page: Page, name: string, plots: readonly string[] = ['emissions', 'insertion-loss']): Promise<void> {
  await page.screenshot({ path: join(screenshots, `${name}.png`) });
  for (const plot of plots) expect(await drawnPixels(page, plot), `${plot} drawn on ${name}`).toBeGreaterThan(5000);
}

/** The frequencies of the self-resonances the resonance list shows for a part. */
export async function listedSelfResonances(page: Page, id: string): Promise<number[]> {
  return page.evaluate((elementId) => {
    const planner = document.querySelector('chokepoint-planner')!;
    const result = planner.results!.resultFor(planner.store!.workspace.activeId)!;
    if (result.sweep.status !== 'done') return [];
    return result.sweep.result.resonances.filter((r) => r.kind === 'element' && r.elementId === elementId).map((r) => r.frequencyHz);
  }, id);
}

/** The revision of the work this page last saved to the browser's storage (0 before its first save). */
export async function savedRevision(page: Page): Promise<number> {
  return page.evaluate(() => document.querySelector('chokepoint-planner')!.autosave?.revision ?? 0);
}
