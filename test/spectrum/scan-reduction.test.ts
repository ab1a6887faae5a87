import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { DesignInput } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';
import { marginReport } from '../../src/spectrum/margin.ts';
import { predictScan } from '../../src/spectrum/prediction.ts';
import { reduceScan } from '../../src/spectrum/scan-reduction.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { repoFile } from '../support/cli-harness.ts';
import { propertySettings } from '../support/property-settings.ts';

// Bin widths: a quarter of the CISPR 16-1-1 6 dB bandwidths (200 Hz in band A, 9 kHz in band B,
// 120 kHz in bands C/D; references.md, receiver table, status V2).

function linearScan(fromHz: number, toHz: number, n: number, level: (f: number, i: number) => number): Scan {
  const frequencyHz = new Float64Array(n);
  const peak = new Float64Array(n);
  const average = new Float64Array(n);
  for (let i = 0; i < n; i += 1) {
    const f = fromHz + ((toHz - fromHz) * i) / (n - 1);
    frequencyHz[i] = f;
    peak[i] = level(f, i);
    average[i] = level(f, i) - 10 - (i % 3);
  }
  return { name: 'invented', tag: 'total', frequencyHz, traces: [{ detector: 'peak', levelDbuV: peak }, { detector: 'average', levelDbuV: average }], rejected: [], notes: [] };
}

describe('reduceScan: a scan at the receiver’s resolution', () => {
  it('bins 2.25 kHz wide in band B, 50 Hz in band A and 30 kHz above 30 MHz, on multiples of their width', () => {
    const bins = (from: number, to: number, width: number): number => Math.floor(to / width) - Math.floor(from / width) + 1;
    expect(reduceScan(linearScan(1e6, 1.1e6, 10_001, () => 50), []).toPoints).toBe(bins(1e6, 1.1e6, 2250));
    expect(reduceScan(linearScan(100e3, 101e3, 1001, () => 50), []).toPoints).toBe(bins(100e3, 101e3, 50));
    expect(reduceScan(linearScan(40e6, 43e6, 3001, () => 50), []).toPoints).toBe(bins(40e6, 43e6, 30e3));
  });

  it('leaves a scan stepped no finer than its bins exactly as it was, and points below 9 kHz alone', () => {
    const coarse = linearScan(150e3, 30e6, 5000, (f) => 60 - f / 1e6);
    expect(reduceScan(coarse, []).scan).toBe(coarse);
    const belowBandA = linearScan(0.15, 30, 4, () => 80);
    expect(reduceScan(belowBandA, [150e3]).toPoints).toBe(4);
  });

  it('property: no reading is ever lowered or made up, and a point on an edge keeps its own bin', () => {
    const cases = fc.record({
      n: fc.integer({ min: 2, max: 200 }),
      from: fc.double({ min: 1e4, max: 5e7, noNaN: true }),
      span: fc.double({ min: 10, max: 2e6, noNaN: true }),
      edges: fc.array(fc.double({ min: 1e4, max: 6e7, noNaN: true }), { maxLength: 5 }),
      seed: fc.integer(),
    });
    fc.assert(
      fc.property(cases, ({ n, from, span, edges, seed }) => {
        const scan = linearScan(from, from + span, n, (f, i) => 40 + 20 * Math.sin(i * 0.7 + seed));
        const { scan: reduced } = reduceScan(scan, edges);
        const g = reduced.frequencyHz;
        const width = (f: number): number => (f < 150e3 ? 50 : f <= 30e6 ? 2250 : 30e3);
        // Each original reading is held, at least as high, by a kept point less than a bin away.
        for (let i = 0; i < n; i += 1) {
          const f = scan.frequencyHz[i]!;
          scan.traces.forEach((trace, t) => {
            let held = -Infinity;
            for (let b = 0; b < g.length; b += 1) if (Math.abs(g[b]! - f) < width(f)) held = Math.max(held, reduced.traces[t]!.levelDbuV[b]!);
            expect(held).toBeGreaterThanOrEqual(trace.levelDbuV[i]!);
          });
        }
        // Each kept frequency is one of the scan's own, and each kept level one of the scan's readings.
        const frequencies = new Set(scan.frequencyHz);
        const readings = scan.traces.map((trace) => new Set(trace.levelDbuV));
        for (let b = 0; b < g.length; b += 1) {
          expect(frequencies.has(g[b]!)).toBe(true);
          scan.traces.forEach((_, t) => expect(readings[t]!.has(reduced.traces[t]!.levelDbuV[b]!)).toBe(true));
        }
        // A point exactly on an edge keeps a bin of its own: its readings as they were.
        for (const edge of edges) {
          const i = scan.frequencyHz.indexOf(edge);
          if (i < 0) continue;
          const b = g.indexOf(edge);
          expect(b).toBeGreaterThanOrEqual(0);
          scan.traces.forEach((trace, t) => expect(reduced.traces[t]!.levelDbuV[b]).toBe(trace.levelDbuV[i]));
        }
      }),
      propertySettings(150),
    );
  });
});

describe('the analysis of a long scan judges it at the receiver’s resolution', () => {
  const demo = requireDesign(JSON.parse(repoFile('fixtures/demo/adapter-two-stage.design.json')) as DesignInput);

  it('an invented 200 000-point scan: the same verdict, worst margins within 0.3 dB of judging every point, and said so', () => {
    // Lobes at harmonics of 65 kHz, 8 kHz wide, over a floor: peaks a fine scan resolves.
    const scan = linearScan(150e3, 30e6, 200_000, (f) => {
      const h = Math.round(f / 65e3);
      return Math.abs(f - h * 65e3) < 4e3 ? 95 - 20 * Math.log10(h) - Math.abs(f - h * 65e3) / 1e3 : 25;
    });
    const reduced = analyzeEmissions(demo, { kind: 'scan', scan });
    expect(reduced.scanPoints).toEqual({ read: 200_000, analysed: reduced.frequencyHz.length });
    expect(reduced.frequencyHz.length).toBeLessThan(14_000);
    expect(reduced.notes.join('\n')).toMatch(/the scan's 200000 points were reduced to \d+ for the analysis: bins a quarter of the receiver's resolution bandwidth/u);
    // Every point judged, as before the reduction: predicted at every frequency, then the same margin table.
    const masks = demo.emissions!.masks;
    const full = predictScan(demo, scan, { attribution: 'both', noiseFloorDbuV: demo.emissions!.noiseFloorDbuV });
    const series = full.traces.map((trace) => ({ label: 'total, predicted', detector: trace.detector, frequencyHz: full.frequencyHz, levelDbuV: trace.predictedDbuV, excluded: full.belowFloor }));
    const direct = marginReport(series, masks, { targetMarginDb: 6, bands: reduced.report.bands });
    expect(reduced.report.verdict.status).toBe(direct.verdict.status);
    reduced.report.bands.forEach((band, b) => {
      expect(band.status).toBe(direct.bands[b]!.status);
      expect(Math.abs(band.worst!.marginDb - direct.bands[b]!.worst!.marginDb)).toBeLessThan(0.3);
    });
  });
});
