import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createProcessImage, readAddress, writeAddress } from '@/simulator/address/process-image';
import type { LogicSheetInput } from './api';
import { BLOCK_TYPES, blockCatalogue, blockPorts, portTypesCompatible, type BlockType } from './catalogue';
import { clonePlcState, compileSheet, compileSheetWith, deserializePlcState, serializePlcState } from './compile';
import { interpretSheet } from './interpret';

type B = LogicSheetInput['blocks'][number];
const blk = (id: string, type: BlockType, params: Record<string, unknown> = {}): B =>
  ({ id, type, params, position: { x: 0, y: 0 } }) as B;
const wire = (id: string, from: string, fp: string, to: string, tp: string) => ({ id, from: { block: from, port: fp }, to: { block: to, port: tp } });
const codes = (r: { ok: boolean; errors?: { code: string; path: (string | number)[] }[] }) =>
  r.ok ? [] : (r.errors ?? []).map((e) => [e.code, e.path.join('.')]);

describe('sheet validation: every problem, with its path', () => {
  it('reports unknown types, negative times, bad addresses and coil areas together', () => {
    const r = compileSheet({
      scanPeriodMs: 10,
      blocks: [blk('a', 'TON', { PT: -5 }), { id: 'b', type: 'BLINKER', params: {}, position: { x: 0, y: 0 } }, blk('c', 'COIL', { address: '%IX0.0' }), blk('d', 'NO_CONTACT', { address: '%IX0.9' })],
      connections: [],
    });
    expect(codes(r)).toEqual([
      ['negative_time', 'blocks.0.params.PT'],
      ['unknown_block_type', 'blocks.1.type'],
      ['address_area', 'blocks.2.params.address'],
      ['address_range', 'blocks.3.params.address'],
    ]);
  });
  it('reports dangling connections, unknown ports, type mismatches, double drivers and duplicate ids', () => {
    const r = compileSheet({
      scanPeriodMs: 10,
      blocks: [blk('a', 'NO_CONTACT', { address: '%IX0.0' }), blk('t', 'TON', { PT: 10 }), blk('g', 'GT'), blk('a', 'NOT')],
      connections: [
        wire('w1', 'ghost', 'Q', 't', 'IN'),
        wire('w2', 'a', 'NOPE', 't', 'IN'),
        wire('w3', 'a', 'Q', 'g', 'IN1'),
        wire('w4', 'a', 'Q', 't', 'IN'),
        wire('w5', 'a', 'Q', 't', 'IN'),
      ],
    });
    expect(codes(r)).toEqual([
      ['duplicate_id', 'blocks.3.id'],
      ['dangling_connection', 'connections.0.from.block'],
      ['unknown_port', 'connections.1.from.port'],
      ['type_mismatch', 'connections.2'],
      ['multiple_drivers', 'connections.4.to'],
    ]);
  });
  it('rejects an algebraic loop naming its blocks, and accepts the same loop through PREV_BOOL', () => {
    const loop = compileSheet({
      scanPeriodMs: 10,
      blocks: [blk('x', 'NO_CONTACT', { address: '%IX0.0' }), blk('o', 'OR'), blk('n', 'AND'), blk('k', 'NOT')],
      connections: [wire('c1', 'x', 'Q', 'o', 'IN1'), wire('c2', 'o', 'Q', 'n', 'IN1'), wire('c3', 'n', 'Q', 'k', 'IN'), wire('c4', 'k', 'Q', 'o', 'IN2')],
    });
    expect(loop.ok).toBe(false);
    if (!loop.ok) {
      expect(loop.errors).toHaveLength(1);
      expect(loop.errors[0].code).toBe('algebraic_loop');
      expect(loop.errors[0].related).toEqual(['o', 'n', 'k']);
      expect(loop.errors[0].path).toEqual(['connections', 1]);
    }
    const broken = compileSheet({
      scanPeriodMs: 10,
      blocks: [blk('x', 'NO_CONTACT', { address: '%IX0.0' }), blk('o', 'OR'), blk('p', 'PREV_BOOL'), blk('k', 'NOT')],
      connections: [wire('c1', 'x', 'Q', 'o', 'IN1'), wire('c2', 'o', 'Q', 'k', 'IN'), wire('c3', 'k', 'Q', 'p', 'IN'), wire('c4', 'p', 'Q', 'o', 'IN2')],
    });
    expect(broken.ok).toBe(true);
    // A block wired to itself is a loop too.
    expect(codes(compileSheet({ scanPeriodMs: 10, blocks: [blk('s', 'NOT')], connections: [wire('c', 's', 'Q', 's', 'IN')] }))).toEqual([['algebraic_loop', 'connections.0']]);
  });
  it('rejects an oversized sheet and a bad scan period', () => {
    const blocks = Array.from({ length: 20_001 }, (_, i) => blk(`b${i}`, 'NOT'));
    expect(codes(compileSheet({ scanPeriodMs: 0, blocks, connections: [] }))).toEqual([
      ['invalid_scan_period', 'scanPeriodMs'],
      ['too_large', 'blocks'],
    ]);
  });
});

describe('scan semantics', () => {
  it('start/stop seal-in: a coil read back by a contact keeps itself on (last scan value)', () => {
    // Rung: (start OR motor) AND NOT stop → motor. Stop is wired NC in the field, so %IX0.1 is 1 when healthy.
    const sheet: LogicSheetInput = {
      scanPeriodMs: 10,
      blocks: [
        blk('start', 'NO_CONTACT', { address: '%IX0.0' }),
        blk('hold', 'NO_CONTACT', { address: '%QX0.0' }),
        blk('or', 'OR'),
        blk('stop', 'NO_CONTACT', { address: '%IX0.1' }),
        blk('motor', 'COIL', { address: '%QX0.0' }),
      ],
      connections: [wire('a', 'start', 'Q', 'or', 'IN1'), wire('b', 'hold', 'Q', 'or', 'IN2'), wire('c', 'or', 'Q', 'stop', 'IN'), wire('d', 'stop', 'Q', 'motor', 'IN')],
    };
    const c = compileSheet(sheet);
    if (!c.ok) throw new Error(JSON.stringify(c.errors));
    const s = c.value.createState();
    const img = createProcessImage();
    const run = (start: boolean, stopHealthy: boolean) => {
      writeAddress(img, '%IX0.0', start);
      writeAddress(img, '%IX0.1', stopHealthy);
      c.value.scan(s, img);
      return readAddress(img, '%QX0.0');
    };
    expect(run(false, true)).toBe(0);
    expect(run(true, true)).toBe(1);
    expect(run(false, true)).toBe(1); // sealed in
    expect(run(false, false)).toBe(0); // stop breaks the seal
    expect(run(false, true)).toBe(0);
    expect(s.scans).toBe(5);
  });
  it('numeric blocks: word in, span map, limit, compare, select, word out', () => {
    const sheet: LogicSheetInput = {
      scanPeriodMs: 10,
      blocks: [
        blk('raw', 'WORD_IN', { address: '%IW2' }),
        // No raw span given: SPAN_MAP takes the span of the word it reads (%IW2 unsigned: 0..65535).
        blk('sc', 'SPAN_MAP', { outMin: 0, outMax: 10 }),
        blk('lo', 'CONST', { value: 1 }),
        blk('hi', 'CONST', { value: 8 }),
        blk('lim', 'LIMIT'),
        blk('gt', 'GT'),
        blk('sel', 'SEL'),
        blk('out', 'WORD_OUT', { address: '%QW0' }),
      ],
      connections: [
        wire('a', 'raw', 'OUT', 'sc', 'IN'),
        wire('b', 'sc', 'OUT', 'lim', 'IN'),
        wire('c', 'lo', 'OUT', 'lim', 'MN'),
        wire('d', 'hi', 'OUT', 'lim', 'MX'),
        wire('e', 'sc', 'OUT', 'gt', 'IN1'),
        wire('f', 'hi', 'OUT', 'gt', 'IN2'),
        wire('g', 'gt', 'Q', 'sel', 'G'),
        wire('h', 'lim', 'OUT', 'sel', 'IN0'),
        wire('i', 'hi', 'OUT', 'sel', 'IN1'),
        wire('j', 'sel', 'OUT', 'out', 'IN'),
      ],
    };
    const c = compileSheet(sheet);
    if (!c.ok) throw new Error(JSON.stringify(c.errors));
    const s = c.value.createState();
    const img = createProcessImage();
    writeAddress(img, '%IW2', 26214); // 26214 / 65535 × 10 = 4.0 exactly
    c.value.scan(s, img);
    expect(c.value.readOutput(s, 'sc', 'OUT')).toBe(4);
    expect(readAddress(img, '%QW0')).toBe(4);
    writeAddress(img, '%IW2', 65535); // 10.0 > 8 → SEL picks 8
    c.value.scan(s, img);
    expect(c.value.readOutput(s, 'gt', 'Q')).toBe(true);
    expect(readAddress(img, '%QW0')).toBe(8);
    // Snapshots: clone and JSON round trip keep every value.
    const json = JSON.parse(JSON.stringify(serializePlcState(s)));
    expect(Array.from(deserializePlcState(json).values)).toEqual(Array.from(s.values));
    expect(clonePlcState(s).values).not.toBe(s.values);
  });
});

// ---------- property tests ----------

const bitAddr = fc.tuple(fc.constantFrom('I', 'Q', 'M'), fc.integer({ min: 0, max: 1 }), fc.integer({ min: 0, max: 7 })).map(([a, by, bi]) => `%${a}X${by}.${bi}`);
const outAddr = fc.tuple(fc.constantFrom('Q', 'M'), fc.integer({ min: 0, max: 1 }), fc.integer({ min: 0, max: 7 })).map(([a, by, bi]) => `%${a}X${by}.${bi}`);

function paramsFor(type: BlockType): fc.Arbitrary<Record<string, unknown>> {
  switch (type) {
    case 'NO_CONTACT':
    case 'NC_CONTACT':
      return bitAddr.map((address) => ({ address }));
    case 'COIL':
    case 'SET_COIL':
    case 'RESET_COIL':
      return outAddr.map((address) => ({ address }));
    case 'AND':
    case 'OR':
    case 'XOR':
      return fc.integer({ min: 2, max: 4 }).map((inputs) => ({ inputs }));
    case 'TON':
    case 'TOF':
    case 'TP':
      return fc.integer({ min: 0, max: 60 }).map((PT) => ({ PT }));
    case 'CTU':
    case 'CTD':
    case 'CTUD':
      return fc.integer({ min: -2, max: 4 }).map((PV) => ({ PV }));
    case 'SPAN_MAP':
      return fc.record({ inMin: fc.integer({ min: -5, max: 5 }), inMax: fc.integer({ min: 6, max: 20 }), outMin: fc.integer({ min: -10, max: 10 }), outMax: fc.integer({ min: -10, max: 10 }), clamp: fc.boolean() });
    case 'WORD_IN':
      return fc.tuple(fc.constantFrom('I', 'Q', 'M'), fc.constantFrom('B', 'W', 'D'), fc.boolean()).map(([a, s, signed]) => ({ address: `%${a}${s}0`, signed }));
    case 'WORD_OUT':
      return fc.tuple(fc.constantFrom('Q', 'M'), fc.constantFrom('B', 'W')).map(([a, s]) => ({ address: `%${a}${s}0` }));
    case 'CONST':
      return fc.double({ min: -100, max: 100, noNaN: true }).map((value) => ({ value }));
    case 'CONST_BOOL':
      return fc.boolean().map((value) => ({ value }));
    case 'PREV_BOOL':
      return fc.boolean().map((initial) => ({ initial }));
    case 'PREV_NUM':
      return fc.integer({ min: -3, max: 3 }).map((initial) => ({ initial }));
    default:
      return fc.constant({});
  }
}

/** Random well-typed sheets: forward wires only, plus feedback wires into PREV blocks. */
const randomSheet = fc
  .array(fc.constantFrom(...BLOCK_TYPES).chain((type) => paramsFor(type).map((params) => ({ type, params }))), { minLength: 1, maxLength: 25 })
  .chain((specs) => {
    const blocks = specs.map((s, i) => blk(`b${i}`, s.type, s.params));
    const slots: { to: number; port: string; type: string; prev: boolean }[] = [];
    specs.forEach((s, i) => {
      for (const p of blockPorts(s.type, s.params).inputs) slots.push({ to: i, port: p.name, type: p.type, prev: !!blockCatalogue[s.type].breaksLoops });
    });
    return fc.tuple(fc.constant(blocks), fc.array(fc.nat(), { minLength: slots.length, maxLength: slots.length })).map(([bs, picks]) => {
      const connections: ReturnType<typeof wire>[] = [];
      slots.forEach((slot, k) => {
        const candidates: [number, string][] = [];
        specs.forEach((s, j) => {
          if (!(j < slot.to || slot.prev)) return;
          for (const o of blockPorts(s.type, s.params).outputs) if (portTypesCompatible(o.type, slot.type as 'BOOL')) candidates.push([j, o.name]);
        });
        // About one in four inputs stays unconnected and takes its default.
        if (candidates.length === 0 || picks[k] % 4 === 0) return;
        const [j, port] = candidates[picks[k] % candidates.length];
        connections.push(wire(`c${k}`, `b${j}`, port, `b${slot.to}`, slot.port));
      });
      return { scanPeriodMs: 10, blocks: bs, connections } as LogicSheetInput;
    });
  });

describe('property: compiled sheet ≡ reference interpreter', () => {
  it('on random acyclic sheets and random input sequences, with default and tiny chunks', () => {
    fc.assert(
      fc.property(
        randomSheet,
        fc.array(fc.tuple(fc.uint8Array({ minLength: 8, maxLength: 8 }), fc.constantFrom(0, 5, 10, 20)), { minLength: 1, maxLength: 20 }),
        // Tiny chunks put wires across function boundaries (slot loads instead of locals)
        // and the PREV epilogue after a chunk that may or may not hold the PREV inputs.
        fc.integer({ min: 1, max: 5 }),
        // Starting %Q and %M bytes, so set/reset coils and contacts on outputs see both bit values.
        fc.uint8Array({ minLength: 4, maxLength: 4 }),
        (sheet, steps, perChunk, start) => {
          const c = compileSheet(sheet);
          const k = compileSheetWith(sheet, { blocksPerChunk: perChunk });
          const r = interpretSheet(sheet);
          expect(c.ok).toBe(true);
          expect(k.ok).toBe(true);
          expect(r.ok).toBe(true);
          if (!c.ok || !k.ok || !r.ok) return;
          expect(c.value.order).toEqual(r.value.order);
          expect(k.value.order).toEqual(r.value.order);
          const s = c.value.createState();
          const t = k.value.createState();
          const a = createProcessImage();
          const b = createProcessImage();
          const d = createProcessImage();
          for (const img of [a, b, d]) {
            img.Q.set(start.subarray(0, 2));
            img.M.set(start.subarray(2, 4));
          }
          for (const [inputs, dt] of steps) {
            a.I.set(inputs);
            b.I.set(inputs);
            d.I.set(inputs);
            c.value.scan(s, a, dt);
            k.value.scan(t, d, dt);
            r.value.scan(b, dt);
            const expected = r.value.readBlockOutputs();
            expect(c.value.readBlockOutputs(s)).toEqual(expected);
            expect(k.value.readBlockOutputs(t)).toEqual(expected);
            // The state arrays are the wires: identical whatever the chunking.
            expect(Array.from(t.values)).toEqual(Array.from(s.values));
            for (const slot of c.value.outputSlots) {
              const x = expected[slot.block][slot.port];
              expect(c.value.readOutput(s, slot.block, slot.port)).toBe(x);
              expect(s.values[slot.slot]).toBe(typeof x === 'boolean' ? Number(x) : x);
            }
            for (const img of [a, d]) {
              expect(Array.from(img.Q.subarray(0, 8))).toEqual(Array.from(b.Q.subarray(0, 8)));
              expect(Array.from(img.M.subarray(0, 8))).toEqual(Array.from(b.M.subarray(0, 8)));
            }
          }
        },
      ),
      { numRuns: 300 },
    );
    // Three compilations and an interpreter per run: allow for a busy machine.
  }, 30_000);
});

describe('property: malformed sheets are rejected with paths', () => {
  it('a corrupted field anywhere yields a problem whose path points at it', () => {
    fc.assert(
      fc.property(randomSheet, fc.nat(), fc.constantFrom('type', 'position', 'id', 'conn'), (sheet, k, what) => {
        const doc = structuredClone(sheet) as { blocks: Record<string, unknown>[]; connections: { from: { block: string } }[] };
        let expected: (string | number)[];
        if (what === 'conn' && doc.connections.length > 0) {
          const j = k % doc.connections.length;
          doc.connections[j].from.block = 'nowhere';
          expected = ['connections', j, 'from', 'block'];
        } else {
          const i = k % doc.blocks.length;
          if (what === 'type') doc.blocks[i].type = 'NO_SUCH_BLOCK';
          else if (what === 'id') doc.blocks[i].id = '';
          else doc.blocks[i].position = { x: 'left' };
          expected = ['blocks', i, what === 'conn' ? 'position' : what];
          if (what === 'conn') doc.blocks[i].position = { x: 'left' };
        }
        const r = compileSheet(doc);
        expect(r.ok).toBe(false);
        if (!r.ok) expect(r.errors.some((e) => expected.every((p, n) => e.path[n] === p))).toBe(true);
      }),
      { numRuns: 200 },
    );
  });
});

describe('SPAN_MAP: its raw span', () => {
  const fed = (params: Record<string, unknown>, word = '%IW2', signed = false): LogicSheetInput => ({
    scanPeriodMs: 10,
    blocks: [blk('raw', 'WORD_IN', { address: word, signed }), blk('sp', 'SPAN_MAP', params)],
    connections: [wire('a', 'raw', 'OUT', 'sp', 'IN')],
  });
  const out = (sheet: LogicSheetInput, raw: number, options = {}) => {
    const c = compileSheetWith(sheet, options);
    if (!c.ok) throw new Error(JSON.stringify(c.errors));
    const s = c.value.createState();
    const img = createProcessImage();
    writeAddress(img, '%IW2', raw);
    c.value.scan(s, img);
    return c.value.readOutput(s, 'sp', 'OUT');
  };

  it('comes from the analog module IN reads when the cell knows it, else from the word as read', () => {
    const sheet = fed({ outMin: 0, outMax: 100 });
    // A 12-bit unsigned module: 0..4095 over the span.
    expect(out(sheet, 4095, { analogSpan: () => ({ lo: 0, hi: 4095 }) })).toBe(100);
    // No module known: the unsigned word's own range 0..65535, or 0..32767 read signed.
    expect(out(sheet, 65535)).toBe(100);
    expect(out(fed({ outMin: 0, outMax: 100 }, '%IW2', true), 32767)).toBe(100);
    // Given explicitly, the parameters win.
    expect(out(fed({ inMin: 0, inMax: 1000, outMin: 0, outMax: 100 }), 500, { analogSpan: () => ({ lo: 0, hi: 4095 }) })).toBe(50);
  });

  it('is a problem when neither given nor fed by a WORD_IN, or given by half', () => {
    const alone = compileSheet({ scanPeriodMs: 10, blocks: [blk('sp', 'SPAN_MAP', { outMin: 0, outMax: 1 })], connections: [] });
    expect(alone.ok ? [] : alone.errors.map((p) => [p.code, p.path.join('.')])).toEqual([['raw_span_unknown', 'blocks.0.params.inMin']]);
    const half = compileSheet(fed({ inMin: 0, outMin: 0, outMax: 1 }));
    expect(half.ok ? [] : half.errors.map((p) => p.code)).toEqual(['invalid_span']);
  });

  it('old documents load: a block of the former name SCALE reads as SPAN_MAP with its own span', () => {
    const sheet = fed({ inMin: 0, inMax: 4000, outMin: 0, outMax: 100 });
    (sheet.blocks[1] as { type: string }).type = 'SCALE';
    const c = compileSheet(sheet);
    if (!c.ok) throw new Error(JSON.stringify(c.errors));
    expect(c.value.sheet.blocks[1].type).toBe('SPAN_MAP');
    expect(out(sheet, 2000)).toBe(50);
  });
});
