/**
 * A file's bytes as text, or why they are not: every file that enters from outside (a design, a
 * scan, a mask, a measurement; on the command line or in the page) is read as UTF-8 here and
 * nowhere else. A byte that is not UTF-8 is refused with its line and column instead of being
 * replaced by U+FFFD, which would turn a Latin-1 "µ" or a UTF-16 file into silent garbage.
 */

/** Encodings a byte-order mark (or its absence with NUL bytes) identifies. */
export type NamedEncoding = 'UTF-8 with BOM' | 'UTF-16 LE' | 'UTF-16 BE' | 'UTF-32 LE' | 'UTF-32 BE';

export interface NotUtf8Error {
  readonly code: 'not-utf8';
  /** What the file looks like instead, when its first bytes say so. */
  readonly encoding: NamedEncoding | undefined;
  /** 1-based line and column (in characters) of the first byte that does not read, and its offset in bytes. */
  readonly line: number;
  readonly column: number;
  readonly byteOffset: number;
  /** For a person: "not UTF-8 text: byte 0xE9 at line 3, column 12 …". */
  readonly message: string;
}

export type DecodedText =
  | { readonly ok: true; readonly text: string; /** The file began with a UTF-8 byte-order mark (dropped). */ readonly byteOrderMark: boolean }
  | { readonly ok: false; readonly error: NotUtf8Error };

interface Utf8Decoder {
  decode(input: Uint8Array): string;
}
type Utf8DecoderConstructor = new (label: string, options?: { fatal?: boolean; ignoreBOM?: boolean }) => Utf8Decoder;

// The WHATWG TextDecoder exists in Node, browsers and workers alike; looked up on globalThis so the
// pure layers compile without DOM or Node types.
const Decoder = (globalThis as unknown as { TextDecoder: Utf8DecoderConstructor }).TextDecoder;
const strict = new Decoder('utf-8', { fatal: true, ignoreBOM: true });
const lenient = new Decoder('utf-8', { ignoreBOM: true });

/** Read bytes as UTF-8 text; a UTF-8 byte-order mark is dropped; anything else that is not UTF-8 is refused. */
export function decodeText(bytes: Uint8Array): DecodedText {
  const mark = byteOrderMark(bytes);
  if (mark !== undefined && mark !== 'UTF-8 with BOM') {
    return refuse(mark, 1, 1, 0, `the file is ${mark} text (its byte-order mark says so): save it as UTF-8`);
  }
  const start = mark === 'UTF-8 with BOM' ? 3 : 0;
  const body = bytes.subarray(start);
  const nul = body.indexOf(0);
  if (nul >= 0) {
    const { line, column } = position(body, nul);
    const guess = nulGuess(body);
    const what = guess ? `it looks like ${guess} text without a byte-order mark: save it as UTF-8` : 'this is not a text file';
    return refuse(guess, line, column, start + nul, `a NUL byte at line ${line}, column ${column}: ${what}`);
  }
  // The lenient decoder is about twice as fast, and it writes U+FFFD only where the bytes are not
  // UTF-8: text without one is exactly what the strict decoder would give. With one (which a file
  // may also hold as a character), the strict decoder decides.
  const text = lenient.decode(body);
  if (!text.includes('\uFFFD')) return { ok: true, text, byteOrderMark: start > 0 };
  try {
    return { ok: true, text: strict.decode(body), byteOrderMark: start > 0 };
  } catch {
    // The decoder says only that the bytes are not UTF-8; find the first that is not, for the message.
    const bad = firstInvalidUtf8(body);
    const { line, column } = position(body, bad);
    const byte = body[bad] ?? 0;
    const what = `byte 0x${byte.toString(16).toUpperCase().padStart(2, '0')} at line ${line}, column ${column} is not part of a UTF-8 character`;
    const hint = mark ? ', although the file starts with a UTF-8 byte-order mark' : ' (a file saved as Latin-1 or Windows-1252? save it as UTF-8)';
    return refuse(mark, line, column, start + bad, `${what}${hint}`);
  }
}

function refuse(encoding: NamedEncoding | undefined, line: number, column: number, byteOffset: number, detail: string): DecodedText {
  return { ok: false, error: { code: 'not-utf8', encoding, line, column, byteOffset, message: `not UTF-8 text: ${detail}` } };
}

/** The encoding a byte-order mark names; UTF-32 LE is tested before UTF-16 LE, whose mark it starts with. */
function byteOrderMark(b: Uint8Array): NamedEncoding | undefined {
  if (b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) return 'UTF-8 with BOM';
  if (b[0] === 0xff && b[1] === 0xfe && b[2] === 0 && b[3] === 0) return 'UTF-32 LE';
  if (b[0] === 0 && b[1] === 0 && b[2] === 0xfe && b[3] === 0xff) return 'UTF-32 BE';
  if (b[0] === 0xff && b[1] === 0xfe) return 'UTF-16 LE';
  if (b[0] === 0xfe && b[1] === 0xff) return 'UTF-16 BE';
  return undefined;
}

/** Text in UTF-16 without a mark has a NUL beside nearly every ASCII character: which side tells the byte order. */
function nulGuess(b: Uint8Array): NamedEncoding | undefined {
  const n = Math.min(b.length - (b.length % 2), 4096);
  let even = 0;
  let odd = 0;
  for (let i = 0; i < n; i += 2) {
    if (b[i] === 0) even += 1;
    if (b[i + 1] === 0) odd += 1;
  }
  const pairs = n / 2;
  if (pairs === 0) return undefined;
  if (odd > 0.4 * pairs && even < 0.1 * pairs) return 'UTF-16 LE';
  if (even > 0.4 * pairs && odd < 0.1 * pairs) return 'UTF-16 BE';
  return undefined;
}

/**
 * The offset of the first byte that does not start a well-formed UTF-8 sequence (the Unicode
 * standard's table 3-7: no overlong forms, no surrogates, nothing above U+10FFFF), or the length
 * when there is none. Only called when the decoder has refused the bytes.
 */
export function firstInvalidUtf8(b: Uint8Array): number {
  const n = b.length;
  let i = 0;
  while (i < n) {
    const lead = b[i]!;
    if (lead < 0x80) {
      i += 1;
      continue;
    }
    let count: number;
    let low = 0x80;
    let high = 0xbf;
    if (lead >= 0xc2 && lead <= 0xdf) count = 1;
    else if (lead >= 0xe0 && lead <= 0xef) {
      count = 2;
      if (lead === 0xe0) low = 0xa0;
      if (lead === 0xed) high = 0x9f;
    } else if (lead >= 0xf0 && lead <= 0xf4) {
      count = 3;
      if (lead === 0xf0) low = 0x90;
      if (lead === 0xf4) high = 0x8f;
    } else return i;
    // A broken sequence is reported at its first byte: the Latin-1 "é" (0xE9), not the letter after it.
    for (let k = 1; k <= count; k += 1) {
      if (i + k >= n) return i;
      const next = b[i + k]!;
      if (next < (k === 1 ? low : 0x80) || next > (k === 1 ? high : 0xbf)) return i;
    }
    i += count + 1;
  }
  return n;
}

/** Line (counting \n, \r\n and a lone \r) and column in characters of a byte offset in well-formed UTF-8 before it. */
function position(b: Uint8Array, offset: number): { line: number; column: number } {
  let line = 1;
  let column = 1;
  for (let i = 0; i < offset; i += 1) {
    const byte = b[i]!;
    if (byte === 0x0a || (byte === 0x0d && b[i + 1] !== 0x0a)) {
      line += 1;
      column = 1;
    } else if (byte !== 0x0d && (byte & 0xc0) !== 0x80) column += 1;
  }
  return { line, column };
}
