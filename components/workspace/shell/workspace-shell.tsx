'use client';
import { useEffect, useState } from 'react';
import { Pencil, Radio } from 'lucide-react';
import { cn } from '@/components/ui/cn';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { ForceBanner } from '@/components/monitor/force-banner';
import { ScopeRecorderProvider } from '@/components/scope/scope-context';
import { useWorkspace, useWorkspaceApi, type WorkspaceInit } from '../contract';
import { WorkspaceProvider } from '../workspace-provider';
import { StatusStrip } from '../status-strip';
import { SaveControls } from './save-controls';
import { useAutosavedDraft } from './use-autosaved-draft';
import { AreaBody } from './area-slots';
import { AreaTabs, type AreaId } from '../area-tabs';

/** The client island of the workspace page: one store, one engine worker, six areas. */
export function Workspace({ init, cellName }: { init: WorkspaceInit; cellName: string }) {
  return (
    <WorkspaceProvider init={init}>
      <ScopeRecorderProvider>
        <WorkspaceBody cellName={cellName} />
      </ScopeRecorderProvider>
    </WorkspaceProvider>
  );
}

function WorkspaceBody({ cellName }: { cellName: string }) {
  const api = useWorkspaceApi();
  const [area, setArea] = useState<AreaId>('panel');
  const editMode = useWorkspace((s) => s.editMode);
  const canEdit = useWorkspace((s) => s.canEdit);
  const setEditMode = useWorkspace((s) => s.setEditMode);
  const engineStatus = useWorkspace((s) => s.engine.status);
  const problemCount = useWorkspace((s) => s.engine.problems.length);
  const rejection = useWorkspace((s) => s.engine.lastRejection);
  const draft = useAutosavedDraft();

  // Ctrl/Cmd+Z undo, Ctrl/Cmd+Shift+Z or Ctrl+Y redo — except inside text fields, which keep their own undo.
  useEffect(() => {
    const onKey = (e: globalThis.KeyboardEvent) => {
      if (!(e.ctrlKey || e.metaKey)) return;
      const t = e.target as HTMLElement | null;
      if (t && (t.tagName === 'INPUT' || t.tagName === 'TEXTAREA' || t.tagName === 'SELECT' || t.isContentEditable)) return;
      const key = e.key.toLowerCase();
      if (key === 'z' && !e.shiftKey) {
        e.preventDefault();
        api.getState().undo();
      } else if ((key === 'z' && e.shiftKey) || key === 'y') {
        e.preventDefault();
        api.getState().redo();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [api]);


  return (
    <div className="min-w-0 max-w-full space-y-3" data-testid="workspace">
      <header className="flex flex-wrap items-center justify-between gap-3">
        <div className="min-w-0">
          <h1 className="text-xl font-semibold text-slate-900">{cellName}</h1>
          <p className="text-xs text-slate-600">
            {canEdit ? 'Your cell' : 'Shared with your cohort (run only)'} · edits apply to the running cell at once and restart its clock
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          {canEdit ? (
            <button
              type="button"
              aria-pressed={editMode}
              onClick={() => setEditMode(!editMode)}
              className={cn(
                'inline-flex items-center gap-1.5 rounded-md border px-3 py-2 text-sm font-medium',
                editMode ? 'border-accent-700 bg-accent-50 text-accent-900 ring-2 ring-accent-600' : 'border-slate-300 bg-white text-slate-800 hover:bg-slate-100',
              )}
            >
              <Pencil aria-hidden className="h-4 w-4" /> {editMode ? 'Editing layout' : 'Edit layout'}
            </button>
          ) : null}
          <SaveControls cellName={cellName} />
        </div>
      </header>

      {draft.notice ? (
        <div role="status" data-testid="draft-notice" className="flex flex-wrap items-center gap-3 rounded-md border border-accent-300 bg-accent-50 px-3 py-2 text-sm text-accent-950">
          {draft.notice.kind === 'restored' ? (
            <span>Restored your unsaved draft from {new Date(draft.notice.savedAt).toLocaleString()}.</span>
          ) : (
            <span>
              You have an unsaved draft based on version {draft.notice.fromVersion} (from {new Date(draft.notice.savedAt).toLocaleString()}).
            </span>
          )}
          {draft.notice.kind === 'older' ? (
            <button type="button" onClick={draft.restoreOlder} className="rounded border border-accent-600 bg-white px-2 py-0.5 text-xs font-medium">
              Apply it here
            </button>
          ) : (
            <button type="button" onClick={draft.dismiss} className="rounded border border-accent-600 bg-white px-2 py-0.5 text-xs font-medium">
              Keep it
            </button>
          )}
          <button type="button" onClick={draft.discard} className="rounded border border-slate-300 bg-white px-2 py-0.5 text-xs">
            Discard draft
          </button>
        </div>
      ) : null}

      <ForceBanner />
      <StatusStrip />
      <SafetyCaution compact />

      {engineStatus === 'invalid' || engineStatus === 'crashed' ? (
        <p role="alert" className="rounded-md border border-red-300 bg-red-50 px-3 py-2 text-sm text-red-800" data-testid="engine-problems">
          {engineStatus === 'crashed' ? 'The engine stopped: ' : `The cell does not load (${problemCount} ${problemCount === 1 ? 'problem' : 'problems'}); `}
          see the marks in the Field and Logic areas, or undo the last edit.
        </p>
      ) : null}
      {rejection ? (
        <p role="status" className="rounded-md border border-amber-300 bg-amber-50 px-3 py-1.5 text-xs text-amber-900">
          The cell refused “{rejection.event.type}”: {rejection.problems.map((p) => p.message).join('; ')}
        </p>
      ) : null}

      <AreaTabs
        area={area}
        onSelect={setArea}
        trailing={
          <span className="ml-auto flex items-center gap-1 self-center text-xs text-slate-600">
            <Radio aria-hidden className="h-3.5 w-3.5" /> live
          </span>
        }
      />

      {/* The area scrolls inside itself on a narrow screen; the toolbars above wrap instead. */}
      <div role="tabpanel" id={`area-${area}`} aria-labelledby={`tab-${area}`} className="min-h-[420px] min-w-0 overflow-x-auto" data-testid={`area-${area}`}>
        <AreaBody area={area} />
      </div>
    </div>
  );
}
