import { z } from 'zod';
import { parseQuantity, type UnitSymbol } from './units.ts';

/** What values a physical field may take. */
export type QuantityRule = 'positive' | 'non-negative';

const RULE_TEXT: Record<QuantityRule, string> = {
  positive: 'a positive',
  'non-negative': 'a zero or positive',
};

function unitText(unit: UnitSymbol): string {
  return unit === '' ? '' : ` in ${unit}`;
}

/**
 * Read one physical value from a design file: a JSON number in SI units, or text in engineering
 * notation with an optional unit ("4.7 mH", "100n", "2u2"). Rejects NaN, infinities, wrong units
 * and values outside the rule, with a message that says what was expected.
 */
function readQuantity(input: unknown, unit: UnitSymbol, rule: QuantityRule, ctx: z.RefinementCtx): number {
  const expected = `${RULE_TEXT[rule]} number${unitText(unit)}`;
  let value: number;
  if (typeof input === 'number') {
    if (!Number.isFinite(input)) {
      ctx.addIssue({ code: 'custom', message: `expected ${expected}, got ${String(input)}`, params: { code: 'not-finite' } });
      return z.NEVER;
    }
    value = input;
  } else if (typeof input === 'string') {
    const parsed = parseQuantity(input, unit);
    if (!parsed.ok) {
      ctx.addIssue({ code: 'custom', message: `cannot read "${input}": ${parsed.reason}`, params: { code: 'bad-quantity' } });
      return z.NEVER;
    }
    value = parsed.value;
  } else if (input === undefined) {
    ctx.addIssue({ code: 'custom', message: `missing: expected ${expected}`, params: { code: 'missing-field' } });
    return z.NEVER;
  } else {
    ctx.addIssue({
      code: 'custom',
      message: `expected ${expected} or text such as "4.7 m${unit}", got ${input === null ? 'null' : typeof input}`,
      params: { code: 'wrong-type' },
    });
    return z.NEVER;
  }
  const inRange = rule === 'positive' ? value > 0 : value >= 0;
  if (!inRange) {
    ctx.addIssue({ code: 'custom', message: `expected ${expected}, got ${value}`, params: { code: 'out-of-range' } });
    return z.NEVER;
  }
  return value;
}

/** What a quantity field reads: its SI unit and the values it allows. */
export interface QuantityInfo {
  readonly unit: UnitSymbol;
  readonly rule: QuantityRule;
}

// quantity() schemas are transforms, which zod cannot describe; editors and docs look them up here.
const QUANTITY_INFO = new WeakMap<object, QuantityInfo>();

/** The unit and rule of a schema made by quantity(), or undefined for any other schema. */
export function quantityInfo(schema: z.core.$ZodType): QuantityInfo | undefined {
  return QUANTITY_INFO.get(schema);
}

/** A required physical field. */
export function quantity(unit: UnitSymbol, rule: QuantityRule = 'positive') {
  const schema = z.unknown().transform((input, ctx) => readQuantity(input, unit, rule, ctx));
  QUANTITY_INFO.set(schema, { unit, rule });
  return schema;
}

/** An optional physical field that reads as `fallback` when absent (parasitics default to zero). */
export function quantityOr(fallback: number, unit: UnitSymbol, rule: QuantityRule = 'non-negative') {
  return quantity(unit, rule).default(fallback);
}

/** An optional physical field that stays undefined when absent (ratings not yet known). */
export function optionalQuantity(unit: UnitSymbol, rule: QuantityRule = 'positive') {
  return quantity(unit, rule).optional();
}
