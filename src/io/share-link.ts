import { readDesign } from '../model/read-design.ts';
import { ValidationError } from '../model/validation-error.ts';
import { type DesignHashReading, decodeBase64Url, decodeUtf8, encodeBase64Url, encodeUtf8, readDesignHash } from './design-url.ts';

/**
 * The share link: `#d=<base64url of the design's JSON, deflate-compressed>`, which the page keeps in
 * its address as the design is edited. Compression is the caller's (the browser's CompressionStream,
 * or Node's), so this stays DOM-free; older plain links (`#design=…`) still read. A link too long to
 * pass around is refused with the reason, and decompression stops at a stated size, so a crafted link
 * cannot make the page unpack gigabytes.
 */

export interface ByteCodec {
  compress(bytes: Uint8Array): Promise<Uint8Array>;
  /** Unpack, failing once more than `maxBytes` would come out. */
  decompress(bytes: Uint8Array, maxBytes: number): Promise<Uint8Array>;
}

const KEY = 'd';
/** Links longer than this are refused when made: mail and chat programs cut long addresses. */
export const MAX_SHARE_LINK_CHARS = 60_000;
/** A design's JSON is far smaller; this bounds what a hostile link can make the page unpack. */
export const MAX_SHARED_DESIGN_BYTES = 8_000_000;

export type ShareLinkResult = { readonly ok: true; readonly hash: string; readonly chars: number } | { readonly ok: false; readonly reason: string };

export async function encodeShareLink(document: object, codec: ByteCodec): Promise<ShareLinkResult> {
  const packed = await codec.compress(encodeUtf8(JSON.stringify(document)));
  const hash = `#${KEY}=${encodeBase64Url(packed)}`;
  if (hash.length > MAX_SHARE_LINK_CHARS) {
    return {
      ok: false,
      reason: `the design makes a ${Math.round(hash.length / 1000)} k-character link, more than the ${MAX_SHARE_LINK_CHARS / 1000} k that links can carry safely; share the design file instead (measured tables make designs large)`,
    };
  }
  return { ok: true, hash, chars: hash.length };
}

/** Read a design from a location hash: `#d=…` (compressed) or the older `#design=…`; absent is not an error. */
export async function readShareLink(hash: string, codec: ByteCodec): Promise<DesignHashReading> {
  const fragment = hash.startsWith('#') ? hash.slice(1) : hash;
  const values = fragment
    .split('&')
    .filter((pair) => pair === KEY || pair.startsWith(`${KEY}=`))
    .map((pair) => pair.slice(KEY.length + 1));
  if (values.length === 0) return readDesignHash(hash);
  if (values.length > 1) return invalid(`the link holds ${values.length} designs (#${KEY}=… appears more than once)`);
  const encoded = values[0]!;
  if (encoded === '') return invalid(`the link's #${KEY}= is empty`);
  if (encoded.length > MAX_SHARE_LINK_CHARS * 4) return invalid(`the link's design is ${encoded.length} characters long; at most ${MAX_SHARE_LINK_CHARS * 4} are read`);
  const bytes = decodeBase64Url(encoded);
  if (typeof bytes === 'string') return invalid(`the link's design is not base64url text: ${bytes}`);
  let unpacked: Uint8Array;
  try {
    unpacked = await codec.decompress(bytes, MAX_SHARED_DESIGN_BYTES);
  } catch (cause) {
    return invalid(`the link's design could not be unpacked (${cause instanceof Error ? cause.message : String(cause)}); it may have been cut short when it was copied`);
  }
  const text = decodeUtf8(unpacked);
  if (text === undefined) return invalid("the link's design is not UTF-8 text once unpacked");
  let document: unknown;
  try {
    document = JSON.parse(text);
  } catch (cause) {
    return { status: 'invalid', error: new ValidationError('unreadable design link', [{ path: '', code: 'bad-json', message: `the link's design is not valid JSON (${(cause as Error).message})` }]) };
  }
  const read = readDesign(document);
  if (!read.ok) return { status: 'invalid', error: new ValidationError('invalid design in the link', read.error.issues) };
  return { status: 'found', document, design: read.value };
}

function invalid(message: string): DesignHashReading {
  return { status: 'invalid', error: new ValidationError('unreadable design link', [{ path: '', code: 'bad-file', message }]) };
}
