import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  compileNetwork,
  evaluateNetworkOnce,
  logSpace,
  type ComplexColumns,
  type NetworkResponse,
  type ResistiveSystem,
} from '../../src/engine/index.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import {
  column,
  GOLDEN_ROOT,
  goldenCaseNames,
  loadGoldenScript,
  ngspiceOnPath,
  readExpectedCsv,
  type ExpectedTable,
} from '../support/ngspice.ts';

/*
 * Independent oracle for the engine: golden curves from ngspice-39 (Debian) batch AC analysis of
 * netlists written by hand from each case's circuit description, never from the engine.
 * Each case is a folder fixtures/golden/<case>/ with design.json, filter.inc (the filter as a
 * subcircuit), cm.cir / dm.cir (noise source T network + filter + receivers, common-mode or
 * differential-mode EMF), optionally cispr17.cir (resistive insertion loss), expected.csv (the
 * ngspice output) and SOURCE.md. Regenerate with `npm run goldens`.
 */

/** Magnitudes must agree within this, wherever ngspice's value is above FLOOR_DB. */
const MAGNITUDE_TOLERANCE_DB = 0.05;
const PHASE_TOLERANCE_DEG = 0.5;
const FLOOR_DB = -150;
/** A fresh ngspice run must reproduce expected.csv this closely (dB and degrees). */
const RERUN_TOLERANCE = 1e-6;

/** The AC grid every netlist uses: `.ac dec 50 10k 100meg`. */
const GRID = { startHz: 10e3, stopHz: 100e6, pointsPerDecade: 50, points: 201 } as const;

/** The resistive systems of cispr17.cir, keyed by the column-name infix the netlist uses. */
const CISPR17_SYSTEMS_IN_NETLIST: readonly (ResistiveSystem & { readonly infix: string })[] = [
  { id: '50-50', infix: '50_50', sourceOhm: 50, loadOhm: 50 },
  { id: '0.1-100', infix: '0p1_100', sourceOhm: 0.1, loadOhm: 100 },
  { id: '100-0.1', infix: '100_0p1', sourceOhm: 100, loadOhm: 0.1 },
];

const CM_COLUMNS = ['line1_cm_db', 'line1_cm_deg', 'line2_cm_db', 'line2_cm_deg'];
const DM_COLUMNS = ['line1_dm_db', 'line1_dm_deg', 'line2_dm_db', 'line2_dm_deg'];
const CISPR17_COLUMNS = ['cm', 'dm'].flatMap((mode) => CISPR17_SYSTEMS_IN_NETLIST.map((s) => `il_${mode}_${s.infix}_db`));

const CASES = goldenCaseNames();

interface CaseData {
  readonly table: ExpectedTable;
  readonly frequencies: Float64Array;
  readonly response: NetworkResponse;
}

const loaded = new Map<string, CaseData>();

/** expected.csv and our engine evaluated on exactly its frequencies (computed once per case). */
function caseData(name: string): CaseData {
  const cached = loaded.get(name);
  if (cached) return cached;
  const dir = join(GOLDEN_ROOT, name);
  const table = readExpectedCsv(join(dir, 'expected.csv'));
  const design = requireDesign(JSON.parse(readFileSync(join(dir, 'design.json'), 'utf8')));
  const frequencies = column(table, 'frequency_hz');
  const response = evaluateNetworkOnce(compileNetwork(design, CISPR17_SYSTEMS_IN_NETLIST), frequencies);
  const data = { table, frequencies, response };
  loaded.set(name, data);
  return data;
}

const magnitudeDb = (re: number, im: number): number => 20 * Math.log10(Math.hypot(re, im));
const phaseDeg = (re: number, im: number): number => (Math.atan2(im, re) * 180) / Math.PI;
/** a − b folded into (−180°, 180°]. */
function phaseDifference(a: number, b: number): number {
  const d = (((a - b) % 360) + 360) % 360;
  return d > 180 ? d - 360 : d;
}
const fmt = (value: number): string => value.toPrecision(10);

/**
 * The first frequency where the engine's complex voltage leaves ngspice's dB / degree values by
 * more than the tolerances (only where ngspice is above FLOOR_DB), described with both values.
 */
function firstDisagreement(
  label: string,
  frequencies: Float64Array,
  spiceDb: Float64Array,
  spiceDeg: Float64Array,
  engine: ComplexColumns,
): string | undefined {
  for (let i = 0; i < frequencies.length; i += 1) {
    const db = spiceDb[i]!;
    if (!(db > FLOOR_DB)) continue;
    const ourDb = magnitudeDb(engine.re[i]!, engine.im[i]!);
    const ourDeg = phaseDeg(engine.re[i]!, engine.im[i]!);
    const f = fmt(frequencies[i]!);
    if (!(Math.abs(ourDb - db) <= MAGNITUDE_TOLERANCE_DB)) {
      return `${label} at ${f} Hz: engine ${fmt(ourDb)} dB, ngspice ${fmt(db)} dB (differ by ${fmt(ourDb - db)} dB > ${MAGNITUDE_TOLERANCE_DB})`;
    }
    const dPhase = phaseDifference(ourDeg, spiceDeg[i]!);
    if (!(Math.abs(dPhase) <= PHASE_TOLERANCE_DEG)) {
      return `${label} at ${f} Hz: engine phase ${fmt(ourDeg)}°, ngspice ${fmt(spiceDeg[i]!)}° (differ by ${fmt(dPhase)}° > ${PHASE_TOLERANCE_DEG})`;
    }
  }
  return undefined;
}

/** Fails with the first disagreement, both values in full, as the assertion message. */
function expectAgreement(failure: string | undefined): void {
  expect(failure === undefined, `first frequency outside tolerance: ${failure ?? ''}`).toBe(true);
}

/** Points above the floor: a case must actually test something. */
function pointsAboveFloor(values: Float64Array): number {
  return values.reduce((count, v) => (v > FLOOR_DB ? count + 1 : count), 0);
}

describe('SPICE golden set (ngspice-39 batch AC analysis, fixtures/golden/)', () => {
  it('holds at least five cases, each with design.json, filter.inc, cm.cir, dm.cir, expected.csv and SOURCE.md', () => {
    expect(CASES.length).toBeGreaterThanOrEqual(5);
    for (const name of CASES) {
      for (const file of ['design.json', 'filter.inc', 'cm.cir', 'dm.cir', 'expected.csv', 'SOURCE.md']) {
        expect(existsSync(join(GOLDEN_ROOT, name, file)), `${name}/${file}`).toBe(true);
      }
    }
  });

  it('checks CISPR 17 resistive insertion loss (cispr17.cir) in at least one case', () => {
    expect(CASES.filter((name) => existsSync(join(GOLDEN_ROOT, name, 'cispr17.cir'))).length).toBeGreaterThanOrEqual(1);
  });
});

describe.each(CASES)('golden case fixtures/golden/%s (ngspice-39 batch AC analysis)', (name) => {
  const where = `fixtures/golden/${name}`;
  const hasCispr17 = existsSync(join(GOLDEN_ROOT, name, 'cispr17.cir'));

  it(`expected.csv is on the grid of ".ac dec 50 10k 100meg" (${GRID.points} points), the same grid as logSpace and the design's frequency plan`, () => {
    const { frequencies } = caseData(name);
    const grid = logSpace(GRID.startHz, GRID.stopHz, GRID.pointsPerDecade);
    expect(frequencies.length).toBe(GRID.points);
    expect(grid.length).toBe(GRID.points);
    for (let i = 0; i < grid.length; i += 1) expect(Math.abs(frequencies[i]! / grid[i]! - 1)).toBeLessThan(1e-12);
    const design = requireDesign(JSON.parse(readFileSync(join(GOLDEN_ROOT, name, 'design.json'), 'utf8')));
    expect(design.frequencyPlan).toEqual({ startHz: GRID.startHz, stopHz: GRID.stopHz, pointsPerDecade: GRID.pointsPerDecade });
  });

  for (const mode of ['cm', 'dm'] as const) {
    const excitation = mode === 'cm' ? 'common-mode' : 'differential-mode';
    it(`${excitation} EMF: receiver voltage on line 1 and line 2 matches ngspice-39 batch AC analysis of ${where}/${mode}.cir within ${MAGNITUDE_TOLERANCE_DB} dB and ${PHASE_TOLERANCE_DEG}°`, () => {
      const { table, frequencies, response } = caseData(name);
      const engine = mode === 'cm' ? [response.line1FromCm, response.line2FromCm] : [response.line1FromDm, response.line2FromDm];
      for (const line of [1, 2] as const) {
        const spiceDb = column(table, `line${line}_${mode}_db`);
        const spiceDeg = column(table, `line${line}_${mode}_deg`);
        expect(pointsAboveFloor(spiceDb), `line ${line}: points above ${FLOOR_DB} dB`).toBeGreaterThan(GRID.points / 2);
        const failure = firstDisagreement(`line ${line}, ${excitation} EMF`, frequencies, spiceDb, spiceDeg, engine[line - 1]!);
        expectAgreement(failure);
      }
    });
  }

  if (hasCispr17) {
    it(`CISPR 17 insertion loss (lines joined for common mode, balanced for differential mode; 50/50, 0.1/100, 100/0.1 Ω) matches ngspice-39 batch AC analysis of ${where}/cispr17.cir within ${MAGNITUDE_TOLERANCE_DB} dB`, () => {
      const { table, frequencies, response } = caseData(name);
      CISPR17_SYSTEMS_IN_NETLIST.forEach((system, s) => {
        for (const mode of ['cm', 'dm'] as const) {
          const spiceIl = column(table, `il_${mode}_${system.infix}_db`);
          const ours = (mode === 'cm' ? response.resistiveCmLoss : response.resistiveDmLoss)[s]!;
          // ngspice solved for V_with; apply the same floor to it: V_with = V_without − IL in dB.
          const withoutDb = 20 * Math.log10(system.loadOhm / (system.sourceOhm + system.loadOhm));
          let failure: string | undefined;
          for (let i = 0; i < frequencies.length && failure === undefined; i += 1) {
            if (!(withoutDb - spiceIl[i]! > FLOOR_DB)) continue;
            const ourIl = 10 * Math.log10(ours[i]!);
            if (!(Math.abs(ourIl - spiceIl[i]!) <= MAGNITUDE_TOLERANCE_DB)) {
              failure = `${mode.toUpperCase()} IL, r_s/r_l = ${system.id} Ω, at ${fmt(frequencies[i]!)} Hz: engine ${fmt(ourIl)} dB, ngspice ${fmt(spiceIl[i]!)} dB (differ by ${fmt(ourIl - spiceIl[i]!)} dB > ${MAGNITUDE_TOLERANCE_DB})`;
            }
          }
          expectAgreement(failure);
        }
      });
    });
  }
});

describe('imbalanced golden case really converts modes (ngspice-39, fixtures/golden/imbalanced-*/cm.cir and dm.cir)', () => {
  const imbalanced = CASES.filter((name) => name.startsWith('imbalanced-'));

  it('exists', () => {
    expect(imbalanced.length).toBeGreaterThanOrEqual(1);
  });

  it.each(imbalanced)('%s: in ngspice the two lines differ by more than 1 dB under each excitation', (name) => {
    const { table } = caseData(name);
    for (const mode of ['cm', 'dm']) {
      const a = column(table, `line1_${mode}_db`);
      const b = column(table, `line2_${mode}_db`);
      const largest = a.reduce((worst, v, i) => Math.max(worst, Math.abs(v - b[i]!)), 0);
      expect(largest, `${mode}: largest |line1 − line2| in dB`).toBeGreaterThan(1);
    }
  });
});

const NGSPICE_VERSION = ngspiceOnPath();

describe(`committed goldens are what ngspice produces (${NGSPICE_VERSION ?? 'ngspice not on the PATH'})`, () => {
  it.each(CASES)(
    '%s: SOURCE.md attributes expected.csv to ngspice-39 and names the commands, grid, columns, tolerance and regeneration',
    (name) => {
      const dir = join(GOLDEN_ROOT, name);
      const source = readFileSync(join(dir, 'SOURCE.md'), 'utf8');
      const netlists = ['cm.cir', 'dm.cir', ...(existsSync(join(dir, 'cispr17.cir')) ? ['cispr17.cir'] : [])];
      expect(source).toContain('ngspice-39');
      expect(source).toContain('npm run goldens');
      expect(source).toContain('node scripts/regenerate-goldens.mjs');
      expect(source).toContain('ac dec 50 10k 100meg');
      expect(source).toContain(`${MAGNITUDE_TOLERANCE_DB} dB`);
      for (const netlist of netlists) {
        expect(source).toContain(`ngspice -b ${netlist}`);
        const text = readFileSync(join(dir, netlist), 'utf8');
        expect(text).toContain('.include filter.inc');
        expect(text).toContain('.ac dec 50 10k 100meg');
        expect(text).toContain(`wrdata ${netlist.replace('.cir', '.data')} `);
      }
      const { header } = readExpectedCsv(join(dir, 'expected.csv'));
      const columns = ['frequency_hz', ...CM_COLUMNS, ...DM_COLUMNS, ...(netlists.includes('cispr17.cir') ? CISPR17_COLUMNS : [])];
      expect(header).toEqual(columns);
      for (const name of columns) expect(source).toContain(name);
    },
  );

  if (NGSPICE_VERSION !== undefined) {
    it.each(CASES)(
      `%s: re-running its netlists with ${NGSPICE_VERSION} (ngspice -b) reproduces expected.csv within ${RERUN_TOLERANCE}`,
      async (name) => {
        const script = await loadGoldenScript();
        const fresh = await script.runCase(join(GOLDEN_ROOT, name));
        const committed = readExpectedCsv(join(GOLDEN_ROOT, name, 'expected.csv'));
        expect(fresh.header).toEqual(committed.header);
        expect(fresh.rows.length).toBe(committed.rows.length);
        let failure: string | undefined;
        fresh.rows.forEach((row, r) => {
          row.forEach((text, c) => {
            const now = Number(text);
            const then = Number(committed.rows[r]![c]);
            const columnName = fresh.header[c]!;
            const difference =
              c === 0 ? Math.abs(now / then - 1) : columnName.endsWith('_deg') ? Math.abs(phaseDifference(now, then)) : Math.abs(now - then);
            if (failure === undefined && !(difference <= (c === 0 ? 1e-12 : RERUN_TOLERANCE))) {
              failure = `row ${r + 1}, ${columnName}: fresh ngspice ${text}, committed ${committed.rows[r]![c]}`;
            }
          });
        });
        expect(failure === undefined, `expected.csv is stale (${failure ?? ''}); run "npm run goldens" and review the diff`).toBe(true);
      },
      60_000,
    );
  } else {
    it('without ngspice on the PATH the regeneration script refuses with a clear message (CI installs ngspice and re-runs the netlists)', async () => {
      const script = await loadGoldenScript();
      const first = CASES[0];
      expect(first).toBeDefined();
      await expect(script.runCase(join(GOLDEN_ROOT, first!))).rejects.toThrow(/ngspice was not found on the PATH/u);
    });
  }
});
