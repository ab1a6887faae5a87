import type { ByteCodec } from '../io/share-link.ts';

/**
 * Deflate (raw, RFC 1951) with the platform's CompressionStream, which the browser and Node 20 both
 * have: no library for a solved problem. Unpacking stops with an error once more than `maxBytes`
 * have come out.
 */
export const deflateCodec: ByteCodec = {
  async compress(bytes) {
    return collect(new Blob([bytes as BlobPart]).stream().pipeThrough(new CompressionStream('deflate-raw')), Infinity);
  },
  async decompress(bytes, maxBytes) {
    return collect(new Blob([bytes as BlobPart]).stream().pipeThrough(new DecompressionStream('deflate-raw')), maxBytes);
  },
};

async function collect(stream: ReadableStream<Uint8Array>, maxBytes: number): Promise<Uint8Array> {
  const reader = stream.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.length;
    if (total > maxBytes) {
      await reader.cancel();
      throw new RangeError(`more than ${maxBytes} bytes`);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const chunk of chunks) {
    out.set(chunk, at);
    at += chunk.length;
  }
  return out;
}
