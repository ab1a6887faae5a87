import type { SweepColumnId } from '../../engine/index.ts';

/** The insertion-loss curves the page draws, in legend order. */
export interface InsertionLossSeries {
  readonly column: SweepColumnId;
  readonly mode: 'CM' | 'DM';
  /** Where the loss is measured: between the design's own source and LISNs, or in the 50 Ω fixture. */
  readonly setting: 'in-circuit' | '50-ohm';
  readonly label: string;
  readonly stroke: string;
  readonly width: number;
  readonly dash: readonly number[];
}

// One hue per mode so CM and DM read apart at a glance (blue and amber stay distinct for the
// common colour-vision deficiencies); the in-circuit curve is the prediction, so it is the solid one.
export const MODE_COLOURS = { CM: '#1f5fa8', DM: '#b35900' } as const;

export const INSERTION_LOSS_SERIES: readonly InsertionLossSeries[] = [
  { column: 'insertionLossInCircuitCm', mode: 'CM', setting: 'in-circuit', label: 'CM in circuit', stroke: MODE_COLOURS.CM, width: 2, dash: [] },
  { column: 'insertionLoss50Cm', mode: 'CM', setting: '50-ohm', label: 'CM 50 Ω/50 Ω', stroke: MODE_COLOURS.CM, width: 1.5, dash: [6, 4] },
  { column: 'insertionLossInCircuitDm', mode: 'DM', setting: 'in-circuit', label: 'DM in circuit', stroke: MODE_COLOURS.DM, width: 2, dash: [] },
  { column: 'insertionLoss50Dm', mode: 'DM', setting: '50-ohm', label: 'DM 50 Ω/50 Ω', stroke: MODE_COLOURS.DM, width: 1.5, dash: [6, 4] },
];

/** The drawn series for a column, if the chart draws it. */
export function seriesForColumn(column: SweepColumnId): InsertionLossSeries | undefined {
  return INSERTION_LOSS_SERIES.find((series) => series.column === column);
}
