import { spawnSync } from 'node:child_process';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * Typed access to scripts/regenerate-goldens.mjs (plain JavaScript, so it carries no types) and
 * small readers for the golden fixtures under fixtures/golden/.
 */

export const GOLDEN_ROOT = fileURLToPath(new URL('../../fixtures/golden/', import.meta.url));

/** One fresh ngspice run of a case: the merged wrdata columns, numbers as ngspice printed them. */
export interface GoldenRun {
  readonly caseName: string;
  readonly ngspiceVersion: string;
  readonly netlists: readonly string[];
  readonly header: readonly string[];
  readonly rows: readonly (readonly string[])[];
}

export interface GoldenScript {
  runCase(caseDir: string): Promise<GoldenRun>;
  /** The case's netlists run at exactly these frequencies (decimal text, Hz), one row each. */
  runCaseAt(caseDir: string, frequencies: readonly string[]): Promise<GoldenRun>;
}

function isGoldenScript(value: unknown): value is GoldenScript {
  if (typeof value !== 'object' || value === null) return false;
  const record = value as Record<string, unknown>;
  return typeof record['runCase'] === 'function' && typeof record['runCaseAt'] === 'function';
}

/** Import the regeneration script (the same code `npm run goldens` runs). */
export async function loadGoldenScript(): Promise<GoldenScript> {
  const specifier = new URL('../../scripts/regenerate-goldens.mjs', import.meta.url).href;
  const loaded: unknown = await import(/* @vite-ignore */ specifier);
  if (!isGoldenScript(loaded)) throw new Error('scripts/regenerate-goldens.mjs does not export runCase and runCaseAt');
  return loaded;
}

/** Whether an ngspice executable answers `ngspice --version`; its version tag ("ngspice-39") if so. */
export function ngspiceOnPath(): string | undefined {
  const result = spawnSync('ngspice', ['--version'], { encoding: 'utf8', timeout: 20_000 });
  if (result.error || result.status !== 0) return undefined;
  return /ngspice-[0-9][0-9A-Za-z.+-]*/u.exec(`${result.stdout}\n${result.stderr}`)?.[0];
}

/** Case folders (those holding a design.json), sorted by name. */
export function goldenCaseNames(): string[] {
  return readdirSync(GOLDEN_ROOT)
    .filter((name) => statSync(join(GOLDEN_ROOT, name)).isDirectory())
    .filter((name) => {
      try {
        return statSync(join(GOLDEN_ROOT, name, 'design.json')).isFile();
      } catch {
        return false;
      }
    })
    .sort();
}

export interface ExpectedTable {
  readonly header: readonly string[];
  readonly rows: readonly (readonly string[])[];
  /** Column name → values. */
  readonly columns: ReadonlyMap<string, Float64Array>;
}

/** Parse a case's expected.csv (header row, then comma-separated numbers). */
export function readExpectedCsv(file: string): ExpectedTable {
  const lines = readFileSync(file, 'utf8')
    .split(/\r?\n/u)
    .filter((line) => line.length > 0);
  const header = (lines[0] ?? '').split(',');
  const rows = lines.slice(1).map((line) => line.split(','));
  const columns = new Map<string, Float64Array>();
  header.forEach((name, c) => {
    columns.set(
      name,
      Float64Array.from(rows, (row, r) => {
        const value = Number(row[c]);
        if (row.length !== header.length || !Number.isFinite(value)) {
          throw new Error(`${file}: row ${r + 2}, column ${name}: "${row[c] ?? ''}" is not a number`);
        }
        return value;
      }),
    );
  });
  return { header, rows, columns };
}

/** A column that must exist. */
export function column(table: ExpectedTable, name: string): Float64Array {
  const values = table.columns.get(name);
  if (!values) throw new Error(`expected.csv has no column "${name}" (columns: ${table.header.join(', ')})`);
  return values;
}
