import type { ImpedanceTable, MeasuredImpedance } from '../model/design.ts';
import { type Complex, add, complex, divide, magnitude, multiply, phaseDeg, scale, subtract } from './complex.ts';
import { type FrequencyUnit, frequencyUnitFactor } from './frequency-unit.ts';
import { checkTable } from './impedance-table-csv.ts';
import { describeLines, type LineIssue, type TextReadResult } from './text-issues.ts';
import { formatOhm, type NetworkParameter, networkEntry, networkReference, type TouchstoneFormat, type TouchstoneNetwork } from './touchstone-network.ts';

/**
 * A two-terminal part measured with a network analyser or an impedance analyser, from a Touchstone
 * file read by touchstone-network.ts: on a one-port (its reflection S11, or Z/Y data as impedance
 * analysers write them), or in a two-port thru fixture: in series between port 1 and port 2
 * ("series-thru") or from the through line to ground ("shunt-thru"). docs/cli.md, `measured-part`.
 */

/** How the part sat on the analyser's ports. */
export type MeasurementFixture = 'reflection' | 'series-thru' | 'shunt-thru';
export type ThruFixture = Exclude<MeasurementFixture, 'reflection'>;
export const MEASUREMENT_FIXTURES: readonly MeasurementFixture[] = ['reflection', 'series-thru', 'shunt-thru'];
export const THRU_FIXTURES: readonly ThruFixture[] = ['series-thru', 'shunt-thru'];

/** The ports a fixture uses. */
export function fixturePorts(fixture: MeasurementFixture): 1 | 2 {
  return fixture === 'reflection' ? 1 : 2;
}

// ---- Fixture formulas (equal, real reference impedances) ----------------------------------------

/**
 * Series-thru: Z in series between two ports of reference Z0 sees 2·Z0 around it, so
 * S21 = 2·Z0 / (2·Z0 + Z). (Z = 100 Ω in 50 Ω: S21 = 0.5, −6.02 dB.)
 */
export function impedanceToS21SeriesThru(z: Complex, z0: number): Complex {
  return divide(complex(2 * z0), add(complex(2 * z0), z));
}

/** Z = 2·Z0·(1 − S21) / S21. */
export function s21ToImpedanceSeriesThru(s21: Complex, z0: number): Complex {
  return scale(divide(subtract(complex(1), s21), s21), 2 * z0);
}

/** Shunt-thru: Z from the through line to ground in a Z0 system: S21 = 2·Z / (2·Z + Z0). */
export function impedanceToS21ShuntThru(z: Complex, z0: number): Complex {
  return divide(scale(z, 2), add(scale(z, 2), complex(z0)));
}

/** Z = Z0·S21 / (2·(1 − S21)). */
export function s21ToImpedanceShuntThru(s21: Complex, z0: number): Complex {
  return divide(scale(s21, z0), scale(subtract(complex(1), s21), 2));
}

/** Reflection of Z terminating a port of real reference Z0: S11 = (Z − Z0)/(Z + Z0). */
export function impedanceToS11(z: Complex, z0: number): Complex {
  return divide(subtract(z, complex(z0)), add(z, complex(z0)));
}

/** Z = Z0·(1 + S11)/(1 − S11). */
export function s11ToImpedance(s11: Complex, z0: number): Complex {
  return scale(divide(add(complex(1), s11), subtract(complex(1), s11)), z0);
}

/** The full S-matrix of a thru fixture holding impedance Z (symmetric and reciprocal). */
export function thruFixtureSParameters(fixture: ThruFixture, z: Complex, z0: number): Omit<TwoPortRecord, 'frequencyHz'> {
  if (fixture === 'series-thru') {
    const denominator = add(z, complex(2 * z0));
    const s11 = divide(z, denominator);
    const s21 = impedanceToS21SeriesThru(z, z0);
    return { s11, s21, s12: s21, s22: s11 };
  }
  const denominator = add(scale(z, 2), complex(z0));
  const s11 = divide(complex(-z0), denominator);
  const s21 = impedanceToS21ShuntThru(z, z0);
  return { s11, s21, s12: s21, s22: s11 };
}

/**
 * The part's impedance at one frequency from the file's parameters, exact for any real reference
 * impedances R1, R2 of the ports (docs/cli.md, "Touchstone files"):
 *
 * | fixture | S | Y | Z |
 * | reflection | R1·(1 + S11)/(1 − S11) | 1/Y11 | Z11 |
 * | series-thru | 2·√(R1·R2)/S21 − R1 − R2 | −1/Y21 | det Z / Z21 |
 * | shunt-thru | S21·R1·R2 / (2·√(R1·R2) − S21·(R1 + R2)) | −Y21 / det Y | Z21 |
 */
function partImpedance(
  fixture: MeasurementFixture,
  parameter: NetworkParameter,
  entry: (i: number, j: number) => Complex,
  r1: number,
  r2: number,
): Complex {
  const one = complex(1);
  if (fixture === 'reflection') {
    if (parameter === 'S') return scale(divide(add(one, entry(0, 0)), subtract(one, entry(0, 0))), r1);
    return parameter === 'Y' ? divide(one, entry(0, 0)) : entry(0, 0);
  }
  const p21 = entry(1, 0);
  const determinant = (): Complex => subtract(multiply(entry(0, 0), entry(1, 1)), multiply(entry(0, 1), entry(1, 0)));
  if (fixture === 'series-thru') {
    if (parameter === 'S') return subtract(divide(complex(2 * Math.sqrt(r1 * r2)), p21), complex(r1 + r2));
    return parameter === 'Y' ? scale(divide(one, p21), -1) : divide(determinant(), p21);
  }
  if (parameter === 'S') return divide(scale(p21, r1 * r2), subtract(complex(2 * Math.sqrt(r1 * r2)), scale(p21, r1 + r2)));
  return parameter === 'Y' ? scale(divide(p21, determinant()), -1) : p21;
}

// ---- From a network to a part ---------------------------------------------------------------------

export interface PartFromNetwork {
  readonly table: ImpedanceTable;
  readonly fixture: MeasurementFixture;
  readonly parameter: NetworkParameter;
  /** The one reference impedance of S data, when every port at every frequency had the same real one. */
  readonly referenceOhm: number | undefined;
  /** The file line of each table point. */
  readonly lines: readonly number[];
}

const MAX_ISSUES = 200;

/**
 * The part's impedance from a network read from a Touchstone file. `referenceOhm` overrides the
 * file's reference impedances of S data (a fixture measured in another system than the file states).
 * Refused: a fixture that does not match the file's ports; S data referred to a complex or non-positive
 * impedance (the wave definition is then not known, and the formulas above do not hold); a point
 * where the impedance is zero or unbounded. A 0 Hz point is left out (a table holds positive
 * frequencies).
 */
export function impedanceFromNetwork(
  network: TouchstoneNetwork,
  fixture: MeasurementFixture,
  options: { readonly referenceOhm?: number } = {},
): TextReadResult<PartFromNetwork> {
  const ports = fixturePorts(fixture);
  if (network.ports !== ports) {
    return fail([
      {
        line: 0,
        message:
          network.ports === 1
            ? `a 1-port file holds one reflection; --fixture ${fixture} needs a 2-port (thru) file, use the reflection fixture`
            : network.ports === 2
              ? `a 2-port file needs a thru fixture (series-thru or shunt-thru), not ${fixture}`
              : `a ${network.ports}-port file: a two-terminal part is read from a 1-port (reflection) or a 2-port (thru) file`,
      },
    ]);
  }
  const { parameter } = network;
  const override = options.referenceOhm;
  if (override !== undefined && !(override > 0 && Number.isFinite(override))) {
    return fail([{ line: 0, message: `the reference impedance must be a positive number of ohms, got ${override}` }]);
  }
  if (override !== undefined && parameter !== 'S') {
    return fail([{ line: 0, message: `a reference impedance applies to S-parameters; this file holds ${parameter}-parameters in absolute units` }]);
  }
  const notes: LineIssue[] = [];
  const issues: LineIssue[] = [];
  const skippedDc: number[] = [];
  const nonPassive: number[] = [];
  const frequencyHz: number[] = [];
  const magnitudeOhm: number[] = [];
  const phase: number[] = [];
  const lines: number[] = [];
  const references = new Set<number>();
  const count = network.frequencyHz.length;
  for (let k = 0; k < count && issues.length < MAX_ISSUES; k += 1) {
    const line = network.lines[k]!;
    const frequency = network.frequencyHz[k]!;
    if (frequency === 0) {
      skippedDc.push(line);
      continue;
    }
    const r: number[] = [];
    if (parameter === 'S') {
      let refused = false;
      for (let i = 0; i < ports; i += 1) {
        const reference = networkReference(network, k, i);
        if (override !== undefined) {
          r.push(override);
          continue;
        }
        if (reference.im !== 0 && Math.abs(reference.im) > 1e-12 * Math.abs(reference.re)) {
          issues.push({
            line,
            message: `the reference impedance of port ${i + 1} is complex here (${formatOhm(reference.re, reference.im)}): S-parameters referred to a complex impedance have more than one definition (power waves, pseudo-waves) and the file does not say which; export the data renormalised to a real impedance such as 50 Ω`,
          });
          refused = true;
          break;
        }
        if (!(reference.re > 0)) {
          issues.push({ line, message: `the reference impedance of port ${i + 1} is ${formatOhm(reference.re, reference.im)}; it must be positive` });
          refused = true;
          break;
        }
        r.push(reference.re);
      }
      if (refused) continue;
      for (const value of r) references.add(value);
    }
    const z = partImpedance(fixture, parameter, (i, j) => networkEntry(network, k, i, j), r[0] ?? 1, r[1] ?? r[0] ?? 1);
    const size = magnitude(z);
    const shown = parameter === 'S' ? (fixture === 'reflection' ? 'S11' : 'S21') : `${parameter}${fixture === 'reflection' ? '11' : '21'}`;
    const value = fixture === 'reflection' ? networkEntry(network, k, 0, 0) : networkEntry(network, k, 1, 0);
    if (!Number.isFinite(size) || size > 1e300) {
      issues.push({ line, message: `${shown} = ${formatComplex(value)} makes the ${fixture} impedance unbounded` });
      continue;
    }
    if (!(size > 0)) {
      issues.push({ line, message: `${shown} = ${formatComplex(value)} makes the ${fixture} impedance zero` });
      continue;
    }
    if (z.re < 0) nonPassive.push(line);
    frequencyHz.push(frequency);
    magnitudeOhm.push(size);
    phase.push(phaseDeg(z));
    lines.push(line);
  }
  if (issues.length > 0) return fail(issues);
  if (override !== undefined) {
    const stated = [...new Set(Array.from(network.referenceRe))];
    if (!(stated.length === 1 && stated[0] === override && network.referenceIm.every((v) => v === 0))) {
      notes.push({ line: network.optionLine ?? 0, message: `reference impedance ${override} Ω used instead of the file's ${formatReferences(network)}` });
    }
  }
  if (skippedDc.length > 0) notes.push({ line: skippedDc[0]!, message: 'the 0 Hz point was left out: an impedance table holds positive frequencies' });
  if (nonPassive.length > 0) {
    notes.push({
      line: 0,
      message: `the impedance has a negative real part on ${describeLines(nonPassive)} (more than a passive part can give): check the calibration`,
    });
  }
  if (frequencyHz.length < 2) return fail([{ line: 0, message: `an impedance table needs at least 2 frequencies, the file gives ${frequencyHz.length}` }]);
  const checked = checkTable({ frequencyHz, magnitudeOhm, phaseDeg: phase }, lines);
  if (!checked.ok) return checked;
  const referenceOhm = references.size === 1 ? [...references][0] : undefined;
  return { ok: true, value: { table: checked.value, fixture, parameter, referenceOhm, lines }, notes };
}

function formatReferences(network: TouchstoneNetwork): string {
  const first = networkReference(network, 0, 0);
  return network.referenceRe.every((v) => v === first.re) && network.referenceIm.every((v) => v === first.im)
    ? formatOhm(first.re, first.im)
    : 'reference impedances';
}

/** A measured part for a design, with where it came from. */
export function measuredPartFromNetwork(result: PartFromNetwork, fileName?: string): MeasuredImpedance {
  const format =
    result.fixture === 'reflection'
      ? result.parameter === 'S'
        ? 'touchstone-reflection'
        : 'touchstone-one-port-impedance'
      : result.fixture === 'series-thru'
        ? 'touchstone-series-thru'
        : 'touchstone-shunt-thru';
  return {
    kind: 'measured',
    table: result.table,
    origin: {
      format,
      ...(result.referenceOhm === undefined ? {} : { referenceImpedance: result.referenceOhm }),
      ...(fileName === undefined ? {} : { fileName }),
    },
  };
}

function formatComplex(value: Complex): string {
  const sign = value.im < 0 ? '−' : '+';
  return `${value.re.toPrecision(6)} ${sign} j${Math.abs(value.im).toPrecision(6)}`;
}

function fail<T>(issues: readonly LineIssue[]): TextReadResult<T> {
  return { ok: false, issues };
}

// ---- Writing -------------------------------------------------------------------------------

/** One frequency of a two-port's S-parameters, for writing. */
export interface TwoPortRecord {
  readonly frequencyHz: number;
  readonly s11: Complex;
  readonly s21: Complex;
  readonly s12: Complex;
  readonly s22: Complex;
}

export interface TouchstoneWriteOptions {
  readonly frequencyUnit?: FrequencyUnit;
  readonly format?: TouchstoneFormat;
  readonly referenceOhm?: number;
  /** Written as "!" comment lines before the option line. */
  readonly comments?: readonly string[];
}

/**
 * A Touchstone v1 two-port file: comments, option line, one line of 9 numbers per frequency.
 * Numbers are written with full precision so that a file read back gives the same values.
 */
export function writeTouchstoneTwoPort(
  records: readonly TwoPortRecord[],
  options: TouchstoneWriteOptions = {},
): string {
  const unit = options.frequencyUnit ?? 'Hz';
  const format = options.format ?? 'RI';
  const referenceOhm = options.referenceOhm ?? 50;
  const factor = frequencyUnitFactor(unit);
  const pair = (value: Complex): string => {
    if (format === 'RI') return `${value.re} ${value.im}`;
    const size = magnitude(value);
    const angle = phaseDeg(value);
    return format === 'MA' ? `${size} ${angle}` : `${20 * Math.log10(size)} ${angle}`;
  };
  const out: string[] = (options.comments ?? []).map((comment) => `! ${comment}`);
  out.push(`# ${unit} S ${format} R ${referenceOhm}`);
  for (const record of records) {
    const frequency = Number((record.frequencyHz / factor).toPrecision(15));
    out.push([String(frequency), pair(record.s11), pair(record.s21), pair(record.s12), pair(record.s22)].join(' '));
  }
  return `${out.join('\n')}\n`;
}
