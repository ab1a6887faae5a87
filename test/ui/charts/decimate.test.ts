// @vitest-environment node
// Thinning for display is pure: it runs in plain Node, with no DOM.
import { describe, expect, it } from 'vitest';
import { decimateLogMaxHold, lowerBound, upperBound } from '../../../src/ui/charts/decimate.ts';

/** n points from `from` to `to` Hz, evenly spaced on a linear axis like a receiver's sweep. */
function linearAxis(n: number, from: number, to: number): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => from + ((to - from) * i) / (n - 1));
}

describe('decimateLogMaxHold', () => {
  it('is not called on a DOM', () => {
    expect(typeof document).toBe('undefined');
  });

  it('returns a short axis point for point, NaN as a gap (null)', () => {
    const x = Float64Array.of(1e5, 2e5, 5e5, 1e6);
    const level = Float64Array.of(40, Number.NaN, 55, 30);
    const out = decimateLogMaxHold(x, [level], { bins: 100 });
    expect(out.x).toEqual([1e5, 2e5, 5e5, 1e6]);
    expect(out.columns).toEqual([[40, null, 55, 30]]);
  });

  it('keeps a one-point peak at its full height: max-hold, never an average', () => {
    const n = 100_000;
    const x = linearAxis(n, 150e3, 30e6);
    const level = new Float64Array(n).fill(20);
    const spike = 61_234;
    level[spike] = 87.5;
    const out = decimateLogMaxHold(x, [level], { bins: 500 });
    expect(out.x.length).toBeLessThanOrEqual(500);
    expect(Math.max(...(out.columns[0] as number[]))).toBe(87.5);
    // The spike keeps its own frequency, not the bin's centre.
    expect(out.x[out.columns[0]!.indexOf(87.5)]).toBe(x[spike]);
    // Nothing is invented between the floor and the peak, as an average would.
    expect(new Set(out.columns[0])).toEqual(new Set([20, 87.5]));
  });

  it('holds the minimum of a column asked to (a limit: the stricter value in a pixel)', () => {
    const x = linearAxis(10_000, 4.9e6, 5.1e6);
    // A step from 56 to 60 at 5 MHz, lower level at the step itself.
    const limit = Float64Array.from(x, (f) => (f <= 5e6 ? 56 : 60));
    const level = Float64Array.from(x, (_, i) => (i % 7 === 0 ? 50 : 10));
    const out = decimateLogMaxHold(x, [level, limit], { bins: 50, reduce: ['max', 'min'] });
    expect(out.columns[0]!.every((v) => v === 50)).toBe(true);
    const limits = out.columns[1] as number[];
    // Still a step: 56 up to 5 MHz, 60 after it, and never a value in between.
    expect(new Set(limits)).toEqual(new Set([56, 60]));
    const firstHigh = limits.indexOf(60);
    expect(limits.slice(0, firstHigh).every((v) => v === 56)).toBe(true);
    expect(limits.slice(firstHigh).every((v) => v === 60)).toBe(true);
    expect(out.x[firstHigh - 1]).toBeLessThanOrEqual(5e6);
    expect(out.x[firstHigh]).toBeGreaterThan(5e6);
  });

  it('leaves a bin with no finite value as a gap and ignores NaN beside finite values', () => {
    const x = linearAxis(1000, 1e5, 1e6);
    const values = Float64Array.from(x, (f) => (f < 5e5 ? Number.NaN : 30));
    values[999] = Number.NaN;
    const out = decimateLogMaxHold(x, [values], { bins: 20 });
    const column = out.columns[0]!;
    expect(column[0]).toBeNull();
    expect(column[column.length - 1]).toBe(30);
  });

  it('thins a window and keeps one point beyond each edge and, if asked, the axis ends', () => {
    const x = linearAxis(50_000, 1e5, 3e7);
    const values = Float64Array.from(x, (_, i) => i);
    const out = decimateLogMaxHold(x, [values], { bins: 100, fromX: 1e6, toX: 2e6, keepEnds: true });
    expect(out.x[0]).toBe(x[0]);
    expect(out.x[out.x.length - 1]).toBe(x[x.length - 1]);
    const inside = out.x.slice(2, -2);
    expect(inside.every((f) => f >= 1e6 && f <= 2e6)).toBe(true);
    expect(out.x[1]).toBeLessThan(1e6);
    expect(out.x[out.x.length - 2]).toBeGreaterThan(2e6);
    expect(inside.length).toBeLessThanOrEqual(100);
    // The axis stays rising.
    for (let i = 1; i < out.x.length; i += 1) expect(out.x[i]!).toBeGreaterThan(out.x[i - 1]!);
  });

  it('shows a zoomed-in window of a dense scan point for point', () => {
    const x = linearAxis(1_000_000, 150e3, 30e6);
    const values = Float64Array.from(x, (_, i) => i % 1000);
    const start = lowerBound(x, 10e6);
    const stop = upperBound(x, 10.02e6);
    const out = decimateLogMaxHold(x, [values], { bins: 800, fromX: 10e6, toX: 10.02e6 });
    // Fewer points in the window than bins: every one of them, plus the two neighbours.
    expect(stop - start).toBeLessThan(800);
    expect(out.x.length).toBe(stop - start + 2);
  });

  it('thins a million-point scan with several columns to about one point per bin', () => {
    const n = 1_000_000;
    const x = linearAxis(n, 150e3, 30e6);
    const columns = [0, 1, 2, 3, 4, 5].map((c) => Float64Array.from(x, (_f, i) => (i === 777_777 + c ? 95 : 40 + 20 * Math.sin(i / (50 + c)))));
    const out = decimateLogMaxHold(x, columns, { bins: 1200 });
    expect(out.x.length).toBeLessThanOrEqual(1200);
    expect(out.x.length).toBeGreaterThan(1000);
    for (const column of out.columns) expect(column).toHaveLength(out.x.length);
    // The one tall point of each column survives.
    for (const column of out.columns) expect(Math.max(...(column as number[]))).toBe(95);
  });

  it('handles an empty axis and one point', () => {
    expect(decimateLogMaxHold(new Float64Array(0), [new Float64Array(0)], { bins: 10 })).toEqual({ x: [], columns: [[]] });
    expect(decimateLogMaxHold(Float64Array.of(1e6), [Float64Array.of(3)], { bins: 10 })).toEqual({ x: [1e6], columns: [[3]] });
  });
});

describe('lowerBound and upperBound', () => {
  it('find the window of a sorted axis', () => {
    const x = [1, 2, 2, 3, 5];
    expect(lowerBound(x, 2)).toBe(1);
    expect(upperBound(x, 2)).toBe(3);
    expect(lowerBound(x, 0)).toBe(0);
    expect(upperBound(x, 9)).toBe(5);
  });
});
