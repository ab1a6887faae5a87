import type { Design } from '../model/design.ts';
import { readDesign } from '../model/read-design.ts';
import { ValidationError, type ValidationIssue } from '../model/validation-error.ts';

/**
 * A design carried in a link: `#design=<base64url of the design's JSON>`. The fragment never
 * reaches a server, so a shared link keeps the design private between the people who have it.
 * Pure and DOM-free (no atob/TextEncoder): the UTF-8 and base64url steps are written out here so
 * the same code runs in the page, the worker, Node and the command line.
 */

const HASH_KEY = 'design';
/** Far above any real design (even with long measured tables) and below what browsers keep in a URL. */
export const MAX_DESIGN_HASH_LENGTH = 2_000_000;

export type DesignHashReading =
  | { readonly status: 'absent' }
  | { readonly status: 'found'; readonly document: unknown; readonly design: Design }
  | { readonly status: 'invalid'; readonly error: ValidationError };

/** `#design=…` for a design document (as written in a file, or an already validated design). */
export function encodeDesignHash(document: object): string {
  return `#${HASH_KEY}=${encodeBase64Url(encodeUtf8(JSON.stringify(document)))}`;
}

/**
 * Read the design from a location hash ("#design=…", with or without the "#", possibly among other
 * `key=value` pairs joined by "&"). No design key is not an error: the caller shows its default.
 */
export function readDesignHash(hash: string): DesignHashReading {
  const fragment = hash.startsWith('#') ? hash.slice(1) : hash;
  const values = fragment
    .split('&')
    .filter((pair) => pair === HASH_KEY || pair.startsWith(`${HASH_KEY}=`))
    .map((pair) => pair.slice(HASH_KEY.length + 1));
  if (values.length === 0) return { status: 'absent' };
  if (values.length > 1) return invalid('bad-file', `the link holds ${values.length} designs (#${HASH_KEY}=… appears more than once)`);
  const encoded = values[0]!;
  if (encoded === '') return invalid('bad-file', `the link's #${HASH_KEY}= is empty`);
  if (encoded.length > MAX_DESIGN_HASH_LENGTH) {
    return invalid('bad-file', `the link's design is ${encoded.length} characters long; at most ${MAX_DESIGN_HASH_LENGTH} are read`);
  }

  const bytes = decodeBase64Url(encoded);
  if (typeof bytes === 'string') return invalid('bad-file', `the link's design is not base64url text: ${bytes}`);
  const text = decodeUtf8(bytes);
  if (text === undefined) return invalid('bad-file', `the link's design is not UTF-8 text once decoded`);
  let document: unknown;
  try {
    document = JSON.parse(text);
  } catch (cause) {
    return invalid('bad-json', `the link's design is not valid JSON (${(cause as Error).message})`);
  }
  const read = readDesign(document);
  if (!read.ok) return { status: 'invalid', error: new ValidationError("invalid design in the link", read.error.issues) };
  return { status: 'found', document, design: read.value };
}

function invalid(code: ValidationIssue['code'], message: string): DesignHashReading {
  return { status: 'invalid', error: new ValidationError('unreadable design link', [{ path: '', code, message }]) };
}

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_';
const SEXTET = new Map<string, number>([...ALPHABET].map((symbol, index) => [symbol, index]));

/** RFC 4648 §5, without padding: the result is safe in a URL fragment as it stands. */
export function encodeBase64Url(bytes: Uint8Array): string {
  let text = '';
  for (let i = 0; i < bytes.length; i += 3) {
    const b0 = bytes[i]!;
    const b1 = bytes[i + 1] ?? 0;
    const b2 = bytes[i + 2] ?? 0;
    const chunk = (b0 << 16) | (b1 << 8) | b2;
    const symbols = i + 2 < bytes.length ? 4 : i + 1 < bytes.length ? 3 : 2;
    for (let s = 0; s < symbols; s += 1) text += ALPHABET[(chunk >> (18 - 6 * s)) & 63];
  }
  return text;
}

/** Bytes, or the reason the text is not base64url. Trailing "=" padding is tolerated. */
export function decodeBase64Url(text: string): Uint8Array | string {
  const body = text.replace(/={1,2}$/u, '');
  if (body.length % 4 === 1) return `its length (${body.length}) cannot be base64 (it was probably cut short)`;
  const bytes = new Uint8Array(Math.floor((body.length * 3) / 4));
  let chunk = 0;
  let bits = 0;
  let out = 0;
  for (let i = 0; i < body.length; i += 1) {
    const symbol = body[i]!;
    const value = SEXTET.get(symbol);
    if (value === undefined) return `character ${JSON.stringify(symbol)} at position ${i + 1} is not allowed (only A–Z, a–z, 0–9, "-" and "_")`;
    chunk = (chunk << 6) | value;
    bits += 6;
    if (bits >= 8) {
      bits -= 8;
      bytes[out] = (chunk >> bits) & 0xff;
      out += 1;
    }
  }
  return bytes;
}

export function encodeUtf8(text: string): Uint8Array {
  const bytes: number[] = [];
  for (const character of text) {
    let code = character.codePointAt(0)!;
    // A lone surrogate cannot be encoded; write U+FFFD as TextEncoder does.
    if (code >= 0xd800 && code <= 0xdfff) code = 0xfffd;
    if (code < 0x80) bytes.push(code);
    else if (code < 0x800) bytes.push(0xc0 | (code >> 6), 0x80 | (code & 63));
    else if (code < 0x10000) bytes.push(0xe0 | (code >> 12), 0x80 | ((code >> 6) & 63), 0x80 | (code & 63));
    else bytes.push(0xf0 | (code >> 18), 0x80 | ((code >> 12) & 63), 0x80 | ((code >> 6) & 63), 0x80 | (code & 63));
  }
  return Uint8Array.from(bytes);
}

/** Strict UTF-8: overlong forms, surrogates and truncated sequences give undefined. */
export function decodeUtf8(bytes: Uint8Array): string | undefined {
  const codes: number[] = [];
  let text = '';
  for (let i = 0; i < bytes.length; ) {
    const lead = bytes[i]!;
    let length: number;
    let code: number;
    let minimum: number;
    if (lead < 0x80) [length, code, minimum] = [1, lead, 0];
    else if (lead >= 0xc2 && lead < 0xe0) [length, code, minimum] = [2, lead & 31, 0x80];
    else if (lead >= 0xe0 && lead < 0xf0) [length, code, minimum] = [3, lead & 15, 0x800];
    else if (lead >= 0xf0 && lead < 0xf5) [length, code, minimum] = [4, lead & 7, 0x10000];
    else return undefined;
    if (i + length > bytes.length) return undefined;
    for (let k = 1; k < length; k += 1) {
      const next = bytes[i + k]!;
      if ((next & 0xc0) !== 0x80) return undefined;
      code = (code << 6) | (next & 63);
    }
    if (code < minimum || code > 0x10ffff || (code >= 0xd800 && code <= 0xdfff)) return undefined;
    codes.push(code);
    // Flush in slices: String.fromCodePoint takes its arguments on the stack.
    if (codes.length === 8192) text += String.fromCodePoint(...codes.splice(0));
    i += length;
  }
  return text + String.fromCodePoint(...codes);
}
