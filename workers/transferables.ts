/**
 * Every ArrayBuffer under a reply, once each: the transfer list for postMessage. A buffer listed
 * twice makes postMessage throw, and several columns of one result often share a buffer (a scan's
 * axis and traces, the estimate's columns), so this collects a set. Shared memory is never listed.
 */
export function collectTransferables(value: unknown): ArrayBuffer[] {
  const buffers = new Set<ArrayBuffer>();
  const seen = new Set<object>();
  const visit = (item: unknown): void => {
    if (typeof item !== 'object' || item === null || seen.has(item)) return;
    seen.add(item);
    if (ArrayBuffer.isView(item)) {
      if (item.buffer instanceof ArrayBuffer) buffers.add(item.buffer);
      return;
    }
    if (item instanceof ArrayBuffer) {
      buffers.add(item);
      return;
    }
    for (const child of Array.isArray(item) ? item : Object.values(item)) visit(child);
  };
  visit(value);
  return [...buffers];
}
