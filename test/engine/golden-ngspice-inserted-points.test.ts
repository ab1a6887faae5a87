import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { type ComplexColumns, PointFlag, PointOrigin, sweepDesign, type SweepResult } from '../../src/engine/index.ts';
import type { SweepColumnId } from '../../src/engine/sweep/sweep-result.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import { column, GOLDEN_ROOT, goldenCaseNames, loadGoldenScript, ngspiceOnPath, readExpectedCsv, type ExpectedTable } from '../support/ngspice.ts';

/*
 * The engine against ngspice-39 (Debian) at the points the engine adds to the plan's grid: every
 * element's self-resonance and every located peak and notch (docs/engine-math.md §7). The grid
 * points are checked by golden-ngspice.test.ts against expected.csv; here inserted.csv holds
 * ngspice's values at exactly the frequencies the engine's sweep of design.json adds, one
 * single-point AC analysis each (`foreach f … ac lin 1 $f $f`, scripts/regenerate-goldens.mjs).
 * Only the frequencies come from the engine; every value is ngspice's.
 *
 * These are the sharpest points of a curve (a lossy choke's self-resonance is a 1 Hz wide peak),
 * so the tolerance is much tighter than on the grid: it is what proves that a part with losses is
 * never clipped (docs/engine-math.md §6). Measured worst disagreement on the committed cases:
 * 2e-5 dB (a −218 dB DM level), 3e-10 dB on the lossy choke's peak.
 */

const INSERTED_FILE = 'inserted.csv';
const MAGNITUDE_TOLERANCE_DB = 1e-3;
const PHASE_TOLERANCE_DEG = 0.01;
/** Below this ngspice's own rounding (about 1e-16 V per volt of EMF, −320 dB) is no longer far away. */
const FLOOR_DB = -250;
/** A fresh ngspice run must reproduce inserted.csv this closely (dB and degrees). */
const RERUN_TOLERANCE = 1e-6;

/** cispr17.cir's systems in the order of sweepDesign's CISPR17_SYSTEMS, with the sweep's column of each. */
const CISPR17_COLUMNS: readonly { readonly spice: string; readonly engine: SweepColumnId }[] = [
  { spice: 'il_cm_50_50_db', engine: 'insertionLoss50Cm' },
  { spice: 'il_cm_0p1_100_db', engine: 'insertionLossLowHighCm' },
  { spice: 'il_cm_100_0p1_db', engine: 'insertionLossHighLowCm' },
  { spice: 'il_dm_50_50_db', engine: 'insertionLoss50Dm' },
  { spice: 'il_dm_0p1_100_db', engine: 'insertionLossLowHighDm' },
  { spice: 'il_dm_100_0p1_db', engine: 'insertionLossHighLowDm' },
];
const CISPR17_LOAD_OVER_TOTAL: Readonly<Record<string, number>> = { '50_50': 50 / 100, '0p1_100': 100 / 100.1, '100_0p1': 0.1 / 100.1 };

const LINE_COLUMNS = [
  { spice: 'line1_cm', engine: 'line1FromCm' },
  { spice: 'line2_cm', engine: 'line2FromCm' },
  { spice: 'line1_dm', engine: 'line1FromDm' },
  { spice: 'line2_dm', engine: 'line2FromDm' },
] as const;

const CASES = goldenCaseNames();

interface CaseSweep {
  readonly result: SweepResult;
  /** Indices into the result of the points the engine added (origin other than the base grid). */
  readonly inserted: readonly number[];
  readonly table: ExpectedTable | undefined;
}

const sweeps = new Map<string, CaseSweep>();

function caseSweep(name: string): CaseSweep {
  const cached = sweeps.get(name);
  if (cached) return cached;
  const dir = join(GOLDEN_ROOT, name);
  const result = sweepDesign(requireDesign(JSON.parse(readFileSync(join(dir, 'design.json'), 'utf8'))));
  const inserted: number[] = [];
  result.pointOrigin.forEach((origin, i) => {
    if (origin !== PointOrigin.Base) inserted.push(i);
  });
  const file = join(dir, INSERTED_FILE);
  const data = { result, inserted, table: existsSync(file) ? readExpectedCsv(file) : undefined };
  sweeps.set(name, data);
  return data;
}

const ORIGIN_NAMES: Readonly<Record<number, string>> = { [PointOrigin.ElementResonance]: 'element resonance', [PointOrigin.ResponseExtremum]: 'located extremum' };
const magnitudeDb = (c: ComplexColumns, i: number): number => 20 * Math.log10(Math.hypot(c.re[i]!, c.im[i]!));
const phaseDeg = (c: ComplexColumns, i: number): number => (Math.atan2(c.im[i]!, c.re[i]!) * 180) / Math.PI;
function phaseDifference(a: number, b: number): number {
  const d = (((a - b) % 360) + 360) % 360;
  return d > 180 ? d - 360 : d;
}
const fmt = (value: number): string => value.toPrecision(12);

/** Every disagreement beyond the tolerances at one inserted point (row r of inserted.csv, index i of the sweep). */
function disagreements(name: string, r: number, i: number, toleranceDb: number, phaseToleranceDeg: number, floorDb: number): string[] {
  const { result, table } = caseSweep(name);
  if (!table) return [`${name}: no ${INSERTED_FILE}`];
  const at = `${fmt(result.frequencyHz[i]!)} Hz (${ORIGIN_NAMES[result.pointOrigin[i]!] ?? 'grid'})`;
  const found: string[] = [];
  for (const line of LINE_COLUMNS) {
    const spiceDb = column(table, `${line.spice}_db`)[r]!;
    if (!(spiceDb > floorDb)) continue;
    const ourDb = magnitudeDb(result.transfers[line.engine], i);
    if (!(Math.abs(ourDb - spiceDb) <= toleranceDb)) found.push(`${line.spice} at ${at}: engine ${fmt(ourDb)} dB, ngspice ${fmt(spiceDb)} dB`);
    const spiceDeg = column(table, `${line.spice}_deg`)[r]!;
    const dPhase = phaseDifference(phaseDeg(result.transfers[line.engine], i), spiceDeg);
    if (!(Math.abs(dPhase) <= phaseToleranceDeg)) found.push(`${line.spice} phase at ${at}: engine and ngspice differ by ${fmt(dPhase)}°`);
  }
  if (table.columns.has(CISPR17_COLUMNS[0]!.spice)) {
    for (const il of CISPR17_COLUMNS) {
      const spiceIl = column(table, il.spice)[r]!;
      // ngspice solved for V_with = V_without − IL (dB); the same floor applies to it.
      const infix = il.spice.replace(/^il_(cm|dm)_/u, '').replace(/_db$/u, '');
      if (!(20 * Math.log10(CISPR17_LOAD_OVER_TOTAL[infix]!) - spiceIl > floorDb)) continue;
      const ours = result.columns[il.engine][i]!;
      if (!(Math.abs(ours - spiceIl) <= toleranceDb)) found.push(`${il.spice} at ${at}: engine ${fmt(ours)} dB, ngspice ${fmt(spiceIl)} dB`);
    }
  }
  return found;
}

describe('ngspice at the engine’s inserted points (fixtures/golden/*/inserted.csv)', () => {
  it('the sweep’s resistive systems are cispr17.cir’s, in the same order', () => {
    const { result } = caseSweep(CASES[0]!);
    expect(result.resistiveSystems.map((s) => [s.sourceOhm, s.loadOhm])).toEqual([
      [50, 50],
      [0.1, 100],
      [100, 0.1],
    ]);
  });

  it('most cases have inserted points (the check is not empty)', () => {
    expect(CASES.filter((name) => caseSweep(name).inserted.length > 0).length).toBeGreaterThanOrEqual(5);
  });
});

describe.each(CASES)('golden case fixtures/golden/%s at the engine’s inserted points (ngspice-39, one AC point each)', (name) => {
  const dir = join(GOLDEN_ROOT, name);

  it(`${INSERTED_FILE} holds exactly the frequencies the engine's sweep adds to the grid (else run "npm run goldens")`, () => {
    const { result, inserted, table } = caseSweep(name);
    if (inserted.length === 0) {
      expect(table, `the engine inserts no points, so there must be no ${INSERTED_FILE}`).toBeUndefined();
      return;
    }
    expect(table, `${name}/${INSERTED_FILE}`).toBeDefined();
    const frequencies = column(table!, 'frequency_hz');
    expect(frequencies.length, `${INSERTED_FILE} rows against the engine's inserted points`).toBe(inserted.length);
    inserted.forEach((i, r) => {
      expect(Math.abs(frequencies[r]! / result.frequencyHz[i]! - 1), `row ${r + 1}: ${frequencies[r]} Hz, engine ${result.frequencyHz[i]} Hz`).toBeLessThan(1e-12);
    });
  });

  it(`line voltages (both EMFs) and CISPR 17 insertion loss agree with ngspice within ${MAGNITUDE_TOLERANCE_DB} dB and ${PHASE_TOLERANCE_DEG}° at every inserted point above ${FLOOR_DB} dB`, () => {
    const { inserted, table } = caseSweep(name);
    if (inserted.length === 0 || !table) return;
    const failures = inserted.flatMap((i, r) => disagreements(name, r, i, MAGNITUDE_TOLERANCE_DB, PHASE_TOLERANCE_DEG, FLOOR_DB));
    expect(failures, `${failures.length} disagreement(s); first: ${failures[0] ?? ''}`).toEqual([]);
  });

  it(`SOURCE.md describes ${INSERTED_FILE}, its single-point analyses and its tolerance`, () => {
    if (!existsSync(join(dir, INSERTED_FILE))) return;
    const source = readFileSync(join(dir, 'SOURCE.md'), 'utf8');
    expect(source).toContain(INSERTED_FILE);
    expect(source).toContain('ac lin 1 $f $f');
    expect(source).toContain(`${MAGNITUDE_TOLERANCE_DB} dB`);
  });
});

const NGSPICE_VERSION = ngspiceOnPath();

if (NGSPICE_VERSION !== undefined) {
  describe(`committed ${INSERTED_FILE} files are what ${NGSPICE_VERSION} produces at the engine's points`, () => {
    it.each(CASES.filter((name) => existsSync(join(GOLDEN_ROOT, name, INSERTED_FILE))))(
      `%s: re-running its netlists at the engine's inserted frequencies reproduces ${INSERTED_FILE} within ${RERUN_TOLERANCE}`,
      async (name) => {
        const { result, inserted, table } = caseSweep(name);
        const script = await loadGoldenScript();
        // The frequencies as the command line prints them (shortest round-trip decimal), as the script passes them.
        const fresh = await script.runCaseAt(
          join(GOLDEN_ROOT, name),
          inserted.map((i) => String(result.frequencyHz[i]!)),
        );
        expect(fresh.header).toEqual(table!.header);
        expect(fresh.rows.length).toBe(table!.rows.length);
        let failure: string | undefined;
        fresh.rows.forEach((row, r) => {
          row.forEach((text, c) => {
            const now = Number(text);
            const then = Number(table!.rows[r]![c]);
            const columnName = fresh.header[c]!;
            const difference = c === 0 ? Math.abs(now / then - 1) : columnName.endsWith('_deg') ? Math.abs(phaseDifference(now, then)) : Math.abs(now - then);
            if (failure === undefined && !(difference <= (c === 0 ? 1e-12 : RERUN_TOLERANCE))) {
              failure = `row ${r + 1}, ${columnName}: fresh ngspice ${text}, committed ${table!.rows[r]![c]}`;
            }
          });
        });
        expect(failure === undefined, `${INSERTED_FILE} is stale (${failure ?? ''}); run "npm run goldens" and review the diff`).toBe(true);
      },
      60_000,
    );
  });
}

/*
 * The lossy choke of fixtures/golden/lossy-cmc-6m8-*: L = 6.8 mH per winding, k = 0.99, DCR
 * 80 mΩ, 10 pF across each winding. Its common-mode self-resonance is at
 * f = 1/(2π√((L + M)·C_w)) = 432.65 kHz (closed form for the even mode, docs/engine-math.md §2),
 * with Q = √((L + M)/C_w)/DCR ≈ 4.6·10⁵: a 0.9 Hz wide peak of (L + M)/(DCR·C_w) ≈ 17 GΩ per
 * winding. The DCR makes it finite, so the engine must not clip it; when it limited every
 * impedance to 10⁹ Ω it reported 136.7 dB of 50 Ω CM insertion loss there, against ngspice's
 * 161.3 dB.
 */
describe('a lossy choke exactly at its self-resonance is not clipped (fixtures/golden/lossy-cmc-6m8-*, ngspice-39)', () => {
  const name = CASES.find((c) => c.startsWith('lossy-cmc-6m8-'));
  const L = 6.8e-3;
  const M = 0.99 * L;
  const CW = 10e-12;
  const srf = 1 / (2 * Math.PI * Math.sqrt((L + M) * CW));
  const PEAK_TOLERANCE_DB = 0.01;

  it('the case exists and the engine inserts the common-mode self-resonance of LCM1 at the closed-form frequency', () => {
    expect(name).toBeDefined();
    const { result } = caseSweep(name!);
    const marks = result.resonances.filter((m) => m.kind === 'element' && m.elementId === 'LCM1' && m.view === 'common-mode');
    expect(marks.length).toBe(1);
    expect(Math.abs(marks[0]!.frequencyHz / srf - 1), `${marks[0]!.frequencyHz} Hz against ${srf} Hz`).toBeLessThan(1e-9);
  });

  it(`at that point every line voltage and CISPR 17 insertion loss agrees with ngspice within ${PEAK_TOLERANCE_DB} dB, the point is not flagged, and nothing warns of a limit`, () => {
    const { result, inserted, table } = caseSweep(name!);
    const mark = result.resonances.find((m) => m.kind === 'element' && m.elementId === 'LCM1' && m.view === 'common-mode')!;
    const i = result.frequencyHz.indexOf(mark.frequencyHz);
    expect(i, 'the resonance is a point of the sweep').toBeGreaterThanOrEqual(0);
    const r = inserted.indexOf(i);
    expect(r, `the resonance is a row of ${INSERTED_FILE}`).toBeGreaterThanOrEqual(0);
    // The peak is real: ngspice puts the 50 Ω CM insertion loss far above what a 10⁹ Ω clip gives.
    expect(column(table!, 'il_cm_50_50_db')[r]!).toBeGreaterThan(160);
    // No floor here: every column at the peak is compared.
    expect(disagreements(name!, r, i, PEAK_TOLERANCE_DB, PHASE_TOLERANCE_DEG, -Infinity)).toEqual([]);
    expect(result.pointFlags[i]! & PointFlag.IdealResonanceLimited).toBe(0);
    expect(result.warnings.filter((w) => w.code === 'ideal-resonance-limited')).toEqual([]);
  });
});
