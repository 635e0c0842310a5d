'use client';
import { useEffect, useState } from 'react';
import { useWorkspaceApi } from '../contract';
import { clearDraft, findOlderDraft, readDraft, writeDraft } from '../draft';
import { sameDocument } from '../store';

/** Draft autosave delay after the last edit (ms). */
const AUTOSAVE_MS = 400;

export type DraftNotice = { kind: 'restored' | 'older'; savedAt: string; fromVersion: number } | null;

/**
 * Restores this cell's draft on first mount (with a notice), offers a draft left behind on an
 * older version, and autosaves the document while it differs from the saved version.
 */
export function useAutosavedDraft(): { notice: DraftNotice; dismiss: () => void; discard: () => void; restoreOlder: () => void } {
  const api = useWorkspaceApi();
  const [notice, setNotice] = useState<DraftNotice>(null);

  useEffect(() => {
    const storage = window.localStorage;
    const { cellId, version, document, editDocument } = api.getState();
    const draft = readDraft(storage, cellId, version);
    let initial: DraftNotice = null;
    if (draft && !sameDocument(draft.document, document)) {
      editDocument(draft.document, 'Restore draft');
      initial = { kind: 'restored', savedAt: draft.savedAt, fromVersion: version };
    } else {
      const older = findOlderDraft(storage, cellId, version);
      if (older) initial = { kind: 'older', savedAt: older.draft.savedAt, fromVersion: older.version };
    }
    // Shown once, from what storage held when the page opened.
    // eslint-disable-next-line react-hooks/set-state-in-effect
    if (initial) setNotice(initial);

    let timer: ReturnType<typeof setTimeout> | null = null;
    const unsubscribe = api.subscribe((s, prev) => {
      if (s.document === prev.document && s.dirty === prev.dirty && s.version === prev.version) return;
      if (timer) clearTimeout(timer);
      timer = setTimeout(() => {
        const now = api.getState();
        if (now.dirty) writeDraft(storage, now.cellId, now.version, now.document);
        else clearDraft(storage, now.cellId, now.version);
      }, AUTOSAVE_MS);
    });
    return () => {
      unsubscribe();
      if (timer) clearTimeout(timer);
    };
  }, [api]);

  return {
    notice,
    dismiss: () => setNotice(null),
    discard: () => {
      const { cellId, version, savedDocument, editDocument } = api.getState();
      if (notice?.kind === 'restored') editDocument(savedDocument, 'Discard draft');
      clearDraft(window.localStorage, cellId, notice?.fromVersion ?? version);
      setNotice(null);
    },
    restoreOlder: () => {
      const { cellId, version, editDocument } = api.getState();
      const older = findOlderDraft(window.localStorage, cellId, version);
      if (older) {
        editDocument(older.draft.document, `Restore draft of version ${older.version}`);
        clearDraft(window.localStorage, cellId, older.version);
      }
      setNotice(null);
    },
  };
}
