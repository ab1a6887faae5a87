// node scripts/run-ts.mjs scripts/touchstone/compare-with-scikit-rf.ts REFERENCE.json
// Reads every file listed by scripts/touchstone/scikit-rf-reference.py with chokepoint's Touchstone
// reader and compares with what scikit-rf read: S-parameters and reference impedances, and the part
// impedance of one-ports (reflection) and two-ports (series-thru). Prints one line per file that does
// not agree to 1e-12 and a summary; a development aid (DEVELOPERS.md), not a test.
import { readFileSync } from 'node:fs';
import { basename } from 'node:path';
import { formatLineIssue } from '../../src/io/text-issues.ts';
import { impedanceFromNetwork } from '../../src/io/touchstone.ts';
import { readTouchstone, type TouchstoneNetwork } from '../../src/io/touchstone-network.ts';

interface Columns {
  readonly re: readonly number[];
  readonly im: readonly number[];
}

interface Reference {
  readonly path: string;
  readonly library: string;
  readonly ok: boolean;
  readonly error?: string;
  readonly ports?: number;
  readonly frequencyHz?: readonly number[];
  readonly s?: Columns;
  readonly referenceOhm?: Columns;
  readonly reflection?: Columns;
  readonly seriesThru?: Columns;
}

const references = JSON.parse(readFileSync(process.argv[2]!, 'utf8')) as Reference[];

function worstRelative(re: ArrayLike<number>, im: ArrayLike<number>, want: Columns, floor: number): number {
  let worst = 0;
  for (let at = 0; at < want.re.length; at += 1) {
    const size = Math.max(Math.hypot(want.re[at]!, want.im[at]!), floor);
    worst = Math.max(worst, Math.hypot(re[at]! - want.re[at]!, im[at]! - want.im[at]!) / size);
  }
  return worst;
}

function partWorst(network: TouchstoneNetwork, want: Columns, fixture: 'reflection' | 'series-thru'): number | string {
  const part = impedanceFromNetwork(network, fixture);
  if (!part.ok) return part.issues.slice(0, 1).map(formatLineIssue).join('');
  const { table } = part.value;
  // scikit-rf keeps a 0 Hz point; chokepoint leaves it out of a table.
  const offset = network.frequencyHz[0] === 0 ? 1 : 0;
  let worst = 0;
  table.frequencyHz.forEach((_, k) => {
    const re = table.magnitudeOhm[k]! * Math.cos((table.phaseDeg[k]! * Math.PI) / 180);
    const im = table.magnitudeOhm[k]! * Math.sin((table.phaseDeg[k]! * Math.PI) / 180);
    const wantRe = want.re[k + offset]!;
    const wantIm = want.im[k + offset]!;
    worst = Math.max(worst, Math.hypot(re - wantRe, im - wantIm) / Math.hypot(wantRe, wantIm));
  });
  return worst;
}

let read = 0;
let agreed = 0;
let worstAgreed = 0;
let parts = 0;
let partsAgreed = 0;
let worstPart = 0;
const refusals = new Map<string, number>();
for (const reference of references) {
  const name = basename(reference.path);
  if (!reference.ok) {
    process.stdout.write(`${name}: scikit-rf refuses it (${reference.error ?? ''})\n`);
    continue;
  }
  const result = readTouchstone(readFileSync(reference.path, 'latin1'), { fileName: name });
  if (!result.ok) {
    const why = result.issues.slice(0, 1).map(formatLineIssue).join('');
    process.stdout.write(`${name}: chokepoint refuses it: ${why}\n`);
    refusals.set('file', (refusals.get('file') ?? 0) + 1);
    continue;
  }
  read += 1;
  const network = result.value;
  const sLargest = Math.max(...reference.s!.re.map((re, at) => Math.hypot(re, reference.s!.im[at]!)));
  const sWorst = worstRelative(network.re, network.im, reference.s!, Math.max(1e-9 * sLargest, 1e-300));
  const zWorst = worstRelative(network.referenceRe, network.referenceIm, reference.referenceOhm!, 1e-9);
  const worst = Math.max(sWorst, zWorst);
  if (network.ports === reference.ports && worst <= 1e-12) {
    agreed += 1;
    worstAgreed = Math.max(worstAgreed, worst);
  } else {
    process.stdout.write(`${name}: ${network.ports} ports (scikit-rf ${reference.ports!}), S worst ${sWorst.toExponential(2)}, reference worst ${zWorst.toExponential(2)} (${network.referenceFrom})\n`);
  }
  const want = reference.reflection ?? reference.seriesThru;
  if (want) {
    parts += 1;
    const part = partWorst(network, want, reference.reflection ? 'reflection' : 'series-thru');
    if (typeof part === 'string') {
      const reason = /complex/u.test(part) ? 'complex reference impedance' : part;
      refusals.set(reason, (refusals.get(reason) ?? 0) + 1);
      if (!/complex/u.test(part)) process.stdout.write(`${name}: part refused: ${part}\n`);
    } else if (part <= 1e-9) {
      partsAgreed += 1;
      worstPart = Math.max(worstPart, part);
    } else {
      process.stdout.write(`${name}: part impedance worst ${part.toExponential(2)}\n`);
    }
  }
}
process.stdout.write(
  `${references.length} files (${references[0]?.library ?? ''}); chokepoint read ${read}; ${agreed} agree on S and references to 1e-12 (worst ${worstAgreed.toExponential(2)}); ` +
    `part impedance of ${parts} one- and two-ports: ${partsAgreed} agree to 1e-9 (worst ${worstPart.toExponential(2)}); refused: ${[...refusals].map(([why, n]) => `${n} × ${why}`).join(', ') || 'none'}\n`,
);
