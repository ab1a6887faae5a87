import type { ImpedanceTable } from '../../model/design.ts';
import type { ComplexColumns } from '../complex-columns.ts';

/**
 * A measured |Z|/phase table ready for interpolation: log10 f, ln |Z| and unwrapped phase in
 * radians. Between points, ln|Z| and phase are linear in log f (straight lines on a Bode plot);
 * outside the measured range the end value is held and the caller flags the point.
 */
export interface PreparedTable {
  readonly logFrequency: Float64Array;
  readonly logMagnitude: Float64Array;
  readonly phaseRad: Float64Array;
}

const DEG = Math.PI / 180;

export function prepareImpedanceTable(table: ImpedanceTable): PreparedTable {
  const n = table.frequencyHz.length;
  const logFrequency = new Float64Array(n);
  const logMagnitude = new Float64Array(n);
  const phaseRad = new Float64Array(n);
  let offset = 0;
  for (let i = 0; i < n; i += 1) {
    logFrequency[i] = Math.log10(table.frequencyHz[i]!);
    logMagnitude[i] = Math.log(table.magnitudeOhm[i]!);
    let phase = table.phaseDeg[i]! * DEG + offset;
    // Unwrap: a jump of more than π between neighbours is a ±180° wrap of the instrument's display.
    if (i > 0) {
      const step = phase - phaseRad[i - 1]!;
      if (step > Math.PI) {
        offset -= 2 * Math.PI;
        phase -= 2 * Math.PI;
      } else if (step < -Math.PI) {
        offset += 2 * Math.PI;
        phase += 2 * Math.PI;
      }
    }
    phaseRad[i] = phase;
  }
  return { logFrequency, logMagnitude, phaseRad };
}

/** Write Z(f) at out[index]; returns true when f lies outside the measured range. */
export function interpolateImpedanceTable(table: PreparedTable, frequencyHz: number, out: ComplexColumns, index: number): boolean {
  const x = Math.log10(frequencyHz);
  const xs = table.logFrequency;
  const last = xs.length - 1;
  let logMagnitude: number;
  let phase: number;
  let outside = false;
  if (x <= xs[0]!) {
    outside = x < xs[0]!;
    logMagnitude = table.logMagnitude[0]!;
    phase = table.phaseRad[0]!;
  } else if (x >= xs[last]!) {
    outside = x > xs[last]!;
    logMagnitude = table.logMagnitude[last]!;
    phase = table.phaseRad[last]!;
  } else {
    let lo = 0;
    let hi = last;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (xs[mid]! <= x) lo = mid;
      else hi = mid;
    }
    const t = (x - xs[lo]!) / (xs[hi]! - xs[lo]!);
    logMagnitude = table.logMagnitude[lo]! + t * (table.logMagnitude[hi]! - table.logMagnitude[lo]!);
    phase = table.phaseRad[lo]! + t * (table.phaseRad[hi]! - table.phaseRad[lo]!);
  }
  const magnitude = Math.exp(logMagnitude);
  out.re[index] = magnitude * Math.cos(phase);
  out.im[index] = magnitude * Math.sin(phase);
  return outside;
}
