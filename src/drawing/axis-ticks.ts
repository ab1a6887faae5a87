import { formatQuantity, type UnitSymbol } from '../model/units.ts';
import { formatFrequency } from './frequency-ticks.ts';
import { textWidth } from './text-metrics.ts';

/**
 * Where the ticks of a plot go and what they say. A log-frequency axis carries a grid line at every
 * 1…9 × 10^k, darker on the decades, with engineering labels ("150 kHz", "1 MHz", "30 MHz") on the
 * decades, the axis ends, and on 2 and 5 when a decade is wide enough, never two labels touching.
 * A linear axis gets "nice" steps (1, 2, 2.5 or 5 × 10^k) about every 36 pixels.
 */

export interface Tick {
  readonly value: number;
  /** Pixel position along the axis. */
  readonly position: number;
  /** Text under (or beside) the tick; undefined for a grid line alone. */
  readonly label: string | undefined;
  /** A decade of a log axis, or every tick of a linear one: drawn with the stronger grid colour. */
  readonly major: boolean;
}

/** Maps a value to a pixel position; the inverse is for tests and cursors. */
export interface Scale {
  readonly min: number;
  readonly max: number;
  readonly from: number;
  readonly to: number;
  readonly kind: 'log' | 'linear';
  position(value: number): number;
}

export function logScale(min: number, max: number, from: number, to: number): Scale {
  if (!(min > 0 && max > min)) throw new RangeError(`a log scale needs 0 < min < max, got ${min} and ${max}`);
  const lo = Math.log10(min);
  const span = Math.log10(max) - lo;
  return { min, max, from, to, kind: 'log', position: (value) => from + ((Math.log10(value) - lo) / span) * (to - from) };
}

export function linearScale(min: number, max: number, from: number, to: number): Scale {
  if (!(max > min)) throw new RangeError(`a linear scale needs min < max, got ${min} and ${max}`);
  return { min, max, from, to, kind: 'linear', position: (value) => from + ((value - min) / (max - min)) * (to - from) };
}

/** k × 10^e written so that 3 × 10^5 is exactly 300000 (no 300000.00000000006). */
function decadeMultiple(k: number, exponent: number): number {
  return exponent >= 0 ? k * 10 ** exponent : k / 10 ** -exponent;
}

/** The mantissa 1…9 of a value on the 1…9 × 10^k lattice. */
function mantissaOf(value: number): number {
  return Math.round(value / 10 ** Math.floor(Math.log10(value) + 1e-9));
}

export function formatFrequencyLabel(hz: number): string {
  return formatFrequency(hz, 3);
}

/**
 * Ticks of a log-frequency axis over [minHz, maxHz] drawn on `scale`. Labels are placed in order of
 * importance (decades, then the two ends, then 2 and 5) and each is kept only when it clears the
 * labels already placed by `gapPx`.
 */
export function logFrequencyTicks(scale: Scale, fontSizePx: number, gapPx = 10): Tick[] {
  const { min, max } = scale;
  const values: number[] = [];
  for (let exponent = Math.floor(Math.log10(min)); exponent <= Math.ceil(Math.log10(max)); exponent += 1) {
    for (let k = 1; k <= 9; k += 1) {
      const value = decadeMultiple(k, exponent);
      if (value >= min * (1 - 1e-12) && value <= max * (1 + 1e-12)) values.push(value);
    }
  }
  const pixelsPerDecade = Math.abs(scale.to - scale.from) / Math.log10(max / min);
  const placed: { left: number; right: number }[] = [];
  const labels = new Map<number, string>();
  const tryLabel = (value: number): void => {
    if (labels.has(value)) return;
    const text = formatFrequencyLabel(value);
    const half = textWidth(text, fontSizePx) / 2;
    const centre = scale.position(value);
    const box = { left: centre - half - gapPx / 2, right: centre + half + gapPx / 2 };
    if (placed.some((other) => box.left < other.right && box.right > other.left)) return;
    placed.push(box);
    labels.set(value, text);
  };
  for (const value of values) if (mantissaOf(value) === 1) tryLabel(value);
  tryLabel(min);
  tryLabel(max);
  if (pixelsPerDecade >= 150) for (const value of values) if (mantissaOf(value) === 2 || mantissaOf(value) === 5) tryLabel(value);
  const ticks: Tick[] = values.map((value) => ({ value, position: scale.position(value), label: labels.get(value), major: mantissaOf(value) === 1 }));
  // The ends carry a label even where no grid line falls (150 kHz, 30 MHz).
  for (const end of [min, max]) {
    if (labels.has(end) && !values.some((value) => Math.abs(value / end - 1) < 1e-9)) {
      ticks.push({ value: end, position: scale.position(end), label: labels.get(end), major: false });
    }
  }
  return ticks.sort((a, b) => a.value - b.value);
}

const NICE_STEPS = [1, 2, 2.5, 5, 10];

/** The smallest nice step (1, 2, 2.5, 5 × 10^k) at least `raw`. */
export function niceStep(raw: number): number {
  if (!(raw > 0) || !Number.isFinite(raw)) return 1;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = NICE_STEPS.find((s) => s * power >= raw * (1 - 1e-9)) ?? 10;
  return Number((step * power).toPrecision(12));
}

/** A range widened to whole steps, with a step giving about one tick per `spacingPx`. */
export function niceLinearRange(min: number, max: number, lengthPx: number, spacingPx = 36): { min: number; max: number; step: number } {
  let low = min;
  let high = max;
  if (!(high > low)) {
    const pad = Math.abs(low) > 0 ? Math.abs(low) * 0.1 : 1;
    low -= pad;
    high += pad;
  }
  const count = Math.max(2, Math.floor(lengthPx / spacingPx));
  let step = niceStep((high - low) / count);
  // Widening to whole steps can overshoot the tick budget by one step: take the next step then.
  for (let attempt = 0; attempt < 3; attempt += 1) {
    const lo = Math.floor(low / step + 1e-9) * step;
    const hi = Math.ceil(high / step - 1e-9) * step;
    if ((hi - lo) / step <= count + 1) return { min: Number(lo.toPrecision(12)), max: Number(hi.toPrecision(12)), step };
    step = niceStep(step * 1.01);
  }
  return { min: Math.floor(low / step) * step, max: Math.ceil(high / step) * step, step };
}

/** Decimals the step itself is written with: 2.5 → 1, 0.25 → 2, 10 → 0. */
function decimalsOf(step: number): number {
  const text = String(step);
  const exponent = /e-(\d+)$/u.exec(text);
  const fraction = text.split('e')[0]!.split('.')[1]?.length ?? 0;
  return Math.min(12, exponent ? Number(exponent[1]) + fraction : fraction);
}

/** A number as a tick label: as many decimals as the step needs, a true minus sign. */
export function formatTickNumber(value: number, step: number): string {
  const decimals = decimalsOf(step);
  const text = Math.abs(value) < step * 1e-9 ? (0).toFixed(decimals) : value.toFixed(decimals);
  return text.startsWith('-') ? `\u2212${text.slice(1)}` : text;
}

/** Ticks every `step` from min to max on a linear scale. */
export function linearTicks(scale: Scale, step: number): Tick[] {
  const ticks: Tick[] = [];
  const first = Math.ceil(scale.min / step - 1e-9);
  const last = Math.floor(scale.max / step + 1e-9);
  for (let k = first; k <= last; k += 1) {
    const value = Number((k * step).toPrecision(12));
    ticks.push({ value, position: scale.position(value), label: formatTickNumber(value, step), major: true });
  }
  return ticks;
}

const UNIT_SYMBOLS: readonly UnitSymbol[] = ['H', 'F', 'Ω', 'Hz', 'V', 'A', 's', 'W'];

/** Decades (and 2, 5 when there are few decades) of a log value axis, labelled in engineering notation. */
export function logValueTicks(scale: Scale, unit: string): Tick[] {
  const symbol = UNIT_SYMBOLS.find((u) => u === unit) ?? '';
  const decades = Math.log10(scale.max / scale.min);
  const ticks: Tick[] = [];
  for (let exponent = Math.floor(Math.log10(scale.min)); exponent <= Math.ceil(Math.log10(scale.max)); exponent += 1) {
    for (let k = 1; k <= 9; k += 1) {
      const value = decadeMultiple(k, exponent);
      if (value < scale.min * (1 - 1e-12) || value > scale.max * (1 + 1e-12)) continue;
      const labelled = k === 1 || (decades <= 2.5 && (k === 2 || k === 5));
      ticks.push({ value, position: scale.position(value), label: labelled ? formatQuantity(value, symbol, 3) : undefined, major: k === 1 });
    }
  }
  return ticks;
}
