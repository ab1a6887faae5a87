import { describe, expect, it } from 'vitest';
import { runSafetyChecks } from '../../src/safety/index.ts';
import { expectRelative, finding, MAINS_264_60, safetyDesign, value, xCap } from './safety-designs.ts';

/**
 * The discharge check on invented designs, against the bleeder rows of references.md §9 and check
 * case C14 of domain.md §6: IEC 60950-1 cl. 2.1.1.7 (τ ≤ 1 s, pluggable type A; applies above 0.1 µF),
 * IEC 60335-1 cl. 22.5 (34 V 1 s after disconnection at the peak; ≤ 0.1 µF exempt), both from clause
 * texts reproduced in safety forums; IEC 62368-1 cl. 5.5.2.2 (2 s; the 60 V threshold not confirmed).
 */

const uF = 1e-6;
const MAINS_230_50 = { kind: 'ac-mains', highestVoltage: 230, highestFrequencyHz: 50 } as const;
const bleeder = (id: string, resistance: number | string) => ({ id, placement: 'line-to-line' as const, part: { kind: 'resistor' as const, resistance } });
const tau1s = { kind: 'listed-requirement', id: 'iec60950-1-pluggable-a' } as const;

describe('X-capacitor discharge', () => {
  it('IEC 60950-1 cl. 2.1.1.7: 1 µF with a 1 MΩ bleeder meets τ ≤ 1 s exactly (tolerance 0); 1.1 MΩ does not', () => {
    const at = (r: number) => finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF), bleeder('RB1', r)], supply: MAINS_230_50, safety: { discharge: tau1s, capacitorTolerance: 0 } })), 'discharge.plug');
    const ok = at(1e6);
    expect(ok.status).toBe('pass');
    expectRelative(value(ok, 'largest bleed resistance'), 1e6, 1e-12);
    expectRelative(value(ok, 'time constant'), 1, 1e-12);
    expectRelative(value(ok, 'bleeder dissipation'), 52.9e-3, 1e-12);
    expect(at(1.1e6).status).toBe('fail');
  });

  it('IEC 60335-1 cl. 22.5: 34 V after 1 s from 230 V·√2 needs at most 442.8 kΩ across 1 µF (C14: τ ≤ 0.443 s)', () => {
    const report = runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF), bleeder('RB1', '430k')], supply: MAINS_230_50, safety: { discharge: { kind: 'listed-requirement', id: 'iec60335-1' }, capacitorTolerance: 0 } }));
    const plug = finding(report, 'discharge.plug');
    expect(plug.status).toBe('pass');
    expectRelative(value(plug, 'largest time constant'), 0.442812, 1e-5);
    expectRelative(value(plug, 'largest bleed resistance'), 442.8e3, 1e-4);
    expectRelative(value(plug, 'voltage after 1 s'), Math.SQRT2 * 230 * Math.exp(-1 / 0.43), 1e-9);
    expect(plug.sources.map((s) => `${s.standard} ${s.clause}`)).toContain('IEC 60335-1 cl. 22.5');
  });

  it('IEC 62368-1 cl. 5.5.2.2: 60 V after 2 s from 264 V·√2 allows 1.094 MΩ across 1 µF, and says the 60 V is not confirmed', () => {
    const plug = finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF), bleeder('RB1', '1meg')], supply: MAINS_264_60, safety: { discharge: { kind: 'listed-requirement', id: 'iec62368-1' }, capacitorTolerance: 0 } })), 'discharge.plug');
    expect(plug.status).toBe('pass');
    expectRelative(value(plug, 'largest bleed resistance'), 1.094e6, 5e-4);
    expect(plug.summary).toContain('not confirmed');
  });

  it('the tolerance lengthens the time constant: +20 % on 1 µF needs at most 833 kΩ for τ ≤ 1 s', () => {
    const plug = finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF), bleeder('RB1', 1e6)], supply: MAINS_230_50, safety: { discharge: tau1s, capacitorTolerance: 0.2 } })), 'discharge.plug');
    expect(plug.status).toBe('fail');
    expectRelative(value(plug, 'largest bleed resistance'), 1e6 / 1.2, 1e-12);
  });

  it('no bleeder above the exemption value is a fail that gives the bleeder to fit and its dissipation', () => {
    const plug = finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 0.47 * uF)], supply: MAINS_230_50, safety: { discharge: tau1s, capacitorTolerance: 0 } })), 'discharge.plug');
    expect(plug.status).toBe('fail');
    expectRelative(value(plug, 'largest bleed resistance'), 2.128e6, 5e-4);
    expect(plug.summary).toMatch(/No discharge path/u);
  });

  it('at or below 0.1 µF across the pins it is exempt (IEC 60335-1 cl. 22.5, IEC 60950-1 cl. 2.1.1.7); small parts are listed', () => {
    const report = runSafetyChecks(safetyDesign({ elements: [xCap('CX1', '47n'), xCap('CX2', '47n')], supply: MAINS_230_50, safety: { discharge: tau1s } }));
    const plug = finding(report, 'discharge.plug');
    expect(plug.status).toBe('pass');
    expect(plug.summary).toMatch(/^Exempt/u);
    expect(report.checks.find((c) => c.id === 'discharge')!.assumptions.join(' ')).toMatch(/CX1 \(47 nF\), CX2 \(47 nF\)/u);
  });

  it('two parts each below 0.1 µF but 0.2 µF together need a discharge path', () => {
    expect(finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', '100n'), xCap('CX2', '100n')], supply: MAINS_230_50, safety: { discharge: tau1s } })), 'discharge.plug').status).toBe('fail');
  });

  it('a zero-ohm resistor across the lines is a short, not a bleeder', () => {
    expect(finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF), bleeder('R0', 0)], supply: MAINS_230_50, safety: { discharge: tau1s } })), 'discharge.plug').status).toBe('fail');
  });

  it('an external bleed resistance counts in parallel with the design’s own', () => {
    const plug = finding(
      runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF), bleeder('RB1', 2e6)], supply: MAINS_230_50, safety: { discharge: tau1s, capacitorTolerance: 0, externalBleedResistance: '2meg' } })),
      'discharge.plug',
    );
    expect(plug.status).toBe('pass');
    expectRelative(value(plug, 'bleed resistance'), 1e6, 1e-12);
  });

  it('an entered residual-voltage requirement needs no bleeder when the peak is below it; the time constant kind is judged too', () => {
    const low = { kind: 'ac-mains', highestVoltage: 20, highestFrequencyHz: 50 } as const;
    expect(finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF)], supply: low, safety: { discharge: { kind: 'residual-voltage', maxVoltage: 34, after: 1 } } })), 'discharge.plug').status).toBe('pass');
    const entered = finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF), bleeder('RB1', 5e6)], supply: MAINS_230_50, safety: { discharge: { kind: 'time-constant', maxTimeConstant: 10 } } })), 'discharge.plug');
    expect(entered.status).toBe('pass');
    expect(entered.summary).toContain('you entered');
  });

  it('without a requirement or a supply it is not checked; on a DC input it does not apply', () => {
    expect(finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF)], supply: MAINS_230_50 })), 'discharge.plug')).toMatchObject({ status: 'not-checked', missing: ['safety.discharge'] });
    expect(finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF)], safety: { discharge: tau1s } })), 'discharge.plug')).toMatchObject({ status: 'not-checked', missing: ['operating.supply'] });
    expect(finding(runSafetyChecks(safetyDesign({ elements: [xCap('CX1', 1 * uF)], supply: { kind: 'dc', highestVoltage: 400 }, safety: { discharge: tau1s } })), 'discharge.plug').status).toBe('not-applicable');
  });
});
