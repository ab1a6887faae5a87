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
 */
export class SweepScratch {
  private workspace: { readonly shape: string; readonly value: Workspace } | undefined;
  private response: { readonly systems: number; readonly value: NetworkResponse } | undefined;

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
}

/** What a workspace's layout depends on: the kind of each element, in order. */
function shapeOf(network: Network): string {
  return network.elements.map((element) => element.kind).join(',');
}

function withHeadroom(capacity: number): number {
  return Math.ceil(capacity * 1.125) + 16;
}
