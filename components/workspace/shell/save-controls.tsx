'use client';
import { useEffect, useRef, useState } from 'react';
import { useRouter } from 'next/navigation';
import { Redo2, Save, Undo2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import type { CellDocument } from '@/simulator';
import { useWorkspace, useWorkspaceApi } from '../contract';
import { clearDraft } from '../draft';

type Conflict = { latestVersion: number | null; message: string };

/** Undo / redo, and Save with a message; a stale save opens the conflict dialog. */
export function SaveControls({ cellName }: { cellName: string }) {
  const api = useWorkspaceApi();
  const router = useRouter();
  const dirty = useWorkspace((s) => s.dirty);
  const canEdit = useWorkspace((s) => s.canEdit);
  const version = useWorkspace((s) => s.version);
  const undoLabel = useWorkspace((s) => s.past.at(-1)?.label);
  const redoLabel = useWorkspace((s) => s.future.at(-1)?.label);
  const undo = useWorkspace((s) => s.undo);
  const redo = useWorkspace((s) => s.redo);
  const [asking, setAsking] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [savedNote, setSavedNote] = useState<string | null>(null);

  const save = async (message: string) => {
    const { cellId, document, version: baseVersion } = api.getState();
    setBusy(true);
    setError(null);
    try {
      const res = await fetch(`/api/cells/${cellId}/versions`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ baseVersion, document, message }),
        credentials: 'same-origin',
      });
      const body = (await res.json().catch(() => ({}))) as { version?: { version: number }; error?: string; latestVersion?: number };
      if (res.status === 201 && body.version) {
        clearDraft(window.localStorage, cellId, baseVersion);
        api.getState().markSaved(body.version.version);
        setAsking(false);
        setSavedNote(`Saved as version ${body.version.version}.`);
        router.refresh();
      } else if (res.status === 409) {
        setAsking(false);
        setConflict({ latestVersion: body.latestVersion ?? null, message: body.error ?? 'Someone saved a newer version.' });
      } else {
        setError(body.error ?? `Save failed (${res.status}).`);
      }
    } catch {
      setError('Save failed: the server did not answer. Your work is kept in this browser as a draft.');
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="flex flex-wrap items-center gap-2">
      <Button variant="secondary" onClick={undo} disabled={!undoLabel} title={undoLabel ? `Undo: ${undoLabel} (Ctrl+Z)` : 'Nothing to undo'} aria-label={undoLabel ? `Undo ${undoLabel}` : 'Undo'}>
        <Undo2 aria-hidden className="h-4 w-4" /> Undo
      </Button>
      <Button variant="secondary" onClick={redo} disabled={!redoLabel} title={redoLabel ? `Redo: ${redoLabel} (Ctrl+Shift+Z)` : 'Nothing to redo'} aria-label={redoLabel ? `Redo ${redoLabel}` : 'Redo'}>
        <Redo2 aria-hidden className="h-4 w-4" /> Redo
      </Button>
      <span className="text-xs text-slate-600" data-testid="version-label">
        version {version}
        {dirty ? <strong className="ml-1 text-slate-900">· unsaved changes</strong> : null}
      </span>
      {canEdit ? (
        <Button onClick={() => (setSavedNote(null), setAsking(true))} disabled={busy}>
          <Save aria-hidden className="h-4 w-4" /> Save
        </Button>
      ) : (
        <span className="text-xs text-slate-600">Shared with your cohort: open your own copy from the cells list to save changes.</span>
      )}
      {savedNote ? (
        <span role="status" className="text-xs text-accent-800">
          {savedNote}
        </span>
      ) : null}
      {asking ? <SaveDialog busy={busy} error={error} onCancel={() => setAsking(false)} onSave={save} /> : null}
      {conflict ? <ConflictDialog conflict={conflict} cellName={cellName} onClose={() => setConflict(null)} onNavigate={(href) => router.push(href)} /> : null}
    </div>
  );
}

function SaveDialog({ busy, error, onCancel, onSave }: { busy: boolean; error: string | null; onCancel: () => void; onSave: (message: string) => void }) {
  const ref = useRef<HTMLDialogElement>(null);
  const [message, setMessage] = useState('');
  useEffect(() => {
    ref.current?.showModal();
  }, []);
  return (
    <dialog ref={ref} onCancel={onCancel} aria-labelledby="save-title" className="m-auto w-[min(28rem,90vw)] rounded-lg border border-slate-300 p-0 shadow-xl backdrop:bg-slate-900/40">
      <form
        method="dialog"
        className="space-y-3 p-5"
        onSubmit={(e) => {
          e.preventDefault();
          onSave(message);
        }}
      >
        <h2 id="save-title" className="text-base font-semibold text-slate-900">
          Save a new version
        </h2>
        <label className="block text-sm">
          <span className="font-medium text-slate-700">What changed?</span>
          <input autoFocus value={message} maxLength={500} onChange={(e) => setMessage(e.target.value)} className="mt-1 w-full rounded border border-slate-300 px-2 py-1.5" placeholder="e.g. guard now holds the robot" />
        </label>
        {error ? (
          <p role="alert" className="text-sm text-red-700">
            {error}
          </p>
        ) : null}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
          <Button type="submit" disabled={busy}>
            {busy ? 'Saving…' : 'Save version'}
          </Button>
        </div>
      </form>
    </dialog>
  );
}

/**
 * A save against a stale version: reload the latest (my edits stay in a draft under the old
 * base version) or keep my work as a new cell. Nothing is lost either way.
 */
function ConflictDialog({ conflict, cellName, onClose, onNavigate }: { conflict: Conflict; cellName: string; onClose: () => void; onNavigate: (href: string) => void }) {
  const api = useWorkspaceApi();
  const ref = useRef<HTMLDialogElement>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    ref.current?.showModal();
  }, []);

  const reload = async () => {
    const { cellId } = api.getState();
    setBusy(true);
    setError(null);
    try {
      const data = await fetchJson<{ version: { version: number; document: CellDocument } }>(`/api/cells/${cellId}`);
      // The draft under the old base version stays in storage until the user discards it.
      api.getState().markSaved(data.version.version, data.version.document, true);
      onClose();
    } catch (e) {
      setError(e instanceof ApiClientError ? e.message : 'Could not reload the latest version.');
    } finally {
      setBusy(false);
    }
  };

  const keepCopy = async () => {
    const { document, cellId, version } = api.getState();
    setBusy(true);
    setError(null);
    try {
      const name = `${cellName} (my copy)`.slice(0, 120);
      const data = await fetchJson<{ cell: { id: string } }>('/api/cells/import', { method: 'POST', body: { name, document } });
      clearDraft(window.localStorage, cellId, version);
      onNavigate(`/cells/${data.cell.id}`);
      onClose();
    } catch (e) {
      setError(e instanceof ApiClientError ? e.message : 'Could not save a copy. Your work is still here and in the draft.');
    } finally {
      setBusy(false);
    }
  };

  return (
    <dialog ref={ref} onCancel={onClose} aria-labelledby="conflict-title" data-testid="conflict-dialog" className="m-auto w-[min(32rem,92vw)] rounded-lg border border-slate-300 p-0 shadow-xl backdrop:bg-slate-900/40">
      <div className="space-y-3 p-5">
        <h2 id="conflict-title" className="text-base font-semibold text-slate-900">
          A newer version was saved
        </h2>
        <p className="text-sm text-slate-700">{conflict.message}</p>
        <ul className="list-disc space-y-1 pl-5 text-sm text-slate-700">
          <li>
            <strong>Keep my work as a copy</strong>: saves your edited cell as a new cell of yours and opens it.
          </li>
          <li>
            <strong>Reload latest</strong>: shows version {conflict.latestVersion ?? 'latest'}; your edits stay in this browser as a draft of the older version.
          </li>
        </ul>
        {error ? (
          <p role="alert" className="text-sm text-red-700">
            {error}
          </p>
        ) : null}
        <div className="flex flex-wrap justify-end gap-2">
          <Button variant="ghost" onClick={onClose} disabled={busy}>
            Not now
          </Button>
          <Button variant="secondary" onClick={reload} disabled={busy}>
            Reload latest
          </Button>
          <Button onClick={keepCopy} disabled={busy}>
            Keep my work as a copy
          </Button>
        </div>
      </div>
    </dialog>
  );
}
