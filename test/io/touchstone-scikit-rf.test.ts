import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { convertNetworkPoint } from '../../src/io/network-conversion.ts';
import { formatLineIssue } from '../../src/io/text-issues.ts';
import { impedanceFromNetwork, type MeasurementFixture } from '../../src/io/touchstone.ts';
import { readTouchstone, type TouchstoneNetwork } from '../../src/io/touchstone-network.ts';

/**
 * The Touchstone files in fixtures/touchstone were made by scikit-rf 0.15.4 (Debian 12's
 * python3-scikit-rf) from invented parts: the library built each network and computed its
 * parameters, and wrote the version 1 S-parameter files itself (fixtures/touchstone/SOURCE.md,
 * scripts/touchstone/make-fixtures.py). Each `<file>.expected.json` holds what scikit-rf computes for
 * the same network. These tests read the files with chokepoint's reader and compare.
 */

interface ComplexColumns {
  readonly re: readonly number[];
  readonly im: readonly number[];
}

interface Expected {
  readonly library: string;
  readonly ports: number;
  readonly parameter: 'S' | 'Y' | 'Z';
  readonly frequencyHz: readonly number[];
  readonly matrix: ComplexColumns;
  readonly referenceOhm: ComplexColumns;
  readonly part?: ComplexColumns & { readonly fixture: MeasurementFixture };
  readonly y?: ComplexColumns;
}

const folder = new URL('../../fixtures/touchstone/', import.meta.url);
const files = readdirSync(folder)
  .filter((name) => name.endsWith('.expected.json'))
  .map((name) => name.slice(0, -'.expected.json'.length))
  .sort();

/** Relative difference of two complex numbers, against the larger of |expected| and `floor`. */
function relative(re: number, im: number, wantRe: number, wantIm: number, floor: number): number {
  return Math.hypot(re - wantRe, im - wantIm) / Math.max(Math.hypot(wantRe, wantIm), floor);
}

function read(name: string): TouchstoneNetwork {
  const result = readTouchstone(readFileSync(new URL(name, folder), 'utf8'), { fileName: name });
  if (!result.ok) throw new Error(`${name} was refused:\n${result.issues.map(formatLineIssue).join('\n')}`);
  return result.value;
}

describe('Touchstone files written with scikit-rf 0.15.4 read as scikit-rf reads them', () => {
  it('the fixture set covers one-ports, two-ports, a four-port, version 2, Z and Y data and port impedances in comments', () => {
    expect(files.length).toBeGreaterThanOrEqual(16);
    for (const pattern of [/\.s1p$/u, /\.s2p$/u, /\.s4p$/u, /\.ts$/u, /-z-/u, /-y-/u, /port-impedance-comments/u, /lower/u, /upper/u]) {
      expect(files.some((name) => pattern.test(name))).toBe(true);
    }
  });

  for (const name of files) {
    const expected = JSON.parse(readFileSync(new URL(`${name}.expected.json`, folder), 'utf8')) as Expected;

    it(`${name}: ports, frequencies, parameters and reference impedances agree with scikit-rf to 1e-9`, () => {
      expect(expected.library).toBe('scikit-rf 0.15.4');
      const network = read(name);
      expect(network.ports).toBe(expected.ports);
      expect(network.parameter).toBe(expected.parameter);
      expect(network.frequencyHz.length).toBe(expected.frequencyHz.length);
      network.frequencyHz.forEach((f, k) => expect(Math.abs(f / expected.frequencyHz[k]! - 1)).toBeLessThan(1e-12));
      // Entries far below the matrix's largest carry only the text's rounding: judge them against it.
      const largest = Math.max(...expected.matrix.re.map((re, at) => Math.hypot(re, expected.matrix.im[at]!)));
      let worst = 0;
      for (let at = 0; at < network.re.length; at += 1) {
        worst = Math.max(worst, relative(network.re[at]!, network.im[at]!, expected.matrix.re[at]!, expected.matrix.im[at]!, 1e-6 * largest));
      }
      expect(worst).toBeLessThan(1e-9);
      for (let at = 0; at < network.referenceRe.length; at += 1) {
        expect(relative(network.referenceRe[at]!, network.referenceIm[at]!, expected.referenceOhm.re[at]!, expected.referenceOhm.im[at]!, 1)).toBeLessThan(1e-12);
      }
    });

    const part = expected.part;
    if (part) {
      it(`${name}: the part's impedance (${part.fixture}) agrees with scikit-rf's to 1e-9`, () => {
        const result = impedanceFromNetwork(read(name), part.fixture);
        if (!result.ok) throw new Error(result.issues.map(formatLineIssue).join('\n'));
        const { table } = result.value;
        expect(table.frequencyHz.length).toBe(part.re.length);
        table.frequencyHz.forEach((_, k) => {
          const re = table.magnitudeOhm[k]! * Math.cos((table.phaseDeg[k]! * Math.PI) / 180);
          const im = table.magnitudeOhm[k]! * Math.sin((table.phaseDeg[k]! * Math.PI) / 180);
          expect(relative(re, im, part.re[k]!, part.im[k]!, 0)).toBeLessThan(1e-9);
        });
      });
    }

    const y = expected.y;
    if (y) {
      it(`${name}: S converted to Y at every frequency agrees with scikit-rf's Network.y to 1e-9`, () => {
        const network = read(name);
        const n = network.ports * network.ports;
        for (let k = 0; k < network.frequencyHz.length; k += 1) {
          const converted = convertNetworkPoint(network, k, 'Y');
          if (typeof converted === 'string') throw new Error(converted);
          const largest = Math.max(...Array.from({ length: n }, (_, at) => Math.hypot(y.re[k * n + at]!, y.im[k * n + at]!)));
          for (let at = 0; at < n; at += 1) {
            expect(relative(converted.re[at]!, converted.im[at]!, y.re[k * n + at]!, y.im[k * n + at]!, 1e-6 * largest)).toBeLessThan(1e-9);
          }
        }
      });
    }
  }
});
