import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DEFAULT_BANDS } from '../../src/model/emissions-schema.ts';
import { copyPreset } from '../../src/spectrum/limit-presets.ts';
import { limitAt } from '../../src/spectrum/limit-mask.ts';
import { type LevelSeries, marginReport } from '../../src/spectrum/margin.ts';
import { judge, type JudgedItem } from '../../src/spectrum/verdict.ts';
import { propertySettings } from '../support/property-settings.ts';

// Limits from 47 CFR §15.107(a), class B quasi-peak (status V in references.md): 66→56 dBµV falling
// with log f over 0.15–0.5 MHz, 56 dBµV to 5 MHz, 60 dBµV to 30 MHz.
const qp = copyPreset('fcc-15.107-class-b-qp');
const bands = DEFAULT_BANDS.map((band) => ({ ...band }));
const series = (frequencies: readonly number[], levels: readonly number[], excluded?: readonly number[]): LevelSeries => ({
  label: 'line 1',
  detector: 'quasi-peak',
  frequencyHz: Float64Array.from(frequencies),
  levelDbuV: Float64Array.from(levels),
  ...(excluded ? { excluded: Uint8Array.from(excluded) } : {}),
});
const item = (status: JudgedItem['status'], judgedPoints: number): JudgedItem => ({ name: status, status, judgedPoints, reason: 'because' });

describe('judge: a verdict needs evidence', () => {
  it('passes only when every item passes, fails on any fail or not-covered item, refuses with nothing judged', () => {
    expect(judge([item('pass', 3), item('pass', 1)]).status).toBe('pass');
    expect(judge([item('pass', 3), item('fail', 1)]).status).toBe('fail');
    expect(judge([item('pass', 3), item('not-covered', 0)]).status).toBe('fail');
    expect(judge([item('not-covered', 0), item('not-covered', 0)]).status).toBe('refused');
    expect(judge([]).status).toBe('refused');
    expect(judge([item('pass', 3)], { refusals: ['no limit'] }).status).toBe('refused');
  });

  it('counts the judged points (the caller’s count when items share points) and gives reasons', () => {
    const verdict = judge([item('pass', 3), item('not-covered', 0)], { hints: ['check the frequency unit'] });
    expect(verdict.judgedPoints).toBe(3);
    expect(verdict.reasons).toEqual(['not-covered: not covered: because', 'check the frequency unit']);
    expect(judge([item('pass', 3), item('pass', 3)], { judgedPoints: 5 }).judgedPoints).toBe(5);
    // Hints explain a shortfall; a pass needs none.
    expect(judge([item('pass', 1)], { hints: ['unused'] }).reasons.join(' ')).not.toMatch(/unused/u);
  });

  it('property: refused exactly when nothing was judged; pass exactly when every item passed', () => {
    const items = fc.array(
      fc.record({ status: fc.constantFrom<JudgedItem['status']>('pass', 'fail', 'not-covered'), judgedPoints: fc.nat(5) }).map(
        ({ status, judgedPoints }) => item(status, status === 'not-covered' ? 0 : Math.max(1, judgedPoints)),
      ),
      { maxLength: 6 },
    );
    fc.assert(
      fc.property(items, (list) => {
        const verdict = judge(list);
        const judged = list.reduce((sum, i) => sum + i.judgedPoints, 0);
        expect(verdict.status === 'refused').toBe(judged === 0);
        if (judged > 0) expect(verdict.status === 'pass').toBe(list.every((i) => i.status === 'pass'));
      }),
      propertySettings(300),
    );
  });
});

describe('margin bands: pass only with judged points that cover the band (47 CFR §15.107(a) class B QP)', () => {
  it('a one-point scan passes no band: the band with the point is not covered edge to edge, the others hold no point', () => {
    const report = marginReport([series([200e3], [30])], [qp], { targetMarginDb: 6, bands, source: 'the scan' });
    expect(report.bands.map((b) => b.status)).toEqual(['not-covered', 'not-covered', 'not-covered']);
    expect(report.bands[0]!.judgedPoints).toBe(1);
    expect(report.bands[0]!.reason).toMatch(/does not reach the band's lower edge \(150 kHz\) or upper edge \(500 kHz\)/u);
    expect(report.bands[1]!.reason).toBe('the scan has no point in this band');
    expect(report.verdict.status).toBe('fail');
    expect(report.pass).toBe(false);
  });

  it('a scan in MHz read as Hz is refused, saying where the levels lie and asking about the unit', () => {
    const report = marginReport([series([0.15, 0.5, 5, 30], [60, 50, 40, 40])], [qp], { targetMarginDb: 6, bands, source: 'the scan', hints: ['check the frequency unit'] });
    expect(report.verdict.status).toBe('refused');
    expect(report.verdict.judgedPoints).toBe(0);
    expect(report.verdict.reasons[0]).toMatch(/nothing was judged: no point falls in any band: the scan spans 150 mHz to 30 Hz.*frequency unit/u);
    expect(report.verdict.reasons).toContain('check the frequency unit');
  });

  it('a scan covering one band passes that band only; the others are not covered and the whole fails', () => {
    const f = Array.from({ length: 40 }, (_, i) => 150e3 * (500 / 150) ** (i / 39));
    const report = marginReport([series(f, f.map(() => 40))], [qp], { targetMarginDb: 6, bands, source: 'the scan' });
    expect(report.bands.map((b) => b.status)).toEqual(['pass', 'not-covered', 'not-covered']);
    expect(report.bands[0]).toMatchObject({ judgedPoints: 40, coveredFromHz: 150e3 });
    expect(report.bands[0]!.coveredToHz).toBeCloseTo(500e3, 6);
    expect(report.verdict.status).toBe('fail');
  });

  it('a failing point fails its band however little of the band is covered (evidence of a failure suffices)', () => {
    // 300 kHz: limit 60.2428 dBµV (references.md §1.2), level 58: 2.2 dB, below the 6 dB target.
    const report = marginReport([series([300e3], [58])], [qp], { targetMarginDb: 6, bands });
    expect(report.bands[0]!.status).toBe('fail');
    expect(report.bands[0]!.worst!.marginDb).toBeCloseTo(60.2428 - 58, 3);
  });

  it('a mask that covers no band leaves nothing judged: refused', () => {
    const high = { id: 'above', name: 'above 40 MHz', detector: 'quasi-peak' as const, frequencyHz: [40e6, 100e6], levelDbuV: [60, 60] };
    const f = [150e3, 1e6, 10e6, 30e6, 50e6, 80e6];
    const report = marginReport([series(f, f.map(() => 40))], [high], { targetMarginDb: 6, bands, source: 'the scan' });
    expect(report.comparisons).toHaveLength(1);
    expect(report.verdict.status).toBe('refused');
    expect(report.bands.every((b) => b.reason.startsWith('no limit line applies in this band'))).toBe(true);
  });

  it('points at the noise floor cover a band but carry no margin; a band with only such points is not covered', () => {
    const f = [150e3, 300e3, 500e3];
    const report = marginReport([series(f, [40, 40, 40], [1, 0, 1])], [qp], { targetMarginDb: 6, bands: [bands[0]!] });
    expect(report.bands[0]).toMatchObject({ status: 'pass', judgedPoints: 1, coveredPoints: 3, coveredFromHz: 150e3, coveredToHz: 500e3 });
    const silent = marginReport([series(f, [40, 40, 40], [1, 1, 1])], [qp], { targetMarginDb: 6, bands: [bands[0]!] });
    expect(silent.bands[0]!.status).toBe('not-covered');
    expect(silent.verdict.status).toBe('refused');
  });

  it('spectral lines (an estimate) cover a band when it holds a judged line and the lines were worked out past its top', () => {
    const lines = [195e3, 260e3, 2e6];
    const estimate = (upToHz: number) =>
      marginReport([series(lines, [40, 40, 40])], [qp], { targetMarginDb: 6, bands, sampling: { kind: 'lines', upToHz }, source: 'the estimate' });
    expect(estimate(30e6).bands.map((b) => b.status)).toEqual(['pass', 'pass', 'not-covered']);
    expect(estimate(30e6).bands[2]!.reason).toBe('the estimate has no spectral line in this band');
    expect(estimate(3e6).bands[1]!.status).toBe('not-covered');
    expect(estimate(3e6).bands[1]!.reason).toMatch(/worked out only up to 3 MHz/u);
  });

  it('property: a band fails exactly when a judged point in it is below the target, and passes only on judged points reaching both edges', () => {
    const scans = fc.record({
      points: fc.uniqueArray(fc.double({ min: 1e5, max: 4e7, noNaN: true }), { minLength: 1, maxLength: 60 }),
      level: fc.double({ min: 20, max: 70, noNaN: true }),
      spread: fc.double({ min: 0, max: 20, noNaN: true }),
    });
    fc.assert(
      fc.property(scans, ({ points, level, spread }) => {
        const f = [...points].sort((a, b) => a - b);
        const levels = f.map((_, i) => level + spread * Math.sin(i));
        const report = marginReport([series(f, levels)], [qp], { targetMarginDb: 6, bands });
        for (const band of report.bands) {
          const inside = f.map((x, i) => ({ x, i })).filter(({ x }) => x >= band.startHz && x <= band.stopHz && limitAt(qp, x) !== undefined);
          const short = inside.some(({ x, i }) => limitAt(qp, x)! - levels[i]! < 6);
          expect(band.status === 'fail').toBe(short);
          expect(band.judgedPoints).toBe(inside.length);
          if (band.status === 'pass') {
            expect(band.judgedPoints).toBeGreaterThan(0);
            expect(band.coveredFromHz!).toBeLessThanOrEqual(band.startHz * Math.max(1.01, (band.coveredToHz! / band.coveredFromHz!) ** (2 / Math.max(1, inside.length - 1))));
          }
        }
        expect(report.verdict.status === 'refused').toBe(report.bands.every((b) => b.judgedPoints === 0));
      }),
      propertySettings(200),
    );
  });
});
