import { readFileSync } from 'node:fs';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import type { Command } from '../../src/cli/command.ts';
import { type CliIo, runCli } from '../../src/cli/run-cli.ts';
import { sweepDesign, type SweepResult } from '../../src/engine/index.ts';
import type { SweepJson } from '../../src/io/sweep-export.ts';
import { requireDesign } from '../../src/model/index.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const demoText = readFileSync(new URL(`../../${DEMO}`, import.meta.url), 'utf8');
const demoDesign = requireDesign(JSON.parse(demoText));

/** Errors as Node's fs raises them: an Error with a code. */
function fsError(code: string, path: string): Error {
  return Object.assign(new Error(`${code}: failed, '${path}'`), { code });
}

interface Run {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
  readonly written: ReadonlyMap<string, string>;
}

/** Run the command line in-process on files kept in memory; "dir/" names a folder, "/readonly/…" cannot be written. */
async function run(argv: string[], files: Record<string, string> = {}, commands?: readonly Command[]): Promise<Run> {
  const all: Record<string, string> = { [DEMO]: demoText, ...files };
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
      if (path.startsWith('/missing/')) throw fsError('ENOENT', path);
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
  const code = commands ? await runCli(argv, io, commands) : await runCli(argv, io);
  return { code, stdout, stderr, written };
}

/** The design file text with one change made to its JSON. */
function demoWith(change: (design: Record<string, unknown>) => void): string {
  const design = JSON.parse(demoText) as Record<string, unknown>;
  change(design);
  return JSON.stringify(design, null, 2);
}

function csvColumns(text: string): Map<string, string[]> {
  const parsed = Papa.parse<string[]>(text.trimEnd(), { delimiter: ',' });
  expect(parsed.errors).toEqual([]);
  const [header, ...rows] = parsed.data;
  return new Map(header!.map((name, i) => [name, rows.map((row) => row[i]!)]));
}

const numbers = (values: readonly string[] | undefined): number[] => (values ?? []).map(Number);

let refined: SweepResult | undefined;
const demoSweep = (): SweepResult => (refined ??= sweepDesign(demoDesign));

describe('chokepoint sweep', () => {
  it('writes CSV to standard output whose numbers are the engine’s', async () => {
    const { code, stdout, stderr } = await run(['sweep', DEMO]);
    expect(code).toBe(0);
    expect(stderr).toBe('');
    const columns = csvColumns(stdout);
    const result = demoSweep();
    expect(numbers(columns.get('frequency_Hz'))).toEqual(Array.from(result.frequencyHz));
    expect(numbers(columns.get('cm_insertion_loss_50ohm_dB'))).toEqual(Array.from(result.columns.insertionLoss50Cm));
    expect(numbers(columns.get('dm_insertion_loss_in_circuit_dB'))).toEqual(Array.from(result.columns.insertionLossInCircuitDm));
    expect(numbers(columns.get('line2_from_cm_dB'))).toEqual(Array.from(result.columns.line2FromCm));
    const t = result.transfers.line1FromDm;
    expect(numbers(columns.get('line1_from_dm_deg'))).toEqual(Array.from(t.re, (re, i) => (Math.atan2(t.im[i]!, re) * 180) / Math.PI));
  });

  it('writes JSON with --json, with the version as generator', async () => {
    const { code, stdout } = await run(['sweep', DEMO, '--json']);
    expect(code).toBe(0);
    const json = JSON.parse(stdout) as SweepJson;
    const result = demoSweep();
    expect(json).toMatchObject({ format: 'chokepoint-sweep', generator: 'chokepoint 9.8.7-test', designName: demoDesign.name });
    expect(json.pointCount).toBe(result.frequencyHz.length);
    expect(json.data['frequency_Hz']).toEqual(Array.from(result.frequencyHz));
    expect(json.data['dm_insertion_loss_50ohm_dB']).toEqual(Array.from(result.columns.insertionLoss50Dm));
    expect(json.resonances).toEqual(result.resonances);
  });

  it('writes to a file with --out (or -o) and says what it wrote on standard error', async () => {
    for (const flag of ['--out', '-o']) {
      const { code, stdout, stderr, written } = await run(['sweep', DEMO, flag, 'out/sweep.csv']);
      expect(code).toBe(0);
      expect(stdout).toBe('');
      expect(written.get('out/sweep.csv')).toMatch(/^frequency_Hz,/u);
      expect(stderr).toMatch(/^chokepoint: wrote \d+ points from 9 kHz to 30 MHz to out\/sweep\.csv\n$/u);
    }
    const quiet = await run(['sweep', '--out=x.json', '--json', '-q', DEMO]);
    expect(quiet.code).toBe(0);
    expect(quiet.stderr).toBe('');
    expect(JSON.parse(quiet.written.get('x.json')!)).toMatchObject({ format: 'chokepoint-sweep' });
  });

  it('treats --out - as standard output', async () => {
    const { code, stdout, written } = await run(['sweep', DEMO, '--out', '-']);
    expect(code).toBe(0);
    expect(stdout).toMatch(/^frequency_Hz,/u);
    expect(written.size).toBe(0);
  });

  it('skips the refinement with --no-refine', async () => {
    const { code, stdout } = await run(['sweep', DEMO, '--no-refine']);
    expect(code).toBe(0);
    const coarse = sweepDesign(demoDesign, { refine: false });
    const columns = csvColumns(stdout);
    expect(numbers(columns.get('frequency_Hz'))).toEqual(Array.from(coarse.frequencyHz));
    expect(columns.get('point_origin')).not.toContain('response-extremum');
    expect(coarse.frequencyHz.length).toBeLessThan(demoSweep().frequencyHz.length);
  });

  it('writes every engine column with --columns all', async () => {
    const { code, stdout } = await run(['sweep', DEMO, '--columns', 'all', '--no-refine']);
    expect(code).toBe(0);
    const columns = csvColumns(stdout);
    expect(numbers(columns.get('dm_input_impedance_ohm'))).toEqual(Array.from(sweepDesign(demoDesign, { refine: false }).columns.inputImpedanceDmOhm));
  });

  it('sweeps another range with --start, --stop and --points-per-decade', async () => {
    const { code, stdout } = await run(['sweep', DEMO, '--start', '150k', '--stop', '30 MHz', '--points-per-decade', '20', '--no-refine']);
    expect(code).toBe(0);
    const frequencies = numbers(csvColumns(stdout).get('frequency_Hz'));
    expect(frequencies[0]).toBe(150e3);
    expect(frequencies[frequencies.length - 1]).toBe(30e6);
    const plan = { ...demoDesign, frequencyPlan: { startHz: 150e3, stopHz: 30e6, pointsPerDecade: 20 } };
    expect(frequencies).toEqual(Array.from(sweepDesign(plan, { refine: false }).frequencyHz));
  });

  it('prints the sweep’s warnings on standard error', async () => {
    const ideal = demoWith((design) => {
      const stages = design['stages'] as { elements: { part: Record<string, unknown> }[] }[];
      delete stages[0]!.elements[0]!.part['esl'];
    });
    const { code, stderr } = await run(['sweep', 'ideal.json', '--no-refine'], { 'ideal.json': ideal });
    expect(code).toBe(0);
    expect(stderr).toMatch(/^chokepoint: warning: CX1 X2 100 nF: no ESL/mu);
  });
});

describe('help and version', () => {
  it.each([[['--help']], [['-h']], [['help']]])('%j prints the general help and exits 0', async (argv) => {
    const { code, stdout, stderr } = await run(argv);
    expect(code).toBe(0);
    expect(stderr).toBe('');
    expect(stdout).toMatch(/^chokepoint 9\.8\.7-test: /u);
    expect(stdout).toMatch(/Usage: chokepoint <command>/u);
    expect(stdout).toMatch(/\n {2}sweep {2}/u);
  });

  it.each([[['help', 'sweep']], [['sweep', '--help']], [['sweep', DEMO, '-h']]])('%j prints the sweep help and exits 0', async (argv) => {
    const { code, stdout } = await run(argv);
    expect(code).toBe(0);
    expect(stdout).toMatch(/^Usage: chokepoint sweep <design\.json> \[options\]/u);
    for (const option of ['--out <file>', '--json', '--no-refine', '--columns <set>', '--start <frequency>', '--stop <frequency>']) {
      expect(stdout).toContain(option);
    }
  });

  it('prints the version', async () => {
    const { code, stdout } = await run(['--version']);
    expect(code).toBe(0);
    expect(stdout).toBe('chokepoint 9.8.7-test\n');
  });
});

/** Every bad input: exit 2, nothing on standard output, a message on standard error and no stack trace. */
async function refused(argv: string[], files: Record<string, string> = {}): Promise<string> {
  const { code, stdout, stderr } = await run(argv, files);
  expect(code, stderr).toBe(2);
  expect(stdout).toBe('');
  expect(stderr).toMatch(/^chokepoint: /u);
  expect(stderr).not.toMatch(/\n\s+at /u);
  return stderr;
}

describe('bad input exits 2 with a message that names the problem', () => {
  it('no command at all (the help goes to standard error)', async () => {
    expect(await run([])).toMatchObject({ code: 2, stdout: '' });
    expect((await run([])).stderr).toMatch(/chokepoint: missing command\n/u);
  });

  it('an unknown command, with a suggestion', async () => {
    expect(await refused(['swep', DEMO])).toMatch(/^chokepoint: unknown command "swep" \(did you mean "sweep"\?\); commands: sweep, check, limits, measured-part, safety, report, diagnose, size, damp, stability, tolerance, map, propose, help\n/u);
    expect(await refused(['help', 'nothing'])).toMatch(/unknown command "nothing"/u);
  });

  it('an unknown option, with a suggestion and a pointer to the help', async () => {
    const message = await refused(['sweep', DEMO, '--jsno']);
    expect(message).toBe('chokepoint: unknown option --jsno for "sweep" (did you mean --json?)\nRun "chokepoint help sweep" for the usage.\n');
    expect(await refused(['sweep', DEMO, '-x'])).toMatch(/unknown option -x for "sweep"/u);
    expect(await refused(['--verbose'])).toMatch(/unknown option --verbose: give a command first/u);
  });

  it('a missing or an extra argument', async () => {
    expect(await refused(['sweep'])).toMatch(/^chokepoint: missing argument <design\.json> .*: chokepoint sweep <design\.json> \[options\]/u);
    expect(await refused(['sweep', '--json'])).toMatch(/missing argument <design\.json>/u);
    expect(await refused(['sweep', DEMO, 'other.json'])).toMatch(/unexpected argument "other\.json"/u);
  });

  it('an option without its value, a flag with a value, an option given twice', async () => {
    expect(await refused(['sweep', DEMO, '--out'])).toMatch(/--out needs a value: --out <file>\n/u);
    expect(await refused(['sweep', DEMO, '--out', '--json'])).toMatch(/--out needs a value: --out <file>, found the option --json/u);
    expect(await refused(['sweep', DEMO, '--json=yes'])).toMatch(/--json takes no value/u);
    expect(await refused(['sweep', DEMO, '--out', 'a', '-o', 'b'])).toMatch(/-o is given twice/u);
  });

  it('a design file that does not exist, or is a folder', async () => {
    expect(await refused(['sweep', 'missing.design.json'])).toBe('chokepoint: cannot read the design missing.design.json: no such file\n');
    expect(await refused(['sweep', 'fixtures/'])).toMatch(/cannot read the design fixtures\/: it is a folder, not a file/u);
    expect(await refused(['sweep', '-'])).toMatch(/standard input is not supported/u);
  });

  it('a design file that is not JSON, located by line and column', async () => {
    const broken = demoText.replace('"version": 2,', '"version": 2');
    const message = await refused(['sweep', 'broken.json'], { 'broken.json': broken });
    expect(message).toMatch(/^chokepoint: broken\.json is not valid JSON: line 4, column 3: expected "," or "\}" after a property value, found "\\""\n/u);
    expect(message).toContain('\n    "name": "Invented demo');
    expect(message).toMatch(/\n {4}\^\n$/u);
    expect(await refused(['sweep', 'empty.json'], { 'empty.json': '' })).toMatch(/empty\.json is not valid JSON: line 1, column 1: expected a value/u);
  });

  it('an invalid field, named by its path and its element', async () => {
    const bad = demoWith((design) => {
      const stages = design['stages'] as { elements: { part: Record<string, unknown> }[] }[];
      stages[0]!.elements[0]!.part['capacitance'] = '4.7 q';
    });
    const message = await refused(['sweep', 'bad.json'], { 'bad.json': bad });
    expect(message).toMatch(/^chokepoint: bad\.json is not a valid design \(1 problem\):\n/u);
    expect(message).toContain('  stages[0].elements[0].part.capacitance: cannot read "4.7 q": unknown unit or prefix "q" (element "CX1")\n');
  });

  it('every problem of a design, each with its path', async () => {
    const bad = demoWith((design) => {
      design['colour'] = 'red';
      const stages = design['stages'] as { elements: Record<string, unknown>[] }[];
      stages[1]!.elements[0]!['placement'] = 'sideways';
      (stages[0]!.elements[3]!['part'] as Record<string, unknown>)['inductance'] = -1;
    });
    const message = await refused(['sweep', 'bad.json'], { 'bad.json': bad });
    expect(message).toMatch(/\(3 problems\)/u);
    expect(message).toMatch(/\n {2}: unknown field "colour"|\n {2}unknown field "colour"/u);
    expect(message).toContain('stages[1].elements[0].placement: expected one of');
    expect(message).toContain('(element "CX2")');
    expect(message).toContain('stages[0].elements[3].part.inductance:');
  });

  it('a file that is JSON but not a design', async () => {
    expect(await refused(['sweep', 'list.json'], { 'list.json': '[1, 2]' })).toMatch(/list\.json is not a valid design \(1 problem\):\n {2}expected a JSON object/u);
  });

  it('a plan that starts above its stop, in the design or on the command line', async () => {
    const inverted = demoWith((design) => {
      design['frequencyPlan'] = { startHz: '40 MHz', stopHz: '30 MHz' };
    });
    expect(await refused(['sweep', 'inverted.json'], { 'inverted.json': inverted })).toMatch(
      /\n {2}frequencyPlan\.stopHz: stop \(30000000 Hz\) must be above start \(40000000 Hz\)\n/u,
    );
    expect(await refused(['sweep', DEMO, '--start', '40 MHz'])).toBe(
      'chokepoint: the sweep would start at 40 MHz (--start), not below its stop at 30 MHz (frequencyPlan.stopHz in the design)\n',
    );
    expect(await refused(['sweep', DEMO, '--start', '1 MHz', '--stop', '100 kHz'])).toMatch(/start at 1 MHz \(--start\), not below its stop at 100 kHz \(--stop\)/u);
  });

  it('option values that do not read', async () => {
    expect(await refused(['sweep', DEMO, '--start', '4.7 q'])).toMatch(/--start: cannot read "4\.7 q" as a frequency: unknown unit or prefix "q"/u);
    expect(await refused(['sweep', DEMO, '--stop', '10 pF'])).toMatch(/--stop: cannot read "10 pF" as a frequency: expected Hz, got F/u);
    expect(await refused(['sweep', DEMO, '--stop', '-5'])).toMatch(/--stop must be a frequency from 1 mHz to 1 THz, got "-5"/u);
    expect(await refused(['sweep', DEMO, '--points-per-decade', '2.5'])).toMatch(/--points-per-decade must be a whole number from 1 to 100000, written with digits only, got "2\.5"/u);
    expect(await refused(['sweep', DEMO, '--columns', 'some'])).toMatch(/--columns must be "standard" or "all", got "some"/u);
  });

  it('a plan with too many points from the command line', async () => {
    expect(await refused(['sweep', DEMO, '--start', '1', '--stop', '1e12', '--points-per-decade', '100000'])).toMatch(
      /frequency plan from the command line is not usable:\n {2}the sweep from 1 Hz \(--start\) to 1 THz \(--stop\) at 100000 points per decade \(--points-per-decade\): .*at most 1000000/u,
    );
  });

  it('an output file that cannot be written', async () => {
    expect(await refused(['sweep', DEMO, '--out', '/readonly/sweep.csv', '--no-refine'])).toBe(
      'chokepoint: cannot write /readonly/sweep.csv: permission denied\n',
    );
    expect(await refused(['sweep', DEMO, '-o', '/missing/sweep.csv', '--no-refine'])).toBe(
      'chokepoint: cannot write /missing/sweep.csv: its folder does not exist\n',
    );
  });
});

describe('a defect in a command', () => {
  it('is reported in one line with exit code 3, never a stack trace', async () => {
    const broken: Command = {
      name: 'boom',
      summary: 'fails',
      description: [],
      arguments: [],
      options: [],
      examples: [],
      run: () => Promise.reject(new TypeError('cannot read properties of undefined')),
    };
    const { code, stdout, stderr } = await run(['boom'], {}, [broken]);
    expect(code).toBe(3);
    expect(stdout).toBe('');
    expect(stderr).toBe('chokepoint: internal error, please report it with the command and input that caused it: TypeError: cannot read properties of undefined\n');
  });
});
