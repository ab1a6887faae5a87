import type { PlotSeries, PlotSpec, SeriesStyle } from '../../src/drawing/plot-spec.ts';

/**
 * Invented plot specs for the SVG renderer's tests and screenshots: shapes like the planner's
 * (a scan against stepped limits, insertion loss with a worst-case band and resonance marks, part
 * impedances on a log axis, a line spectrum of dots), with a seeded generator so every run is alike.
 */

export function logGrid(startHz: number, stopHz: number, points: number): Float64Array {
  const grid = new Float64Array(points);
  const lo = Math.log10(startHz);
  const step = (Math.log10(stopHz) - lo) / (points - 1);
  for (let i = 0; i < points; i += 1) grid[i] = 10 ** (lo + i * step);
  grid[points - 1] = stopHz;
  return grid;
}

/** A small linear congruential generator (Numerical Recipes constants), seeded. */
export function seeded(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

const style = (color: SeriesStyle['color'], dash: SeriesStyle['dash'] = 'solid', width = 1.5, draw: SeriesStyle['draw'] = 'line'): SeriesStyle => ({ color, dash, width, draw });

function series(id: string, label: string, frequencyHz: Float64Array, values: Float64Array, s: SeriesStyle, reduce: 'max' | 'min' = 'max', extra: Partial<PlotSeries> = {}): PlotSeries {
  return { id, label, frequencyHz, values, style: s, reduce, ...extra };
}

/** A stepped class-B-like limit on a grid (invented numbers of the usual shape). */
export function steppedLimit(frequencyHz: Float64Array, offsetDb: number): Float64Array {
  return frequencyHz.map((f) => {
    if (f < 150e3) return Number.NaN;
    if (f <= 500e3) return 66 - 10 * (Math.log10(f / 150e3) / Math.log10(500e3 / 150e3)) + offsetDb;
    if (f <= 5e6) return 56 + offsetDb;
    return 60 + offsetDb;
  });
}

export function emissionsSpec(points = 20_000): PlotSpec {
  const random = seeded(7);
  const f = logGrid(150e3, 30e6, points);
  const scan = f.map((hz) => 72 - 18 * Math.log10(hz / 150e3) + 6 * random());
  // Harmonic peaks every 65 kHz, narrow: one grid point each.
  for (let i = 0; i < f.length; i += 1) if (Math.abs((f[i]! / 65e3) % 1) < 0.004) scan[i] = scan[i]! + 14;
  const predicted = scan.map((level) => level - 30);
  for (let i = 0; i < f.length; i += 1) if (f[i]! > 2.2e6 && f[i]! < 3.1e6) predicted[i] = predicted[i]! + 22 * Math.exp(-(((f[i]! - 2.6e6) / 0.25e6) ** 2));
  const gap = f.map((hz, i) => (hz > 8e6 && hz < 9e6 ? Number.NaN : predicted[i]!));
  return {
    id: 'emissions',
    title: 'Predicted emission against the limits',
    description: 'Invented scan and prediction against two stepped limit lines, 150 kHz to 30 MHz',
    x: { label: 'Frequency', min: 150e3, max: 30e6 },
    y: { label: 'Level', unit: 'dBµV', scale: 'linear' },
    series: [
      series('scan-peak', 'scan as measured, peak', f, scan, style('scan-peak', 'solid', 1)),
      series('predicted-peak', 'line 1, predicted, peak', f, gap, style('peak', 'solid', 1.5)),
      series('limit-qp', 'limit: class B, quasi-peak', f, steppedLimit(f, 0), style('limit-1', 'solid', 2), 'min'),
      series('limit-av', 'limit: class B, average', f, steppedLimit(f, -10), style('limit-2', 'dash', 2), 'min'),
      series('hidden', 'hidden series', f, scan, style('neutral'), 'max', { hidden: true }),
    ],
    bands: [],
    regions: [{ startHz: 2.45e6, stopHz: 2.8e6, label: 'margin below the 6 dB target', color: 'shortfall' }],
    levels: [{ value: 20, label: 'receiver noise floor 20 dBµV', color: 'floor', dash: 'dot' }],
    markers: [{ frequencyHz: 2.6e6, value: 48, label: 'worst margin 2.1 dB', shape: 'circle', color: 'worst' }],
    notes: ['Mode unknown: the filter is credited with the smaller of its CM and DM improvements (worst case).', 'Invented data for the renderer’s tests.'],
  };
}

export function insertionLossSpec(): PlotSpec {
  const f = logGrid(9e3, 30e6, 1400);
  const il = (cornerHz: number, resonanceHz: number, slope: number) =>
    f.map((hz) => {
      const r = hz / cornerHz;
      const base = r < 1 ? 3 * r : slope * Math.log10(r) + 3;
      return base - 30 * Math.exp(-((Math.log10(hz / resonanceHz) / 0.03) ** 2)) + (hz > resonanceHz ? -8 * Math.log10(hz / resonanceHz) : 0);
    });
  const cm = il(20e3, 9.4e6, 40);
  const dm = il(60e3, 4.5e6, 38);
  const variantCm = cm.map((v) => v - 6);
  return {
    id: 'insertion-loss',
    title: 'Insertion loss, common and differential mode',
    description: 'Invented insertion-loss curves with a worst-case band and self-resonance marks',
    x: { label: 'Frequency', min: 9e3, max: 30e6 },
    y: { label: 'Insertion loss', unit: 'dB', scale: 'linear' },
    series: [
      series('cm', 'CM in circuit', f, cm, style('common-mode', 'solid', 1.75)),
      series('dm', 'DM in circuit', f, dm, style('differential-mode', 'solid', 1.75)),
      series('cm-50', 'CM, 50 Ω/50 Ω', f, cm.map((v) => v - 4), style('common-mode', 'dash', 1.25)),
      series('cm-variant', 'CM in circuit — variant “one stage”', f, variantCm, style('common-mode', 'long-dash', 1.5), 'max', { variantId: 'one-stage' }),
      series('dm-variant', 'DM in circuit — variant “one stage”', f, dm.map((v) => v - 3), style('differential-mode', 'long-dash', 1.5), 'max', { variantId: 'one-stage' }),
    ],
    bands: [{ id: 'cm-worst', label: 'CM worst-case spread (0.1 Ω/100 Ω to 100 Ω/0.1 Ω)', frequencyHz: f, lower: cm.map((v) => v - 14), upper: cm.map((v) => v + 6), color: 'common-mode' }],
    regions: [],
    levels: [],
    markers: [
      { frequencyHz: 9.4e6, value: undefined, label: 'LCM1 SRF 9.4 MHz', shape: 'triangle-down', color: 'neutral' },
      { frequencyHz: 4.5e6, value: undefined, label: 'CX1 SRF 4.5 MHz', shape: 'triangle-down', color: 'neutral' },
      { frequencyHz: 5.1e6, value: undefined, label: 'CX2 SRF 5.1 MHz', shape: 'triangle-down', color: 'neutral' },
      { frequencyHz: 1.2e6, value: 70, label: 'peak', shape: 'diamond', color: 'differential-mode' },
      { frequencyHz: 300e3, value: 20, label: 'check', shape: 'cross', color: 'accent' },
    ],
    notes: ['Below 0 dB the filter adds noise at that frequency.'],
  };
}

export function impedanceSpec(): PlotSpec {
  const f = logGrid(10e3, 100e6, 1000);
  const capacitor = f.map((hz) => Math.hypot(0.03, 2 * Math.PI * hz * 10e-9 - 1 / (2 * Math.PI * hz * 100e-9)));
  const choke = f.map((hz) => {
    const w = 2 * Math.PI * hz;
    const zl = w * 2.2e-3;
    const zc = 1 / (w * 8e-12);
    return (zl * zc) / Math.max(Math.abs(zc - zl), 2e3);
  });
  return {
    id: 'part-impedance',
    title: 'Part impedances',
    description: 'Invented impedance magnitudes of a capacitor and a choke with their self-resonances',
    x: { label: 'Frequency', min: 10e3, max: 100e6 },
    y: { label: '|Z|', unit: 'Ω', scale: 'log' },
    series: [
      series('CX1', 'CX1 100 nF', f, capacitor, style('series-1', 'solid', 1.5), 'min'),
      series('LCM1', 'LCM1 2.2 mH, CM', f, choke, style('series-2', 'solid', 1.5)),
    ],
    bands: [],
    regions: [],
    levels: [],
    markers: [
      { frequencyHz: 1 / (2 * Math.PI * Math.sqrt(10e-9 * 100e-9)), value: 0.03, label: 'CX1 SRF', shape: 'triangle-down', color: 'series-1' },
      { frequencyHz: 1 / (2 * Math.PI * Math.sqrt(2.2e-3 * 8e-12)), value: undefined, label: 'LCM1 SRF', shape: 'triangle-down', color: 'series-2' },
    ],
    notes: [],
  };
}

export function lineSpectrumSpec(): PlotSpec {
  const harmonics = new Float64Array(460).map((_, k) => 65e3 * (k + 3));
  const levels = harmonics.map((hz) => 95 - 20 * Math.log10(hz / 195e3) - (hz > 5e6 ? 20 * Math.log10(hz / 5e6) : 0));
  const limitGrid = logGrid(150e3, 30e6, 400);
  return {
    id: 'estimate',
    title: 'Estimated line spectrum, <script>alert("x")</script> & “quotes”',
    description: 'Dots at each harmonic of an invented switching frequency',
    x: { label: 'Frequency', min: 150e3, max: 30e6 },
    y: { label: 'Level', unit: 'dBµV', scale: 'linear', min: 0, max: 100 },
    series: [
      series('estimate', 'line 1, estimate (any detector)', harmonics, levels, style('quasi-peak', 'solid', 1.5, 'dots')),
      series('estimate-variant', 'line 1, estimate — variant <b>B</b>', harmonics, levels.map((v) => v - 12), style('quasi-peak', 'dot', 1.5, 'dots'), 'max', { variantId: 'b' }),
      series('limit', 'limit: class B, quasi-peak', limitGrid, steppedLimit(limitGrid, 0), style('limit-1', 'solid', 2), 'min'),
    ],
    bands: [],
    regions: [],
    levels: [],
    markers: [],
    notes: ['A note with <markup> & an ampersand.'],
  };
}
