import type { NetworkResponse } from '../kernel/network-response.ts';
import { magnitudeToDb, powerRatioToDb } from '../point-flags.ts';

/**
 * Mode quantities derived from the per-line receiver voltages at one point:
 *   T_CM = (V1 + V2)/2 per volt of CM EMF, T_DM = (V1 − V2)/2 per volt of DM EMF,
 *   CM→DM = (V1 − V2)/2 per volt of CM EMF, DM→CM = (V1 + V2)/2 per volt of DM EMF.
 */
export type ModeQuantity = 'transferCm' | 'transferDm' | 'conversionCmToDm' | 'conversionDmToCm' | 'bareTransferCm' | 'bareTransferDm';

export function modeQuantity(response: NetworkResponse, quantity: ModeQuantity, i: number): { re: number; im: number } {
  switch (quantity) {
    case 'transferCm':
      return half(response.line1FromCm.re[i]!, response.line1FromCm.im[i]!, response.line2FromCm.re[i]!, response.line2FromCm.im[i]!, 1);
    case 'transferDm':
      return half(response.line1FromDm.re[i]!, response.line1FromDm.im[i]!, response.line2FromDm.re[i]!, response.line2FromDm.im[i]!, -1);
    case 'conversionCmToDm':
      return half(response.line1FromCm.re[i]!, response.line1FromCm.im[i]!, response.line2FromCm.re[i]!, response.line2FromCm.im[i]!, -1);
    case 'conversionDmToCm':
      return half(response.line1FromDm.re[i]!, response.line1FromDm.im[i]!, response.line2FromDm.re[i]!, response.line2FromDm.im[i]!, 1);
    case 'bareTransferCm':
      return half(
        response.bareLine1FromCm.re[i]!,
        response.bareLine1FromCm.im[i]!,
        response.bareLine2FromCm.re[i]!,
        response.bareLine2FromCm.im[i]!,
        1,
      );
    case 'bareTransferDm':
      return half(
        response.bareLine1FromDm.re[i]!,
        response.bareLine1FromDm.im[i]!,
        response.bareLine2FromDm.re[i]!,
        response.bareLine2FromDm.im[i]!,
        -1,
      );
  }
}

function half(ar: number, ai: number, br: number, bi: number, sign: 1 | -1): { re: number; im: number } {
  return { re: 0.5 * (ar + sign * br), im: 0.5 * (ai + sign * bi) };
}

/** Curves whose peaks and notches are located by refinement. */
export const REFINED_CURVES = [
  'insertionLoss50Cm',
  'insertionLoss50Dm',
  'insertionLossLowHighCm',
  'insertionLossLowHighDm',
  'insertionLossHighLowCm',
  'insertionLossHighLowDm',
  'transferCm',
  'transferDm',
] as const;
export type RefinedCurve = (typeof REFINED_CURVES)[number];

/** Index of each CISPR 17 system in Network.resistiveSystems (the order of CISPR17_SYSTEMS). */
const SYSTEM_INDEX = { '50': 0, LowHigh: 1, HighLow: 2 } as const;

/** Value in dB of a refined curve at point i. */
export function refinedCurveDb(response: NetworkResponse, curve: RefinedCurve, i: number): number {
  switch (curve) {
    case 'insertionLoss50Cm':
      return powerRatioToDb(response.resistiveCmLoss[SYSTEM_INDEX['50']]![i]!);
    case 'insertionLoss50Dm':
      return powerRatioToDb(response.resistiveDmLoss[SYSTEM_INDEX['50']]![i]!);
    case 'insertionLossLowHighCm':
      return powerRatioToDb(response.resistiveCmLoss[SYSTEM_INDEX.LowHigh]![i]!);
    case 'insertionLossLowHighDm':
      return powerRatioToDb(response.resistiveDmLoss[SYSTEM_INDEX.LowHigh]![i]!);
    case 'insertionLossHighLowCm':
      return powerRatioToDb(response.resistiveCmLoss[SYSTEM_INDEX.HighLow]![i]!);
    case 'insertionLossHighLowDm':
      return powerRatioToDb(response.resistiveDmLoss[SYSTEM_INDEX.HighLow]![i]!);
    case 'transferCm':
    case 'transferDm': {
      const value = modeQuantity(response, curve, i);
      return magnitudeToDb(Math.hypot(value.re, value.im));
    }
  }
}
