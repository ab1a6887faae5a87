import type { EmissionsAnalysis } from '../spectrum/emissions-analysis.ts';
import type { BandResult } from '../spectrum/margin.ts';
import { lowerBound } from './columns.ts';

/**
 * Which mode limits a band, so nobody enlarges the common-mode choke to fix a differential-mode
 * failure. Read at the band's worst point from what the analysis already holds:
 *
 * - a scan separated by mode speaks for its own mode;
 * - a scan of unknown mode credited to both modes takes, at each frequency, the smaller of the
 *   filter's CM and DM improvements (the worst case), so the mode with the smaller improvement is
 *   the one that sets the level there; credited to one mode, it is that mode by assumption;
 * - an estimate predicts each mode's level at the receivers: the higher one limits, and within 3 dB
 *   both matter (they add on each line).
 */

export interface LimitingMode {
  readonly mode: 'common mode' | 'differential mode' | 'both modes' | 'not known';
  /** Why, in a few words, with the numbers it rests on. */
  readonly reason: string;
}

const CLOSE_DB = 3;

const db = (value: number): string => `${value.toFixed(1)} dB`;

export function limitingModeOfBand(analysis: EmissionsAnalysis, band: BandResult): LimitingMode {
  const worst = band.worst;
  if (!worst) return { mode: 'not known', reason: 'no limit covers this band' };
  const f = analysis.frequencyHz;
  let i = lowerBound(f, worst.frequencyHz);
  if (i >= f.length || (i > 0 && Math.abs(f[i - 1]! - worst.frequencyHz) < Math.abs(f[i]! - worst.frequencyHz))) i -= 1;
  const scan = analysis.scanPrediction;
  if (scan) {
    if (scan.tag === 'common-mode') return { mode: 'common mode', reason: 'the scan measured common mode' };
    if (scan.tag === 'differential-mode') return { mode: 'differential mode', reason: 'the scan measured differential mode' };
    if (scan.attribution === 'common-mode') return { mode: 'common mode', reason: 'assumed: the scan is credited to common mode' };
    if (scan.attribution === 'differential-mode') return { mode: 'differential mode', reason: 'assumed: the scan is credited to differential mode' };
    const cm = scan.improvement.commonModeDb[i]!;
    const dm = scan.improvement.differentialModeDb[i]!;
    const text = `filter improvement at the worst point: CM ${db(cm)}, DM ${db(dm)}; the smaller one is credited`;
    if (Math.abs(cm - dm) < CLOSE_DB) return { mode: 'both modes', reason: `${text} (within ${CLOSE_DB} dB of each other)` };
    return { mode: cm < dm ? 'common mode' : 'differential mode', reason: text };
  }
  const estimate = analysis.estimatePrediction;
  if (estimate) {
    const cm = estimate.commonMode.readingDbuV[i]!;
    const dm = estimate.differentialMode.readingDbuV[i]!;
    if (!Number.isFinite(cm) && !Number.isFinite(dm)) return { mode: 'not known', reason: 'neither mode has a line at the worst point' };
    if (!Number.isFinite(dm) || dm < -300) return { mode: 'common mode', reason: `only the common-mode source has a line there (${db(cm)}µV)` };
    if (!Number.isFinite(cm) || cm < -300) return { mode: 'differential mode', reason: `only the differential-mode source has a line there (${db(dm)}µV)` };
    const text = `estimated at the receivers at the worst point: CM ${db(cm)}µV, DM ${db(dm)}µV`;
    if (Math.abs(cm - dm) < CLOSE_DB) return { mode: 'both modes', reason: `${text} (within ${CLOSE_DB} dB of each other)` };
    return { mode: cm > dm ? 'common mode' : 'differential mode', reason: text };
  }
  return { mode: 'not known', reason: 'the analysis holds no mode information' };
}
