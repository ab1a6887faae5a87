import { Window } from 'happy-dom';
import { afterAll, describe, expect, it } from 'vitest';
import { linearScale, logFrequencyTicks, logScale, niceLinearRange, niceStep } from '../../src/drawing/axis-ticks.ts';
import { PLOT_PALETTE } from '../../src/drawing/plot-palette.ts';
import type { PlotSpec } from '../../src/drawing/plot-spec.ts';
import { drawPlot, plotToSvg } from '../../src/drawing/plot-svg.ts';
import { thinToColumns } from '../../src/drawing/thin-series.ts';
import { emissionsSpec, impedanceSpec, insertionLossSpec, lineSpectrumSpec, logGrid } from '../support/sample-plots.ts';

const window = new Window();
afterAll(() => window.happyDOM.close());
const parse = (text: string) => new window.DOMParser().parseFromString(text, 'image/svg+xml');

function simpleSpec(series: PlotSpec['series'], extra: Partial<PlotSpec> = {}): PlotSpec {
  return {
    id: 'simple',
    title: 'Simple',
    description: 'a test plot',
    x: { label: 'Frequency', min: 100e3, max: 100e6 },
    y: { label: 'Level', unit: 'dBµV', scale: 'linear', min: 0, max: 100 },
    series,
    bands: [],
    regions: [],
    levels: [],
    markers: [],
    notes: [],
    ...extra,
  };
}

const line = (id: string, f: Float64Array, v: Float64Array, reduce: 'max' | 'min' = 'max') => ({
  id,
  label: id,
  frequencyHz: f,
  values: v,
  style: { color: 'common-mode' as const, dash: 'solid' as const, width: 1.5, draw: 'line' as const },
  reduce,
});

/** The absolute points of an SVG path made of M/L commands. */
function pathPoints(d: string): { command: string; x: number; y: number }[] {
  return [...d.matchAll(/([ML])(-?[\d.]+) (-?[\d.]+)/gu)].map((m) => ({ command: m[1]!, x: Number(m[2]), y: Number(m[3]) }));
}

describe('axis scales and ticks', () => {
  it('maps frequency by log10: a decade is the same width everywhere and the geometric mean sits in the middle', () => {
    const x = logScale(100e3, 100e6, 50, 650);
    expect(x.position(100e3)).toBe(50);
    expect(x.position(100e6)).toBeCloseTo(650, 9);
    expect(x.position(1e6)).toBeCloseTo(250, 9);
    expect(x.position(10e6)).toBeCloseTo(450, 9);
    expect(x.position(Math.sqrt(100e3 * 100e6))).toBeCloseTo(350, 9);
    // log10(2) of a decade past 1 MHz: 0.30103 × 200 px (log10 2 = 0.30102999566…).
    expect(x.position(2e6) - x.position(1e6)).toBeCloseTo(60.206, 3);
  });

  it('labels decades, both ends and, when a decade is wide, 2 and 5, in engineering units', () => {
    const ticks = logFrequencyTicks(logScale(150e3, 30e6, 60, 760), 12);
    const labels = ticks.filter((t) => t.label !== undefined).map((t) => t.label);
    // 200 kHz would touch 150 kHz and 20 MHz would touch 30 MHz (about 40 px apart at 304 px per decade).
    expect(labels).toEqual(['150 kHz', '500 kHz', '1 MHz', '2 MHz', '5 MHz', '10 MHz', '30 MHz']);
    // A grid line at every 1…9 × 10^k inside the range, the decades major.
    const grid = ticks.map((t) => t.value);
    expect(grid).toEqual([150e3, 200e3, 300e3, 400e3, 500e3, 600e3, 700e3, 800e3, 900e3, 1e6, 2e6, 3e6, 4e6, 5e6, 6e6, 7e6, 8e6, 9e6, 10e6, 20e6, 30e6]);
    expect(ticks.filter((t) => t.major).map((t) => t.value)).toEqual([1e6, 10e6]);
  });

  it('keeps only decades when they are narrow, and never lets two labels touch', () => {
    const scale = logScale(9e3, 108e6, 0, 300);
    const ticks = logFrequencyTicks(scale, 12).filter((t) => t.label !== undefined);
    // The end label "108 MHz" would touch "100 MHz" and gives way to the decade.
    expect(ticks.map((t) => t.label)).toEqual(['10 kHz', '100 kHz', '1 MHz', '10 MHz', '100 MHz']);
    for (let i = 1; i < ticks.length; i += 1) expect(ticks[i]!.position - ticks[i - 1]!.position).toBeGreaterThan(50);
  });

  it('chooses nice linear steps of 1, 2, 2.5 or 5 × 10^k', () => {
    expect([0.7, 1, 1.1, 2.2, 3, 7, 12, 26, 0.013].map(niceStep)).toEqual([1, 1, 2, 2.5, 5, 10, 20, 50, 0.02]);
    expect(niceLinearRange(-23, 87, 280)).toEqual({ min: -40, max: 100, step: 20 });
    expect(niceLinearRange(-23, 87, 140)).toEqual({ min: -50, max: 100, step: 50 });
    expect(niceLinearRange(3, 3, 200).max).toBeGreaterThan(3);
  });
});

describe('plotToSvg', () => {
  it('places a known point by the log-frequency and linear mappings', () => {
    const f = new Float64Array([100e3, 1e6, 10e6, 100e6]);
    const spec = simpleSpec([line('a', f, new Float64Array([0, 50, 100, 25]))]);
    const { node, layout } = drawPlot(spec, { width: 700, height: 400 });
    const { left, right, top, bottom } = layout.plot;
    const path = parse(plotToSvg(spec, { width: 700, height: 400 })).querySelector('path[data-series-id="a"]');
    const points = pathPoints(path?.getAttribute('d') ?? '');
    expect(points).toHaveLength(4);
    expect(points[0]!.x).toBeCloseTo(left, 1);
    expect(points[1]!.x).toBeCloseTo(left + (right - left) / 3, 1);
    expect(points[2]!.x).toBeCloseTo(left + (2 * (right - left)) / 3, 1);
    expect(points[3]!.x).toBeCloseTo(right, 1);
    expect(points[0]!.y).toBeCloseTo(bottom, 1);
    expect(points[1]!.y).toBeCloseTo((top + bottom) / 2, 1);
    expect(points[2]!.y).toBeCloseTo(top, 1);
    expect(points[3]!.y).toBeCloseTo(bottom - (bottom - top) / 4, 1);
    expect(node.attributes['role']).toBe('img');
  });

  it('breaks the line at NaN gaps instead of joining across them', () => {
    const f = logGrid(100e3, 100e6, 9);
    const values = new Float64Array([10, 20, Number.NaN, Number.NaN, 50, 60, Number.NaN, 80, 90]);
    const d = parse(plotToSvg(simpleSpec([line('g', f, values)]))).querySelector('path[data-series-id="g"]')?.getAttribute('d') ?? '';
    expect(pathPoints(d).map((p) => p.command).join('')).toBe('MLMLML');
  });

  it('thins a million points to about one per pixel column and keeps a one-point peak (max-hold)', () => {
    const n = 1_000_000;
    const f = logGrid(100e3, 100e6, n);
    const values = new Float64Array(n).fill(40);
    const peakAt = 654_321;
    values[peakAt] = 97;
    const dip = new Float64Array(n).fill(60);
    dip[123_456] = 3;
    const spec = simpleSpec([line('scan', f, values), line('limit', f, dip, 'min')]);
    const text = plotToSvg(spec, { width: 800 });
    expect(text.length).toBeLessThan(60_000);
    const doc = parse(text);
    const { layout } = drawPlot(spec, { width: 800 });
    const y = (v: number) => layout.y.position(v);
    const scanPoints = pathPoints(doc.querySelector('path[data-series-id="scan"]')?.getAttribute('d') ?? '');
    expect(scanPoints.length).toBeLessThan(900);
    const highest = Math.min(...scanPoints.map((p) => p.y));
    expect(highest).toBeCloseTo(y(97), 1);
    // At the peak's own frequency, not at the column's centre.
    const at = scanPoints.find((p) => Math.abs(p.y - y(97)) < 0.01)!;
    expect(at.x).toBeCloseTo(layout.x.position(f[peakAt]!), 1);
    const limitPoints = pathPoints(doc.querySelector('path[data-series-id="limit"]')?.getAttribute('d') ?? '');
    expect(Math.max(...limitPoints.map((p) => p.y))).toBeCloseTo(y(3), 1);
  });

  it('thinning never averages: each kept value is one of the inputs, the column extreme', () => {
    const f = logGrid(1e5, 1e6, 5000);
    const values = new Float64Array(5000).map((_, i) => Math.sin(i * 1.7) * 10 + (i === 2500 ? 50 : 0));
    const x = logScale(1e5, 1e6, 0, 100);
    const thinned = thinToColumns(f, values, 'max', x.position, 0, 100);
    const inputs = new Set(values);
    expect(thinned.values.every((v) => inputs.has(v))).toBe(true);
    expect(Math.max(...thinned.values)).toBe(values[2500]);
    expect(thinned.values.length).toBeLessThanOrEqual(102);
  });

  it('escapes user text everywhere it appears: title, description, legend, markers, notes', () => {
    const hostile = '<script>alert("x")</script> & \'q\'';
    const f = logGrid(100e3, 100e6, 10);
    const spec = simpleSpec([{ ...line('s', f, new Float64Array(10).fill(50)), label: hostile }], {
      title: hostile,
      description: hostile,
      notes: [hostile],
      levels: [{ value: 30, label: hostile, color: 'floor', dash: 'dot' }],
      markers: [{ frequencyHz: 1e6, value: 50, label: hostile, shape: 'circle', color: 'worst' }],
      regions: [{ startHz: 2e6, stopHz: 3e6, label: hostile, color: 'shortfall' }],
      bands: [{ id: 'b', label: hostile, frequencyHz: f, lower: new Float64Array(10).fill(10), upper: new Float64Array(10).fill(20), color: 'common-mode' }],
    });
    const text = plotToSvg(spec);
    expect(text).not.toContain('<script');
    const doc = parse(text);
    expect(doc.querySelectorAll('script')).toHaveLength(0);
    const texts = [...doc.querySelectorAll('text, title, desc')].map((n) => n.textContent);
    // title, desc, visible title, legend ×4 (series, band, region, level), level label, marker label, note, and tooltips.
    expect(texts.filter((t) => t === hostile).length).toBeGreaterThanOrEqual(10);
  });

  it('skips hidden series in the drawing and the legend', () => {
    const text = plotToSvg(emissionsSpec(2000));
    expect(text).not.toContain('data-series-id="hidden"');
    expect(text).not.toContain('hidden series');
  });

  it('draws each series with its dash and the legend sample with the same dash', () => {
    const doc = parse(plotToSvg(insertionLossSpec()));
    const curve = doc.querySelector('path[data-series-id="cm-variant"]');
    expect(curve?.getAttribute('stroke-dasharray')).toBe('14 5');
    expect(curve?.getAttribute('stroke')).toBe(PLOT_PALETTE.light['common-mode']);
    const samples = [...doc.querySelectorAll('.legend-entry line')].map((l) => l.getAttribute('stroke-dasharray'));
    expect(samples).toEqual([null, null, '8 4', '14 5', '14 5']);
    expect(doc.querySelectorAll('.marker')).toHaveLength(5);
    expect([...doc.querySelectorAll('.marker')].map((m) => m.getAttribute('data-shape'))).toContain('cross');
  });

  it('uses the dark palette when asked', () => {
    const text = plotToSvg(insertionLossSpec(), { theme: 'dark' });
    expect(text).toContain(`stroke="${PLOT_PALETTE.dark['common-mode']}"`);
    expect(text).not.toContain(`stroke="${PLOT_PALETTE.light['common-mode']}"`);
  });

  it('draws dots, one per value, for a line spectrum', () => {
    const spec = lineSpectrumSpec();
    const doc = parse(plotToSvg(spec));
    expect(doc.querySelectorAll('g[data-series-id="estimate"] circle')).toHaveLength(460);
  });

  it('labels a log value axis by decades in engineering units', () => {
    const { layout } = drawPlot(impedanceSpec());
    expect(layout.yTicks.filter((t) => t.label !== undefined).map((t) => t.label)).toEqual(['10 mΩ', '100 mΩ', '1 Ω', '10 Ω', '100 Ω', '1 kΩ', '10 kΩ', '100 kΩ', '1 MΩ']);
  });

  it('is deterministic: the same spec gives the same bytes', () => {
    expect(plotToSvg(emissionsSpec(3000))).toBe(plotToSvg(emissionsSpec(3000)));
  });

  it('fits the y range to what is drawn when the spec gives none', () => {
    const f = logGrid(100e3, 100e6, 10);
    const spec = simpleSpec([line('a', f, new Float64Array(10).map((_, i) => -12 + i * 9))], { y: { label: 'Loss', unit: 'dB', scale: 'linear' } });
    const { layout } = drawPlot(spec);
    expect(layout.y.min).toBeLessThanOrEqual(-12);
    expect(layout.y.max).toBeGreaterThanOrEqual(69);
    expect(layout.y.max - layout.y.min).toBeLessThan(120);
    expect(linearScale(0, 10, 100, 0).position(5)).toBe(50);
  });

  it('puts a mark’s label beside it and never over another mark; crowded labels stay in the tooltip', () => {
    const f = logGrid(100e3, 100e6, 10);
    const markers = [1e6, 1.02e6, 1.04e6, 1.06e6].map((hz, i) => ({ frequencyHz: hz, value: 50, label: `mark ${i + 1}`, shape: 'circle' as const, color: 'worst' as const }));
    const spec = simpleSpec([line('a', f, new Float64Array(10).fill(20))], { markers });
    const { layout } = drawPlot(spec, { width: 700 });
    const doc = parse(plotToSvg(spec, { width: 700 }));
    const centres = markers.map((m) => layout.x.position(m.frequencyHz));
    const labels = [...doc.querySelectorAll('.markers text')];
    expect(labels.length).toBeGreaterThan(0);
    expect(labels.length).toBeLessThan(4);
    for (const label of labels) {
      const x0 = Number(label.getAttribute('x'));
      const y0 = Number(label.getAttribute('y'));
      // Level with its mark (on the mark's row), and starting clear of every mark's circle (radius 5).
      expect(Math.abs(y0 - (layout.y.position(50) + 12 * 0.9 * 0.35))).toBeLessThan(0.01);
      for (const cx of centres) expect(x0 > cx + 5 || x0 + 30 < cx - 5).toBe(true);
    }
    expect(doc.querySelectorAll('.marker title')).toHaveLength(4);
  });
});

describe('thinBandToColumns', () => {
  it('keeps both edges paired, the widest spread per column, and gaps where either edge is missing', async () => {
    const { thinBandToColumns } = await import('../../src/drawing/thin-series.ts');
    const n = 100_000;
    const f = logGrid(1e5, 1e7, n);
    const lower = new Float64Array(n).map((_, i) => -10 - (i === 40_000 ? 30 : 0));
    const upper = new Float64Array(n).map((_, i) => (i > 70_000 && i < 72_000 ? Number.NaN : 10 + (i === 20_000 ? 25 : 0)));
    const x = logScale(1e5, 1e7, 0, 200);
    const band = thinBandToColumns(f, lower, upper, x.position, 0, 200);
    expect(band.upper).toHaveLength(band.x.length);
    expect(band.lower).toHaveLength(band.x.length);
    expect(Math.max(...band.upper.filter(Number.isFinite))).toBe(35);
    expect(Math.min(...band.lower.filter(Number.isFinite))).toBe(-40);
    // The missing stretch of the upper edge leaves columns with no band at all, on both edges alike.
    const gaps = band.upper.map((v, i) => Number.isNaN(v) === Number.isNaN(band.lower[i]!));
    expect(gaps.every(Boolean)).toBe(true);
    expect(band.upper.some(Number.isNaN)).toBe(true);
    expect(band.x.length).toBeLessThanOrEqual(202);
  });
});
