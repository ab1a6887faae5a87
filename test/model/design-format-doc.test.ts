import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { capacitorSchema, designSchema, PLACEMENTS } from '../../src/model/design-schema.ts';
import { quantity } from '../../src/model/quantity-field.ts';
import { parseQuantity, type UnitSymbol } from '../../src/model/units.ts';

/**
 * Keeps docs/design-format.md in step with the schema in src/model/design-schema.ts. The test walks
 * the zod schema itself (objects, discriminated unions and the default/optional/pipe wrappers), so a
 * field, a part kind or a placement added to the schema fails here until it is documented.
 *
 * How the page is read:
 * - Each schema object is documented under one heading. An object with a `kind` is found by that
 *   kind in backticks (`capacitor`); any other object by the key it sits under (`frequencyPlan`,
 *   `stages[]`, also as the end of a dotted name such as `measured.table`); the design object itself
 *   by "Top level".
 * - Directly under that heading, a table whose first header cell is "field" lists one row per field:
 *   | field | type | unit | required / default | allowed | meaning |. Rows are checked both ways, and
 *   the type, unit, required/default and allowed cells are checked against what the schema does.
 */

const DOC_URL = new URL('../../docs/design-format.md', import.meta.url);
const VALIDATION_ERROR_URL = new URL('../../src/model/validation-error.ts', import.meta.url);
const doc = readFileSync(DOC_URL, 'utf8');

// ---- The schema, walked ---------------------------------------------------------------------

type Schema = z.core.$ZodType;

interface FieldInfo {
  readonly name: string;
  readonly schema: Schema;
  /** 'required', or 'default' with its value, or 'optional' (absent stays absent). */
  readonly presence: { readonly kind: 'required' } | { readonly kind: 'default'; readonly value: unknown } | { readonly kind: 'optional' };
  /** For a physical value read by quantity(): its unit ('' for a plain ratio). */
  readonly quantityUnit: UnitSymbol | undefined;
}

interface SchemaObject {
  /** Where the walk first met it: "stages[].elements[].part<capacitor>". */
  readonly where: string;
  /** The value of its `kind` literal, if it has one. */
  readonly kind: string | undefined;
  /** The key it sits under ("frequencyPlan", "stages[]"); '' for the root. */
  readonly key: string;
  readonly fields: readonly FieldInfo[];
}

interface Catalogue {
  readonly objects: SchemaObject[];
  readonly fieldNames: Set<string>;
  readonly kinds: Set<string>;
  /** Values of enums: placements, safety classes, origin formats. */
  readonly choices: Map<string, Set<string>>;
  /** Literal values other than kinds ("chokepoint-design", 1). */
  readonly literals: Set<string>;
}

const UNITS: readonly UnitSymbol[] = ['H', 'F', 'Ω', 'Hz', 'V', 'A', 's', 'W'];

function defOf(schema: Schema): z.core.$ZodTypes['_zod']['def'] {
  return (schema as z.core.$ZodTypes)._zod.def;
}

/** Strip default/optional wrappers; say which one was there. */
function unwrap(schema: Schema): { inner: Schema; presence: FieldInfo['presence'] } {
  const def = defOf(schema);
  if (def.type === 'default') {
    const value: unknown = typeof def.defaultValue === 'function' ? (def.defaultValue as () => unknown)() : def.defaultValue;
    return { inner: unwrap(def.innerType).inner, presence: { kind: 'default', value } };
  }
  if (def.type === 'optional') return { inner: unwrap(def.innerType).inner, presence: { kind: 'optional' } };
  return { inner: schema, presence: { kind: 'required' } };
}

/** quantity() is z.unknown().transform(...): find its unit by asking it. */
function quantityUnitOf(inner: Schema): UnitSymbol | undefined {
  const def = defOf(inner);
  if (def.type !== 'pipe' || defOf(def.in).type !== 'unknown' || defOf(def.out).type !== 'transform') return undefined;
  const unit = UNITS.find((symbol) => z.safeParse(inner, `1 ${symbol}`).success);
  if (unit !== undefined) return unit;
  return z.safeParse(inner, '1').success ? '' : undefined;
}

function literalValues(schema: Schema): readonly unknown[] {
  const def = defOf(unwrap(schema).inner);
  return def.type === 'literal' ? def.values : [];
}

function catalogue(root: Schema): Catalogue {
  const result: Catalogue = { objects: [], fieldNames: new Set(), kinds: new Set(), choices: new Map(), literals: new Set() };
  const seen = new Set<Schema>();

  const visit = (schema: Schema, where: string, key: string): void => {
    const def = defOf(schema);
    switch (def.type) {
      case 'object': {
        if (seen.has(schema)) return;
        seen.add(schema);
        const kindSchema = def.shape['kind'];
        const kindValue = kindSchema ? literalValues(kindSchema)[0] : undefined;
        const kind = typeof kindValue === 'string' ? kindValue : undefined;
        const here = kind === undefined ? where : `${where}<${kind}>`;
        const fields = Object.entries(def.shape).map(([name, field]): FieldInfo => {
          const { inner, presence } = unwrap(field);
          return { name, schema: field, presence, quantityUnit: quantityUnitOf(inner) };
        });
        result.objects.push({ where: here === '' ? '(top level)' : here, kind, key, fields });
        for (const [name, field] of Object.entries(def.shape)) {
          result.fieldNames.add(name);
          visit(field, here === '' ? name : `${here}.${name}`, name);
        }
        return;
      }
      case 'union':
        for (const option of def.options) visit(option, where, key);
        return;
      case 'array':
        visit(def.element, `${where}[]`, `${key}[]`);
        return;
      case 'default':
      case 'prefault':
      case 'optional':
      case 'nullable':
      case 'nonoptional':
      case 'readonly':
      case 'catch':
        visit(def.innerType, where, key);
        return;
      case 'pipe':
        visit(def.in, where, key);
        visit(def.out, where, key);
        return;
      case 'lazy':
        visit(def.getter(), where, key);
        return;
      case 'literal':
        for (const value of def.values) (key === 'kind' ? result.kinds : result.literals).add(String(value));
        return;
      case 'enum': {
        const values = result.choices.get(key) ?? new Set<string>();
        for (const value of Object.values(def.entries)) values.add(String(value));
        result.choices.set(key, values);
        return;
      }
      case 'string':
      case 'number':
      case 'boolean':
      case 'unknown':
      case 'transform':
        return;
      default:
        // A new kind of schema could hide fields from this walk: teach the walk about it first.
        throw new Error(`the design-format doc check does not know zod type "${def.type}" (at ${where || 'the top level'})`);
    }
  };
  visit(root, '', '');
  return result;
}

// ---- The page, read -------------------------------------------------------------------------

interface Section {
  readonly heading: string;
  readonly line: number;
  /** Text from the heading to the next heading of any level. */
  readonly own: string;
}

function sectionsOf(markdown: string): Section[] {
  const sections: { heading: string; line: number; lines: string[] }[] = [];
  let fenced = false;
  markdown.split('\n').forEach((text, index) => {
    if (/^\s*```/u.test(text)) fenced = !fenced;
    if (!fenced && /^#{1,6}\s/u.test(text)) sections.push({ heading: text, line: index + 1, lines: [] });
    else sections.at(-1)?.lines.push(text);
  });
  return sections.map(({ heading, line, lines }) => ({ heading, line, own: lines.join('\n') }));
}

/** Cells of a markdown table row; "\|" inside a cell is not a separator. */
function cellsOf(row: string): string[] {
  return row
    .trim()
    .replace(/^\|/u, '')
    .replace(/\|$/u, '')
    .split(/(?<!\\)\|/u)
    .map((cell) => cell.trim());
}

/** Tables in `text` as header cells and body rows. */
function tablesOf(text: string): { header: string[]; rows: string[][] }[] {
  const tables: { header: string[]; rows: string[][] }[] = [];
  let current: string[] = [];
  const flush = (): void => {
    if (current.length >= 2) tables.push({ header: cellsOf(current[0]!), rows: current.slice(2).map(cellsOf) });
    current = [];
  };
  for (const line of text.split('\n')) {
    if (line.trim().startsWith('|')) current.push(line);
    else flush();
  }
  flush();
  return tables;
}

/** Rows of the "field" tables in a section, by the field named in backticks in the first cell. */
function fieldRows(section: Section): Map<string, string[]> {
  const rows = new Map<string, string[]>();
  for (const table of tablesOf(section.own)) {
    if (table.header[0] !== 'field') continue;
    for (const row of table.rows) {
      const name = /^`([^`]+)`$/u.exec(row[0] ?? '')?.[1];
      if (name !== undefined) rows.set(name, row);
    }
  }
  return rows;
}

function withoutFencedBlocks(markdown: string): string {
  return markdown.replace(/^\s*```[^\n]*\n[\s\S]*?^\s*```\s*$/gmu, '');
}

function backticked(text: string): string[] {
  return [...text.matchAll(/`([^`]+)`/gu)].map((match) => match[1]!);
}

/** The heading that documents an object (see the comment at the top). */
function headingFor(object: SchemaObject, sections: readonly Section[]): Section | undefined {
  if (object.kind !== undefined) return sections.find((s) => backticked(s.heading).includes(object.kind!));
  if (object.key === '') return sections.find((s) => /top level/iu.test(s.heading));
  return sections.find((s) => backticked(s.heading).some((span) => span === object.key || span.endsWith(`.${object.key}`)));
}

function describeObject(object: SchemaObject): string {
  return object.kind === undefined ? object.where : `\`${object.kind}\` (${object.where})`;
}

const COLUMN = { type: 1, unit: 2, presence: 3, allowed: 4 } as const;

/** Every way the page and the schema disagree, one line each; empty when they agree. */
function docProblems(markdown: string, schema: Catalogue): string[] {
  const problems: string[] = [];
  const sections = sectionsOf(markdown);
  const documentedAt = new Map<Section, SchemaObject[]>();

  for (const object of schema.objects) {
    const section = headingFor(object, sections);
    if (!section) {
      problems.push(`no heading documents ${describeObject(object)}`);
      continue;
    }
    documentedAt.set(section, [...(documentedAt.get(section) ?? []), object]);
    const rows = fieldRows(section);
    for (const field of object.fields) {
      const row = rows.get(field.name);
      const where = `field \`${field.name}\` of ${describeObject(object)}`;
      if (!row) {
        problems.push(`${where} has no row in the field table under "${section.heading}" (line ${section.line})`);
        continue;
      }
      problems.push(...rowProblems(where, field, row));
    }
  }

  for (const [section, objects] of documentedAt) {
    const rows = fieldRows(section);
    const known = new Set(objects.flatMap((object) => object.fields.map((field) => field.name)));
    for (const name of rows.keys()) {
      if (!known.has(name)) problems.push(`"${section.heading}" (line ${section.line}) lists \`${name}\`, which the schema does not have there`);
    }
  }

  // A value may be written bare (`X2`) or as the JSON text (`"X2"`).
  const everywhere = new Set(backticked(withoutFencedBlocks(markdown)).map((span) => span.replace(/^"(.*)"$/u, '$1')));
  const mention = (what: string, value: string): void => {
    if (!everywhere.has(value)) problems.push(`${what} \`${value}\` is not mentioned (in backticks)`);
  };
  for (const name of schema.fieldNames) mention('field', name);
  for (const kind of schema.kinds) mention('kind', kind);
  for (const literal of schema.literals) mention('literal value', literal);
  for (const [key, values] of schema.choices) for (const value of values) mention(`choice of \`${key}\``, value);

  const placements = schema.choices.get('placement') ?? new Set<string>();
  const placementRows = new Set(
    tablesOf(markdown)
      .filter((table) => table.header[0] === 'placement')
      .flatMap((table) => table.rows.map((row) => /^`([^`]+)`$/u.exec(row[0] ?? '')?.[1])),
  );
  for (const placement of placements) {
    if (!placementRows.has(placement)) problems.push(`placement \`${placement}\` has no row in the placement table`);
  }
  return problems;
}

/** Field tables under headings that no schema object maps to: a renamed key or kind, say. */
function orphanFieldTables(markdown: string, schema: Catalogue): string[] {
  const sections = sectionsOf(markdown);
  const used = new Set(schema.objects.map((object) => headingFor(object, sections)));
  return sections
    .filter((section) => !used.has(section) && fieldRows(section).size > 0)
    .map((section) => `"${section.heading}" (line ${section.line}) has a field table but documents no schema object`);
}

/** The type, unit, required/default and allowed cells of one row against the schema field. */
function rowProblems(where: string, field: FieldInfo, row: readonly string[]): string[] {
  const problems: string[] = [];
  const type = row[COLUMN.type] ?? '';
  const unitCell = (row[COLUMN.unit] ?? '').replace(/^\(none\)$/u, '');
  const presence = row[COLUMN.presence] ?? '';
  const allowed = row[COLUMN.allowed] ?? '';
  const unit = field.quantityUnit;

  if (unit !== undefined) {
    if (type !== 'quantity') problems.push(`${where}: reads a quantity, but the type cell says "${type}"`);
    if (unitCell !== unit) problems.push(`${where}: the unit is "${unit}", but the unit cell says "${unitCell}"`);
    const zeroAllowed = z.safeParse(field.schema, 0).success;
    const expected = zeroAllowed ? 'zero or positive' : 'positive';
    if (!allowed.startsWith(expected)) problems.push(`${where}: allows ${expected} values, but the allowed cell says "${allowed}"`);
  } else if (type === 'quantity') {
    problems.push(`${where}: is documented as a quantity, but the schema does not read it as one`);
  }

  if (!presence.startsWith(field.presence.kind)) {
    problems.push(`${where}: is ${field.presence.kind} in the schema, but the doc says "${presence}"`);
  } else if (field.presence.kind === 'default') {
    const problem = defaultProblem(field.presence.value, presence.slice('default'.length).trim(), unit ?? '');
    if (problem) problems.push(`${where}: ${problem}`);
  }
  return problems;
}

/** "default 50 Ω" or "default `{ "kind": "none" }`" against the schema's default value. */
function defaultProblem(value: unknown, written: string, unit: UnitSymbol): string | undefined {
  const code = /^`([^`]*)`/u.exec(written)?.[1];
  if (code !== undefined) {
    let parsed: unknown;
    try {
      parsed = JSON.parse(code);
    } catch {
      return `the default \`${code}\` is not JSON`;
    }
    return JSON.stringify(parsed) === JSON.stringify(value) ? undefined : `the default is ${JSON.stringify(value)}, the doc says ${code}`;
  }
  if (typeof value !== 'number') return `the default is ${JSON.stringify(value)}; write it in backticks as JSON`;
  const read = parseQuantity(written, unit);
  if (!read.ok) return `the default "${written}" does not read as a value (${read.reason})`;
  return Math.abs(read.value - value) <= 1e-12 * Math.abs(value) ? undefined : `the default is ${value}, the doc says ${written}`;
}

// ---- The tests ------------------------------------------------------------------------------

describe('docs/design-format.md documents the design schema', () => {
  const schema = catalogue(designSchema);

  it('the walk finds the whole schema (a sanity check on the walk itself)', () => {
    expect(schema.objects.length).toBeGreaterThanOrEqual(25);
    expect(schema.kinds).toEqual(
      new Set([
        'capacitor', 'inductor', 'resistor', 'ferrite-bead', 'damping-rc', 'damping-rl', 'measured', 'common-mode-choke',
        'none', 'parallel-resistance', 'quality-factor', 'constant', 'first-order-relaxation', 'leakage-inductance',
        'coupling-factor', 'cispr16-mains-50uh', 'vehicle-5uh', 'resistive', 'custom',
        'stages', 'pulsed', 'triangular-ripple', 'ac-mains', 'dc',
        'listed-limit', 'entered-limit', 'listed-requirement', 'time-constant', 'residual-voltage',
      ]),
    );
    expect(schema.choices.get('placement')).toEqual(new Set(PLACEMENTS));
    expect(schema.fieldNames).toContain('relaxationFrequencyHz');
    expect(schema.fieldNames).toContain('phaseDeg');
    const capacitor = schema.objects.find((object) => object.kind === 'capacitor')!;
    expect(capacitor.fields.find((field) => field.name === 'esl')).toMatchObject({ presence: { kind: 'default', value: 0 }, quantityUnit: 'H' });
    expect(capacitor.fields.find((field) => field.name === 'ratedVoltage')).toMatchObject({ presence: { kind: 'optional' }, quantityUnit: 'V' });
  });

  it('every object, field, kind and placement is documented, and nothing else is', () => {
    expect(docProblems(doc, schema)).toEqual([]);
    expect(orphanFieldTables(doc, schema)).toEqual([]);
  });

  it('every stable validation code is listed in the codes table, and nothing else is', () => {
    const source = readFileSync(VALIDATION_ERROR_URL, 'utf8');
    const union = /export type ValidationCode =([^;]+);/u.exec(source)?.[1] ?? '';
    const codes = [...union.matchAll(/'([a-z-]+)'/gu)].map((match) => match[1]!);
    expect(codes).toContain('duplicate-id');
    const listed = tablesOf(doc)
      .filter((table) => table.header[0] === 'code')
      .flatMap((table) => table.rows.map((row) => /^`([^`]+)`$/u.exec(row[0] ?? '')?.[1]));
    expect(new Set(listed)).toEqual(new Set(codes));
  });
});

describe('the doc check itself notices drift', () => {
  it('an undocumented field on the design object', () => {
    const grown = z.strictObject({ ...designSchema.shape, madeUpField: z.string() });
    expect(docProblems(doc, catalogue(grown))).toEqual([expect.stringMatching(/^field `madeUpField` of \(top level\) has no row/u), 'field `madeUpField` is not mentioned (in backticks)']);
  });

  it('a field documented elsewhere but not under its own part', () => {
    const grown = capacitorSchema.extend({ inductance: quantity('H') });
    expect(docProblems(doc, catalogue(grown))).toEqual([expect.stringMatching(/^field `inductance` of `capacitor`.*no row in the field table under "### `capacitor`"/u)]);
  });

  it('a new part kind without a section', () => {
    const grown = z.discriminatedUnion('kind', [capacitorSchema, z.strictObject({ kind: z.literal('made-up-kind'), value: quantity('F') })]);
    const problems = docProblems(doc, catalogue(grown));
    expect(problems).toContain('no heading documents `made-up-kind` (<made-up-kind>)');
    expect(problems).toContain('kind `made-up-kind` is not mentioned (in backticks)');
  });

  it('a field that the doc lists but the schema dropped', () => {
    const shrunk = capacitorSchema.omit({ esl: true });
    expect(docProblems(doc, catalogue(shrunk))).toEqual([expect.stringMatching(/lists `esl`, which the schema does not have there$/u)]);
  });

  it('a default, a unit or a range that changed', () => {
    const changed = capacitorSchema.extend({ esr: quantity('Ω'), esl: quantity('F', 'non-negative').default(1e-9) });
    expect(docProblems(doc, catalogue(changed))).toEqual([
      'field `esr` of `capacitor` (<capacitor>): allows positive values, but the allowed cell says "zero or positive"',
      'field `esr` of `capacitor` (<capacitor>): is required in the schema, but the doc says "default 0"',
      'field `esl` of `capacitor` (<capacitor>): the unit is "F", but the unit cell says "H"',
      'field `esl` of `capacitor` (<capacitor>): the default is 1e-9, the doc says 0',
    ]);
  });

  it('a new placement', () => {
    const grown = z.strictObject({ placement: z.enum([...PLACEMENTS, 'made-up-placement']) });
    expect(docProblems(doc, catalogue(grown))).toContain('placement `made-up-placement` has no row in the placement table');
  });

  it('a kind of zod schema the walk does not know stops the walk', () => {
    expect(() => catalogue(z.strictObject({ values: z.record(z.string(), z.number()) }))).toThrow(/does not know zod type "record"/u);
  });
});
