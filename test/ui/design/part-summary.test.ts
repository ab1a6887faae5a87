// @vitest-environment node
import { describe, expect, it } from 'vitest';
import type { Part, Receiver } from '../../../src/model/design.ts';
import { requireDesign } from '../../../src/model/index.ts';
import { describePlacement, describeReceiver, summarizePart } from '../../../src/ui/design/part-summary.ts';
import { buildDesign, element } from '../../support/design-builders.ts';

/** Validate a part the way a design file would, so defaults are filled in. */
function part(input: Record<string, unknown>): Part {
  const placement = input['kind'] === 'common-mode-choke' ? 'both-lines-coupled' : 'line-to-line';
  const design = buildDesign({ elements: [element(placement, input as never, 'X')] });
  return design.stages[0]!.elements[0]!.part;
}

describe('summarizePart', () => {
  it.each([
    [{ kind: 'capacitor', capacitance: '4.7 nF' }, { kind: 'capacitor', value: '4.7 nF', details: '' }],
    [
      { kind: 'capacitor', capacitance: '2.2 nF', esl: '6 nH', safetyClass: 'Y1', ratedVoltage: '400 V' },
      { kind: 'Y1 capacitor', value: '2.2 nF', details: 'ESL 6 nH, rated 400 V' },
    ],
    [
      { kind: 'inductor', inductance: '100 uH', dcr: '0.1', coreLoss: { kind: 'quality-factor', qualityFactor: 30, atFrequencyHz: '1 MHz' } },
      { kind: 'inductor', value: '100 µH', details: 'DCR 100 mΩ, Q 30 at 1 MHz' },
    ],
    [{ kind: 'resistor', resistance: '4R7', seriesInductance: '5 nH' }, { kind: 'resistor', value: '4.7 Ω', details: 'series L 5 nH' }],
    [
      { kind: 'ferrite-bead', resistance: 600, inductance: '2 uH', ratedCurrent: 3 },
      { kind: 'ferrite bead', value: '600 Ω peak', details: 'L 2 µH, rated 3 A' },
    ],
    [{ kind: 'damping-rc', resistance: 1, capacitance: '1 uF' }, { kind: 'RC damper', value: '1 Ω + 1 µF', details: 'R and C in series' }],
    [{ kind: 'damping-rl', resistance: 2, inductance: '1 uH' }, { kind: 'RL damper', value: '2 Ω ∥ 1 µH', details: 'R and L in parallel' }],
    [
      { kind: 'measured', table: { frequencyHz: [1e5, 1e7], magnitudeOhm: [10, 1000], phaseDeg: [80, 85] }, origin: { format: 'impedance-table', fileName: 'bead.csv' } },
      { kind: 'measured impedance', value: '2 points', details: '100 kHz to 10 MHz, bead.csv' },
    ],
    [
      { kind: 'common-mode-choke', inductance: '1 mH', coupling: { kind: 'coupling-factor', couplingFactor: 0.99 }, ratedCurrent: 1 },
      { kind: 'common-mode choke', value: '1 mH', details: 'value per winding, coupling k = 0.99, rated 1 A' },
    ],
  ])('%j reads as %j', (input, expected) => {
    expect(summarizePart(part(input))).toEqual(expected);
  });
});

describe('placements and receivers', () => {
  it('describes placements plainly', () => {
    expect(describePlacement('series-line2')).toBe('in series, line 2');
    expect(describePlacement('line2-to-ground')).toBe('line 2 to ground');
  });

  it('describes receiving networks', () => {
    const receivers: [Receiver, string][] = [
      [{ kind: 'vehicle-5uh' }, 'LISN, 50 Ω ∥ 5 µH'],
      [{ kind: 'resistive', resistance: 25 }, '25 Ω resistive'],
      [{ kind: 'custom', label: 'bench network', impedance: { kind: 'resistor', resistance: 10, seriesInductance: 0 } }, 'bench network'],
    ];
    for (const [receiver, text] of receivers) expect(describeReceiver(receiver)).toBe(text);
    const design = requireDesign({ ...buildDesign({}), receivers: { line1: { kind: 'cispr16-mains-50uh' }, line2: { kind: 'cispr16-mains-50uh' } } });
    expect(describeReceiver(design.receivers.line1)).toBe('LISN, 50 Ω ∥ (50 µH + 5 Ω)');
  });
});
