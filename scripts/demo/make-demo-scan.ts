/**
 * Makes the INVENTED demo scan: what a fictional 90 W flyback adapter with no filter fitted might
 * read on line 1 of a CISPR 16 network. Not a measurement of anything: the levels come from the
 * demo design's own noise estimate (a trapezoidal switch node over a small parasitic capacitance,
 * pulsed input current from the bulk capacitor), drawn through a 9 kHz receiver bandwidth, over a
 * receiver floor, with a little seeded roughness. Rerun with
 *   node scripts/run-ts.mjs scripts/demo/make-demo-scan.ts > fixtures/scans/invented-adapter-no-filter.csv
 */
import { readFileSync } from 'node:fs';
import { requireDesign } from '../../src/model/read-design.ts';
import { predictFromEstimate } from '../../src/spectrum/noise-estimate.ts';

const design = requireDesign(JSON.parse(readFileSync('fixtures/demo/adapter-two-stage.design.json', 'utf8')));
const estimate = design.emissions?.estimate;
if (!estimate) throw new Error('the demo design has no emissions.estimate');
const bare = { ...design, stages: [] };
const lines = predictFromEstimate(bare, estimate, { stopHz: 31e6 });

// A receiver tuned to f sees each spectral line through its bandwidth: 9 kHz at −6 dB (CISPR
// 16-1-1 band B), modelled as a Gaussian in amplitude.
const halfWidth = 4.5e3;
const shape = Math.log(2) / (halfWidth * halfWidth);
const floorV = 10 ** ((16 - 120) / 20) * Math.SQRT2; // 16 dBµV rms floor, as a peak amplitude
let seed = 20261201;
const random = (): number => {
  seed = (seed * 1103515245 + 12345) % 2147483648;
  return seed / 2147483648;
};

// A receiver scan steps linearly, about half a bandwidth at a time.
const grid = Float64Array.from({ length: Math.floor((30e6 - 150e3) / 4e3) + 1 }, (_, k) => 150e3 + 4e3 * k);
const rows: string[] = [
  '# INVENTED demo scan: a fictional 90 W flyback adapter, no filter fitted, line 1, CISPR 16 network.',
  '# Not a measurement. Made by scripts/demo/make-demo-scan.ts from the demo design\'s noise estimate.',
  'Frequency [MHz],Peak [dBuV],QP [dBuV],AV [dBuV]',
];
const f = lines.frequencyHz;
const amplitude = lines.line1.total.peakV;
for (const frequency of grid) {
  let sum = 0;
  for (let k = 0; k < f.length; k += 1) {
    const d = frequency - f[k]!;
    if (Math.abs(d) < 4 * halfWidth) sum += amplitude[k]! * Math.exp(-shape * d * d);
  }
  const peakV = Math.sqrt(sum * sum + floorV * floorV) * (1 + 0.08 * (random() - 0.5));
  const peak = 20 * Math.log10(peakV / Math.SQRT2 / 1e-6);
  // Switching noise from a rectified-mains converter is modulated at twice the line frequency, so
  // quasi-peak and average read below peak on the lines (invented offsets); the floor reads the same.
  const lineShare = sum / (sum + floorV);
  const qp = peak - 2.5 * lineShare;
  const av = peak - 7 * lineShare;
  rows.push([(frequency / 1e6).toFixed(6), peak.toFixed(2), qp.toFixed(2), av.toFixed(2)].join(','));
}
process.stdout.write(`${rows.join('\n')}\n`);
