import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { Planner, screenshots } from './harness.ts';
import { settle, shoot } from './planner-driver.ts';

/**
 * The safety checks and the hand-over report from the page, in Debian's Chromium: a check that lacks
 * its input says so and runs once the input is given; the report is made in the worker and saved as
 * one self-contained page.
 */

const planner = new Planner();
const profiles: Planner[] = [];

beforeAll(async () => {
  await planner.start();
});

afterEach(async () => {
  for (const profile of profiles.splice(0)) await profile.stop();
});

afterAll(async () => {
  await planner.stop();
});

async function freshPage() {
  const profile = await planner.otherProfile();
  profiles.push(profile);
  return profile.open();
}

describe('checks and report in the planner', () => {
  it('leakage current: not checked without a supply; given 264 V, 60 Hz it is judged with its numbers', async () => {
    const { page } = await freshPage();
    await settle(page);
    const panel = page.locator('chokepoint-safety-panel');
    await expect.poll(async () => panel.locator('[data-check="leakage"] .badge').first().innerText()).toBe('NOT CHECKED');
    await panel.locator('summary', { hasText: 'What the checks are run for' }).click();
    await panel.getByRole('button', { name: 'Add' }).first().click();
    // The operating block's supply: AC mains at 264 V, 60 Hz (the planner's starting values for a new supply).
    const supply = panel.getByLabel('Supply', { exact: true });
    await supply.selectOption('ac-mains');
    // Limits are never assumed: choose one from the list (its name says its standard and value).
    await panel.getByRole('button', { name: 'Add' }).first().click();
    await panel.getByLabel('Leakage limit', { exact: true }).selectOption('listed-limit');
    const limit = panel.getByLabel('Id', { exact: true });
    expect(await limit.locator('option[value="iec60335-1-class-i-portable"]').innerText()).toMatch(/0\.75 mA.*IEC 60335-1/u);
    await limit.selectOption('iec60335-1-class-i-portable');
    await expect.poll(async () => panel.locator('[data-check="leakage"] .badge').first().innerText(), { timeout: 20_000 }).not.toBe('NOT CHECKED');
    await panel.locator('[data-check="leakage"] > summary').click();
    const leakage = await panel.locator('[data-check="leakage"]').innerText();
    expect(leakage).toMatch(/^PASS/u);
    // 2.2 nF from line 1 to ground at 264 V, 60 Hz, +20 % tolerance: I = 2π·60·2.64 nF·264 V = 0.2627 mA (I = 2πfCV).
    expect(leakage).toMatch(/0\.26\d* mA/u);
    await shoot(page, 'checks-leakage', ['insertion-loss']);
  });

  it('the report is made in the page and saved as one self-contained file with every section', async () => {
    const { page } = await freshPage();
    await settle(page);
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), page.locator('chokepoint-file-actions').getByRole('button', { name: 'Report' }).click()]);
    const path = join(screenshots, 'page-report.html');
    await download.saveAs(path);
    const html = readFileSync(path, 'utf8');
    expect(download.suggestedFilename()).toMatch(/\.report\.html$/u);
    expect(html).not.toMatch(/<script/iu);
    expect(html).toMatch(/Content-Security-Policy/u);
    for (const id of ['design', 'checks', 'assumptions', 'cautions']) expect(html).toContain(`id="${id}"`);
    expect(html).toMatch(/SHA-256/u);
    await expect.poll(() => page.locator('chokepoint-file-actions .said').innerText()).toMatch(/Report saved/u);
  });
});
