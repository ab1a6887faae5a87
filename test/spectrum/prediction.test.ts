import { describe, expect, it } from 'vitest';
import { predictScan } from '../../src/spectrum/prediction.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';
import { buildDesign, capacitor, element } from '../support/design-builders.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import type { DesignInput } from '../../src/model/design.ts';

/**
 * End-to-end case computed by hand (closed-form circuit arithmetic, written out below, not by the
 * engine). A common-mode noise source that is nearly a current source — 10 pF to chassis — feeds
 * two Y capacitors of 2.2 nF (4.4 nF together in common mode) and then an ideal common-mode
 * choke of 1 mH per winding (k = 1, so common mode sees L = 1 mH), into two 50 Ω receiving
 * networks (25 Ω in common mode, the two in parallel). Scan: 90 dBµV at 1 MHz, common mode from a
 * separator, taken with no filter fitted.
 */
const f = 1e6;
const w = 2 * Math.PI * f;
type Cx = { re: number; im: number };
const cx = (re: number, im = 0): Cx => ({ re, im });
const add = (a: Cx, b: Cx): Cx => cx(a.re + b.re, a.im + b.im);
const mul = (a: Cx, b: Cx): Cx => cx(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
const div = (a: Cx, b: Cx): Cx => {
  const d = b.re * b.re + b.im * b.im;
  return cx((a.re * b.re + a.im * b.im) / d, (a.im * b.re - a.re * b.im) / d);
};
const abs = (a: Cx): number => Math.hypot(a.re, a.im);
const parallel = (a: Cx, b: Cx): Cx => div(mul(a, b), add(a, b));

const zSource = cx(0, -1 / (w * 10e-12)); // 10 pF: −j15.9 kΩ
const zY = cx(0, -1 / (w * 4.4e-9)); // both Y capacitors: −j36.2 Ω
const zChoke = cx(0, w * 1e-3); // j6.28 kΩ
const zLoad = cx(25); // two 50 Ω receivers in parallel
// Without filter: V = E·Z_load/(Z_source + Z_load).
const bare = div(zLoad, add(zSource, zLoad));
// With filter: E drives Z_source into Z_Y ∥ (Z_choke + Z_load); the load takes Z_load/(Z_choke + Z_load) of it.
const rest = parallel(zY, add(zChoke, zLoad));
const atY = div(rest, add(zSource, rest));
const filtered = mul(atY, div(zLoad, add(zChoke, zLoad)));
const handImprovementDb = 20 * Math.log10(abs(bare) / abs(filtered));

const choke = { kind: 'common-mode-choke' as const, inductance: 1e-3, coupling: { kind: 'coupling-factor' as const, couplingFactor: 1 } };

function design(withFilter: boolean): ReturnType<typeof buildDesign> {
  return buildDesign({
    elements: withFilter
      ? [element('line1-to-ground', capacitor(2.2e-9)), element('line2-to-ground', capacitor(2.2e-9)), element('both-lines-coupled', choke)]
      : [],
    commonModeSource: { kind: 'capacitor', capacitance: 10e-12 },
    differentialModeSource: { kind: 'resistor', resistance: 1 },
  });
}

const scan: Scan = {
  name: 'hand case',
  tag: 'common-mode',
  frequencyHz: Float64Array.of(f),
  traces: [{ detector: 'quasi-peak', levelDbuV: Float64Array.of(90) }],
  rejected: [],
  notes: [],
};

describe('prediction = scan + 20·log|T_new / T_baseline|, in circuit', () => {
  it('matches the hand calculation of a CM current source, Y capacitors and a choke into 25 Ω (closed-form circuit arithmetic)', () => {
    // The hand numbers themselves: about 15.9 kΩ source, 36 Ω Y, 6.3 kΩ choke.
    expect(handImprovementDb).toBeGreaterThan(40);
    const prediction = predictScan(design(true), scan);
    expect(prediction.improvement.commonModeDb[0]!).toBeCloseTo(handImprovementDb, 6);
    expect(prediction.traces[0]!.predictedDbuV[0]!).toBeCloseTo(90 - handImprovementDb, 6);
    // Margin against the class B quasi-peak limit at 1 MHz, 56 dBµV (47 CFR §15.107(a)).
    const margin = 56 - prediction.traces[0]!.predictedDbuV[0]!;
    expect(margin).toBeCloseTo(56 - (90 - handImprovementDb), 6);
  });

  it('is not "scan minus the 50 Ω insertion loss": the two differ by several dB in this circuit', () => {
    // 50 Ω/50 Ω CM insertion loss of the same filter (CISPR 17, lines joined): source 50 Ω, load 50 Ω.
    const z50 = cx(50);
    const bare50 = div(z50, add(z50, z50));
    const rest50 = parallel(zY, add(zChoke, z50));
    const with50 = mul(div(rest50, add(z50, rest50)), div(z50, add(zChoke, z50)));
    const il50 = 20 * Math.log10(abs(bare50) / abs(with50));
    expect(Math.abs(il50 - handImprovementDb)).toBeGreaterThan(3);
  });

  it('with no filter in the new design, the prediction is the scan itself', () => {
    const prediction = predictScan(design(false), scan);
    expect(prediction.traces[0]!.predictedDbuV[0]!).toBeCloseTo(90, 9);
  });

  it('a baseline equal to the new filter predicts no change (T_new / T_baseline = 1)', () => {
    const withFilter = design(true);
    const input = { ...(JSON.parse(JSON.stringify(withFilter)) as DesignInput) };
    const same = requireDesign({ ...input, emissions: { baseline: { kind: 'stages', stages: input.stages } } });
    const prediction = predictScan(same, scan);
    expect(prediction.traces[0]!.predictedDbuV[0]!).toBeCloseTo(90, 9);
  });

  it('a scan of unknown mode credits the smaller improvement by default, and either mode on request', () => {
    const total: Scan = { ...scan, tag: 'total' };
    const worst = predictScan(design(true), total);
    const cm = predictScan(design(true), total, { attribution: 'common-mode' });
    const dm = predictScan(design(true), total, { attribution: 'differential-mode' });
    expect(worst.attribution).toBe('both');
    // This filter has no DM part at all (ideal choke, Y caps give DM nothing worth speaking of).
    expect(dm.improvement.appliedDb[0]!).toBeLessThan(1);
    expect(cm.improvement.appliedDb[0]!).toBeCloseTo(handImprovementDb, 6);
    expect(worst.improvement.appliedDb[0]!).toBeCloseTo(Math.min(cm.improvement.appliedDb[0]!, dm.improvement.appliedDb[0]!), 12);
    expect(worst.notes.join(' ')).toMatch(/smaller/);
  });

  it('marks points at or below the noise floor', () => {
    const floor: Scan = { ...scan, frequencyHz: Float64Array.of(1e6, 2e6), traces: [{ detector: 'peak', levelDbuV: Float64Array.of(90, 10) }] };
    const prediction = predictScan(design(true), floor, { noiseFloorDbuV: 12 });
    expect(Array.from(prediction.belowFloor)).toEqual([0, 1]);
  });
});
