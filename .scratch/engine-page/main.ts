import { sweepDesign, SweepScratch } from '../../src/engine/index.ts';
const scratch = new SweepScratch();
import { readDesign } from '../../src/model/index.ts';
import { BENCH_DESIGN } from '../../scripts/bench/bench-design.ts';
const read = readDesign(structuredClone(BENCH_DESIGN));
if (!read.ok) throw new Error('bad');
(window as unknown as { go: () => void }).go = () => {
const res: string[] = [];
for (const refine of [true, false]) {
  const times: number[] = [];
  for (let i = 0; i < 60; i += 1) { const t0 = performance.now(); sweepDesign(read.value, { refine, scratch }); times.push(performance.now() - t0); }
  const tail = times.slice(20).sort((a, b) => a - b);
  res.push(`refine=${refine} median ${tail[20]!.toFixed(2)} min ${tail[0]!.toFixed(2)}`);
}
(window as unknown as { done: string }).done = res.join('; ');
};
