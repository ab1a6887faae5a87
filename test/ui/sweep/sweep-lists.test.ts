import { afterEach, describe, expect, it } from 'vitest';
import '../../../src/ui/app/safety-note.ts';
import '../../../src/ui/sweep/resonance-list.ts';
import '../../../src/ui/sweep/warning-list.ts';
import { syntheticSweep } from '../support/synthetic-sweep.ts';

afterEach(() => {
  document.body.replaceChildren();
});

const cells = (root: ShadowRoot | null | undefined): string[] =>
  [...(root?.querySelectorAll('tbody tr') ?? [])].map((row) => row.textContent?.replace(/\s+/gu, ' ').trim() ?? '');

describe('<chokepoint-resonance-list>', () => {
  it('lists self-resonances and located peaks of the drawn curves by frequency', async () => {
    const list = document.createElement('chokepoint-resonance-list');
    list.result = syntheticSweep();
    document.body.append(list);
    await list.updateComplete;
    expect(cells(list.shadowRoot)).toEqual([
      '▼ 850 kHz LCM1 2.2 mH choke, CM impedance: parallel self-resonance',
      '○ 2.37 MHz DM 50 Ω/50 Ω: peak, 157.2 dB',
      '▼ 5 MHz CX1 X2 100 nF: series self-resonance',
      '▼ 16 MHz LCM1 2.2 mH choke, DM impedance: parallel self-resonance',
    ]);
  });

  it('says when there is nothing to list', async () => {
    const list = document.createElement('chokepoint-resonance-list');
    list.result = { ...syntheticSweep(), resonances: [] };
    document.body.append(list);
    await list.updateComplete;
    expect(list.shadowRoot?.textContent).toContain('No self-resonances or located peaks');
  });
});

describe('<chokepoint-warning-list>', () => {
  it('lists the sweep warnings, or says there are none', async () => {
    const list = document.createElement('chokepoint-warning-list');
    list.warnings = syntheticSweep().warnings;
    document.body.append(list);
    await list.updateComplete;
    expect([...(list.shadowRoot?.querySelectorAll('li') ?? [])].map((li) => li.textContent)).toEqual([
      'CX1 X2 100 nF: no ESL, so its attenuation keeps rising with frequency',
    ]);
    list.warnings = [];
    await list.updateComplete;
    expect(list.shadowRoot?.textContent).toContain('None: no idealised parts or flagged points.');
  });
});

describe('<chokepoint-safety-note>', () => {
  it('cautions about Y leakage, X discharge, safety-rated parts and local codes', async () => {
    const note = document.createElement('chokepoint-safety-note');
    document.body.append(note);
    await note.updateComplete;
    const text = note.shadowRoot?.textContent?.replace(/\s+/gu, ' ') ?? '';
    expect(text).toContain('Y capacitors (line to protective earth) pass leakage current to earth');
    expect(text).toContain('X capacitors (line to line) stay charged after unplugging: give them a discharge path');
    expect(text).toContain('safety-rated X and Y capacitors');
    expect(text).toContain('local electrical codes and licensed practice');
  });
});
