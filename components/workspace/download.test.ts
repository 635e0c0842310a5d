import { describe, expect, it, vi } from 'vitest';
import { createCell, pickAndPlaceCell, pickAndPlaceDebouncedSheet, type Cell, type CellDocument, type CellEvent, type DownloadEvent } from '@/simulator';
import { eventRefusal } from '@/lib/runs/policy';
import { afterDownload, changedAreas, downloadEvent, revertRefused, type DownloadInFlight } from './download';
import { createWorkspaceStore, type EngineConnection, type EngineFactory, type EngineSink } from './store';
import { demoDocument } from './test-helpers';

function fakeEngine(keepsRunOnEdit: boolean) {
  const sent: CellEvent[] = [];
  const loads: CellDocument[] = [];
  const conn: EngineConnection = {
    load: vi.fn((d: CellDocument) => void loads.push(d)),
    send: vi.fn((e: CellEvent) => void sent.push(e)),
    run: vi.fn(),
    pause: vi.fn(),
    stepScan: vi.fn(),
    getEventLog: vi.fn(async () => []),
    dispose: vi.fn(),
    keepsRunOnEdit,
  };
  return { conn, sent, loads };
}

const withDebounce = (d: CellDocument): CellDocument => ({ ...d, plc: { ...d.plc, sheet: pickAndPlaceDebouncedSheet() as CellDocument['plc']['sheet'] } });

describe('download helpers', () => {
  it('carry only the changed parts among the allowed areas, and merge them back', () => {
    const running = demoDocument();
    expect(downloadEvent(running, running)).toBeNull();
    const edited = withDebounce(running);
    edited.panel = [...edited.panel].reverse(); // not a downloadable part
    expect(changedAreas(running, edited)).toEqual(['logic']);
    expect(downloadEvent(running, edited, ['wiring', 'routine'])).toBeNull();
    const e = downloadEvent(running, edited)!;
    expect(Object.keys(e).sort()).toEqual(['logic', 'type']);
    const merged = afterDownload(running, e);
    expect(changedAreas(merged, edited)).toEqual([]);
    expect(merged.panel).toBe(running.panel);
  });

  it('the event a helper builds is one the engine accepts', () => {
    const made = createCell(pickAndPlaceCell);
    if (!made.ok) throw new Error('cell');
    const e = downloadEvent(demoDocument(), withDebounce(demoDocument()))!;
    expect(made.value.apply(e).ok).toBe(true);
  });

  it('the run policy (one module for the browser and the server) refuses downloads of parts the drill does not make editable', () => {
    const e = { type: 'download', logic: pickAndPlaceDebouncedSheet() } as CellEvent;
    expect(eventRefusal(e, { forceAllowed: false, editable: ['logic'] })).toBeNull();
    expect(eventRefusal(e, { forceAllowed: false, editable: ['point-map'] })).toContain('logic');
  });
});

describe('workspace store: Send to cell (a download event)', () => {
  it('with a server-side run, edits stay local until downloaded; the download sends only what changed', () => {
    const { conn, sent, loads } = fakeEngine(true);
    const store = createWorkspaceStore({ cellId: 'c', version: 1, document: demoDocument(), canEdit: true }, () => conn);
    expect(store.getState().downloadEdits(['logic'])).toBeNull();
    store.getState().editDocument((d) => withDebounce(d), 'Debounce the part input');
    // The reload reaches the connection (it acknowledges) but the running document is unchanged.
    expect(loads).toHaveLength(2);
    expect(changedAreas(store.getState().engineDocument, store.getState().document)).toEqual(['logic']);
    const e = store.getState().downloadEdits(['logic', 'wiring']);
    expect(e?.type).toBe('download');
    expect(sent).toEqual([e]);
    expect(store.getState().downloadEdits(['logic', 'wiring'])).toBeNull();
    expect(sent).toHaveLength(1);
  });

  it('with the worker, a reload already runs the edit, so there is nothing to download', () => {
    const { conn, sent } = fakeEngine(false);
    const store = createWorkspaceStore({ cellId: 'c', version: 1, document: demoDocument(), canEdit: true }, () => conn);
    store.getState().editDocument((d) => withDebounce(d), 'Debounce');
    expect(store.getState().downloadEdits(['logic'])).toBeNull();
    // An edit kept off the engine (engine: 'keep') is downloadable without a reset.
    store.getState().editDocument((d) => ({ ...d, wiring: d.wiring.filter((w) => w.id !== 'w-recipe2') }), 'Remove a row', { engine: 'keep' });
    expect(store.getState().downloadEdits(['wiring'])?.wiring).toHaveLength(pickAndPlaceCell.wiring.length - 1);
    expect(sent).toHaveLength(1);
  });
});

/**
 * An engine connection over a real Cell that answers as the worker does (engine-host.ts and
 * engine-connection.ts): events cross postMessage as structured clones, each is answered in
 * order with accepted (and `sink.accepted`) or rejected (`lastRejection` with the cell's
 * problems). `hold` queues events so a test can answer them later, like a busy worker.
 */
function cellEngine() {
  let cell: Cell | null = null;
  let sink: EngineSink | null = null;
  const loads: CellDocument[] = [];
  const queued: CellEvent[] = [];
  let hold = false;
  const answer = (event: CellEvent) => {
    const copy = structuredClone(event);
    const r = cell!.apply(copy);
    if (r.ok) {
      sink!.patch({ lastRejection: null, eventCount: cell!.eventLog().length });
      sink!.accepted?.(copy);
    } else sink!.patch({ lastRejection: { event: copy, problems: r.errors } });
  };
  const factory: EngineFactory = (s) => {
    sink = s;
    return {
      load(d) {
        loads.push(d);
        const made = createCell(d);
        if (!made.ok) throw new Error('the test document must load');
        cell = made.value;
        s.patch({ status: 'ready' });
      },
      send: (e) => (hold ? queued.push(e) : answer(e)),
      run: vi.fn(),
      pause: vi.fn(),
      stepScan: () => void cell!.advance(10),
      getEventLog: async () => cell!.eventLog(),
      dispose: vi.fn(),
    };
  };
  return {
    factory,
    loads,
    cell: () => cell!,
    hold: (on: boolean) => void (hold = on),
    release: () => queued.splice(0).forEach(answer),
  };
}

/** A logic sheet the engine refuses: a connection from a block that does not exist. */
function danglingSheet(d: CellDocument): CellDocument['plc']['sheet'] {
  const sheet = structuredClone(d.plc.sheet);
  sheet.connections.push({ id: 'c-ghost', from: { block: 'ghost', port: 'Q' }, to: { block: 'startPulse', port: 'IN' } } as (typeof sheet.connections)[number]);
  return sheet;
}

const setPulse = (ms: number) => (d: CellDocument) => {
  const b = d.plc.sheet.blocks.find((x) => x.id === 'startPulse')!;
  b.params = { ...b.params, PT: ms };
};
const pulseOf = (d: CellDocument) => (d.plc.sheet.blocks.find((x) => x.id === 'startPulse')!.params as { PT: number }).PT;

describe('workspace store: edits that wait for a download (practice, preview)', () => {
  // Behaviour specified in docs/engine.md "Downloading edits": a download swaps the parts into the
  // running cell without starting over; a refused download changes nothing and is not logged.
  it('an edit keeps the run going; the download reaches the running cell and its log at the current time', () => {
    const eng = cellEngine();
    const store = createWorkspaceStore({ cellId: 'c', version: 1, document: demoDocument(), canEdit: false, editsWaitForDownload: true }, eng.factory);
    eng.cell().advance(500);
    store.getState().editDocument(setPulse(250), 'Set PT of startPulse');
    store.getState().undo();
    store.getState().redo();
    // No reload: the cell created on attach is still the one running, at 500 ms.
    expect(eng.loads).toHaveLength(1);
    expect(eng.cell().timeMs).toBe(500);
    expect(changedAreas(store.getState().engineDocument, store.getState().document)).toEqual(['logic']);

    const sent = store.getState().downloadEdits(['logic', 'wiring', 'routine']);
    expect(sent && Object.keys(sent).sort()).toEqual(['logic', 'type']);
    expect(eng.cell().timeMs).toBe(500);
    // The download is logged at the cell time it was applied (so the recorder stores it and a replay runs it).
    expect(eng.cell().eventLog()).toEqual([{ t: 500, event: sent }]);
    expect(pulseOf(store.getState().engineDocument)).toBe(250);
    expect(store.getState().downloadRefusal).toBeNull();
    expect(changedAreas(store.getState().engineDocument, store.getState().document)).toEqual([]);
  });

  it('a refused download leaves the edits marked as not yet sent, keeps the problems, and the button resends them', () => {
    const eng = cellEngine();
    const base = demoDocument();
    const store = createWorkspaceStore({ cellId: 'c', version: 1, document: base, canEdit: false, editsWaitForDownload: true }, eng.factory);
    store.getState().editDocument((d) => {
      d.plc.sheet = danglingSheet(d);
    }, 'Wire from a ghost');
    const first = store.getState().downloadEdits(['logic']);
    expect(first).not.toBeNull();

    const s = store.getState();
    expect(s.engineDocument.plc.sheet).toEqual(base.plc.sheet);
    expect(changedAreas(s.engineDocument, s.document, ['logic'])).toEqual(['logic']);
    expect(s.downloadRefusal?.event.type).toBe('download');
    // The path points into the document (docs/engine.md: "its path a path into the document").
    expect(s.downloadRefusal?.problems.map((p) => p.path)).toEqual([['plc', 'sheet', 'connections', base.plc.sheet.connections.length, 'from', 'block']]);
    expect(s.engine.lastRejection?.event.type).toBe('download');
    expect(eng.cell().eventLog()).toEqual([]);

    // Pressing again sends the same parts again (refused again, still pending).
    const again = store.getState().downloadEdits(['logic']);
    expect(again).toEqual(first);
    expect(changedAreas(store.getState().engineDocument, store.getState().document, ['logic'])).toEqual(['logic']);

    // Corrected: the next download goes through and clears the refusal.
    store.getState().editDocument((d) => {
      d.plc.sheet.connections = d.plc.sheet.connections.filter((c) => c.id !== 'c-ghost');
      setPulse(300)(d);
    }, 'Fix');
    expect(store.getState().downloadEdits(['logic'])).not.toBeNull();
    expect(store.getState().downloadRefusal).toBeNull();
    expect(pulseOf(store.getState().engineDocument)).toBe(300);
    expect(changedAreas(store.getState().engineDocument, store.getState().document)).toEqual([]);
    expect(eng.cell().eventLog()).toHaveLength(1);
  });

  it('a refusal that arrives after a later download keeps what the later one sent', () => {
    const eng = cellEngine();
    const base = demoDocument();
    const store = createWorkspaceStore({ cellId: 'c', version: 1, document: base, canEdit: false, editsWaitForDownload: true }, eng.factory);
    eng.hold(true);
    // 1: bad logic + a wiring change; 2: wiring changed again (logic untouched since 1).
    store.getState().editDocument((d) => {
      d.plc.sheet = danglingSheet(d);
      d.wiring = d.wiring.filter((w) => w.id !== 'w-recipe2');
    }, 'Two parts');
    store.getState().downloadEdits(['logic', 'wiring']);
    store.getState().editDocument((d) => {
      d.wiring = d.wiring.filter((w) => w.id !== 'w-recipe2' && w.id !== d.wiring[0].id);
    }, 'Another row');
    const second = store.getState().downloadEdits(['logic', 'wiring']);
    expect(second && Object.keys(second).sort()).toEqual(['type', 'wiring']);
    eng.release();

    const s = store.getState();
    // The engine refused 1 and took 2: it runs the old logic and the wiring of 2.
    expect(s.engineDocument.plc.sheet).toEqual(base.plc.sheet);
    expect(s.engineDocument.wiring).toEqual(s.document.wiring);
    expect(changedAreas(s.engineDocument, s.document)).toEqual(['logic']);
    expect(eng.cell().eventLog().map((e) => e.event)).toEqual([second]);
  });

  it('"Restart run" starts over from the run\u2019s own document; the edits stay to download', () => {
    const eng = cellEngine();
    const base = demoDocument();
    const store = createWorkspaceStore({ cellId: 'c', version: 1, document: base, canEdit: false, editsWaitForDownload: true }, eng.factory);
    store.getState().editDocument(setPulse(400), 'Set PT');
    store.getState().restartRun();
    expect(eng.loads).toHaveLength(2);
    expect(eng.loads[1]).toEqual(base);
    expect(pulseOf(store.getState().document)).toBe(400);
    expect(changedAreas(store.getState().engineDocument, store.getState().document)).toEqual(['logic']);
  });

  it('a server-side run settles a download when it is stored, so a later identical refusal reverts the right one', () => {
    const { conn } = fakeEngine(true);
    let sink: EngineSink | null = null;
    const base = demoDocument();
    const store = createWorkspaceStore({ cellId: 'c', version: 1, document: base, canEdit: false }, (s) => ((sink = s), conn));
    store.getState().editDocument(setPulse(250), 'PT 250');
    const a = store.getState().downloadEdits(['logic'])!;
    sink!.accepted?.(a);
    store.getState().editDocument(setPulse(100), 'PT back');
    const b = store.getState().downloadEdits(['logic'])!;
    store.getState().editDocument(setPulse(250), 'PT 250 again');
    const c = store.getState().downloadEdits(['logic'])!;
    expect(c).toEqual(a);
    sink!.accepted?.(b);
    // The server refuses the third (same content as the first, which it stored): the running
    // cell has the second one's PT 100, so PT 250 shows as not yet sent.
    sink!.patch({ lastRejection: { event: c, problems: [{ path: [], code: 'refused', message: 'refused by the server' }] } });
    expect(pulseOf(store.getState().engineDocument)).toBe(100);
    expect(changedAreas(store.getState().engineDocument, store.getState().document)).toEqual(['logic']);
    expect(store.getState().downloadRefusal?.problems[0].message).toBe('refused by the server');
  });
});

describe('revertRefused', () => {
  it('corrects the base of later downloads, so refusing two in a row restores what the engine had', () => {
    const base = demoDocument();
    const logicA = withDebounce(base).plc.sheet;
    const wiringB = base.wiring.slice(1);
    const e1: DownloadEvent = { type: 'download', logic: logicA, wiring: wiringB };
    const after1 = afterDownload(base, e1);
    const e2: DownloadEvent = { type: 'download', logic: danglingSheet(base) };
    const after2 = afterDownload(after1, e2);
    const flights: DownloadInFlight[] = [
      { event: e1, key: JSON.stringify(e1), before: base },
      { event: e2, key: JSON.stringify(e2), before: after1 },
    ];
    const r1 = revertRefused(after2, flights, 0);
    // e2 carries the logic, so the engine document keeps e2's logic for now, but loses e1's wiring.
    expect(r1.engineDocument.plc.sheet).toEqual(e2.logic);
    expect(r1.engineDocument.wiring).toEqual(base.wiring);
    expect(r1.inFlight).toHaveLength(1);
    const r2 = revertRefused(r1.engineDocument, r1.inFlight, 0);
    expect(r2.engineDocument.plc.sheet).toEqual(base.plc.sheet);
    expect(r2.engineDocument.wiring).toEqual(base.wiring);
    expect(r2.inFlight).toEqual([]);
  });
});
