import type { LimitMask } from '../../model/design.ts';
import type { Attribution } from '../../model/emissions-schema.ts';
import { copyPreset, LIMIT_PRESETS, type LimitPreset } from '../../spectrum/limit-presets.ts';
import type { RejectedLine, Scan } from '../../spectrum/spectrum-types.ts';
import type { EmissionsError } from '../../client/emissions-outcome.ts';
import type { EmissionsAnalysis } from '../../spectrum/emissions-analysis.ts';

/**
 * The state of the emissions section and the edits it makes to the design document. Edits work on
 * the document as the page holds it (plain JSON, values as the file wrote them) and return a new
 * document; the caller validates it with readDesign before showing it, exactly as a file is read.
 * The preset catalogue is only read: adding a preset puts a copy into the design.
 */

/** Where the noise comes from: the design's own estimate, or the scan loaded on the page. */
export type NoiseChoice = 'estimate' | 'scan';

/** A scan that was read, with what the reader left out and noted. */
export interface LoadedScan {
  readonly scan: Scan;
  readonly fileName: string;
  readonly invented: boolean;
  readonly elapsedMs: number;
}

export type ImportState =
  | { readonly kind: 'idle' }
  | { readonly kind: 'reading'; readonly fileName: string; readonly fractionDone: number }
  | {
      readonly kind: 'failed';
      readonly fileName: string;
      readonly message: string;
      readonly rejected: readonly RejectedLine[];
      readonly notes: readonly string[];
    };

export type AnalysisState =
  | { readonly kind: 'idle'; readonly reason: string }
  | { readonly kind: 'running' }
  | { readonly kind: 'done'; readonly analysis: EmissionsAnalysis; readonly elapsedMs: number }
  | { readonly kind: 'failed'; readonly error: EmissionsError };

type JsonObject = Record<string, unknown>;

function asObject(value: unknown): JsonObject {
  return typeof value === 'object' && value !== null && !Array.isArray(value) ? (value as JsonObject) : {};
}

/** The document's `emissions` object as written (empty when the design has none). */
export function emissionsOf(document: unknown): JsonObject {
  return asObject(asObject(document)['emissions']);
}

/** The masks as written in the document. */
export function masksOf(document: unknown): unknown[] {
  const masks = emissionsOf(document)['masks'];
  return Array.isArray(masks) ? masks : [];
}

/** A new document with some `emissions` fields replaced; a field set to undefined is removed. */
export function withEmissions(document: unknown, patch: Readonly<Record<string, unknown>>): unknown {
  const emissions: JsonObject = { ...emissionsOf(document) };
  for (const [key, value] of Object.entries(patch)) {
    if (value === undefined) delete emissions[key];
    else emissions[key] = value;
  }
  return { ...asObject(document), emissions };
}

/** A mask id not used yet: the preset's own, else with "-2", "-3" … appended. */
export function uniqueMaskId(taken: readonly string[], base: string): string {
  if (!taken.includes(base)) return base;
  for (let n = 2; ; n += 1) {
    const id = `${base}-${n}`;
    if (!taken.includes(id)) return id;
  }
}

function maskIds(document: unknown): string[] {
  return masksOf(document).flatMap((mask) => {
    const id = asObject(mask)['id'];
    return typeof id === 'string' ? [id] : [];
  });
}

/** Add a copy of a preset to the design's masks. */
export function addPresetMask(document: unknown, presetId: string): unknown {
  const copy: LimitMask = copyPreset(presetId, uniqueMaskId(maskIds(document), presetId));
  return withEmissions(document, { masks: [...masksOf(document), copy] });
}

/** Remove a mask from the design by its id. */
export function removeMask(document: unknown, maskId: string): unknown {
  return withEmissions(document, { masks: masksOf(document).filter((mask) => asObject(mask)['id'] !== maskId) });
}

export function setAttribution(document: unknown, attribution: Attribution): unknown {
  return withEmissions(document, { attribution });
}

export type NumberInput = { readonly ok: true; readonly value: number | undefined } | { readonly ok: false; readonly message: string };

/** A dB or dBµV field: a plain number within bounds, or empty when `optional`. A decimal comma is accepted. */
export function readNumberInput(text: string, what: string, bounds: { min: number; max: number; optional: boolean }): NumberInput {
  const trimmed = text.trim().replace(',', '.');
  if (trimmed === '') return bounds.optional ? { ok: true, value: undefined } : { ok: false, message: `${what}: enter a number` };
  const value = Number(trimmed);
  if (!Number.isFinite(value)) return { ok: false, message: `${what}: “${text.trim()}” is not a number` };
  if (value < bounds.min || value > bounds.max) return { ok: false, message: `${what}: from ${bounds.min} to ${bounds.max}` };
  return { ok: true, value };
}

/** The presets offered, grouped by standard for the picker. */
export function presetGroups(): { readonly standard: string; readonly presets: readonly LimitPreset[] }[] {
  const groups: { standard: string; presets: LimitPreset[] }[] = [];
  for (const preset of LIMIT_PRESETS) {
    const group = groups.find((g) => g.standard === preset.standard);
    if (group) group.presets.push(preset);
    else groups.push({ standard: preset.standard, presets: [preset] });
  }
  return groups;
}
