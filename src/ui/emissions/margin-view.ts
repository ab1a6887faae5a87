import type { EmissionsAnalysis } from '../../spectrum/emissions-analysis.ts';
import type { MarginPoint } from '../../spectrum/margin.ts';
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
  readonly verdict: Verdict;
  readonly verdictText: string;
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
  readonly verdict: Verdict;
  /** "PASS", "FAIL" or "NOT JUDGED". */
  readonly verdictWord: string;
  readonly summary: string;
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

export function marginTableView(analysis: EmissionsAnalysis): MarginTableView {
  const report = analysis.report;
  const target = report.targetMarginDb;
  const judged = report.comparisons.length > 0;
  const failing = report.bands.filter((band) => band.pass === false).length;
  const verdict: Verdict = !judged ? 'none' : report.pass ? 'pass' : 'fail';
  const targetText = `${target} dB`;
  const summary =
    verdict === 'none'
      ? 'No limit line could be applied, so nothing was judged.'
      : verdict === 'pass'
        ? `Every band keeps at least the ${targetText} target margin below every limit.`
        : `${failing} band${failing === 1 ? '' : 's'} below the ${targetText} target margin.`;

  const bands: BandView[] = report.bands.map((band) => {
    const worst = band.worst ? pointView(band.worst, target) : undefined;
    const bandVerdict: Verdict = band.pass === undefined ? 'none' : band.pass ? 'pass' : 'fail';
    const verdictText =
      bandVerdict === 'none' ? 'no limit here' : bandVerdict === 'pass' ? 'PASS' : worst && worst.marginDb < 0 ? 'FAIL, over the limit' : 'FAIL, short of the target';
    return { name: band.name, worst, verdict: bandVerdict, verdictText };
  });

  const peaks = report.worstPeaks.map((point) => pointView(point, target));
  const failingRanges = report.failingRanges.map(
    (range): RangeView => ({ from: formatFrequency(range.startHz, 4), to: formatFrequency(range.stopHz, 4), worst: pointView(range.worst, target) }),
  );
  const notes = [...new Set([...analysis.notes, ...report.notes])];
  return {
    verdict,
    verdictWord: verdict === 'none' ? 'NOT JUDGED' : verdict === 'pass' ? 'PASS' : 'FAIL',
    summary,
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
