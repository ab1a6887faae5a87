import demo from '../../../fixtures/demo/adapter-two-stage.design.json';
import { ladderToSvg } from '../../../src/drawing/ladder-svg.ts';
import type { PlotSpec } from '../../../src/drawing/plot-spec.ts';
import { plotToSvg } from '../../../src/drawing/plot-svg.ts';
import { requireDesign } from '../../../src/model/read-design.ts';
import { makeReport } from '../../../src/report/make-report.ts';
import { type BenchSection, time } from '../bench-section.ts';

/**
 * The SVG renderer on a million-point curve (thinned per pixel column), the drawn filter of the
 * invented demo, and the whole report of the demo from its noise estimate (sweep, analysis, page, CSV).
 */
function millionPointSpec(): PlotSpec {
  const n = 1_000_000;
  const frequencyHz = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i += 1) {
    frequencyHz[i] = 150e3 * 200 ** (i / (n - 1));
    values[i] = 60 - 20 * Math.log10(frequencyHz[i]! / 150e3) + ((i * 7919) % 13);
  }
  return {
    id: 'bench',
    title: 'a million points',
    description: 'bench',
    x: { label: 'Frequency', min: 150e3, max: 30e6 },
    y: { label: 'Level', unit: 'dBµV', scale: 'linear' },
    series: [{ id: 'scan', label: 'scan', frequencyHz, values, style: { color: 'peak', dash: 'solid', width: 1.25, draw: 'line' }, reduce: 'max' }],
    bands: [],
    regions: [],
    levels: [],
    markers: [],
    notes: [],
  };
}

export const drawingReportSection: BenchSection = {
  id: 'drawing-report',
  title: 'drawings and report',
  async run() {
    const spec = millionPointSpec();
    let bytes = 0;
    const plot = time(() => {
      bytes = plotToSvg(spec, { width: 900 }).length;
    }, 2000, 5, 2);
    const design = requireDesign(demo);
    const ladder = time(() => ladderToSvg(design), 1000, 50, 20);
    const report = time(() => makeReport({ design, origin: { program: 'chokepoint', version: 'bench', generatedAt: '2026-12-04' } }), 3000, 5, 2);
    return {
      figures: {
        plotSvgMillionPointsMs: Number(plot.medianMs.toFixed(1)),
        plotSvgMillionPointsKb: Number((bytes / 1024).toFixed(1)),
        ladderSvgDemoMs: Number(ladder.medianMs.toFixed(2)),
        reportDemoEstimateMs: Number(report.medianMs.toFixed(0)),
      },
      rows: [
        ['plot SVG, 1 000 000 points, 900 px', `${plot.medianMs.toFixed(1)} ms, ${(bytes / 1024).toFixed(1)} kB`],
        ['drawn filter, demo', `${ladder.medianMs.toFixed(2)} ms`],
        ['report of the demo (estimate)', `${report.medianMs.toFixed(0)} ms`],
      ],
    };
  },
};
