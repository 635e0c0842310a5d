import { describe, expect, it, vi } from 'vitest';
import { createWorkspaceStore, FORCE_NOT_ALLOWED, HISTORY_LIMIT, type EngineConnection } from './store';
import { clearDraft, draftKey, findOlderDraft, readDraft, writeDraft } from './draft';
import { demoDocument, MemoryStorage } from './test-helpers';

function fakeEngine() {
  const calls: string[] = [];
  const conn: EngineConnection = {
    load: vi.fn(() => void calls.push('load')),
    send: vi.fn((e) => void calls.push(`send:${e.type}`)),
    run: vi.fn((s) => void calls.push(`run:${s}`)),
    pause: vi.fn(() => void calls.push('pause')),
    stepScan: vi.fn(() => void calls.push('step')),
    getEventLog: vi.fn(async () => []),
    dispose: vi.fn(),
  };
  return { conn, calls };
}

const init = () => ({ cellId: 'c1', version: 3, document: demoDocument(), canEdit: true });

describe('workspace store: editing, undo and redo', () => {
  it('records each edit as one undo step and marks the document dirty', () => {
    const store = createWorkspaceStore(init());
    store.getState().editDocument((d) => {
      d.panel[0].label = 'Go';
    }, 'Rename start');
    store.getState().editDocument((d) => {
      d.panel[1].label = 'Halt';
    }, 'Rename stop');
    const s = store.getState();
    expect(s.document.panel[0].label).toBe('Go');
    expect(s.document.panel[1].label).toBe('Halt');
    expect(s.past.map((p) => p.label)).toEqual(['Rename start', 'Rename stop']);
    expect(s.dirty).toBe(true);
  });

  it('undo and redo walk the history and dirty follows the saved document', () => {
    const store = createWorkspaceStore(init());
    const original = store.getState().document.panel[0].label;
    store.getState().editDocument((d) => {
      d.panel[0].label = 'Go';
    }, 'Rename start');
    store.getState().undo();
    expect(store.getState().document.panel[0].label).toBe(original);
    expect(store.getState().dirty).toBe(false);
    expect(store.getState().future).toHaveLength(1);
    store.getState().redo();
    expect(store.getState().document.panel[0].label).toBe('Go');
    expect(store.getState().dirty).toBe(true);
    expect(store.getState().future).toHaveLength(0);
  });

  it('a new edit after undo drops the redo stack', () => {
    const store = createWorkspaceStore(init());
    store.getState().editDocument((d) => void (d.panel[0].label = 'A'), 'a');
    store.getState().undo();
    store.getState().editDocument((d) => void (d.panel[0].label = 'B'), 'b');
    expect(store.getState().future).toHaveLength(0);
    store.getState().redo();
    expect(store.getState().document.panel[0].label).toBe('B');
  });

  it('an edit that changes nothing is not an undo step; history is capped', () => {
    const store = createWorkspaceStore(init());
    store.getState().editDocument(() => undefined, 'nothing');
    expect(store.getState().past).toHaveLength(0);
    for (let i = 0; i < HISTORY_LIMIT + 5; i++) store.getState().editDocument((d) => void (d.panel[0].label = `L${i}`), `step ${i}`);
    expect(store.getState().past).toHaveLength(HISTORY_LIMIT);
    expect(store.getState().past[0].label).toBe('step 5');
  });

  it('a recipe may return a new document instead of mutating', () => {
    const store = createWorkspaceStore(init());
    store.getState().editDocument((d) => ({ ...d, name: 'Renamed cell' }), 'Rename cell');
    expect(store.getState().document.name).toBe('Renamed cell');
  });

  it('reloads the engine on edits, undo and redo, but not with engine: keep', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    expect(calls).toEqual(['load']);
    store.getState().editDocument((d) => void (d.panel[0].label = 'A'), 'a');
    store.getState().editDocument((d) => void (d.controller.staged = []), 'stage', { engine: 'keep' });
    store.getState().undo();
    store.getState().redo();
    expect(calls).toEqual(['load', 'load', 'load', 'load']);
  });

  it('markSaved moves the base version and clears dirty; with a document it reloads and can reset history', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    store.getState().editDocument((d) => void (d.panel[0].label = 'A'), 'a');
    store.getState().markSaved(4);
    expect(store.getState()).toMatchObject({ version: 4, dirty: false });
    expect(store.getState().past).toHaveLength(1);
    const latest = demoDocument();
    latest.name = 'Someone else saved this';
    store.getState().markSaved(5, latest, true);
    expect(store.getState()).toMatchObject({ version: 5, dirty: false, past: [], future: [] });
    expect(store.getState().document.name).toBe('Someone else saved this');
    expect(calls.filter((c) => c === 'load')).toHaveLength(3);
  });

  it('passes run controls and events to the engine and tracks the run state', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    store.getState().run(10);
    expect(store.getState().engine).toMatchObject({ running: true, speed: 10 });
    store.getState().sendEvent({ type: 'press', device: 'start' });
    store.getState().stepScan();
    expect(store.getState().engine.running).toBe(false);
    store.getState().pause();
    expect(calls).toEqual(['load', 'run:10', 'send:press', 'step', 'pause']);
  });

  it('allows forcing by default and passes force/unforce to the engine', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    expect(store.getState().forceAllowed).toBe(true);
    store.getState().sendEvent({ type: 'force', target: '%IX0.5', value: 0 });
    store.getState().sendEvent({ type: 'unforce', target: '%IX0.5' });
    expect(calls).toEqual(['load', 'send:force', 'send:unforce']);
    expect(store.getState().engine.lastRejection).toBeNull();
  });

  it('with forceAllowed false refuses force and unforce before the engine, other events still pass', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore({ ...init(), forceAllowed: false }, () => conn);
    expect(store.getState().forceAllowed).toBe(false);
    store.getState().sendEvent({ type: 'force', target: '%IX0.5', value: 1 });
    expect(store.getState().engine.lastRejection).toMatchObject({ event: { type: 'force', target: '%IX0.5' }, problems: [{ code: 'force_not_allowed', message: FORCE_NOT_ALLOWED }] });
    store.getState().sendEvent({ type: 'unforce', target: '%IX0.5' });
    expect(store.getState().engine.lastRejection?.event.type).toBe('unforce');
    store.getState().sendEvent({ type: 'press', device: 'start' });
    expect(calls).toEqual(['load', 'send:press']);
  });

  it('drops the live snapshot when the engine reports the document invalid', () => {
    const store = createWorkspaceStore(init());
    store.getState().receiveSnapshot({ timeMs: 5 } as never);
    store.getState().patchEngine({ status: 'invalid', problems: [{ path: ['wiring', 0], code: 'x', message: 'bad' }] });
    expect(store.getState().snapshot).toBeNull();
    expect(store.getState().engine.problems).toHaveLength(1);
  });

  it('shares one selection', () => {
    const store = createWorkspaceStore(init());
    store.getState().select({ kind: 'address', id: '%IX0.0' });
    expect(store.getState().selection).toEqual({ kind: 'address', id: '%IX0.0' });
  });
});

describe('drafts', () => {
  it('round-trips a draft per cell and base version', () => {
    const storage = new MemoryStorage();
    const doc = demoDocument();
    doc.name = 'Draft name';
    writeDraft(storage, 'c1', 3, doc, new Date('2026-12-01T10:00:00Z'));
    expect(readDraft(storage, 'c1', 3)).toEqual({ document: doc, savedAt: '2026-12-01T10:00:00.000Z' });
    expect(readDraft(storage, 'c1', 4)).toBeNull();
    expect(readDraft(storage, 'c2', 3)).toBeNull();
    clearDraft(storage, 'c1', 3);
    expect(readDraft(storage, 'c1', 3)).toBeNull();
  });

  it('drops a corrupt or schema-invalid draft', () => {
    const storage = new MemoryStorage();
    storage.setItem(draftKey('c1', 3), '{not json');
    expect(readDraft(storage, 'c1', 3)).toBeNull();
    expect(storage.getItem(draftKey('c1', 3))).toBeNull();
    storage.setItem(draftKey('c1', 3), JSON.stringify({ document: { schemaVersion: 99 }, savedAt: 'x' }));
    expect(readDraft(storage, 'c1', 3)).toBeNull();
  });

  it('finds the newest draft left on an older base version', () => {
    const storage = new MemoryStorage();
    writeDraft(storage, 'c1', 1, demoDocument());
    writeDraft(storage, 'c1', 2, demoDocument());
    writeDraft(storage, 'c1', 5, demoDocument());
    writeDraft(storage, 'other', 4, demoDocument());
    expect(findOlderDraft(storage, 'c1', 4)?.version).toBe(2);
    expect(findOlderDraft(storage, 'c1', 1)).toBeNull();
  });

  it('restoring a draft into a store makes it dirty and undoable back to the saved version', () => {
    const storage = new MemoryStorage();
    const edited = demoDocument();
    edited.panel[0].label = 'From the draft';
    writeDraft(storage, 'c1', 3, edited);
    const store = createWorkspaceStore(init());
    const draft = readDraft(storage, 'c1', 3)!;
    store.getState().editDocument(draft.document, 'Restore draft');
    expect(store.getState().document.panel[0].label).toBe('From the draft');
    expect(store.getState().dirty).toBe(true);
    store.getState().undo();
    expect(store.getState().dirty).toBe(false);
  });
});

describe('workspace store: staging the point map and rebooting the controller', () => {
  const moved = (doc: ReturnType<typeof demoDocument>) => doc.controller.pointMap.map((r) => (r.id === 'pm-do' ? { ...r, firstChannel: 8 } : r));

  it('stages rows in the document and the engine without reloading the run', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    calls.length = 0;
    const rows = moved(store.getState().document);
    store.getState().stagePointMap(rows, 'Set first channel of pm-do');
    expect(store.getState().document.controller.staged).toEqual(rows);
    expect(store.getState().past.at(-1)?.label).toBe('Set first channel of pm-do');
    // Staged, not loaded: the running cell keeps its map until the reboot.
    expect(calls).toEqual(['send:stage-point-map']);
  });

  it('keeps clashing rows in the document only (the engine would refuse them)', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    calls.length = 0;
    const rows = store.getState().document.controller.pointMap.map((r) => (r.id === 'pm-do' ? { ...r, slot: 99 } : r));
    store.getState().stagePointMap(rows, 'Move pm-do');
    expect(store.getState().document.controller.staged).toEqual(rows);
    expect(calls).toEqual([]);
  });

  it('rows equal to the running map drop the staged change', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    const running = store.getState().document.controller.pointMap;
    store.getState().stagePointMap(moved(store.getState().document), 'Move');
    calls.length = 0;
    store.getState().stagePointMap(running.map((r) => ({ ...r })), 'Move back');
    expect(store.getState().document.controller.staged).toBeNull();
    expect(calls).toEqual(['send:discard-staged']);
  });

  it('the reboot puts the staged rows in force in the engine and the document', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    const rows = moved(store.getState().document);
    store.getState().stagePointMap(rows, 'Move');
    calls.length = 0;
    store.getState().restartController();
    expect(calls).toEqual(['send:stage-point-map', 'send:restart-controller']);
    expect(store.getState().document.controller.pointMap).toEqual(rows);
    expect(store.getState().document.controller.staged).toBeNull();
    // Undo brings the staged rows back as one step.
    store.getState().undo();
    expect(store.getState().document.controller.staged).toEqual(rows);
  });

  it('a reboot with nothing staged only reboots; dropping forgets the staged rows', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    calls.length = 0;
    store.getState().restartController();
    expect(calls).toEqual(['send:restart-controller']);
    store.getState().stagePointMap(moved(store.getState().document), 'Move');
    calls.length = 0;
    store.getState().discardStagedPointMap();
    expect(store.getState().document.controller.staged).toBeNull();
    expect(calls).toEqual(['send:discard-staged']);
  });
});

describe('workspace store: replacing the logic sheet (an imported file)', () => {
  /** The demo sheet without its first block and that block's wires (what a shorter imported file holds). */
  const shorter = (doc: ReturnType<typeof demoDocument>) => {
    const sheet = structuredClone(doc.plc.sheet);
    const gone = sheet.blocks[0].id;
    sheet.blocks = sheet.blocks.slice(1);
    sheet.connections = sheet.connections.filter((c) => c.from.block !== gone && c.to.block !== gone);
    return { sheet, gone };
  };

  it('replaces the sheet as one named undo step that reloads the cell; undo and redo walk it', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore(init(), () => conn);
    const original = store.getState().document.plc.sheet;
    const { sheet } = shorter(store.getState().document);
    calls.length = 0;
    store.getState().replaceLogicSheet(sheet, 'Import sheet from cell-logic.xml');
    const s = store.getState();
    expect(s.document.plc.sheet).toEqual(sheet);
    expect(s.document.plc.sheet).not.toBe(sheet); // the store keeps its own copy
    expect(s.past.map((p) => p.label)).toEqual(['Import sheet from cell-logic.xml']);
    expect(s.dirty).toBe(true);
    expect(calls).toEqual(['load']);
    // Nothing else in the document changed.
    expect({ ...s.document, plc: { ...s.document.plc, sheet: null } }).toEqual({ ...s.savedDocument, plc: { ...s.savedDocument.plc, sheet: null } });
    store.getState().undo();
    expect(store.getState().document.plc.sheet).toEqual(original);
    expect(store.getState().dirty).toBe(false);
    store.getState().redo();
    expect(store.getState().document.plc.sheet).toEqual(sheet);
  });

  it('an identical sheet adds no undo step', () => {
    const store = createWorkspaceStore(init());
    store.getState().replaceLogicSheet(structuredClone(store.getState().document.plc.sheet), 'Import');
    expect(store.getState().past).toEqual([]);
    expect(store.getState().dirty).toBe(false);
  });

  it('drops a selected block the new sheet lacks and keeps any other selection', () => {
    const store = createWorkspaceStore(init());
    const { sheet, gone } = shorter(store.getState().document);
    store.getState().select({ kind: 'block', id: gone });
    store.getState().replaceLogicSheet(sheet, 'Import');
    expect(store.getState().selection).toBeNull();

    store.getState().undo();
    const kept = sheet.blocks[0].id;
    store.getState().select({ kind: 'block', id: kept });
    store.getState().replaceLogicSheet(sheet, 'Import');
    expect(store.getState().selection).toEqual({ kind: 'block', id: kept });

    store.getState().undo();
    store.getState().select({ kind: 'address', id: '%IX0.0' });
    store.getState().replaceLogicSheet(sheet, 'Import');
    expect(store.getState().selection).toEqual({ kind: 'address', id: '%IX0.0' });
  });

  it('where edits wait for "Send to cell", the imported sheet waits too and goes as one download', () => {
    const { conn, calls } = fakeEngine();
    const store = createWorkspaceStore({ ...init(), editsWaitForDownload: true }, () => conn);
    const { sheet } = shorter(store.getState().document);
    calls.length = 0;
    store.getState().replaceLogicSheet(sheet, 'Import');
    expect(calls).toEqual([]);
    const event = store.getState().downloadEdits(['logic']);
    expect(event?.logic).toEqual(sheet);
    expect(calls).toEqual(['send:download']);
  });
});
