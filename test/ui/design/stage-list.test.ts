import { afterEach, describe, expect, it } from 'vitest';
import demo from '../../../fixtures/demo/adapter-two-stage.design.json';
import { requireDesign } from '../../../src/model/index.ts';
import '../../../src/ui/design/stage-list.ts';
import { buildDesign, capacitor, element } from '../../support/design-builders.ts';

afterEach(() => {
  document.body.replaceChildren();
});

async function mountStageList(design: ReturnType<typeof requireDesign> | undefined) {
  const list = document.createElement('chokepoint-stage-list');
  list.design = design;
  document.body.append(list);
  await list.updateComplete;
  return list;
}

const rows = (root: ShadowRoot | null | undefined): string[][] =>
  [...(root?.querySelectorAll('tbody tr') ?? [])].map((row) =>
    [...row.querySelectorAll('td')].map((cell) => cell.textContent?.replace(/\s+/gu, ' ').trim() ?? ''),
  );

describe('<chokepoint-stage-list>', () => {
  it('renders nothing without a design', async () => {
    const list = await mountStageList(undefined);
    expect(list.shadowRoot?.textContent?.trim()).toBe('');
  });

  it('lists each stage with its elements, values in engineering notation and placements', async () => {
    const list = await mountStageList(requireDesign(demo));
    const root = list.shadowRoot;
    expect([...(root?.querySelectorAll('h3') ?? [])].map((h) => h.textContent?.replace(/\s+/gu, ' ').trim())).toEqual([
      'Stage 1, converter side (converter-side)',
      'Stage 2, mains inlet (mains-side)',
    ]);
    const all = rows(root);
    expect(all.map((row) => row[0])).toEqual(['CX1', 'CY1', 'CY2', 'LCM1', 'CX2', 'LCM2', 'CX3']);
    expect(all[0]).toEqual(['CX1', '100 nF', 'X2 capacitor, line to line ESR 30 mΩ, ESL 10 nH, rated 310 V']);
    expect(all[1]?.[2]).toMatch(/^Y2 capacitor, line 1 to ground/u);
    expect(all[3]?.[1]).toBe('2.2 mH');
    expect(all[3]?.[2]).toMatch(/^common-mode choke, both lines, coupled value per winding, leakage 12 µH, DCR 60 mΩ/u);
    expect(all[5]?.[2]).toContain('coupling k = 0.992');
    const ends = root?.querySelector('.ends')?.textContent?.replace(/\s+/gu, ' ');
    // The demo's converter couples 1.5 pF to chassis (an ideal capacitor: no parasitics listed).
    expect(ends).toContain('Source, CM capacitor 1.5 pF Source, DM capacitor 100 µF (ESR 300 mΩ, ESL 20 nH)');
    expect(ends).toContain('LISN, 50 Ω ∥ (50 µH + 5 Ω), each line');
  });

  it('marks a switched-off element and an empty stage', async () => {
    const design = buildDesign({
      stages: [
        { id: 'one', elements: [{ ...element('line-to-line', capacitor(1e-6), 'C9'), enabled: false }] },
        { id: 'two', label: 'Spare', elements: [] },
      ],
    });
    const list = await mountStageList(design);
    const row = list.shadowRoot?.querySelector('tbody tr');
    expect(row?.classList.contains('off')).toBe(true);
    expect(row?.textContent).toContain('(switched off)');
    expect(list.shadowRoot?.querySelector('.empty-stage')?.textContent).toBe('No elements.');
    expect(list.shadowRoot?.textContent).toContain('resistive');
  });
});
