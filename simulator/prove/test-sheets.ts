/**
 * Test helper: seeded random logic sheets with interlock rules, for the prover's
 * cross-check against explicit-state search (./oracle.test.ts). Used only by tests.
 */
import type { LogicSheetInput } from '@/simulator/plc';
import type { InterlockRuleInput, RuleCondition } from './rules';

/** Mulberry32: a small seeded PRNG, so every run checks the same sheets (common practice for reproducible tests). */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type B = LogicSheetInput['blocks'][number];
const pos = { x: 0, y: 0 };
const inAddr = (k: number) => `%IX${k >> 3}.${k & 7}`;
/** The %Q/%M bits generated coils write and contacts read back. */
export const OUT_BITS = ['%QX0.0', '%QX0.1', '%QX0.2', '%QX0.3', '%MX0.0', '%MX0.1'];

/** A generated sheet, its declared inputs, and three rules over its bits. */
export type Generated = { sheet: LogicSheetInput; inputs: string[]; rules: InterlockRuleInput[] };

/** A random sheet with latches, edges, timers, counters and feedback through %Q/%M bits. */
export function generate(r: () => number, id: number): Generated {
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
  // Mostly small input counts; a few sheets use all 12.
  const nIn = r() < 0.03 ? 12 : 1 + Math.floor(r() * 7);
  const inputs = Array.from({ length: nIn }, (_, k) => inAddr(k));
  const blocks: B[] = [];
  const connections: LogicSheetInput['connections'] = [];
  const boolOuts: { block: string; port: string }[] = [];
  let wires = 0;
  const wire = (from: { block: string; port: string }, to: string, port: string) =>
    connections.push({ id: `w${wires++}`, from, to: { block: to, port } });
  // Only outputs of other, earlier blocks: the wiring stays free of algebraic loops.
  const sources = (to: string) => boolOuts.filter((o) => o.block !== to);
  const feed = (to: string, port: string, pUnconnected = 0.15) => {
    if (sources(to).length > 0 && r() > pUnconnected) wire(pick(sources(to)), to, port);
  };
  const add = (b: B, outs: string[]) => {
    blocks.push(b);
    for (const p of outs) boolOuts.push({ block: b.id, port: p });
  };
  // Every input is read by a contact (so the oracle's enumeration is no larger than needed);
  // a few more contacts read inputs again or read back %Q/%M bits (seal-in, feedback).
  const nContacts = nIn + Math.floor(r() * 3);
  for (let k = 0; k < nContacts; k++) {
    const type = r() < 0.6 ? 'NO_CONTACT' : 'NC_CONTACT';
    const address = k < nIn ? inputs[k] : r() < 0.4 ? pick(inputs) : pick(OUT_BITS);
    const b = { id: `c${k}`, type, params: { address }, position: pos } as B;
    add(b, ['Q']);
    if (k > 0 && r() < 0.3) wire(pick(sources(b.id)), b.id, 'IN');
  }
  // Wide sheets get few stateful blocks, so their 4,096 input vectors meet few states.
  const nLogic = 1 + Math.floor(r() * (nIn > 8 ? 3 : 7));
  for (let k = 0; k < nLogic; k++) {
    const bid = `b${k}`;
    const kind = r();
    if (kind < 0.3) {
      const type = pick(['AND', 'OR', 'XOR'] as const);
      const n = r() < 0.7 ? 2 : 3;
      add({ id: bid, type, params: { inputs: n }, position: pos } as B, ['Q']);
      for (let i = 1; i <= n; i++) feed(bid, `IN${i}`);
    } else if (kind < 0.38) {
      add({ id: bid, type: 'NOT', params: {}, position: pos } as B, ['Q']);
      feed(bid, 'IN', 0);
    } else if (kind < 0.53) {
      const type = pick(['SR', 'RS'] as const);
      add({ id: bid, type, params: {}, position: pos } as B, ['Q1']);
      feed(bid, type === 'SR' ? 'S1' : 'S', 0);
      feed(bid, type === 'SR' ? 'R' : 'R1');
    } else if (kind < 0.66) {
      add({ id: bid, type: pick(['R_TRIG', 'F_TRIG'] as const), params: {}, position: pos } as B, ['Q']);
      feed(bid, 'CLK', 0);
    } else if (kind < 0.74) {
      // PREV_BOOL may read a later block: feedback the engine allows.
      blocks.push({ id: bid, type: 'PREV_BOOL', params: { initial: r() < 0.3 }, position: pos } as B);
      boolOuts.push({ block: bid, port: 'Q' });
      (blocks[blocks.length - 1] as B & { lateFeed?: boolean }).lateFeed = true;
    } else if (kind < 0.86) {
      const type = pick(['TON', 'TOF', 'TP'] as const);
      add({ id: bid, type, params: { PT: pick([0, 10, 20, 30, 45]) }, position: pos } as B, ['Q']);
      feed(bid, 'IN', 0);
    } else if (kind < 0.96) {
      const type = pick(['CTU', 'CTD', 'CTUD'] as const);
      add({ id: bid, type, params: { PV: pick([0, 1, 2, 3]) }, position: pos } as B, type === 'CTUD' ? ['QU', 'QD'] : ['Q']);
      if (type === 'CTU') {
        feed(bid, 'CU', 0);
        feed(bid, 'R', 0.4);
      } else if (type === 'CTD') {
        feed(bid, 'CD', 0);
        feed(bid, 'LD', 0.4);
      } else {
        feed(bid, 'CU', 0);
        feed(bid, 'CD', 0.3);
        feed(bid, 'R', 0.5);
        feed(bid, 'LD', 0.5);
      }
    } else {
      // A comparison of constants: the encoding must fold it exactly.
      blocks.push({ id: `${bid}k1`, type: 'CONST', params: { value: pick([1, 2, 3]) }, position: pos } as B);
      blocks.push({ id: `${bid}k2`, type: 'CONST', params: { value: 2 }, position: pos } as B);
      add({ id: bid, type: pick(['GT', 'GE', 'EQ', 'NE', 'LE', 'LT'] as const), params: {}, position: pos } as B, ['Q']);
      wire({ block: `${bid}k1`, port: 'OUT' }, bid, 'IN1');
      wire({ block: `${bid}k2`, port: 'OUT' }, bid, 'IN2');
    }
  }
  for (const b of blocks) {
    if ((b as B & { lateFeed?: boolean }).lateFeed) {
      delete (b as B & { lateFeed?: boolean }).lateFeed;
      if (r() < 0.9) wire(pick(boolOuts), b.id, 'IN');
    }
  }
  const nCoils = 1 + Math.floor(r() * 3);
  const written: string[] = [];
  for (let k = 0; k < nCoils; k++) {
    const type = r() < 0.7 ? 'COIL' : pick(['SET_COIL', 'RESET_COIL'] as const);
    const address = pick(OUT_BITS);
    if (!written.includes(address)) written.push(address);
    blocks.push({ id: `q${k}`, type, params: { address }, position: pos } as B);
    wire(pick(boolOuts), `q${k}`, 'IN');
  }
  const signals = [...inputs, ...written, ...(r() < 0.2 ? [pick(OUT_BITS)] : [])];
  const cond = (depth: number): RuleCondition => {
    if (depth >= 2 || r() < 0.6) return { signal: pick(signals), value: r() < 0.5 ? 'on' : 'off' };
    const k = r();
    if (k < 0.4) return { all: [cond(depth + 1), cond(depth + 1)] };
    if (k < 0.8) return { any: [cond(depth + 1), cond(depth + 1)] };
    return { not: cond(depth + 1) };
  };
  const rules: InterlockRuleInput[] = Array.from({ length: 3 }, (_, k) => {
    const kind = pick(['never', 'only-if', 'within'] as const);
    const rid = `s${id}r${k}`;
    if (kind === 'never') return { id: rid, title: '', kind, what: cond(0), while: cond(0) };
    if (kind === 'only-if') return { id: rid, title: '', kind, what: cond(0), requires: [cond(0), ...(r() < 0.5 ? [cond(1)] : [])] };
    return { id: rid, title: '', kind, after: cond(0), expect: cond(0), scans: Math.floor(r() * 4), trigger: r() < 0.7 ? 'rises' : 'holds' };
  });
  return { sheet: { scanPeriodMs: 10, blocks, connections }, inputs, rules };
}

