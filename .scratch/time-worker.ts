import { sweepApi } from '../workers/sweep-api.ts';
import { BENCH_DESIGN } from '../scripts/bench/bench-design.ts';
import { sweepDesign } from '../src/engine/index.ts';
import { readDesign } from '../src/model/index.ts';
import { analyzeEmissions } from '../src/spectrum/emissions-analysis.ts';

const design = structuredClone(BENCH_DESIGN) as Record<string, unknown>;
const t = (label: string, f: () => unknown, n = 30): void => {
  for (let i = 0; i < 5; i += 1) f();
  const times: number[] = [];
  for (let i = 0; i < n; i += 1) { const t0 = performance.now(); f(); times.push(performance.now() - t0); }
  times.sort((a, b) => a - b);
  console.log(label.padEnd(40), 'median', times[n >> 1]!.toFixed(2), 'ms  min', times[0]!.toFixed(2));
};
let id = 1;
const read = readDesign(design);
if (!read.ok) throw new Error('bad');
console.log('has estimate', Boolean(read.value.emissions?.estimate), 'points', read.value.frequency);
t('readDesign', () => readDesign(structuredClone(design)));
t('sweepDesign refine', () => sweepDesign(read.value, { refine: true }));
t('sweepDesign no refine', () => sweepDesign(read.value, { refine: false }));
// t('analyzeEmissions estimate', () => analyzeEmissions(read.value, { kind: 'estimate' }, {}));
t('api sweep (new design obj)', () => sweepApi.sweep({ requestId: id++, design: structuredClone(design) }));
// t('api analyze (new design obj)', () => sweepApi.analyzeEmissions({ requestId: id++, design: structuredClone(design), noise: { kind: 'estimate' } }));
t('api safety', () => sweepApi.safetyChecks({ requestId: id++, design: structuredClone(design) }));
