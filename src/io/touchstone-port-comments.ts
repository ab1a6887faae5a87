import { type Complex, complex } from './complex.ts';
import { parseDecimal } from './decimal-number.ts';

/**
 * Port reference impedances that some exporters write in comments instead of (or beside) the
 * option line's R. The conventions read here, each seen in files written by real tools:
 *
 * - `! Port Impedance <re> <im> <re> <im> …` after each frequency's record: the impedance of every
 *   port at that frequency (field-solver exports whose option line has no R, "Data is not
 *   renormalized"); the numbers may follow the words without a blank and, for many ports, go on
 *   over further comment lines that hold numbers only.
 * - `! Port[1] = 50+j0`: one port's impedance in the header. Such lines also carry port *names*
 *   (`! Port[1] = WavePort1:1`, `! Port[2] = 2`), so a value counts only when it reads as an
 *   impedance: with an imaginary part written with j (`50+j0`, `50-j1.5`, `50+0j`) or a unit
 *   (`50 Ohm`, `50 Ω`); a bare number is a name.
 * - `! PortZ Port1:100+j0 Port2:50+j0`: a network analyser's note of the port impedances it
 *   renormalised to.
 */

/** One comment's reading: a header-level impedance of one port, of all ports, or numbers that continue a list. */
export type PortComment =
  | { readonly kind: 'port-impedance-list'; readonly numbers: readonly number[] }
  | { readonly kind: 'port-impedance'; readonly port: number; readonly impedance: Complex }
  | { readonly kind: 'port-impedance-set'; readonly impedances: ReadonlyMap<number, Complex> }
  | { readonly kind: 'numbers'; readonly numbers: readonly number[] };

const LIST = /^\s*port\s+impedance\s*(.*)$/iu;
const PORT_INDEX = /^\s*port\s*\[\s*(\d+)\s*\]\s*=\s*(.+?)\s*$/iu;
const PORTZ = /^\s*portz\s+(.*)$/iu;
const PORTZ_ENTRY = /^port\s*(\d+)\s*:\s*(.+)$/iu;
const NUMBERS_ONLY = /^[\s\d.eE+-]+$/u;

/** What a comment (the text after "!") says about port impedances, if anything. */
export function readPortComment(text: string): PortComment | undefined {
  const list = LIST.exec(text);
  if (list) {
    const numbers = readNumbers(list[1]!);
    return numbers === undefined ? undefined : { kind: 'port-impedance-list', numbers };
  }
  const indexed = PORT_INDEX.exec(text);
  if (indexed) {
    const impedance = readStatedImpedance(indexed[2]!);
    return impedance === undefined ? undefined : { kind: 'port-impedance', port: Number(indexed[1]), impedance };
  }
  const portz = PORTZ.exec(text);
  if (portz) {
    const impedances = new Map<number, Complex>();
    for (const entry of portz[1]!.trim().split(/\s+/u)) {
      const found = PORTZ_ENTRY.exec(entry);
      const impedance = found ? readStatedImpedance(found[2]!, true) : undefined;
      if (!found || impedance === undefined) return undefined;
      impedances.set(Number(found[1]), impedance);
    }
    return impedances.size === 0 ? undefined : { kind: 'port-impedance-set', impedances };
  }
  if (NUMBERS_ONLY.test(text) && text.trim() !== '') {
    const numbers = readNumbers(text);
    return numbers === undefined ? undefined : { kind: 'numbers', numbers };
  }
  return undefined;
}

function readNumbers(text: string): number[] | undefined {
  const tokens = text.trim().split(/\s+/u).filter((token) => token !== '');
  const numbers: number[] = [];
  for (const token of tokens) {
    const value = parseDecimal(token);
    if (value === undefined) return undefined;
    numbers.push(value);
  }
  return numbers.length > 0 ? numbers : undefined;
}

const UNSIGNED = String.raw`(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?`;
const NUMBER = `[+-]?${UNSIGNED}`;
const UNIT = String.raw`(?:\s*(?:ohms?|Ω))?`;
const J_FIRST = new RegExp(String.raw`^(${NUMBER})\s*([+-])\s*j\s*(${UNSIGNED})${UNIT}$`, 'iu');
const J_AFTER = new RegExp(String.raw`^(${NUMBER})\s*([+-])\s*(${UNSIGNED})\s*j${UNIT}$`, 'iu');
const WITH_UNIT = new RegExp(String.raw`^(${NUMBER})\s*(?:ohms?|Ω)$`, 'iu');
const BARE = new RegExp(String.raw`^(${NUMBER})$`, 'u');

/**
 * "50+j0", "50-j1.5", "50+0j", "50 Ohm", "75Ω" as an impedance in ohms; undefined for anything else
 * (a port name). A bare number counts only where the convention has no names (`bareNumber`).
 */
export function readStatedImpedance(text: string, bareNumber = false): Complex | undefined {
  const trimmed = text.trim();
  const imaginary = J_FIRST.exec(trimmed) ?? J_AFTER.exec(trimmed);
  if (imaginary) {
    const re = Number(imaginary[1]);
    const im = Number(imaginary[3]) * (imaginary[2] === '-' ? -1 : 1);
    return Number.isFinite(re) && Number.isFinite(im) ? complex(re, im) : undefined;
  }
  const real = WITH_UNIT.exec(trimmed) ?? (bareNumber ? BARE.exec(trimmed) : null);
  if (real) {
    const re = Number(real[1]);
    return Number.isFinite(re) ? complex(re) : undefined;
  }
  return undefined;
}
