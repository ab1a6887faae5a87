import { sha256 } from '@noble/hashes/sha2.js';
import { bytesToHex, utf8ToBytes } from '@noble/hashes/utils.js';
import type { Design } from '../model/design.ts';
import { canonicalJson } from './canonical-json.ts';

/**
 * The content hash that ties a report to its design: SHA-256 (FIPS 180-4) of the design's canonical
 * JSON (canonical-json.ts) as UTF-8, in lower-case hex. It is taken of the design as read and
 * validated (SI numbers, defaults filled in), so "4.7 mH" and 0.0047, or a different field order,
 * give the same hash, while any change of value gives another. Synchronous and the same in Node, the
 * worker and the page.
 */
export function designHash(design: Design): string {
  return sha256Hex(canonicalJson(design));
}

export function sha256Hex(text: string): string {
  return bytesToHex(sha256(utf8ToBytes(text)));
}
