import type { JsonObject } from '../planner/json.ts';
import { checkDocument } from '../planner/validation.ts';
import type { NoiseChoice, Workspace } from '../planner/workspace.ts';
import type { Scan } from '../spectrum/spectrum-types.ts';
import type { EmissionsNoise, StoreScanRequest } from '../../workers/emissions-protocol.ts';
import { EmissionsClient, type EmissionsRemote } from './emissions-client.ts';
import type { EmissionsError } from './emissions-outcome.ts';
import { SweepClient, type SweepRemote } from './sweep-client.ts';
import { NewestRequestQueue } from './newest-request-queue.ts';
import type { SafetyReport } from '../safety/index.ts';
import type { SafetyRequest } from '../../workers/checks-protocol.ts';
import type { SweepError } from './sweep-outcome.ts';
import type { SweepResult } from '../engine/index.ts';
import type { EmissionsAnalysis } from '../spectrum/emissions-analysis.ts';
import type { LimitingMode } from '../report/limiting-mode.ts';

/**
 * What the page shows for each variant: its sweep and its emissions analysis, computed in the
 * worker for the variant's last valid document and the chosen noise. Each variant has its own
 * newest-request-wins clients, so typing in one variant never waits behind another's stale work and
 * only the newest answer is kept. Results are kept per document object: a variant that did not change
 * is not swept again, and undo back to an earlier document finds its results at once.
 */

export interface PlannerRemote extends SweepRemote, EmissionsRemote {
  storeScan(request: StoreScanRequest): Promise<unknown>;
  safetyChecks(request: SafetyRequest): Promise<unknown>;
}

export type SafetyState =
  | { readonly status: 'running' }
  | { readonly status: 'done'; readonly report: SafetyReport }
  | { readonly status: 'error'; readonly message: string };

export type SweepState =
  | { readonly status: 'running' }
  | { readonly status: 'done'; readonly result: SweepResult; readonly elapsedMs: number }
  | { readonly status: 'error'; readonly error: SweepError };

export type AnalysisState =
  | { readonly status: 'idle'; readonly reason: string }
  | { readonly status: 'running' }
  | { readonly status: 'done'; readonly analysis: EmissionsAnalysis; readonly elapsedMs: number; readonly limitingModes: readonly LimitingMode[] }
  | { readonly status: 'error'; readonly error: EmissionsError };

export interface VariantResult {
  /** The document these results belong to (the variant's last valid one). */
  readonly document: JsonObject;
  readonly noiseKey: string;
  readonly sweep: SweepState;
  readonly analysis: AnalysisState;
  /** The safety and practical checks of the document (they do not depend on the noise). */
  readonly safety: SafetyState;
  /**
   * The newest finished results of this variant, perhaps for an earlier document: what the page keeps
   * drawing while new ones are computed, so an edit never blanks or rebuilds a plot.
   */
  readonly shown: { readonly sweep: SweepResult | undefined; readonly analysis: EmissionsAnalysis | undefined };
}

/** Gives the worker's scans by id; the page's scan store. */
export type ScanSource = (scanId: string) => Scan | undefined;

interface Slot {
  readonly sweep: SweepClient;
  readonly emissions: EmissionsClient;
  readonly safety: NewestRequestQueue<SafetyOutcome>;
  result: VariantResult | undefined;
}

type SafetyOutcome = { readonly status: 'done'; readonly requestId: number; readonly report: SafetyReport } | { readonly status: 'refused'; readonly requestId: number; readonly message: string };

/** How many results per variant are kept for documents no longer shown (undo finds them). */
const KEPT_PER_VARIANT = 8;

export class PlannerResults {
  private readonly slots = new Map<string, Slot>();
  private readonly kept = new Map<string, Map<string, VariantResult>>();
  private readonly storedScans = new Set<string>();
  private readonly documentKeys = new WeakMap<JsonObject, string>();
  private documentCount = 0;
  private disposed = false;

  constructor(
    private readonly remote: PlannerRemote,
    private readonly scans: ScanSource,
    /** Called whenever a variant's results change (started, finished, failed). */
    private readonly onChange: (variantId: string) => void,
    /**
     * Given the storage of a sweep result that nothing shows or keeps any more, so the worker can write
     * a later result into it (memory used before is much cheaper than fresh memory: sweep-scratch.ts).
     * The buffer is unusable here afterwards.
     */
    private readonly releaseSweepBuffer?: (buffer: ArrayBuffer) => void,
  ) {}

  /** Results for a variant as far as they have come. */
  resultFor(variantId: string): VariantResult | undefined {
    return this.slots.get(variantId)?.result;
  }

  /**
   * Bring the results in line with the workspace: sweep and analyse the edited variant first, then
   * the overlaid ones, then the rest (for the comparison table). Variants deleted are let go.
   */
  update(workspace: Workspace): void {
    if (this.disposed) return;
    const order = [workspace.activeId, ...workspace.overlayIds.filter((id) => id !== workspace.activeId)];
    for (const variant of workspace.variants) if (!order.includes(variant.id)) order.push(variant.id);
    for (const id of [...this.slots.keys()]) {
      if (!workspace.variants.some((variant) => variant.id === id)) {
        this.slots.get(id)!.sweep.dispose();
        this.slots.get(id)!.emissions.dispose();
        this.slots.get(id)!.safety.dispose();
        this.slots.delete(id);
        this.kept.delete(id);
      }
    }
    for (const id of order) {
      const variant = workspace.variants.find((v) => v.id === id);
      if (variant?.validDocument) this.ensure(id, variant.validDocument, workspace.noise);
    }
  }

  dispose(): void {
    this.disposed = true;
    for (const slot of this.slots.values()) {
      slot.sweep.dispose();
      slot.emissions.dispose();
      slot.safety.dispose();
    }
    this.slots.clear();
  }

  private slotOf(variantId: string): Slot {
    let slot = this.slots.get(variantId);
    if (!slot) {
      slot = {
        sweep: new SweepClient(this.remote),
        emissions: new EmissionsClient(this.remote),
        safety: new NewestRequestQueue<SafetyOutcome>('safety', (reason) => `the worker did not answer the safety checks: ${reason}`),
        result: undefined,
      };
      this.slots.set(variantId, slot);
    }
    return slot;
  }

  private keyOf(document: JsonObject): string {
    let key = this.documentKeys.get(document);
    if (key === undefined) {
      this.documentCount += 1;
      key = `d${this.documentCount}`;
      this.documentKeys.set(document, key);
    }
    return key;
  }

  private ensure(variantId: string, document: JsonObject, noise: NoiseChoice): void {
    const slot = this.slotOf(variantId);
    const noiseKey = noise.kind === 'scan' ? `scan:${noise.scanId}` : 'estimate';
    const current = slot.result;
    if (current && current.document === document && current.noiseKey === noiseKey) return;
    const cacheKey = `${this.keyOf(document)}|${noiseKey}`;
    const cached = this.kept.get(variantId)?.get(cacheKey);
    if (cached && cached.sweep.status === 'done' && (cached.analysis.status === 'done' || cached.analysis.status === 'idle')) {
      slot.result = cached;
      this.onChange(variantId);
      if (cached.safety.status === 'running') void this.runSafety(variantId, slot, document, noiseKey);
      return;
    }
    // The sweep is the same whatever the noise: keep it when only the noise changed.
    const sameDocument = current?.document === document;
    const sweep: SweepState = sameDocument && current.sweep.status === 'done' ? current.sweep : { status: 'running' };
    const shown = current?.shown ?? { sweep: undefined, analysis: undefined };
    const safety: SafetyState = sameDocument ? current.safety : { status: 'running' };
    slot.result = { document, noiseKey, sweep, analysis: { status: 'running' }, safety, shown: sweep.status === 'done' ? { ...shown, sweep: sweep.result } : shown };
    this.onChange(variantId);
    if (sweep.status === 'running') void this.runSweep(variantId, slot, document, noiseKey, cacheKey);
    // The safety checks wait for the analysis: the worker answers in order, and the plots come first.
    void this.runAnalysis(variantId, slot, document, noise, noiseKey, cacheKey).then(() => {
      if (safety.status === 'running' && this.isCurrent(slot, document, noiseKey)) void this.runSafety(variantId, slot, document, noiseKey);
    });
  }

  private async runSweep(variantId: string, slot: Slot, document: JsonObject, noiseKey: string, cacheKey: string): Promise<void> {
    const outcome = await slot.sweep.request(document);
    if (outcome.status === 'superseded' || !this.isCurrent(slot, document, noiseKey)) return;
    const sweep: SweepState = outcome.status === 'done' ? { status: 'done', result: outcome.result, elapsedMs: outcome.elapsedMs } : { status: 'error', error: outcome.error };
    const shown = slot.result!.shown;
    slot.result = { ...slot.result!, sweep, shown: sweep.status === 'done' ? { ...shown, sweep: sweep.result } : shown };
    this.keep(variantId, cacheKey, slot.result);
    this.onChange(variantId);
  }

  private async runSafety(variantId: string, slot: Slot, document: JsonObject, noiseKey: string): Promise<void> {
    const outcome = await slot.safety.enqueue(async (requestId) => {
      const reply = (await this.remote.safetyChecks({ requestId, design: document })) as { ok?: unknown; report?: SafetyReport; error?: { message?: unknown } };
      return reply.ok === true && reply.report
        ? { status: 'done' as const, requestId, report: reply.report }
        : { status: 'refused' as const, requestId, message: typeof reply.error?.message === 'string' ? reply.error.message : 'the worker sent a malformed safety reply' };
    });
    if (outcome.status === 'superseded' || !this.isCurrent(slot, document, noiseKey)) return;
    const safety: SafetyState =
      outcome.status === 'done' ? { status: 'done', report: outcome.report } : { status: 'error', message: outcome.status === 'refused' ? outcome.message : outcome.error.message };
    slot.result = { ...slot.result!, safety };
    this.onChange(variantId);
  }

  private async runAnalysis(variantId: string, slot: Slot, document: JsonObject, noise: NoiseChoice, noiseKey: string, cacheKey: string): Promise<void> {
    const request = await this.noiseRequest(document, noise);
    if (!this.isCurrent(slot, document, noiseKey)) return;
    if ('reason' in request) {
      slot.result = { ...slot.result!, analysis: { status: 'idle', reason: request.reason }, shown: { ...slot.result!.shown, analysis: undefined } };
      this.keep(variantId, cacheKey, slot.result);
      this.onChange(variantId);
      return;
    }
    const outcome = await slot.emissions.analyze(document, request.noise);
    if (outcome.status === 'superseded' || !this.isCurrent(slot, document, noiseKey)) return;
    const analysis: AnalysisState =
      outcome.status === 'done' ? { status: 'done', analysis: outcome.analysis, elapsedMs: outcome.elapsedMs, limitingModes: outcome.limitingModes } : { status: 'error', error: outcome.error };
    slot.result = { ...slot.result!, analysis, shown: { ...slot.result!.shown, analysis: analysis.status === 'done' ? analysis.analysis : undefined } };
    this.keep(variantId, cacheKey, slot.result);
    this.onChange(variantId);
  }

  private isCurrent(slot: Slot, document: JsonObject, noiseKey: string): boolean {
    return !this.disposed && slot.result?.document === document && slot.result.noiseKey === noiseKey;
  }

  private keep(variantId: string, cacheKey: string, result: VariantResult): void {
    let kept = this.kept.get(variantId);
    if (!kept) {
      kept = new Map();
      this.kept.set(variantId, kept);
    }
    kept.delete(cacheKey);
    kept.set(cacheKey, result);
    while (kept.size > KEPT_PER_VARIANT) {
      const oldest = kept.keys().next().value!;
      const evicted = kept.get(oldest)!;
      kept.delete(oldest);
      this.release(evicted);
    }
  }

  /** Hand an evicted result's sweep storage back, unless some result still shown or kept holds it. */
  private release(evicted: VariantResult): void {
    if (!this.releaseSweepBuffer || evicted.sweep.status !== 'done') return;
    const sweep = evicted.sweep.result;
    const holds = (result: VariantResult | undefined): boolean =>
      result !== undefined && ((result.sweep.status === 'done' && result.sweep.result === sweep) || result.shown.sweep === sweep);
    for (const slot of this.slots.values()) if (holds(slot.result)) return;
    for (const kept of this.kept.values()) for (const result of kept.values()) if (holds(result)) return;
    const buffer = sweep.frequencyHz.buffer;
    if (buffer instanceof ArrayBuffer && buffer.byteLength > 0) this.releaseSweepBuffer(buffer);
  }

  /** The noise as the worker's report request names it (a stored scan, or the estimate), or undefined when there is none. */
  async reportNoise(document: JsonObject, noise: NoiseChoice): Promise<{ readonly kind: 'estimate' } | { readonly kind: 'stored-scan'; readonly scanId: string } | undefined> {
    const request = await this.noiseRequest(document, noise);
    if ('reason' in request || request.noise.kind === 'scan') return undefined;
    return request.noise;
  }

  /** The noise to send, or why there is none to judge. */
  private async noiseRequest(document: JsonObject, noise: NoiseChoice): Promise<{ noise: EmissionsNoise } | { reason: string }> {
    if (noise.kind === 'scan') {
      if (!this.storedScans.has(noise.scanId)) {
        const scan = this.scans(noise.scanId);
        if (!scan) return { reason: 'The chosen scan is not loaded.' };
        const message = {
          name: scan.name,
          tag: scan.tag,
          frequencyHz: scan.frequencyHz,
          traces: scan.traces.map((trace) => ({ ...trace })),
          notes: [...scan.notes],
          ...(scan.warnings && scan.warnings.length > 0 ? { warnings: [...scan.warnings] } : {}),
        };
        const reply = (await this.remote.storeScan({ scanId: noise.scanId, scan: message })) as { ok?: unknown; message?: unknown };
        if (reply.ok !== true) return { reason: `The worker refused the scan: ${typeof reply.message === 'string' ? reply.message : 'no reason given'}` };
        this.storedScans.add(noise.scanId);
      }
      return { noise: { kind: 'stored-scan', scanId: noise.scanId } };
    }
    const checked = checkDocument(document);
    const estimate = checked.ok ? checked.design.emissions?.estimate : undefined;
    if (!estimate || (!estimate.commonMode && !estimate.differentialMode)) {
      return { reason: 'Nothing to judge yet: load a scan, or give the design a noise estimate from its switching waveform.' };
    }
    return { noise: { kind: 'estimate' } };
  }
}
