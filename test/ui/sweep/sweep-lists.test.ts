import { afterEach, describe, expect, it } from 'vitest';
import '../../../src/ui/checks/safety-panel.ts';
import demoDesign from '../../../fixtures/demo/adapter-two-stage.design.json';
import { requireDesign } from '../../../src/model/read-design.ts';
import { runSafetyChecks } from '../../../src/safety/index.ts';
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

describe('<chokepoint-safety-panel>', () => {
  it('always cautions that the checks are planning aids; shows each check with its status and what a missing input needs', async () => {
    const panel = document.createElement('chokepoint-safety-panel');
    document.body.append(panel);
    await panel.updateComplete;
    expect(panel.shadowRoot?.textContent).toMatch(/planning aids, not a certification/u);
    panel.state = { status: 'done', report: runSafetyChecks(requireDesign(demoDesign)) };
    await panel.updateComplete;
    const text = panel.shadowRoot?.textContent?.replace(/\s+/gu, ' ') ?? '';
    expect(text).toContain('Leakage (touch) current');
    expect(text).toMatch(/Give: operating\.supply/u);
    expect(text).toMatch(/licensed practice/u);
    expect(panel.shadowRoot?.querySelector('[data-check="leakage"] .badge')?.textContent).toBe('not checked');
  });
});
