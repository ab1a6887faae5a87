import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { formatJson } from '../../src/cli/commands/measured-part.ts';
import { detectMeasurementKind } from '../../src/io/measurement-file.ts';
import { type CliIo, runCli } from '../../src/cli/run-cli.ts';
import { sweepDesign } from '../../src/engine/index.ts';
import { type Complex, complex, magnitude, phaseDeg } from '../../src/io/complex.ts';
import { measuredPartFromTable, readImpedanceTableCsv } from '../../src/io/impedance-table-csv.ts';
import { thruFixtureSParameters, writeTouchstoneTwoPort } from '../../src/io/touchstone.ts';
import type { TouchstoneFormat } from '../../src/io/touchstone-network.ts';
import type { MeasuredImpedance } from '../../src/model/design.ts';
import { readDesign } from '../../src/model/index.ts';

const BEAD = 'fixtures/measured/invented-bead.csv';
const WINDING = 'fixtures/measured/invented-winding-series-thru.s2p';
const CAPACITOR = 'fixtures/measured/invented-capacitor-shunt-thru.s2p';
const fixture = (path: string): string => readFileSync(new URL(`../../${path}`, import.meta.url), 'utf8');
const FIXTURES: Record<string, string> = { [BEAD]: fixture(BEAD), [WINDING]: fixture(WINDING), [CAPACITOR]: fixture(CAPACITOR) };

interface Run {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
  readonly written: ReadonlyMap<string, string>;
}

function fsError(code: string, path: string): Error {
  return Object.assign(new Error(`${code}: failed, '${path}'`), { code });
}

/** The command line in-process, on files kept in memory; "/readonly/…" cannot be written. */
async function run(argv: string[], files: Record<string, string> = {}): Promise<Run> {
  const all: Record<string, string> = { ...FIXTURES, ...files };
  const written = new Map<string, string>();
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    readFile: async (path) => {
      if (path.endsWith('/')) throw fsError('EISDIR', path);
      const text = all[path];
      if (text === undefined) throw fsError('ENOENT', path);
      return new TextEncoder().encode(text);
    },
    writeTextFile: async (path, text) => {
      if (path.startsWith('/readonly/')) throw fsError('EACCES', path);
      written.set(path, text);
    },
    stdout: (text) => {
      stdout += text;
    },
    stderr: (text) => {
      stderr += text;
    },
    version: '9.8.7-test',
  };
  const code = await runCli(argv, io);
  return { code, stdout, stderr, written };
}

/** A run that must succeed; returns the printed JSON. */
async function printed(argv: string[], files: Record<string, string> = {}): Promise<{ json: unknown; stderr: string }> {
  const { code, stdout, stderr } = await run(argv, files);
  expect(code, stderr).toBe(0);
  return { json: JSON.parse(stdout) as unknown, stderr };
}

/** The smallest design around an element, as a design file would hold it. */
function designAround(element: unknown): unknown {
  return {
    format: 'chokepoint-design',
    version: 2,
    name: 'test: a measured part from the command line',
    frequencyPlan: { startHz: '100 kHz', stopHz: '100 MHz', pointsPerDecade: 20 },
    noiseSource: {
      commonMode: { impedance: { kind: 'resistor', resistance: 50 } },
      differentialMode: { impedance: { kind: 'resistor', resistance: 100 } },
    },
    receivers: { line1: { kind: 'resistive', resistance: 50 }, line2: { kind: 'resistive', resistance: 50 } },
    stages: [{ id: 'input', elements: [element] }],
  };
}

/** Read the printed part back inside a design, as `sweep` would load it. */
function readsBackAsPart(part: unknown): MeasuredImpedance {
  const read = readDesign(designAround({ id: 'M1', placement: 'line-to-line', part }));
  if (!read.ok) throw new Error(read.error.message);
  const loaded = read.value.stages[0]!.elements[0]!.part;
  if (loaded.kind !== 'measured') throw new Error(`expected a measured part, got ${loaded.kind}`);
  expect(loaded).toEqual(part);
  return loaded;
}

const relative = (actual: number, wanted: number): number => Math.abs(actual - wanted) / Math.abs(wanted);
const wrapDegrees = (degrees: number): number => degrees - 360 * Math.round(degrees / 360);

describe('chokepoint measured-part: a |Z| table', () => {
  it('prints the part of the invented bead table, which reads back inside a design', async () => {
    const { json, stderr } = await printed(['measured-part', BEAD]);
    expect(stderr).toBe('');
    const read = readImpedanceTableCsv(FIXTURES[BEAD]!);
    if (!read.ok) throw new Error('the fixture reads');
    expect(json).toEqual(measuredPartFromTable(read.value.table, 'invented-bead.csv'));
    const part = readsBackAsPart(json);
    // The header says MHz: 31 points from 1 MHz to 1 GHz, first row 6.9127 Ω at 88.46°.
    expect(part.table.frequencyHz).toHaveLength(31);
    expect(part.table.frequencyHz[0]).toBe(1e6);
    expect(part.table.frequencyHz[30]).toBe(1e9);
    expect(part.table.magnitudeOhm[0]).toBe(6.9127);
    expect(part.table.phaseDeg[0]).toBe(88.46);
    expect(part.origin).toEqual({ format: 'impedance-table', fileName: 'invented-bead.csv' });
  });

  it('writes a whole element with --id and --placement, which a design holds and sweeps', async () => {
    const { json } = await printed(['measured-part', BEAD, '--id', 'FB1', '--placement', 'series-line1']);
    expect(json).toMatchObject({ id: 'FB1', placement: 'series-line1', part: { kind: 'measured' } });
    expect(Object.keys(json as object)).toEqual(['id', 'placement', 'part']);
    const read = readDesign(designAround(json));
    if (!read.ok) throw new Error(read.error.message);
    const result = sweepDesign(read.value, { refine: false });
    expect(result.elements[0]).toMatchObject({ id: 'FB1', partKind: 'measured' });
    // Below the table's 1 MHz the sweep holds the end value and says so.
    expect(result.warnings.map((w) => w.code)).toContain('outside-measured-range');
  });

  it('reads a whitespace table without a header in the unit given by --frequency-unit', async () => {
    const text = '# INVENTED test data\n1 10 85\n2 22.5 80.5\n5 60 -12\n';
    const { json, stderr } = await printed(['measured-part', 'bead.txt', '--frequency-unit', 'MHz'], { 'bead.txt': text });
    expect(stderr).toBe('');
    expect(readsBackAsPart(json).table).toEqual({ frequencyHz: [1e6, 2e6, 5e6], magnitudeOhm: [10, 22.5, 60], phaseDeg: [85, 80.5, -12] });
    // Without the unit the reader takes hertz, and the note says so.
    const plain = await printed(['measured-part', 'bead.txt'], { 'bead.txt': text });
    expect(plain.stderr).toBe('chokepoint: note: bead.txt: no frequency unit in a header: frequencies read as Hz\n');
  });

  it('reads semicolons with decimal commas', async () => {
    const text = 'f/kHz;Z/Ohm;phase/deg\n1000;10;85\n2000;22,5;80,5\n5000;60;-12\n';
    const { json } = await printed(['measured-part', 'bead.csv'], { 'bead.csv': text });
    expect(readsBackAsPart(json).table.magnitudeOhm).toEqual([10, 22.5, 60]);
  });

  it('leaves out rejected data lines, reports each with its line number, and still succeeds', async () => {
    const text = 'Frequency (Hz),|Z| (Ohm),Phase (deg)\n0,1,0\n1e6,10,85\n2e6,abc,80\n3e6,15\n5e6,60,-12\n1e7,80,-40\n';
    const { json, stderr } = await printed(['measured-part', 'bead.csv'], { 'bead.csv': text });
    expect(stderr).toBe(
      [
        'chokepoint: warning: bead.csv, line 2 left out: frequency must be positive, got 0',
        'chokepoint: warning: bead.csv, line 4 left out: |Z| "abc" is not a number',
        'chokepoint: warning: bead.csv, line 5 left out: 2 values, expected at least 3 (the header on line 1 has 3 columns)',
        '',
      ].join('\n'),
    );
    expect(readsBackAsPart(json).table).toEqual({ frequencyHz: [1e6, 5e6, 1e7], magnitudeOhm: [10, 60, 80], phaseDeg: [85, -12, -40] });
  });

  it('refuses the same file with --strict, listing every rejected line', async () => {
    const text = '1e6,10,85\n2e6,abc,80\n5e6,60,-12\n1e7,-3,0\n';
    const { code, stdout, stderr } = await run(['measured-part', 'bead.csv', '--strict'], { 'bead.csv': text });
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toBe(
      'chokepoint: bead.csv does not give a usable |Z| table (2 problems):\n  line 2: |Z| "abc" is not a number\n  line 4: |Z| must be positive, got -3 Ω\n',
    );
  });

  it('writes to a file with --out and says what it wrote', async () => {
    const { code, stdout, stderr, written } = await run(['measured-part', BEAD, '-o', 'out/bead.part.json']);
    expect(code).toBe(0);
    expect(stdout).toBe('');
    expect(stderr).toBe('chokepoint: wrote a measured part (31 points from 1 MHz to 1 GHz) to out/bead.part.json\n');
    readsBackAsPart(JSON.parse(written.get('out/bead.part.json')!));
  });
});

/** Z from S21 by the two-port arithmetic, written out here rather than taken from src/io. */
function seriesThruImpedance(s21: Complex, z0: number): Complex {
  // series-thru: Z = 2·Z0·(1 − S21)/S21
  const d = s21.re * s21.re + s21.im * s21.im;
  const n = complex(1 - s21.re, -s21.im);
  return complex((2 * z0 * (n.re * s21.re + n.im * s21.im)) / d, (2 * z0 * (n.im * s21.re - n.re * s21.im)) / d);
}

function shuntThruImpedance(s21: Complex, z0: number): Complex {
  // shunt-thru: Z = Z0·S21 / (2·(1 − S21))
  const n = complex(1 - s21.re, -s21.im);
  const d = 2 * (n.re * n.re + n.im * n.im);
  return complex((z0 * (s21.re * n.re + s21.im * n.im)) / d, (z0 * (s21.im * n.re - s21.re * n.im)) / d);
}

/** Frequency (Hz) and S21 of each data line of a one-record-per-line Touchstone file in MHz. */
function s21Lines(text: string, format: 'DB' | 'MA'): { frequencyHz: number; s21: Complex }[] {
  return text
    .split('\n')
    .filter((line) => /^\d/u.test(line))
    .map((line) => {
      const v = line.trim().split(/\s+/u).map(Number);
      const size = format === 'DB' ? 10 ** (v[3]! / 20) : v[3]!;
      const angle = (v[4]! * Math.PI) / 180;
      // MHz to Hz to 15 digits, as the reader does, so that 0.501187 MHz is 501187 Hz exactly.
      return { frequencyHz: Number((v[0]! * 1e6).toPrecision(15)), s21: complex(size * Math.cos(angle), size * Math.sin(angle)) };
    });
}

describe('chokepoint measured-part: a Touchstone thru file', () => {
  it('series-thru: Z = 2·Z0·(1 − S21)/S21 of each line, and the winding the file describes', async () => {
    const { json, stderr } = await printed(['measured-part', WINDING, '--fixture', 'series-thru']);
    expect(stderr).toBe('');
    const part = readsBackAsPart(json);
    expect(part.origin).toEqual({ format: 'touchstone-series-thru', referenceImpedance: 50, fileName: 'invented-winding-series-thru.s2p' });
    const lines = s21Lines(FIXTURES[WINDING]!, 'DB');
    expect(part.table.frequencyHz).toEqual(lines.map((l) => l.frequencyHz));
    lines.forEach(({ frequencyHz, s21 }, i) => {
      const z = seriesThruImpedance(s21, 50);
      expect(relative(part.table.magnitudeOhm[i]!, magnitude(z))).toBeLessThan(1e-9);
      expect(Math.abs(wrapDegrees(part.table.phaseDeg[i]! - phaseDeg(z)))).toBeLessThan(1e-9);
      // The file's comment: 10 µH with 0.15 Ω in series and 3.3 pF across, Z = (R + jωL) ∥ 1/(jωC);
      // the file holds 7 digits of dB, so agreement to 1e-4 is all it can give.
      const w = 2 * Math.PI * frequencyHz;
      const a = complex(0.15, w * 10e-6);
      const b = complex(0, -1 / (w * 3.3e-12));
      const sum = complex(a.re + b.re, a.im + b.im);
      const product = complex(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
      const expected = magnitude(product) / magnitude(sum);
      expect(relative(part.table.magnitudeOhm[i]!, expected)).toBeLessThan(1e-4);
    });
    // Inductive below the self-resonance near 27.7 MHz, capacitive above.
    expect(part.table.phaseDeg[0]).toBeGreaterThan(80);
    expect(part.table.phaseDeg[part.table.phaseDeg.length - 1]).toBeLessThan(-80);
  });

  it('shunt-thru: Z = Z0·S21/(2·(1 − S21)) of each line, and the capacitor the file describes', async () => {
    const { json, stderr } = await printed(['measured-part', CAPACITOR, '--fixture', 'shunt-thru', '--id', 'CX1', '--placement', 'line-to-line']);
    expect(stderr).toBe('');
    const read = readDesign(designAround(json));
    if (!read.ok) throw new Error(read.error.message);
    const part = read.value.stages[0]!.elements[0]!.part;
    if (part.kind !== 'measured') throw new Error('expected a measured part');
    expect(part.origin).toEqual({ format: 'touchstone-shunt-thru', referenceImpedance: 50, fileName: 'invented-capacitor-shunt-thru.s2p' });
    s21Lines(FIXTURES[CAPACITOR]!, 'MA').forEach(({ frequencyHz, s21 }, i) => {
      expect(part.table.frequencyHz[i]).toBe(frequencyHz);
      const z = shuntThruImpedance(s21, 50);
      expect(relative(part.table.magnitudeOhm[i]!, magnitude(z))).toBeLessThan(1e-9);
      // The file's comment: 100 nF, 20 mΩ ESR, 8 nH ESL, Z = ESR + j(ωL − 1/(ωC)), written to 10 digits.
      const w = 2 * Math.PI * frequencyHz;
      const expected = complex(0.02, w * 8e-9 - 1 / (w * 100e-9));
      expect(relative(part.table.magnitudeOhm[i]!, magnitude(expected))).toBeLessThan(1e-7);
      expect(Math.abs(part.table.phaseDeg[i]! - phaseDeg(expected))).toBeLessThan(1e-6);
    });
  });

  it('round trip: a table → a series-thru Touchstone file (the io writer) → measured-part → the same |Z| within 1e-9', async () => {
    const frequencyHz = [1e3, 1e4, 1.5e5, 2e6, 3.3e7, 4.7e8, 1e9];
    const magnitudeOhm = [0.1, 0.47, 3.3, 50, 680, 2200, 1e4];
    const phaseDegrees = [-89.5, -60, -5, 0, 45, 89.9, 120];
    for (const format of ['RI', 'MA', 'DB'] as const satisfies readonly TouchstoneFormat[]) {
      const records = frequencyHz.map((f, i) => {
        const radians = (phaseDegrees[i]! * Math.PI) / 180;
        const z = complex(magnitudeOhm[i]! * Math.cos(radians), magnitudeOhm[i]! * Math.sin(radians));
        return { frequencyHz: f, ...thruFixtureSParameters('series-thru', z, 50) };
      });
      const file = writeTouchstoneTwoPort(records, { format, frequencyUnit: 'MHz', referenceOhm: 50, comments: ['INVENTED round-trip test data'] });
      const { json, stderr } = await printed(['measured-part', 'round-trip.s2p', '--fixture', 'series-thru'], { 'round-trip.s2p': file });
      // A negative real part (phase beyond ±90°) is not passive, and the reader says so.
      expect(stderr).toBe('chokepoint: note: round-trip.s2p: the impedance has a negative real part on line 9 (more than a passive part can give): check the calibration\n');
      const table = readsBackAsPart(json).table;
      expect(table.frequencyHz).toEqual(frequencyHz);
      table.magnitudeOhm.forEach((size, i) => expect(relative(size, magnitudeOhm[i]!), `${format} point ${i}`).toBeLessThan(1e-9));
      table.phaseDeg.forEach((angle, i) => expect(Math.abs(wrapDegrees(angle - phaseDegrees[i]!)), `${format} point ${i}`).toBeLessThan(1e-7));
    }
  });

  it('recognises a Touchstone file by its option line whatever its name, and a table with # comments as a table', async () => {
    expect(detectMeasurementKind('winding.txt', FIXTURES[WINDING]!)).toBe('touchstone');
    expect(detectMeasurementKind('winding.S2P', '')).toBe('touchstone');
    expect(detectMeasurementKind('v2.dat', '! comment\n[Version] 2.0\n')).toBe('touchstone');
    expect(detectMeasurementKind(BEAD, FIXTURES[BEAD]!)).toBe('impedance-table');
    expect(detectMeasurementKind('plain.csv', '#\n# R 50 ohm bead\n1,2,3\n')).toBe('impedance-table');
    const { json } = await printed(['measured-part', 'winding.txt', '--fixture', 'series-thru'], { 'winding.txt': FIXTURES[WINDING]! });
    expect((json as MeasuredImpedance).origin).toMatchObject({ format: 'touchstone-series-thru', fileName: 'winding.txt' });
  });

  it('leaves out a one-line record whose S21 gives no impedance, and refuses it with --strict', async () => {
    const lines = FIXTURES[WINDING]!.split('\n');
    // S21 = S12 = −8000 dB, zero in doubles: a series impedance without bound.
    lines[9] = lines[9]!
      .split(' ')
      .map((field, i) => (i === 3 || i === 5 ? '-8000' : field))
      .join(' ');
    const broken = lines.join('\n');
    const { json, stderr } = await printed(['measured-part', 'broken.s2p', '--fixture', 'series-thru'], { 'broken.s2p': broken });
    expect(stderr).toMatch(/^chokepoint: warning: broken\.s2p, line 10 left out: S21 = .* makes the series-thru impedance unbounded\n$/u);
    expect(readsBackAsPart(json).table.frequencyHz).toHaveLength(30);
    const strict = await run(['measured-part', 'broken.s2p', '--fixture', 'series-thru', '--strict'], { 'broken.s2p': broken });
    expect(strict.code).toBe(2);
    expect(strict.stderr).toMatch(/^chokepoint: broken\.s2p does not give a series-thru impedance \(1 problem\):\n {2}line 10: S21 = /u);
  });

  it('leaves out a one-line record with a word in it, then reads on', async () => {
    const lines = FIXTURES[WINDING]!.split('\n');
    lines[6] = lines[6]!.replace('-0.05575009', 'n/a');
    const { json, stderr } = await printed(['measured-part', 'gap.s2p', '--fixture', 'series-thru'], { 'gap.s2p': lines.join('\n') });
    expect(stderr).toBe('chokepoint: warning: gap.s2p, line 7 left out: "n/a" is not a number\n');
    const table = readsBackAsPart(json).table;
    expect(table.frequencyHz).toHaveLength(30);
    expect(table.frequencyHz).not.toContain(158489);
  });
});

/** Every bad input: exit 2, nothing on standard output, one message on standard error, no stack trace. */
async function refused(argv: string[], files: Record<string, string> = {}): Promise<string> {
  const { code, stdout, stderr } = await run(argv, files);
  expect(code, stderr).toBe(2);
  expect(stdout).toBe('');
  expect(stderr).toMatch(/^chokepoint: /u);
  expect(stderr).not.toMatch(/\n\s+at /u);
  return stderr;
}

/** A file in fixtures/touchstone (made with scikit-rf 0.15.4) and the part impedance scikit-rf computed for it. */
function scikitRf(name: string): { files: Record<string, string>; re: readonly number[]; im: readonly number[] } {
  const path = `fixtures/touchstone/${name}`;
  const expected = JSON.parse(fixture(`${path}.expected.json`)) as { part: { re: number[]; im: number[] } };
  return { files: { [path]: fixture(path) }, re: expected.part.re, im: expected.part.im };
}

describe('chokepoint measured-part: one-port and version 2 Touchstone files (made with scikit-rf 0.15.4)', () => {
  const cases: readonly { name: string; args: string[]; origin: string; note?: RegExp }[] = [
    { name: 'rlc-bead-reflection-ma-mhz.s1p', args: [], origin: 'touchstone-reflection' },
    { name: 'capacitor-reflection-ri-ghz-75ohm.s1p', args: ['--fixture', 'reflection'], origin: 'touchstone-reflection' },
    { name: 'rlc-bead-z-ma-hz-r1.s1p', args: [], origin: 'touchstone-one-port-impedance' },
    { name: 'capacitor-y-db-mhz-r50.s1p', args: [], origin: 'touchstone-one-port-impedance' },
    { name: 'rlc-bead-z-v2-ri-mhz.ts', args: [], origin: 'touchstone-one-port-impedance' },
    { name: 'winding-series-thru-v2-full-12_21-ri-per-port.ts', args: ['--fixture', 'series-thru'], origin: 'touchstone-series-thru' },
    { name: 'capacitor-shunt-thru-v2-lower-db-per-port.ts', args: ['--fixture', 'shunt-thru'], origin: 'touchstone-shunt-thru' },
    {
      name: 'rlc-bead-reflection-port-impedance-comments-25ohm.s1p',
      args: [],
      origin: 'touchstone-reflection',
      note: /^chokepoint: note: .*, line 2: the file gives no reference impedance \(R\) on its option line: the port impedances stated in its comments were used/mu,
    },
  ];
  for (const { name, args, origin, note } of cases) {
    it(`${name}: the part's impedance agrees with scikit-rf's within 1e-9`, async () => {
      const { files, re, im } = scikitRf(name);
      const { json, stderr } = await printed(['measured-part', `fixtures/touchstone/${name}`, ...args], files);
      const part = readsBackAsPart(json);
      expect(part.origin?.format).toBe(origin);
      expect(part.table.frequencyHz).toHaveLength(re.length);
      part.table.magnitudeOhm.forEach((m, k) => expect(relative(m, Math.hypot(re[k]!, im[k]!))).toBeLessThan(1e-9));
      part.table.phaseDeg.forEach((p, k) => expect(Math.abs(p - (Math.atan2(im[k]!, re[k]!) * 180) / Math.PI)).toBeLessThan(1e-7));
      if (note) expect(stderr).toMatch(note);
    });
  }

  it('refuses a series-thru fixture for a one-port, and a one-port S file referred to a complex impedance', async () => {
    const { files } = scikitRf('rlc-bead-reflection-ma-mhz.s1p');
    expect(await refused(['measured-part', 'fixtures/touchstone/rlc-bead-reflection-ma-mhz.s1p', '--fixture', 'series-thru'], files)).toMatch(
      /a 1-port file holds one reflection/u,
    );
    expect(await refused(['measured-part', 'c.s1p'], { 'c.s1p': '# GHz S RI R (50+50j)\n1 0.2 0\n2 0.2 0\n' })).toMatch(
      /line 2: the reference impedance of port 1 is complex here/u,
    );
  });
});

describe('chokepoint measured-part: bad input exits 2 with a message that names the problem', () => {
  it('a file that does not exist or is a folder', async () => {
    expect(await refused(['measured-part', 'missing.csv'])).toBe('chokepoint: cannot read the measurement file missing.csv: no such file\n');
    expect(await refused(['measured-part', 'fixtures/'])).toMatch(/cannot read the measurement file fixtures\/: it is a folder, not a file/u);
    expect(await refused(['measured-part'])).toMatch(/missing argument <file>/u);
  });

  it('a Touchstone file without --fixture, or with a table option', async () => {
    expect(await refused(['measured-part', WINDING])).toBe(
      `chokepoint: ${WINDING} is a 2-port Touchstone file: say how the part was connected with --fixture series-thru (in series between the ports) or --fixture shunt-thru (from the through line to ground)\nRun "chokepoint help measured-part" for the usage.\n`,
    );
    expect(await refused(['measured-part', WINDING, '--fixture', 'series-thru', '--frequency-unit', 'MHz'])).toMatch(
      /--frequency-unit is for \|Z\| tables; the Touchstone file .* gives its unit in its option line/u,
    );
  });

  it('a fixture for a table, an unknown fixture or unit', async () => {
    expect(await refused(['measured-part', BEAD, '--fixture', 'series-thru'])).toMatch(/--fixture is for Touchstone files; .*invented-bead\.csv reads as a \|Z\| table/u);
    expect(await refused(['measured-part', WINDING, '--fixture', 'series'])).toMatch(/--fixture must be "reflection", "series-thru", "shunt-thru", got "series"/u);
    expect(await refused(['measured-part', BEAD, '--frequency-unit', 'THz'])).toMatch(/--frequency-unit must be Hz, kHz, MHz, GHz, got "THz"/u);
  });

  it('--id without --placement and the other way round, a bad id, a choke placement', async () => {
    expect(await refused(['measured-part', BEAD, '--id', 'FB1'])).toMatch(/--id needs --placement/u);
    expect(await refused(['measured-part', BEAD, '--placement', 'series-line1'])).toMatch(/--placement needs --id/u);
    expect(await refused(['measured-part', BEAD, '--id', '1FB', '--placement', 'series-line1'])).toMatch(/--id: an id starts with a letter .*, got "1FB"/u);
    expect(await refused(['measured-part', BEAD, '--id', 'FB1', '--placement', 'both-lines-coupled'])).toMatch(/"both-lines-coupled" is for a common-mode choke/u);
    expect(await refused(['measured-part', BEAD, '--id', 'FB1', '--placement', 'sideways'])).toMatch(/--placement must be one of series-line1, .*, got "sideways"/u);
    // An id like the checking design's stage still works: the stage takes another name.
    expect((await printed(['measured-part', BEAD, '--id', 'stage', '--placement', 'line1-to-ground'])).json).toMatchObject({ id: 'stage' });
  });

  it('a header in dB, or a header unit that contradicts --frequency-unit: the header is never dropped', async () => {
    const db = 'Frequency (Hz),|Z| (dB),Phase (deg)\n1e6,10,85\n2e6,20,80\n';
    expect(await refused(['measured-part', 'db.csv'], { 'db.csv': db })).toBe(
      'chokepoint: db.csv does not give a usable |Z| table (1 problem):\n  line 1: the |Z| column "|Z| (dB)" is in dB; export |Z| in ohms\n',
    );
    expect(await refused(['measured-part', BEAD, '--frequency-unit', 'kHz'])).toMatch(
      /\n {2}line 3: the header gives frequencies in MHz but kHz was asked for; drop one of the two\n$/u,
    );
  });

  it('no data at all, or fewer than two usable points', async () => {
    expect(await refused(['measured-part', 'empty.csv'], { 'empty.csv': '' })).toMatch(/empty\.csv does not give a usable \|Z\| table \(1 problem\):\n {2}no data lines found/u);
    const one = await refused(['measured-part', 'one.csv'], { 'one.csv': '1e6,10,85\n2e6,-1,80\n' });
    expect(one).toBe(
      'chokepoint: one.csv does not give a usable |Z| table (2 problems):\n  line 2: |Z| must be positive, got -1 Ω\n  a table needs at least 2 data lines, found 1\n',
    );
  });

  it('frequencies out of order refuse the whole table (which line is wrong cannot be told)', async () => {
    const unsorted = '1e6,10,85\n1e8,30,80\n2e6,12,84\n3e6,14,83\n';
    expect(await refused(['measured-part', 'unsorted.csv'], { 'unsorted.csv': unsorted })).toMatch(
      /\n {2}line 3: frequency 2000000 Hz is below the 100000000 Hz of line 2: sort the table by rising frequency\n/u,
    );
    expect(await refused(['measured-part', 'twice.csv'], { 'twice.csv': '1e6,10,85\n2e6,12,84\n2e6,13,84\n' })).toMatch(/line 3: frequency 2000000 Hz repeats line 2/u);
    const lines = FIXTURES[WINDING]!.split('\n');
    [lines[8], lines[9]] = [lines[9]!, lines[8]!];
    expect(await refused(['measured-part', 'swapped.s2p', '--fixture', 'series-thru'], { 'swapped.s2p': lines.join('\n') })).toMatch(
      /line 10: frequency .* Hz is not above the .* Hz of line 9: Touchstone frequencies rise/u,
    );
  });

  it('a Touchstone file with Z-parameters, a wrapped record cut short, or one-port data', async () => {
    // Z-parameters of a two-port whose series-thru impedance is zero (all entries equal: det Z = 0).
    expect(await refused(['measured-part', 'z.s2p', '--fixture', 'series-thru'], { 'z.s2p': '# MHz Z RI R 50\n1 1 0 1 0 1 0 1 0\n' })).toMatch(
      /\n {2}line 2: Z21 = 50\.0000 \+ j0\.00000 makes the series-thru impedance zero\n/u,
    );
    expect(await refused(['measured-part', 'h.s2p', '--fixture', 'series-thru'], { 'h.s2p': '# MHz H RI R 50\n1 1 0 1 0 1 0 1 0\n' })).toMatch(
      /\n {2}line 1: option line: H-parameters are not read; export S-, Y- or Z-parameters\n/u,
    );
    // A line that is not a whole record may belong to a wrapped one: it is never left out.
    const lines = FIXTURES[WINDING]!.split('\n');
    lines[7] = lines[7]!.split(' ').slice(0, 8).join(' ');
    expect(await refused(['measured-part', 'cut.s2p', '--fixture', 'series-thru'], { 'cut.s2p': lines.join('\n') })).toMatch(/\n {2}line 8: 8 values; /u);
    expect(await refused(['measured-part', 'one.s1p', '--fixture', 'shunt-thru'], { 'one.s1p': '# MHz S MA R 50\n1 0.5 0\n' })).toMatch(
      /a 1-port file holds one reflection; --fixture shunt-thru needs a 2-port \(thru\) file/u,
    );
  });

  it('a file that is not a table at all (too many rejected lines)', async () => {
    const text = Array.from({ length: 300 }, (_, i) => `${i + 1},-1,0`).join('\n');
    const message = await refused(['measured-part', 'words.csv'], { 'words.csv': text });
    expect(message).toMatch(/^chokepoint: words\.csv does not give a usable \|Z\| table \(201 problems\):\n {2}line 1: \|Z\| must be positive, got -1 Ω\n/u);
    expect(message).toMatch(/\n {2}… and 171 more\n$/u);
  });

  it('an output file that cannot be written', async () => {
    expect(await refused(['measured-part', BEAD, '--out', '/readonly/part.json'])).toBe('chokepoint: cannot write /readonly/part.json: permission denied\n');
  });
});

describe('chokepoint measured-part: help', () => {
  it('is listed in the general help and has its own', async () => {
    expect((await run(['help'])).stdout).toMatch(/\n {2}measured-part {2}/u);
    const { code, stdout } = await run(['measured-part', '--help']);
    expect(code).toBe(0);
    expect(stdout).toMatch(/^Usage: chokepoint measured-part <file> \[options\]/u);
    for (const option of ['--fixture <fixture>', '--frequency-unit <unit>', '--id <id>', '--placement <placement>', '-o, --out <file>', '--strict']) {
      expect(stdout).toContain(option);
    }
  });
});

describe('the JSON layout', () => {
  it('indents objects, keeps each list of numbers on one line, and reads back to the same values', () => {
    const value = { kind: 'measured', table: { frequencyHz: [1e6, 0.1 + 0.2], phaseDeg: [-1.5e-300, 180] }, origin: { fileName: 'a [1,2].csv', skipped: undefined } };
    const text = formatJson(value);
    expect(text).toBe(
      '{\n  "kind": "measured",\n  "table": {\n    "frequencyHz": [1000000, 0.30000000000000004],\n    "phaseDeg": [-1.5e-300, 180]\n  },\n  "origin": {\n    "fileName": "a [1,2].csv"\n  }\n}',
    );
    expect(JSON.parse(text)).toEqual({ ...value, origin: { fileName: 'a [1,2].csv' } });
  });
});
