import type { DesignInput } from './design.ts';

type NoiseSourceModeInput = DesignInput['noiseSource']['commonMode'];

/**
 * Starting points for a design's noise source, per mode; each fills the mode's impedance and
 * names itself in `preset` (informational: the values stay editable in the design). Typical values
 * are common practice, no single source.
 */
export const NOISE_SOURCE_PRESETS = {
  /** Common mode: the switch node's capacitance to chassis (heatsink tab, transformer, cable), 100 pF unless given. */
  'capacitive-coupling-to-chassis': (capacitance: number | string = '100 pF'): NoiseSourceModeInput => ({
    preset: 'capacitive-coupling-to-chassis',
    impedance: { kind: 'capacitor', capacitance },
  }),
  /** Differential mode: the converter's bulk or input capacitor with its ESR and ESL. */
  'bulk-capacitor': (capacitance: number | string = '100 uF', esr: number | string = '0.1', esl: number | string = '20 nH'): NoiseSourceModeInput => ({
    preset: 'bulk-capacitor',
    impedance: { kind: 'capacitor', capacitance, esr, esl },
  }),
  /** Either mode: a plain resistance (a 50 Ω signal generator, say). */
  resistive: (resistance: number | string = 50): NoiseSourceModeInput => ({
    preset: 'resistive',
    impedance: { kind: 'resistor', resistance },
  }),
} as const;

export type NoiseSourcePresetId = keyof typeof NOISE_SOURCE_PRESETS;
