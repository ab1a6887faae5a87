import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { Planner } from './harness.ts';
import { bandMargin, listedSelfResonances, predictedLevelAt, selectPart, settle, shoot, typeField } from './planner-driver.ts';

/**
 * The three things people come to the planner for, walked as an engineer would in Debian's Chromium,
 * on the invented demo with its noise estimate, a screenshot at each step (each checked for drawn
 * plots, not a blank canvas). Expected directions and values come from the physics, not from earlier
 * runs: more CM inductance lowers the CM emission; a choke's self-resonance is 1/(2π√(LC)) with
 * L = L_self + M across each winding's capacitance (the even mode of a coupled pair).
 */

const planner = new Planner();

beforeAll(async () => {
  await planner.start();
});

afterAll(async () => {
  await planner.stop();
});

/** Each story starts from the demo in a browser profile of its own (no work saved by another story). */
const profiles: Planner[] = [];
async function freshPage() {
  const profile = await planner.otherProfile();
  profiles.push(profile);
  return profile.open();
}

afterEach(async () => {
  for (const profile of profiles.splice(0)) await profile.stop();
});

describe('the planner, walked through its three stories', () => {
  it('1. a larger CM choke inductance, typed in the part editor, lowers the emission and raises the worst margin', async () => {
    const { page } = await freshPage();
    await settle(page);
    await shoot(page, 'story1-0-demo');
    const before = { level: await predictedLevelAt(page, 520e3), low: await bandMargin(page, '0.15–0.5 MHz'), mid: await bandMargin(page, '0.5–5 MHz') };
    await selectPart(page, 'LCM1');
    await typeField(page, 'Inductance', '10 mH');
    await settle(page);
    await shoot(page, 'story1-1-choke-10mH');
    const after = { level: await predictedLevelAt(page, 520e3), low: await bandMargin(page, '0.15–0.5 MHz'), mid: await bandMargin(page, '0.5–5 MHz') };
    // The CM part of the emission falls with more CM inductance: at 520 kHz by several dB.
    expect(after.level).toBeLessThan(before.level - 3);
    expect(after.mid).toBeGreaterThan(before.mid);
    expect(after.low).toBeGreaterThanOrEqual(before.low);
    // And the typed text is what the design now holds.
    await expect.poll(() => page.locator('chokepoint-part-editor').getByLabel('Inductance', { exact: true }).inputValue()).toBe('10 mH');
  });

  it('2. raising a choke’s winding capacitance moves its self-resonance to 1/(2π√(LC)) and costs margin above it', async () => {
    const { page } = await freshPage();
    await settle(page);
    await selectPart(page, 'LCM2');
    // A constant permeability, so the resonance is that of the plain LC.
    await page.locator('chokepoint-part-editor').getByLabel('Ferrite permeability', { exact: true }).selectOption('constant');
    await settle(page);
    const high = await bandMargin(page, '5–30 MHz');
    await typeField(page, 'Winding capacitance', '40 pF');
    await settle(page);
    await shoot(page, 'story2-1-winding-40pF', ['emissions', 'insertion-loss', 'part-impedance']);
    // LCM2: 470 µH per winding, k = 0.992 (demo), so L + M = 1.992 × 470 µH across 40 pF.
    const expected = 1 / (2 * Math.PI * Math.sqrt(1.992 * 470e-6 * 40e-12));
    const found = await listedSelfResonances(page, 'LCM2');
    const nearest = found.reduce((a, b) => (Math.abs(Math.log(b / expected)) < Math.abs(Math.log(a / expected)) ? b : a), found[0] ?? 0);
    // Within the grid spacing of 200 points per decade (the engine inserts the resonance exactly).
    expect(Math.abs(Math.log10(nearest / expected))).toBeLessThan(1 / 200);
    // The resonance list on the page names it too.
    await expect.poll(async () => (await page.locator('chokepoint-resonance-list tbody').innerText()).includes('LCM2')).toBe(true);
    // Above its resonance the choke is a capacitor: the high band loses margin.
    expect(await bandMargin(page, '5–30 MHz')).toBeLessThan(high - 3);
  });

  it('3. a second stage added, both versions kept as variants, compared in the table and on the plots', async () => {
    const { page } = await freshPage();
    await settle(page);
    // Start from a one-stage filter: the converter-side stage alone.
    await page.locator('chokepoint-stage-editor li.stage[data-stage="mains-side"] button[aria-label="Remove stage 2"]').click();
    await settle(page);
    const keep = page.locator('chokepoint-variant-table').getByLabel('Name for a copy of the design being edited');
    await keep.fill('one stage');
    await page.locator('chokepoint-variant-table').getByRole('button', { name: 'Keep a copy as a variant' }).click();
    const oneStage = await bandMargin(page, '0.15–0.5 MHz');
    await shoot(page, 'story3-0-one-stage');

    // Add the second stage: a common-mode choke and an X capacitor at the mains side.
    await page.locator('chokepoint-stage-editor').getByRole('button', { name: 'Add a stage' }).click();
    const stage = page.locator('chokepoint-stage-editor li.stage').nth(1);
    await stage.getByLabel('Where the new part goes, stage 2').selectOption('common-mode-choke');
    await stage.getByRole('button', { name: 'Add part' }).click();
    await stage.getByLabel('Where the new part goes, stage 2').selectOption('line-to-line');
    await stage.getByLabel('Kind of the new part, stage 2').selectOption('capacitor');
    await stage.getByRole('button', { name: 'Add part' }).click();
    // The part just added is selected for editing.
    await expect.poll(() => page.locator('chokepoint-part-editor #part-id').inputValue()).toBe('CX2');
    await typeField(page, 'Capacitance', '1 uF');
    await settle(page);
    await keep.fill('two stages');
    await page.locator('chokepoint-variant-table').getByRole('button', { name: 'Keep a copy as a variant' }).click();
    const twoStages = await bandMargin(page, '0.15–0.5 MHz');
    expect(twoStages).toBeGreaterThan(oneStage + 6);

    // Compare: the table lists both with their margins; overlay the one-stage variant on the plots.
    const table = page.locator('chokepoint-variant-table');
    await expect.poll(async () => table.locator('tbody tr').count()).toBe(3);
    const oneRow = table.locator('tbody tr[data-name="one stage"]');
    await oneRow.getByLabel('overlay').check();
    await settle(page);
    await expect.poll(async () => (await page.locator('chokepoint-plot-panel').first().locator('.u-legend').innerText()).includes('one stage')).toBe(true);
    const rowText = await oneRow.innerText();
    expect(rowText).toMatch(/FAIL/u);
    expect(rowText).toMatch(new RegExp(`${oneStage.toFixed(1).replace('-', '[-−]')} dB`, 'u'));
    await shoot(page, 'story3-1-compared');
  });
});
