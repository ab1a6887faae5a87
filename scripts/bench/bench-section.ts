/**
 * One area's figures for `npm run bench`. Each section lives in scripts/bench/sections/, is listed in
 * bench-main.ts, and returns flat named figures (their names carry the unit: `kernelMs`,
 * `editToPlotMsP95`, `peakMemoryMb`) plus the rows the table prints. Figure names are unique across
 * sections, so `--json` prints one flat object that two versions can be compared by, key by key.
 */
export interface BenchSection {
  /** Short id for `--only <id,id>`. */
  readonly id: string;
  readonly title: string;
  run(): Promise<SectionResult>;
}

export type Figure = number | string | boolean | null;

export interface SectionResult {
  readonly figures: Readonly<Record<string, Figure>>;
  /** label, value: the human-readable table. */
  readonly rows: readonly (readonly [string, string])[];
  /** Why some figures are missing (a tool not installed, say); printed and kept in the JSON. */
  readonly notes?: readonly string[];
}

export interface Timing {
  readonly medianMs: number;
  readonly minimumMs: number;
  readonly runs: number;
}

/** Median of repeated runs after a warm-up, so the JIT has settled; at least `minimumRuns`, for at least `budgetMs`. */
export function time(run: () => void, budgetMs: number, minimumRuns: number, warmupRuns: number): Timing {
  for (let k = 0; k < warmupRuns; k += 1) run();
  const samples: number[] = [];
  const started = performance.now();
  while (samples.length < minimumRuns || performance.now() - started < budgetMs) {
    const t0 = performance.now();
    run();
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  return { medianMs: samples[Math.floor(samples.length / 2)]!, minimumMs: samples[0]!, runs: samples.length };
}

/** The p-th percentile (0..100) of samples, by nearest rank. */
export function percentile(samples: readonly number[], p: number): number {
  const sorted = [...samples].sort((a, b) => a - b);
  if (sorted.length === 0) return Number.NaN;
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[rank]!;
}
