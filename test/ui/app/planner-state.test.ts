// @vitest-environment node
import { describe, expect, it } from 'vitest';
import demo from '../../../fixtures/demo/adapter-two-stage.design.json';
import { encodeDesignHash } from '../../../src/io/design-url.ts';
import { designFromHash, type DesignState, statusLine } from '../../../src/ui/app/planner-state.ts';
import { syntheticSweep } from '../support/synthetic-sweep.ts';

function ready(state: DesignState): Extract<DesignState, { kind: 'ready' }> {
  if (state.kind !== 'ready') throw new Error(`expected a design, got ${state.error.message}`);
  return state;
}

describe('designFromHash', () => {
  it('shows the demo when the hash names no design', () => {
    const state = ready(designFromHash('', demo));
    expect(state.origin).toBe('demo');
    expect(state.document).toBe(demo);
    expect(state.design.name).toBe(demo.name);
  });

  it('shows the link’s design when there is one', () => {
    const state = ready(designFromHash(encodeDesignHash({ ...demo, name: 'linked' }), demo));
    expect(state.origin).toBe('link');
    expect(state.design.name).toBe('linked');
  });

  it('refuses a bad link without falling back to the demo', () => {
    const state = designFromHash('#design=@@', demo);
    expect(state).toMatchObject({ kind: 'unreadable', origin: 'link' });
  });

  it('reports a broken demo as such', () => {
    expect(designFromHash('', { format: 'chokepoint-design', version: 1 })).toMatchObject({ kind: 'unreadable', origin: 'demo' });
  });
});

describe('statusLine', () => {
  const design = ready(designFromHash('', demo));

  it('tells what is happening, with points and worker time when done', () => {
    expect(statusLine(design, { kind: 'idle' })).toEqual({ tone: 'idle', text: 'Waiting to sweep.', issues: [] });
    expect(statusLine(design, { kind: 'running' }).text).toBe(`Sweeping “${demo.name}”…`);
    const result = syntheticSweep();
    expect(statusLine(design, { kind: 'done', result, elapsedMs: 3.25 }).text).toBe(
      `Swept ${result.frequencyHz.length} points, 9 kHz to 30 MHz, in 3.3 ms in the worker.`,
    );
    expect(statusLine(design, { kind: 'done', result, elapsedMs: 12_345 }).text).toMatch(/in 12\.3 s in the worker\.$/u);
  });

  it('lists each problem of an unreadable link as "path: message"', () => {
    const broken = structuredClone(demo);
    broken.noiseSource.commonMode.impedance.capacitance = '0 F';
    const status = statusLine(designFromHash(encodeDesignHash(broken), demo), { kind: 'idle' });
    expect(status.tone).toBe('error');
    expect(status.text).toBe('The design in the link cannot be used, so nothing is drawn.');
    expect(status.issues).toEqual(['noiseSource.commonMode.impedance.capacitance: expected a positive number in F, got 0']);
  });

  it('words a worker refusal by its kind', () => {
    const failed = (kind: 'invalid-design' | 'invalid-request' | 'engine-failure') =>
      statusLine(design, { kind: 'failed', error: { kind, message: 'the sweep failed: x', issues: [] } }).text;
    expect(failed('invalid-design')).toBe('The design is invalid, so nothing is drawn.');
    expect(failed('invalid-request')).toMatch(/malformed request/u);
    expect(failed('engine-failure')).toBe('The sweep failed, so nothing is drawn: the sweep failed: x');
  });
});
