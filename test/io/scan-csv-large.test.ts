import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseDecimal } from '../../src/io/decimal-number.ts';
import { readNumberField, readScanText } from '../../src/io/scan-csv.ts';
import { MAX_SCAN_LINES } from '../../src/io/scan-limits.ts';
import { propertySettings } from '../support/property-settings.ts';

// The oracle for numbers: the JavaScript engine's Number(), which ECMAScript requires to round the
// decimal text correctly; for the fields, papaparse (the reader's path for anything quoted).

/** Decimal-looking text: digits, a point or comma, an exponent, signs, and junk now and then. */
const numberText = fc
  .tuple(
    fc.constantFrom('', '+', '-'),
    fc.stringMatching(/^[0-9]{0,18}$/u),
    fc.constantFrom('', '.', ','),
    fc.stringMatching(/^[0-9]{0,18}$/u),
    fc.constantFrom('', 'e', 'E', 'e+', 'e-', 'E-'),
    fc.stringMatching(/^[0-9]{0,4}$/u),
    fc.constantFrom('', '', '', 'x', ' ', '.', '0'),
  )
  .map((parts) => parts.join(''));

describe('readNumberField: the scan reader’s number, exactly as parseDecimal and Number() give it', () => {
  it('property: the same value (or the same refusal) as parseDecimal, with and without a decimal comma', () => {
    fc.assert(
      fc.property(numberText, fc.boolean(), (text, comma) => {
        // The reader hands it trimmed fields; parseDecimal trims its own.
        expect(Object.is(readNumberField(text.trim(), comma), parseDecimal(text, comma))).toBe(true);
      }),
      propertySettings(20_000),
    );
  });

  it('property: times 10^power it is Number() of the text with the exponent moved (kHz, MHz, GHz to Hz)', () => {
    fc.assert(
      fc.property(numberText, fc.constantFrom(3, 6, 9), (text, power) => {
        const field = text.trim();
        const plain = parseDecimal(field);
        const scaled = readNumberField(field, false, power);
        if (plain === undefined) {
          expect(scaled).toBeUndefined();
          return;
        }
        const e = field.search(/[eE]/u);
        const expected = e === -1 ? Number(`${field}e${power}`) : Number(`${field.slice(0, e)}e${Number(field.slice(e + 1)) + power}`);
        expect(Object.is(scaled, Number.isFinite(expected) ? expected : undefined)).toBe(true);
      }),
      propertySettings(20_000),
    );
  });

  it('known cases: 8.3 MHz is 8300000 Hz, not 8300000.000000001; signed zero; too many digits go to Number()', () => {
    expect(readNumberField('8.3', false, 6)).toBe(8300000);
    expect(8.3 * 1e6).not.toBe(8300000);
    expect(readNumberField('1.015', false, 6)).toBe(1015000);
    expect(Object.is(readNumberField('-0.0', false), -0)).toBe(true);
    expect(readNumberField('12345678901234567890', false)).toBe(Number('12345678901234567890'));
    expect(readNumberField('1e400', false)).toBeUndefined();
    expect(readNumberField('45,2', true)).toBe(45.2);
    expect(readNumberField('45,2', false)).toBeUndefined();
  });
});

describe('the body of a scan without quotes is split by the reader itself, as papaparse splits it', () => {
  const cell = fc.oneof(
    numberText,
    fc.double({ min: 1e3, max: 1e8, noNaN: true }).map(String),
    fc.constantFrom('', ' 12.5 ', 'abc', '-3', 'NaN', '1e5'),
  );
  const row = fc.array(cell, { minLength: 0, maxLength: 5 });
  const scanText = fc.tuple(fc.constantFrom(',', ';', '\t', ' '), fc.array(row, { minLength: 1, maxLength: 40 })).map(([separator, rows]) => ({
    separator,
    text: `f,peak,av\n${rows.map((cells) => cells.join(separator)).join('\n')}\n`,
  }));

  it('property: the same scan with the quote-free fast path as through papaparse (a quoted line sends the body there)', () => {
    fc.assert(
      fc.property(scanText, ({ separator, text }) => {
        const delimiter = separator === ' ' ? 'whitespace' : (separator as ',' | ';' | '\t');
        const fast = readScanText(text, { delimiter });
        const viaPapaparse = readScanText(`${text}"quoted text"\n`, { delimiter });
        expect(viaPapaparse.ok).toBe(fast.ok);
        if (fast.ok && viaPapaparse.ok) {
          expect(viaPapaparse.scan.frequencyHz).toEqual(fast.scan.frequencyHz);
          expect(viaPapaparse.scan.traces).toEqual(fast.scan.traces);
          expect(viaPapaparse.scan.rejected).toEqual(fast.scan.rejected);
          const withoutSkips = (notes: readonly string[]) => notes.filter((note) => !note.startsWith('skipped'));
          expect(withoutSkips(viaPapaparse.scan.notes)).toEqual(withoutSkips(fast.scan.notes));
        }
        if (!fast.ok && !viaPapaparse.ok) expect(viaPapaparse.error.rejected).toEqual(fast.error.rejected);
      }),
      propertySettings(1500),
    );
  });
});

describe('large scans', () => {
  // A million rows are timed and measured by `npm run bench` (section scan-import); here, their kind.
  it('three hundred thousand rows read in full, into views of one buffer', { timeout: 60_000 }, () => {
    const n = 300_000;
    const lines = ['Frequency [Hz],Peak [dBuV],AV [dBuV]'];
    for (let i = 0; i < n; i += 1) lines.push(`${150_000 + i * 29.85},${(50 + (i % 13) / 10).toFixed(1)},${(40 + (i % 7) / 10).toFixed(1)}`);
    const read = readScanText(lines.join('\n'));
    if (!read.ok) throw new Error(read.error.message);
    expect(read.scan.frequencyHz.length).toBe(n);
    expect(read.scan.frequencyHz[n - 1]).toBe(150_000 + (n - 1) * 29.85);
    expect(read.scan.traces[1]!.levelDbuV.buffer).toBe(read.scan.frequencyHz.buffer);
  });

  it(`more than ${MAX_SCAN_LINES} lines are refused, with the limit and what to do`, () => {
    const read = readScanText('1e6,50\n'.repeat(MAX_SCAN_LINES + 1));
    expect(read.ok).toBe(false);
    if (!read.ok) expect(read.error.message).toMatch(/^the file has 2,000,001 lines; scans of up to 2,000,000 lines are read: export it with a coarser step/u);
    expect(readScanText('1e6,50\n'.repeat(3)).ok).toBe(true);
  });
});
