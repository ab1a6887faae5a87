import { readEmissionsReply } from '../../../src/client/read-emissions-reply.ts';
import { copyPreset } from '../../../src/spectrum/limit-presets.ts';
import type { EmissionsAnalysis } from '../../../src/spectrum/emissions-analysis.ts';
import type { Scan, ScanTag } from '../../../src/spectrum/spectrum-types.ts';
import type { EmissionsNoise } from '../../../workers/emissions-protocol.ts';
import { sweepApi } from '../../../workers/sweep-api.ts';

/**
 * A small design document with an emissions block (FCC class B QP and AV limits, a 6 dB target, a
 * noise estimate) and a synthetic scan with known peaks. The numbers are made up for the tests; the
 * analyses come from the worker's own API, called in-process, so the page is tested against exactly
 * what the worker sends.
 */
export function emissionsDesignDocument(emissions: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    format: 'chokepoint-design',
    version: 2,
    name: 'Test adapter, one LC stage',
    frequencyPlan: { startHz: '150 kHz', stopHz: '30 MHz', pointsPerDecade: 40 },
    noiseSource: {
      commonMode: { impedance: { kind: 'capacitor', capacitance: '50 pF' } },
      differentialMode: { impedance: { kind: 'capacitor', capacitance: '47 uF', esr: '0.2', esl: '15 nH' } },
    },
    receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } },
    stages: [
      {
        id: 's1',
        elements: [
          { id: 'CX1', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '1 uF', esl: '10 nH' } },
          {
            id: 'L1',
            placement: 'both-lines-coupled',
            part: { kind: 'common-mode-choke', inductance: '1 mH', coupling: { kind: 'leakage-inductance', leakageInductance: '10 uH' }, windingCapacitance: '5 pF' },
          },
        ],
      },
    ],
    emissions: {
      masks: [copyPreset('fcc-15.107-class-b-qp'), copyPreset('fcc-15.107-class-b-av')],
      targetMarginDb: 6,
      noiseFloorDbuV: 20,
      estimate: {
        commonMode: { switchNode: { amplitude: '380 V', frequencyHz: '100 kHz', duty: 0.4, riseTime: '30 ns' }, parasiticCapacitance: '2 pF' },
        differentialMode: {
          current: { kind: 'pulsed', pulse: { amplitude: '0.3 A', frequencyHz: '100 kHz', duty: 0.4, riseTime: '30 ns' } },
          inputCapacitance: '47 uF',
          esr: '0.2',
          esl: '15 nH',
        },
      },
      ...emissions,
    },
  };
}

/**
 * A scan on a linear axis from 150 kHz to 30 MHz (or `stopHz`): a floor of 15 dBµV with lobes at harmonics of
 * 100 kHz falling with frequency (peak; QP 3 dB and AV 8 dB lower), like a flyback with no filter.
 */
export function syntheticScan(options: { points?: number; tag?: ScanTag; name?: string; stopHz?: number } = {}): Scan {
  const n = options.points ?? 3000;
  const stopHz = options.stopHz ?? 30e6;
  const buffer = new Float64Array(4 * n);
  const frequencyHz = buffer.subarray(0, n);
  const peak = buffer.subarray(n, 2 * n);
  const qp = buffer.subarray(2 * n, 3 * n);
  const av = buffer.subarray(3 * n, 4 * n);
  for (let i = 0; i < n; i += 1) {
    const f = 150e3 + ((stopHz - 150e3) * i) / (n - 1);
    frequencyHz[i] = f;
    const harmonic = Math.round(f / 100e3);
    const offset = Math.abs(f - harmonic * 100e3);
    const lobe = offset < 4e3 ? 95 - 20 * Math.log10(harmonic) : 15;
    peak[i] = Math.max(15, lobe);
    qp[i] = Math.max(15, lobe - 3);
    av[i] = Math.max(15, lobe - 8);
  }
  return {
    name: options.name ?? 'synthetic.csv',
    tag: options.tag ?? 'line1',
    frequencyHz,
    traces: [
      { detector: 'peak', levelDbuV: peak },
      { detector: 'quasi-peak', levelDbuV: qp },
      { detector: 'average', levelDbuV: av },
    ],
    rejected: [],
    notes: [],
  };
}

export function scanNoise(scan: Scan): EmissionsNoise {
  return { kind: 'scan', scan: { name: scan.name, tag: scan.tag, frequencyHz: scan.frequencyHz, traces: scan.traces.map((t) => ({ ...t })) } };
}

/** The worker API's answer for a design and noise, checked as the page checks it. */
export function analyse(document: unknown, noise: EmissionsNoise, options?: { attribution?: 'both' | 'common-mode' | 'differential-mode' }): EmissionsAnalysis {
  const outcome = readEmissionsReply(sweepApi.analyzeEmissions({ requestId: 1, design: document, noise, ...(options ? { options } : {}) }), 1);
  if (outcome.status !== 'done') throw new Error(`expected an analysis, got ${JSON.stringify(outcome)}`);
  return outcome.analysis;
}
