/** A complex number as plain data; the io layer's few conversions need nothing more. */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

export const complex = (re: number, im = 0): Complex => ({ re, im });

export function add(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}

export function subtract(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}

export function multiply(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

export function scale(a: Complex, factor: number): Complex {
  return { re: a.re * factor, im: a.im * factor };
}

/** a / b, scaled to avoid overflow (Smith's method). b = 0 gives non-finite parts. */
export function divide(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const r = b.im / b.re;
    const d = b.re + b.im * r;
    return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
  }
  const r = b.re / b.im;
  const d = b.re * r + b.im;
  return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

export function magnitude(a: Complex): number {
  return Math.hypot(a.re, a.im);
}

/** Phase in degrees, −180 to 180. */
export function phaseDeg(a: Complex): number {
  return (Math.atan2(a.im, a.re) * 180) / Math.PI;
}

export function fromPolarDeg(magnitudeValue: number, degrees: number): Complex {
  const radians = (degrees * Math.PI) / 180;
  return { re: magnitudeValue * Math.cos(radians), im: magnitudeValue * Math.sin(radians) };
}
