import { formatQuantity } from '../model/units.ts';

/** A frequency for people: "150 kHz", "2.37 MHz". */
export function formatFrequency(hz: number, significantDigits = 3): string {
  return formatQuantity(hz, 'Hz', significantDigits);
}

/**
 * Labels for the ticks of a log frequency axis. uPlot places a tick at every 1…9 × 10^k; only
 * some get text, or the labels would collide: 1, 2 and 5 per decade when a decade is wide enough,
 * else the decades alone. Unlabelled ticks still draw their grid line, which reads as log paper.
 */
export function frequencyTickLabels(splits: readonly (number | null)[], pixelsPerDecade: number): string[] {
  const labelled = pixelsPerDecade >= 190 ? [1, 2, 5] : pixelsPerDecade >= 70 ? [1, 3] : [1];
  return splits.map((hz) => {
    if (hz === null || !(hz > 0)) return '';
    const mantissa = Math.round(hz / 10 ** Math.floor(Math.log10(hz) + 1e-9));
    return labelled.includes(mantissa) ? formatFrequency(hz) : '';
  });
}

/** Horizontal room per decade on a log axis spanning [minHz, maxHz] over `widthPx`. */
export function pixelsPerDecade(minHz: number, maxHz: number, widthPx: number): number {
  const decades = Math.log10(maxHz / minHz);
  return decades > 0 ? widthPx / decades : widthPx;
}

/**
 * Tick positions on a log axis: every 1…9 × 10^k inside [min, max]. uPlot's own log splits start at
 * the scale's minimum, so an axis starting at 65 kHz would be ticked at 65, 75, … and then at odd
 * multiples such as 105 kHz and 210 kHz; these stay on the decades wherever the axis starts. Zoomed
 * in so far that fewer than four of those fall inside, the steps become 1.0, 1.1 … 9.9 × 10^k, and so on.
 */
export function logSplits(min: number, max: number): number[] {
  if (!(min > 0 && max >= min && Number.isFinite(max))) return [];
  let splits: number[] = [];
  for (let digits = 0; digits <= 3; digits += 1) {
    splits = splitsWithDigits(min, max, digits);
    if (splits.length >= 4) break;
  }
  return splits;
}

/** k × 10^(e − digits) for k = 10^digits … 10^(digits+1) − 1, written so that 3 × 10^5 is exactly 300000. */
function splitsWithDigits(min: number, max: number, digits: number): number[] {
  const splits: number[] = [];
  const first = 10 ** digits;
  for (let exponent = Math.floor(Math.log10(min)); exponent <= Math.ceil(Math.log10(max)); exponent += 1) {
    const power = exponent - digits;
    for (let k = first; k < 10 * first; k += 1) {
      const value = power >= 0 ? k * 10 ** power : k / 10 ** -power;
      if (value >= min * (1 - 1e-12) && value <= max * (1 + 1e-12)) splits.push(value);
    }
  }
  return splits;
}
