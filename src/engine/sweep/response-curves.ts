import type { NetworkResponse } from '../kernel/network-response.ts';
import { powerRatioToDb } from '../point-flags.ts';

/** Mode quantities, as stored by the kernel (see NetworkResponse). */
export type ModeQuantity = 'transferCm' | 'transferDm' | 'conversionCmToDm' | 'conversionDmToCm' | 'bareTransferCm' | 'bareTransferDm';

const MODE_COLUMN = {
  transferCm: 'cmFromCm',
  transferDm: 'dmFromDm',
  conversionCmToDm: 'dmFromCm',
  conversionDmToCm: 'cmFromDm',
  bareTransferCm: 'bareCmFromCm',
  bareTransferDm: 'bareDmFromDm',
} as const satisfies Record<ModeQuantity, keyof NetworkResponse>;

export function modeColumn(response: NetworkResponse, quantity: ModeQuantity): { re: Float64Array; im: Float64Array } {
  return response[MODE_COLUMN[quantity]];
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
      const column = modeColumn(response, curve);
      return powerRatioToDb(column.re[i]! * column.re[i]! + column.im[i]! * column.im[i]!);
    }
  }
}
