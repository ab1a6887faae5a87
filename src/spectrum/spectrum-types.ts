/**
 * Shared shapes for "noise in, margin out": scans and the detectors that tie them to limit masks.
 * Levels are in dBµV at the receiver's input (the LISN's measuring port); frequencies in Hz.
 * Columnar like the sweep result: one frequency axis and Float64Array columns beside it.
 */
import type { Detector } from '../model/emissions-schema.ts';

export type { Attribution, Detector } from '../model/emissions-schema.ts';

/**
 * What a scan measured: one line's receiving network, a mode from a CM/DM separator, or the
 * total on a line when the mode is unknown.
 */
export const SCAN_TAGS = ['line1', 'line2', 'common-mode', 'differential-mode', 'total'] as const;
export type ScanTag = (typeof SCAN_TAGS)[number];

/**
 * The tag of a scan nobody tagged, the same on every way in (the page's scan import, `chokepoint
 * check`, the reader): "total", a line's level with the mode unknown. An engineer exporting a LISN
 * scan knows which line it was, but the file does not say, and calling it line 1 would state a fact
 * nobody gave. The prediction is the same for line1, line2 and total (a mode-unknown level, credited
 * per the attribution); the tag only names the trace, and an untagged trace should claim nothing.
 */
export const DEFAULT_SCAN_TAG: ScanTag = 'total';

/** One detector's readings over the scan's frequency axis, in dBµV. */
export interface ScanTrace {
  readonly detector: Detector;
  readonly levelDbuV: Float64Array;
}

/** A line the importer could not use, and why (1-based line number in the file). */
export interface RejectedLine {
  readonly line: number;
  readonly reason: string;
}

export interface Scan {
  readonly name: string;
  readonly tag: ScanTag;
  /** Strictly rising. */
  readonly frequencyHz: Float64Array;
  readonly traces: readonly ScanTrace[];
  readonly rejected: readonly RejectedLine[];
  /** How the file's columns were read (units, separator, assumptions), for the report. */
  readonly notes: readonly string[];
  /**
   * The notes that point to a likely mistake ("check the frequency unit: …"), also among `notes`:
   * shown beside any verdict made from the scan, and given as hints when it is not a pass.
   */
  readonly warnings?: readonly string[];
}

