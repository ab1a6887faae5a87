import { type ComplexColumns, complexColumns } from '../complex-columns.ts';
import { createWorkspace, type Workspace } from '../kernel/evaluate-network.ts';
import { allocateResponse, type NetworkResponse } from '../kernel/network-response.ts';
import type { Network } from '../network.ts';

/**
 * The kernel's working memory kept from one sweep to the next, for a caller that sweeps again and
 * again (the page's worker, on every edit). A sweep of the benchmark design touches about 2 MB of
 * workspace and response columns; in Chromium a fresh typed array costs several milliseconds per
 * megabyte on this kind of machine (new pages are mapped and zeroed), against a tenth of that for
 * memory used before, so reusing it is a large part of an edit's time. Nothing here outlives what the
 * sweep copies into its result: the result never shares memory with the scratch.
 *
 * A workspace fits a network of the same shape (the same element kinds in order) and at most its
 * capacity of points; capacity grows with headroom so that a few refined points more do not
 * reallocate. One scratch serves one sweep at a time (a worker is single-threaded).
 *
 * A result's own storage (the one buffer its columns share) leaves with the result, across the worker
 * boundary. A caller that knows a result is no longer used anywhere may hand its buffer back with
 * `reuseResultBuffer`; the next sweep writes its result into it (every value is written afresh).
 */
export class SweepScratch {
  private workspace: { readonly shape: string; readonly value: Workspace } | undefined;
  private response: { readonly systems: number; readonly value: NetworkResponse } | undefined;
  private readonly probes: ComplexColumns[] = [];
  private readonly resultBuffers: ArrayBuffer[] = [];

  /** A workspace for `network` holding at least `capacity` points. */
  workspaceFor(network: Network, capacity: number): Workspace {
    const shape = shapeOf(network);
    const kept = this.workspace;
    if (kept && kept.shape === shape && kept.value.capacity >= capacity) return kept.value;
    const value = createWorkspace(network, withHeadroom(capacity));
    this.workspace = { shape, value };
    return value;
  }

  /** Response columns for at least `capacity` points and `systems` resistive systems. */
  responseFor(capacity: number, systems: number): NetworkResponse {
    const kept = this.response;
    if (kept && kept.systems === systems && kept.value.count >= capacity) return kept.value;
    const value = allocateResponse(withHeadroom(capacity), systems);
    this.response = { systems, value };
    return value;
  }

  /** Complex columns of `length` points for temporary use within one sweep; `index` names which. */
  temporaryColumns(index: number, length: number): ComplexColumns {
    const kept = this.probes[index];
    if (kept && kept.re.length >= length) return { re: kept.re.subarray(0, length), im: kept.im.subarray(0, length) };
    const value = complexColumns(withHeadroom(length));
    this.probes[index] = value;
    return { re: value.re.subarray(0, length), im: value.im.subarray(0, length) };
  }

  /** Storage for a result of `doubles` values: a buffer handed back, if one fits, or a new one. */
  resultStorage(doubles: number): Float64Array {
    const bytes = doubles * Float64Array.BYTES_PER_ELEMENT;
    // A buffer much larger than needed would travel with every result: take only a near fit.
    const index = this.resultBuffers.findIndex((buffer) => buffer.byteLength >= bytes && buffer.byteLength <= bytes * 1.5 + 65_536);
    if (index < 0) return new Float64Array(doubles);
    const [buffer] = this.resultBuffers.splice(index, 1);
    return new Float64Array(buffer!, 0, doubles);
  }

  /** Hand back a result's buffer that nothing reads any more (a detached one is ignored). */
  reuseResultBuffer(buffer: ArrayBuffer): void {
    if (buffer.byteLength === 0 || this.resultBuffers.includes(buffer)) return;
    this.resultBuffers.push(buffer);
    while (this.resultBuffers.length > MAX_RESULT_BUFFERS) this.resultBuffers.shift();
  }
}

/** Result buffers kept for reuse: a page sweeps one or a few variants at a time. */
const MAX_RESULT_BUFFERS = 4;

/** What a workspace's layout depends on: the kind of each element, in order. */
function shapeOf(network: Network): string {
  return network.elements.map((element) => element.kind).join(',');
}

function withHeadroom(capacity: number): number {
  return Math.ceil(capacity * 1.125) + 16;
}
