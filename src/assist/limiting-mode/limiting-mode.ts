import type { Design } from '../../model/design.ts';
import type { Attribution } from '../../model/emissions-schema.ts';
import { type ValueTarget, allElements, targetValue, withTargetValue } from '../design-edit/part-values.ts';
import type { AssistProblem } from '../margin/assist-problem.ts';
import { envelopeMargin, type MarginRun, runsBelow } from '../margin/envelope.ts';
import { compileMarginEvaluator, type MarginEvaluator, type MarginOutcome } from '../margin/margin-evaluator.ts';
import { ProgressCounter, type Steps } from '../run/steps.ts';

/**
 * Which mode limits, and by how much (docs/assistants.md, "Which mode limits"). For every range
 * of frequencies below the target margin:
 *
 * - scans of unknown mode (a line scan): the margin with the noise taken as all common mode and
 *   as all differential mode. The mode whose attribution gives the lower margin sets it: that is
 *   the mode where the filter's in-circuit improvement is the smaller;
 * - a mode-separated scan (a CM/DM separator output) speaks for its own mode directly;
 * - the noise estimate: each line's level is |from CM| + |from DM|; the mode with the larger
 *   contribution at the worst point sets the margin, and each mode's missing attenuation is how
 *   far that mode alone would have to fall for the sum to keep the target.
 *
 * Then the question a new user asks by hand: would more CM inductance help at all? Every CM choke
 * (and all of them together) is swept from 0.1× to 10× its inductance with the engine, holding its
 * winding capacitance and its leakage (so only the common-mode path changes), and the range's
 * margin is recorded at each value.
 */

export type Mode = 'common-mode' | 'differential-mode';

export interface ModeMargins {
  /** The range's lowest margin with the noise taken as all common mode, dB (NaN when not applicable). */
  readonly commonModeDb: number;
  readonly differentialModeDb: number;
}

export interface InductanceProbe {
  /** The chokes varied together ("LCM1", or "LCM1+LCM2" for all of them). */
  readonly elementIds: readonly string[];
  /** The factors applied to each choke's inductance, and the range's margin at each (dB). */
  readonly factors: readonly number[];
  readonly marginDb: readonly number[];
  /** The best margin over the factors, dB. */
  readonly bestMarginDb: number;
  /** How much more inductance (factors above 1) raises the margin at most, dB (0 when it never does). */
  readonly gainDb: number;
  /** Whether any factor keeps the target margin in this range. */
  readonly reachesTarget: boolean;
}

export interface ProblemRange {
  readonly startHz: number;
  readonly stopHz: number;
  readonly worstFrequencyHz: number;
  /** failing: over the limit; marginal: under it but short of the target margin. */
  readonly status: 'failing' | 'marginal';
  /** The lowest margin in the range as the problem judges it (its attribution), dB. */
  readonly marginDb: number;
  /** For a scan of unknown mode: the margin under each attribution. Separated scans and estimates: per mode as described. */
  readonly byMode: ModeMargins;
  /** The mode that sets the margin here. */
  readonly limitingMode: Mode;
  /** How the mode was decided: 'scan-mode' (a separated scan), 'attribution' (unknown mode), 'estimate'. */
  readonly evidence: 'scan-mode' | 'attribution' | 'estimate';
  /** Attenuation still missing per mode to reach the target margin, dB; Infinity when that mode alone cannot do it. */
  readonly missingCmDb: number;
  readonly missingDmDb: number;
  /** Sweeps of the CM choke inductance (one per choke, then all together); empty with no choke. */
  readonly inductanceProbes: readonly InductanceProbe[];
  /** Whether more (or less) CM inductance can bring this range to the target: some probe reaches it. */
  readonly cmInductanceCanFix: boolean;
  /** One sentence for the person. */
  readonly summary: string;
}

export interface LimitingModeReport {
  readonly targetMarginDb: number;
  readonly noise: 'scans' | 'estimate';
  readonly attribution: Attribution;
  /** The worst judged margin as the problem stands (NaN when nothing was judged). */
  readonly worstMarginDb: number;
  /** Whether anything was judged at all: with nothing judged there is no verdict. */
  readonly judged: boolean;
  readonly ranges: readonly ProblemRange[];
  readonly notes: readonly string[];
}

export const PROBE_FACTORS: readonly number[] = [0.1, 0.2, 0.5, 1, 2, 5, 10];

/** Ranges closer than this (relative frequency) are one problem. */
const MERGE_GAP = 0.05;

export function* limitingMode(problem: AssistProblem): Steps<LimitingModeReport> {
  const evaluator = compileMarginEvaluator(problem);
  const design = problem.design;
  const chokes = allElements(design)
    .filter((l) => l.element.enabled && l.element.part.kind === 'common-mode-choke')
    .map((l) => l.element.id);
  const probeSets: string[][] = chokes.length > 1 ? [...chokes.map((id) => [id]), chokes] : chokes.map((id) => [id]);
  const progress = new ProgressCounter(3 + probeSets.length * PROBE_FACTORS.length, 'judging the design');

  const nominal = evaluator.evaluate(design);
  yield progress.step();
  const envelope = envelopeMargin(evaluator, nominal);
  const notes: string[] = [];
  if (!nominal.judged) {
    notes.push('nothing was judged: no limit covers the noise inside the bands');
    return { targetMarginDb: problem.targetMarginDb, noise: problem.noise.kind, attribution: problem.attribution, worstMarginDb: Number.NaN, judged: false, ranges: [], notes };
  }
  const runs = mergeRuns(evaluator, runsBelow(evaluator, envelope, problem.targetMarginDb));

  // The margin under each attribution, for scans of unknown mode.
  const underCm = envelopeMargin(evaluator, evaluator.evaluate(design, 'common-mode'));
  yield progress.step();
  const underDm = envelopeMargin(evaluator, evaluator.evaluate(design, 'differential-mode'));
  yield progress.step();
  const nominalAgain = evaluator.evaluate(design);
  const estimateShares = problem.noise.kind === 'estimate' ? estimateModeShares(evaluator, nominalAgain, runs, problem.targetMarginDb) : undefined;

  // Each probe: the range-by-range lowest margin at every factor.
  progress.enter('sweeping the CM choke inductance');
  const probeMargins: number[][][] = [];
  for (const ids of probeSets) {
    const perFactor: number[][] = [];
    for (const factor of PROBE_FACTORS) {
      const varied = scaleChokes(design, ids, factor);
      const outcome = varied ? evaluator.evaluate(varied) : undefined;
      const env = outcome ? envelopeMargin(evaluator, outcome) : undefined;
      perFactor.push(runs.map((run) => (env ? lowestIn(env, run) : Number.NaN)));
      yield progress.step();
    }
    probeMargins.push(perFactor);
  }

  const scanModes = evaluator.segments.map((segment) => (segment.tag === 'common-mode' || segment.tag === 'differential-mode' ? segment.tag : undefined));
  const ranges: ProblemRange[] = runs.map((run, r) => {
    const marginDb = lowestIn(envelope, run);
    const f = evaluator.frequencyHz;
    const probes: InductanceProbe[] = probeSets.map((ids, p) => {
      const marginAt = probeMargins[p]!.map((perRun) => perRun[r]!);
      const finite = marginAt.filter(Number.isFinite);
      const more = marginAt.filter((m, i) => PROBE_FACTORS[i]! > 1 && Number.isFinite(m));
      return {
        elementIds: ids,
        factors: PROBE_FACTORS,
        marginDb: marginAt,
        bestMarginDb: finite.length > 0 ? Math.max(...finite) : Number.NaN,
        gainDb: more.length > 0 ? Math.max(0, Math.max(...more) - marginDb) : 0,
        reachesTarget: finite.some((m) => m >= problem.targetMarginDb),
      };
    });
    let byMode: ModeMargins;
    let limiting: Mode;
    let evidence: ProblemRange['evidence'];
    let missingCmDb: number;
    let missingDmDb: number;
    const short = (m: number): number => Math.max(0, problem.targetMarginDb - m);
    const scanMode = problem.noise.kind === 'scans' ? scanModes[run.segment] : undefined;
    if (estimateShares) {
      const share = estimateShares[r]!;
      byMode = { commonModeDb: share.commonModeDb, differentialModeDb: share.differentialModeDb };
      limiting = share.limiting;
      evidence = 'estimate';
      missingCmDb = share.missingCmDb;
      missingDmDb = share.missingDmDb;
    } else if (scanMode) {
      byMode = scanMode === 'common-mode' ? { commonModeDb: marginDb, differentialModeDb: Number.NaN } : { commonModeDb: Number.NaN, differentialModeDb: marginDb };
      limiting = scanMode;
      evidence = 'scan-mode';
      missingCmDb = scanMode === 'common-mode' ? short(marginDb) : 0;
      missingDmDb = scanMode === 'differential-mode' ? short(marginDb) : 0;
    } else {
      byMode = { commonModeDb: lowestIn(underCm, run), differentialModeDb: lowestIn(underDm, run) };
      limiting = byMode.differentialModeDb <= byMode.commonModeDb ? 'differential-mode' : 'common-mode';
      evidence = 'attribution';
      missingCmDb = short(byMode.commonModeDb);
      missingDmDb = short(byMode.differentialModeDb);
    }
    const cmInductanceCanFix = probes.some((p) => p.reachesTarget);
    const range: Omit<ProblemRange, 'summary'> = {
      startHz: f[run.first]!,
      stopHz: f[run.last]!,
      worstFrequencyHz: f[run.worst]!,
      status: marginDb < 0 ? 'failing' : 'marginal',
      marginDb,
      byMode,
      limitingMode: limiting,
      evidence,
      missingCmDb,
      missingDmDb,
      inductanceProbes: probes,
      cmInductanceCanFix,
    };
    return { ...range, summary: summarize(range, problem.targetMarginDb) };
  });
  if (chokes.length === 0) notes.push('the design has no common-mode choke: the CM inductance probe was not run');
  for (const reason of evaluator.coverage.reasons) notes.push(`${reason}: the check command cannot pass any filter until this band is covered`);
  if (problem.noise.kind === 'scans' && scanModes.some((m) => m === undefined)) {
    notes.push(
      'a line scan cannot be split into modes (|V1| fits any ratio of CM to DM): each range is judged with the noise taken as all CM and as all DM; the mode with the lower margin is the one the filter does least for there',
    );
  }
  return { targetMarginDb: problem.targetMarginDb, noise: problem.noise.kind, attribution: problem.attribution, worstMarginDb: nominal.worstMarginDb, judged: true, ranges, notes };
}

/** Runs separated by less than MERGE_GAP in frequency (same segment) become one range. */
function mergeRuns(evaluator: MarginEvaluator, runs: readonly MarginRun[]): MarginRun[] {
  const f = evaluator.frequencyHz;
  const merged: MarginRun[] = [];
  for (const run of runs) {
    const last = merged[merged.length - 1];
    if (last && last.segment === run.segment && f[run.first]! <= f[last.last]! * (1 + MERGE_GAP)) {
      merged[merged.length - 1] = { segment: last.segment, first: last.first, last: run.last, worst: last.worst };
      continue;
    }
    merged.push(run);
  }
  return merged;
}

function lowestIn(envelope: Float64Array, run: MarginRun): number {
  let lowest = Number.POSITIVE_INFINITY;
  for (let k = run.first; k <= run.last; k += 1) if (envelope[k]! < lowest) lowest = envelope[k]!;
  return Number.isFinite(lowest) ? lowest : Number.NaN;
}

/** Every listed choke's inductance times `factor`, winding capacitance and leakage (in henries) held. */
function scaleChokes(design: Design, ids: readonly string[], factor: number): Design | undefined {
  let varied: Design | undefined = design;
  for (const id of ids) {
    const target: ValueTarget = { elementIds: [id], quantity: 'inductance' };
    const value = targetValue(design, target);
    if (value === undefined || !varied) return undefined;
    varied = withTargetValue(varied, target, value * factor, { windingCapacitance: 'keep', leakage: 'fixed-value' });
  }
  return varied;
}

interface EstimateShare {
  readonly commonModeDb: number;
  readonly differentialModeDb: number;
  readonly limiting: Mode;
  readonly missingCmDb: number;
  readonly missingDmDb: number;
}

/**
 * For the estimate: at a range's worst point, on the worse line, the level is |a| + |b| (CM and DM
 * contributions in volts). "By mode" margins are what each mode alone would leave; the missing
 * attenuation of one mode is how far it must fall for a + b to keep the target, Infinity when the
 * other mode alone already breaks it. Exact where the line stands alone in the receiver's
 * bandwidth; with neighbours inside it, the same proportions are assumed.
 */
function estimateModeShares(evaluator: MarginEvaluator, outcome: MarginOutcome, runs: readonly MarginRun[], targetDb: number): EstimateShare[] {
  const lines = outcome.estimateLines!;
  return runs.map((run) => {
    const k = run.worst;
    // The comparison (line and mask) that holds the lowest margin at this point.
    let best = -1;
    let lowest = Number.POSITIVE_INFINITY;
    evaluator.comparisons.forEach((info, c) => {
      const m = outcome.marginDb[c]![k - info.offset];
      if (info.judged[k - info.offset] && m !== undefined && m < lowest) {
        lowest = m;
        best = c;
      }
    });
    const line1 = best < 0 || evaluator.comparisons[best]!.series.startsWith('line 1');
    const a = line1 ? lines.line1FromCm[k]! : lines.line2FromCm[k]!;
    const b = line1 ? lines.line1FromDm[k]! : lines.line2FromDm[k]!;
    const total = a + b;
    const db = (x: number): number => (x > 0 ? 20 * Math.log10(x) : Number.NEGATIVE_INFINITY);
    // Margin if only one mode were present: the total's margin plus how much smaller that mode is.
    const commonModeDb = lowest + db(total) - db(a);
    const differentialModeDb = lowest + db(total) - db(b);
    const allowed = total * 10 ** (-Math.max(0, targetDb - lowest) / 20);
    const missing = (own: number, other: number): number => {
      if (lowest >= targetDb) return 0;
      const room = allowed - other;
      return room > 0 ? db(own) - db(room) : Number.POSITIVE_INFINITY;
    };
    return { commonModeDb, differentialModeDb, limiting: b >= a ? 'differential-mode' : 'common-mode', missingCmDb: missing(a, b), missingDmDb: missing(b, a) };
  });
}

const MODE_TEXT: Record<Mode, string> = { 'common-mode': 'common mode', 'differential-mode': 'differential mode' };
const dB = (x: number): string => (Number.isFinite(x) ? `${x.toFixed(1)} dB` : 'no value');
const kHz = (f: number): string => (f >= 1e6 ? `${(f / 1e6).toPrecision(4)} MHz` : `${(f / 1e3).toPrecision(4)} kHz`);

function summarize(range: Omit<ProblemRange, 'summary'>, targetDb: number): string {
  const where = range.startHz === range.stopHz ? kHz(range.startHz) : `${kHz(range.startHz)} to ${kHz(range.stopHz)}`;
  const head = `${where}: margin ${dB(range.marginDb)} (target ${targetDb} dB); ${MODE_TEXT[range.limitingMode]} sets it`;
  let why: string;
  if (range.evidence === 'scan-mode') why = `the scan measured ${MODE_TEXT[range.limitingMode]} alone`;
  else if (range.evidence === 'attribution') {
    why = `taken as all common mode the margin would be ${dB(range.byMode.commonModeDb)}, as all differential mode ${dB(range.byMode.differentialModeDb)}`;
  } else why = `the ${MODE_TEXT[range.limitingMode]} part of the estimate is the larger one there`;
  const missing = `missing: CM ${dB(range.missingCmDb)}, DM ${dB(range.missingDmDb)}`;
  let choke = '';
  if (range.inductanceProbes.length > 0) {
    const gain = Math.max(...range.inductanceProbes.map((p) => p.gainDb));
    const best = Math.max(...range.inductanceProbes.map((p) => p.bestMarginDb));
    const dmShort = range.evidence !== 'scan-mode' && range.byMode.differentialModeDb < targetDb;
    const reason =
      range.limitingMode === 'differential-mode'
        ? ', because differential mode sets this margin'
        : dmShort
          ? `, because the differential mode is short here too (${dB(range.byMode.differentialModeDb)})`
          : '';
    choke = range.cmInductanceCanFix
      ? `; a different CM choke inductance reaches the target here (best ${dB(best)} over 0.1× to 10×)`
      : `; more CM inductance cannot fix it: up to 10× the choke inductance raises this margin by ${gain.toFixed(2)} dB at most (best ${dB(best)})${reason}`;
  }
  return `${head} (${why}); ${missing}${choke}`;
}
