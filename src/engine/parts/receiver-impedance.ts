import type { Receiver } from '../../model/design.ts';
import type { ComplexColumns } from '../complex-columns.ts';
import { twoTerminalEvaluator, type TwoTerminalEvaluator } from './part-impedance.ts';

/**
 * Receiving networks (LISN / artificial network) as seen from the equipment terminal, with the
 * measuring port terminated in 50 Ω and the supply side short at radio frequency.
 */
export const CISPR16_MAINS_NETWORK = { portResistance: 50, inductance: 50e-6, seriesResistance: 5 } as const;
export const VEHICLE_NETWORK = { portResistance: 50, inductance: 5e-6, seriesResistance: 0 } as const;

const TWO_PI = 2 * Math.PI;

/** R ∥ (Rs + jωL): the V-network arm. */
function parallelArm(
  network: { portResistance: number; inductance: number; seriesResistance: number },
  f: Float64Array,
  out: ComplexColumns,
): void {
  const r = network.portResistance;
  for (let i = 0; i < f.length; i += 1) {
    const ar = network.seriesResistance;
    const ai = TWO_PI * f[i]! * network.inductance;
    // R·a / (R + a)
    const dr = r + ar;
    const d2 = dr * dr + ai * ai;
    const nr = r * ar;
    const ni = r * ai;
    out.re[i] = (nr * dr + ni * ai) / d2;
    out.im[i] = (ni * dr - nr * ai) / d2;
  }
}

export function receiverEvaluator(receiver: Receiver): TwoTerminalEvaluator {
  switch (receiver.kind) {
    case 'cispr16-mains-50uh':
      return { evaluate: (f, out) => parallelArm(CISPR16_MAINS_NETWORK, f, out) };
    case 'vehicle-5uh':
      return { evaluate: (f, out) => parallelArm(VEHICLE_NETWORK, f, out) };
    case 'resistive':
      return {
        evaluate: (f, out) => {
          out.re.fill(receiver.resistance, 0, f.length);
          out.im.fill(0, 0, f.length);
        },
      };
    case 'custom':
      return twoTerminalEvaluator(receiver.impedance);
  }
}
