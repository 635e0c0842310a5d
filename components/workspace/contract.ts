'use client';
/**
 * The workspace contract: how any area of the cell workspace (panel, field, logic,
 * controller, monitor, scope, and whatever comes later) reads the cell and drives it.
 *
 * Shape
 * -----
 * One zustand store per open cell, built by `createWorkspaceStore(initial, engine?)`
 * (components/workspace/store.ts) and handed down by `<WorkspaceProvider>`
 * (components/workspace/workspace-provider.tsx). There is no module-level store, so two
 * workspaces (or two tests) never share state (shared/STYLE.md).
 *
 * The store holds:
 * - `cellId`, `version`: the saved version the editable document is based on (the
 *   `baseVersion` of the next save),
 * - `document`: the editable cell document (simulator/schema/cell-document.ts),
 * - undo/redo history and a `dirty` flag (document differs from the saved version),
 * - `snapshot`: the live CellSnapshot from the engine worker, replaced at most once per
 *   animation frame,
 * - `engine`: run state (running/paused, speed, problems of an invalid document),
 * - `selection`: one selected device / block / point / address / wire id, shared by every
 *   area so they all highlight the same signal,
 * - `forceAllowed`: whether force/unforce may be sent (default true; a drill can forbid it).
 *   The monitor and the force banner hide their force controls when it is false, and
 *   `sendEvent` refuses force/unforce itself (reported in `engine.lastRejection`), so no area
 *   can slip one through.
 *
 * Reading
 * -------
 *   const doc = useWorkspace((s) => s.document);
 *   const state = useSnapshot((snap) => snap.controller.state);           // undefined until the first snapshot
 *   const pts = useSnapshot((snap) => snap.controller.points, shallowEqual);
 *
 * Selectors run on every store change (including every snapshot, ~60/s): return a primitive,
 * an existing object from the state, or pass an equality function (e.g. `shallowEqual`,
 * re-exported below) when building a new array/object, so components re-render only when
 * what they show changes.
 *
 * Editing
 * -------
 *   const edit = useEditDocument();
 *   edit((draft) => { draft.panel.push(button); }, 'Add push button');
 *   edit(nextDocument, 'Import');
 *
 * A recipe gets a deep copy of the current document: mutate it and return nothing, or return
 * a new document. Each call is one undo step named by `label`. After an edit the worker
 * reloads the cell from the new document at time 0 (deterministic: same document, same events,
 * same seed → same trace). Pass `{ engine: 'keep' }` when the running cell was already told
 * about the change by an event (e.g. a point-map edit sent as `stage-point-map`, which must
 * stay staged without resetting the run) — the document is updated for saving and undo, the
 * run continues untouched.
 *
 * In a run whose edits wait for "Send to cell" (`WorkspaceInit.editsWaitForDownload`: free
 * practice, a trainer's preview; a drill attempt's server-side cell always behaves so) no edit
 * (nor undo/redo) reloads the cell: `downloadEdits(areas)` sends the changed logic sheet,
 * wiring or routine as one `download` event and the run goes on. `engineDocument` is what the
 * engine runs; a refused download puts the parts back to what ran before (so they show as not
 * yet sent and the button resends them) and keeps the engine's problems in `downloadRefusal`.
 *
 * Driving the run
 * ---------------
 *   const send = useSendEvent();
 *   send({ type: 'press', device: 'start' });
 * Events go to the engine worker and are recorded in its event log (for replay and grading).
 * The result comes back asynchronously; a rejected event is reported in `engine.lastRejection`.
 *
 * Run controls: `run(1 | 10 | 'max')`, `pause()`, `stepScan()` (advance to the end of the next
 * PLC scan), `restartRun()` (reload the current document at time 0; where edits wait for a download, the
 * init document, leaving the edits to download).
 */
import { createContext, useContext } from 'react';
import { useStoreWithEqualityFn } from 'zustand/traditional';
import { shallow } from 'zustand/shallow';
import type { StoreApi } from 'zustand/vanilla';
import type { CellDocument, CellSnapshot, CellEvent, DownloadEvent, LoggedEvent, PointMapRow, Problem } from '@/simulator';
import type { DownloadArea } from './download';
import type { RunSpeed, TraceChunk } from './engine-protocol';

export type { CellDocument, CellSnapshot, CellEvent, LoggedEvent, Problem };

export type { RunSpeed };

/** What the store needs from an engine (the worker adapter in engine-connection.ts, or a fake). */
export type EngineConnection = {
  load(document: CellDocument): void;
  send(event: CellEvent): void;
  run(speed: RunSpeed): void;
  pause(): void;
  stepScan(): void;
  getEventLog(): Promise<LoggedEvent[]>;
  dispose(): void;
  /**
   * True when a reload cannot reach the running cell (a drill's cell runs on the server and
   * hears events only): edits then stay in the document until `downloadEdits` sends them.
   */
  keepsRunOnEdit?: boolean;
};

/** Where the engine pushes its results. */
export type EngineSink = {
  snapshot(snapshot: CellSnapshot): void;
  /** Exact signal changes; never coalesced (unlike snapshots), so no edge is lost. */
  trace(chunk: TraceChunk): void;
  patch(patch: Partial<EngineState>): void;
  /**
   * The engine took `event` (the worker applied it; a server-side run stored it). Optional for
   * connections that cannot tell; the store uses it to settle downloads still in flight.
   * A refusal is reported through `patch({ lastRejection })`.
   */
  accepted?(event: CellEvent): void;
};

/** Builds an engine connection for a store; receives the sink it reports into. */
export type EngineFactory = (sink: EngineSink) => EngineConnection;


/** What can be selected; the id is a device id, block id, point ref (`DI3`), PLC address (`%IX0.0`) or wiring row id. */
export type SelectionKind = 'device' | 'block' | 'point' | 'address' | 'wire';
export type Selection = { kind: SelectionKind; id: string } | null;

/** One entry of the undo or redo stack. */
export type HistoryEntry = { label: string; document: CellDocument };

/** How an edit affects the running cell. */
export type EditOptions = {
  /** 'reload' (default): the worker reloads the cell from the edited document at time 0. 'keep': the run continues. */
  engine?: 'reload' | 'keep';
};

/** A recipe: mutate the deep copy and return nothing, or return the next document. */
export type DocumentRecipe = (draft: CellDocument) => CellDocument | void;

/** Engine worker status as the UI sees it. */
export type EngineState = {
  /** 'loading' until the first snapshot; 'invalid' when the document does not load (see `problems`). */
  status: 'loading' | 'ready' | 'invalid' | 'crashed';
  running: boolean;
  speed: RunSpeed;
  /** Problems of the current document (createCell's validation), with paths into the document. */
  problems: Problem[];
  /** Warnings about a document that runs (IEC 60204-1 panel colours, the supply's tolerance), with paths. */
  warnings: Problem[];
  /** The last event the cell rejected, with why; null when the last event was accepted. */
  lastRejection: { event: CellEvent; problems: Problem[] } | null;
  /** Every signal name the cell exposes (scope and rule pickers). */
  signalNames: string[];
  /** How many events the current run has logged. */
  eventCount: number;
};

/** What the provider is created from: the page's props. */
export type WorkspaceInit = {
  cellId: string;
  /** Version number the document was read from. */
  version: number;
  document: CellDocument;
  /** False for a viewer who may run the cell but not save it. */
  canEdit: boolean;
  /** False when force/unforce is forbidden (a drill's permission); default true. */
  forceAllowed?: boolean;
  /**
   * True when edits must not restart the run: the document changes, the running cell keeps
   * going until `downloadEdits` sends the changed parts. "Restart run" reloads at time 0 from
   * this init document (where a recorded run's replay starts), leaving the edits to download.
   * Default false (the cell workspace reloads on every edit).
   */
  editsWaitForDownload?: boolean;
};

/** Store state. */
export type WorkspaceState = {
  cellId: string;
  version: number;
  canEdit: boolean;
  /** Whether force/unforce events may be sent; `sendEvent` refuses them when false. */
  forceAllowed: boolean;
  document: CellDocument;
  /** The document as last saved (or loaded); `dirty` compares against it. */
  savedDocument: CellDocument;
  /**
   * What the engine runs: the document of the last (re)load, with downloaded parts swapped in.
   * `downloadEdits` sends the logic/wiring/routine parts where `document` differs from it.
   */
  engineDocument: CellDocument;
  /**
   * The last download the engine refused and why (paths into the document); cleared by the next
   * download and by a reload. The refused parts count as not yet sent again.
   */
  downloadRefusal: { event: DownloadEvent; problems: Problem[] } | null;
  past: HistoryEntry[];
  future: HistoryEntry[];
  dirty: boolean;
  /** Panel/field editing mode (add, move, edit devices) versus operating mode. */
  editMode: boolean;
  snapshot: CellSnapshot | null;
  engine: EngineState;
  selection: Selection;
};

/** Store actions. */
export type WorkspaceActions = {
  /** Changes the document as one undo step named `label`. */
  editDocument(recipe: DocumentRecipe | CellDocument, label: string, options?: EditOptions): void;
  undo(): void;
  redo(): void;
  /** Replaces document and base version after a save or a reload; clears history when `resetHistory`. */
  markSaved(version: number, document?: CellDocument, resetHistory?: boolean): void;
  setEditMode(on: boolean): void;
  /** Sends an event to the engine worker (logged in the run's event log); force/unforce are refused when not allowed. */
  sendEvent(event: CellEvent): void;
  /**
   * "Send to cell": sends the edited parts among `areas` (logic sheet, wiring, routine) that
   * differ from `engineDocument` as one `download` event — the run goes on, nothing restarts
   * at time 0. Returns the event sent, or null when nothing among `areas` changed.
   */
  downloadEdits(areas: readonly DownloadArea[]): DownloadEvent | null;
  /**
   * Replaces the whole logic sheet (an imported file) as one undo step named `label`, through
   * `editDocument` like any sheet edit; drops a block selection the new sheet does not have.
   */
  replaceLogicSheet(sheet: CellDocument['plc']['sheet'], label: string): void;
  /**
   * Stages `rows` as the controller's next point map (one undo step named `label`): the document
   * keeps them for saving, the engine records them with `stage-point-map` (unless they clash, which
   * the engine would refuse), and the run keeps its map until `restartController`. Rows equal to
   * the running map drop the staged change instead.
   */
  stagePointMap(rows: PointMapRow[], label: string): void;
  /** Drops the staged point map (document and engine); the running map stays as it is. */
  discardStagedPointMap(): void;
  /** Reboots the robot controller; a staged point map goes in force with it (and becomes the document's map). */
  restartController(): void;
  run(speed: RunSpeed): void;
  pause(): void;
  /** Advances the cell to the end of the next PLC scan (paused). */
  stepScan(): void;
  /** Reloads the current document (or, where edits wait for a download, the init document) at time 0; keeps the run state. */
  restartRun(): void;
  /** The run's event log so far, from the worker. */
  getEventLog(): Promise<LoggedEvent[]>;
  select(selection: Selection): void;
  /** Exact changes of PLC addresses and controller points, as the engine traces them (the scope uses it). */
  subscribeTrace(listener: (chunk: TraceChunk) => void): () => void;
  /** Internal: the engine connection pushes into the store through these. */
  receiveSnapshot(snapshot: CellSnapshot): void;
  patchEngine(patch: Partial<EngineState>): void;
  /** Internal: the engine took `event` (settles a download in flight). */
  eventAccepted(event: CellEvent): void;
  /**
   * Internal: connects an engine (the provider does this with the Web Worker) and loads the
   * current document into it; returns the function that disconnects and stops it.
   */
  attachEngine(factory: EngineFactory): () => void;
};

export type WorkspaceStore = WorkspaceState & WorkspaceActions;
export type WorkspaceStoreApi = StoreApi<WorkspaceStore>;

/** The React context carrying this workspace's store; provided by `<WorkspaceProvider>`. */
export const WorkspaceStoreContext = createContext<WorkspaceStoreApi | null>(null);

/** Equality helper for selectors that build new arrays or objects. */
export const shallowEqual = shallow;

/** The store API of the nearest provider (for imperative reads: `api.getState()`). */
export function useWorkspaceApi(): WorkspaceStoreApi {
  const api = useContext(WorkspaceStoreContext);
  if (!api) throw new Error('useWorkspace* hooks need a <WorkspaceProvider> above them');
  return api;
}

/** Selects from the whole workspace store (state and actions). */
export function useWorkspace<T>(selector: (state: WorkspaceStore) => T, equality?: (a: T, b: T) => boolean): T {
  return useStoreWithEqualityFn(useWorkspaceApi(), selector, equality);
}

/** Selects from the live snapshot; `undefined` until the engine posts the first one. */
export function useSnapshot<T>(selector: (snapshot: CellSnapshot) => T, equality?: (a: T | undefined, b: T | undefined) => boolean): T | undefined {
  return useStoreWithEqualityFn(useWorkspaceApi(), (s) => (s.snapshot ? selector(s.snapshot) : undefined), equality);
}

/** The current editable document. */
export function useCellDocument(): CellDocument {
  return useWorkspace((s) => s.document);
}

/** `editDocument(recipe | next, label, options?)`. */
export function useEditDocument(): WorkspaceActions['editDocument'] {
  return useWorkspace((s) => s.editDocument);
}

/** `sendEvent(event)` to the engine worker. */
export function useSendEvent(): WorkspaceActions['sendEvent'] {
  return useWorkspace((s) => s.sendEvent);
}

/** The shared selection and its setter. */
export function useSelection(): [Selection, WorkspaceActions['select']] {
  const selection = useWorkspace((s) => s.selection);
  const select = useWorkspace((s) => s.select);
  return [selection, select];
}

/** True when `kind`/`id` is the selected item (cheap per-row check). */
export function useIsSelected(kind: SelectionKind, id: string): boolean {
  return useWorkspace((s) => s.selection?.kind === kind && s.selection.id === id);
}

/** Whether the document may be edited here (role and edit mode aside). */
export function useCanEdit(): boolean {
  return useWorkspace((s) => s.canEdit);
}

/** Whether force/unforce may be used in this workspace (false in a drill that forbids forcing). */
export function useForceAllowed(): boolean {
  return useWorkspace((s) => s.forceAllowed);
}
