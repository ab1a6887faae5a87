import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { limitAt, limitOnGrid, maskCorners, type MaskPoints } from '../../src/spectrum/limit-mask.ts';
import { findPreset, type LimitPreset } from '../../src/spectrum/limit-presets.ts';
import { propertySettings } from '../support/property-settings.ts';

/**
 * Limit values below come from references.md §1. The class B and class A lines are
 * those of 47 CFR §15.107(a) and (b) (status V, CFR text as revised October 2008), taken here from
 * the FCC presets; the interpolated values are references.md §1.2 (status C: computed from the
 * log-f rule applied to that V table), given there to 4 decimals and checked to ±0.001 dB, the
 * tolerance references.md suggests for C values in dB.
 */

const MHz = 1e6;
const TOLERANCE_DB = 1e-3;

function preset(id: string): LimitPreset {
  const found = findPreset(id);
  if (!found) throw new Error(`no preset ${id}`);
  return found;
}

function expectDb(actual: number | undefined, expected: number): void {
  expect(actual).toBeDefined();
  expect(Math.abs(actual! - expected)).toBeLessThanOrEqual(TOLERANCE_DB);
}

// 47 CFR §15.107(a), class B (V).
const classBQp = preset('fcc-15.107-class-b-qp');
const classBAv = preset('fcc-15.107-class-b-av');
// 47 CFR §15.107(b), class A (V).
const classAQp = preset('fcc-15.107-class-a-qp');
const classAAv = preset('fcc-15.107-class-a-av');

describe('limitAt on the class B line (47 CFR §15.107(a), V; check values references.md §1.2, C)', () => {
  it.each([
    // f (MHz), QP, AV: references.md §1.2 table, status C.
    [0.15, 66.0, 56.0],
    [0.2, 63.6106, 53.6106],
    [0.25, 61.7572, 51.7572],
    [0.3, 60.2428, 50.2428],
    [0.4, 57.8534, 47.8534],
    [0.45, 56.8751, 46.8751],
    [0.5, 56.0, 46.0],
  ])('at %f MHz: QP %f dBµV, AV %f dBµV', (f, qp, av) => {
    expectDb(limitAt(classBQp, f * MHz), qp);
    expectDb(limitAt(classBAv, f * MHz), av);
  });

  it('is a straight line in log f: 0.3 MHz is 60.2428 dBµV QP, not the 61.7143 of a linear-frequency axis (references.md §1.2 note, C)', () => {
    const qp = limitAt(classBQp, 0.3 * MHz)!;
    expectDb(qp, 60.2428);
    // Interpolating on a linear frequency axis gives 66 − 10·(0.15/0.35) = 61.7143 (references.md §1.2, C).
    expect(Math.abs(qp - 61.7143)).toBeGreaterThan(1);
    // The same slip at 250 kHz would give 63.14 instead of 61.76 (domain.md §6 C5).
    expect(Math.abs(limitAt(classBQp, 0.25 * MHz)! - 63.1429)).toBeGreaterThan(1);
  });

  it('the lower limit applies at the band edges 0.5 MHz and 5 MHz (§15.107(a) text, V; C in references.md §1.2)', () => {
    // At 0.5 MHz the falling segment and the flat band meet at 56 / 46.
    expect(limitAt(classBQp, 0.5 * MHz)).toBe(56);
    expect(limitAt(classBAv, 0.5 * MHz)).toBe(46);
    // At 5 MHz the line steps from 56 up to 60 (QP) and 46 up to 50 (AV): the lower applies at 5 MHz itself.
    expect(limitAt(classBQp, 5 * MHz)).toBe(56);
    expect(limitAt(classBAv, 5 * MHz)).toBe(46);
    // Either side of the step, each band's own level.
    expect(limitAt(classBQp, 4.999999 * MHz)).toBe(56);
    expect(limitAt(classBQp, 5.000001 * MHz)).toBe(60);
    expect(limitAt(classBAv, 5.000001 * MHz)).toBe(50);
  });

  it('is flat from 0.5 to 5 MHz and from 5 to 30 MHz (§15.107(a), V)', () => {
    for (const f of [0.7, 1, 2, 4.5]) {
      expect(limitAt(classBQp, f * MHz)).toBe(56);
      expect(limitAt(classBAv, f * MHz)).toBe(46);
    }
    for (const f of [6, 10, 29.9, 30]) {
      expect(limitAt(classBQp, f * MHz)).toBe(60);
      expect(limitAt(classBAv, f * MHz)).toBe(50);
    }
  });
});

describe('limitAt on the class A line (47 CFR §15.107(b), V)', () => {
  it('79 / 66 dBµV below 0.5 MHz, 73 / 60 above', () => {
    expect(limitAt(classAQp, 0.15 * MHz)).toBe(79);
    expect(limitAt(classAQp, 0.3 * MHz)).toBe(79);
    expect(limitAt(classAQp, 0.499999 * MHz)).toBe(79);
    expect(limitAt(classAQp, 0.500001 * MHz)).toBe(73);
    expect(limitAt(classAQp, 30 * MHz)).toBe(73);
    expect(limitAt(classAAv, 0.3 * MHz)).toBe(66);
    expect(limitAt(classAAv, 10 * MHz)).toBe(60);
  });

  it('the lower limit applies at the 0.5 MHz boundary: 73 QP, 60 AV (§15.107(b) text, V; C in references.md §1.2)', () => {
    expect(limitAt(classAQp, 0.5 * MHz)).toBe(73);
    expect(limitAt(classAAv, 0.5 * MHz)).toBe(60);
  });
});

describe('limitAt outside the span and on invented masks', () => {
  it('is undefined below the first and above the last frequency, and for NaN', () => {
    for (const f of [0, -1, 149_999.999, 30_000_000.001, 1e12, Number.POSITIVE_INFINITY, Number.NaN]) {
      expect(limitAt(classBQp, f)).toBeUndefined();
    }
    expect(limitAt(classBQp, 150e3)).toBe(66);
    expect(limitAt(classBQp, 30e6)).toBe(60);
  });

  // INVENTED masks (no standard): shapes the presets do not have.
  it('takes the lower level at a step whichever way it goes, also at the first and last frequency', () => {
    const down: MaskPoints = { frequencyHz: [1e3, 1e3, 1e4, 1e4], levelDbuV: [90, 70, 70, 80] };
    expect(limitAt(down, 1e3)).toBe(70);
    expect(limitAt(down, 1e4)).toBe(70);
    expect(limitAt(down, 5e3)).toBe(70);
    const up: MaskPoints = { frequencyHz: [1e3, 2e3, 2e3, 4e3], levelDbuV: [40, 40, 50, 50] };
    expect(limitAt(up, 2e3)).toBe(40);
    expect(limitAt(up, 2000.000001)).toBe(50);
  });

  it('interpolates a rising segment and holds exact values at the points', () => {
    // INVENTED: 40 dBµV at 1 kHz rising to 60 dBµV at 100 kHz, 10 dB per decade.
    const rising: MaskPoints = { frequencyHz: [1e3, 1e5], levelDbuV: [40, 60] };
    expect(limitAt(rising, 1e4)).toBeCloseTo(50, 12);
    expect(limitAt(rising, Math.sqrt(10) * 1e3)).toBeCloseTo(45, 12);
    expect(limitAt(rising, 1e3)).toBe(40);
    expect(limitAt(rising, 1e5)).toBe(60);
  });

  it('stays between the two ends of its segment and agrees with limitOnGrid (property, invented masks)', () => {
    const mask = fc
      .array(fc.record({ gapDecades: fc.double({ min: 0, max: 2, noNaN: true }), level: fc.double({ min: -20, max: 140, noNaN: true }) }), {
        minLength: 2,
        maxLength: 12,
      })
      .map((points) => {
        let f = 1e3;
        const frequencyHz: number[] = [];
        points.forEach((p, i) => {
          // A gap of zero is a step; never three points at one frequency.
          const step = p.gapDecades < 0.2 && i > 0 && frequencyHz[i - 2] !== f;
          if (i > 0 && !step) f *= 10 ** Math.max(p.gapDecades, 0.01);
          frequencyHz.push(f);
        });
        return { frequencyHz, levelDbuV: points.map((p) => p.level) };
      });
    fc.assert(
      fc.property(mask, fc.double({ min: 0, max: 1, noNaN: true }), (m, where) => {
        const f0 = m.frequencyHz[0]!;
        const f1 = m.frequencyHz[m.frequencyHz.length - 1]!;
        const f = f0 * (f1 / f0) ** where;
        const level = limitAt(m, f);
        const grid = limitOnGrid(m, Float64Array.of(f, f0 / 2, f1 * 2));
        if (f < f0 || f > f1) return;
        expect(level).toBeDefined();
        expect(grid[0]).toBe(level);
        expect(grid[1]).toBeNaN();
        expect(grid[2]).toBeNaN();
        let below = 0;
        while (below + 1 < m.frequencyHz.length && m.frequencyHz[below + 1]! <= f) below += 1;
        const above = m.frequencyHz.findIndex((x) => x >= f);
        const ends = [m.levelDbuV[below]!, m.levelDbuV[above]!];
        if (m.frequencyHz[below] === f) ends.push(...m.levelDbuV.filter((_, i) => m.frequencyHz[i] === f));
        expect(level!).toBeGreaterThanOrEqual(Math.min(...ends) - 1e-9);
        expect(level!).toBeLessThanOrEqual(Math.max(...ends) + 1e-9);
      }),
      propertySettings(500),
    );
  });
});

describe('limitOnGrid', () => {
  it('gives the limit at every grid frequency, in any order, NaN outside the span', () => {
    const grid = Float64Array.of(0.3 * MHz, 100e3, 5 * MHz, 0.15 * MHz, 40 * MHz, 10 * MHz);
    const limit = limitOnGrid(classBQp, grid);
    expect(limit).toBeInstanceOf(Float64Array);
    expect(limit).toHaveLength(grid.length);
    expectDb(limit[0], 60.2428); // references.md §1.2, C
    expect(limit[1]).toBeNaN();
    expect(limit[2]).toBe(56); // lower limit at the 5 MHz edge, §15.107(a) (V)
    expect(limit[3]).toBe(66);
    expect(limit[4]).toBeNaN();
    expect(limit[5]).toBe(60);
    grid.forEach((f, i) => {
      if (!Number.isNaN(limit[i])) expect(limit[i]).toBe(limitAt(classBQp, f));
    });
  });

  it('writes into a caller-owned array and refuses one of the wrong length', () => {
    const grid = Float64Array.of(0.2 * MHz, 1 * MHz);
    const out = new Float64Array(2);
    expect(limitOnGrid(classBAv, grid, out)).toBe(out);
    expectDb(out[0], 53.6106); // references.md §1.2, C
    expect(out[1]).toBe(46); // §15.107(a), V
    expect(() => limitOnGrid(classBAv, grid, new Float64Array(3))).toThrow(RangeError);
  });

  it('handles an empty grid', () => {
    expect(limitOnGrid(classAQp, new Float64Array(0))).toHaveLength(0);
  });
});

describe('maskCorners', () => {
  it('class B: start, the bend at 0.5 MHz, the step at 5 MHz, stop (47 CFR §15.107(a), V)', () => {
    expect([...maskCorners(classBQp)]).toEqual([0.15 * MHz, 0.5 * MHz, 5 * MHz, 30 * MHz]);
    expect([...maskCorners(classBAv)]).toEqual([0.15 * MHz, 0.5 * MHz, 5 * MHz, 30 * MHz]);
  });

  it('class A: start, the step at 0.5 MHz, stop (47 CFR §15.107(b), V)', () => {
    expect([...maskCorners(classAQp)]).toEqual([0.15 * MHz, 0.5 * MHz, 30 * MHz]);
  });

  it('leaves out points that only continue a straight line in log f (invented mask)', () => {
    // INVENTED: 66 → 56 over 0.15–0.5 MHz written with an extra point on the line at 0.3 MHz.
    const onLine = limitAt(classBQp, 0.3 * MHz)!;
    const mask: MaskPoints = { frequencyHz: [0.15 * MHz, 0.3 * MHz, 0.5 * MHz, 1 * MHz, 2 * MHz], levelDbuV: [66, onLine, 56, 56, 50] };
    expect([...maskCorners(mask)]).toEqual([0.15 * MHz, 0.5 * MHz, 1 * MHz, 2 * MHz]);
  });

  it('lists a step at the first frequency once', () => {
    const mask: MaskPoints = { frequencyHz: [1e3, 1e3, 1e4], levelDbuV: [90, 70, 70] };
    expect([...maskCorners(mask)]).toEqual([1e3, 1e4]);
  });
});
