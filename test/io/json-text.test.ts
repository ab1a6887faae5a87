import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { locateJsonSyntaxError, parseJsonText } from '../../src/io/json-text.ts';
import { propertySettings } from '../support/property-settings.ts';

function error(text: string) {
  const result = parseJsonText(text);
  if (result.ok) throw new Error('expected a syntax error');
  return result.error;
}

describe('JSON with a located syntax error', () => {
  it('parses valid JSON, with or without a byte-order mark', () => {
    expect(parseJsonText('{"a": [1, 2.5e3, "x", true, null]}')).toEqual({ ok: true, value: { a: [1, 2500, 'x', true, null] } });
    expect(parseJsonText('\uFEFF{"a": 1}')).toEqual({ ok: true, value: { a: 1 } });
  });

  it.each([
    ['{\n  "a": 1\n  "b": 2\n}', 3, 3, 'expected "," or "}" after a property value, found "\\""'],
    ['{"a": 1,}', 1, 9, 'trailing comma before "}"'],
    ['[1, 2,\n]', 2, 1, 'trailing comma before "]"'],
    ['{a: 1}', 1, 2, 'expected a property name in double quotes, found "a"'],
    ["{'a': 1}", 1, 2, `expected a property name in double quotes, found "'" (JSON strings use double quotes)`],
    ['{"a": 01}', 1, 8, 'malformed number'],
    ['{"a": "x\ny"}', 1, 9, 'a line break inside a string (write it as an escape)'],
    ['{"a": "\\q"}', 1, 8, 'unknown escape "\\q" in a string'],
    ['{"a": 1', 1, 8, 'expected "," or "}" after a property value, found the end of the text'],
    ['{"a": "open', 1, 7, 'a string is not closed'],
    ['', 1, 1, 'expected a value, found the end of the text'],
    ['{"a": 1} x', 1, 10, 'unexpected text after the end of the JSON value'],
    ['{"a": tru}', 1, 7, 'expected a value, found "t"'],
    ['{"a": 1 // note\n}', 1, 9, 'expected "," or "}" after a property value, found "/"'],
    ['{"a" 1}', 1, 6, 'expected ":" after the property name, found "1"'],
  ])('%j: line %i, column %i', (text, line, column, message) => {
    expect(error(text)).toMatchObject({ line, column, message });
  });

  it('shows the line with a caret under the column', () => {
    expect(error('{\n  "name": "x" "y"\n}').excerpt).toBe('  "name": "x" "y"\n              ^');
  });

  it('agrees with JSON.parse on what is valid (property)', () => {
    const mutated = fc
      .tuple(fc.json(), fc.nat(), fc.constantFrom('', ',', '}', ']', '"', ':', 'x', ' ', '0', '-', '.', 'e'), fc.boolean())
      .map(([json, at, insert, remove]) => {
        const i = json.length === 0 ? 0 : at % json.length;
        return json.slice(0, i) + insert + json.slice(remove ? i + 1 : i);
      });
    fc.assert(
      fc.property(fc.oneof(fc.json(), mutated), (text) => {
        let valid = true;
        try {
          JSON.parse(text);
        } catch {
          valid = false;
        }
        expect(locateJsonSyntaxError(text) === undefined).toBe(valid);
      }),
      propertySettings(2000),
    );
  });
});
