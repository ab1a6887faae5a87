import { copyPreset } from '../../spectrum/limit-presets.ts';
import { getAt, isJsonObject, type Json, type JsonObject } from '../json.ts';
import type { EditResult } from './design-edits.ts';

/**
 * Edits of a design's `emissions` block: limit masks (added from a preset or a file, removed, their
 * points edited in a table), and the judging settings. Presets are only read: adding one puts an
 * editable copy into the design, so a later change to the catalogue cannot move a saved limit.
 */

/** The format allows 16 masks and 10 000 points per mask (emissions-schema.ts). */
export const MAX_MASKS = 16;
export const MAX_MASK_POINTS = 10_000;

export function emissionsOf(document: JsonObject): JsonObject {
  const emissions = document['emissions'];
  return isJsonObject(emissions) ? emissions : {};
}

export function masksOf(document: JsonObject): readonly JsonObject[] {
  const masks = emissionsOf(document)['masks'];
  return Array.isArray(masks) ? (masks as readonly Json[]).filter(isJsonObject) : [];
}

/** A copy of the document with some emissions fields replaced; undefined removes a field. */
export function withEmissions(document: JsonObject, patch: Readonly<Record<string, Json | undefined>>): JsonObject {
  const emissions: Record<string, Json> = { ...emissionsOf(document) };
  for (const [key, value] of Object.entries(patch)) {
    if (value === undefined) delete emissions[key];
    else emissions[key] = value;
  }
  return { ...document, emissions };
}

/** The mask id not taken yet: the wanted one, else with "-2", "-3" … appended. */
export function uniqueMaskId(document: JsonObject, wanted: string): string {
  const taken = new Set(masksOf(document).map((mask) => mask['id']));
  if (!taken.has(wanted)) return wanted;
  for (let n = 2; ; n += 1) if (!taken.has(`${wanted}-${n}`)) return `${wanted}-${n}`;
}

export function addPresetMask(document: JsonObject, presetId: string): EditResult {
  if (masksOf(document).length >= MAX_MASKS) return { ok: false, reason: `a design holds at most ${MAX_MASKS} limit masks` };
  let mask;
  try {
    mask = copyPreset(presetId, uniqueMaskId(document, presetId));
  } catch {
    return { ok: false, reason: `no limit preset "${presetId}"` };
  }
  const json: JsonObject = { ...mask, frequencyHz: [...mask.frequencyHz], levelDbuV: [...mask.levelDbuV] };
  return { ok: true, document: withEmissions(document, { masks: [...masksOf(document), json] }), created: [json['id'] as string] };
}

/** Add masks read from a file (already validated by the mask reader), each with an id made unique. */
export function addMasks(document: JsonObject, masks: readonly JsonObject[]): EditResult {
  if (masksOf(document).length + masks.length > MAX_MASKS) return { ok: false, reason: `a design holds at most ${MAX_MASKS} limit masks` };
  let next = document;
  const created: string[] = [];
  for (const mask of masks) {
    const id = uniqueMaskId(next, typeof mask['id'] === 'string' ? mask['id'] : 'mask');
    created.push(id);
    next = withEmissions(next, { masks: [...masksOf(next), { ...mask, id }] });
  }
  return { ok: true, document: next, created };
}

export function removeMask(document: JsonObject, maskId: string): EditResult {
  const masks = masksOf(document);
  if (!masks.some((mask) => mask['id'] === maskId)) return { ok: false, reason: `no limit mask "${maskId}"` };
  return { ok: true, document: withEmissions(document, { masks: masks.filter((mask) => mask['id'] !== maskId) }) };
}

function maskIndex(document: JsonObject, maskId: string): number {
  return masksOf(document).findIndex((mask) => mask['id'] === maskId);
}

function columns(mask: JsonObject): { frequencyHz: Json[]; levelDbuV: Json[] } {
  const f = mask['frequencyHz'];
  const l = mask['levelDbuV'];
  return { frequencyHz: Array.isArray(f) ? [...(f as readonly Json[])] : [], levelDbuV: Array.isArray(l) ? [...(l as readonly Json[])] : [] };
}

function replaceMask(document: JsonObject, index: number, mask: JsonObject): JsonObject {
  const masks = [...masksOf(document)];
  masks[index] = mask;
  return withEmissions(document, { masks });
}

/** Set one point of a mask's table; a value the table cannot hold is stored as typed and marked by validation. */
export function setMaskPoint(document: JsonObject, maskId: string, point: number, change: { readonly frequencyHz?: Json; readonly levelDbuV?: Json }): EditResult {
  const index = maskIndex(document, maskId);
  if (index < 0) return { ok: false, reason: `no limit mask "${maskId}"` };
  const mask = masksOf(document)[index]!;
  const table = columns(mask);
  if (point < 0 || point >= table.frequencyHz.length) return { ok: false, reason: `no point ${point + 1} in "${maskId}"` };
  if (change.frequencyHz !== undefined) table.frequencyHz[point] = change.frequencyHz;
  if (change.levelDbuV !== undefined) table.levelDbuV[point] = change.levelDbuV;
  return { ok: true, document: replaceMask(document, index, { ...mask, ...table }) };
}

/**
 * A new point after `point`: halfway (on the log-frequency axis the mask is drawn on) to the next
 * point, at the level the line has there; after the last point, a decade above at the same level.
 */
export function insertMaskPoint(document: JsonObject, maskId: string, point: number): EditResult {
  const index = maskIndex(document, maskId);
  if (index < 0) return { ok: false, reason: `no limit mask "${maskId}"` };
  const mask = masksOf(document)[index]!;
  const table = columns(mask);
  if (table.frequencyHz.length >= MAX_MASK_POINTS) return { ok: false, reason: `a mask holds at most ${MAX_MASK_POINTS} points` };
  const at = Math.min(Math.max(point, -1), table.frequencyHz.length - 1);
  const f0 = Number(table.frequencyHz[at] ?? 150e3);
  const l0 = Number(table.levelDbuV[at] ?? 60);
  const f1 = table.frequencyHz[at + 1];
  const l1 = table.levelDbuV[at + 1];
  let f = f0 * 10;
  let level = l0;
  if (typeof f1 === 'number' && typeof l1 === 'number' && f1 > f0 && f0 > 0) {
    f = Math.sqrt(f0 * f1);
    level = (l0 + l1) / 2;
  }
  table.frequencyHz.splice(at + 1, 0, Number(f.toPrecision(6)));
  table.levelDbuV.splice(at + 1, 0, Number(level.toFixed(2)));
  return { ok: true, document: replaceMask(document, index, { ...mask, ...table }) };
}

export function removeMaskPoint(document: JsonObject, maskId: string, point: number): EditResult {
  const index = maskIndex(document, maskId);
  if (index < 0) return { ok: false, reason: `no limit mask "${maskId}"` };
  const mask = masksOf(document)[index]!;
  const table = columns(mask);
  if (table.frequencyHz.length <= 2) return { ok: false, reason: 'a mask needs at least two points' };
  if (point < 0 || point >= table.frequencyHz.length) return { ok: false, reason: `no point ${point + 1} in "${maskId}"` };
  table.frequencyHz.splice(point, 1);
  table.levelDbuV.splice(point, 1);
  return { ok: true, document: replaceMask(document, index, { ...mask, ...table }) };
}

/** The mask as written in the document, for export. */
export function maskDocument(document: JsonObject, maskId: string): JsonObject | undefined {
  const found = getAt(document, ['emissions', 'masks', maskIndex(document, maskId)]);
  return isJsonObject(found) ? found : undefined;
}
