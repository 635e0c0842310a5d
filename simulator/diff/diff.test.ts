import { describe, expect, it } from 'vitest';
import { starterCell } from '@/simulator/demo';
import { validateCellDocument } from '@/simulator/schema/validate';
import type { CellDocument } from '@/simulator/schema/cell-document';
import { diffCells, DIFF_AREAS, DIFF_KINDS, type CellDiff, type DiffEntry } from './index';
import { changeoverProposal, INPUT_CARD_ROWS, parsedCell } from './test-helpers';

// Check values below are the edits the fixture (test-helpers.ts) makes by hand, or counted from
// the demo document (simulator/demo/pick-and-place.ts); none comes from running the diff.

const all = (d: CellDiff) => DIFF_AREAS.flatMap((a) => d.areas[a]);
const find = (d: CellDiff, target: DiffEntry['target'], id: string, kind?: DiffEntry['kind']) =>
  all(d).filter((e) => e.target === target && e.id === id && (kind === undefined || e.kind === kind));
const ids = (d: CellDiff, target: DiffEntry['target'], kind: DiffEntry['kind']) =>
  new Set(all(d).filter((e) => e.target === target && e.kind === kind).map((e) => e.id));

/** Plain set difference of the ids of two lists: what the diff's added / removed must equal. */
function setDiff<T>(base: readonly T[], proposed: readonly T[], id: (t: T) => string) {
  const a = new Set(base.map(id));
  const b = new Set(proposed.map(id));
  return { added: new Set([...b].filter((x) => !a.has(x))), removed: new Set([...a].filter((x) => !b.has(x))) };
}

/** A proposal that also takes things away: the ready lamp and its logic go, a pose is added. */
function removalProposal(base: CellDocument): CellDocument {
  const p = changeoverProposal(base);
  p.panel = p.panel.filter((d) => d.id !== 'readyLamp');
  p.wiring = p.wiring.filter((r) => r.id !== 'w-readylamp');
  p.plc.sheet.blocks = p.plc.sheet.blocks.filter((b) => b.id !== 'readyPass' && b.id !== 'readyLampCoil');
  p.plc.sheet.connections = p.plc.sheet.connections.filter((c) => c.id !== 'c21');
  p.controller.poses.push({ id: 'service', label: 'Service', coordinates: [0, 0.5], speed: 0.2, accel: 1 });
  return p;
}

describe('diffCells', () => {
  it('identical cells give an empty diff (also for a fresh copy and the starter cell)', () => {
    for (const [a, b] of [
      [parsedCell(), parsedCell()],
      [parsedCell(starterCell), parsedCell(starterCell)],
    ]) {
      const d = diffCells(a, b);
      expect(d.summary.identical).toBe(true);
      expect(d.summary.total).toBe(0);
      for (const area of DIFF_AREAS) expect(d.areas[area]).toEqual([]);
    }
  });

  it('the order of lists with ids is not a change', () => {
    const a = parsedCell();
    const b = parsedCell();
    b.panel.reverse();
    b.wiring.reverse();
    b.plc.sheet.blocks.reverse();
    b.plc.sheet.connections.reverse();
    b.controller.pointMap.reverse();
    b.controller.modules.reverse();
    b.controller.poses.reverse();
    expect(diffCells(a, b).summary.identical).toBe(true);
  });

  it('a field written as undefined reads as absent, as in JSON', () => {
    const a = parsedCell();
    const b = parsedCell();
    b.wiring[0].label = undefined;
    b.controller.routine[1] = { ...b.controller.routine[1], label: undefined };
    expect(diffCells(a, b).summary.identical).toBe(true);
  });

  it('odd ids: a block called __proto__, a device id with a dot', () => {
    const a = parsedCell();
    const b = parsedCell();
    b.plc.sheet.blocks.push({ id: '__proto__', type: 'NOT', position: { x: 0, y: 0 }, params: {} });
    b.initial.devices = { ...b.initial.devices, 'guard.2': { guardClosed: true } };
    const d = diffCells(a, b);
    expect(d.areas.logic.map((e) => [e.kind, e.id])).toEqual([['added', '__proto__']]);
    expect(d.areas.cell.map((e) => [e.id, e.path])).toEqual([['initial.devices.guard.2.guardClosed', ['initial', 'devices', 'guard.2', 'guardClosed']]]);
  });

  it('the changeover fixture is a valid cell (so the diff is tested on a realistic proposal)', () => {
    const r = validateCellDocument(changeoverProposal(parsedCell()));
    expect(r.ok ? [] : r.errors).toEqual([]);
  });

  it('a second guard door added and wired', () => {
    const a = parsedCell();
    const d = diffCells(a, changeoverProposal(a));
    expect(d.areas.devices).toHaveLength(1);
    expect(d.areas.devices[0]).toMatchObject({ kind: 'added', target: 'field-device', id: 'guard2', path: ['field', 3] });
    expect(find(d, 'wire', 'w-guard2', 'added')).toHaveLength(1);
    expect(find(d, 'block', 'guard2Ok', 'added')[0]).toMatchObject({ area: 'logic', path: ['plc', 'sheet', 'blocks', a.plc.sheet.blocks.length] });
    expect(find(d, 'connection', 'c6b', 'added')[0].detail).toContain('guard2Ok.Q → startPermit.IN5');
    expect(find(d, 'block', 'startPermit', 'changed')[0].changes).toEqual([{ path: 'params.inputs', from: 4, to: 5 }]);
    expect(find(d, 'cell-field', 'initial.devices.guard2.guardClosed', 'added')[0].changes).toEqual([{ path: 'initial.devices.guard2.guardClosed', to: true }]);
  });

  it('an input card moved to another slot: module, point-map rows and every wire on it', () => {
    const a = parsedCell();
    const d = diffCells(a, changeoverProposal(a));
    expect(find(d, 'controller-module', 'ctl-di')[0]).toMatchObject({ kind: 'changed', changes: [{ path: 'slot', from: 2, to: 6 }] });
    const wi = find(d, 'point-map-row', 'pm-wi')[0];
    expect(wi).toMatchObject({ kind: 'changed', map: 'live', changes: [{ path: 'slot', from: 2, to: 6 }] });
    const di = find(d, 'point-map-row', 'pm-di')[0];
    expect(di.map).toBe('live');
    expect(di.changes).toEqual(
      expect.arrayContaining([
        { path: 'slot', from: 2, to: 6 },
        { path: 'count', from: 6, to: 7 },
        { path: 'points.DI7.label', to: 'Guards closed' },
      ]),
    );
    expect(ids(d, 'wire', 'changed')).toEqual(new Set(INPUT_CARD_ROWS));
    for (const id of INPUT_CARD_ROWS) {
      const e = find(d, 'wire', id)[0];
      const was = a.wiring.find((r) => r.id === id)!.to;
      if (!('controller' in was)) throw new Error(`fixture: ${id} does not end on the controller`);
      expect(e.ends).toEqual([{ end: 'to', was, now: { controller: { ...was.controller, slot: 6 } } }]);
    }
  });

  it('a block parameter change, a re-pointed connection and a canvas move (low importance)', () => {
    const a = parsedCell();
    const d = diffCells(a, changeoverProposal(a));
    const pulse = find(d, 'block', 'startPulse');
    expect(pulse).toHaveLength(1);
    expect(pulse[0]).toMatchObject({ kind: 'changed', importance: 'high', changes: [{ path: 'params.PT', from: 100, to: 150 }] });
    expect(pulse[0].detail).toBe('block startPulse (TP): PT 100 → 150');
    const c12 = find(d, 'connection', 'c12')[0];
    expect(c12.kind).toBe('changed');
    expect(c12.changes).toEqual([{ path: 'from', from: { block: 'guardPass', port: 'Q' }, to: { block: 'guardOk', port: 'Q' } }]);
    expect(c12.detail).toContain('re-pointed');
    const moved = all(d).filter((e) => e.kind === 'moved');
    expect(moved.map((e) => e.id)).toEqual(['recipeWord']);
    expect(moved[0]).toMatchObject({ importance: 'low', changes: [{ path: 'position', from: { x: 600, y: 1000 }, to: { x: 640, y: 1000 } }] });
    expect(all(d).filter((e) => e.importance === 'low')).toEqual(moved);
  });

  it('a routine step changed and a handshake role re-pointed', () => {
    const a = parsedCell();
    const d = diffCells(a, changeoverProposal(a));
    expect(d.areas.routine).toEqual([
      expect.objectContaining({ kind: 'changed', target: 'step', id: '#5', baseIndex: 4, proposedIndex: 4, changes: [{ path: 'timeoutMs', from: 2000, to: 3000 }] }),
    ]);
    expect(d.areas.handshake).toHaveLength(1);
    expect(d.areas.handshake[0]).toMatchObject({
      kind: 'changed',
      id: 'inputs.guardClosed',
      path: ['controller', 'handshake', 'inputs', 'guardClosed'],
      // DI4 is the 4th point of pm-di (first channel 0), so channel 3; DI7 the 7th, channel 6 on the moved card.
      was: { point: 'DI4', label: 'Guard closed', location: { rack: 1, slot: 2, channel: 3 }, wiredTo: ['%QX0.3'] },
      now: { point: 'DI7', label: 'Guards closed', location: { rack: 1, slot: 6, channel: 6 }, wiredTo: ['%QX0.6'] },
    });
  });

  it('added and removed ids equal a plain set computation, for every list with ids', () => {
    const a = parsedCell();
    for (const b of [changeoverProposal(a), removalProposal(a)]) {
      const d = diffCells(a, b);
      const lists: [DiffEntry['target'], { id: string }[], { id: string }[]][] = [
        ['panel-device', a.panel, b.panel],
        ['field-device', a.field, b.field],
        ['wire', a.wiring, b.wiring],
        ['block', a.plc.sheet.blocks, b.plc.sheet.blocks],
        ['connection', a.plc.sheet.connections, b.plc.sheet.connections],
        ['point-map-row', a.controller.pointMap, b.controller.pointMap],
        ['controller-module', a.controller.modules, b.controller.modules],
        ['plc-module', a.plc.modules, b.plc.modules],
        ['pose', a.controller.poses, b.controller.poses],
      ];
      for (const [target, x, y] of lists) {
        const plain = setDiff(x, y, (t) => t.id);
        expect({ target, added: ids(d, target, 'added') }).toEqual({ target, added: plain.added });
        expect({ target, removed: ids(d, target, 'removed') }).toEqual({ target, removed: plain.removed });
      }
    }
    // The removal proposal really removes something, so the check above is not vacuous.
    const d = diffCells(a, removalProposal(a));
    expect(ids(d, 'block', 'removed')).toEqual(new Set(['readyPass', 'readyLampCoil']));
    expect(ids(d, 'panel-device', 'removed')).toEqual(new Set(['readyLamp']));
  });

  it('the summary counts every entry by area and kind', () => {
    const a = parsedCell();
    const d = diffCells(a, removalProposal(a));
    let total = 0;
    for (const area of DIFF_AREAS) {
      for (const kind of DIFF_KINDS) expect(d.summary.areas[area][kind]).toBe(d.areas[area].filter((e) => e.kind === kind).length);
      expect(d.summary.areas[area].total).toBe(d.areas[area].length);
      total += d.areas[area].length;
    }
    expect(d.summary.total).toBe(total);
    expect(d.summary.identical).toBe(false);
    expect(Object.keys(d.summary.areas)).toEqual([...DIFF_AREAS]);
  });

  it('is deterministic: same inputs, same JSON; list order changes only the paths', () => {
    const a = parsedCell();
    const b = removalProposal(a);
    const first = JSON.stringify(diffCells(a, b));
    expect(JSON.stringify(diffCells(parsedCell(), removalProposal(parsedCell())))).toBe(first);
    const shuffled = structuredClone(b);
    shuffled.wiring.reverse();
    shuffled.plc.sheet.blocks.reverse();
    shuffled.plc.sheet.connections.reverse();
    shuffled.field.reverse();
    const strip = (d: CellDiff) => all(d).map(({ path: _path, ...rest }) => rest);
    expect(strip(diffCells(a, shuffled))).toEqual(strip(JSON.parse(first) as CellDiff));
  });

  it('the diff is plain JSON (round-trips unchanged)', () => {
    const a = parsedCell();
    const d = diffCells(a, changeoverProposal(a));
    expect(JSON.parse(JSON.stringify(d))).toEqual(d);
  });

  it('cell fields: name and scan period are reported in the cell area with their document paths', () => {
    const a = parsedCell();
    const b = parsedCell();
    b.name = 'Kestrel Vale Cell B — two guards';
    b.plc.sheet.scanPeriodMs = 5;
    const d = diffCells(a, b);
    expect(d.areas.cell.map((e) => [e.id, e.path, e.kind])).toEqual([
      ['name', ['name'], 'changed'],
      ['plc.sheet.scanPeriodMs', ['plc', 'sheet', 'scanPeriodMs'], 'changed'],
    ]);
    expect(d.proposed.name).toBe(b.name);
    expect(d.summary.total).toBe(2);
  });

  it('devices: NO/NC, colour and label changes are fields; a front-plate move is a separate low entry', () => {
    const a = parsedCell();
    const b = parsedCell();
    const start = b.panel.find((p) => p.id === 'start')!;
    if (start.type !== 'push-button') throw new Error('fixture: start is not a push button');
    start.contact = 'NC';
    start.colour = 'white';
    start.label = 'Start cycle';
    start.position = { x: start.position.x, y: start.position.y + 20 };
    const d = diffCells(a, b);
    expect(d.areas.devices.map((e) => [e.id, e.kind, e.importance])).toEqual([
      ['start', 'changed', 'high'],
      ['start', 'moved', 'low'],
    ]);
    expect(d.areas.devices[0].changes).toEqual([
      { path: 'colour', from: 'green', to: 'white' },
      { path: 'contact', from: 'NO', to: 'NC' },
      { path: 'label', from: 'Cycle start', to: 'Start cycle' },
    ]);
  });

  it('staged point-map edits are marked staged and compared with what runs after a restart', () => {
    const a = parsedCell();
    const b = parsedCell();
    const staged = structuredClone(b.controller.pointMap);
    staged[0].points = staged[0].points!.map((p, i) => (i === 1 ? { ...p, invert: true } : p));
    b.controller.staged = staged;
    const d = diffCells(a, b);
    expect(d.areas.pointMap.map((e) => [e.target, e.id, e.kind, e.map])).toEqual([
      ['staged-map', 'staged', 'added', 'staged'],
      ['point-map-row', 'pm-di', 'changed', 'staged'],
    ]);
    expect(d.areas.pointMap[1].changes).toEqual([{ path: 'points.DI2.invert', from: false, to: true }]);
    expect(d.areas.pointMap[1].path).toEqual(['controller', 'staged', 0]);
  });
});

describe('routine steps', () => {
  const routine = (d: CellDocument, steps: CellDocument['controller']['routine']) => {
    d.controller.routine = steps;
    return d;
  };
  const A = { kind: 'wait', condition: { point: 'DI6', op: '==', value: 1 } } as const;
  const B = { kind: 'move', pose: 'abovePick' } as const;
  const C = { kind: 'move', pose: 'pick' } as const;
  const grip = { kind: 'set', point: 'TO1', value: 1, label: 'grip' } as const;
  const E = { kind: 'pause', ms: 100 } as const;
  const F = { kind: 'move', pose: 'home' } as const;

  it('added, removed, changed (labelled and by place) and reordered', () => {
    const a = routine(parsedCell(), [A, B, C, grip, E, F]);
    // F moved to the front; a new pause after A; C gets a speed; grip sets 0; E (pause 100) goes.
    const b = routine(parsedCell(), [F, A, { kind: 'pause', ms: 50 }, B, { ...C, speedPercent: 50 }, { ...grip, value: 0 }]);
    const d = diffCells(a, b);
    expect(d.areas.routine.map((e) => [e.kind, e.id, e.baseIndex, e.proposedIndex])).toEqual([
      ['reordered', '#1', 5, 0],
      ['added', '#3', undefined, 2],
      ['removed', '#5', 4, undefined],
      ['changed', '#5', 2, 4],
      ['changed', 'grip', 3, 5],
    ]);
    expect(d.areas.routine[3].changes).toEqual([{ path: 'speedPercent', to: 50 }]);
    expect(d.areas.routine[4].changes).toEqual([{ path: 'value', from: 1, to: 0 }]);
    expect(d.summary.areas.routine).toMatchObject({ added: 1, removed: 1, changed: 2, reordered: 1, total: 5 });
  });

  it('an inserted step does not make the steps after it "reordered"', () => {
    const a = routine(parsedCell(), [A, B, C, F]);
    const b = routine(parsedCell(), [{ kind: 'pause', ms: 10 }, A, B, C, F]);
    expect(diffCells(a, b).areas.routine.map((e) => [e.kind, e.proposedIndex])).toEqual([['added', 0]]);
  });

  it('key order inside a step is not a change', () => {
    const a = routine(parsedCell(), [A, { kind: 'set', point: 'TO1', value: 1 }]);
    const b = routine(parsedCell(), [A, { value: 1, point: 'TO1', kind: 'set' }]);
    expect(diffCells(a, b).summary.identical).toBe(true);
  });
});
