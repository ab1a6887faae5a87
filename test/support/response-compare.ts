import type { NetworkResponse } from '../../src/engine/index.ts';

type ComplexKey =
  | 'line1FromCm'
  | 'line2FromCm'
  | 'line1FromDm'
  | 'line2FromDm'
  | 'cmFromCm'
  | 'dmFromCm'
  | 'cmFromDm'
  | 'dmFromDm'
  | 'bareCmFromCm'
  | 'bareDmFromDm'
  | 'inputImpedanceCm'
  | 'inputImpedanceDm';

/**
 * Quantities that come out of one solve are compared relative to the largest of them at the
 * point (a nearly cancelled mode conversion carries the rounding of the direct transfers).
 */
const GROUPS: readonly (readonly ComplexKey[])[] = [
  ['line1FromCm', 'line2FromCm', 'line1FromDm', 'line2FromDm', 'cmFromCm', 'dmFromCm', 'cmFromDm', 'dmFromDm'],
  ['bareCmFromCm', 'bareDmFromDm'],
  ['inputImpedanceCm', 'inputImpedanceDm'],
];

export interface Difference {
  readonly error: number;
  readonly where: string;
}

/**
 * The largest relative difference between two responses over every complex output (relative to
 * its group's scale at the point) and every resistive insertion loss (as a voltage ratio).
 */
export function largestDifference(a: NetworkResponse, b: NetworkResponse, frequencies: ArrayLike<number>): Difference {
  return compareResponses(a, b, frequencies).worst;
}

export type OutputKind = 'transfer' | 'impedance' | 'resistive';

export interface Comparison {
  /** Every relative difference, in no particular order. */
  readonly errors: number[];
  /** The largest over everything. */
  readonly worst: Difference;
  /** The largest per kind of output: receiver transfers, input impedances, resistive insertion losses. */
  readonly worstOf: Record<OutputKind, Difference>;
  /** Every relative difference per kind of output. */
  readonly errorsOf: Record<OutputKind, number[]>;
}

/** Every relative difference (see largestDifference), and the largest with where it occurred. */
export function compareResponses(a: NetworkResponse, b: NetworkResponse, frequencies: ArrayLike<number>): Comparison {
  const none = (): Difference => ({ error: 0, where: 'nowhere' });
  let worst = none();
  const worstOf: Record<OutputKind, Difference> = { transfer: none(), impedance: none(), resistive: none() };
  const errors: number[] = [];
  const errorsOf: Record<OutputKind, number[]> = { transfer: [], impedance: [], resistive: [] };
  const note = (error: number, where: () => string, kind: OutputKind = 'resistive'): void => {
    errors.push(error);
    errorsOf[kind].push(error);
    if (!(error <= worstOf[kind].error)) worstOf[kind] = { error, where: where() };
    if (!(error <= worst.error)) worst = worstOf[kind];
  };
  for (let i = 0; i < a.count; i += 1) {
    for (const group of GROUPS) {
      const scale = Math.max(...group.map((key) => Math.hypot(b[key].re[i]!, b[key].im[i]!)));
      for (const key of group) {
        const dr = a[key].re[i]! - b[key].re[i]!;
        const di = a[key].im[i]! - b[key].im[i]!;
        note(
          scale === 0 ? Math.hypot(dr, di) : Math.hypot(dr, di) / scale,
          () => `${key} at ${frequencies[i]} Hz: ${a[key].re[i]}+j${a[key].im[i]} vs ${b[key].re[i]}+j${b[key].im[i]}`,
          key.startsWith('inputImpedance') ? 'impedance' : 'transfer',
        );
      }
    }
    for (const [name, x, y] of [
      ['resistiveCmLoss', a.resistiveCmLoss, b.resistiveCmLoss],
      ['resistiveDmLoss', a.resistiveDmLoss, b.resistiveDmLoss],
    ] as const) {
      for (let s = 0; s < x.length; s += 1) {
        // Beyond 200 dB (a power ratio of 1e20) the output is 1e-10 of the chain's entries and
        // carries their rounding amplified as much; there only a difference above 1e-4 dB counts.
        const deep = x[s]![i]! > 1e20 && y[s]![i]! > 1e20;
        const relative = Math.abs(Math.sqrt(x[s]![i]! / y[s]![i]!) - 1);
        const error = deep ? Math.min(relative, Math.abs(10 * Math.log10(x[s]![i]! / y[s]![i]!)) * 1e-2) : relative;
        note(error, () => `${name}[${s}] at ${frequencies[i]} Hz: ${x[s]![i]} vs ${y[s]![i]}`);
      }
    }
  }
  return { errors, worst, worstOf, errorsOf };
}

/** Every value of both responses, for exact comparison. */
export function flatten(response: NetworkResponse): number[] {
  const keys: ComplexKey[] = GROUPS.flat();
  return [
    ...keys.flatMap((key) => [...response[key].re, ...response[key].im]),
    ...response.resistiveCmLoss.flatMap((c) => [...c]),
    ...response.resistiveDmLoss.flatMap((c) => [...c]),
    ...response.flags,
  ];
}
