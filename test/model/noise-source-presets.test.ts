import { describe, expect, it } from 'vitest';
import { NOISE_SOURCE_PRESETS } from '../../src/model/noise-source-presets.ts';
import { readDesign } from '../../src/model/read-design.ts';

const designWith = (commonMode: unknown, differentialMode: unknown): unknown => ({
  format: 'chokepoint-design',
  version: 2,
  name: 'presets',
  noiseSource: { commonMode, differentialMode },
  receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } },
  stages: [],
});

describe('noise-source presets', () => {
  it('fill a valid design with the stated defaults (100 pF to chassis; 100 µF, 0.1 Ω, 20 nH bulk capacitor)', () => {
    const result = readDesign(designWith(NOISE_SOURCE_PRESETS['capacitive-coupling-to-chassis'](), NOISE_SOURCE_PRESETS['bulk-capacitor']()));
    if (!result.ok) throw result.error;
    const { commonMode, differentialMode } = result.value.noiseSource;
    expect(commonMode.preset).toBe('capacitive-coupling-to-chassis');
    expect(commonMode.impedance).toMatchObject({ kind: 'capacitor', capacitance: 100e-12 });
    expect(differentialMode.impedance).toMatchObject({ kind: 'capacitor', capacitance: 100e-6, esr: 0.1, esl: 20e-9 });
  });

  it('take values, as numbers or engineering text', () => {
    const result = readDesign(designWith(NOISE_SOURCE_PRESETS['capacitive-coupling-to-chassis']('47p'), NOISE_SOURCE_PRESETS.resistive(1e3)));
    if (!result.ok) throw result.error;
    expect(result.value.noiseSource.commonMode.impedance).toMatchObject({ capacitance: 47e-12 });
    expect(result.value.noiseSource.differentialMode.impedance).toMatchObject({ kind: 'resistor', resistance: 1000 });
  });

  it('a preset given a bad value is caught by the schema like any other field', () => {
    const result = readDesign(designWith(NOISE_SOURCE_PRESETS['capacitive-coupling-to-chassis']('4.7 q'), NOISE_SOURCE_PRESETS.resistive()));
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error.issues[0]!.path).toBe('noiseSource.commonMode.impedance.capacitance');
  });
});
