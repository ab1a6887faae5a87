import { Window } from 'happy-dom';
import { afterAll, describe, expect, it } from 'vitest';
import demoJson from '../../fixtures/demo/adapter-two-stage.design.json';
import { sweepDesign } from '../../src/engine/index.ts';
import { readScanText } from '../../src/io/scan-csv.ts';
import { type DesignInput, requireDesign } from '../../src/model/index.ts';
import { makeReport, type ReportRequest } from '../../src/report/index.ts';
import { analyzeEmissions } from '../../src/spectrum/emissions-analysis.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { repoFile } from '../support/cli-harness.ts';

// The report is checked against the engine's own results computed here independently (the sweep
// and the emissions analysis the command line and the page run), read back from the HTML.

const window = new Window();
afterAll(() => window.happyDOM.close());
const parse = (html: string) => new window.DOMParser().parseFromString(html, 'text/html');

const demo = requireDesign(demoJson);
const scanRead = readScanText(repoFile('fixtures/scans/invented-adapter-no-filter.csv'), { name: 'invented-adapter-no-filter.csv' });
if (!scanRead.ok) throw new Error('the demo scan does not read');
const scan: Scan = scanRead.scan;
const origin = { program: 'chokepoint', version: 'test', generatedAt: '2026-12-04', designFile: 'adapter-two-stage.design.json', scanFile: 'invented-adapter-no-filter.csv' };
const request: ReportRequest = { design: demo, noise: { kind: 'scan', scan }, origin };
const report = makeReport(request);
const doc = parse(report.html);

const numberIn = (cell: { getAttribute(name: string): string | null } | null | undefined): number => Number(cell?.getAttribute('data-value'));

describe('the report of the demo with its scan', () => {
  it('has every section', () => {
    for (const id of ['summary', 'design', 'filter', 'plots', 'margins', 'assumptions', 'checks', 'cautions', 'trace']) expect(doc.getElementById(id), id).not.toBeNull();
    expect([...doc.querySelectorAll('figure[data-plot-id]')].map((f) => f.getAttribute('data-plot-id'))).toEqual(['emissions', 'required-attenuation', 'insertion-loss', 'part-impedance']);
    expect(doc.querySelectorAll('#filter svg g.part')).toHaveLength(7);
    const assumptions = [...doc.querySelectorAll('#assumptions dt')].map((dt) => dt.textContent);
    for (const title of ['Noise source', 'Receiving networks', 'Baseline', 'Attribution', 'Detectors', 'Tolerances']) expect(assumptions).toContain(title);
    expect(doc.querySelector('#cautions')?.textContent).toContain('not a certification');
    expect(doc.querySelector('#cautions')?.textContent).toContain('safety-certified');
    expect(doc.querySelector('#cautions')?.textContent).toContain('local electrical codes and licensed practice');
    // The safety checks run for every report; the demo gives no supply, so those checks say what to give.
    expect(doc.querySelector('#checks')?.textContent).toContain('Leakage (touch) current');
    expect(doc.querySelector('#checks')?.textContent).toContain('Give: operating.supply');
  });

  it('lists every part with its value, parasitics, ratings and safety class', () => {
    const rows = [...doc.querySelectorAll('table[data-table="parts"] tbody tr')];
    expect(rows.map((r) => r.getAttribute('data-element-id'))).toEqual(['CX1', 'CY1', 'CY2', 'LCM1', 'CX2', 'LCM2', 'CX3']);
    const cells = (id: string) => [...(doc.querySelector(`tr[data-element-id="${id}"]`)?.querySelectorAll('td') ?? [])].map((td) => td.textContent);
    expect(cells('CX1')).toEqual(['CX1', 'CX1 X2 100 nF', 'X2 capacitor', 'line to line', '100 nF', 'ESR 30 mΩ, ESL 10 nH', 'rated 310 V', 'X2', 'on']);
    expect(cells('LCM1')[6]).toBe('rated 250 V, rated 2 A');
    expect(cells('LCM1')[5]).toContain('leakage 12 µH');
  });

  it('prints the engine’s margins per band, its worst peaks and the attenuation still needed', () => {
    const analysis = analyzeEmissions(demo, { kind: 'scan', scan });
    const bandRows = [...doc.querySelectorAll('table[data-table="bands"] tbody tr')];
    expect(bandRows.map((r) => r.getAttribute('data-band'))).toEqual(analysis.report.bands.map((b) => b.name));
    analysis.report.bands.forEach((band, b) => {
      const cells = bandRows[b]!.querySelectorAll('td');
      expect(numberIn(cells[1])).toBe(band.worst!.marginDb);
      expect(cells[1]!.textContent).toBe(band.worst!.marginDb.toFixed(1).replace('-', '\u2212'));
      expect(numberIn(cells[2])).toBe(band.worst!.frequencyHz);
      expect(numberIn(cells[3])).toBe(band.worst!.levelDbuV);
      expect(numberIn(cells[4])).toBe(band.worst!.limitDbuV);
      expect(cells[6]!.textContent).toBe(band.pass ? 'meets target' : 'below target');
    });
    const peaks = [...doc.querySelectorAll('table[data-table="worst-peaks"] tbody tr')].map((r) => numberIn(r.querySelector('td')));
    expect(peaks).toEqual(analysis.report.worstPeaks.map((p) => p.marginDb));
    const cmNeeded = numberIn(doc.querySelector('table[data-table="required"] tr[data-mode="common mode"] td:nth-child(2)'));
    expect(cmNeeded).toBe(Math.max(...Array.from(analysis.requiredAttenuationCmDb!).filter(Number.isFinite)));
    expect(doc.querySelector('#summary')?.textContent).toContain(`${analysis.report.worst!.marginDb.toFixed(1)} dB`);
  });

  it('says which mode limits each band, from the filter’s improvement at the worst point', () => {
    const analysis = analyzeEmissions(demo, { kind: 'scan', scan });
    const rows = [...doc.querySelectorAll('table[data-table="limiting-modes"] tbody tr')];
    analysis.report.bands.forEach((band, b) => {
      const i = analysis.frequencyHz.indexOf(band.worst!.frequencyHz);
      const cm = analysis.scanPrediction!.improvement.commonModeDb[i]!;
      const dm = analysis.scanPrediction!.improvement.differentialModeDb[i]!;
      const expected = Math.abs(cm - dm) < 3 ? 'both modes' : cm < dm ? 'common mode' : 'differential mode';
      expect(rows[b]!.querySelectorAll('td')[1]!.textContent).toBe(expected);
    });
  });

  it('carries the program version, the date and the design’s content hash', () => {
    expect(doc.querySelector('[data-design-hash]')?.textContent).toBe(report.data.designHash);
    expect(report.data.designHash).toMatch(/^[0-9a-f]{64}$/u);
    expect(doc.querySelector('header')?.textContent).toContain('chokepoint test');
    expect(doc.querySelector('header')?.textContent).toContain('2026-12-04');
    expect(doc.querySelector('meta[name="chokepoint-design-hash"]')?.getAttribute('content')).toBe(report.data.designHash);
  });

  it('is self-contained: no script, no external resource, a policy that forbids requests', () => {
    expect(report.html).not.toMatch(/<script|<link|<iframe|<img|<object|@import|url\(\s*['"]?(?!#)/iu);
    expect(report.html).not.toMatch(/\s(src|href)=/iu);
    expect(doc.querySelector('meta[http-equiv="Content-Security-Policy"]')?.getAttribute('content')).toContain("default-src 'none'");
  });

  it('is deterministic: the same request gives the same bytes', () => {
    expect(makeReport(request).html).toBe(report.html);
  });

  it('writes every curve as CSV with the engine’s numbers, and every table', () => {
    const names = report.csv.map((f) => f.name);
    expect(names).toEqual(expect.arrayContaining(['design-parts.csv', 'margin-bands.csv', 'margin-worst-peaks.csv', 'margin-failing-ranges.csv', 'required-attenuation.csv', 'curves-emissions.csv', 'curves-insertion-loss.csv', 'curves-part-impedance.csv']));
    const sweep = sweepDesign(demo);
    const curves = report.csv.find((f) => f.name === 'curves-insertion-loss.csv')!.text.trim().split('\n');
    const header = curves[0]!.split(',');
    expect(header[0]).toBe('frequency_Hz');
    const cmColumn = header.indexOf('CM in circuit (dB)');
    expect(cmColumn).toBeGreaterThan(0);
    expect(curves).toHaveLength(sweep.frequencyHz.length + 1);
    for (const i of [0, 100, 400, sweep.frequencyHz.length - 1]) {
      const fields = curves[i + 1]!.split(',');
      expect(Number(fields[0])).toBe(sweep.frequencyHz[i]);
      expect(Number(fields[cmColumn])).toBe(sweep.columns.insertionLossInCircuitCm[i]);
    }
  });
});

describe('the report’s optional parts', () => {
  const hostile = '<script>alert("x")</script> & =cmd|\' /C calc\'!A0';

  it('shows checks, assistants and a variant comparison when they are given, and escapes all user text', () => {
    const variant = requireDesign({ ...(demoJson as unknown as DesignInput), name: 'one stage', stages: [(demoJson as unknown as DesignInput).stages[0]!] });
    const withAll = makeReport({
      ...request,
      design: requireDesign({ ...(demoJson as unknown as DesignInput), name: hostile }),
      designVariantName: hostile,
      variants: [{ variantId: 'v2', name: `variant ${hostile}`, design: variant }],
      safety: {
        conditions: '264 V, 60 Hz',
        checks: [{ id: 'leakage', title: 'Leakage current', status: 'warn', summary: hostile, figures: [{ label: 'touch current', value: '0.21 mA' }], assumption: 'normal condition', source: 'IEC 60990 (example)' }],
      },
      assistants: { sizing: { title: 'Smallest parts', lines: [hostile], table: { columns: ['part', 'value'], rows: [['LCM1', '3.3 mH']] } } },
    });
    const html = withAll.html;
    expect(html).not.toContain('<script>');
    const page = parse(html);
    expect(page.querySelector('h1')?.textContent).toBe(`Filter report: ${hostile}`);
    expect(page.querySelector('tr[data-check-id="leakage"]')?.getAttribute('data-status')).toBe('warn');
    expect(page.querySelector('#checks')?.textContent).toContain('0.21 mA');
    expect(page.querySelector('#assistants')?.textContent).toContain('Smallest parts');
    const variantRows = [...page.querySelectorAll('table[data-table="variants"] tbody tr')];
    expect(variantRows).toHaveLength(2);
    expect(variantRows[1]!.querySelectorAll('td')[4]!.textContent).toBe('4');
    expect(variantRows[0]!.querySelectorAll('td')[5]!.textContent).toBe('2.67 mH');
    expect(variantRows[0]!.querySelectorAll('td')[6]!.textContent).toBe('4.4 nF');
    // Spreadsheet formulas in user text are written as text.
    const checksCsv = withAll.csv.find((f) => f.name === 'checks.csv')!.text;
    expect(checksCsv).not.toMatch(/(^|,)=cmd/mu);
    expect(page.querySelectorAll('figure[data-plot-id="insertion-loss"] [data-variant-id="v2"]').length).toBeGreaterThan(0);
  });

  it('says why nothing was judged when there is no limit', () => {
    const bare = requireDesign({ ...(demoJson as unknown as DesignInput), emissions: undefined });
    const page = parse(makeReport({ design: bare, origin }).html);
    expect(page.querySelector('#margins')?.textContent).toContain('no limit mask');
    expect(page.querySelectorAll('figure[data-plot-id]')).toHaveLength(2);
  });

  it('judges the noise estimate by default when the design has one and no scan is given', () => {
    const estimate = makeReport({ design: demo, origin });
    expect(estimate.data.margin?.noise).toContain('noise estimate');
    const analysis = analyzeEmissions(demo, { kind: 'estimate' });
    expect(estimate.data.margin?.bands.map((b) => b.worstMarginDb?.value)).toEqual(analysis.report.bands.map((b) => b.worst?.marginDb));
  });
});
