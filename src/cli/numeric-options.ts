import { parseDecimal } from '../io/decimal-number.ts';
import type { ParsedArgs } from './args.ts';
import { UsageError } from './exit-codes.ts';

/**
 * Numbers given as options, each checked on its own and named when it is wrong. JavaScript's
 * Number() would read "0x10" as 16, "" as 0 and "Infinity" as a number; an option takes only what a
 * person writes: a plain decimal ("6", "-3.5", "1e-3"), or for counts a whole number written plainly
 * ("10", not "1e1" or "10.0").
 */

export interface DecimalOption {
  readonly min: number;
  readonly max: number;
  /** A unit the value may carry after it, matched without case ("dB" in "6 dB"). */
  readonly unit?: RegExp;
}

/** A plain decimal within bounds, or undefined when the option was not given. */
export function readDecimalOption(args: ParsedArgs, name: string, command: string, spec: DecimalOption): number | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const bare = spec.unit ? text.trim().replace(spec.unit, '') : text.trim();
  const value = parseDecimal(bare);
  if (value === undefined) {
    throw new UsageError(`--${name} must be a plain decimal number (such as 6, -3.5 or 1e-3), got "${text}"`, command);
  }
  if (!(value >= spec.min && value <= spec.max)) throw new UsageError(`--${name} must be from ${spec.min} to ${spec.max}, got ${bare}`, command);
  return value;
}

const WHOLE = /^\d+$/u;

/** A whole number written plainly (digits only) within bounds, or undefined when the option was not given. */
export function readWholeOption(args: ParsedArgs, name: string, command: string, min: number, max: number): number | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const trimmed = text.trim();
  const value = WHOLE.test(trimmed) ? Number(trimmed) : Number.NaN;
  if (!(Number.isSafeInteger(value) && value >= min && value <= max)) {
    throw new UsageError(`--${name} must be a whole number from ${min} to ${max}, written with digits only, got "${text}"`, command);
  }
  return value;
}
