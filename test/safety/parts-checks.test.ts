import { describe, expect, it } from 'vitest';
import { runSafetyChecks } from '../../src/safety/index.ts';
import { expectRelative, finding, MAINS_264_60, safetyDesign, value, xCap, yCap } from './safety-designs.ts';

/**
 * Class, voltage stress, line current and saturation on invented designs. Impulse test voltages are
 * IEC 60384-14's (references.md §9); the copper loss, flux and crest-factor arithmetic is worked by
 * hand in each test.
 */

const nF = 1e-9;
const DC48 = { kind: 'dc', highestVoltage: 48 } as const;

describe('capacitor safety class (IEC 60384-14 subclasses)', () => {
  const classOf = (element: Parameters<typeof safetyDesign>[0]['elements'][number], supply: Parameters<typeof safetyDesign>[0]['supply'] = MAINS_264_60) =>
    finding(runSafetyChecks(safetyDesign({ elements: [element], supply })), `class.${element.id}`);

  it('Y2 from a line to earth passes with its 5 kV impulse test voltage; X2 across the line with 2.5 kV', () => {
    const y = classOf(yCap('CY1', 'line1-to-ground', 2.2 * nF));
    expect(y.status).toBe('pass');
    expect(value(y, 'impulse test voltage of Y2')).toBe(5000);
    const x = classOf(xCap('CX1', 100 * nF));
    expect(x.status).toBe('pass');
    expect(value(x, 'impulse test voltage of X2')).toBe(2500);
    expect(x.summary).toMatch(/overvoltage category II/u);
  });

  it('an X part or an unclassed part from a line to earth fails; an unclassed part across the line fails', () => {
    expect(classOf(yCap('CY1', 'line2-to-ground', 2.2 * nF, { safetyClass: 'X1' })).status).toBe('fail');
    expect(classOf(yCap('CY1', 'line2-to-ground', 2.2 * nF, { safetyClass: 'none' })).status).toBe('fail');
    expect(classOf(xCap('CX1', 100 * nF, { safetyClass: 'none' })).status).toBe('fail');
  });

  it('a Y part across the line is accepted; Y4 is known', () => {
    const y4 = classOf(xCap('CX1', 10 * nF, { safetyClass: 'Y4' }));
    expect(y4.status).toBe('pass');
    expect(value(y4, 'impulse test voltage of Y4')).toBe(2500);
  });

  it('an X2 above 1 µF shows the derated impulse voltage and says the rule is from a secondary source (2.2 µF: 1685.5 V)', () => {
    const x = classOf(xCap('CX1', 2.2e-6));
    expectRelative(value(x, 'impulse test voltage of X2 (derated above 1 µF)'), 1685.5, 5e-5);
    expect(x.summary).toContain('secondary source');
  });

  it('a damping R-C is a warning (no class field); a DC input needs no class', () => {
    expect(classOf({ id: 'RC1', placement: 'line-to-line', part: { kind: 'damping-rc', resistance: 1.5, capacitance: 1e-6 } }).status).toBe('warn');
    const dc = runSafetyChecks(safetyDesign({ elements: [yCap('CY1', 'line1-to-ground', 2.2 * nF, { safetyClass: 'none' })], supply: DC48 }));
    expect(finding(dc, 'class.supply').status).toBe('not-applicable');
  });
});

describe('voltage stress', () => {
  const stressOf = (element: Parameters<typeof safetyDesign>[0]['elements'][number], supply: Parameters<typeof safetyDesign>[0]['supply'] = MAINS_264_60) =>
    finding(runSafetyChecks(safetyDesign({ elements: [element], supply })), `voltage.${element.id}`);

  it('an X2 rated 310 V AC at 264 V: 85.2 % of its rating, peak 373.35 V against 438.41 V', () => {
    const x = stressOf(xCap('CX1', 100 * nF));
    expect(x.status).toBe('pass');
    expectRelative(value(x, 'peak voltage across it'), 264 * Math.SQRT2, 1e-12);
    expectRelative(value(x, 'rating as a peak'), 310 * Math.SQRT2, 1e-12);
    expectRelative(value(x, 'share of the rating'), (100 * 264) / 310, 1e-12);
  });

  it('an AC rating up to 10 % below the highest voltage warns (250 V at 264 V); further below fails (230 V at 264 V)', () => {
    expect(stressOf(xCap('CX1', 100 * nF, { ratedVoltage: 250 })).status).toBe('warn');
    expect(stressOf(xCap('CX1', 100 * nF, { ratedVoltage: 230 })).status).toBe('fail');
  });

  it('an unclassed capacitor is taken as DC-rated: 400 V against the 373.35 V peak passes, 350 V fails', () => {
    expect(stressOf(xCap('CX1', 100 * nF, { safetyClass: 'none', ratedVoltage: 400 })).status).toBe('pass');
    expect(stressOf(xCap('CX1', 100 * nF, { safetyClass: 'none', ratedVoltage: 350 })).status).toBe('fail');
  });

  it('on a DC input the DC voltage is compared with the rating; a missing rating names its field', () => {
    expect(stressOf(xCap('CX1', 1e-6, { safetyClass: 'none', ratedVoltage: 50 }), DC48).status).toBe('pass');
    expect(stressOf(xCap('CX1', 1e-6, { safetyClass: 'none', ratedVoltage: 40 }), DC48).status).toBe('fail');
    const missing = stressOf({ id: 'CX1', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: 1e-6 } }, DC48);
    expect(missing).toMatchObject({ status: 'not-checked', missing: ['stages[0].elements[0].part.ratedVoltage'] });
  });

  it('a common-mode choke’s rating against the working voltage', () => {
    const choke = (ratedVoltage: number) => ({ id: 'L1', placement: 'both-lines-coupled' as const, part: { kind: 'common-mode-choke' as const, inductance: 1e-3, coupling: { kind: 'coupling-factor' as const, couplingFactor: 0.99 }, ratedVoltage } });
    expect(stressOf(choke(275)).status).toBe('pass');
    expect(stressOf(choke(125)).status).toBe('fail');
  });
});

const cmc = (extra: Record<string, unknown> = {}) => ({
  id: 'LCM1',
  placement: 'both-lines-coupled' as const,
  part: { kind: 'common-mode-choke' as const, inductance: '2.2 mH', coupling: { kind: 'leakage-inductance' as const, leakageInductance: '12 uH' }, dcr: '60 mOhm', ratedCurrent: '2 A', ratedVoltage: 250, ...extra },
});

describe('line current: copper loss and ratings', () => {
  it('a choke at 1.2 A with 60 mΩ per winding loses 2 × 1.2² × 0.06 = 172.8 mW; 60 % of its 2 A rating', () => {
    const report = runSafetyChecks(safetyDesign({ elements: [cmc()], supply: MAINS_264_60, lineCurrent: 1.2 }));
    const w = finding(report, 'windings.LCM1');
    expect(w.status).toBe('pass');
    expectRelative(value(w, 'copper loss at the line current'), 0.1728, 1e-12);
    expectRelative(value(w, 'copper loss per winding at the line current'), 0.0864, 1e-12);
    expectRelative(report.checks.find((c) => c.id === 'windings')!.figures.find((f) => f.label === 'total copper loss at the line current')!.value, 0.1728, 1e-12);
  });

  it('above its rated current it fails; without the line current the loss is shown at the rated current and the rating is not checked', () => {
    expect(finding(runSafetyChecks(safetyDesign({ elements: [cmc()], supply: MAINS_264_60, lineCurrent: 2.5 })), 'windings.LCM1').status).toBe('fail');
    const w = finding(runSafetyChecks(safetyDesign({ elements: [cmc()], supply: MAINS_264_60 })), 'windings.LCM1');
    expect(w).toMatchObject({ status: 'not-checked', missing: ['operating.lineCurrent'] });
    expectRelative(value(w, 'copper loss at the rated current'), 2 * 4 * 0.06, 1e-12);
  });

  it('inductors and beads in series count once; a series resistor is a warning with its dissipation; the total adds them', () => {
    const report = runSafetyChecks(
      safetyDesign({
        elements: [
          { id: 'L1', placement: 'series-line1', part: { kind: 'inductor', inductance: 1e-4, dcr: 0.1, ratedCurrent: 3 } },
          { id: 'FB1', placement: 'series-line2', part: { kind: 'ferrite-bead', resistance: 100, inductance: 1e-6, dcResistance: 0.05, ratedCurrent: 3 } },
          { id: 'R1', placement: 'series-line2', part: { kind: 'resistor', resistance: 1 } },
        ],
        supply: DC48,
        lineCurrent: 2,
      }),
    );
    expectRelative(value(finding(report, 'windings.L1'), 'copper loss at the line current'), 0.4, 1e-12);
    expectRelative(value(finding(report, 'windings.FB1'), 'copper loss at the line current'), 0.2, 1e-12);
    expect(finding(report, 'windings.R1').status).toBe('warn');
    expectRelative(report.checks.find((c) => c.id === 'windings')!.figures[1]!.value, 0.4 + 0.2 + 4, 1e-12);
  });
});

describe('saturation and inductance at full load', () => {
  const core = { effectiveAreaMm2: 20, turns: 30, saturationFluxDensityTesla: 0.35 };

  it('a choke’s peak flux: 12 µH × 3 A / (30 × 20 mm²) = 60 mT from the line current, plus the Y capacitors’ common-mode current', () => {
    // 1.2 A rms with crest factor 2.5 → 3 A peak. Y capacitors on the converter side (before the choke):
    // 2.2 nF per line at 264 V, 60 Hz, +20 % → 0.26274 mA rms, ×√2 peak; M = 2.188 mH.
    const report = runSafetyChecks(
      safetyDesign({
        elements: [yCap('CY1', 'line1-to-ground', 2.2 * nF), yCap('CY2', 'line2-to-ground', 2.2 * nF), cmc({ core })],
        supply: MAINS_264_60,
        lineCurrent: 1.2,
        safety: { lineCurrentCrestFactor: 2.5 },
      }),
    );
    const flux = finding(report, 'saturation.LCM1');
    expectRelative(value(flux, 'flux density from the line current'), (12e-6 * 3) / (30 * 20e-6), 1e-12);
    const cmPeak = Math.SQRT2 * 2 * Math.PI * 60 * 2.2e-9 * 1.2 * 264;
    expectRelative(value(flux, 'peak common-mode current'), cmPeak, 1e-12);
    expectRelative(value(flux, 'flux density from the common-mode current'), (2.188e-3 * cmPeak) / (30 * 20e-6), 1e-9);
    expect(flux.status).toBe('pass');
  });

  it('Y capacitors on the mains side of a choke add no common-mode current through it', () => {
    const report = runSafetyChecks(safetyDesign({ elements: [cmc({ core }), yCap('CY1', 'line1-to-ground', 2.2 * nF)], supply: MAINS_264_60, lineCurrent: 1 }));
    expect(value(finding(report, 'saturation.LCM1'), 'peak common-mode current')).toBe(0);
  });

  it('inside the margin warns, above saturation fails (a DM inductor: B = L·I/(N·A_e))', () => {
    const inductorWith = (turns: number) => ({ id: 'L1', placement: 'series-line1' as const, part: { kind: 'inductor' as const, inductance: 1e-3, core: { effectiveAreaMm2: 50, turns, saturationFluxDensityTesla: 0.3 } } });
    // DC 2 A: B = 1e-3 × 2 / (N × 50e-6) = 40 / N T
    const at = (turns: number) => finding(runSafetyChecks(safetyDesign({ elements: [inductorWith(turns)], supply: DC48, lineCurrent: 2 })), 'saturation.L1');
    expectRelative(value(at(200), 'peak flux density'), 0.2, 1e-12);
    expect(at(200).status).toBe('pass'); // 0.2 T ≤ 0.24 T
    expect(at(150).status).toBe('warn'); // 0.2667 T between 0.24 and 0.3 T
    expect(at(120).status).toBe('fail'); // 0.3333 T
  });

  it('missing core data is named field by field; no core at all is not checked', () => {
    const partial = finding(runSafetyChecks(safetyDesign({ elements: [cmc({ core: { turns: 10 } })], supply: MAINS_264_60, lineCurrent: 1 })), 'saturation.LCM1');
    expect(partial).toMatchObject({ status: 'not-checked', missing: ['stages[0].elements[0].part.core.effectiveAreaMm2', 'stages[0].elements[0].part.core.saturationFluxDensityTesla'] });
    expect(finding(runSafetyChecks(safetyDesign({ elements: [cmc()], supply: MAINS_264_60, lineCurrent: 1 })), 'saturation.LCM1').status).toBe('not-checked');
  });

  it('warns that common-mode inductance falls with current when no bias curve is given; reads the curve when one is', () => {
    const none = finding(runSafetyChecks(safetyDesign({ elements: [cmc()], supply: MAINS_264_60, lineCurrent: 1 })), 'inductance-at-current.LCM1');
    expect(none.status).toBe('warn');
    expect(none.summary).toMatch(/common-mode inductance falls/u);
    const curve = { currentA: [0, 1, 2], inductanceRatio: [1, 0.9, 0.6] };
    // 1 A rms × √2 = 1.4142 A peak → 0.9 + 0.4142 × (0.6 − 0.9) = 0.77574: below 80 % → warn
    const withCurve = finding(runSafetyChecks(safetyDesign({ elements: [cmc({ core: { biasCurve: curve } })], supply: MAINS_264_60, lineCurrent: 1 })), 'inductance-at-current.LCM1');
    expect(withCurve.status).toBe('warn');
    expectRelative(value(withCurve, 'share of the zero-current value'), 100 * (0.9 + (Math.SQRT2 - 1) * -0.3), 1e-12);
    const small = finding(runSafetyChecks(safetyDesign({ elements: [cmc({ core: { biasCurve: curve } })], supply: MAINS_264_60, lineCurrent: 0.5 })), 'inductance-at-current.LCM1');
    expect(small.status).toBe('pass');
    const beyond = finding(runSafetyChecks(safetyDesign({ elements: [cmc({ core: { biasCurve: curve } })], supply: MAINS_264_60, lineCurrent: 2 })), 'inductance-at-current.LCM1');
    expect(beyond.status).toBe('not-checked');
  });
});
