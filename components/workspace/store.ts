/**
 * The workspace store factory (see contract.ts for the shape and how areas use it).
 * Engine-agnostic: the store talks to the engine through an `EngineConnection`, so unit tests
 * run it without a Web Worker and the worker stays replaceable.
 */
import { createStore } from 'zustand/vanilla';
import { validatePointMap, type CellDocument, type DownloadEvent, type PointMapRow, type Problem } from '@/simulator';
import type { TraceChunk } from './engine-protocol';
import { afterDownload, downloadEvent, revertRefused, type DownloadInFlight } from './download';
import type { EngineConnection, EngineFactory, EngineState, HistoryEntry, WorkspaceInit, WorkspaceStore, WorkspaceStoreApi } from './contract';

/** The engine side of the store (defined with the rest of its shape in contract.ts). */
export type { EngineConnection, EngineFactory, EngineSink } from './contract';

/** Undo depth; older steps fall off (a document is small, but hours of editing add up). */
export const HISTORY_LIMIT = 100;

/** Why a force/unforce was refused in a workspace that does not allow forcing. */
export const FORCE_NOT_ALLOWED = 'Forcing is not allowed in this drill.';

const INITIAL_ENGINE: EngineState = {
  status: 'loading',
  running: false,
  speed: 1,
  problems: [],
  warnings: [],
  lastRejection: null,
  signalNames: [],
  eventCount: 0,
};

/** Structural equality of two JSON documents (cheap enough for a cell document per edit). */
export function sameDocument(a: CellDocument, b: CellDocument): boolean {
  return a === b || JSON.stringify(a) === JSON.stringify(b);
}

/** The point map the controller runs now: the engine's live map, or the document's before the first snapshot. */
export function runningPointMap(state: Pick<WorkspaceStore, 'snapshot' | 'document'>): readonly PointMapRow[] {
  return state.snapshot?.controller.pointMap ?? state.document.controller.pointMap;
}

/**
 * Creates one workspace store. `engineFactory` is optional: the provider attaches the worker in
 * an effect (so React's mount/unmount/mount in development leaves exactly one worker), tests
 * pass a fake here, and without any engine the run controls are no-ops.
 */
export function createWorkspaceStore(init: WorkspaceInit, engineFactory?: EngineFactory): WorkspaceStoreApi {
  let engine: EngineConnection | null = null;
  const traceListeners = new Set<(chunk: TraceChunk) => void>();
  // Downloads sent and not yet answered, oldest first: a refusal puts what they carried back to "not sent".
  let inFlight: DownloadInFlight[] = [];
  const editsWait = init.editsWaitForDownload === true;

  const store = createStore<WorkspaceStore>()((set, get) => {
    /**
     * Hands `document` to the engine: an edit reloads the cell at time 0 unless this run's
     * edits wait for a download; `restart` always reloads (the "Restart run" control).
     */
    const applyDocument = (document: CellDocument, reload: boolean, restart = false) => {
      if (reload && editsWait && !restart) return;
      if (reload && !engine?.keepsRunOnEdit) {
        inFlight = [];
        set({ engineDocument: document, downloadRefusal: null });
      }
      if (reload) {
        set({ engine: { ...get().engine, status: 'loading', problems: [], lastRejection: null } });
        engine?.load(document);
      }
    };
    const findInFlight = (event: DownloadEvent) => {
      // The worker answers with a structured clone, a server-side run with the very object: match either way.
      const byIdentity = inFlight.findIndex((f) => f.event === event);
      if (byIdentity >= 0) return byIdentity;
      const key = JSON.stringify(event);
      return inFlight.findIndex((f) => f.key === key);
    };
    const downloadRefused = (event: DownloadEvent, problems: Problem[]) => {
      const i = findInFlight(event);
      if (i < 0) {
        set({ downloadRefusal: { event, problems } });
        return;
      }
      const next = revertRefused(get().engineDocument, inFlight, i);
      inFlight = next.inFlight;
      set({ engineDocument: next.engineDocument, downloadRefusal: { event, problems } });
    };
    const pushHistory = (stack: HistoryEntry[], entry: HistoryEntry) => {
      const next = [...stack, entry];
      return next.length > HISTORY_LIMIT ? next.slice(next.length - HISTORY_LIMIT) : next;
    };

    return {
      cellId: init.cellId,
      version: init.version,
      canEdit: init.canEdit,
      forceAllowed: init.forceAllowed ?? true,
      document: init.document,
      savedDocument: init.document,
      engineDocument: init.document,
      downloadRefusal: null,
      past: [],
      future: [],
      dirty: false,
      editMode: false,
      snapshot: null,
      engine: INITIAL_ENGINE,
      selection: null,

      editDocument(recipe, label, options) {
        const current = get().document;
        let next: CellDocument;
        if (typeof recipe === 'function') {
          const draft = structuredClone(current);
          next = recipe(draft) ?? draft;
        } else {
          next = recipe;
        }
        if (sameDocument(current, next)) return;
        set((s) => ({
          document: next,
          past: pushHistory(s.past, { label, document: current }),
          future: [],
          dirty: !sameDocument(next, s.savedDocument),
        }));
        applyDocument(next, options?.engine !== 'keep');
      },

      undo() {
        const { past, document } = get();
        const last = past.at(-1);
        if (!last) return;
        set((s) => ({
          document: last.document,
          past: s.past.slice(0, -1),
          future: [...s.future, { label: last.label, document }],
          dirty: !sameDocument(last.document, s.savedDocument),
        }));
        applyDocument(last.document, true);
      },

      redo() {
        const { future, document } = get();
        const last = future.at(-1);
        if (!last) return;
        set((s) => ({
          document: last.document,
          future: s.future.slice(0, -1),
          past: pushHistory(s.past, { label: last.label, document }),
          dirty: !sameDocument(last.document, s.savedDocument),
        }));
        applyDocument(last.document, true);
      },

      markSaved(version, document, resetHistory) {
        const doc = document ?? get().document;
        const reload = document !== undefined && !sameDocument(document, get().document);
        set((s) => ({
          version,
          document: doc,
          savedDocument: doc,
          dirty: false,
          past: resetHistory ? [] : s.past,
          future: resetHistory ? [] : s.future,
        }));
        applyDocument(doc, reload);
      },

      setEditMode(on) {
        set({ editMode: on });
      },

      sendEvent(event) {
        // The UI hides force controls when forcing is forbidden; refusing here too keeps any other
        // sender (a keyboard shortcut, a future area) from recording an event the run's policy rejects.
        if ((event.type === 'force' || event.type === 'unforce') && !get().forceAllowed) {
          set((s) => ({ engine: { ...s.engine, lastRejection: { event, problems: [{ path: [], code: 'force_not_allowed', message: FORCE_NOT_ALLOWED }] } } }));
          return;
        }
        engine?.send(event);
      },
      downloadEdits(areas) {
        const { engineDocument, document } = get();
        const event = downloadEvent(engineDocument, document, areas);
        if (!event) return null;
        // Optimistic: the parts count as sent at once. A refusal (engine.lastRejection) puts them
        // back to what ran before, so the edits show as not yet sent and the button resends them.
        inFlight.push({ event, key: JSON.stringify(event), before: engineDocument });
        set({ engineDocument: afterDownload(engineDocument, event), downloadRefusal: null });
        get().sendEvent(event);
        return event;
      },
      replaceLogicSheet(sheet, label) {
        get().editDocument((d) => {
          d.plc.sheet = structuredClone(sheet);
        }, label);
        // A selected block the new sheet no longer has would leave the details panel pointing at nothing.
        const { selection } = get();
        if (selection?.kind === 'block' && !sheet.blocks.some((b) => b.id === selection.id)) set({ selection: null });
      },
      stagePointMap(rows, label) {
        const state = get();
        const unchanged = JSON.stringify(rows) === JSON.stringify(runningPointMap(state));
        // The run keeps its map: the engine only records the staged rows, and the document keeps them for saving.
        state.editDocument(
          (d) => {
            d.controller.staged = unchanged ? null : rows;
          },
          label,
          { engine: 'keep' },
        );
        if (unchanged) state.sendEvent({ type: 'discard-staged' });
        // The engine refuses to stage a map that clashes (docs/engine.md); such rows stay in the document only, and the reboot waits.
        else if (validatePointMap(rows, state.document.controller.modules, []).length === 0) state.sendEvent({ type: 'stage-point-map', rows });
      },
      discardStagedPointMap() {
        const state = get();
        if (state.document.controller.staged === null) return;
        state.editDocument(
          (d) => {
            d.controller.staged = null;
          },
          'Drop staged point-map changes',
          { engine: 'keep' },
        );
        state.sendEvent({ type: 'discard-staged' });
      },
      restartController() {
        const state = get();
        const staged = state.document.controller.staged;
        if (!staged) {
          state.sendEvent({ type: 'restart-controller' });
          return;
        }
        // Re-send the staged rows first so the engine applies exactly what the area shows.
        state.sendEvent({ type: 'stage-point-map', rows: staged });
        state.sendEvent({ type: 'restart-controller' });
        state.editDocument(
          (d) => {
            if (d.controller.staged) d.controller.pointMap = d.controller.staged;
            d.controller.staged = null;
          },
          'Reboot controller: staged point map in force',
          { engine: 'keep' },
        );
      },
      run(speed) {
        set((s) => ({ engine: { ...s.engine, running: true, speed } }));
        engine?.run(speed);
      },
      pause() {
        set((s) => ({ engine: { ...s.engine, running: false } }));
        engine?.pause();
      },
      stepScan() {
        set((s) => ({ engine: { ...s.engine, running: false } }));
        engine?.stepScan();
      },
      restartRun() {
        // Where edits wait for a download, a restart starts the run over from the document it
        // began with (what a recorded run's replay starts from); the edits stay pending.
        applyDocument(editsWait ? init.document : get().document, true, true);
      },
      getEventLog() {
        return engine ? engine.getEventLog() : Promise.resolve([]);
      },
      select(selection) {
        set({ selection });
      },
      subscribeTrace(listener) {
        traceListeners.add(listener);
        return () => void traceListeners.delete(listener);
      },
      receiveSnapshot(snapshot) {
        set({ snapshot });
      },
      patchEngine(patch) {
        // A document that does not load leaves no running cell: drop the old picture rather than show it as live.
        set((s) => ({ engine: { ...s.engine, ...patch }, ...(patch.status === 'invalid' ? { snapshot: null } : {}) }));
        const refused = patch.lastRejection?.event;
        if (refused?.type === 'download') downloadRefused(refused, patch.lastRejection!.problems);
      },
      eventAccepted(event) {
        if (event.type !== 'download') return;
        const i = findInFlight(event);
        if (i >= 0) inFlight = inFlight.filter((_, j) => j !== i);
      },
      attachEngine(factory) {
        engine?.dispose();
        const conn = factory({
          snapshot: (snap) => get().receiveSnapshot(snap),
          trace: (chunk) => traceListeners.forEach((l) => l(chunk)),
          patch: (p) => get().patchEngine(p),
          accepted: (e) => get().eventAccepted(e),
        });
        engine = conn;
        inFlight = [];
        const { running, speed } = get().engine;
        set({ snapshot: null, engine: { ...INITIAL_ENGINE, running, speed }, engineDocument: get().document, downloadRefusal: null });
        conn.load(get().document);
        if (running) conn.run(speed);
        return () => {
          conn.dispose();
          if (engine === conn) engine = null;
        };
      },
    };
  });

  if (engineFactory) store.getState().attachEngine(engineFactory);

  return store;
}
