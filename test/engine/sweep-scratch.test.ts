import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { sweepDesign, SweepScratch } from '../../src/engine/index.ts';
import type { SweepResult } from '../../src/engine/sweep/sweep-result.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import { buildDesign, capacitor, element } from '../support/design-builders.ts';
import { propertySettings } from '../support/property-settings.ts';
import { randomDesign } from '../support/random-designs.ts';

/** Every number a sweep hands out: the grid, each column, each transfer and each part view. */
function numbersOf(result: SweepResult): number[][] {
  return [
    Array.from(result.frequencyHz),
    ...Object.values(result.columns).map((column) => Array.from(column)),
    ...Object.values(result.transfers).flatMap((transfer) => [Array.from(transfer.re), Array.from(transfer.im)]),
    ...result.elements.flatMap((element) => element.views.flatMap((view) => [Array.from(view.magnitudeOhm), Array.from(view.phaseDeg)])),
  ];
}

describe('sweep scratch memory', () => {
  it('gives exactly the numbers of a fresh sweep, whatever was swept with it or written in its result buffers before', () => {
    // One scratch carried through a run of random designs of different shapes and grid sizes (and
    // the same shape again with another grid): memory left over from an earlier sweep must never
    // show in a later one, so each result equals a sweep with memory of its own, to the bit.
    const scratch = new SweepScratch();
    fc.assert(
      fc.property(randomDesign, fc.integer({ min: 5, max: 60 }), fc.boolean(), (input, pointsPerDecade, refine) => {
        const design = requireDesign({ ...input, frequencyPlan: { startHz: 9e3, stopHz: 3e7, pointsPerDecade } });
        const fresh = sweepDesign(design, { refine });
        const reused = sweepDesign(design, { refine, scratch });
        expect(numbersOf(reused)).toEqual(numbersOf(fresh));
        expect(reused.resonances).toEqual(fresh.resonances);
        // Handed back, its storage holds the next result: stale values there must not show either.
        scratch.reuseResultBuffer(reused.frequencyHz.buffer as ArrayBuffer);
      }),
      propertySettings(40),
    );
  });

  it('hands out results that later sweeps do not overwrite', () => {
    const scratch = new SweepScratch();
    const plan = { startHz: 1.5e5, stopHz: 3e7, pointsPerDecade: 50 };
    const design = buildDesign({ elements: [element('line-to-line', capacitor(1e-7, { esl: 1e-8, esr: 0.01 }))], frequencyPlan: plan });
    const first = sweepDesign(design, { scratch });
    const kept = numbersOf(first);
    const larger = buildDesign({ elements: [element('line-to-line', capacitor(4.7e-7, { esl: 1e-8, esr: 0.01 }))], frequencyPlan: plan });
    sweepDesign(larger, { scratch });
    expect(numbersOf(first)).toEqual(kept);
    // Once handed back, the next result of that size is written into the same storage, afresh.
    const storage = first.frequencyHz.buffer as ArrayBuffer;
    scratch.reuseResultBuffer(storage);
    const again = sweepDesign(larger, { scratch });
    expect(again.frequencyHz.buffer).toBe(storage);
    expect(numbersOf(again)).toEqual(numbersOf(sweepDesign(larger)));
  });
});
