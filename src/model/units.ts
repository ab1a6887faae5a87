/**
 * Engineering notation: the one place where typed text becomes an SI number and back.
 *
 * Accepted forms (case matters for prefixes, as in SI):
 *   "4.7e-3", "4.7 mH", "4m7", "100n", "2u2", "10 pF", "1meg", "4R7" (ohms), "150 kHz", "1 MHz".
 * Prefixes: f p n u µ m k K meg/MEG/Meg G T, and M only when a unit follows ("1 MHz", "2 MΩ").
 * A bare "M" ("1M", "4M7") is rejected: SPICE reads it as milli and SI as mega, so a value pasted
 * from a netlist would be off by 10^9 either way.
 */

export type UnitSymbol = 'H' | 'F' | 'Ω' | 'Hz' | 'V' | 'A' | 's' | 'W' | '';

export interface ParsedQuantity {
  readonly ok: true;
  readonly value: number;
}
export interface QuantityParseFailure {
  readonly ok: false;
  readonly reason: string;
}
export type QuantityParseResult = ParsedQuantity | QuantityParseFailure;

const PREFIX_EXPONENT: Readonly<Record<string, number>> = {
  f: -15,
  p: -12,
  n: -9,
  u: -6,
  µ: -6,
  μ: -6,
  m: -3,
  k: 3,
  K: 3,
  meg: 6,
  MEG: 6,
  Meg: 6,
  M: 6,
  G: 9,
  T: 12,
};

/** Unit spellings people type, mapped to the canonical symbol. */
const UNIT_ALIASES: Readonly<Record<string, UnitSymbol>> = {
  h: 'H',
  f: 'F',
  Ω: 'Ω',
  ω: 'Ω',
  ohm: 'Ω',
  ohms: 'Ω',
  r: 'Ω',
  hz: 'Hz',
  v: 'V',
  a: 'A',
  s: 's',
  w: 'W',
};

// number | RKM ("4m7", "4R7") followed by the rest (prefix and unit).
const DECIMAL = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/u;
const RKM = /^([+-]?\d+)(meg|MEG|Meg|[fpnuµμmkKMGTRr])(\d+)\s*(.*)$/u;

function canonicalUnit(text: string): UnitSymbol | undefined {
  if (text === '') return '';
  return UNIT_ALIASES[text.toLowerCase()] ?? UNIT_ALIASES[text];
}

function unitName(unit: UnitSymbol): string {
  return unit === '' ? 'no unit' : unit;
}

/**
 * Split the text after the number into an SI prefix and a unit: "mH" -> (m, H), "meg" -> (meg, none),
 * "F" -> (none, F). A lone prefix letter is a prefix ("100f" is 100 femto, as in SPICE), never a unit.
 */
function splitPrefixAndUnit(
  rest: string,
): { exponent: number; prefix: string; unit: UnitSymbol } | undefined {
  const loneExponent = PREFIX_EXPONENT[rest];
  if (loneExponent !== undefined) return { exponent: loneExponent, prefix: rest, unit: '' };
  const loneUnit = canonicalUnit(rest);
  if (loneUnit !== undefined) return { exponent: 0, prefix: '', unit: loneUnit };
  for (const prefix of PREFIXES_LONGEST_FIRST) {
    if (!rest.startsWith(prefix)) continue;
    const unitText = rest.slice(prefix.length).trim();
    const unit = unitText === '' ? undefined : canonicalUnit(unitText);
    const exponent = PREFIX_EXPONENT[prefix];
    if (unit !== undefined && exponent !== undefined) return { exponent, prefix, unit };
  }
  return undefined;
}

const PREFIXES_LONGEST_FIRST = Object.keys(PREFIX_EXPONENT).sort((a, b) => b.length - a.length);

/**
 * Parse a quantity typed by a person. `expected` is the unit of the field; a different unit in
 * the text ("10 pF" for an inductance) is an error, and so is any unknown suffix.
 */
export function parseQuantity(text: string, expected: UnitSymbol): QuantityParseResult {
  const trimmed = text.trim();
  if (trimmed === '') return { ok: false, reason: 'empty value' };

  const rkm = RKM.exec(trimmed);
  if (rkm) {
    const [, whole, marker, fraction, after] = rkm as unknown as [string, string, string, string, string];
    const isOhmMarker = marker === 'R' || marker === 'r';
    if (isOhmMarker && expected !== 'Ω') {
      return { ok: false, reason: `"${marker}" as a decimal point is for resistances only` };
    }
    if (marker === 'M' && after.trim() === '') {
      return ambiguousMega(trimmed);
    }
    const mantissa = Number(`${whole}.${fraction}`);
    const exponent = isOhmMarker ? 0 : (PREFIX_EXPONENT[marker] ?? 0);
    const unitText = after.trim();
    const unit = canonicalUnit(unitText);
    if (unit === undefined) return { ok: false, reason: `unknown unit "${unitText}"` };
    if (unit !== '' && unit !== expected) {
      return { ok: false, reason: `expected ${unitName(expected)}, got ${unit}` };
    }
    return finish(mantissa * 10 ** exponent, trimmed);
  }

  const decimal = DECIMAL.exec(trimmed);
  if (!decimal) return { ok: false, reason: `"${trimmed}" is not a number` };
  const mantissa = Number(decimal[1]);
  const rest = (decimal[2] ?? '').trim();
  if (rest === '') return finish(mantissa, trimmed);
  if (rest === 'M') return ambiguousMega(trimmed);
  if (expected === 'Ω' && (rest === 'R' || rest === 'r')) return finish(mantissa, trimmed);

  const split = splitPrefixAndUnit(rest);
  if (!split) return { ok: false, reason: `unknown unit or prefix "${rest}"` };
  if (split.prefix === 'M' && split.unit === '') return ambiguousMega(trimmed);
  if (split.unit !== '' && split.unit !== expected) {
    return { ok: false, reason: `expected ${unitName(expected)}, got ${split.unit}` };
  }
  return finish(mantissa * 10 ** split.exponent, trimmed);
}

function ambiguousMega(text: string): QuantityParseFailure {
  return {
    ok: false,
    reason: `"${text}" is ambiguous: write "m" for milli or "meg" for mega (a bare "M" means milli in SPICE and mega in SI)`,
  };
}

function finish(value: number, text: string): QuantityParseResult {
  if (!Number.isFinite(value)) return { ok: false, reason: `"${text}" is not a finite number` };
  // Repair the binary noise of mantissa * 10^exponent ("4.7" * 1e-3 → 0.0047000000000000002).
  return { ok: true, value: Number(value.toPrecision(15)) };
}

const FORMAT_PREFIXES: readonly { exponent: number; symbol: string }[] = [
  { exponent: 12, symbol: 'T' },
  { exponent: 9, symbol: 'G' },
  { exponent: 6, symbol: 'M' },
  { exponent: 3, symbol: 'k' },
  { exponent: 0, symbol: '' },
  { exponent: -3, symbol: 'm' },
  { exponent: -6, symbol: 'µ' },
  { exponent: -9, symbol: 'n' },
  { exponent: -12, symbol: 'p' },
  { exponent: -15, symbol: 'f' },
];

/**
 * Format an SI value with an engineering prefix: formatQuantity(0.0047, 'H') === "4.7 mH".
 * `significantDigits` bounds the mantissa; trailing zeros are dropped. Without a unit a mega
 * value is written "meg" so that the text parses back unambiguously.
 */
export function formatQuantity(value: number, unit: UnitSymbol, significantDigits = 4): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return unit === '' ? '0' : `0 ${unit}`;
  const magnitude = Math.abs(value);
  const exponent = Math.floor(Math.log10(magnitude) / 3) * 3;
  const choice =
    FORMAT_PREFIXES.find((p) => p.exponent <= exponent) ?? FORMAT_PREFIXES[FORMAT_PREFIXES.length - 1]!;
  let mantissa = Number((value / 10 ** choice.exponent).toPrecision(significantDigits));
  let prefix = choice;
  // Rounding can carry 999.95 up to 1000: move to the next prefix.
  if (Math.abs(mantissa) >= 1000 && prefix.exponent < 12) {
    prefix = FORMAT_PREFIXES.find((p) => p.exponent === choice.exponent + 3)!;
    mantissa = Number((value / 10 ** prefix.exponent).toPrecision(significantDigits));
  }
  const symbol = unit === '' && prefix.symbol === 'M' ? 'meg' : prefix.symbol;
  const suffix = `${symbol}${unit}`;
  return suffix === '' ? String(mantissa) : `${mantissa} ${suffix}`;
}
