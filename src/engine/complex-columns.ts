/** A complex quantity over a grid: real and imaginary parts as parallel Float64Arrays. */
export interface ComplexColumns {
  readonly re: Float64Array;
  readonly im: Float64Array;
}

export function complexColumns(length: number): ComplexColumns {
  return { re: new Float64Array(length), im: new Float64Array(length) };
}

/** Views of the first `length` points, sharing storage. */
export function headOf(columns: ComplexColumns, length: number): ComplexColumns {
  return { re: columns.re.subarray(0, length), im: columns.im.subarray(0, length) };
}
