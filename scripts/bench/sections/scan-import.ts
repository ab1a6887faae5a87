import { spawnSync } from 'node:child_process';
import { closeSync, existsSync, mkdtempSync, openSync, readFileSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { type BenchSection, type Figure } from '../bench-section.ts';

/**
 * A million-row scan read and judged: by `chokepoint check` in a child process of its own (wall time,
 * CPU time, peak RSS and the V8 heap at exit, written by scripts/bench/scan-usage-preload.mjs), and in
 * the built page in headless Chromium (time from choosing the file to the verdict on screen, and the
 * peak RSS of the page's renderer process, which runs the page and its workers), each in a fresh
 * process so the figures are clean. The scan is invented: 150 kHz to 30 MHz in 29.85 Hz steps, peak,
 * quasi-peak and average, lobes at harmonics of 65 kHz over a floor.
 */

const ROWS = 1_000_000;
const RUNS = 3;
const root = process.cwd();
const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const CHROMIUM = '/usr/bin/chromium';

function writeScan(path: string): number {
  const file = openSync(path, 'w');
  let bytes = 0;
  const put = (text: string): void => {
    bytes += writeSync(file, text);
  };
  put('# INVENTED million-row scan for the benchmark, not a measurement\nFrequency [MHz],Peak [dBuV],QP [dBuV],AV [dBuV]\n');
  let chunk = '';
  for (let i = 0; i < ROWS; i += 1) {
    const f = 0.15 + ((30 - 0.15) * i) / (ROWS - 1);
    const harmonic = Math.round(f / 0.065);
    const lobe = Math.abs(f - harmonic * 0.065) < 0.004 ? 90 - 20 * Math.log10(harmonic) : 16 + (i % 7) * 0.1;
    chunk += `${f.toFixed(7)},${lobe.toFixed(2)},${(lobe - 2).toFixed(2)},${(lobe - 5).toFixed(2)}\n`;
    if (chunk.length > 1 << 20) {
      put(chunk);
      chunk = '';
    }
  }
  put(chunk);
  closeSync(file);
  return bytes;
}

interface Usage {
  readonly maxRssKb: number;
  readonly userCpuUs: number;
  readonly systemCpuUs: number;
  readonly heapCommittedBytes: number;
  readonly peakMallocedBytes: number;
}

const median = (values: readonly number[]): number => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!;
const mb = (bytes: number): number => Math.round(bytes / 1e5) / 10;

/** `chokepoint check` on the scan, in a fresh Node process each run. */
function measureCli(scanPath: string, dir: string): { figures: Record<string, Figure>; rows: [string, string][] } {
  // Build the command line first if it is stale, outside the measurement.
  spawnSync(process.execPath, [join(root, 'bin', 'chokepoint.mjs'), '--version'], { cwd: root, stdio: 'ignore' });
  const walls: number[] = [];
  const usages: Usage[] = [];
  let exitCode: number | null = null;
  for (let run = 0; run < RUNS; run += 1) {
    const usageFile = join(dir, `usage-${run}.json`);
    const started = performance.now();
    const child = spawnSync(
      process.execPath,
      ['--import', join(root, 'scripts', 'bench', 'scan-usage-preload.mjs'), join(root, 'dist-cli', 'chokepoint.mjs'), 'check', DEMO, '--scan', scanPath, '--json', '-o', join(dir, 'check.json')],
      { cwd: root, env: { ...process.env, CHOKEPOINT_USAGE_FILE: usageFile }, stdio: ['ignore', 'ignore', 'pipe'] },
    );
    walls.push(performance.now() - started);
    exitCode = child.status;
    usages.push(JSON.parse(readFileSync(usageFile, 'utf8')) as Usage);
  }
  const cpu = median(usages.map((u) => (u.userCpuUs + u.systemCpuUs) / 1e3));
  const rss = Math.max(...usages.map((u) => u.maxRssKb)) / 1e3;
  const heap = Math.max(...usages.map((u) => u.heapCommittedBytes));
  const analysed = (JSON.parse(readFileSync(join(dir, 'check.json'), 'utf8')) as { frequencyHz: unknown[] }).frequencyHz.length;
  return {
    figures: {
      scanImportRows: ROWS,
      scanImportAnalysedPoints: analysed,
      scanImportCliMs: median(walls),
      scanImportCliCpuMs: cpu,
      scanImportCliPeakRssMb: Math.round(rss * 10) / 10,
      scanImportCliHeapCommittedAtExitMb: mb(heap),
      scanImportCliExitCode: exitCode,
    },
    rows: [
      ['chokepoint check, 10^6-row scan (whole process)', `${median(walls).toFixed(0)} ms wall, ${cpu.toFixed(0)} ms CPU (median of ${RUNS})`],
      ['  peak RSS / V8 heap committed at exit', `${rss.toFixed(0)} MB / ${mb(heap)} MB`],
      ['  points judged after the reduction to the receiver’s resolution', String(analysed)],
    ],
  };
}

/** The built page in headless Chromium, measured by scripts/bench/page-scan-bench.mjs in a process of its own. */
function measurePage(scanPath: string): { figures: Record<string, Figure>; rows: [string, string][]; note?: string } {
  const child = spawnSync(process.execPath, [join(root, 'scripts', 'bench', 'page-scan-bench.mjs'), scanPath, String(RUNS)], { cwd: root, encoding: 'utf8' });
  if (child.status !== 0) return { figures: {}, rows: [], note: `the page could not be measured: ${(child.stderr || child.stdout).trim().split('\n').slice(-3).join(' ')}` };
  const result = JSON.parse(child.stdout.trim().split('\n').pop()!) as { ms: number; rendererPeakRssMb: number; status: string };
  return {
    figures: { scanImportPageMs: Math.round(result.ms), scanImportPageRendererPeakRssMb: result.rendererPeakRssMb },
    rows: [
      ['the page in headless Chromium, file chosen to verdict shown', `${result.ms.toFixed(0)} ms (median of ${RUNS})`],
      ['  peak RSS of the renderer (page and its workers)', `${result.rendererPeakRssMb.toFixed(0)} MB`],
      ['  status line', result.status],
    ],
  };
}

export const scanImportSection: BenchSection = {
  id: 'scan-import',
  title: 'scan import and judgement, 10^6 rows',
  run() {
    const dir = mkdtempSync(join(tmpdir(), 'chokepoint-bench-scan-'));
    try {
      const scanPath = join(dir, 'bench-scan.csv');
      const bytes = writeScan(scanPath);
      const cli = measureCli(scanPath, dir);
      const notes: string[] = [];
      let page: ReturnType<typeof measurePage> = { figures: {}, rows: [] };
      if (existsSync(CHROMIUM)) page = measurePage(scanPath);
      else notes.push(`no ${CHROMIUM}: the page was not measured`);
      if (page.note) notes.push(page.note);
      return Promise.resolve({
        figures: { scanImportFileMb: mb(bytes), ...cli.figures, ...page.figures },
        rows: [['scan file', `${ROWS} rows, ${mb(bytes)} MB (invented)`], ...cli.rows, ...page.rows],
        notes,
      });
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  },
};
