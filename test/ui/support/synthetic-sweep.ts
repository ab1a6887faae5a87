import { SWEEP_COLUMNS, type SweepColumnId, type SweepResult, TRANSFER_IDS, type TransferId } from '../../../src/engine/index.ts';
import type { ComplexColumns } from '../../../src/engine/index.ts';

/**
 * A sweep result with known numbers, shaped exactly like the engine's. UI tests draw this rather
 * than running the engine, so they test the page and stay exact: the in-circuit CM curve starts at
 * −15 dB (negative insertion loss must show), the largest value is the 50 Ω DM curve's last point.
 */
export function syntheticSweep(options: { name?: string; points?: number; startHz?: number; stopHz?: number } = {}): SweepResult {
  const n = options.points ?? 61;
  const startHz = options.startHz ?? 9e3;
  const stopHz = options.stopHz ?? 30e6;
  const frequencyHz = Float64Array.from({ length: n }, (_, i) => startHz * (stopHz / startHz) ** (i / (n - 1)));
  const decades = (f: number): number => Math.log10(f / startHz);

  const shapes: Partial<Record<SweepColumnId, (f: number) => number>> = {
    insertionLossInCircuitCm: (f) => 30 * decades(f) - 15,
    insertionLoss50Cm: (f) => 25 * decades(f),
    insertionLossInCircuitDm: (f) => 35 * decades(f) - 5,
    insertionLoss50Dm: (f) => 40 * decades(f) + 2,
  };
  const columns = {} as Record<SweepColumnId, Float64Array>;
  for (const { id } of SWEEP_COLUMNS) columns[id] = Float64Array.from(frequencyHz, shapes[id] ?? (() => -60));

  const transfers = {} as Record<TransferId, ComplexColumns>;
  for (const id of TRANSFER_IDS) transfers[id] = { re: new Float64Array(n), im: new Float64Array(n) };

  const view = (name: 'impedance' | 'common-mode' | 'differential-mode', resonanceHz: number, type: 'series' | 'parallel') => ({
    name,
    magnitudeOhm: new Float64Array(n).fill(1),
    phaseDeg: new Float64Array(n),
    selfResonances: [{ frequencyHz: resonanceHz, type }],
  });

  return {
    designName: options.name ?? 'Synthetic filter',
    frequencyHz,
    pointOrigin: new Uint8Array(n),
    pointFlags: new Uint8Array(n),
    columns,
    transfers,
    elements: [
      { id: 'CX1', stageId: 's1', label: 'CX1 X2 100 nF', placement: 'line-to-line', partKind: 'capacitor', views: [view('impedance', 5e6, 'series')] },
      {
        id: 'LCM1',
        stageId: 's1',
        label: 'LCM1 2.2 mH choke',
        placement: 'both-lines-coupled',
        partKind: 'common-mode-choke',
        views: [view('common-mode', 850e3, 'parallel'), view('differential-mode', 16e6, 'parallel')],
      },
    ],
    resonances: [
      { kind: 'element', elementId: 'LCM1', view: 'common-mode', frequencyHz: 850e3, type: 'parallel' },
      { kind: 'response', column: 'insertionLoss50Dm', frequencyHz: 2.37e6, valueDb: 157.2, type: 'peak' },
      { kind: 'response', column: 'transferCm', frequencyHz: 3e6, valueDb: -80, type: 'notch' },
      { kind: 'element', elementId: 'CX1', view: 'impedance', frequencyHz: 5e6, type: 'series' },
      { kind: 'element', elementId: 'LCM1', view: 'differential-mode', frequencyHz: 16e6, type: 'parallel' },
    ],
    warnings: [{ code: 'ideal-part', elementId: 'CX1', message: 'CX1 X2 100 nF: no ESL, so its attenuation keeps rising with frequency' }],
    resistiveSystems: [],
  };
}
