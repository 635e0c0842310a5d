/**
 * Encodes one scan of a logic sheet as a {@link TransitionSystem}: the blocks are solved
 * symbolically in the engine's execution order, reading and writing a symbolic process
 * image, exactly as `simulator/plc/compile.ts` and the reference interpreter
 * (`simulator/plc/interpret.ts`) run them. Contacts see what a coil earlier in the order
 * wrote this scan and last scan's value otherwise; %QX/%MX bits persist into the next scan.
 *
 * Treatment per block family (each block in the cone of a rule is listed in its verdict):
 * - contacts, coils, AND/OR/XOR/NOT, SR/RS, R_TRIG/F_TRIG, PREV_BOOL, CONST_BOOL: exact.
 *   Edge memories start FALSE, so an R_TRIG sees a CLK that is on in the first scan as a
 *   rising edge and an F_TRIG a CLK that is off (IEC 61131-3 R_TRIG/F_TRIG bodies).
 * - CTU / CTD with a constant PV: exact for Q, with a bounded count — CTU keeps
 *   min(CV, PV), CTD keeps max(CV, 0) (Q depends on nothing else). CTUD: exact, the full
 *   INT count in 16 bits. A PV from a wire: Q free each scan (abstracted).
 * - TON / TOF / TP with a constant PT: exact when PT is reached within the horizon
 *   (`timerHorizonScans`), counting elapsed scans as state (N scans, the ET sequence the
 *   engine accumulates); otherwise abstracted to what IEC 61131-3 still guarantees
 *   (below). A PT from a wire is abstracted the same way.
 * - Comparisons over numbers (GT…LT): exact when both operands are constants, else Q is
 *   free each scan. WORD_OUT over a bit a contact or rule reads: exact for a constant,
 *   else those bits are free after it runs. Numbers themselves are never encoded.
 */
import { parseAddress, formatAddress } from '@/simulator/address/address';
import type { AnalysedSheet } from '@/simulator/plc/validate';
import type { SheetBlock } from '@/simulator/plc/sheet-schema';
import { FALSE, TRUE, neg, constBits, eqConst, increment, decrement, leConst, muxBits, widthFor, type Lit } from './aig';
import { TransitionSystem, type EncodingNote } from './system';

/** Encoding options. */
export type EncodeOptions = {
  /** Longest timer encoded exactly, in scans (PT / scan period); longer ones are abstracted. */
  timerHorizonScans: number;
  /** Canonical %QX/%MX/%IX bit addresses the rules read (so they are tracked). */
  watch: readonly string[];
};

/** A sheet's scan as a transition system, with the post-scan value of every tracked bit. */
export type EncodedSheet = {
  system: TransitionSystem;
  /** The value of a bit address after the scan (an %IX bit: this scan's input). */
  signal(address: string): Lit;
  /** Block ids by index, for notes and diagnostics. */
  blockIds: string[];
};

/** INT limits of counters (IEC 61131-3 INT, as compile.ts). */
const CV_MIN = -32768;

/** Canonical text of a bit address, or null. */
export function canonicalBit(text: string): string | null {
  const r = parseAddress(text);
  return r.ok && r.value.size === 'X' ? formatAddress(r.value) : null;
}

/**
 * Scans a timer needs to reach PT: the first n with ET_n ≥ PT, where ET_0 = 0 and
 * ET_{k+1} = min(PT, ET_k + dt) — the engine's own accumulation, so float presets and
 * periods give the same count. Null beyond `limit` scans.
 */
export function scansToReach(pt: number, dt: number, limit: number): number | null {
  const p = pt > 0 ? pt : 0;
  let et = 0;
  for (let n = 0; n <= limit; n++) {
    if (et >= p) return n;
    et = Math.min(p, et + dt);
  }
  return null;
}

/** Encodes an analysed sheet. */
export function encodeSheet(a: AnalysedSheet, options: EncodeOptions): EncodedSheet {
  const ts = new TransitionSystem();
  const g = ts.aig;
  const blocks = a.sheet.blocks;
  const dt = a.sheet.scanPeriodMs;
  const note = (i: number, treatment: EncodingNote['treatment'], detail: string) =>
    ts.notes.set(i, { block: blocks[i].id, type: blocks[i].type, treatment, detail });

  // ---- the symbolic image: bits a contact reads, a coil writes, or a rule watches
  const relevant = new Set<string>();
  const written = new Set<string>();
  for (const b of blocks) {
    if (b.type === 'NO_CONTACT' || b.type === 'NC_CONTACT') relevant.add(canonicalBit(b.params.address) as string);
    if (b.type === 'COIL' || b.type === 'SET_COIL' || b.type === 'RESET_COIL') {
      const x = canonicalBit(b.params.address) as string;
      relevant.add(x);
      written.add(x);
    }
  }
  for (const w of options.watch) relevant.add(w);
  blocks.forEach((b) => {
    if (b.type !== 'WORD_OUT') return;
    for (const x of bitsOf(b.params.address)) if (relevant.has(x)) written.add(x);
  });
  const image = new Map<string, Lit>();
  // Written Q/M bits are state (they persist); unwritten ones stay 0 from the start.
  for (const x of [...written].sort()) image.set(x, ts.addState(false, x, { address: x }));
  const imageStart = new Map(image);
  const readBit = (x: string): Lit => (x.startsWith('%I') ? ts.input(x) : (image.get(x) ?? FALSE));

  // ---- block outputs
  const bools = new Map<string, Lit>();
  const nums = new Map<string, number>();
  const key = (i: number, port: string) => `${i}\u0000${port}`;
  const params = (b: SheetBlock) => b.params as Record<string, unknown>;
  const boolIn = (i: number, port: string): Lit => {
    const d = a.drivers[i].get(port);
    if (d) return bools.get(key(d.block, d.port)) as Lit;
    const spec = a.ports[i].inputs.find((p) => p.name === port);
    if (!spec) throw new Error(`no port ${port}`);
    const v = spec.fromParam ? params(blocks[i])[spec.fromParam] : spec.default;
    return v ? TRUE : FALSE;
  };
  /** A numeric input's value when it is a constant (a parameter, an unconnected default, a CONST). */
  const numIn = (i: number, port: string): number | undefined => {
    const d = a.drivers[i].get(port);
    if (d) return nums.get(key(d.block, d.port));
    const spec = a.ports[i].inputs.find((p) => p.name === port);
    if (!spec) throw new Error(`no port ${port}`);
    return Number(spec.fromParam ? params(blocks[i])[spec.fromParam] : spec.default);
  };
  const prevNext: { lit: Lit; i: number }[] = [];

  for (const i of a.order) {
    const b = blocks[i];
    const id = b.id;
    const set = (port: string, lit: Lit) => bools.set(key(i, port), lit);
    switch (b.type) {
      case 'NO_CONTACT':
        set('Q', g.and(boolIn(i, 'IN'), readBit(canonicalBit(b.params.address) as string)));
        break;
      case 'NC_CONTACT':
        set('Q', g.and(boolIn(i, 'IN'), neg(readBit(canonicalBit(b.params.address) as string))));
        break;
      case 'COIL':
      case 'SET_COIL':
      case 'RESET_COIL': {
        const x = canonicalBit(b.params.address) as string;
        const c = boolIn(i, 'IN');
        const cur = image.get(x) as Lit;
        image.set(x, b.type === 'COIL' ? c : b.type === 'SET_COIL' ? g.or(cur, c) : g.and(cur, neg(c)));
        set('Q', c);
        break;
      }
      case 'AND':
      case 'OR':
      case 'XOR': {
        const xs = a.ports[i].inputs.map((p) => boolIn(i, p.name));
        set('Q', b.type === 'AND' ? g.andAll(xs) : b.type === 'OR' ? g.orAll(xs) : g.xorAll(xs));
        break;
      }
      case 'NOT':
        set('Q', neg(boolIn(i, 'IN')));
        break;
      case 'SR': {
        const q = ts.addState(false, `${id}.Q1`, { block: i });
        const next = g.or(boolIn(i, 'S1'), g.and(neg(boolIn(i, 'R')), q));
        ts.setNext(q, next);
        set('Q1', next);
        break;
      }
      case 'RS': {
        const q = ts.addState(false, `${id}.Q1`, { block: i });
        const next = g.and(neg(boolIn(i, 'R1')), g.or(boolIn(i, 'S'), q));
        ts.setNext(q, next);
        set('Q1', next);
        break;
      }
      case 'R_TRIG':
      case 'F_TRIG': {
        // IEC 61131-3 R_TRIG: Q := CLK AND NOT M; M := CLK. F_TRIG: Q := NOT CLK AND NOT M; M := NOT CLK.
        const m = ts.addState(false, `${id}.M`, { block: i });
        const clk = b.type === 'R_TRIG' ? boolIn(i, 'CLK') : neg(boolIn(i, 'CLK'));
        set('Q', g.and(clk, neg(m)));
        ts.setNext(m, clk);
        break;
      }
      case 'TON':
      case 'TOF':
      case 'TP':
        set('Q', encodeTimer(ts, i, id, b.type, boolIn(i, 'IN'), numIn(i, 'PT'), dt, options.timerHorizonScans, note));
        break;
      case 'CTU':
      case 'CTD':
      case 'CTUD':
        encodeCounter(ts, i, b, boolIn, numIn(i, 'PV'), set, note);
        break;
      case 'GT':
      case 'GE':
      case 'EQ':
      case 'NE':
      case 'LE':
      case 'LT': {
        const x = numIn(i, 'IN1');
        const y = numIn(i, 'IN2');
        if (x !== undefined && y !== undefined) set('Q', compareConst(b.type, x, y) ? TRUE : FALSE);
        else {
          set('Q', ts.addFree(`${id}.Q`, i));
          note(i, 'abstracted', 'compares numbers (word, analog, count or time values), which proofs do not model: Q is free every scan');
        }
        break;
      }
      case 'MOVE': {
        const x = numIn(i, 'IN');
        if (x !== undefined) nums.set(key(i, 'OUT'), x);
        break;
      }
      case 'CONST':
        nums.set(key(i, 'OUT'), b.params.value);
        break;
      case 'CONST_BOOL':
        set('Q', b.params.value ? TRUE : FALSE);
        break;
      case 'PREV_BOOL': {
        const q = ts.addState(b.params.initial, `${id}.Q`, { block: i });
        set('Q', q);
        prevNext.push({ lit: q, i });
        break;
      }
      case 'WORD_OUT': {
        const hit = bitsOf(b.params.address).filter((x) => image.has(x));
        if (hit.length === 0) break;
        const x = numIn(i, 'IN');
        const span = bitsOf(b.params.address);
        if (x !== undefined) {
          // As the engine writes it: rounded, non-finite as 0, the low bits kept.
          const v = Number.isFinite(x) ? Math.round(x) : 0;
          for (const bit of hit) {
            const k = span.indexOf(bit);
            image.set(bit, Math.floor(v / 2 ** k) % 2 !== 0 ? TRUE : FALSE);
          }
        } else {
          for (const bit of hit) image.set(bit, ts.addFree(`${id}→${bit}`, i));
          note(i, 'abstracted', `writes a computed number over ${hit.join(', ')}, which a contact or rule reads: those bits are free after it runs`);
        }
        break;
      }
      // Numeric-only blocks: their values are not encoded (consumers that turn them into BOOLs are abstracted).
      case 'SEL':
      case 'LIMIT':
      case 'SPAN_MAP':
      case 'WORD_IN':
      case 'PREV_NUM':
        break;
    }
  }
  // Previous-scan blocks latch their input after the whole sheet is solved.
  for (const p of prevNext) ts.setNext(p.lit, boolIn(p.i, 'IN'));
  for (const [x, start] of imageStart) ts.setNext(start, image.get(x) as Lit);

  return {
    system: ts,
    blockIds: blocks.map((b) => b.id),
    signal(address: string): Lit {
      if (address.startsWith('%I')) return ts.input(address);
      if (!relevant.has(address)) throw new Error(`${address} was not watched when the sheet was encoded`);
      return image.get(address) ?? FALSE;
    },
  };
}

/** Canonical bit addresses a byte/word/double-word address covers, bit 0 first (little-endian, see address.ts). */
function bitsOf(text: string): string[] {
  const r = parseAddress(text);
  if (!r.ok) return [];
  const { area, byte, size } = r.value;
  const bytes = size === 'B' ? 1 : size === 'W' ? 2 : size === 'D' ? 4 : 0;
  const out: string[] = [];
  for (let k = 0; k < bytes * 8; k++) out.push(`%${area}X${byte + (k >> 3)}.${k & 7}`);
  return out;
}

function compareConst(type: 'GT' | 'GE' | 'EQ' | 'NE' | 'LE' | 'LT', x: number, y: number): boolean {
  switch (type) {
    case 'GT':
      return x > y;
    case 'GE':
      return x >= y;
    case 'EQ':
      return x === y;
    case 'NE':
      return x !== y;
    case 'LE':
      return x <= y;
    case 'LT':
      return x < y;
  }
}

type Note = (i: number, treatment: EncodingNote['treatment'], detail: string) => void;

/** A bounded count 0..max as state bits with a domain constraint; returns the bits. */
function countBits(ts: TransitionSystem, i: number, role: string, max: number, init = 0): Lit[] {
  const w = widthFor(max);
  const initBits = constBits(init, w);
  const bits = Array.from({ length: w }, (_, k) => ts.addState(initBits[k] === TRUE, `${role}[${k}]`, { block: i }));
  if (max < 2 ** w - 1) ts.constraints.push({ lit: leConst(ts.aig, bits, max), owner: role });
  return bits;
}

/** Sets the next value of count bits. */
function setCount(ts: TransitionSystem, bits: Lit[], next: Lit[]): void {
  bits.forEach((b, k) => ts.setNext(b, next[k]));
}

/**
 * TON / TOF / TP. Exact: `was` (IN last scan), for TOF/TP the previous Q, and the scans
 * elapsed since the timer started, 0..N (N scans to reach PT). The count is kept at 0
 * whenever Q no longer depends on it, so equal futures share one state.
 */
function encodeTimer(ts: TransitionSystem, i: number, role: string, type: 'TON' | 'TOF' | 'TP', x: Lit, pt: number | undefined, dt: number, horizon: number, note: Note): Lit {
  const g = ts.aig;
  const was = ts.addState(false, `${role}.was`, { block: i });
  ts.setNext(was, x);
  const n = pt === undefined ? null : scansToReach(pt, dt, horizon);
  if (n === null) {
    // Abstracted, keeping what IEC 61131-3 guarantees whatever PT is (see each case).
    const q = ts.addState(false, `${role}.Q`, { block: i });
    const f = ts.addFree(`${role}.Q?`, i);
    const constPt = pt !== undefined; // then PT > horizon scans, so PT > 0
    let next: Lit;
    if (type === 'TON') {
      // Q only while IN is on; with PT > 0 not on IN's first scan; once on, on until IN drops (PT constant).
      next = constPt ? g.and(g.and(x, was), g.or(q, f)) : g.and(x, f);
    } else if (type === 'TOF') {
      // Q on while IN is on, and (PT > 0) on the scan IN falls; afterwards it may drop at any scan and stays off until IN.
      next = constPt ? g.or(x, g.or(g.and(was, neg(x)), g.and(q, f))) : g.or(x, g.and(g.or(was, q), f));
    } else {
      // A pulse starts only on a rising IN while none runs; a running pulse may end at any scan.
      next = g.ite(q, f, constPt ? g.and(x, neg(was)) : g.and(g.and(x, neg(was)), f));
    }
    ts.setNext(q, next);
    note(
      i,
      'abstracted',
      pt === undefined
        ? `PT comes from a wire, so Q is free within what IEC 61131-3 ${type} allows`
        : `PT ${pt} ms is more than ${horizon} scans of ${dt} ms, so Q is free within what IEC 61131-3 ${type} allows`,
    );
    return next;
  }
  note(i, 'exact', `elapsed time counted in scans: PT ${pt} ms is ${n} scan${n === 1 ? '' : 's'} of ${dt} ms`);
  if (n === 0) {
    // PT = 0: TON passes IN through; TOF is Q = IN (PT > 0 needed to hold); TP never pulses.
    return type === 'TON' ? x : type === 'TOF' ? x : FALSE;
  }
  const cnt = countBits(ts, i, `${role}.count`, n);
  const zero = constBits(0, cnt.length);
  const inc = muxBits(g, eqConst(g, cnt, n), cnt, increment(g, cnt));
  if (type === 'TON') {
    // ET runs while IN stays on: count := min(count + 1, N) when IN was on too, else 0; Q := IN AND count = N.
    const running = g.and(x, was);
    const next = muxBits(g, running, inc, zero);
    setCount(ts, cnt, next);
    ts.constraints.push({ lit: g.or(was, eqConst(g, cnt, 0)), owner: `${role}.count` });
    return g.and(x, eqConst(g, next, n));
  }
  const q = ts.addState(false, `${role}.Q`, { block: i });
  ts.constraints.push({ lit: g.or(q, eqConst(g, cnt, 0)), owner: `${role}.count` });
  ts.constraints.push({ lit: leConst(g, cnt, n - 1), owner: `${role}.count` });
  // After one more scan of a running Q: still on while count + 1 < N.
  const stillOn = neg(eqConst(g, cnt, n - 1));
  const after = muxBits(g, stillOn, increment(g, cnt), zero);
  let qNext: Lit;
  let cNext: Lit[];
  if (type === 'TOF') {
    // IN on: Q on, count 0. IN just fell: Q on (PT > 0), count 0. Q running: count + 1, Q while < N.
    const hold = g.and(neg(x), g.and(neg(was), q));
    qNext = g.or(x, g.or(was, g.and(hold, stillOn)));
    cNext = muxBits(g, hold, after, zero);
  } else {
    // A running pulse: count + 1, Q while < N (edges ignored). Else a rising IN starts one with count 0.
    qNext = g.ite(q, stillOn, g.and(x, neg(was)));
    cNext = muxBits(g, q, after, zero);
  }
  ts.setNext(q, qNext);
  setCount(ts, cnt, cNext);
  return qNext;
}

/** CTU / CTD / CTUD (see the module comment for the bounded counts). */
function encodeCounter(
  ts: TransitionSystem,
  i: number,
  b: Extract<SheetBlock, { type: 'CTU' | 'CTD' | 'CTUD' }>,
  boolIn: (i: number, port: string) => Lit,
  pv: number | undefined,
  set: (port: string, lit: Lit) => void,
  note: Note,
): void {
  const g = ts.aig;
  const role = b.id;
  const edge = (port: string) => {
    const clk = boolIn(i, port);
    const m = ts.addState(false, `${role}.${port}.M`, { block: i });
    ts.setNext(m, clk);
    return g.and(clk, neg(m));
  };
  if (pv === undefined || !Number.isFinite(pv)) {
    for (const p of b.type === 'CTUD' ? ['QU', 'QD'] : ['Q']) set(p, ts.addFree(`${role}.${p}?`, i));
    note(i, 'abstracted', 'PV comes from a wire, which proofs do not model: Q is free every scan');
    return;
  }
  if (b.type === 'CTU') {
    // IEC 61131-3 CTU: IF R THEN CV := 0 ELSIF rising CU THEN CV := CV + 1; Q := CV >= PV. CV never goes below 0.
    if (pv <= 0) {
      set('Q', TRUE);
      note(i, 'exact', `PV ${pv} ≤ 0: CV ≥ 0 ≥ PV, so Q is always on`);
      return;
    }
    const up = edge('CU');
    const c = countBits(ts, i, `${role}.count`, pv);
    const counted = muxBits(g, g.and(up, neg(eqConst(g, c, pv))), increment(g, c), c);
    const next = muxBits(g, boolIn(i, 'R'), constBits(0, c.length), counted);
    setCount(ts, c, next);
    set('Q', eqConst(g, next, pv));
    note(i, 'exact', `exact for Q: the count is kept as min(CV, PV) with PV ${pv}`);
    return;
  }
  if (b.type === 'CTD') {
    // IEC 61131-3 CTD: IF LD THEN CV := PV ELSIF rising CD THEN CV := CV - 1; Q := CV <= 0. Keep max(CV, 0).
    const top = Math.max(pv, 0);
    const down = edge('CD');
    if (top === 0) {
      set('Q', TRUE);
      note(i, 'exact', `PV ${pv} ≤ 0: CV never rises above 0, so Q is always on`);
      return;
    }
    const c = countBits(ts, i, `${role}.count`, top);
    const counted = muxBits(g, g.and(down, neg(eqConst(g, c, 0))), decrement(g, c), c);
    const next = muxBits(g, boolIn(i, 'LD'), constBits(top, c.length), counted);
    setCount(ts, c, next);
    set('Q', eqConst(g, next, 0));
    note(i, 'exact', `exact for Q: the count is kept as max(CV, 0), at most PV ${pv}`);
    return;
  }
  // CTUD: the full INT count, stored biased (CV + 32768) in 16 bits so comparisons are unsigned.
  const up = edge('CU');
  const down = edge('CD');
  const bias = -CV_MIN;
  const c = Array.from({ length: 16 }, (_, k) => ts.addState(k === 15, `${role}.count[${k}]`, { block: i }));
  const top = 2 ** 16 - 1;
  const inc = muxBits(g, g.and(g.and(up, neg(down)), neg(eqConst(g, c, top))), increment(g, c), c);
  const dec = muxBits(g, g.and(g.and(down, neg(up)), neg(eqConst(g, c, 0))), decrement(g, c), inc);
  const loaded = muxBits(g, boolIn(i, 'LD'), constBits(pv + bias, 16), dec);
  const next = muxBits(g, boolIn(i, 'R'), constBits(bias, 16), loaded);
  setCount(ts, c, next);
  // QU: CV >= PV; QD: CV <= 0 (IEC 61131-3 CTUD).
  set('QU', neg(leConst(g, next, pv + bias - 1)));
  set('QD', leConst(g, next, bias));
  note(i, 'exact', 'exact: the full INT count (16 bits)');
}
