import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readImpedanceTableCsv, type TableDelimiter } from '../../src/io/impedance-table-csv.ts';
import { readTouchstone } from '../../src/io/touchstone-network.ts';
import { impedanceTableSchema } from '../../src/model/design-schema.ts';
import { propertySettings } from '../support/property-settings.ts';

/** Text made of the pieces these files are made of, so the readers' branches are reached. */
const fileText = fc
  .array(
    fc.oneof(
      fc.constantFrom('\n', '\r\n', ',', ';', '\t', ' ', '  ', '"', '#', '!', '[', 'Hz', 'MHz', 'Phase', '|Z|', 'Ohm', 'freq', 'S', 'RI', 'DB', 'R'),
      fc.double({ noNaN: true }).map(String),
      fc.integer({ min: -5, max: 1e7 }).map(String),
      fc.string({ maxLength: 4 }),
    ),
    { maxLength: 80 },
  )
  .map((pieces) => pieces.join(''));

function lineCount(text: string): number {
  return text.split(/\r\n|\r|\n/u).length;
}

describe('the text readers on arbitrary input (property)', () => {
  it('the |Z| table reader never throws; a table it returns loads, a problem it reports has a real line', () => {
    fc.assert(
      fc.property(fileText, (text) => {
        const result = readImpedanceTableCsv(text);
        if (result.ok) expect(impedanceTableSchema.safeParse(result.value.table).success).toBe(true);
        else {
          expect(result.issues.length).toBeGreaterThan(0);
          for (const issue of result.issues) expect(issue.line).toBeLessThanOrEqual(lineCount(text));
        }
      }),
      propertySettings(1500),
    );
  });

  it('the Touchstone reader never throws and reports real lines', () => {
    fc.assert(
      fc.property(fileText, (text) => {
        const result = readTouchstone(text);
        const issues = result.ok ? result.notes : result.issues;
        for (const issue of issues) expect(issue.line).toBeLessThanOrEqual(lineCount(text));
      }),
      propertySettings(1500),
    );
  });

  it('a table written in any separator and decimal style reads back to the same numbers', () => {
    const point = fc.record({
      magnitude: fc.double({ min: 1e-3, max: 1e6, noNaN: true }),
      phase: fc.double({ min: -180, max: 180, noNaN: true }).map((v) => v + 0), // no -0: it prints as "0"
    });
    fc.assert(
      fc.property(
        fc.array(point, { minLength: 2, maxLength: 40 }),
        fc.constantFrom<TableDelimiter>(',', ';', '\t', 'whitespace'),
        fc.boolean(),
        fc.boolean(),
        (points, delimiter, header, comma) => {
          const decimalComma = comma && delimiter !== ',';
          const separator = delimiter === 'whitespace' ? '   ' : delimiter;
          const number = (value: number): string => (decimalComma ? String(value).replace('.', ',') : String(value));
          const lines = points.map((p, i) => [number(1000 * (i + 1)), number(p.magnitude), number(p.phase)].join(separator));
          if (header) lines.unshift(['Frequency (kHz)', 'Impedance (Ohm)', 'Phase (deg)'].join(delimiter === 'whitespace' ? ' ' : delimiter));
          const result = readImpedanceTableCsv(lines.join('\n'), header ? {} : { frequencyUnit: 'kHz' });
          if (!result.ok) throw new Error(JSON.stringify(result.issues));
          expect(result.value.delimiter).toBe(delimiter);
          expect(result.value.table.frequencyHz).toEqual(points.map((_, i) => 1e6 * (i + 1)));
          expect(result.value.table.magnitudeOhm).toEqual(points.map((p) => p.magnitude));
          expect(result.value.table.phaseDeg).toEqual(points.map((p) => p.phase));
        },
      ),
      propertySettings(400),
    );
  });
});
