import { afterEach, describe, expect, it } from 'vitest';
import { MarginTable } from '../../../src/ui/emissions/margin-table.ts';
import { marginTableView } from '../../../src/ui/emissions/margin-view.ts';
import { analyse, emissionsDesignDocument, scanNoise, syntheticScan } from '../support/emissions-fixtures.ts';

afterEach(() => {
  document.body.replaceChildren();
});

const cells = (row: Element): string[] => [...row.querySelectorAll('td')].map((td) => td.textContent?.replace(/\s+/gu, ' ').trim() ?? '');

describe('<chokepoint-margin-table>', () => {
  it('is registered under its tag and draws nothing without a view', async () => {
    expect(customElements.get('chokepoint-margin-table')).toBe(MarginTable);
    const table = document.createElement('chokepoint-margin-table');
    document.body.append(table);
    await table.updateComplete;
    expect(table.shadowRoot?.textContent?.trim()).toBe('');
  });

  it('renders the overall result, each band’s worst margin with pass or fail, the peaks, the ranges and the notes', async () => {
    const view = marginTableView(analyse(emissionsDesignDocument(), scanNoise(syntheticScan())));
    const table = document.createElement('chokepoint-margin-table');
    table.view = view;
    document.body.append(table);
    await table.updateComplete;
    const root = table.shadowRoot!;
    expect(root.querySelector('.verdict')?.getAttribute('data-verdict')).toBe(view.verdict);
    expect(root.querySelector('.verdict strong')?.textContent).toBe(view.verdictWord);

    const bands = [...root.querySelectorAll('table.bands tbody tr')];
    expect(bands).toHaveLength(3);
    bands.forEach((row, i) => {
      const band = view.bands[i]!;
      expect(row.className).toBe(band.verdict);
      expect(cells(row)).toEqual([
        band.name,
        band.worst!.margin,
        band.worst!.frequency,
        band.worst!.level,
        band.worst!.limit,
        `${band.worst!.mask} ${band.worst!.series}`,
        band.verdictText,
      ]);
    });
    expect(root.querySelectorAll('table.peaks tbody tr')).toHaveLength(view.peaks.length);
    expect(root.querySelectorAll('table.ranges tbody tr')).toHaveLength(view.failingRanges.length);
    const notes = [...root.querySelectorAll('.notes li')].map((li) => li.textContent?.trim());
    expect(notes).toEqual(view.notes);
    expect([...root.querySelectorAll('.required dt')].map((dt) => dt.textContent)).toEqual(['common mode', 'differential mode']);
  });
});
