import type { z } from 'zod';
import { quantityInfo, type QuantityRule } from './quantity-field.ts';
import type { UnitSymbol } from './units.ts';

/**
 * What an editor needs to know about an object of the design schema, read from the schema itself:
 * its fields in order, each with its type, unit, default and allowed values. The page's part editor
 * is generated from this, so a field added to the schema is editable without a hand-written form.
 * Only what zod already states is reported; labels and hints are the page's business.
 */

type Schema = z.core.$ZodType;
type Def = z.core.$ZodTypes['_zod']['def'];

export type FieldType =
  | { readonly type: 'quantity'; readonly unit: UnitSymbol; readonly rule: QuantityRule }
  | { readonly type: 'number'; readonly integer: boolean; readonly min: number | undefined; readonly max: number | undefined; readonly exclusiveMin: boolean; readonly exclusiveMax: boolean }
  | { readonly type: 'boolean' }
  | { readonly type: 'text'; readonly maxLength: number | undefined }
  | { readonly type: 'choice'; readonly values: readonly string[] }
  | { readonly type: 'literal'; readonly value: unknown }
  | { readonly type: 'object'; readonly schema: Schema }
  /** A discriminated union on `kind`: one object schema per kind. */
  | { readonly type: 'kinds'; readonly options: ReadonlyMap<string, Schema> }
  | { readonly type: 'list'; readonly element: Schema }
  | { readonly type: 'other' };

export type Presence =
  | { readonly kind: 'required' }
  | { readonly kind: 'default'; readonly value: unknown }
  | { readonly kind: 'optional' };

export interface FieldDescription {
  readonly name: string;
  readonly field: FieldType;
  readonly presence: Presence;
}

function defOf(schema: Schema): Def {
  return (schema as z.core.$ZodTypes)._zod.def;
}

/** Strip default/optional (and pipe-free) wrappers; say which one was there. */
export function unwrapField(schema: Schema): { inner: Schema; presence: Presence } {
  const def = defOf(schema);
  if (def.type === 'default' || def.type === 'prefault') {
    const value: unknown = typeof def.defaultValue === 'function' ? (def.defaultValue as () => unknown)() : def.defaultValue;
    return { inner: unwrapField(def.innerType).inner, presence: { kind: 'default', value } };
  }
  if (def.type === 'optional') return { inner: unwrapField(def.innerType).inner, presence: { kind: 'optional' } };
  if (def.type === 'readonly' || def.type === 'nonoptional') return unwrapField(def.innerType);
  return { inner: schema, presence: { kind: 'required' } };
}

/** The object schema under refinements (superRefine keeps the object; a pipe holds it as `in`). */
export function objectSchemaOf(schema: Schema): Schema | undefined {
  const def = defOf(schema);
  if (def.type === 'object') return schema;
  if (def.type === 'pipe') return objectSchemaOf(def.in);
  if (def.type === 'default' || def.type === 'optional' || def.type === 'readonly') return objectSchemaOf(def.innerType);
  return undefined;
}

/** Describe one (unwrapped) field schema. */
export function describeField(inner: Schema): FieldType {
  const quantity = quantityInfo(inner);
  if (quantity) return { type: 'quantity', unit: quantity.unit, rule: quantity.rule };
  const def = defOf(inner);
  switch (def.type) {
    case 'number': {
      // The bounds as the checks state them (zod fills its own summary lazily, on first use).
      let min: number | undefined;
      let max: number | undefined;
      let exclusiveMin = false;
      let exclusiveMax = false;
      let integer = false;
      for (const check of checksOf(def)) {
        if (check.check === 'greater_than' && typeof check.value === 'number') {
          min = check.value;
          exclusiveMin = check.inclusive !== true;
        } else if (check.check === 'less_than' && typeof check.value === 'number') {
          max = check.value;
          exclusiveMax = check.inclusive !== true;
        } else if (check.check === 'number_format') integer = true;
      }
      return { type: 'number', integer, min, max, exclusiveMin, exclusiveMax };
    }
    case 'boolean':
      return { type: 'boolean' };
    case 'string': {
      let maxLength: number | undefined;
      for (const check of checksOf(def)) if (check.check === 'max_length' && typeof check.maximum === 'number') maxLength = check.maximum;
      return { type: 'text', maxLength };
    }
    case 'enum':
      return { type: 'choice', values: Object.values(def.entries).map(String) };
    case 'literal':
      return { type: 'literal', value: def.values[0] };
    case 'array':
      return { type: 'list', element: def.element };
    case 'union': {
      const options = new Map<string, Schema>();
      for (const option of def.options) {
        const object = objectSchemaOf(option);
        const kind = object ? kindOf(object) : undefined;
        if (object && kind !== undefined) options.set(kind, object);
      }
      return options.size === def.options.length ? { type: 'kinds', options } : { type: 'other' };
    }
    case 'object':
      return { type: 'object', schema: inner };
    case 'pipe': {
      const object = objectSchemaOf(inner);
      return object ? { type: 'object', schema: object } : { type: 'other' };
    }
    default:
      return { type: 'other' };
  }
}

interface CheckDef {
  readonly check: string;
  readonly value?: unknown;
  readonly inclusive?: boolean;
  readonly maximum?: unknown;
}

function checksOf(def: Def): readonly CheckDef[] {
  const checks = (def as { checks?: readonly { _zod: { def: CheckDef } }[] }).checks ?? [];
  return checks.map((check) => check._zod.def);
}

/** The `kind` literal of an object schema, if it has one. */
export function kindOf(objectSchema: Schema): string | undefined {
  const def = defOf(objectSchema);
  if (def.type !== 'object') return undefined;
  const kind = def.shape['kind'];
  if (!kind) return undefined;
  const kindDef = defOf(unwrapField(kind).inner);
  return kindDef.type === 'literal' && typeof kindDef.values[0] === 'string' ? kindDef.values[0] : undefined;
}

/** Every field of an object schema, in the schema's order. */
export function fieldsOf(schema: Schema): readonly FieldDescription[] {
  const object = objectSchemaOf(schema);
  if (!object) return [];
  const def = defOf(object);
  if (def.type !== 'object') return [];
  return Object.entries(def.shape).map(([name, field]) => {
    const { inner, presence } = unwrapField(field);
    return { name, field: describeField(inner), presence };
  });
}
