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

  it('renders the overall result, each band’s worst margin with its evidence and pass or fail, the peaks, the ranges and the notes', async () => {
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
        band.judged,
        band.covered,
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

describe('<chokepoint-margin-table>: a verdict needs evidence', () => {
  it('a scan covering the low band only: the other bands say NOT COVERED with why, the verdict lists the reasons', async () => {
    const view = marginTableView(analyse(emissionsDesignDocument(), scanNoise(syntheticScan({ stopHz: 480e3 }))));
    const table = document.createElement('chokepoint-margin-table');
    table.view = view;
    document.body.append(table);
    await table.updateComplete;
    const root = table.shadowRoot!;
    expect(root.querySelector('.verdict strong')?.textContent).toBe('FAIL');
    const rows = [...root.querySelectorAll('table.bands tbody tr')];
    expect(rows.map((row) => row.getAttribute('data-status')).slice(1)).toEqual(['not-covered', 'not-covered']);
    // The low band has judged points: it fails on them or, passing, still misses its upper edge (480 of 500 kHz).
    expect(rows[0]!.getAttribute('data-status')).not.toBe('pass');
    expect(cells(rows[1]!).at(-1)).toBe('NOT COVERED the scan has no point in this band');
    const reasons = [...root.querySelectorAll('.verdict .reasons li')].map((li) => li.textContent?.trim());
    expect(reasons).toContain('5–30 MHz: not covered: the scan has no point in this band');
  });
});
