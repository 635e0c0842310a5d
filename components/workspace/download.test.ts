import { describe, expect, it, vi } from 'vitest';
import { createCell, pickAndPlaceCell, pickAndPlaceDebouncedSheet, type CellDocument, type CellEvent } from '@/simulator';
import { refusal } from '@/components/runs/remote-engine';
import { afterDownload, changedAreas, downloadEvent } from './download';
import { createWorkspaceStore, type EngineConnection } from './store';
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

  it('the remote engine refuses downloads of parts the drill does not make editable (as the server does)', () => {
    const e = { type: 'download', logic: pickAndPlaceDebouncedSheet() } as CellEvent;
    expect(refusal(e, { forceAllowed: false, editable: ['logic'] })).toBeNull();
    expect(refusal(e, { forceAllowed: false, editable: ['point-map'] })).toContain('logic');
  });
});

describe('workspace store: Download to PLC', () => {
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
    store.getState().editDocument((d) => ({ ...d, wiring: d.wiring.filter((w) => w.id !== 'w-job2') }), 'Remove a row', { engine: 'keep' });
    expect(store.getState().downloadEdits(['wiring'])?.wiring).toHaveLength(pickAndPlaceCell.wiring.length - 1);
    expect(sent).toHaveLength(1);
  });
});
