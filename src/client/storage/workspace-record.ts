import { z } from 'zod';
import { DETECTORS } from '../../model/emissions-schema.ts';
import type { HistoryState } from '../../planner/history.ts';
import { asJson, isJsonObject, type JsonObject } from '../../planner/json.ts';
import { MAX_VARIANTS, type Variant, type Workspace } from '../../planner/workspace.ts';
import { SCAN_TAGS } from '../../spectrum/spectrum-types.ts';

/**
 * The saved form of a workspace and its undo history, as one record. Documents are shared between
 * the workspace and its history steps, so they are stored once each in a pool and referred to by
 * index. Reading a record back is validated like any file: a record another version wrote, or one
 * damaged on disk, is refused with a reason rather than half-read.
 */

export const RECORD_FORMAT = 'chokepoint-workspace';
export const RECORD_VERSION = 1;
/** Steps of history kept when saved (each way). */
export const SAVED_HISTORY_STEPS = 40;

const selectionSchema = z.union([z.strictObject({ kind: z.enum(['element', 'stage']), id: z.string().max(64) }), z.null()]);
const scanEntrySchema = z.strictObject({
  id: z.string().min(1).max(100),
  name: z.string().max(300),
  tag: z.enum(SCAN_TAGS),
  points: z.number().int().nonnegative(),
  detectors: z.array(z.enum(DETECTORS)).max(3),
  notes: z.array(z.string().max(2000)).max(200),
  warnings: z.array(z.string().max(2000)).max(200).default([]),
  rejectedLines: z.number().int().nonnegative(),
  invented: z.boolean(),
});
const variantSchema = z.strictObject({
  id: z.string().min(1).max(20),
  document: z.number().int().nonnegative(),
  validDocument: z.number().int().nonnegative().nullable(),
  origin: z.enum(['demo', 'file', 'link', 'copy', 'new']),
});
const packedWorkspaceSchema = z.strictObject({
  variants: z.array(variantSchema).min(1).max(MAX_VARIANTS),
  activeId: z.string(),
  overlayIds: z.array(z.string()).max(4),
  selection: selectionSchema,
  scans: z.array(scanEntrySchema).max(32),
  noise: z.union([z.strictObject({ kind: z.literal('estimate') }), z.strictObject({ kind: z.literal('scan'), scanId: z.string() })]),
  nextVariantNumber: z.number().int().positive(),
});
const packedStepSchema = z.strictObject({ label: z.string().max(300), workspace: packedWorkspaceSchema });

export const workspaceRecordSchema = z.strictObject({
  format: z.literal(RECORD_FORMAT),
  version: z.literal(RECORD_VERSION),
  /** Rises with every save; two tabs compare it to see whether the other wrote in between. */
  revision: z.number().int().nonnegative(),
  /** Which tab wrote it. */
  writer: z.string().max(100),
  savedAt: z.number(),
  documents: z.array(z.unknown()).max(5000),
  workspace: packedWorkspaceSchema,
  past: z.array(packedStepSchema).max(SAVED_HISTORY_STEPS),
  future: z.array(packedStepSchema).max(SAVED_HISTORY_STEPS),
});

export type WorkspaceRecord = z.output<typeof workspaceRecordSchema>;
type PackedWorkspace = z.output<typeof packedWorkspaceSchema>;

class DocumentPool {
  readonly documents: JsonObject[] = [];
  private readonly index = new Map<JsonObject, number>();

  add(document: JsonObject): number {
    const known = this.index.get(document);
    if (known !== undefined) return known;
    this.documents.push(document);
    this.index.set(document, this.documents.length - 1);
    return this.documents.length - 1;
  }
}

function pack(workspace: Workspace, pool: DocumentPool): PackedWorkspace {
  return {
    variants: workspace.variants.map((v) => ({ id: v.id, document: pool.add(v.document), validDocument: v.validDocument ? pool.add(v.validDocument) : null, origin: v.origin })),
    activeId: workspace.activeId,
    overlayIds: [...workspace.overlayIds],
    selection: workspace.selection ?? null,
    scans: workspace.scans.map((s) => ({ ...s, detectors: [...s.detectors], notes: [...s.notes], warnings: [...s.warnings] })),
    noise: workspace.noise,
    nextVariantNumber: workspace.nextVariantNumber,
  };
}

/** The record for a workspace and (the recent part of) its history. */
export function packRecord(workspace: Workspace, history: HistoryState, meta: { revision: number; writer: string; savedAt: number }): WorkspaceRecord {
  const pool = new DocumentPool();
  const packed = pack(workspace, pool);
  const steps = (entries: HistoryState['past']) => entries.slice(-SAVED_HISTORY_STEPS).map((entry) => ({ label: entry.label, workspace: pack(entry.workspace, pool) }));
  const past = steps(history.past);
  const future = steps(history.future);
  return { format: RECORD_FORMAT, version: RECORD_VERSION, ...meta, documents: pool.documents, workspace: packed, past, future };
}

export type UnpackResult = { readonly ok: true; readonly workspace: Workspace; readonly history: HistoryState; readonly record: WorkspaceRecord } | { readonly ok: false; readonly reason: string };

/** Read a stored value back, checking everything a later step relies on. */
export function unpackRecord(value: unknown): UnpackResult {
  const parsed = workspaceRecordSchema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    return { ok: false, reason: `the saved work is not in a form this program reads (${issue.path.join('.') || 'the record'}: ${issue.message})` };
  }
  const record = parsed.data;
  const documents: JsonObject[] = [];
  for (let i = 0; i < record.documents.length; i += 1) {
    const checked = asJson(record.documents[i]);
    if (!checked.ok || !isJsonObject(checked.value)) return { ok: false, reason: `saved design ${i} is not a JSON object (${checked.ok ? 'a list or value' : checked.where})` };
    documents.push(checked.value);
  }
  const document = (index: number): JsonObject | undefined => documents[index];
  const unpack = (packed: PackedWorkspace): Workspace | string => {
    const variants: Variant[] = [];
    for (const v of packed.variants) {
      const doc = document(v.document);
      const valid = v.validDocument === null ? undefined : document(v.validDocument);
      if (!doc || (v.validDocument !== null && !valid)) return `variant ${v.id} refers to a design that is not saved`;
      variants.push({ id: v.id, document: doc, validDocument: valid, origin: v.origin });
    }
    if (!variants.some((v) => v.id === packed.activeId)) return `the edited variant ${packed.activeId} is not among the saved ones`;
    if (new Set(variants.map((v) => v.id)).size !== variants.length) return 'two saved variants share an id';
    return {
      variants,
      activeId: packed.activeId,
      overlayIds: packed.overlayIds.filter((id) => id !== packed.activeId && variants.some((v) => v.id === id)),
      selection: packed.selection ?? undefined,
      scans: packed.scans,
      noise: packed.noise.kind === 'scan' && !packed.scans.some((s) => s.id === (packed.noise as { scanId: string }).scanId) ? { kind: 'estimate' } : packed.noise,
      nextVariantNumber: packed.nextVariantNumber,
    };
  };
  const workspace = unpack(record.workspace);
  if (typeof workspace === 'string') return { ok: false, reason: workspace };
  const steps = (list: WorkspaceRecord['past']) => {
    const out: { label: string; workspace: Workspace }[] = [];
    for (const step of list) {
      const w = unpack(step.workspace);
      if (typeof w === 'string') return w;
      out.push({ label: step.label, workspace: w });
    }
    return out;
  };
  const past = steps(record.past);
  const future = steps(record.future);
  if (typeof past === 'string' || typeof future === 'string') return { ok: false, reason: `the saved history is damaged (${typeof past === 'string' ? past : future})` };
  return { ok: true, workspace, history: { past, future }, record };
}
