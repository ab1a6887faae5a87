import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import demo from '../../fixtures/demo/adapter-two-stage.design.json';
import {
  decodeBase64Url,
  decodeUtf8,
  encodeBase64Url,
  encodeDesignHash,
  encodeUtf8,
  readDesignHash,
  type DesignHashReading,
} from '../../src/io/design-url.ts';
import { requireDesign } from '../../src/model/index.ts';

function errorOf(reading: DesignHashReading): { message: string; issues: readonly { path: string; code: string; message: string }[] } {
  if (reading.status !== 'invalid') throw new Error(`expected an invalid link, got ${reading.status}`);
  return reading.error;
}

const hashOfText = (text: string): string => `#design=${encodeBase64Url(encodeUtf8(text))}`;

describe('design links', () => {
  it('round-trips the demo design through a URL hash', () => {
    const hash = encodeDesignHash(demo);
    expect(hash).toMatch(/^#design=[A-Za-z0-9_-]+$/u);
    const reading = readDesignHash(hash);
    expect(reading.status).toBe('found');
    if (reading.status !== 'found') return;
    expect(reading.document).toEqual(demo);
    expect(reading.design).toEqual(requireDesign(demo));
  });

  it('round-trips a validated design, and text outside ASCII (µ, Ω, emoji)', () => {
    const design = requireDesign({ ...demo, name: 'µ-choke 4.7 Ω ✓ 😀', description: 'ü' });
    const reading = readDesignHash(encodeDesignHash(design));
    expect(reading.status === 'found' && reading.design).toEqual(design);
  });

  it('finds the design among other hash parameters, with or without "#"', () => {
    const encoded = encodeDesignHash(demo).slice(1);
    expect(readDesignHash(`#view=dm&${encoded}&x=1`).status).toBe('found');
    expect(readDesignHash(encoded).status).toBe('found');
  });

  it('reports no design when the hash has none', () => {
    expect(readDesignHash('')).toEqual({ status: 'absent' });
    expect(readDesignHash('#')).toEqual({ status: 'absent' });
    expect(readDesignHash('#view=dm')).toEqual({ status: 'absent' });
    expect(readDesignHash('#designer=x')).toEqual({ status: 'absent' });
  });

  it('names a character that is not base64url', () => {
    const error = errorOf(readDesignHash('#design=abc!def'));
    expect(error.issues).toEqual([
      { path: '', code: 'bad-file', message: 'the link\'s design is not base64url text: character "!" at position 4 is not allowed (only A–Z, a–z, 0–9, "-" and "_")' },
    ]);
    expect(error.message).toMatch(/^unreadable design link: /u);
  });

  it('says when the base64 text was cut short or is empty', () => {
    expect(errorOf(readDesignHash('#design=abcde')).issues[0]?.message).toMatch(/cut short/u);
    expect(errorOf(readDesignHash('#design=')).issues[0]?.message).toMatch(/empty/u);
  });

  it('refuses two designs in one link', () => {
    const encoded = encodeDesignHash(demo).slice(1);
    expect(errorOf(readDesignHash(`#${encoded}&${encoded}`)).issues[0]?.message).toMatch(/more than once/u);
  });

  it('reports bad JSON', () => {
    const error = errorOf(readDesignHash(hashOfText('{"format": "chokepoint-design",')));
    expect(error.issues[0]?.code).toBe('bad-json');
    expect(error.issues[0]?.message).toMatch(/^the link's design is not valid JSON \(/u);
  });

  it('reports bytes that are not UTF-8', () => {
    const hash = `#design=${encodeBase64Url(Uint8Array.from([0x7b, 0xff, 0x7d]))}`;
    expect(errorOf(readDesignHash(hash)).issues[0]?.message).toMatch(/not UTF-8/u);
  });

  it('reports an invalid design with the path of each bad field', () => {
    const broken = structuredClone(demo);
    broken.stages[0]!.elements[1]!.part.capacitance = '2.2 nH';
    const error = errorOf(readDesignHash(encodeDesignHash(broken)));
    expect(error.message).toMatch(/^invalid design in the link: stages\[0\]\.elements\[1\]\.part\.capacitance: /u);
    expect(error.issues).toEqual([expect.objectContaining({ path: 'stages[0].elements[1].part.capacitance', code: 'bad-quantity' })]);
  });

  it('reports a JSON value that is not a design', () => {
    expect(errorOf(readDesignHash(hashOfText('[1, 2]'))).issues[0]?.code).toBe('not-a-design');
  });
});

describe('the encodings under design links', () => {
  it('base64url agrees with Node for any bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 200 }), (bytes) => {
        const text = encodeBase64Url(bytes);
        expect(text).toBe(Buffer.from(bytes).toString('base64url'));
        expect(decodeBase64Url(text)).toEqual(bytes);
      }),
    );
  });

  it('UTF-8 agrees with TextEncoder/TextDecoder for any text', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', maxLength: 100 }), (text) => {
        const bytes = encodeUtf8(text);
        expect(bytes).toEqual(new TextEncoder().encode(text));
        expect(decodeUtf8(bytes)).toBe(text);
      }),
    );
  });

  it('refuses overlong and truncated UTF-8', () => {
    expect(decodeUtf8(Uint8Array.from([0xc0, 0xaf]))).toBeUndefined();
    expect(decodeUtf8(Uint8Array.from([0xe2, 0x82]))).toBeUndefined();
    expect(decodeUtf8(Uint8Array.from([0xed, 0xa0, 0x80]))).toBeUndefined();
  });

  it('decodes long text without overflowing the call stack', () => {
    const text = 'Ω'.repeat(50_000);
    expect(decodeUtf8(encodeUtf8(text))).toBe(text);
  });
});
