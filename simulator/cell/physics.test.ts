/**
 * Physics the cell must get right, each check with its source beside it.
 */
import { describe, expect, it } from 'vitest';
import { createCell, type Cell } from './cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';
import { starterCell } from '@/simulator/demo/starter';
import type { CellDocument } from '@/simulator/schema/cell-document';
import { validateCellDocument } from '@/simulator/schema/validate';

type Doc = typeof pickAndPlaceCell;
const copy = <T>(d: T): T => structuredClone(d);

function make(doc: unknown, faults: unknown[] = []): Cell {
  const r = createCell(doc, { faults });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** The pick-and-place cell with its digital input card of `type` and the supply at `volts`. */
function withInputs(type: 1 | 2 | 3, volts?: number): Doc {
  const d = copy(pickAndPlaceCell) as Doc & { supply?: { volts: number } };
  const di = d.plc.modules.find((m) => m.id === 'plc-di0') as { inputType: number };
  di.inputType = type;
  if (volts !== undefined) d.supply = { volts };
  return d;
}

const wire = (c: Cell, id: string) => c.snapshot().wires.find((w) => w.id === id)!;
const input = (c: Cell, row: string) => c.readSignal(`in.${row}`);

describe('IEC 61131-2 input types on a 24 V DC supply', () => {
  // IEC 61131-2, 24 V DC current-sinking inputs (from memory): ON from 15 V (type 1) or 11 V
  // (types 2 and 3) up to 30 V; OFF up to 5 V; in between the transition band, where the
  // standard does not fix the reading — the engine holds the input's last state there.
  it('a supply set at 13 V: a closed contact holds its last state on type 1 inputs, reads ON on types 2 and 3', () => {
    for (const [type, closedReads] of [[1, 0], [2, 1], [3, 1]] as const) {
      const c = make(withInputs(type, 13));
      c.advance(20);
      expect(input(c, 'w-start')).toEqual({ ok: true, value: 0 });
      c.apply({ type: 'press', device: 'start' });
      c.advance(20);
      const w = wire(c, 'w-start');
      expect(w.level).toBe(13);
      expect(w.reading).toBe(type === 1 ? 'undefined' : 'on');
      expect(input(c, 'w-start')).toEqual({ ok: true, value: closedReads });
      c.dispose();
    }
  });

  it('a supply-sag card mid-run: a type 1 input that was ON stays ON in the band, and one that was OFF stays OFF', () => {
    const c = make(withInputs(1), [{ id: 'sag', kind: 'supply-sag', volts: 12, at: 1000 }]);
    c.apply({ type: 'press', device: 'start' });
    c.advance(900);
    expect(input(c, 'w-start')).toEqual({ ok: true, value: 1 });
    expect(input(c, 'w-part')).toEqual({ ok: true, value: 0 });
    c.advance(200); // the sag arrives at 1000 ms
    expect(c.snapshot().supply).toEqual({ volts: 12, withinTolerance: false });
    expect(wire(c, 'w-start')).toMatchObject({ level: 12, reading: 'undefined' });
    expect(input(c, 'w-start')).toEqual({ ok: true, value: 1 }); // held ON
    c.apply({ type: 'set-field', device: 'part', active: true });
    c.advance(50);
    expect(wire(c, 'w-part')).toMatchObject({ level: 12, reading: 'undefined' });
    expect(input(c, 'w-part')).toEqual({ ok: true, value: 0 }); // held OFF: the part is not seen
    c.apply({ type: 'clear-fault', id: 'sag' });
    c.advance(50);
    expect(input(c, 'w-part')).toEqual({ ok: true, value: 1 });
    expect(c.snapshot().supply).toEqual({ volts: 24, withinTolerance: true });
  });

  it('the supply tolerance is 20.4–28.8 V (IEC 61131-2 rated 24 V DC, −15 % / +20 %; from memory): outside it, a warning', () => {
    const warned = (volts: number) => {
      const v = validateCellDocument({ ...copy(pickAndPlaceCell), supply: { volts } });
      if (!v.ok) throw new Error(JSON.stringify(v.errors));
      return v.value.warnings.filter((w) => w.code === 'supply_out_of_tolerance').length;
    };
    expect([20.3, 20.4, 24, 28.8, 28.9].map(warned)).toEqual([1, 0, 0, 0, 1]);
    // The cell runs it anyway, and at 24 V every type reads a closed contact ON.
    for (const type of [1, 2, 3] as const) {
      const c = make(withInputs(type, 24));
      c.apply({ type: 'press', device: 'start' });
      c.advance(20);
      expect(wire(c, 'w-start')).toMatchObject({ level: 24, reading: 'on' });
      c.dispose();
    }
  });

  it('a leaky sensor (1.5 mA while off) lands in the transition band of a type 1 input but reads OFF on types 2 and 3', () => {
    // Our input model R = 0.8 · U_H min / I_H min (electrical/digital.ts): 6 kΩ, ≈1.47 kΩ,
    // 4.4 kΩ. 1.5 mA gives 9 V on type 1 (above U_L 5 V, current above its 0.5 mA: the band),
    // 2.2 V on type 2 (OFF by voltage) and 6.6 V at 1.5 mA on type 3 (OFF: I ≤ I_T min 1.5 mA).
    const expected = { 1: ['undefined', 9], 2: ['off', 2.2], 3: ['off', 6.6] } as const;
    for (const type of [1, 2, 3] as const) {
      const c = make(withInputs(type), [{ id: 'leak', kind: 'sensor-leakage', device: 'part', leakMa: 1.5 }]);
      c.apply({ type: 'set-field', device: 'part', active: true });
      c.advance(20);
      expect(input(c, 'w-part')).toEqual({ ok: true, value: 1 });
      c.apply({ type: 'set-field', device: 'part', active: false });
      c.advance(20);
      const w = wire(c, 'w-part');
      expect(w.reading).toBe(expected[type][0]);
      expect(w.level).toBeCloseTo(expected[type][1], 1);
      // Type 1 holds the last state (ON) inside the band: the part still "seen".
      expect(input(c, 'w-part')).toEqual({ ok: true, value: type === 1 ? 1 : 0 });
      c.dispose();
    }
  });
});

describe('analog counts follow the module\'s declared format and saturate', () => {
  // Right-aligned n-bit converter codes (common practice): unsigned 0..2^n − 1, signed
  // 0..2^(n−1) − 1 over the nominal span; beyond its reach a converter saturates.
  function starter(format: 'unsigned' | 'signed' | undefined, bits: number): Cell {
    const d = copy(starterCell) as unknown as CellDocument;
    const ai = d.plc.modules.find((m) => m.id === 'ai4') as Extract<CellDocument['plc']['modules'][number], { kind: 'analog-in' }>;
    ai.resolutionBits = bits;
    if (format) ai.format = format;
    // Read the word unsigned, so the count shows as the module writes it.
    const raw = d.plc.sheet.blocks.find((b) => b.id === 'speedRaw') as { params: { signed: boolean } };
    raw.params.signed = format === 'signed';
    return make(d);
  }
  const iw4 = (c: Cell) => c.readSignal('plc.%IW4');

  it('a 16-bit unsigned 4–20 mA module reads 12 mA as 32768, not capped at half scale', () => {
    const c = starter('unsigned', 16);
    c.apply({ type: 'set-analog', device: 'speed', value: 50 }); // 50 % of 4–20 mA = 12 mA
    c.advance(20);
    expect(iw4(c)).toEqual({ ok: true, value: 32768 });
    // The SPAN_MAP takes its raw span from the module: 0..65535 → 0..100 %.
    expect(c.readSignal('plc.speedPct.OUT')).toEqual({ ok: true, value: (32768 / 65535) * 100 });
  });

  it('a 16-bit signed module reads the span as 0..32767 and a lost loop as negative counts', () => {
    const s = starter('signed', 16);
    s.apply({ type: 'set-analog', device: 'speed', value: 50 });
    s.advance(20);
    expect(s.readSignal('plc.speedRaw.OUT')).toEqual({ ok: true, value: 16384 });
    s.apply({ type: 'inject-fault', fault: { id: 'lost', kind: 'analog-loss', device: 'speed' } });
    s.advance(20);
    expect(s.readSignal('plc.speedRaw.OUT')).toEqual({ ok: true, value: -8192 }); // 0 mA: (0 − 4) / 16 × 32767
  });

  it('a 12-bit module saturates at 4095 when the loop is shorted to the supply (the overflow reading), never a wrapped word', () => {
    const c = starter(undefined, 12);
    c.apply({ type: 'inject-fault', fault: { id: 's', kind: 'short-24v', row: 'w-speed' } });
    c.advance(20);
    expect(iw4(c)).toEqual({ ok: true, value: 4095 });
    expect(c.readSignal('plc.speedPct.OUT')).toEqual({ ok: true, value: 100 });
  });
});

describe('a boot time of 0', () => {
  it('powers up ready, not e-stopped: the first decision waits for the first input read (IEC 61131-3 cyclic model, from memory)', () => {
    const d = copy(pickAndPlaceCell);
    d.controller.bootMs = 0;
    const c = make(d);
    const states: string[] = [];
    for (let t = 0; t < 10; t++) {
      c.advance(10);
      states.push(c.snapshot().controller.state);
    }
    expect(states).not.toContain('eStopped');
    expect(states.at(-1)).toBe('ready');
  });
});

describe('panel colours against IEC 60204-1 (from memory: §10.2.1 push-button colours, §10.7.3 e-stop red on yellow)', () => {
  const warnings = (edit: (d: Doc) => void) => {
    const d = copy(pickAndPlaceCell);
    edit(d);
    const v = validateCellDocument(d);
    if (!v.ok) throw new Error(JSON.stringify(v.errors));
    return v.value.warnings.map((w) => `${w.code} ${w.path.join('.')}`);
  };
  const at = (id: string, d: Doc) => d.panel.findIndex((p) => p.id === id);

  it('the demo panel raises none', () => {
    expect(warnings(() => undefined)).toEqual([]);
  });

  it('a red start, a green stop, a green reset: each warned at its colour', () => {
    expect(warnings((d) => Object.assign(d.panel[at('start', d)], { function: 'start', colour: 'red' }))).toEqual([`colour_for_function panel.${at('start', pickAndPlaceCell)}.colour`]);
    expect(warnings((d) => Object.assign(d.panel[at('stop', d)], { function: 'stop', colour: 'green' }))).toEqual([`colour_for_function panel.${at('stop', pickAndPlaceCell)}.colour`]);
    expect(warnings((d) => Object.assign(d.panel[at('reset', d)], { function: 'reset', colour: 'green' }))).toHaveLength(1);
    // A green start and a red stop are what the standard asks for; `other` has no rule.
    expect(warnings((d) => Object.assign(d.panel[at('start', d)], { function: 'start', colour: 'green' }))).toEqual([]);
    expect(warnings((d) => Object.assign(d.panel[at('stop', d)], { function: 'stop', colour: 'red' }))).toEqual([]);
    expect(warnings((d) => Object.assign(d.panel[at('start', d)], { function: 'other', colour: 'red' }))).toEqual([]);
  });

  it('an e-stop that is not red, or not on yellow', () => {
    const i = at('estop', pickAndPlaceCell);
    expect(warnings((d) => Object.assign(d.panel[i], { colour: 'blue' }))).toEqual([`colour_for_function panel.${i}.colour`]);
    expect(warnings((d) => Object.assign(d.panel[i], { background: 'grey' }))).toEqual([`colour_for_function panel.${i}.background`]);
    expect(warnings((d) => Object.assign(d.panel[i], { background: 'yellow' }))).toEqual([]);
  });
});
