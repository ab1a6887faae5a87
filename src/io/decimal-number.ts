const DOT_DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/u;
const COMMA_DECIMAL = /^[+-]?(?:\d+(?:,\d*)?|,\d+)(?:[eE][+-]?\d+)?$/u;

/**
 * A plain decimal number as measurement files write it: "1.5e6", "-12.25", "+3", ".5".
 * With `decimalComma`, "12,5" reads as 12.5 as well (files from locales that write a comma);
 * thousands separators, units, "NaN" and "Infinity" are refused (undefined).
 */
export function parseDecimal(text: string, decimalComma = false): number | undefined {
  const trimmed = text.trim();
  let normal: string;
  if (DOT_DECIMAL.test(trimmed)) normal = trimmed;
  else if (decimalComma && COMMA_DECIMAL.test(trimmed)) normal = trimmed.replace(',', '.');
  else return undefined;
  const value = Number(normal);
  return Number.isFinite(value) ? value : undefined;
}

/** Quote a field's text for a message, shortened when long. */
export function quoteField(text: string): string {
  const trimmed = text.trim();
  return JSON.stringify(trimmed.length > 30 ? `${trimmed.slice(0, 30)}…` : trimmed);
}
