import { describe, expect, it } from 'vitest';
import { createCell } from './cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { pickAndPlaceDebouncedSheet, PART_DEBOUNCE_MS } from '@/simulator/demo/part-debounce';
import { replay } from '@/simulator/trace/replay';
import type { LoggedEvent } from './events';

// The chattering-sensor drill's hidden card (lib/drills/library.ts): a loose terminal that
// opens the part-sensor row in about a third of its 30 ms windows (invented scenario values).
const CHATTER = { id: 'f1', kind: 'chatter', row: 'w-part', periodMs: 30, probability: 0.35 } as const;

function cell(seed = 7, trace: string[] = ['plc.%IX0.5', 'plc.%QX0.5']) {
  const r = createCell(pickAndPlaceCell, { faults: [CHATTER], seed, trace });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** Changes of a signal in the trace within [from, to]. */
function toggles(c: ReturnType<typeof cell>, signal: string, from: number, to: number): number {
  const tr = c.trace();
  const i = tr.signals.indexOf(signal);
  return tr.samples.filter(([t, k]) => k === i && t >= from && t <= to).length;
}

describe('download event', () => {
  it('symptom: the chattering part input makes the robot part signal chatter; a downloaded debounce makes it steady', () => {
    const c = cell();
    c.advance(2000);
    expect(c.apply({ type: 'set-field', device: 'part', active: true }).ok).toBe(true);
    c.advance(5000);
    // Without the fix the coil %QX0.5 follows the chattering input (common practice: a coil
    // writes its rung's power flow every scan).
    expect(toggles(c, 'plc.%QX0.5', 2100, 7000)).toBeGreaterThan(10);
    const d = c.apply({ type: 'download', logic: pickAndPlaceDebouncedSheet() });
    expect(d.ok, JSON.stringify(d)).toBe(true);
    c.advance(20_000);
    const settled = 7000 + PART_DEBOUNCE_MS.holdOff + PART_DEBOUNCE_MS.settleOn + 20;
    // The raw input still chatters (the fault card stays attached) ...
    expect(toggles(c, 'plc.%IX0.5', settled, 27_000)).toBeGreaterThan(10);
    // ... but the debounced signal the robot gets is steady on.
    expect(toggles(c, 'plc.%QX0.5', settled, 27_000)).toBe(0);
    expect(c.readSignal('plc.%QX0.5')).toEqual({ ok: true, value: 1 });
    expect(c.snapshot().faults.map((f) => f.status)).toEqual(['active']);
    // The new blocks' signals are readable after the download.
    expect(c.readSignal('plc.partSteady.Q')).toEqual({ ok: true, value: 1 });
  });

  it('logic: stop → run restarts the PLC state; outputs are off until the first scan of the new sheet; the clock goes on', () => {
    const c = cell();
    c.apply({ type: 'set-field', device: 'part', active: true });
    c.apply({ type: 'inject-fault', fault: { id: 'x', kind: 'stuck-on', device: 'part' } });
    c.advance(1005);
    expect(c.snapshot().plc.scans).toBe(100);
    expect(c.readSignal('plc.%QX0.5')).toEqual({ ok: true, value: 1 });
    expect(c.apply({ type: 'download', logic: pickAndPlaceDebouncedSheet() }).ok).toBe(true);
    const s = c.snapshot();
    expect(s.timeMs).toBe(1005);
    expect(s.plc.scans).toBe(0);
    expect(s.plc.addresses['%QX0.5'].value).toBe(0);
    c.advance(5); // first scan of the new sheet at 1010 ms (scan period 10 ms)
    expect(c.snapshot().plc.scans).toBe(1);
    // The TON starts from zero: the part counts only after its preset.
    expect(c.readSignal('plc.%QX0.5')).toEqual({ ok: true, value: 0 });
    c.advance(PART_DEBOUNCE_MS.settleOn);
    expect(c.readSignal('plc.%QX0.5')).toEqual({ ok: true, value: 1 });
  });

  it('a download whose merged document is invalid is rejected with paths and changes nothing', () => {
    const c = cell();
    c.advance(500);
    const before = JSON.stringify(c.snapshot());
    const bad = pickAndPlaceDebouncedSheet();
    bad.connections.push({ id: 'dx', from: { block: 'ghost', port: 'Q' }, to: { block: 'robotStop', port: 'IN' } });
    const r = c.apply({ type: 'download', logic: bad });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.some((p) => p.path[0] === 'plc' && p.path[1] === 'sheet')).toBe(true);
    const wiring = pickAndPlaceCell.wiring.map((w) => (w.id === 'w-part' ? { ...w, to: { plc: '%IX0.0' } } : w));
    const r2 = c.apply({ type: 'download', wiring });
    expect(r2.ok).toBe(false);
    if (!r2.ok) expect(r2.errors.every((p) => p.path[0] === 'wiring')).toBe(true);
    // A shape problem (a negative preset) is found by the event schema; its path still points into the document.
    const negative = structuredClone(pickAndPlaceDebouncedSheet());
    const timer = negative.blocks.findIndex((b) => b.type === 'TON' || b.type === 'TOF' || b.type === 'TP');
    // Deliberately malformed, as a hand-edited or corrupted download would be: bypass the types.
    (negative.blocks[timer].params as Record<string, unknown>).PT = -5;
    const r4 = c.apply({ type: 'download', logic: negative });
    expect(r4.ok).toBe(false);
    if (!r4.ok) expect(r4.errors.map((p) => p.path.slice(0, 6))).toContainEqual(['plc', 'sheet', 'blocks', timer, 'params', 'PT']);
    const r3 = c.apply({ type: 'download' });
    expect(r3.ok).toBe(false);
    if (!r3.ok) expect(r3.errors[0].code).toBe('empty_download');
    expect(JSON.stringify(c.snapshot())).toBe(before);
    expect(c.eventLog()).toEqual([]);
  });

  it('wiring: a card on a removed row stays armed and inactive, and fires again when the row comes back', () => {
    const c = cell();
    c.advance(100);
    const without = pickAndPlaceCell.wiring.filter((w) => w.id !== 'w-part');
    expect(c.apply({ type: 'download', wiring: without }).ok).toBe(true);
    let s = c.snapshot();
    expect(s.faults).toEqual([expect.objectContaining({ status: 'armed', since: null })]);
    expect(s.wires.some((w) => w.id === 'w-part')).toBe(false);
    expect(c.readSignal('in.w-part').ok).toBe(false);
    c.advance(200);
    expect(c.snapshot().faults[0].status).toBe('armed');
    expect(c.apply({ type: 'download', wiring: pickAndPlaceCell.wiring }).ok).toBe(true);
    s = c.snapshot();
    expect(s.faults[0].status).toBe('active');
    expect(s.faults[0].since).toBe(300);
    expect(s.wires.find((w) => w.id === 'w-part')?.faults).toEqual(['f1']);
  });

  it('routine: a changed routine stops the controller at step 0 (no motion without a new start); an identical one changes nothing', () => {
    const c = cell(7, ['ctl.state']);
    c.apply({ type: 'clear-fault', id: 'f1' });
    c.advance(2000);
    c.apply({ type: 'set-field', device: 'part', active: true });
    c.advance(100);
    c.apply({ type: 'press', device: 'start' });
    c.advance(60);
    c.apply({ type: 'release', device: 'start' });
    c.advance(400);
    expect(c.snapshot().controller.state).toBe('cycling');
    const { routine, poses } = pickAndPlaceCell.controller;
    expect(c.apply({ type: 'download', routine: { steps: routine, poses } }).ok).toBe(true);
    expect(c.snapshot().controller.state).toBe('cycling');
    const pc = c.snapshot().controller.pc;
    const changed = [...routine, { kind: 'pause', ms: 10 } as const];
    expect(c.apply({ type: 'download', routine: { steps: changed, poses } }).ok).toBe(true);
    let s = c.snapshot();
    expect(s.controller.state).toBe('stopped');
    expect(s.controller.pc).toBe(0);
    expect(s.arm.moving).toBe(false);
    expect(s.timeMs).toBe(2560);
    expect(pc).toBeGreaterThanOrEqual(0);
    c.advance(3000);
    s = c.snapshot();
    expect(['stopped', 'ready']).toContain(s.controller.state);
    expect(s.arm.moving).toBe(false);
    expect(s.controller.pc).toBe(0);
  });

  it('replay of a log with downloads gives the same trace hash', () => {
    const log: LoggedEvent[] = [
      { t: 2000, event: { type: 'set-field', device: 'part', active: true } },
      { t: 3000, event: { type: 'download', logic: pickAndPlaceDebouncedSheet() } as LoggedEvent['event'] },
      { t: 4000, event: { type: 'download', wiring: pickAndPlaceCell.wiring.filter((w) => w.id !== 'w-part') } as LoggedEvent['event'] },
      { t: 4500, event: { type: 'download', wiring: pickAndPlaceCell.wiring } as LoggedEvent['event'] },
    ];
    const opts = { faults: [CHATTER], trace: ['plc.%IX0.5', 'plc.%QX0.5', 'plc.partPass.Q', 'in.w-part', 'ctl.state'], seed: 11, untilMs: 8000 };
    const a = replay(pickAndPlaceCell, log, opts);
    const b = replay(pickAndPlaceCell, log, opts);
    if (!a.ok || !b.ok) throw new Error(JSON.stringify(a.ok ? b : a));
    expect(b.value.hash).toBe(a.value.hash);
    const again = replay(pickAndPlaceCell, a.value.log, opts);
    if (!again.ok) throw new Error('replay of the recorded log failed');
    expect(again.value.hash).toBe(a.value.hash);
  });
});
