import { readFileSync } from 'node:fs';
import { deflateRawSync, inflateRawSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { deflateCodec } from '../../src/client/compression.ts';
import { encodeDesignHash, encodeBase64Url } from '../../src/io/design-url.ts';
import { encodeShareLink, MAX_SHARE_LINK_CHARS, readShareLink } from '../../src/io/share-link.ts';

/**
 * The share link carries the design deflate-compressed (RFC 1951). The check on the format is
 * Node's own zlib (a general-purpose implementation, not ours): what the page packs, zlib unpacks,
 * and what zlib packs, the page reads.
 */

const demoText = readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8');
const demo = JSON.parse(demoText) as Record<string, unknown>;

describe('the share link', () => {
  it('round-trips a design exactly, and is much shorter than the plain form', async () => {
    const link = await encodeShareLink(demo, deflateCodec);
    if (!link.ok) throw new Error(link.reason);
    expect(link.hash).toMatch(/^#d=[A-Za-z0-9_-]+$/u);
    expect(link.hash.length).toBeLessThan(encodeDesignHash(demo).length / 2);
    const read = await readShareLink(link.hash, deflateCodec);
    expect(read.status).toBe('found');
    if (read.status === 'found') expect(read.document).toEqual(demo);
  });

  it('is raw deflate that zlib itself unpacks, and a zlib-packed link reads (RFC 1951)', async () => {
    const link = await encodeShareLink(demo, deflateCodec);
    if (!link.ok) throw new Error(link.reason);
    const base64 = link.hash.slice(3).replace(/-/gu, '+').replace(/_/gu, '/');
    expect(JSON.parse(inflateRawSync(Buffer.from(base64, 'base64')).toString('utf8'))).toEqual(demo);
    const byZlib = `#d=${encodeBase64Url(new Uint8Array(deflateRawSync(Buffer.from(JSON.stringify(demo)))))}`;
    const read = await readShareLink(byZlib, deflateCodec);
    expect(read.status).toBe('found');
  });

  it('still reads the older plain #design= links', async () => {
    const read = await readShareLink(encodeDesignHash(demo), deflateCodec);
    expect(read.status).toBe('found');
  });

  it('no design in the hash is not an error', async () => {
    expect((await readShareLink('', deflateCodec)).status).toBe('absent');
    expect((await readShareLink('#other=1', deflateCodec)).status).toBe('absent');
  });

  it('refuses a damaged link with a reason, whatever the damage', async () => {
    const link = await encodeShareLink(demo, deflateCodec);
    if (!link.ok) throw new Error(link.reason);
    for (const hash of [link.hash.slice(0, link.hash.length / 2), '#d=%%%', '#d=', `${link.hash}&d=AAAA`, '#d=AAAAAAAA']) {
      const read = await readShareLink(hash, deflateCodec);
      expect(read.status, hash).toBe('invalid');
      if (read.status === 'invalid') expect(read.error.issues[0]!.message.length).toBeGreaterThan(10);
    }
  });

  it('refuses to make a link too long to pass around, saying what to do instead', async () => {
    const big = { ...demo, description: Array.from({ length: 40_000 }, (_, i) => String.fromCharCode(0x4e00 + ((i * 7919) % 20000))).join('') };
    const link = await encodeShareLink(big, deflateCodec);
    expect(link.ok).toBe(false);
    if (!link.ok) expect(link.reason).toMatch(/share the design file/u);
    expect(MAX_SHARE_LINK_CHARS).toBeGreaterThan(10_000);
  });

  it('a link that unpacks to more than the size limit is refused, not unpacked whole', async () => {
    const bomb = `#d=${encodeBase64Url(new Uint8Array(deflateRawSync(Buffer.alloc(50_000_000, 0x20))))}`;
    const read = await readShareLink(bomb, deflateCodec);
    expect(read.status).toBe('invalid');
    if (read.status === 'invalid') expect(read.error.issues[0]!.message).toMatch(/could not be unpacked/u);
  });
});
