import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import demoJson from '../../fixtures/demo/adapter-two-stage.design.json';
import { requireDesign } from '../../src/model/index.ts';
import { canonicalJson } from '../../src/report/canonical-json.ts';
import { designHash, sha256Hex } from '../../src/report/design-hash.ts';

describe('sha256Hex', () => {
  // FIPS 180-2, Appendix B.1 and B.2 (the one-block and two-block messages).
  it('matches the published SHA-256 examples', () => {
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
  });

  it('agrees with Node’s own OpenSSL SHA-256 on UTF-8 text', () => {
    const text = 'Ω µ “quotes” 😀 CX1 470 nF';
    expect(sha256Hex(text)).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
  });
});

describe('canonicalJson', () => {
  // RFC 8785 §3.2.3: members sorted by UTF-16 code units; §3.2.2.3 numbers as ECMAScript writes them.
  it('sorts members by UTF-16 code units and writes numbers the ECMAScript way', () => {
    expect(canonicalJson({ b: 1, a: [true, null, 'x'], A: { d: 1e21, c: 0.000001 } })).toBe('{"A":{"c":0.000001,"d":1e+21},"a":[true,null,"x"],"b":1}');
    // "\u20ac" (euro sign) sorts after "\r" and before "\ud83d\ude00" (an emoji) by code unit.
    expect(canonicalJson({ '\u{1F600}': 3, '\u20ac': 2, '\r': 1 })).toBe('{"\\r":1,"€":2,"😀":3}');
    expect(canonicalJson({ x: undefined, y: -0 })).toBe('{"y":0}');
    expect(() => canonicalJson({ x: Number.NaN })).toThrow(RangeError);
  });
});

describe('designHash', () => {
  const demo = requireDesign(demoJson);

  it('is the SHA-256 of the canonical validated design', () => {
    expect(designHash(demo)).toBe(createHash('sha256').update(canonicalJson(demo), 'utf8').digest('hex'));
    expect(designHash(demo)).toMatch(/^[0-9a-f]{64}$/u);
  });

  it('does not depend on field order or on how values were written, and changes with any value', () => {
    const reverseMembers = (value: unknown): unknown =>
      Array.isArray(value) ? value.map(reverseMembers) : typeof value === 'object' && value !== null ? Object.fromEntries(Object.entries(value).reverse().map(([k, v]) => [k, reverseMembers(v)])) : value;
    const reordered = reverseMembers(demoJson);
    expect(Object.keys(reordered as object)[0]).toBe('emissions');
    const engineering = JSON.parse(readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8')) as { stages: { elements: { part: Record<string, unknown> }[] }[] };
    engineering.stages[0]!.elements[0]!.part['capacitance'] = 1e-7;
    expect(designHash(requireDesign(reordered))).toBe(designHash(demo));
    expect(designHash(requireDesign(engineering))).toBe(designHash(demo));
    engineering.stages[0]!.elements[0]!.part['capacitance'] = 1.01e-7;
    expect(designHash(requireDesign(engineering))).not.toBe(designHash(demo));
  });
});
