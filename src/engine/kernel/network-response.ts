import { type ComplexColumns, headOf } from '../complex-columns.ts';

/**
 * Everything the termination step computes per frequency, as columns over the grid.
 *
 * In circuit, the noise source is a Thevenin pair: the common-mode EMF drives both lines equally
 * (EMF vector [1, 1]) and the differential-mode EMF drives them oppositely ([1, −1]), so each has a
 * mode voltage of 1 V. Receiver voltages are per volt of that EMF.
 */
export interface NetworkResponse {
  readonly count: number;
  /**
   * Mode voltages at the receivers, v_c = (V1 + V2)/2 and v_d = (V1 − V2)/2, per volt of
   * common-mode / differential-mode EMF: cmFromCm is T_CM, dmFromDm is T_DM, the other two are
   * the mode conversions (zero for a symmetric filter between matched receivers).
   */
  readonly cmFromCm: ComplexColumns;
  readonly dmFromCm: ComplexColumns;
  readonly cmFromDm: ComplexColumns;
  readonly dmFromDm: ComplexColumns;
  /** Voltage at each line's receiving network, per volt of CM / DM EMF (v_c ± v_d). */
  readonly line1FromCm: ComplexColumns;
  readonly line2FromCm: ComplexColumns;
  readonly line1FromDm: ComplexColumns;
  readonly line2FromDm: ComplexColumns;
  /** T_CM and T_DM with no filter: source wired straight to the receiving networks. */
  readonly bareCmFromCm: ComplexColumns;
  readonly bareDmFromDm: ComplexColumns;
  /** Looking into the filter from the source side, receivers connected: lines joined (CM), line to line (DM). */
  readonly inputImpedanceCm: ComplexColumns;
  readonly inputImpedanceDm: ComplexColumns;
  /**
   * Insertion loss as a power ratio |V_without / V_with|² for each resistive system (CISPR 17
   * style), common mode and differential mode. Linear, so the kernel takes no logarithms.
   */
  readonly resistiveCmLoss: readonly Float64Array[];
  readonly resistiveDmLoss: readonly Float64Array[];
  /** PointFlag bits per point. */
  readonly flags: Uint8Array;
}

export const RESPONSE_COMPLEX_KEYS = [
  'cmFromCm',
  'dmFromCm',
  'cmFromDm',
  'dmFromDm',
  'line1FromCm',
  'line2FromCm',
  'line1FromDm',
  'line2FromDm',
  'bareCmFromCm',
  'bareDmFromDm',
  'inputImpedanceCm',
  'inputImpedanceDm',
] as const;
export type ResponseComplexKey = (typeof RESPONSE_COMPLEX_KEYS)[number];

/** Storage for a response of up to `capacity` points, carved from one buffer so it transfers whole. */
export function allocateResponse(capacity: number, systemCount: number, storage?: Float64Array): NetworkResponse {
  const doubles = capacity * (RESPONSE_COMPLEX_KEYS.length * 2 + systemCount * 2);
  const buffer = storage ?? new Float64Array(doubles);
  if (buffer.length < doubles) throw new Error(`response storage holds ${buffer.length} values, needs ${doubles}`);
  let offset = 0;
  const take = (): Float64Array => {
    const view = buffer.subarray(offset, offset + capacity);
    offset += capacity;
    return view;
  };
  const complex = (): ComplexColumns => ({ re: take(), im: take() });
  const columns = Object.fromEntries(RESPONSE_COMPLEX_KEYS.map((key) => [key, complex()])) as Record<ResponseComplexKey, ComplexColumns>;
  const resistiveCmLoss = Array.from({ length: systemCount }, take);
  const resistiveDmLoss = Array.from({ length: systemCount }, take);
  return { count: capacity, ...columns, resistiveCmLoss, resistiveDmLoss, flags: new Uint8Array(capacity) };
}

export function responseDoubles(capacity: number, systemCount: number): number {
  return capacity * (RESPONSE_COMPLEX_KEYS.length * 2 + systemCount * 2);
}

/** Views of the first `count` points of a larger response. */
export function responseHead(response: NetworkResponse, count: number): NetworkResponse {
  const columns = Object.fromEntries(RESPONSE_COMPLEX_KEYS.map((key) => [key, headOf(response[key], count)])) as Record<
    ResponseComplexKey,
    ComplexColumns
  >;
  return {
    count,
    ...columns,
    resistiveCmLoss: response.resistiveCmLoss.map((c) => c.subarray(0, count)),
    resistiveDmLoss: response.resistiveDmLoss.map((c) => c.subarray(0, count)),
    flags: response.flags.subarray(0, count),
  };
}
