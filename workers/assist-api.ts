import * as Comlink from 'comlink';
import type { z } from 'zod';
import { type DampingReport, suggestDamping } from '../src/assist/damping/suggest-damping.ts';
import type { ValueTarget } from '../src/assist/design-edit/part-values.ts';
import { findResonances, type ResonanceReport } from '../src/assist/resonance/resonances.ts';
import { limitingMode, type LimitingModeReport } from '../src/assist/limiting-mode/limiting-mode.ts';
import type { ChunkRange, SplitChunk, SplitResult } from '../src/assist/pool/split-jobs.ts';
import { mapCellDesign, type MapSettings } from '../src/assist/value-map/value-map.ts';
import { proposeFilters, type ProposalReport } from '../src/assist/proposal/propose.ts';
import { defaultTargets } from '../src/assist/sizing/default-targets.ts';
import { sizePart, type SizingOptions, type SizingResult } from '../src/assist/sizing/size-part.ts';
import { converterStability, type StabilityResult } from '../src/assist/stability/stability.ts';
import { yCapacitance, type YCapacitanceResult } from '../src/assist/sizing/y-capacitance.ts';
import { AssistInputError, type AssistProblem, assistProblem } from '../src/assist/margin/assist-problem.ts';
import { AssistCancelled, type AssistProgress, runStepsCooperatively, type Steps } from '../src/assist/run/steps.ts';
import { type Design, readDesign, toValidationIssue } from '../src/model/index.ts';
import { type AssistReply, dampRequestSchema, diagnoseRequestSchema, mapCellRequestSchema, proposeRequestSchema, type problemFields, resonancesRequestSchema, sizeRequestSchema, stabilityRequestSchema, yCapacitanceRequestSchema } from './assist-protocol.ts';
import { failure } from './assist-failure.ts';
import { createSplitHost, type HostReply } from './split-host.ts';
import { collectTransferables } from './transferables.ts';

/**
 * The object the assistants' worker exposes (workers/assist.worker.ts). Every method validates its
 * request, runs the assistant in slices so that `cancel(requestId)` is heard while it runs, reports
 * progress through the optional callback (pass it wrapped in Comlink.proxy), and answers with a
 * reply, never a throw. It holds no DOM; tests call it directly or over a MessageChannel.
 */

export type ProgressCallback = (progress: AssistProgress) => void;

const cancelled = new Set<number>();
const host = createSplitHost();
const running = new Set<number>();

/** A zero-delay timer: lets the worker read a cancel message between slices of work. */
const yieldToEventLoop = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, 0));

type ProblemRequest = z.output<z.ZodObject<typeof problemFields>>;

async function runAssistant<Request extends ProblemRequest, T>(
  schema: z.ZodType<Request>,
  request: unknown,
  onProgress: ProgressCallback | undefined,
  start: (parsed: Request, design: Design, problem: AssistProblem) => Steps<T>,
): Promise<AssistReply<T>> {
  const started = performance.now();
  const parsed = schema.safeParse(request, { reportInput: true });
  if (!parsed.success) return failure(salvageRequestId(request), 'invalid-request', 'invalid assistant request', parsed.error.issues.map(toValidationIssue));
  const data = parsed.data;
  const read = readDesign(data.design);
  if (!read.ok) return failure(data.requestId, 'invalid-design', 'invalid design', read.error.issues);
  let problem: AssistProblem;
  try {
    const judging = data.judging ?? {};
    problem = assistProblem(read.value, data.noise, judging);
  } catch (cause) {
    if (cause instanceof AssistInputError) return failure(data.requestId, 'unusable-input', cause.message, []);
    throw cause;
  }
  return await drive(data.requestId, started, onProgress, () => start(data, read.value, problem));
}

/** An assistant that needs only a design (and reads anything else itself). */
async function runDesignAssistant<Request extends { requestId: number; design: unknown }, T>(
  schema: z.ZodType<Request>,
  request: unknown,
  onProgress: ProgressCallback | undefined,
  start: (parsed: Request, design: Design) => Steps<T>,
): Promise<AssistReply<T>> {
  const started = performance.now();
  const parsed = schema.safeParse(request, { reportInput: true });
  if (!parsed.success) return failure(salvageRequestId(request), 'invalid-request', 'invalid assistant request', parsed.error.issues.map(toValidationIssue));
  const read = readDesign(parsed.data.design);
  if (!read.ok) return failure(parsed.data.requestId, 'invalid-design', 'invalid design', read.error.issues);
  return await drive(parsed.data.requestId, started, onProgress, () => start(parsed.data, read.value));
}

/** Run an assistant's steps cooperatively, turning its end (result, cancel, defect) into a reply. */
export async function drive<T>(requestId: number, started: number, onProgress: ProgressCallback | undefined, steps: () => Steps<T>): Promise<AssistReply<T>> {
  running.add(requestId);
  try {
    const result = await runStepsCooperatively(steps(), {
      yieldToEventLoop,
      isCancelled: () => cancelled.has(requestId),
      ...(onProgress ? { onProgress: (progress: AssistProgress) => void onProgress(progress) } : {}),
    });
    const reply = { ok: true as const, requestId, result, elapsedMs: performance.now() - started };
    return Comlink.transfer(reply, collectTransferables(result));
  } catch (cause) {
    if (cause instanceof AssistCancelled) return failure(requestId, 'cancelled', 'cancelled', []);
    if (cause instanceof AssistInputError || cause instanceof RangeError) return failure(requestId, 'unusable-input', cause.message, []);
    const message = cause instanceof Error ? cause.message : String(cause);
    return failure(requestId, 'engine-failure', `the assistant failed: ${message}`, []);
  } finally {
    running.delete(requestId);
    cancelled.delete(requestId);
  }
}

export const assistApi = {
  /** Which mode limits each range short of the target, what is missing per mode, and whether more CM inductance helps. */
  diagnose(request: unknown, onProgress?: ProgressCallback): Promise<AssistReply<LimitingModeReport>> {
    return runAssistant(diagnoseRequestSchema, request, onProgress, (_parsed, _design, problem) => limitingMode(problem));
  },

  /** The smallest value of one part (or of every CM choke, DM inductance and X capacitor) that keeps the target margin. */
  size(request: unknown, onProgress?: ProgressCallback): Promise<AssistReply<SizingResult[]>> {
    return runAssistant(sizeRequestSchema, request, onProgress, (parsed, design, problem) => sizeAll(problem, parsed.target ? [parsed.target] : defaultTargets(design), parsed));
  },

  /** The largest Y capacitance a leakage-current limit allows, and the margin with the Y capacitors at it. */
  yCapacitance(request: unknown, onProgress?: ProgressCallback): Promise<AssistReply<YCapacitanceResult>> {
    return runAssistant(yCapacitanceRequestSchema, request, onProgress, (parsed, _design, problem) =>
      yCapacitance(problem, {
        leakageLimitA: parsed.leakageLimitA,
        ...(parsed.lineVoltageV === undefined ? {} : { lineVoltageV: parsed.lineVoltageV }),
        ...(parsed.lineFrequencyHz === undefined ? {} : { lineFrequencyHz: parsed.lineFrequencyHz }),
        ...(parsed.tolerance === undefined ? {} : { tolerance: parsed.tolerance }),
      }),
    );
  },

  /** Every resonance in circuit: part self-resonances and filter resonances with the parts behind them. */
  resonances(request: unknown, onProgress?: ProgressCallback): Promise<AssistReply<ResonanceReport>> {
    return runDesignAssistant(resonancesRequestSchema, request, onProgress, (parsed, design) =>
      findResonances(design, parsed.minimumDepthDb === undefined ? {} : { minimumDepthDb: parsed.minimumDepthDb }),
    );
  },

  /** A damping leg for one DM resonance; `result.suggestion.design` is the new variant. */
  damp(request: unknown, onProgress?: ProgressCallback): Promise<AssistReply<DampingReport>> {
    return runDesignAssistant(dampRequestSchema, request, onProgress, (parsed, design) => {
      const problem = parsed.noise ? assistProblem(design, parsed.noise, parsed.judging ?? {}) : undefined;
      return suggestDamping(
        design,
        {
          ...(parsed.leg ? { leg: parsed.leg } : {}),
          ...(parsed.ratio === undefined ? {} : { ratio: parsed.ratio }),
          ...(parsed.resonanceHz === undefined ? {} : { resonanceHz: parsed.resonanceHz }),
        },
        problem,
      );
    });
  },

  /** Middlebrook's criterion: the filter's DM output impedance against the converter's −V²/P. */
  stability(request: unknown, onProgress?: ProgressCallback): Promise<AssistReply<StabilityResult>> {
    return runDesignAssistant(stabilityRequestSchema, request, onProgress, (parsed, design) =>
      converterStability(design, {
        ...(parsed.lowestInputVoltageV === undefined ? {} : { lowestInputVoltageV: parsed.lowestInputVoltageV }),
        ...(parsed.highestInputPowerW === undefined ? {} : { highestInputPowerW: parsed.highestInputPowerW }),
        ...(parsed.requiredMarginDb === undefined ? {} : { requiredMarginDb: parsed.requiredMarginDb }),
        ...(parsed.upToHz === undefined ? {} : { upToHz: parsed.upToHz }),
      }),
    );
  },

  /**
   * The pool's side of split work (a tolerance-yield run, a two-value map), driven by
   * src/client/worker-pool.ts: prepare the job in this worker (validated like any request) and get
   * its chunk ranges; run chunks; merge the chunks (in any worker that prepared it); release it.
   */
  prepareSplit(jobId: number, request: unknown): HostReply<{ readonly ranges: readonly ChunkRange[] }> {
    return host.prepare(jobId, request);
  },
  runSplitChunk(jobId: number, range: unknown): HostReply<SplitChunk> {
    const reply = host.run(jobId, range);
    return reply.ok ? Comlink.transfer(reply, collectTransferables(reply.value)) : reply;
  },
  mergeSplit(jobId: number, chunks: unknown): HostReply<SplitResult> {
    const reply = host.merge(jobId, chunks);
    return reply.ok ? Comlink.transfer(reply, collectTransferables(reply.value)) : reply;
  },
  releaseSplit(jobId: number): void {
    host.release(jobId);
  },

  /** Up to three proposed filters with the least total inductance; each `design` is a new variant. */
  propose(request: unknown, onProgress?: ProgressCallback): Promise<AssistReply<ProposalReport>> {
    return runAssistant(proposeRequestSchema, request, onProgress, (parsed, _design, problem) =>
      proposeFilters(problem, {
        ...(parsed.leakage ? { leakage: parsed.leakage } : {}),
        ...(parsed.maxStages === undefined ? {} : { maxStages: parsed.maxStages }),
        ...(parsed.converter ? { converter: parsed.converter } : {}),
        ...(parsed.series ? { series: parsed.series } : {}),
        ...(parsed.fixed ? { fixed: parsed.fixed } : {}),
      }),
    );
  },

  /** The design at one cell of a two-value map: apply it as a new variant. */
  mapCell(request: unknown): Promise<AssistReply<Design>> {
    return runDesignAssistant(mapCellRequestSchema, request, undefined, (parsed, design) => cellSteps(design, parsed.settings as MapSettings, parsed.x, parsed.y));
  },

  /** Stop a running request: it ends with `{ ok: false, error: { kind: 'cancelled' } }`. Unknown ids are ignored. */
  cancel(requestId: number): void {
    if (running.has(requestId)) cancelled.add(requestId);
  },
};

export type AssistApi = typeof assistApi;

// eslint-disable-next-line require-yield -- one step, but driven like every other assistant
function* cellSteps(design: Design, settings: MapSettings, x: number, y: number): Steps<Design> {
  const cell = mapCellDesign(design, settings, x, y);
  if (!cell) throw new AssistInputError('those values make no valid part');
  return cell;
}

function* sizeAll(problem: AssistProblem, targets: readonly ValueTarget[], options: SizingOptions): Steps<SizingResult[]> {
  const results: SizingResult[] = [];
  for (const target of targets) results.push(yield* sizePart(problem, target, options));
  return results;
}


function salvageRequestId(request: unknown): number | null {
  if (typeof request !== 'object' || request === null) return null;
  const id = (request as { requestId?: unknown }).requestId;
  return typeof id === 'number' && Number.isInteger(id) && id >= 0 ? id : null;
}
