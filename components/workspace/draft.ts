/**
 * Autosaved drafts: the unsaved document of a cell, kept in the browser's storage per cell and
 * per base version, so a reload (or a crash) loses nothing. A draft for an older base version
 * stays under its own key and is never applied over a newer version by accident.
 */
import { cellDocumentSchema, upgradeCellDocument, type CellDocument } from '@/simulator';

/** Key prefix in localStorage. */
export const DRAFT_PREFIX = 'cellwright:draft:';

export type Draft = { document: CellDocument; savedAt: string };

/** The storage key of a cell's draft based on `version`. */
export function draftKey(cellId: string, version: number): string {
  return `${DRAFT_PREFIX}${cellId}:v${version}`;
}

/** Stores the draft (quietly does nothing when storage is full or unavailable). */
export function writeDraft(storage: Storage, cellId: string, version: number, document: CellDocument, now = new Date()): void {
  try {
    storage.setItem(draftKey(cellId, version), JSON.stringify({ document, savedAt: now.toISOString() } satisfies Draft));
  } catch {
    // Storage full or blocked (private mode): the draft is a convenience, the editor keeps working.
  }
}

/** Reads a draft; a corrupt or schema-invalid draft is removed and reads as none. */
export function readDraft(storage: Storage, cellId: string, version: number): Draft | null {
  const key = draftKey(cellId, version);
  let raw: string | null = null;
  try {
    raw = storage.getItem(key);
  } catch {
    return null;
  }
  if (!raw) return null;
  try {
    const parsed = JSON.parse(raw) as { document?: unknown; savedAt?: unknown };
    // A draft kept from before a schema change still restores.
    const doc = cellDocumentSchema.safeParse(upgradeCellDocument(parsed.document));
    if (!doc.success || typeof parsed.savedAt !== 'string') throw new Error('invalid draft');
    return { document: doc.data, savedAt: parsed.savedAt };
  } catch {
    storage.removeItem(key);
    return null;
  }
}

/** Removes a draft (after a save, or when the user discards it). */
export function clearDraft(storage: Storage, cellId: string, version: number): void {
  try {
    storage.removeItem(draftKey(cellId, version));
  } catch {
    // Nothing to clean when storage is unavailable.
  }
}

/** The newest draft of this cell based on a version older than `version` (left behind by "reload latest"), if any. */
export function findOlderDraft(storage: Storage, cellId: string, version: number): { version: number; draft: Draft } | null {
  const prefix = `${DRAFT_PREFIX}${cellId}:v`;
  let best: number | null = null;
  try {
    for (let i = 0; i < storage.length; i++) {
      const key = storage.key(i);
      if (!key?.startsWith(prefix)) continue;
      const v = Number(key.slice(prefix.length));
      if (Number.isInteger(v) && v < version && (best === null || v > best)) best = v;
    }
  } catch {
    return null;
  }
  if (best === null) return null;
  const draft = readDraft(storage, cellId, best);
  return draft ? { version: best, draft } : null;
}
