/**
 * A verdict that shows its evidence. Every judgement the tool makes (a margin band against its
 * limits today; stability, yield and safety checks as they come) is a list of judged items, each
 * pass, fail or not covered, and one overall status: pass, fail, or refused when nothing at all was
 * judged. A pass needs evidence: an item with nothing judged is "not covered", never a pass, and it
 * fails the whole; with nothing judged anywhere there is no verdict to give. DEVELOPERS.md,
 * "Verdicts", says how to reuse it.
 */

/** One item's outcome: met, not met, or not judged for want of evidence. */
export type ItemStatus = 'pass' | 'fail' | 'not-covered';
export const ITEM_STATUSES: readonly ItemStatus[] = ['pass', 'fail', 'not-covered'];

/** The whole: every item passed; an item failed or was not covered; nothing was judged at all. */
export type VerdictStatus = 'pass' | 'fail' | 'refused';
export const VERDICT_STATUSES: readonly VerdictStatus[] = ['pass', 'fail', 'refused'];

/** One thing judged: a frequency band, a stability margin, a yield target, a safety rule. */
export interface JudgedItem {
  /** What was judged, as the person reads it ("0.15–0.5 MHz"). */
  readonly name: string;
  readonly status: ItemStatus;
  /** How many points (frequencies, samples, cases) the outcome rests on; 0 when not covered for want of any. */
  readonly judgedPoints: number;
  /** Why this status, in words ("worst margin 4.6 dB at 262 kHz, below the 6 dB target"; "no scan point in this band"). */
  readonly reason: string;
}

export interface Verdict<Item extends JudgedItem = JudgedItem> {
  readonly status: VerdictStatus;
  readonly items: readonly Item[];
  /** The points judged in all (each counted once, where the caller knows; else the items' sum). */
  readonly judgedPoints: number;
  /** Why the status, one sentence each: the failing and uncovered items, or why there is no verdict. */
  readonly reasons: readonly string[];
}

export interface VerdictOptions {
  /** Reasons there can be no verdict whatever the items say (no limit to judge against, say). */
  readonly refusals?: readonly string[];
  /** The points judged in all, when items share points (a boundary frequency in two bands); default their sum. */
  readonly judgedPoints?: number;
  /** Said after the reasons when the result is not a pass: what may explain it ("check the frequency unit …"). */
  readonly hints?: readonly string[];
}

/**
 * The overall verdict of judged items. Refused when a refusal is given, when there is no item, or
 * when no item judged any point; failed when any item failed or was not covered; passed otherwise.
 */
export function judge<Item extends JudgedItem>(items: readonly Item[], options: VerdictOptions = {}): Verdict<Item> {
  const judgedPoints = options.judgedPoints ?? items.reduce((sum, item) => sum + item.judgedPoints, 0);
  const hints = options.hints ?? [];
  const refusals = [...(options.refusals ?? [])];
  if (items.length === 0) refusals.push('there was nothing to judge');
  else if (judgedPoints === 0 && refusals.length === 0) refusals.push('nothing was judged: no item rests on a single judged point');
  if (refusals.length > 0) {
    const itemLines = items.filter((item) => item.status !== 'pass').map((item) => `${item.name}: ${item.reason}`);
    return { status: 'refused', items, judgedPoints, reasons: unique([...refusals, ...itemLines, ...hints]) };
  }

  const failed = items.filter((item) => item.status === 'fail');
  const uncovered = items.filter((item) => item.status === 'not-covered');
  if (failed.length === 0 && uncovered.length === 0) {
    return { status: 'pass', items, judgedPoints, reasons: [`all ${items.length} passed, on ${judgedPoints} judged point${judgedPoints === 1 ? '' : 's'}`] };
  }
  const reasons = [...failed, ...uncovered].map((item) => `${item.name}: ${item.status === 'fail' ? '' : 'not covered: '}${item.reason}`);
  return { status: 'fail', items, judgedPoints, reasons: unique([...reasons, ...hints]) };
}

/** "1 failed, 2 not covered": the count of each status that is not a pass. */
export function describeShortfall(verdict: Verdict): string {
  const failed = verdict.items.filter((item) => item.status === 'fail').length;
  const uncovered = verdict.items.filter((item) => item.status === 'not-covered').length;
  const parts: string[] = [];
  if (failed > 0) parts.push(`${failed} failed`);
  if (uncovered > 0) parts.push(`${uncovered} not covered`);
  return parts.join(', ');
}

function unique(lines: readonly string[]): string[] {
  return [...new Set(lines)];
}
