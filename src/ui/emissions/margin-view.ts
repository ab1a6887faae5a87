import type { EmissionsAnalysis } from '../../spectrum/emissions-analysis.ts';
import type { BandResult, MarginPoint } from '../../spectrum/margin.ts';
import { formatFrequency } from '../../drawing/frequency-ticks.ts';

/**
 * The margin table as the page shows it: text for every cell, taken from the worker's margin report.
 * Pure, so that what the engineer reads (which band fails, by how much, where) is tested without a DOM.
 */

export type Verdict = 'pass' | 'fail' | 'none';

export interface MarginPointView {
  readonly frequency: string;
  /** Where the point is, for moving the plots' cursor to it. */
  readonly frequencyHz: number;
  readonly level: string;
  readonly limit: string;
  readonly margin: string;
  readonly marginDb: number;
  /** The limit line and its detector, e.g. "CISPR 32 / EN 55032 class B, average". */
  readonly mask: string;
  /** The predicted trace judged, e.g. "line 1, predicted". */
  readonly series: string;
  /** A higher-reading detector was judged against this limit (a peak trace against a QP limit). */
  readonly conservative: boolean;
  /** The margin is below the target. */
  readonly short: boolean;
}

export interface BandView {
  readonly name: string;
  readonly worst: MarginPointView | undefined;
  /** 'none' for a band not covered by judged points. */
  readonly verdict: Verdict;
  readonly verdictText: string;
  /** "29", or "29 (+59 at the floor)": how many points the band's verdict rests on. */
  readonly judged: string;
  /** "150 kHz – 498 kHz", or "–" when no point of the band is covered. */
  readonly covered: string;
  /** Why the band has its verdict, in words (for a band not covered: what is missing). */
  readonly reason: string;
  /** For a band short of the target: which mode limits it and why ("differential mode: …"). */
  readonly limitedBy?: { readonly mode: string; readonly reason: string };
}

export interface RangeView {
  readonly from: string;
  readonly to: string;
  readonly worst: MarginPointView;
}

export interface RequiredView {
  readonly mode: 'common mode' | 'differential mode';
  /** "30.2 dB", "none", or "–" when the noise does not speak for this mode. */
  readonly most: string;
  /** "at 390 kHz", or a reason there is no value. */
  readonly where: string;
}

export interface MarginTableView {
  /** 'none' when nothing was judged: there is no result. */
  readonly verdict: Verdict;
  /** "PASS", "FAIL" or "NO RESULT". */
  readonly verdictWord: string;
  readonly summary: string;
  /** For a fail or no result: each band short or not covered, or why nothing was judged, and the reader's hints. */
  readonly reasons: readonly string[];
  readonly targetMarginDb: number;
  readonly targetText: string;
  readonly bands: readonly BandView[];
  readonly peaks: readonly MarginPointView[];
  readonly failingRanges: readonly RangeView[];
  readonly required: readonly RequiredView[];
  readonly notes: readonly string[];
  /** Whether any row is a conservative comparison (the table then explains the mark). */
  readonly anyConservative: boolean;
}

export function formatDb(value: number, unit = 'dB'): string {
  return Number.isFinite(value) ? `${value.toFixed(1)} ${unit}` : '–';
}

function pointView(point: MarginPoint, targetMarginDb: number): MarginPointView {
  return {
    frequency: formatFrequency(point.frequencyHz, 4),
    frequencyHz: point.frequencyHz,
    level: formatDb(point.levelDbuV, 'dBµV'),
    limit: formatDb(point.limitDbuV, 'dBµV'),
    margin: formatDb(point.marginDb),
    marginDb: point.marginDb,
    mask: point.maskName,
    series: point.series,
    conservative: point.conservative,
    short: point.marginDb < targetMarginDb,
  };
}

/** The largest finite value of a column and its index, or undefined when there is none. */
export function largestFinite(values: Float64Array): { value: number; index: number } | undefined {
  let index = -1;
  for (let i = 0; i < values.length; i += 1) {
    const value = values[i]!;
    if (Number.isFinite(value) && (index < 0 || value > values[index]!)) index = i;
  }
  return index < 0 ? undefined : { value: values[index]!, index };
}

function requiredView(mode: RequiredView['mode'], values: Float64Array | undefined, analysis: EmissionsAnalysis): RequiredView {
  if (!values) {
    return { mode, most: '–', where: analysis.input === 'scan' ? 'the scan does not speak for this mode' : 'no limit to judge against' };
  }
  const largest = largestFinite(values);
  if (!largest) return { mode, most: '–', where: 'no limit applies where there is noise' };
  if (largest.value <= 0) return { mode, most: 'none', where: 'the level with no filter already keeps the target margin' };
  return { mode, most: formatDb(largest.value), where: `at ${formatFrequency(analysis.frequencyHz[largest.index]!, 4)}` };
}

function bandView(band: BandResult, target: number): BandView {
  const worst = band.worst ? pointView(band.worst, target) : undefined;
  const verdict: Verdict = band.status === 'pass' ? 'pass' : band.status === 'fail' ? 'fail' : 'none';
  const verdictText =
    verdict === 'none' ? 'NOT COVERED' : verdict === 'pass' ? 'PASS' : worst && worst.marginDb < 0 ? 'FAIL, over the limit' : 'FAIL, short of the target';
  const atFloor = band.coveredPoints - band.judgedPoints;
  const covered =
    band.coveredFromHz === undefined || band.coveredToHz === undefined
      ? '–'
      : `${formatFrequency(band.coveredFromHz, 6)} – ${formatFrequency(band.coveredToHz, 6)}`;
  return {
    name: band.name,
    worst,
    verdict,
    verdictText,
    judged: atFloor > 0 ? `${band.judgedPoints} (+${atFloor} at the floor)` : String(band.judgedPoints),
    covered,
    reason: band.reason,
  };
}

/** Which mode limits a band, as the worker found it (src/report/limiting-mode.ts). */
export interface BandMode {
  readonly mode: string;
  readonly reason: string;
}

export function marginTableView(analysis: EmissionsAnalysis, limitingModes: readonly BandMode[] = []): MarginTableView {
  const report = analysis.report;
  const target = report.targetMarginDb;
  const status = report.verdict.status;
  const failing = report.bands.filter((band) => band.status === 'fail').length;
  const uncovered = report.bands.filter((band) => band.status === 'not-covered').length;
  const verdict: Verdict = status === 'refused' ? 'none' : status === 'pass' ? 'pass' : 'fail';
  const targetText = `${target} dB`;
  const plural = (n: number): string => `${n} band${n === 1 ? '' : 's'}`;
  const judgedText = `${report.verdict.judgedPoints} judged point${report.verdict.judgedPoints === 1 ? '' : 's'}`;
  const shortfall = [
    ...(failing > 0 ? [`${plural(failing)} below the ${targetText} target margin`] : []),
    ...(uncovered > 0 ? [`${plural(uncovered)} not covered by judged points`] : []),
  ];
  const summary =
    verdict === 'none'
      ? 'No result: nothing was judged, so there is nothing to pass or fail.'
      : verdict === 'pass'
        ? `Every band is covered and keeps at least the ${targetText} target margin below every limit (${judgedText}).`
        : `${shortfall.join('; ')} (${judgedText}).`;

  const bands: BandView[] = report.bands.map((band, b) => {
    const view = bandView(band, target);
    const mode = limitingModes[b];
    // Said where it matters: a band short of the target, so the right mode's filter is enlarged.
    return view.verdict === 'fail' && mode && mode.mode !== 'not known' ? { ...view, limitedBy: { mode: mode.mode, reason: mode.reason } } : view;
  });
  const peaks = report.worstPeaks.map((point) => pointView(point, target));
  const failingRanges = report.failingRanges.map(
    (range): RangeView => ({ from: formatFrequency(range.startHz, 4), to: formatFrequency(range.stopHz, 4), worst: pointView(range.worst, target) }),
  );
  const notes = [...new Set([...analysis.notes, ...report.notes])];
  return {
    verdict,
    verdictWord: verdict === 'none' ? 'NO RESULT' : verdict === 'pass' ? 'PASS' : 'FAIL',
    summary,
    reasons: verdict === 'pass' ? [] : report.verdict.reasons,
    targetMarginDb: target,
    targetText,
    bands,
    peaks,
    failingRanges,
    required: [
      requiredView('common mode', analysis.requiredAttenuationCmDb, analysis),
      requiredView('differential mode', analysis.requiredAttenuationDmDb, analysis),
    ],
    notes,
    anyConservative: [...bands.map((b) => b.worst), ...peaks, ...failingRanges.map((r) => r.worst)].some((p) => p?.conservative === true),
  };
}
