import type { SourceNote } from './source-confirmation.ts';

/**
 * The result vocabulary of the safety checks. A verdict carries its evidence by construction: a
 * pass, warn or fail holds at least one figure (a number with its unit), and a check that lacks an
 * input says which one ("not checked: give operating.supply") instead of passing. Plain data only,
 * so a result crosses a worker boundary and goes to a page, a report or JSON as it is.
 */

export const SAFETY_CHECK_IDS = ['leakage', 'discharge', 'class', 'voltage', 'windings', 'saturation'] as const;
export type SafetyCheckId = (typeof SAFETY_CHECK_IDS)[number];

export const CHECK_TITLES: Readonly<Record<SafetyCheckId, string>> = {
  leakage: 'Leakage (touch) current',
  discharge: 'X-capacitor discharge',
  class: 'Capacitor safety class',
  voltage: 'Voltage stress and ratings',
  windings: 'Line current: copper loss and current ratings',
  saturation: 'Saturation and inductance at full load',
};

export type JudgedStatus = 'pass' | 'warn' | 'fail';
export type FindingStatus = JudgedStatus | 'not-checked' | 'not-applicable';
/** A check the user asked to leave out is `skipped`; it has no findings. */
export type CheckStatus = FindingStatus | 'skipped';

/** Units a figure may carry: the design's SI units, and the few the core data and shares use. */
export type FigureUnit = 'A' | 'F' | 'V' | 'Ω' | 's' | 'W' | 'Hz' | 'H' | 'T' | 'mm²' | '%' | '';

/** One number behind a verdict: SI value, its unit, and the text a person reads ("0.3691 mA"). */
export interface SafetyFigure {
  readonly label: string;
  readonly value: number;
  readonly unit: FigureUnit;
  readonly text: string;
}

export type Figures = readonly [SafetyFigure, ...SafetyFigure[]];

interface FindingCommon {
  /** Unique in a report: "leakage.normal", "class.CY1". */
  readonly id: string;
  /** The element's id, or '' for the design as a whole. */
  readonly subject: string;
  readonly title: string;
  /** One sentence with the decisive numbers. */
  readonly summary: string;
  readonly figures: readonly SafetyFigure[];
  /** What the numbers take for granted, in plain words. */
  readonly assumptions: readonly string[];
  /** The standards and clauses behind the limit or rule, with how sure their values are. */
  readonly sources: readonly SourceNote[];
}

export interface JudgedFinding extends FindingCommon {
  readonly status: JudgedStatus;
  readonly figures: Figures;
}

export interface UncheckedFinding extends FindingCommon {
  readonly status: 'not-checked';
  /** What to give for the check to run: field paths of the design ("operating.supply") or a plain instruction. */
  readonly missing: readonly [string, ...string[]];
}

export interface InapplicableFinding extends FindingCommon {
  readonly status: 'not-applicable';
}

export type SafetyFinding = JudgedFinding | UncheckedFinding | InapplicableFinding;

export interface FindingText {
  readonly id: string;
  readonly subject?: string;
  readonly title: string;
  readonly summary: string;
  readonly assumptions?: readonly string[];
  readonly sources?: readonly SourceNote[];
}

export function judged(status: JudgedStatus, text: FindingText, figures: Figures): JudgedFinding {
  if (figures.length === 0) throw new Error(`finding ${text.id}: a verdict needs at least one figure`);
  return { ...common(text, figures), status, figures };
}

export function notChecked(text: FindingText, missing: readonly [string, ...string[]], figures: readonly SafetyFigure[] = []): UncheckedFinding {
  return { ...common(text, figures), status: 'not-checked', missing };
}

export function notApplicable(text: FindingText, figures: readonly SafetyFigure[] = []): InapplicableFinding {
  return { ...common(text, figures), status: 'not-applicable' };
}

function common(text: FindingText, figures: readonly SafetyFigure[]): FindingCommon {
  return {
    id: text.id,
    subject: text.subject ?? '',
    title: text.title,
    summary: text.summary,
    figures,
    assumptions: text.assumptions ?? [],
    sources: text.sources ?? [],
  };
}

/** One check (leakage, discharge, …) with its findings and the status of the worst of them. */
export interface SafetyCheckResult {
  readonly id: SafetyCheckId;
  readonly title: string;
  readonly status: CheckStatus;
  readonly summary: string;
  readonly findings: readonly SafetyFinding[];
  /** Numbers about the check as a whole (the total copper loss, the largest Y capacitance). */
  readonly figures: readonly SafetyFigure[];
  readonly assumptions: readonly string[];
}

/** Worst first: a failure outweighs a missing input, which outweighs a warning. */
const SEVERITY: readonly FindingStatus[] = ['fail', 'not-checked', 'warn', 'pass', 'not-applicable'];

export function worstStatus(statuses: readonly FindingStatus[]): FindingStatus {
  for (const status of SEVERITY) if (statuses.includes(status)) return status;
  return 'not-applicable';
}

export const STATUS_WORDS: Readonly<Record<CheckStatus, string>> = {
  pass: 'pass',
  warn: 'warning',
  fail: 'FAIL',
  'not-checked': 'not checked',
  'not-applicable': 'not applicable',
  skipped: 'skipped',
};

/** A check's result: its status is the worst of its findings', its summary that finding's. */
export function checkResult(
  id: SafetyCheckId,
  findings: readonly SafetyFinding[],
  figures: readonly SafetyFigure[] = [],
  assumptions: readonly string[] = [],
): SafetyCheckResult {
  const status = worstStatus(findings.map((f) => f.status));
  const worst = findings.find((f) => f.status === status);
  const summary = worst === undefined ? 'Nothing in the design for this check.' : findings.length === 1 ? worst.summary : `${countWords(findings)}. ${worst.summary}`;
  return { id, title: CHECK_TITLES[id], status, summary, findings, figures, assumptions };
}

function countWords(findings: readonly SafetyFinding[]): string {
  const counts = new Map<FindingStatus, number>();
  for (const f of findings) counts.set(f.status, (counts.get(f.status) ?? 0) + 1);
  return SEVERITY.filter((s) => counts.has(s))
    .map((s) => `${counts.get(s)} ${STATUS_WORDS[s]}`)
    .join(', ');
}

/** A list of figures known to be non-empty, checked. */
export function atLeastOne(figures: readonly SafetyFigure[]): Figures {
  const [first, ...rest] = figures;
  if (first === undefined) throw new Error('a verdict needs at least one figure');
  return [first, ...rest];
}
