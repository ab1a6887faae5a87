/**
 * The first-cut rule of thumb for a filter's corner: an n-th order section rolls off at 20·n dB per
 * decade above its corner, so the corner must satisfy f_c ≤ f·10^(−A(f)/(20·n)) at every frequency
 * where A(f) dB of attenuation is required; the most demanding point sets it. For a second-order LC
 * section (n = 2) that is f_c = min f·10^(−A/40). A rule only: the termination offset (about 6 dB for
 * equal resistive terminations) and every self-resonance are left out; the assistants size parts
 * with the engine and report this figure beside it for comparison.
 */

export interface RequiredAttenuation {
  readonly frequencyHz: number;
  readonly attenuationDb: number;
}

/** The corner the rule asks for, and the point that sets it; undefined when nothing is required. */
export function ruleCorner(required: readonly RequiredAttenuation[], order = 2): { cornerHz: number; setBy: RequiredAttenuation } | undefined {
  let best: { cornerHz: number; setBy: RequiredAttenuation } | undefined;
  for (const point of required) {
    if (!(point.attenuationDb > 0) || !(point.frequencyHz > 0)) continue;
    const cornerHz = point.frequencyHz * 10 ** (-point.attenuationDb / (20 * order));
    if (!best || cornerHz < best.cornerHz) best = { cornerHz, setBy: point };
  }
  return best;
}

/** The capacitance that puts an LC section of inductance L at corner f_c: 1/((2π f_c)²·L). */
export function capacitanceForCorner(cornerHz: number, inductance: number): number {
  const omega = 2 * Math.PI * cornerHz;
  return 1 / (omega * omega * inductance);
}

/** The inductance that puts an LC section of capacitance C at corner f_c. */
export function inductanceForCorner(cornerHz: number, capacitance: number): number {
  return capacitanceForCorner(cornerHz, capacitance);
}
