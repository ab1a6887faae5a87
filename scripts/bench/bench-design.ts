import type { DesignInput } from '../../src/model/design.ts';

/**
 * The benchmark's design: an invented two-stage mains filter with ten elements, every part
 * carrying its parasitics, between CISPR 16 networks. Ten elements and 2001 points are the size
 * the speed goal is stated for.
 */
export const BENCH_DESIGN: DesignInput = {
  format: 'chokepoint-design',
  version: 2,
  name: 'Benchmark: invented two-stage filter, ten elements',
  frequencyPlan: { startHz: 1e4, stopHz: 1e8, pointsPerDecade: 500 },
  noiseSource: {
    commonMode: { impedance: { kind: 'capacitor', capacitance: '100p', esr: 5, esl: '30n' } },
    differentialMode: { impedance: { kind: 'capacitor', capacitance: '100u', esr: 0.3, esl: '20n' } },
  },
  receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } },
  stages: [
    {
      id: 'near-converter',
      elements: [
        { id: 'CX1', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '100n', esr: '30m', esl: '10n' } },
        { id: 'CY1', placement: 'line1-to-ground', part: { kind: 'capacitor', capacitance: '2n2', esr: 0.2, esl: '6n' } },
        { id: 'CY2', placement: 'line2-to-ground', part: { kind: 'capacitor', capacitance: '2n2', esr: 0.2, esl: '6n' } },
        {
          id: 'LCM1',
          placement: 'both-lines-coupled',
          part: {
            kind: 'common-mode-choke',
            inductance: '2m2',
            coupling: { kind: 'leakage-inductance', leakageInductance: '12u' },
            dcr: '60m',
            windingCapacitance: '8p',
            permeability: { kind: 'first-order-relaxation', relaxationFrequencyHz: '800k' },
          },
        },
        { id: 'RD1', placement: 'line-to-line', part: { kind: 'damping-rc', resistance: 1.5, capacitance: '1u' } },
      ],
    },
    {
      id: 'inlet',
      elements: [
        { id: 'CX2', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '330n', esr: '20m', esl: '14n' } },
        { id: 'LD1', placement: 'series-line1', part: { kind: 'inductor', inductance: '47u', dcr: '20m', windingCapacitance: '5p' } },
        { id: 'LD2', placement: 'series-line2', part: { kind: 'inductor', inductance: '47u', dcr: '20m', windingCapacitance: '5p' } },
        {
          id: 'LCM2',
          placement: 'both-lines-coupled',
          part: {
            kind: 'common-mode-choke',
            inductance: '470u',
            coupling: { kind: 'coupling-factor', couplingFactor: 0.992 },
            dcr: '30m',
            windingCapacitance: '4p',
          },
        },
        { id: 'CX3', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '47n', esr: '40m', esl: '8n' } },
      ],
    },
  ],
};
