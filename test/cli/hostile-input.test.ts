import { describe, expect, it } from 'vitest';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

// Inputs that once broke the command line: each now gives exit 2 and a message that names the
// option, or the line and column, that is wrong.
const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const SCAN = 'fixtures/scans/invented-peak-qp-av-mhz.csv';
const demoText = repoFile(DEMO);
const scanText = repoFile(SCAN);
const run = (argv: string[], files: Record<string, string | Uint8Array> = {}) => runInMemory(argv, { [DEMO]: demoText, [SCAN]: scanText, ...files });

describe('malformed JSON nested at any depth is located, never an internal error', () => {
  it.each([3_600, 100_000, 1_000_000])('%i unclosed arrays: exit 2 at the end of the text', async (depth) => {
    const text = `${'['.repeat(depth)}1${']'.repeat(depth - 1)}`;
    const result = await run(['sweep', 'deep.json'], { 'deep.json': text });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(new RegExp(`deep\\.json is not valid JSON: line 1, column ${2 * depth + 1}: expected "," or "\\]" after a list item, found the end of the text`, 'u'));
  });

  it('a bad token deep inside nested objects is found where it is', async () => {
    const depth = 50_000;
    const text = `${'{"a":'.repeat(depth)}tru${'}'.repeat(depth)}`;
    const result = await run(['sweep', 'deep.json'], { 'deep.json': text });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(new RegExp(`line 1, column ${5 * depth + 1}: expected a value, found "t"`, 'u'));
  });

  it('valid JSON a million levels deep is read, and refused as a design (exit 2)', async () => {
    const depth = 1_000_000;
    const result = await run(['sweep', 'deep.json'], { 'deep.json': `${'['.repeat(depth)}${']'.repeat(depth)}` });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/deep\.json is not a valid design/u);
  });
});

describe('files that are not UTF-8 are refused by name, never read with replaced bytes', () => {
  it('a Latin-1 scan (µ as byte 0xB5): exit 2 naming the line and column', async () => {
    const latin1 = Buffer.from('# INVENTED scan\nFrequency [MHz],Peak [dBµV]\n0.15,60\n', 'latin1');
    const result = await run(['check', DEMO, '--scan', 'latin1.csv'], { 'latin1.csv': latin1 });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/cannot read the scan latin1\.csv: not UTF-8 text: byte 0xB5 at line 2, column 25 is not part of a UTF-8 character/u);
  });

  it('a UTF-16 design (as a Windows editor saves "Unicode"): exit 2 naming UTF-16 LE', async () => {
    const utf16 = Buffer.from(`\uFEFF${demoText}`, 'utf16le');
    const result = await run(['sweep', 'unicode.json'], { 'unicode.json': utf16 });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/cannot read the design unicode\.json: not UTF-8 text: the file is UTF-16 LE text \(its byte-order mark says so\): save it as UTF-8/u);
  });

  it('a mask file in UTF-16 BE, and a measurement with a NUL byte, are refused the same way', async () => {
    const be = Buffer.from('\uFEFF150000,66\n30000000,60\n', 'utf16le').swap16();
    expect((await run(['limits', '--read', 'mask.csv'], { 'mask.csv': be })).stderr).toMatch(/the file is UTF-16 BE text/u);
    const nul = Buffer.from('1e6,10,0\n2e6,\u000020,0\n', 'latin1');
    const measured = await run(['measured-part', 'bead.csv'], { 'bead.csv': nul });
    expect(measured.code).toBe(2);
    expect(measured.stderr).toMatch(/not UTF-8 text: a NUL byte at line 2, column 5/u);
  });

  it('UTF-8 with a byte-order mark reads as usual', async () => {
    const result = await run(['sweep', 'bom.json', '--no-refine', '--points-per-decade', '5'], { 'bom.json': Buffer.from(`\uFEFF${demoText}`, 'utf8') });
    expect(result.code).toBe(0);
  });
});

describe('numeric options take plain numbers only, each checked and named on its own', () => {
  it.each([
    [['--margin', '0x10'], /--margin must be a plain decimal number \(such as 6, -3\.5 or 1e-3\), got "0x10"/u],
    [['--margin', 'Infinity'], /--margin must be a plain decimal number/u],
    [['--margin', '1_0'], /--margin must be a plain decimal number/u],
    [['--margin', '99'], /--margin must be from -40 to 60, got 99/u],
    [['--noise-floor', '0b11'], /--noise-floor must be a plain decimal number/u],
    [['--peaks', '1.5'], /--peaks must be a whole number from 1 to 1000, written with digits only, got "1\.5"/u],
    [['--peaks', '1e3'], /--peaks must be a whole number .* got "1e3"/u],
    [['--peaks', '0'], /--peaks must be a whole number from 1 to 1000/u],
    [['--transfer-impedance', '0x32'], /--transfer-impedance must be a plain decimal number/u],
  ])('check %j: exit 2', async (option, message) => {
    const result = await run(['check', DEMO, '--scan', SCAN, ...option]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(message);
  });

  it('plain numbers, with a dB unit where one fits, still read', async () => {
    const json = JSON.parse((await run(['check', DEMO, '--scan', SCAN, '--margin', '-3.5 dB', '--peaks', '3', '--json'])).stdout) as { targetMarginDb: number; worstPeaks: unknown[] };
    expect(json.targetMarginDb).toBe(-3.5);
    expect(json.worstPeaks).toHaveLength(3);
  });

  it.each([
    [['--points-per-decade', '1e3'], /--points-per-decade must be a whole number from 1 to 100000, written with digits only, got "1e3"/u],
    [['--points-per-decade', '2.0'], /--points-per-decade must be a whole number/u],
    [['--start', '1e-320'], /--start must be a frequency from 1 mHz to 1 THz, got "1e-320"/u],
    [['--stop', '1e300'], /--stop must be a frequency from 1 mHz to 1 THz, got "1e300"/u],
  ])('sweep %j: exit 2, blaming the option', async (option, message) => {
    const result = await run(['sweep', DEMO, ...option]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(message);
    expect(result.stderr).not.toMatch(/in the design/u);
  });

  it('a plan too large as a whole names each value’s source', async () => {
    const result = await run(['sweep', DEMO, '--start', '1mHz', '--points-per-decade', '100000']);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /the sweep from 1 mHz \(--start\) to 30 MHz \(frequencyPlan\.stopHz in the design\) at 100000 points per decade \(--points-per-decade\): the plan asks for about \d+ points; at most 1000000 are allowed/u,
    );
  });
});

describe('--limit takes each limit once, and at most the 16 a design holds', () => {
  it('the same preset twenty times is refused, naming the option and the preset', async () => {
    const result = await run(['check', DEMO, '--scan', SCAN, '--limit', Array(20).fill('cispr32-class-b-qp').join(',')]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/--limit: "cispr32-class-b-qp" is given twice; give each limit once/u);
  });

  it('seventeen different limits are refused before any file is read', async () => {
    const files = Array.from({ length: 17 }, (_, i) => `mask${i}.csv`);
    const result = await run(['check', DEMO, '--scan', SCAN, '--limit', files.join(',')]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/--limit gives 17 limits; a design is judged against at most 16/u);
  });
});
