import { formatQuantity } from '../model/units.ts';
import { resolutionBandwidthHz } from './receiver-view.ts';
import type { Scan, ScanTrace } from './spectrum-types.ts';

/**
 * A scan reduced to the receiver's resolution before it is judged, so that a scan of any length
 * costs the analysis the same bounded work and memory. A receiver cannot tell apart readings much
 * closer than its resolution bandwidth (the IF filter passes them together); an export stepped at
 * 30 Hz through a 9 kHz bandwidth holds hundreds of readings per bandwidth that say the same thing.
 *
 * The rule: bins a quarter of the CISPR 16-1-1 6 dB bandwidth wide (50 Hz from 9 to 150 kHz, 2.25 kHz
 * from 150 kHz to 30 MHz, 30 kHz above: receiver-view.ts; below 9 kHz, where the standard sets none,
 * every point is kept), split at every given edge (the margin
 * bands' edges and the limit lines' corners, so that no bin straddles a step of a limit); a point
 * exactly on an edge keeps a bin of its own. In each bin every detector keeps its highest reading
 * (a peak is never lowered), all placed at the frequency where the highest-reading detector's trace
 * peaks in the bin. A bin holding one point is that point, so a scan stepped no finer than the bins
 * is left exactly as it was. docs/emissions.md, "Large scans", states the consequences.
 */

/** The bottom of CISPR 16-1-1 band A; nothing below it is binned. */
const LOWEST_BAND_HZ = 9e3;

/** The bin width as a fraction of the resolution bandwidth. */
export const BIN_FRACTION_OF_BANDWIDTH = 0.25;

export interface ScanReduction {
  readonly scan: Scan;
  /** Points before and after. */
  readonly fromPoints: number;
  readonly toPoints: number;
  /** What was done, for the notes; undefined when nothing was (no bin held two points). */
  readonly note: string | undefined;
}

const DETECTOR_ORDER = ['peak', 'quasi-peak', 'average'] as const;

/** Reduce a scan to bins of a quarter resolution bandwidth, split at `edgesHz` (any order). */
export function reduceScan(scan: Scan, edgesHz: readonly number[]): ScanReduction {
  const f = scan.frequencyHz;
  const n = f.length;
  const edges = Float64Array.from(new Set(edgesHz.filter((e) => Number.isFinite(e) && e > 0))).sort();
  // The bin of each point: a new one where the width or the bin number changes, or an edge is met or passed.
  // Below 9 kHz the standard sets no bandwidth: such points keep a bin each (-1 - i never repeats).
  const binOf = (i: number, edgeAt: number): number => {
    const here = f[i]!;
    if (here < LOWEST_BAND_HZ) return -1 - i;
    const width = resolutionBandwidthHz(here) * BIN_FRACTION_OF_BANDWIDTH;
    return Math.floor(here / width) * 2 + (width > 1e4 ? 1 : 0) + edgeAt * 1e12;
  };
  // Pass 1: count the bins.
  let bins = 0;
  walk(f, edges, binOf, () => {
    bins += 1;
  });
  if (bins === n) return { scan, fromPoints: n, toPoints: n, note: undefined };

  // Pass 2: fill them. One buffer for the axis and every trace, as the reader makes it.
  const traces = scan.traces;
  const buffer = new ArrayBuffer(8 * bins * (1 + traces.length));
  const frequencyHz = new Float64Array(buffer, 0, bins);
  const levels = traces.map((_, t) => new Float64Array(buffer, 8 * bins * (1 + t), bins));
  const lead = leadingTrace(traces);
  let b = 0;
  walk(f, edges, binOf, (from, to) => {
    let at = from;
    for (let i = from + 1; i < to; i += 1) if (lead.levelDbuV[i]! > lead.levelDbuV[at]!) at = i;
    frequencyHz[b] = f[at]!;
    traces.forEach((trace, t) => {
      const source = trace.levelDbuV;
      let highest = source[from]!;
      for (let i = from + 1; i < to; i += 1) if (source[i]! > highest) highest = source[i]!;
      levels[t]![b] = highest;
    });
    b += 1;
  });
  const reduced: Scan = {
    ...scan,
    frequencyHz,
    traces: traces.map((trace, t): ScanTrace => ({ detector: trace.detector, levelDbuV: levels[t]! })),
  };
  const width = (hz: number): string => formatQuantity(resolutionBandwidthHz(hz) * BIN_FRACTION_OF_BANDWIDTH, 'Hz', 3);
  const note =
    `the scan's ${n} points were reduced to ${bins} for the analysis: bins a quarter of the receiver's resolution bandwidth wide ` +
    `(CISPR 16-1-1: ${width(1e5)} from 9 to 150 kHz, ${width(1e6)} to 30 MHz, ${width(1e8)} above), split at band edges and limit corners, ` +
    `each detector keeping its highest reading in the bin (a peak is never lowered)`;
  return { scan: reduced, fromPoints: n, toPoints: bins, note };
}

/** The trace of the highest-reading detector: where the signal peaks in a bin. */
function leadingTrace(traces: readonly ScanTrace[]): ScanTrace {
  for (const detector of DETECTOR_ORDER) {
    const trace = traces.find((t) => t.detector === detector);
    if (trace) return trace;
  }
  return traces[0]!;
}

/**
 * Call `onBin(from, to)` for each run of points [from, to) in one bin, in order. `edgeAt` counts the
 * edges at or below a point; a point exactly on an edge is a bin of its own.
 */
function walk(f: Float64Array, edges: Float64Array, binOf: (i: number, edgeAt: number) => number, onBin: (from: number, to: number) => void): void {
  const n = f.length;
  let edge = 0;
  let from = 0;
  let key = Number.NaN;
  let onEdge = false;
  for (let i = 0; i < n; i += 1) {
    const here = f[i]!;
    while (edge < edges.length && edges[edge]! <= here) edge += 1;
    const exactly = edge > 0 && edges[edge - 1] === here;
    const k = binOf(i, edge);
    if (i > 0 && (k !== key || exactly || onEdge)) {
      onBin(from, i);
      from = i;
    }
    key = k;
    onEdge = exactly;
  }
  if (n > 0) onBin(from, n);
}
