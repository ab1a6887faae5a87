import type { ComplexColumns } from '../complex-columns.ts';
import type { Placement } from '../../model/design.ts';

/**
 * The result of one sweep, columnar: one frequency axis and named Float64Array columns of the same
 * length, ready for a chart, a table, a CSV file or a transfer to the main thread (all columns live
 * in one ArrayBuffer, see `transferables`). dB values are finite: zero magnitudes print as −400 dB.
 */
export interface SweepResult {
  readonly designName: string;
  readonly frequencyHz: Float64Array;
  /** PointOrigin per point: base grid, element self-resonance, or a refined peak/notch. */
  readonly pointOrigin: Uint8Array;
  /** PointFlag bits per point. */
  readonly pointFlags: Uint8Array;
  readonly columns: Readonly<Record<SweepColumnId, Float64Array>>;
  readonly transfers: Readonly<Record<TransferId, ComplexColumns>>;
  readonly elements: readonly ElementSweep[];
  readonly resonances: readonly ResonanceMark[];
  readonly warnings: readonly SweepWarning[];
  readonly resistiveSystems: readonly { readonly id: string; readonly sourceOhm: number; readonly loadOhm: number }[];
}

export interface ColumnInfo {
  readonly id: SweepColumnId;
  readonly label: string;
  readonly unit: 'dB' | 'Ω' | '°';
  readonly description: string;
}

/** Every real-valued column, in the order exports list them. */
export const SWEEP_COLUMNS = [
  { id: 'insertionLoss50Cm', label: 'CM insertion loss, 50 Ω/50 Ω', unit: 'dB', description: 'CISPR 17 asymmetrical test: lines joined at each end, 50 Ω source and load to ground' },
  { id: 'insertionLoss50Dm', label: 'DM insertion loss, 50 Ω/50 Ω', unit: 'dB', description: 'CISPR 17 symmetrical test: 50 Ω source and load line to line, balanced about ground' },
  { id: 'insertionLossLowHighCm', label: 'CM insertion loss, 0.1 Ω/100 Ω', unit: 'dB', description: 'approximate worst case: 0.1 Ω source, 100 Ω load' },
  { id: 'insertionLossLowHighDm', label: 'DM insertion loss, 0.1 Ω/100 Ω', unit: 'dB', description: 'approximate worst case: 0.1 Ω source, 100 Ω load' },
  { id: 'insertionLossHighLowCm', label: 'CM insertion loss, 100 Ω/0.1 Ω', unit: 'dB', description: 'approximate worst case: 100 Ω source, 0.1 Ω load' },
  { id: 'insertionLossHighLowDm', label: 'DM insertion loss, 100 Ω/0.1 Ω', unit: 'dB', description: 'approximate worst case: 100 Ω source, 0.1 Ω load' },
  { id: 'insertionLossInCircuitCm', label: 'CM insertion loss in circuit', unit: 'dB', description: 'between the design’s noise source and receiving networks: 20 log |T_CM without / T_CM with|' },
  { id: 'insertionLossInCircuitDm', label: 'DM insertion loss in circuit', unit: 'dB', description: 'between the design’s noise source and receiving networks: 20 log |T_DM without / T_DM with|' },
  { id: 'transferCm', label: 'CM transfer to receivers', unit: 'dB', description: '20 log |V_CM at the receivers / CM source EMF|, V_CM = (V1 + V2)/2' },
  { id: 'transferDm', label: 'DM transfer to receivers', unit: 'dB', description: '20 log |V_DM at the receivers / DM source EMF|, V_DM = (V1 − V2)/2' },
  { id: 'conversionCmToDm', label: 'CM → DM conversion', unit: 'dB', description: '20 log |V_DM at the receivers / CM source EMF|; −400 dB for a symmetric filter' },
  { id: 'conversionDmToCm', label: 'DM → CM conversion', unit: 'dB', description: '20 log |V_CM at the receivers / DM source EMF|; −400 dB for a symmetric filter' },
  { id: 'line1FromCm', label: 'line 1 receiver per CM EMF', unit: 'dB', description: '20 log |V1 / CM EMF|' },
  { id: 'line2FromCm', label: 'line 2 receiver per CM EMF', unit: 'dB', description: '20 log |V2 / CM EMF|' },
  { id: 'line1FromDm', label: 'line 1 receiver per DM EMF', unit: 'dB', description: '20 log |V1 / DM EMF|' },
  { id: 'line2FromDm', label: 'line 2 receiver per DM EMF', unit: 'dB', description: '20 log |V2 / DM EMF|' },
  { id: 'inputImpedanceCmOhm', label: '|Z in|, CM, from the source side', unit: 'Ω', description: 'lines joined, receivers connected' },
  { id: 'inputImpedanceCmDeg', label: '∠Z in, CM', unit: '°', description: 'phase of the CM input impedance' },
  { id: 'inputImpedanceDmOhm', label: '|Z in|, DM, from the source side', unit: 'Ω', description: 'line to line, receivers connected; the converter sees this (stability)' },
  { id: 'inputImpedanceDmDeg', label: '∠Z in, DM', unit: '°', description: 'phase of the DM input impedance' },
] as const satisfies readonly { id: string; label: string; unit: string; description: string }[];

export type SweepColumnId = (typeof SWEEP_COLUMNS)[number]['id'];

/** Complex columns kept for later analysis (predictions scale a scan by T_new / T_baseline). */
export const TRANSFER_IDS = [
  'transferCm',
  'transferDm',
  'conversionCmToDm',
  'conversionDmToCm',
  'line1FromCm',
  'line2FromCm',
  'line1FromDm',
  'line2FromDm',
  'bareTransferCm',
  'bareTransferDm',
  'inputImpedanceCm',
  'inputImpedanceDm',
] as const;
export type TransferId = (typeof TRANSFER_IDS)[number];

/** One element's own impedance over the grid, with its self-resonances. */
export interface ElementSweep {
  readonly id: string;
  readonly stageId: string;
  readonly label: string;
  readonly placement: Placement;
  readonly partKind: string;
  /** A two-terminal part has one view ("impedance"); a choke has "common-mode" and "differential-mode". */
  readonly views: readonly ImpedanceView[];
}

export interface ImpedanceView {
  readonly name: 'impedance' | 'common-mode' | 'differential-mode';
  readonly magnitudeOhm: Float64Array;
  readonly phaseDeg: Float64Array;
  readonly selfResonances: readonly SelfResonance[];
}

export interface SelfResonance {
  readonly frequencyHz: number;
  /** series: |Z| minimum, reactance − to +; parallel: |Z| maximum, reactance + to −. */
  readonly type: 'series' | 'parallel';
}

export type ResonanceMark =
  | {
      readonly kind: 'element';
      readonly elementId: string;
      readonly view: ImpedanceView['name'];
      readonly frequencyHz: number;
      readonly type: SelfResonance['type'];
    }
  | {
      readonly kind: 'response';
      readonly column: SweepColumnId;
      readonly frequencyHz: number;
      readonly valueDb: number;
      readonly type: 'peak' | 'notch';
    };

export interface SweepWarning {
  readonly code: 'ideal-part' | 'ideal-resonance-limited' | 'outside-measured-range' | 'not-finite' | 'refinement-capped';
  readonly message: string;
  readonly elementId?: string;
}

/** The buffers to hand to postMessage / Comlink.transfer so a result crosses threads without copying. */
export function transferables(result: SweepResult): ArrayBuffer[] {
  const buffers = new Set<ArrayBuffer>();
  const add = (array: Float64Array | Uint8Array): void => {
    if (array.buffer instanceof ArrayBuffer) buffers.add(array.buffer);
  };
  add(result.frequencyHz);
  add(result.pointOrigin);
  add(result.pointFlags);
  for (const column of Object.values(result.columns)) add(column);
  for (const transfer of Object.values(result.transfers)) {
    add(transfer.re);
    add(transfer.im);
  }
  for (const element of result.elements) {
    for (const view of element.views) {
      add(view.magnitudeOhm);
      add(view.phaseDeg);
    }
  }
  return [...buffers];
}
