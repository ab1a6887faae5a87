import { formatQuantity } from '../../model/units.ts';

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
