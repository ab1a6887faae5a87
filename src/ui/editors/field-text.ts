/**
 * What the editors call each field of the design file, in plain words, with a hint where the name
 * alone does not say enough. A field the schema has and this list lacks is shown by its name in words
 * ("interwindingCapacitance" → "Interwinding capacitance"), so a new field is never hidden.
 */
const FIELD_TEXT: Readonly<Record<string, string>> = {
  capacitance: 'Capacitance',
  esr: 'ESR',
  esl: 'ESL',
  safetyClass: 'Safety class',
  ratedVoltage: 'Rated voltage',
  ratedCurrent: 'Rated current',
  inductance: 'Inductance',
  dcr: 'DC resistance',
  dcResistance: 'DC resistance',
  windingCapacitance: 'Winding capacitance',
  coreLoss: 'Core loss',
  permeability: 'Ferrite permeability',
  relaxationFrequencyHz: 'Relaxation frequency',
  qualityFactor: 'Quality factor Q',
  atFrequencyHz: 'at frequency',
  resistance: 'Resistance',
  seriesInductance: 'Series inductance',
  coupling: 'Coupling',
  leakageInductance: 'Leakage inductance (per winding)',
  couplingFactor: 'Coupling factor k',
  parallelResistance: 'Parallel loss resistance',
  startHz: 'Start',
  stopHz: 'Stop',
  pointsPerDecade: 'Points per decade',
  impedance: 'Impedance',
  preset: 'Preset',
  label: 'Label',
  amplitude: 'Amplitude (peak)',
  frequencyHz: 'Frequency',
  duty: 'Duty cycle',
  riseTime: 'Rise time',
  fallTime: 'Fall time',
  parasiticCapacitance: 'Parasitic capacitance to chassis',
  switchNode: 'Switch-node waveform',
  current: 'Input current',
  pulse: 'Pulse',
  peakToPeak: 'Ripple, peak to peak',
  riseFraction: 'Rising fraction of the period',
  inputCapacitance: 'Input capacitance',
  commonMode: 'Common mode',
  differentialMode: 'Differential mode',
  supply: 'Supply',
  highestVoltage: 'Highest voltage',
  highestFrequencyHz: 'Highest line frequency',
  lineCurrent: 'Line current at full load',
  converter: 'Converter',
  lowestInputVoltage: 'Lowest input voltage at full power',
  highestInputPower: 'Highest input power',
  targetMarginDb: 'Target margin',
  noiseFloorDbuV: 'Receiver noise floor',
  attribution: 'Scan of unknown mode is credited with',
};

const HINT_TEXT: Readonly<Record<string, string>> = {
  esl: 'leads and mounting included',
  windingCapacitance: 'across each winding; sets the self-resonance',
  leakageInductance: 'L − M; the DM loop sees twice this',
  couplingFactor: 'above 0, at most 1',
  relaxationFrequencyHz: 'where µ′ has halved',
  parallelResistance: 'core and winding loss across each winding',
  pointsPerDecade: 'self-resonances and peaks are added on top',
  highestVoltage: 'rms, top of the rated range with its tolerance',
  duty: 'between 0 and 1',
  riseFraction: 'between 0 and 1',
};

/** Kinds as choices in a list. */
const KIND_TEXT: Readonly<Record<string, string>> = {
  constant: 'constant',
  'first-order-relaxation': 'first-order relaxation',
  none: 'none',
  'parallel-resistance': 'parallel resistance',
  'quality-factor': 'quality factor at a frequency',
  'leakage-inductance': 'leakage inductance',
  'coupling-factor': 'coupling factor',
  'cispr16-mains-50uh': 'CISPR 16-1-2 V-network, 50 Ω ∥ (50 µH + 5 Ω)',
  'vehicle-5uh': '50 Ω ∥ 5 µH network (vehicle components)',
  resistive: 'resistive',
  custom: 'custom impedance',
  pulsed: 'pulsed (trapezoid)',
  'triangular-ripple': 'triangular ripple',
  'ac-mains': 'AC mains',
  dc: 'DC',
  capacitor: 'capacitor',
  inductor: 'inductor',
  resistor: 'resistor',
  'ferrite-bead': 'ferrite bead',
  'damping-rc': 'damping R–C leg',
  'damping-rl': 'damping R–L leg',
  measured: 'measured |Z| table',
};

function words(name: string): string {
  const spaced = name.replace(/Hz$/u, '').replace(/([a-z0-9])([A-Z])/gu, '$1 $2').toLowerCase();
  return spaced.charAt(0).toUpperCase() + spaced.slice(1);
}

export function fieldText(name: string): string {
  return FIELD_TEXT[name] ?? words(name);
}

export function fieldHint(name: string): string | undefined {
  return HINT_TEXT[name];
}

export function kindText(kind: string): string {
  return KIND_TEXT[kind] ?? kind.replace(/-/gu, ' ');
}
