import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readScanText } from '../../src/io/scan-csv.ts';
import type { DesignInput } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';
import { limitAt } from '../../src/spectrum/limit-mask.ts';

// The invented demo scenario (docs/emissions.md): a fictional adapter's scan with no filter, the
// demo filter that brings it inside the class B limits except at one resonance, and the fix.
const demoInput = JSON.parse(readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8')) as DesignInput;
const read = readScanText(readFileSync(new URL('../../fixtures/scans/invented-adapter-no-filter.csv', import.meta.url), 'utf8'), { tag: 'line1' });
if (!read.ok) throw new Error(read.error.message);
const scan = read.scan;

describe('the invented demo scenario', () => {
  it('the scan, with no filter fitted, exceeds class B quasi-peak by 10 to 20 dB at its worst', () => {
    const design = requireDesign(demoInput);
    const qp = design.emissions!.masks.find((m) => m.detector === 'quasi-peak')!;
    const trace = scan.traces.find((t) => t.detector === 'quasi-peak')!;
    let worst = -Infinity;
    scan.frequencyHz.forEach((f, i) => {
      const limit = limitAt(qp, f);
      if (limit !== undefined) worst = Math.max(worst, trace.levelDbuV[i]! - limit);
    });
    expect(worst).toBeGreaterThan(10);
    expect(worst).toBeLessThan(20);
  });

  it('the demo filter keeps the 6 dB margin everywhere but one resonance, near 260 kHz', () => {
    const analysis = analyzeEmissions(requireDesign(demoInput), { kind: 'scan', scan });
    expect(analysis.report.pass).toBe(false);
    expect(analysis.report.bands.map((b) => b.pass)).toEqual([false, true, true]);
    expect(analysis.report.failingRanges.length).toBeGreaterThan(0);
    for (const range of analysis.report.failingRanges) {
      expect(range.startHz).toBeGreaterThan(250e3);
      expect(range.stopHz).toBeLessThan(270e3);
    }
  });

  it('a damping branch across the lines at the inlet (1 Ω + 2.2 µF) fixes it', () => {
    const fixed = JSON.parse(JSON.stringify(demoInput)) as DesignInput;
    fixed.stages[1]!.elements.splice(1, 0, { id: 'RD1', placement: 'line-to-line', part: { kind: 'damping-rc', resistance: 1, capacitance: '2.2u' } });
    const analysis = analyzeEmissions(requireDesign(fixed), { kind: 'scan', scan });
    expect(analysis.report.pass).toBe(true);
    expect(analysis.report.worst!.marginDb).toBeGreaterThan(6);
  });
});
