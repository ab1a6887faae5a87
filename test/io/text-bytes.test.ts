import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decodeText, firstInvalidUtf8 } from '../../src/io/text-bytes.ts';
import { propertySettings } from '../support/property-settings.ts';

// The oracle: Node's WHATWG TextDecoder (ICU), an implementation of the Encoding Standard's UTF-8
// decoder, and Node's Buffer encoders for Latin-1 and UTF-16 files as other programs write them.
const reference = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
const lenient = new TextDecoder('utf-8', { ignoreBOM: true });
const referenceDecodes = (bytes: Uint8Array): boolean => {
  try {
    reference.decode(bytes);
    return true;
  } catch {
    return false;
  }
};

function refused(bytes: Uint8Array) {
  const result = decodeText(bytes);
  if (result.ok) throw new Error('expected a refusal');
  return result.error;
}

describe('decodeText: bytes in, UTF-8 text or a located "not UTF-8 text"', () => {
  it('reads UTF-8, with or without a byte-order mark (dropped, and said)', () => {
    expect(decodeText(Buffer.from('Fréquence [MHz];µV\n', 'utf8'))).toEqual({ ok: true, text: 'Fréquence [MHz];µV\n', byteOrderMark: false });
    expect(decodeText(Buffer.from('\uFEFFf,level\n', 'utf8'))).toEqual({ ok: true, text: 'f,level\n', byteOrderMark: true });
    expect(decodeText(new Uint8Array(0))).toEqual({ ok: true, text: '', byteOrderMark: false });
  });

  it('refuses a Latin-1 file at its first non-UTF-8 byte, with line and column', () => {
    const error = refused(Buffer.from('# scan\nFrequency [MHz];Peak [dBµV]\n0,15;40\n', 'latin1'));
    expect(error).toMatchObject({ code: 'not-utf8', encoding: undefined, line: 2, column: 25, byteOffset: 31 });
    expect(error.message).toBe(
      'not UTF-8 text: byte 0xB5 at line 2, column 25 is not part of a UTF-8 character (a file saved as Latin-1 or Windows-1252? save it as UTF-8)',
    );
  });

  it.each([
    ['utf16le', '\uFEFFFrequency,Peak\n0.15,40\n', 'UTF-16 LE'],
    ['utf16be', '\uFEFFFrequency,Peak\n0.15,40\n', 'UTF-16 BE'],
  ] as const)('names %s from its byte-order mark', (encoding, text, name) => {
    const le = Buffer.from(text, 'utf16le');
    const bytes = encoding === 'utf16be' ? le.swap16() : le;
    const error = refused(bytes);
    expect(error).toMatchObject({ encoding: name, line: 1, column: 1, byteOffset: 0 });
    expect(error.message).toBe(`not UTF-8 text: the file is ${name} text (its byte-order mark says so): save it as UTF-8`);
  });

  it('names UTF-32 marks and UTF-16 without a mark (NUL beside every ASCII letter)', () => {
    expect(refused(Uint8Array.of(0xff, 0xfe, 0, 0, 0x41, 0, 0, 0)).encoding).toBe('UTF-32 LE');
    expect(refused(Uint8Array.of(0, 0, 0xfe, 0xff, 0, 0, 0, 0x41)).encoding).toBe('UTF-32 BE');
    const bare = refused(Buffer.from('f,level\n1,2\n', 'utf16le'));
    expect(bare).toMatchObject({ encoding: 'UTF-16 LE', line: 1, column: 2 });
    expect(bare.message).toMatch(/looks like UTF-16 LE text without a byte-order mark/u);
    expect(refused(Buffer.from('f,level\n1,2\n', 'utf16le').swap16()).encoding).toBe('UTF-16 BE');
    expect(refused(Buffer.from('AB\u0000CDEFGHIJKL', 'latin1')).message).toMatch(/a NUL byte at line 1, column 3: this is not a text file/u);
  });

  it('a UTF-8 byte-order mark does not excuse bytes that are not UTF-8', () => {
    const error = refused(Uint8Array.of(0xef, 0xbb, 0xbf, 0x61, 0xe9, 0x62));
    expect(error).toMatchObject({ encoding: 'UTF-8 with BOM', line: 1, column: 2, byteOffset: 4 });
    expect(error.message).toMatch(/although the file starts with a UTF-8 byte-order mark/u);
  });

  it('counts lines ended by \\n, \\r\\n and a lone \\r, and columns in characters', () => {
    expect(refused(Buffer.concat([Buffer.from('a\r\nb\rcµ', 'utf8'), Uint8Array.of(0xff)]))).toMatchObject({ line: 3, column: 3 });
  });

  it('property: accepts exactly what the WHATWG decoder accepts, with the same text', () => {
    const bytes = fc.oneof(
      fc.uint8Array({ maxLength: 40 }),
      fc.string({ unit: 'binary', maxLength: 30 }).map((s) => new Uint8Array(Buffer.from(s, 'utf8'))),
      fc
        .tuple(fc.string({ unit: 'binary', maxLength: 20 }), fc.nat(), fc.integer({ min: 0x80, max: 0xff }))
        .map(([s, at, byte]) => {
          const b = new Uint8Array(Buffer.from(s, 'utf8'));
          if (b.length > 0) b[at % b.length] = byte;
          return b;
        }),
    );
    fc.assert(
      fc.property(bytes, (b) => {
        const result = decodeText(b);
        const hasMark = b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf;
        const otherMark = (b[0] === 0xff && b[1] === 0xfe) || (b[0] === 0xfe && b[1] === 0xff) || (b[0] === 0 && b[1] === 0 && b[2] === 0xfe && b[3] === 0xff);
        const body = hasMark ? b.subarray(3) : b;
        const accepted = !otherMark && !body.includes(0) && referenceDecodes(body);
        expect(result.ok).toBe(accepted);
        if (result.ok) expect(result.text).toBe(reference.decode(body));
      }),
      propertySettings(3000),
    );
  });

  it('property: the first bad byte is where the lenient WHATWG decoder writes its first replacement character', () => {
    const broken = fc.tuple(fc.string({ unit: 'grapheme', maxLength: 20 }), fc.uint8Array({ minLength: 1, maxLength: 6 }), fc.string({ maxLength: 5 })).map(
      ([before, junk, after]) => new Uint8Array(Buffer.concat([Buffer.from(before, 'utf8'), junk, Buffer.from(after, 'utf8')])),
    );
    fc.assert(
      fc.property(broken, (b) => {
        if (referenceDecodes(b)) return;
        const bad = firstInvalidUtf8(b);
        // Everything before the bad byte decodes; the lenient decoder replaces right there.
        expect(referenceDecodes(b.subarray(0, bad))).toBe(true);
        const prefix = reference.decode(b.subarray(0, bad));
        if (prefix.includes('\uFFFD')) return; // a replacement character the text itself holds
        expect(lenient.decode(b).indexOf('\uFFFD')).toBe(prefix.length);
      }),
      propertySettings(3000),
    );
  });
});
