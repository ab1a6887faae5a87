import { describe, expect, it } from 'vitest';
import { plotToCsv } from '../../src/drawing/plot-csv.ts';
import { nearestIndex, readoutAt, valueAt } from '../../src/drawing/plot-readout.ts';
import type { PlotSpec } from '../../src/drawing/plot-spec.ts';

function spec(): PlotSpec {
  return {
    id: 't',
    title: 'Test',
    description: 'a test plot',
    x: { label: 'Frequency', min: 1e5, max: 1e7 },
    y: { label: 'Level', unit: 'dB', scale: 'linear' },
    series: [
      { id: 'a', label: 'curve a', frequencyHz: Float64Array.of(1e5, 1e6, 1e7), values: Float64Array.of(1, 2, 3), style: { color: 'common-mode', dash: 'solid', width: 1, draw: 'line' }, reduce: 'max' },
      { id: 'b', label: '=SUM(A1)', frequencyHz: Float64Array.of(1e6, 2e6), values: Float64Array.of(10, Number.NaN), style: { color: 'differential-mode', dash: 'dash', width: 1, draw: 'line' }, reduce: 'min' },
    ],
    bands: [{ id: 'w', label: 'worst, "case"', frequencyHz: Float64Array.of(1e5, 1e7), lower: Float64Array.of(-1, -2), upper: Float64Array.of(1, 2), color: 'common-mode' }],
    regions: [],
    levels: [],
    markers: [],
    notes: [],
  };
}

describe('reading a plot at the cursor', () => {
  it('takes the nearest point on the log axis', () => {
    const f = Float64Array.of(1e5, 1e6, 1e7);
    expect(nearestIndex(f, 3e5)).toBe(0); // below √(1e5·1e6) = 316 kHz
    expect(nearestIndex(f, 3.2e5)).toBe(1);
    expect(nearestIndex(f, 5e7)).toBe(2);
    expect(nearestIndex(new Float64Array(0), 1)).toBe(-1);
  });

  it('reads nothing far from any point, or where the value is a gap', () => {
    const s = spec();
    expect(valueAt(s.series[0]!, 1.01e6, 0.02)).toEqual({ value: 2, atHz: 1e6 });
    expect(valueAt(s.series[0]!, 3e6, 0.02)).toBeUndefined();
    expect(valueAt(s.series[1]!, 2e6, 0.02)).toBeUndefined();
    const lines = readoutAt(s, 1e6);
    expect(lines.map((l) => l.text)).toEqual(['2.0 dB', '10.0 dB', '–']);
  });
});

describe('a plot as CSV', () => {
  it('one row per frequency of every grid, empty where a series has no point, labels made safe', () => {
    const csv = plotToCsv(spec());
    const rows = csv.trim().split('\n');
    expect(rows[0]).toBe(`frequency (Hz),curve a (dB),'=SUM(A1) (dB),"worst, ""case"", low (dB)","worst, ""case"", high (dB)"`);
    expect(rows.slice(1)).toEqual(['100000,1,,-1,1', '1000000,2,10,,', '2000000,,,,', '10000000,3,,-2,2']);
  });
});
