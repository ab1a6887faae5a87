import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { Planner, repoRoot, screenshots } from './harness.ts';
import { activeDocument, bandMargin, savedRevision, selectPart, settle, shoot, typeField, variantNames } from './planner-driver.ts';

/**
 * Work is never lost and never silently replaced: undo and redo, a reload that restores variants
 * and a loaded scan, a page closed mid-edit, design files out and back in, share links, damaged
 * input refused without change, a part added by keyboard alone, and no request leaving the page.
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

async function profile(): Promise<Planner> {
  const fresh = await planner.otherProfile();
  profiles.push(fresh);
  return fresh;
}

describe('history', () => {
  it('Ctrl+Z undoes an edit and a stage move; Ctrl+Shift+Z and Ctrl+Y redo them', async () => {
    const browser = await profile();
    const { page } = await browser.open();
    await settle(page);
    await selectPart(page, 'CX1');
    await typeField(page, 'Capacitance', '470n');
    await page.locator('chokepoint-stage-editor').getByRole('button', { name: 'Move stage 1 down' }).click();
    const stageIds = async () => ((await activeDocument(page)) as { stages: { id: string }[] }).stages.map((s) => s.id);
    const capacitance = async () => ((await activeDocument(page)) as { stages: { elements: { id: string; part: { capacitance: unknown } }[] }[] }).stages.flatMap((s) => s.elements).find((e) => e.id === 'CX1')!.part.capacitance;
    expect(await stageIds()).toEqual(['mains-side', 'converter-side']);
    await page.locator('body').click({ position: { x: 5, y: 300 } });
    await page.keyboard.press('Control+z');
    expect(await stageIds()).toEqual(['converter-side', 'mains-side']);
    await page.keyboard.press('Control+z');
    expect(await capacitance()).toBe('100 nF');
    await page.keyboard.press('Control+Shift+z');
    expect(await capacitance()).toBe('470n');
    const saved = await savedRevision(page);
    await page.keyboard.press('Control+y');
    expect(await stageIds()).toEqual(['mains-side', 'converter-side']);
    // The history outlives a reload (once the last step is saved, which starts with the keystroke).
    await expect.poll(() => savedRevision(page)).toBeGreaterThan(saved);
    await page.reload();
    await settle(page);
    // The tab's own (perhaps not yet updated) link does not come back as a second variant.
    expect(await variantNames(page)).toHaveLength(1);
    await page.locator('chokepoint-planner').getByRole('button', { name: 'Undo' }).click();
    expect(await stageIds()).toEqual(['converter-side', 'mains-side']);
  });
});

describe('saved work', () => {
  it('a reload restores the variants, the loaded scan (its data), the limits and the selection', async () => {
    const browser = await profile();
    const { page } = await browser.open();
    await settle(page);
    await page.locator('chokepoint-scan-panel').getByRole('button', { name: 'Load the invented demo scan' }).click();
    await expect.poll(async () => page.locator('chokepoint-scan-panel [data-scan]').count()).toBe(1);
    await settle(page);
    await page.locator('chokepoint-limit-editor').getByLabel('Limit preset to add').selectOption('fcc-15.107-class-b-qp');
    await page.locator('chokepoint-limit-editor').getByRole('button', { name: 'Add', exact: true }).click();
    await page.locator('chokepoint-variant-table').getByLabel('Name for a copy of the design being edited').fill('kept');
    await page.locator('chokepoint-variant-table').getByRole('button', { name: 'Keep a copy as a variant' }).click();
    await selectPart(page, 'LCM2');
    await settle(page);
    const margin = await bandMargin(page, '0.15–0.5 MHz');
    // The demo's 260 kHz failure is differential mode: the page says so beside the band, so nobody grows the CM choke for it.
    expect(await page.locator('chokepoint-margin-table tr[data-band="0.15–0.5 MHz"] [data-limited-by]').getAttribute('data-limited-by')).toBe('differential mode');
    const document = await activeDocument(page);
    await page.reload();
    await settle(page);
    expect(await variantNames(page)).toContain('kept');
    expect(await activeDocument(page)).toEqual(document);
    await expect.poll(async () => page.locator('chokepoint-scan-panel [data-scan] input[type="radio"]').isChecked()).toBe(true);
    expect(await bandMargin(page, '0.15–0.5 MHz')).toBe(margin);
    expect(await page.locator('chokepoint-part-editor #part-id').inputValue()).toBe('LCM2');
    await shoot(page, 'work-restored');
  });

  it('a page killed mid-edit (its renderer crashed, no unload handler run) keeps the edit when opened again', async () => {
    const browser = await profile();
    const first = await browser.open();
    await settle(first.page);
    await selectPart(first.page, 'CX3');
    const savedBefore = await savedRevision(first.page);
    await typeField(first.page, 'Capacitance', '68n');
    // Saving starts with the keystroke; once it has landed, the renderer is killed outright.
    await expect.poll(() => savedRevision(first.page)).toBeGreaterThan(savedBefore);
    const cdp = await first.page.context().newCDPSession(first.page);
    const crashed = new Promise((resolve) => first.page.once('crash', resolve));
    // The command never answers: the renderer it would answer from is gone.
    void cdp.send('Page.crash').catch(() => undefined);
    await crashed;
    const second = await browser.open();
    await settle(second.page);
    const document = (await activeDocument(second.page)) as { stages: { elements: { id: string; part: { capacitance: unknown } }[] }[] };
    expect(document.stages.flatMap((s) => s.elements).find((e) => e.id === 'CX3')!.part.capacitance).toBe('68n');
  });

  it('two tabs editing at once: the second to save is stopped and told, nothing is overwritten', async () => {
    const browser = await profile();
    const a = await browser.open();
    await settle(a.page);
    const b = await browser.open();
    await settle(b.page);
    await selectPart(a.page, 'CX1');
    await typeField(a.page, 'Capacitance', '150n');
    await settle(a.page);
    await selectPart(b.page, 'CX1');
    await typeField(b.page, 'Capacitance', '330n');
    await expect.poll(async () => (await b.page.locator('chokepoint-planner .notice.error').allInnerTexts()).join(' ')).toMatch(/another tab/u);
    const third = await browser.open();
    await settle(third.page);
    const saved = (await activeDocument(third.page)) as { stages: { elements: { id: string; part: { capacitance: unknown } }[] }[] };
    expect(saved.stages[0]!.elements[0]!.part.capacitance).toBe('150n');
  });
});

describe('files and links', () => {
  it('a design saved to a file and opened again is the same design, as a new variant', async () => {
    const browser = await profile();
    const { page } = await browser.open();
    await settle(page);
    await selectPart(page, 'CY1');
    await typeField(page, 'Capacitance', '3.3 nF');
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Save file' }).click()]);
    const saved = join(screenshots, 'saved.design.json');
    await download.saveAs(saved);
    const written = JSON.parse(readFileSync(saved, 'utf8')) as unknown;
    expect(written).toEqual(await activeDocument(page));
    await page.locator('chokepoint-file-actions input[type="file"]').setInputFiles(saved);
    await expect.poll(async () => (await variantNames(page)).length).toBe(2);
    expect(await activeDocument(page)).toEqual(written);
  });

  it('a damaged design file is refused with the reason, and nothing changes', async () => {
    const browser = await profile();
    const { page } = await browser.open();
    await settle(page);
    const before = await activeDocument(page);
    const damaged = join(screenshots, 'damaged.design.json');
    const demoText = readFileSync(join(repoRoot, 'fixtures/demo/adapter-two-stage.design.json'), 'utf8');
    writeFileSync(damaged, demoText.replace('"100 nF"', '"100 nX"'));
    await page.locator('chokepoint-file-actions input[type="file"]').setInputFiles(damaged);
    await expect.poll(async () => (await page.locator('chokepoint-planner .notice.error').allInnerTexts()).join(' ')).toMatch(/not a valid design.*capacitance/su);
    expect(await variantNames(page)).toHaveLength(1);
    expect(await activeDocument(page)).toEqual(before);
    writeFileSync(damaged, demoText.slice(0, 500));
    await page.locator('chokepoint-file-actions input[type="file"]').setInputFiles(damaged);
    await expect.poll(async () => (await page.locator('chokepoint-planner .notice.error').allInnerTexts()).join(' ')).toMatch(/not valid JSON \(line \d+, column \d+/u);
    expect(await variantNames(page)).toHaveLength(1);
  });

  it('the link follows every edit; opened in another browser it shows the same design, beside that browser’s own work', async () => {
    const mine = await profile();
    const { page } = await mine.open();
    await settle(page);
    await expect.poll(() => page.url()).toMatch(/#d=[A-Za-z0-9_-]{100,}/u);
    const before = page.url();
    await selectPart(page, 'LCM1');
    await typeField(page, 'Inductance', '3.3 mH');
    await expect.poll(() => page.url()).not.toBe(before);
    const link = new URL(page.url()).hash;
    const document = await activeDocument(page);

    const theirs = await profile();
    const other = await theirs.open();
    await settle(other.page);
    await other.page.goto(`${theirs.origin}/${link}`);
    await settle(other.page);
    expect(await activeDocument(other.page)).toEqual(document);
    expect(await variantNames(other.page)).toHaveLength(2);
    await expect.poll(async () => (await other.page.locator('chokepoint-planner .notice').allInnerTexts()).join(' ')).toMatch(/from the link as a new variant/u);
    // A damaged link opens nothing and says why.
    await other.page.goto(`${theirs.origin}/#d=${link.slice(3, 40)}`);
    await settle(other.page);
    await expect.poll(async () => (await other.page.locator('chokepoint-planner .notice.error').allInnerTexts()).join(' ')).toMatch(/link cannot be used/u);
    expect(await variantNames(other.page)).toHaveLength(2);
  });
});

describe('measured parts', () => {
  it('a |Z| table read in the page becomes the part, as the command line reads it; a bad file changes nothing', async () => {
    const browser = await profile();
    const { page } = await browser.open();
    await settle(page);
    await selectPart(page, 'CX3');
    const editor = page.locator('chokepoint-part-editor');
    await editor.locator('chokepoint-measured-import input[type="file"]').setInputFiles(join(repoRoot, 'fixtures/measured/invented-bead.csv'));
    await expect.poll(async () => editor.locator('chokepoint-measured-import .said').innerText()).toMatch(/invented-bead\.csv read/u);
    await settle(page);
    const document = (await activeDocument(page)) as { stages: { elements: { id: string; part: { kind: string; origin?: { fileName?: string } } }[] }[] };
    const part = document.stages.flatMap((s) => s.elements).find((e) => e.id === 'CX3')!.part;
    expect(part.kind).toBe('measured');
    expect(part.origin?.fileName).toBe('invented-bead.csv');
    expect(await editor.locator('chokepoint-measured-import .summary').innerText()).toMatch(/measured \|Z\| table of \d+ points/u);
    await shoot(page, 'measured-part', ['insertion-loss', 'part-impedance']);
    const before = await activeDocument(page);
    await editor.locator('chokepoint-measured-import input[type="file"]').setInputFiles({ name: 'not-a-table.csv', mimeType: 'text/csv', buffer: Buffer.from('nothing, here\nat, all\n') });
    await expect.poll(async () => editor.locator('chokepoint-measured-import .said.error').innerText()).toMatch(/nothing changed/u);
    expect(await activeDocument(page)).toEqual(before);
  });
});

describe('keyboard and network', () => {
  it('a part is added, named and given a value by keyboard alone', async () => {
    const browser = await profile();
    const { page } = await browser.open();
    await settle(page);
    const placement = page.locator('chokepoint-stage-editor').getByLabel('Where the new part goes, stage 2');
    await placement.focus();
    await page.keyboard.press('Home');
    // "in series, a matched pair in both lines" is the third choice.
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('chokepoint-part-editor #part-id').inputValue()).toBe('L1');
    // To the inductance field: Tab from the id field through label, placement, kind, the switch and into the part's fields.
    await page.locator('chokepoint-part-editor #part-id').focus();
    for (let i = 0; i < 5; i += 1) await page.keyboard.press('Tab');
    await page.keyboard.press('Control+a');
    await page.keyboard.type('33u');
    await settle(page);
    const document = (await activeDocument(page)) as { stages: { elements: { id: string; placement: string; part: { inductance?: unknown } }[] }[] };
    const added = document.stages[1]!.elements.filter((e) => e.id === 'L1' || e.id === 'L2');
    expect(added.map((e) => e.placement)).toEqual(['series-line1', 'series-line2']);
    expect(added[0]!.part.inductance).toBe('33u');
    await shoot(page, 'keyboard-added-pair');
  });

  it('makes no request beyond its own origin, and the plots are keyboard-reachable', async () => {
    const browser = await profile();
    const record = await browser.open();
    await settle(record.page);
    const chart = record.page.locator('chokepoint-plot-panel').first().locator('.plot');
    await chart.focus();
    await record.page.keyboard.press('ArrowRight');
    await expect.poll(async () => (await record.page.locator('chokepoint-cursor-readout').locator('.head').innerText())).toMatch(/^At \d/u);
    await record.page.keyboard.press('+');
    await record.page.keyboard.press('0');
    browser.expectOnlyLocalTraffic(record);
    expect(record.consoleErrors).toEqual([]);
  });
});
