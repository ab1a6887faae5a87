import demo from '../../fixtures/demo/adapter-two-stage.design.json';
import type { Design, DesignInput } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/index.ts';

/** Invented designs for the drawing's tests: the smallest filter and a crowded stage of 20 elements. */

const source = (demo as unknown as DesignInput).noiseSource;
const receivers = (demo as unknown as DesignInput).receivers;

export function oneElementDesign(): Design {
  return requireDesign({
    format: 'chokepoint-design',
    version: 2,
    name: 'One X capacitor (invented)',
    noiseSource: source,
    receivers,
    stages: [{ id: 'input', elements: [{ id: 'CX1', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '470 nF', safetyClass: 'X2' } }] }],
  });
}

/** Every placement and every part kind, 20 elements in one stage. */
export function twentyElementDesign(): Design {
  const kinds = [
    { placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '220 nF', safetyClass: 'X2' } },
    { placement: 'both-lines-coupled', part: { kind: 'common-mode-choke', inductance: '1.5 mH', coupling: { kind: 'coupling-factor', couplingFactor: 0.99 } } },
    { placement: 'series-line1', part: { kind: 'inductor', inductance: '22 uH' } },
    { placement: 'series-line2', part: { kind: 'inductor', inductance: '22 uH' } },
    { placement: 'line1-to-ground', part: { kind: 'capacitor', capacitance: '2.2 nF', safetyClass: 'Y2' } },
    { placement: 'line2-to-ground', part: { kind: 'capacitor', capacitance: '2.2 nF', safetyClass: 'Y2' } },
    { placement: 'series-line1', part: { kind: 'ferrite-bead', resistance: '600', inductance: '2 uH' } },
    { placement: 'series-line2', part: { kind: 'resistor', resistance: '0.1' } },
    { placement: 'line-to-line', part: { kind: 'damping-rc', resistance: '1.5', capacitance: '1 uF' } },
    { placement: 'series-line1', part: { kind: 'damping-rl', resistance: '2', inductance: '1 uH' } },
  ] as const;
  const elements = Array.from({ length: 20 }, (_, i) => ({ id: `E${i + 1}`, ...kinds[i % kinds.length]!, ...(i === 13 ? { enabled: false } : {}) }));
  return requireDesign({
    format: 'chokepoint-design',
    version: 2,
    name: 'Twenty elements in one stage (invented)',
    noiseSource: source,
    receivers,
    stages: [
      { id: 'crowded', label: 'A crowded stage', elements },
      { id: 'outlet', label: 'Outlet', elements: [{ id: 'CX9', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '100 nF' } }] },
    ],
  });
}
