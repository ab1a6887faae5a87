/** Frequency units that measurement files use, with their factor to hertz. */
export const FREQUENCY_UNITS = ['Hz', 'kHz', 'MHz', 'GHz'] as const;
export type FrequencyUnit = (typeof FREQUENCY_UNITS)[number];

const FACTOR: Readonly<Record<FrequencyUnit, number>> = { Hz: 1, kHz: 1e3, MHz: 1e6, GHz: 1e9 };

export function frequencyUnitFactor(unit: FrequencyUnit): number {
  return FACTOR[unit];
}

/** "hz", "KHZ", "MHz" -> the unit. Case is ignored: files write "MHZ", and millihertz never occurs. */
export function parseFrequencyUnit(text: string): FrequencyUnit | undefined {
  const lower = text.trim().toLowerCase();
  return FREQUENCY_UNITS.find((unit) => unit.toLowerCase() === lower);
}

/** A value in `unit` to hertz, with the binary noise of the multiplication removed (1.1 MHz -> 1100000). */
export function toHertz(value: number, unit: FrequencyUnit): number {
  const factor = FACTOR[unit];
  return factor === 1 ? value : Number((value * factor).toPrecision(15));
}
