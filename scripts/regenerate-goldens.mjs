#!/usr/bin/env node
/**
 * Regenerate the SPICE golden curves under fixtures/golden/ with ngspice (batch mode).
 *
 *   npm run goldens                      rewrite every fixtures/golden/<case>/expected.csv and inserted.csv
 *   npm run goldens -- <case> [<case>]   only the named case folders
 *   npm run goldens -- --check           rewrite nothing; exit 1 if any expected.csv or inserted.csv is stale
 *
 * Each case folder holds hand-written netlists: cm.cir and dm.cir (required) and cispr17.cir
 * (optional), plus any *.inc files they include. Every netlist ends its .control block with
 * `wrdata <name>.data <vectors…>` (with wr_singlescale and wr_vecnames set), so the data file
 * starts with a header row: the frequency scale, then the vectors it wrote.
 *
 * For a case, each netlist runs in one fresh temporary directory (`ngspice -b <name>.cir`, HOME
 * pointed there so no personal .spiceinit applies). The data files must all share the same
 * frequency column; expected.csv is that column ("frequency_hz") followed by every netlist's
 * vectors in the order cm, dm, cispr17, numbers copied exactly as ngspice printed them
 * (16 significant digits with numdgt=15).
 *
 * The engine adds points of its own to the plan's grid: every element's self-resonance and every
 * located peak and notch of the response (docs/engine-math.md §7). Those are often where the
 * numbers matter most (a 1 Hz wide peak of a lossy choke falls between any two grid points), so
 * each case also gets inserted.csv: the same columns, computed by ngspice at exactly the
 * frequencies the engine's sweep adds. The script asks the engine for its frequency list
 * (`node bin/chokepoint.mjs sweep design.json`, the point_origin column; only frequencies leave
 * the engine, never a value), then runs each netlist once more with its `run` replaced by one
 * single-point analysis per frequency (`foreach f … ac lin 1 $f $f … end` in the .control block,
 * which Debian's ngspice-39 runs; it has no `.ac list`).
 *
 * Plain Node ESM, no dependencies: the vitest suite imports runCase() and readExpected() from here.
 */
import { execFile } from 'node:child_process';
import { copyFile, mkdtemp, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

/** Absolute path of fixtures/golden/. */
export const GOLDEN_ROOT = fileURLToPath(new URL('../fixtures/golden/', import.meta.url));

/** Netlists a case may hold, in the order their columns appear in expected.csv. */
export const NETLISTS = /** @type {const} */ (['cm.cir', 'dm.cir', 'cispr17.cir']);
const REQUIRED_NETLISTS = ['cm.cir', 'dm.cir'];

export const FREQUENCY_COLUMN = 'frequency_hz';
/** The file of ngspice values at the engine's inserted points (element resonances, located extrema). */
export const INSERTED_FILE = 'inserted.csv';
const NGSPICE = 'ngspice';
const REPOSITORY_ROOT = fileURLToPath(new URL('../', import.meta.url));
const RUN_TIMEOUT_MS = 60_000;

/** Thrown when the ngspice executable cannot be started at all. */
export class NgspiceMissingError extends Error {
  constructor(cause) {
    super(
      'ngspice was not found on the PATH, so the SPICE goldens cannot be regenerated. ' +
        'Install it (Debian/Ubuntu: sudo apt-get install ngspice; the committed goldens came from Debian ngspice-39) and retry.',
      { cause },
    );
    this.name = 'NgspiceMissingError';
  }
}

/**
 * Run a program and collect its output. Resolves even when the program exits non-zero; rejects
 * with NgspiceMissingError when it cannot be started.
 * @returns {Promise<{ code: number | null, stdout: string, stderr: string }>}
 */
function run(file, args, options) {
  return new Promise((resolvePromise, reject) => {
    execFile(file, args, { ...options, encoding: 'utf8', timeout: RUN_TIMEOUT_MS, maxBuffer: 64 * 1024 * 1024 }, (error, stdout, stderr) => {
      if (error && error.code === 'ENOENT') {
        reject(new NgspiceMissingError(error));
        return;
      }
      if (error && error.killed) {
        reject(new Error(`${file} ${args.join(' ')} was stopped after ${RUN_TIMEOUT_MS} ms`, { cause: error }));
        return;
      }
      const code = error ? (typeof error.code === 'number' ? error.code : 1) : 0;
      resolvePromise({ code, stdout: String(stdout), stderr: String(stderr) });
    });
  });
}

/**
 * The first line of `ngspice --version` that names the program, e.g. "** ngspice-39 : Circuit level
 * simulation program", reduced to "ngspice-39". Rejects with NgspiceMissingError if it is absent.
 * @returns {Promise<string>}
 */
export async function ngspiceVersion() {
  const { code, stdout, stderr } = await run(NGSPICE, ['--version'], {});
  const match = /ngspice-[0-9][0-9A-Za-z.+-]*/u.exec(`${stdout}\n${stderr}`);
  if (code !== 0 || !match) throw new Error(`"ngspice --version" did not report a version (exit ${code}):\n${stdout}${stderr}`);
  return match[0];
}

/**
 * Parse a wrdata file written with wr_singlescale and wr_vecnames: a header row of names, then
 * whitespace-separated numbers (a repeated header row, as appended runs write, is skipped). Only real vectors are expected (a complex vector would appear as
 * two columns with one name, which is refused).
 * @param {string} text
 * @param {string} origin for error messages
 * @returns {{ header: string[], rows: string[][] }}
 */
export function parseWrdata(text, origin) {
  const all = text.split(/\r?\n/u).map((line) => line.trim()).filter((line) => line.length > 0);
  // One single-point analysis per inserted frequency appends a header row each time; drop the
  // repeats (they must be the same row, or the columns would not line up).
  const lines = all.filter((line, index) => index === 0 || line !== all[0]);
  if (lines.length < 2) throw new Error(`${origin}: expected a header row and data rows, found ${lines.length} line(s)`);
  const header = lines[0].split(/\s+/u);
  if (header[0] !== 'frequency') throw new Error(`${origin}: the first column is "${header[0]}", expected the AC scale "frequency"`);
  if (new Set(header).size !== header.length) {
    throw new Error(`${origin}: repeated column names (${header.join(', ')}); write real vectors only (db(), ph()), not complex ones`);
  }
  const rows = lines.slice(1).map((line, index) => {
    const fields = line.split(/\s+/u);
    if (fields.length !== header.length) {
      throw new Error(`${origin}: data row ${index + 1} has ${fields.length} fields, the header has ${header.length}`);
    }
    for (const field of fields) {
      if (!Number.isFinite(Number(field))) throw new Error(`${origin}: data row ${index + 1} holds "${field}", not a finite number`);
    }
    return fields;
  });
  return { header, rows };
}

/** Lines of ngspice's console output that mean the netlist did not do what it says. */
function findProblems(output) {
  return output
    .split(/\r?\n/u)
    .filter((line) => /\berror\b|\bwarning\b|singular|interrupted|no such|unknown|not found|could not/iu.test(line));
}

/**
 * The netlists of a case folder, in column order. cm.cir and dm.cir are required; any other
 * *.cir file is refused so that nothing in the folder goes unchecked.
 * @param {string} caseDir
 * @returns {Promise<string[]>}
 */
export async function caseNetlists(caseDir) {
  const files = await readdir(caseDir);
  const cir = files.filter((name) => name.endsWith('.cir'));
  const unknown = cir.filter((name) => !NETLISTS.includes(name));
  if (unknown.length > 0) throw new Error(`${caseDir}: unexpected netlist(s) ${unknown.join(', ')}; expected only ${NETLISTS.join(', ')}`);
  const missing = REQUIRED_NETLISTS.filter((name) => !cir.includes(name));
  if (missing.length > 0) throw new Error(`${caseDir}: missing ${missing.join(', ')}`);
  return NETLISTS.filter((name) => cir.includes(name));
}

/**
 * Run every netlist of one case folder with ngspice and merge their wrdata columns.
 * Nothing in the case folder is written.
 * @param {string} caseDir absolute or relative path of fixtures/golden/<case>
 * @returns {Promise<{ caseName: string, ngspiceVersion: string, netlists: string[], header: string[], rows: string[][] }>}
 */
export async function runCase(caseDir) {
  return runNetlists(caseDir, (text) => text);
}

/**
 * The same netlists run at exactly the given frequencies instead of their `.ac` grid: one
 * single-point analysis per frequency (pointNetlist). The result has the shape of runCase's,
 * one row per frequency in the order given.
 * @param {string} caseDir
 * @param {readonly string[]} frequencies in Hz, as decimal text (passed to ngspice as written)
 */
export async function runCaseAt(caseDir, frequencies) {
  if (frequencies.length === 0) throw new Error(`${caseDir}: no frequencies to run at`);
  return runNetlists(caseDir, (text, where) => pointNetlist(text, frequencies, where));
}

/**
 * A netlist rewritten to run at a list of frequencies: its .control block's `run` line and the
 * lines after it up to and including its `wrdata` line become the body of
 * `foreach f <frequencies>` with `run` replaced by `ac lin 1 $f $f`, and `set appendwrite` makes
 * each pass add its row to the one data file. Anything else in the netlist stays as written.
 * @param {string} text the hand-written netlist
 * @param {readonly string[]} frequencies decimal text, Hz
 * @param {string} where for error messages
 */
export function pointNetlist(text, frequencies, where) {
  for (const f of frequencies) {
    if (!/^[0-9][0-9.eE+-]*$/u.test(f) || !(Number(f) > 0)) throw new Error(`${where}: "${f}" is not a positive frequency in Hz`);
  }
  const lines = text.split('\n');
  const runLines = lines.flatMap((line, index) => (/^\s*run\s*$/u.test(line) ? [index] : []));
  const wrdataLines = lines.flatMap((line, index) => (/^\s*wrdata\s/u.test(line) ? [index] : []));
  if (runLines.length !== 1 || wrdataLines.length !== 1 || wrdataLines[0] < runLines[0]) {
    throw new Error(`${where}: to run at single frequencies the .control block needs exactly one "run" line followed by exactly one "wrdata" line`);
  }
  const [run] = runLines;
  const [wrdata] = wrdataLines;
  return [
    ...lines.slice(0, run),
    'set appendwrite',
    `foreach f ${frequencies.join(' ')}`,
    'ac lin 1 $f $f',
    ...lines.slice(run + 1, wrdata + 1),
    'end',
    ...lines.slice(wrdata + 1),
  ].join('\n');
}

/** Run a case's netlists, each as `rewrite` makes it, in a fresh directory; merge their columns. */
async function runNetlists(caseDir, rewrite) {
  const dir = resolve(caseDir);
  const version = await ngspiceVersion();
  const netlists = await caseNetlists(dir);
  const work = await mkdtemp(join(tmpdir(), 'chokepoint-ngspice-'));
  try {
    for (const name of await readdir(dir)) {
      if (name.endsWith('.inc')) await copyFile(join(dir, name), join(work, name));
      if (name.endsWith('.cir')) await writeFile(join(work, name), rewrite(await readFile(join(dir, name), 'utf8'), `${basename(dir)}/${name}`));
    }
    const header = [FREQUENCY_COLUMN];
    /** @type {string[][]} */
    let rows = [];
    for (const netlist of netlists) {
      const dataName = netlist.replace(/\.cir$/u, '.data');
      const { code, stdout, stderr } = await run(NGSPICE, ['-b', netlist], { cwd: work, env: { ...process.env, HOME: work } });
      const where = `${basename(dir)}/${netlist}`;
      const problems = findProblems(`${stdout}\n${stderr}`);
      if (code !== 0 || problems.length > 0) {
        throw new Error(`ngspice -b ${where} failed (exit ${code}):\n${problems.join('\n') || `${stdout}\n${stderr}`}`);
      }
      let text;
      try {
        text = await readFile(join(work, dataName), 'utf8');
      } catch (cause) {
        throw new Error(`ngspice -b ${where} wrote no ${dataName}; its .control block must end with "wrdata ${dataName} …"`, { cause });
      }
      const data = parseWrdata(text, `${where} -> ${dataName}`);
      for (const name of data.header.slice(1)) {
        if (header.includes(name)) throw new Error(`${where}: column "${name}" is already written by an earlier netlist`);
        header.push(name);
      }
      if (rows.length === 0) {
        rows = data.rows.map((row) => [...row]);
      } else {
        if (data.rows.length !== rows.length) throw new Error(`${where}: ${data.rows.length} rows, earlier netlists gave ${rows.length}`);
        data.rows.forEach((row, i) => {
          if (row[0] !== rows[i][0]) throw new Error(`${where}: row ${i + 1} is at ${row[0]} Hz, earlier netlists at ${rows[i][0]} Hz`);
          rows[i].push(...row.slice(1));
        });
      }
    }
    return { caseName: basename(dir), ngspiceVersion: version, netlists, header, rows };
  } finally {
    await rm(work, { recursive: true, force: true });
  }
}

/**
 * The frequencies the engine's sweep of a case's design.json adds to the plan's grid (element
 * self-resonances and located peaks and notches), as the command line prints them (shortest
 * round-trip decimal), rising. Runs `node bin/chokepoint.mjs sweep design.json --quiet`; only
 * the frequency_Hz and point_origin columns are read.
 * @param {string} caseDir
 * @returns {Promise<string[]>}
 */
export async function engineInsertedFrequencies(caseDir) {
  const design = join(resolve(caseDir), 'design.json');
  const { code, stdout, stderr } = await run(process.execPath, [join(REPOSITORY_ROOT, 'bin', 'chokepoint.mjs'), 'sweep', design, '--quiet'], {
    cwd: REPOSITORY_ROOT,
  });
  if (code !== 0) throw new Error(`chokepoint sweep ${design} failed (exit ${code}):\n${stderr}`);
  const [head, ...lines] = stdout.split(/\r?\n/u).filter((line) => line.length > 0);
  const names = (head ?? '').split(',');
  const frequencyAt = names.indexOf('frequency_Hz');
  const originAt = names.indexOf('point_origin');
  if (frequencyAt < 0 || originAt < 0) throw new Error(`chokepoint sweep ${design}: no frequency_Hz or point_origin column in ${head}`);
  return lines.map((line) => line.split(',')).filter((fields) => fields[originAt] !== 'grid').map((fields) => fields[frequencyAt]);
}

/** expected.csv text for a runCase() result. */
export function formatCsv(result) {
  return `${[result.header, ...result.rows].map((row) => row.join(',')).join('\n')}\n`;
}

/**
 * Read an expected.csv: the header and one numeric array per column.
 * @param {string} file
 * @returns {Promise<{ header: string[], rows: string[][], columns: Record<string, number[]> }>}
 */
export async function readExpected(file) {
  const text = await readFile(file, 'utf8');
  const lines = text.split(/\r?\n/u).filter((line) => line.length > 0);
  if (lines.length < 2) throw new Error(`${file}: no data rows`);
  const header = lines[0].split(',');
  const rows = lines.slice(1).map((line) => line.split(','));
  /** @type {Record<string, number[]>} */
  const columns = {};
  header.forEach((name, c) => {
    columns[name] = rows.map((row, r) => {
      const value = Number(row[c]);
      if (row.length !== header.length || !Number.isFinite(value)) throw new Error(`${file}: row ${r + 2} column ${name} is not a number`);
      return value;
    });
  });
  return { header, rows, columns };
}

/** Absolute paths of every case folder under fixtures/golden/ (those with a design.json). */
export async function listCases(root = GOLDEN_ROOT) {
  const entries = await readdir(root, { withFileTypes: true });
  const cases = [];
  for (const entry of entries) {
    if (!entry.isDirectory()) continue;
    const dir = join(root, entry.name);
    const hasDesign = await stat(join(dir, 'design.json')).then(
      () => true,
      () => false,
    );
    if (hasDesign) cases.push(dir);
  }
  return cases.sort();
}

function describeRun(result) {
  return `${result.rows.length} points, ${result.header.length - 1} columns from ${result.netlists.join(', ')} (${result.ngspiceVersion})`;
}

/** Write a file (or, with check, only compare it); returns 1 when it was stale. */
async function writeOrCheck(target, text, check, summary) {
  const current = await readFile(target, 'utf8').catch(() => '');
  if (check) {
    console.log(`${current === text ? 'current' : 'STALE  '} ${summary}`);
    return current === text ? 0 : 1;
  }
  await writeFile(target, text);
  console.log(`${current === text ? 'unchanged' : 'written  '} ${summary}`);
  return 0;
}

async function main(argv) {
  const check = argv.includes('--check');
  const names = argv.filter((arg) => !arg.startsWith('--'));
  const all = await listCases();
  const chosen = names.length === 0 ? all : names.map((name) => join(GOLDEN_ROOT, basename(name)));
  for (const dir of chosen) {
    if (!all.includes(dir)) throw new Error(`no golden case "${basename(dir)}" under ${GOLDEN_ROOT}`);
  }
  let stale = 0;
  for (const dir of chosen) {
    const caseName = basename(dir);
    const result = await runCase(dir);
    stale += await writeOrCheck(join(dir, 'expected.csv'), formatCsv(result), check, `${caseName}: ${describeRun(result)}`);
    const inserted = await engineInsertedFrequencies(dir);
    const target = join(dir, INSERTED_FILE);
    if (inserted.length === 0) {
      const present = await stat(target).then(() => true, () => false);
      if (present && check) stale += 1;
      if (present && !check) await rm(target);
      console.log(`${present ? (check ? 'STALE  ' : 'removed  ') : check ? 'current' : 'unchanged'} ${caseName}: the engine inserts no points, so no ${INSERTED_FILE}`);
      continue;
    }
    const atPoints = await runCaseAt(dir, inserted);
    stale += await writeOrCheck(target, formatCsv(atPoints), check, `${caseName}/${INSERTED_FILE}: ${describeRun(atPoints)}, at the engine's inserted points`);
  }
  if (stale > 0) {
    console.error(`${stale} expected.csv / inserted.csv file(s) differ from a fresh ngspice run; run "npm run goldens" and review the diff.`);
    process.exitCode = 1;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  main(process.argv.slice(2)).catch((error) => {
    console.error(error instanceof NgspiceMissingError ? error.message : error);
    process.exitCode = 1;
  });
}
