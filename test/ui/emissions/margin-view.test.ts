// @vitest-environment node
// What the margin table says is worked out without a DOM.
import { describe, expect, it } from 'vitest';
import type { EmissionsAnalysis } from '../../../src/spectrum/emissions-analysis.ts';
import type { BandResult, MarginPoint, MarginReport } from '../../../src/spectrum/margin.ts';
import { judge } from '../../../src/spectrum/verdict.ts';
import { formatDb, largestFinite, marginTableView } from '../../../src/ui/emissions/margin-view.ts';
import { analyse, emissionsDesignDocument, scanNoise, syntheticScan } from '../support/emissions-fixtures.ts';

const point = (marginDb: number, frequencyHz: number, conservative = false): MarginPoint => ({
  frequencyHz,
  levelDbuV: 50 - marginDb,
  limitDbuV: 50,
  marginDb,
  series: 'line 1, predicted',
  maskName: 'Class B, average',
  conservative,
});

/** A judged band as the margin report gives it. */
const band = (name: string, startHz: number, stopHz: number, worst: MarginPoint | undefined, status: BandResult['status'], judgedPoints = worst ? 12 : 0): BandResult => ({
  name,
  startHz,
  stopHz,
  worst,
  status,
  judgedPoints,
  coveredPoints: judgedPoints,
  coveredFromHz: judgedPoints > 0 ? startHz : undefined,
  coveredToHz: judgedPoints > 0 ? stopHz : undefined,
  reason: status === 'not-covered' ? 'the scan has no point in this band' : 'worst margin …',
  pass: status === 'pass' ? true : status === 'fail' ? false : undefined,
});

/** A report's bands with the verdict they make. */
const judged = (bands: BandResult[]): Partial<MarginReport> => {
  const verdict = judge(bands);
  return { bands, verdict, pass: verdict.status === 'pass' };
};

/** An analysis with a hand-made report: only the fields the table reads. */
function withReport(report: Partial<MarginReport>, extra: Partial<EmissionsAnalysis> = {}): EmissionsAnalysis {
  const base = analyse(emissionsDesignDocument(), scanNoise(syntheticScan({ points: 200 })));
  return { ...base, notes: [], ...extra, report: { ...base.report, notes: [], ...report } };
}

describe('marginTableView', () => {
  it('fails a band short of the target even when the level is under the limit, and passes the others', () => {
    const view = marginTableView(
      withReport({
        targetMarginDb: 6,
        ...judged([
          band('0.15–0.5 MHz', 150e3, 500e3, point(4.6, 262e3), 'fail'),
          band('0.5–5 MHz', 500e3, 5e6, point(-2.25, 586e3), 'fail'),
          band('5–30 MHz', 5e6, 30e6, point(44.9, 7.41e6), 'pass'),
          band('above 30 MHz', 30e6, 108e6, undefined, 'not-covered'),
        ]),
      }),
    );
    expect(view.verdict).toBe('fail');
    expect(view.verdictWord).toBe('FAIL');
    expect(view.summary).toBe('2 bands below the 6 dB target margin; 1 band not covered by judged points (36 judged points).');
    expect(view.bands.map((b) => [b.name, b.verdict, b.verdictText, b.worst?.margin, b.worst?.frequency, b.judged, b.covered])).toEqual([
      ['0.15–0.5 MHz', 'fail', 'FAIL, short of the target', '4.6 dB', '262 kHz', '12', '150 kHz – 500 kHz'],
      ['0.5–5 MHz', 'fail', 'FAIL, over the limit', '-2.3 dB', '586 kHz', '12', '500 kHz – 5 MHz'],
      ['5–30 MHz', 'pass', 'PASS', '44.9 dB', '7.41 MHz', '12', '5 MHz – 30 MHz'],
      ['above 30 MHz', 'none', 'NOT COVERED', undefined, undefined, '0', '–'],
    ]);
    expect(view.bands[3]!.reason).toBe('the scan has no point in this band');
    expect(view.reasons).toContain('above 30 MHz: not covered: the scan has no point in this band');
    expect(view.bands[0]?.worst).toMatchObject({ level: '45.4 dBµV', limit: '50.0 dBµV', mask: 'Class B, average', series: 'line 1, predicted', short: true });
    expect(view.bands[2]?.worst?.short).toBe(false);
  });

  it('says which mode limits a band short of the target, and only there', () => {
    const bands = judged([band('low', 150e3, 500e3, point(4.6, 262e3), 'fail'), band('high', 5e6, 30e6, point(44.9, 7.41e6), 'pass')]);
    const view = marginTableView(withReport({ targetMarginDb: 6, ...bands }), [
      { mode: 'differential mode', reason: 'filter improvement at the worst point: CM 11.3 dB, DM 4.6 dB' },
      { mode: 'common mode', reason: 'irrelevant here: the band passes' },
    ]);
    expect(view.bands[0]!.limitedBy).toEqual({ mode: 'differential mode', reason: 'filter improvement at the worst point: CM 11.3 dB, DM 4.6 dB' });
    expect(view.bands[1]!.limitedBy).toBeUndefined();
  });

  it('passes when every band is covered and keeps the target, and gives no result when nothing was judged', () => {
    const pass = marginTableView(withReport(judged([band('all', 150e3, 30e6, point(12, 1e6), 'pass')])));
    expect(pass.verdict).toBe('pass');
    expect(pass.verdictWord).toBe('PASS');
    expect(pass.summary).toBe('Every band is covered and keeps at least the 6 dB target margin below every limit (12 judged points).');
    expect(pass.reasons).toEqual([]);

    const none = marginTableView(withReport({ comparisons: [], ...judged([band('all', 150e3, 30e6, undefined, 'not-covered')]) }));
    expect(none.verdict).toBe('none');
    expect(none.verdictWord).toBe('NO RESULT');
    expect(none.reasons[0]).toMatch(/nothing was judged/u);
  });

  it('lists the worst peaks, the failing ranges and marks conservative comparisons', () => {
    const view = marginTableView(
      withReport({
        worstPeaks: [point(-1, 262e3, true), point(3, 194e3)],
        failingRanges: [{ startHz: 254e3, stopHz: 266e3, worst: point(-1, 262e3, true) }],
      }),
    );
    expect(view.peaks.map((p) => [p.margin, p.frequency, p.conservative])).toEqual([
      ['-1.0 dB', '262 kHz', true],
      ['3.0 dB', '194 kHz', false],
    ]);
    expect(view.failingRanges).toEqual([{ from: '254 kHz', to: '266 kHz', worst: expect.objectContaining({ margin: '-1.0 dB' }) }]);
    expect(view.anyConservative).toBe(true);
  });

  it('gives the attenuation still needed per mode: the most, and where', () => {
    const f = Float64Array.of(150e3, 390e3, 1e6);
    const view = marginTableView(
      withReport(
        {},
        { frequencyHz: f, requiredAttenuationCmDb: Float64Array.of(Number.NaN, 30.24, 12), requiredAttenuationDmDb: Float64Array.of(0, 0, Number.NaN) },
      ),
    );
    expect(view.required).toEqual([
      { mode: 'common mode', most: '30.2 dB', where: 'at 390 kHz' },
      { mode: 'differential mode', most: 'none', where: 'the level with no filter already keeps the target margin' },
    ]);
    const cmOnly = marginTableView(withReport({}, { requiredAttenuationDmDb: undefined }));
    expect(cmOnly.required[1]).toEqual({ mode: 'differential mode', most: '–', where: 'the scan does not speak for this mode' });
  });

  it('collects the analysis’ notes and the report’s, each once', () => {
    const view = marginTableView(withReport({ notes: ['b', 'a'] }, { notes: ['a', 'c'] }));
    expect(view.notes).toEqual(['a', 'c', 'b']);
  });

  it('reads a real analysis from the worker: the scan’s notes about the baseline, the attribution and the floor', () => {
    const analysis = analyse(emissionsDesignDocument(), scanNoise(syntheticScan()));
    const view = marginTableView(analysis);
    expect(view.bands.map((b) => b.name)).toEqual(['0.15–0.5 MHz', '0.5–5 MHz', '5–30 MHz']);
    expect(view.notes.join('\n')).toMatch(/no filter fitted/u);
    expect(view.notes.join('\n')).toMatch(/mode unknown/u);
    expect(view.notes.join('\n')).toMatch(/noise floor \(20 dBµV\)/u);
    expect(view.verdict).toBe(analysis.report.pass ? 'pass' : 'fail');
  });
});

describe('formatting', () => {
  it('prints dB with one decimal and a dash for no value', () => {
    expect(formatDb(4.649)).toBe('4.6 dB');
    expect(formatDb(57.94, 'dBµV')).toBe('57.9 dBµV');
    expect(formatDb(Number.NaN)).toBe('–');
  });

  it('finds the largest finite value', () => {
    expect(largestFinite(Float64Array.of(Number.NaN, 3, 7, 7, -1))).toEqual({ value: 7, index: 2 });
    expect(largestFinite(Float64Array.of(Number.NaN))).toBeUndefined();
  });
});
