'use client';
/**
 * The workspace as a run shows it (a drill attempt, a trainer's preview, free practice): the
 * same areas as the cell workspace, each editable or read-only as the run allows, without the
 * save controls (a run never changes the saved cell).
 */
import { useMemo, useState, type ReactNode } from 'react';
import type { StoreApi } from 'zustand/vanilla';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { ForceBanner } from '@/components/monitor/force-banner';
import { ScopeRecorderProvider } from '@/components/scope/scope-context';
import { AreaBody } from '@/components/workspace/shell/area-slots';
import { StatusStrip } from '@/components/workspace/status-strip';
import { WorkspaceStoreContext, useWorkspace, useWorkspaceApi, type WorkspaceInit, type WorkspaceStore, type WorkspaceStoreApi } from '@/components/workspace/contract';
import { WorkspaceProvider } from '@/components/workspace/workspace-provider';
import type { EngineFactory } from '@/components/workspace/store';
import { DownloadButton } from '@/components/workspace/download-button';
import { AreaTabs, type AreaId } from '@/components/workspace/area-tabs';
import type { DownloadArea } from '@/components/workspace/download';

export type RunAreaId = AreaId;

/** Which areas may change the cell; the panel is always operable. */
export type AreaEditing = Partial<Record<RunAreaId, boolean>>;

/**
 * The same store seen with a different `canEdit`: areas decide editability from it, so one
 * workspace can have a read-only logic sheet beside an editable point map. State objects are
 * cached per store state so selectors see stable references.
 */
function withCanEdit(api: WorkspaceStoreApi, canEdit: boolean): WorkspaceStoreApi {
  const cache = new WeakMap<WorkspaceStore, WorkspaceStore>();
  const view = (s: WorkspaceStore): WorkspaceStore => {
    if (s.canEdit === canEdit) return s;
    let v = cache.get(s);
    if (!v) {
      v = { ...s, canEdit };
      cache.set(s, v);
    }
    return v;
  };
  const derived: StoreApi<WorkspaceStore> = {
    getState: () => view(api.getState()),
    getInitialState: () => view(api.getInitialState()),
    setState: api.setState,
    subscribe: (listener) => api.subscribe((s, prev) => listener(view(s), view(prev))),
  };
  return derived;
}

function AreaScope({ canEdit, children }: { canEdit: boolean; children: ReactNode }) {
  const api = useWorkspaceApi();
  const derived = useMemo(() => withCanEdit(api, canEdit), [api, canEdit]);
  return <WorkspaceStoreContext.Provider value={derived}>{children}</WorkspaceStoreContext.Provider>;
}

export type RunWorkspaceProps = {
  init: WorkspaceInit;
  engineFactory?: EngineFactory;
  editing: AreaEditing;
  forceAllowed: boolean;
  /** Replaces the standard run strip (a drill attempt has its own: ×1 only, timer, saving). */
  strip?: ReactNode;
  /** Shown above the areas (brief, timer, submit). */
  header?: ReactNode;
  /** Rendered inside the provider (recorders, fault injection). */
  children?: ReactNode;
  /**
   * Parts the run may download into its running cell ("Send to cell" in the Logic, Field
   * and Controller areas while they are editable); none by default.
   */
  downloadable?: readonly DownloadArea[];
};

/** Which downloadable part each area edits. */
const AREA_DOWNLOADS: Partial<Record<RunAreaId, DownloadArea>> = { logic: 'logic', field: 'wiring', controller: 'routine' };

/** A run's workspace: provider, areas with per-area editing, force shown only when allowed. */
export function RunWorkspace({ init, engineFactory, editing, forceAllowed, strip, header, children, downloadable = [] }: RunWorkspaceProps) {
  return (
    <WorkspaceProvider init={{ ...init, forceAllowed }} engineFactory={engineFactory}>
      <ScopeRecorderProvider>
        {children}
        {header}
        <RunAreas editing={editing} forceAllowed={forceAllowed} strip={strip} downloadable={downloadable} />
      </ScopeRecorderProvider>
    </WorkspaceProvider>
  );
}

function RunAreas({ editing, forceAllowed, strip, downloadable }: { editing: AreaEditing; forceAllowed: boolean; strip?: ReactNode; downloadable: readonly DownloadArea[] }) {
  const [area, setArea] = useState<RunAreaId>('panel');
  const part = AREA_DOWNLOADS[area];
  const areaDownloads = useMemo(() => (part && editing[area] && downloadable.includes(part) ? [part] : []), [part, area, editing, downloadable]);
  const rejection = useWorkspace((s) => s.engine.lastRejection);
  const status = useWorkspace((s) => s.engine.status);
  const problems = useWorkspace((s) => s.engine.problems);


  return (
    <div className="space-y-3" data-testid="workspace">
      {forceAllowed ? <ForceBanner /> : null}
      {strip ?? <StatusStrip />}
      <SafetyCaution compact />
      {status === 'crashed' || status === 'invalid' ? (
        <p role="alert" className="rounded-md border border-red-300 bg-red-50 px-3 py-2 text-sm text-red-800" data-testid="engine-problems">
          {problems.map((p) => p.message).join('; ') || 'The cell does not run.'}
        </p>
      ) : null}
      {rejection ? (
        <p role="status" className="rounded-md border border-amber-300 bg-amber-50 px-3 py-1.5 text-xs text-amber-900" data-testid="event-refused">
          Refused “{rejection.event.type}”: {rejection.problems.map((p) => p.message).join('; ')}
        </p>
      ) : null}
      <AreaTabs
        area={area}
        onSelect={setArea}
        badge={(id) => (id !== 'panel' && id !== 'monitor' && id !== 'scope' && !editing[id] ? <span className="text-[10px] font-normal text-slate-600">read-only</span> : null)}
      />
      <div
        role="tabpanel"
        id={`area-${area}`}
        aria-labelledby={`tab-${area}`}
        className="min-h-[420px]"
        data-testid={`area-${area}`}
        data-force-allowed={forceAllowed}
      >
        {areaDownloads.length > 0 ? <DownloadButton areas={areaDownloads} /> : null}
        <AreaScope canEdit={Boolean(editing[area])}>
          <AreaBody area={area} />
        </AreaScope>
      </div>
    </div>
  );
}
