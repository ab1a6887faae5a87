import type { SweepResult } from '../engine/index.ts';
import type { Design } from '../model/design.ts';
import type { EmissionsAnalysis } from '../spectrum/emissions-analysis.ts';

/**
 * What a report is made from. The design, its sweep and (when there are limits and noise to judge)
 * an emissions analysis come from the engine; everything else is optional and simply left out of
 * the report when absent: the safety and practical checks, each design assistant's result, and the
 * other variants to compare. These are the report's own plain shapes (what a reader sees: a status,
 * numbers with units, the assumption and the source); each producer's result is turned into them by
 * a small adapter beside the producer's code, so the report never depends on how a check or an
 * assistant computes.
 */

export type CheckStatus = 'pass' | 'warn' | 'fail' | 'not-run';

/** One number of a check, ready to print: "leakage current", "0.41 mA". */
export interface ReportFigure {
  readonly label: string;
  readonly value: string;
}

/** One safety or practical check as the report shows it. */
export interface ReportCheck {
  readonly id: string;
  /** The check a finding belongs to ("Leakage (touch) current"): findings of one group print as one table. */
  readonly group?: string;
  readonly title: string;
  readonly status: CheckStatus;
  /** One sentence: what was found. */
  readonly summary: string;
  readonly figures: readonly ReportFigure[];
  /** What the result rests on (voltage, frequency, tolerance, the limit chosen). */
  readonly assumption: string;
  /** The same, one statement each, when the producer has them apart (printed once per check). */
  readonly assumptions?: readonly string[];
  /** The standard and clause, or "common practice, no source". */
  readonly source?: string;
  /** Where the limit's value is not confirmed, the plain words that say so. */
  readonly confidence?: string;
}

export interface SafetyChecksSection {
  readonly checks: readonly ReportCheck[];
  /** Conditions the checks were run for ("230 V, 50 Hz; 2 A"). */
  readonly conditions?: string;
  readonly notes?: readonly string[];
}

/** A small table inside an assistant's result. */
export interface ReportTable {
  readonly columns: readonly string[];
  readonly rows: readonly (readonly string[])[];
}

/** One design assistant's result: a heading, a few lines of finding, and optionally a table. */
export interface AssistantSection {
  readonly title: string;
  readonly lines: readonly string[];
  readonly table?: ReportTable;
  readonly notes?: readonly string[];
}

/** The assistants' results that were run; each absent one is left out of the report. */
export interface AssistantResults {
  /** Which mode limits, the smallest parts for the margin. */
  readonly sizing?: AssistantSection;
  readonly damping?: AssistantSection;
  readonly stability?: AssistantSection;
  readonly yield?: AssistantSection;
  readonly map?: AssistantSection;
}

/** Another variant of the design, with what was computed for it. */
export interface ReportVariant {
  readonly variantId: string;
  readonly name: string;
  readonly design: Design;
  readonly sweep: SweepResult;
  readonly analysis?: EmissionsAnalysis;
}

/** Where the program and the report come from. */
export interface ReportOrigin {
  readonly program: string;
  readonly version: string;
  /** When the report was made, as the caller gives it (ISO 8601: "2026-12-04" or a date-time). */
  readonly generatedAt: string;
  /** The design's file name, when it came from a file. */
  readonly designFile?: string;
  /** The scan's file name, when there was one. */
  readonly scanFile?: string;
}

export interface ReportInput {
  readonly design: Design;
  readonly sweep: SweepResult;
  readonly analysis?: EmissionsAnalysis;
  /** Why there is no analysis, when there is none ("no limit mask"); shown in its place. */
  readonly analysisAbsentReason?: string;
  readonly safety?: SafetyChecksSection;
  readonly assistants?: AssistantResults;
  /** The other variants (the design above is the one reported); compared when there is at least one. */
  readonly variants?: readonly ReportVariant[];
  /** The name of the variant the design is, when it is one of several. */
  readonly designVariantName?: string;
  readonly origin: ReportOrigin;
}
