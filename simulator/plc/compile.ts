/**
 * Compiles a logic sheet to straight-line JavaScript: one statement group per block in
 * execution order, reading and writing numbered slots of a Float64Array and the process
 * image's byte arrays, so a scan never walks the graph. The generated source is split into
 * functions of at most {@link BLOCKS_PER_CHUNK} blocks because very large functions are
 * left unoptimised by JavaScript engines.
 *
 * Block semantics follow IEC 61131-3 (standard function blocks); the comments in
 * `emitBlock` give the clause-level rule each one implements. The reference interpreter
 * (./interpret.ts) implements the same rules independently, and tests check the two agree.
 *
 * Generated code only ever interpolates numbers produced here (slot indices, byte and bit
 * numbers, validated finite parameters) — never a string from the document.
 */
import { parseAddress, type Address } from '@/simulator/address/address';
import type { Problem, Result } from '@/simulator/shared/result';
import type { ProcessImage } from '@/simulator/address/process-image';
import type { BlockOutputs, CompiledSheet, OutputSlot, PlcState, SerializedPlcState } from './api';
import type { PortSpec } from './catalogue';
import { analyseSheet, type AnalysedSheet } from './validate';
import type { SheetBlock } from './sheet-schema';

/** Blocks per generated function. */
export const BLOCKS_PER_CHUNK = 200;

/** INT limits used by the counters (IEC 61131-3 PVmax/PVmin for INT counters). */
const CV_MAX = 32767;
const CV_MIN = -32768;

type ChunkFn = (v: Float64Array, I: Uint8Array, Q: Uint8Array, M: Uint8Array, dt: number) => void;

/** Writes a number as an exact JavaScript literal (round-trips, keeps -0). */
function lit(x: number | boolean): string {
  if (typeof x === 'boolean') return x ? '1' : '0';
  if (Object.is(x, -0)) return '(-0)';
  if (Number.isNaN(x)) return 'NaN';
  if (x === Infinity) return 'Infinity';
  if (x === -Infinity) return '(-Infinity)';
  return x < 0 ? `(${String(x)})` : String(x);
}

function addr(text: string): Address {
  const r = parseAddress(text);
  // The schema already validated every address; reaching this is a bug in the engine.
  if (!r.ok) throw new Error(`unvalidated address ${text}`);
  return r.value;
}

type Layout = {
  out: Map<string, number>[];
  mem: number[][];
  slots: number;
  outputSlots: OutputSlot[];
};

/** Memory slots each block type keeps besides its outputs. */
function memoryCount(type: SheetBlock['type']): number {
  switch (type) {
    case 'TON':
    case 'TOF':
    case 'TP':
    case 'CTU':
    case 'CTD':
    case 'R_TRIG':
    case 'F_TRIG':
    case 'PREV_BOOL':
    case 'PREV_NUM':
      return 1;
    case 'CTUD':
      return 2;
    default:
      return 0;
  }
}

function layout(a: AnalysedSheet): Layout {
  let next = 0;
  const out: Map<string, number>[] = [];
  const mem: number[][] = [];
  const bySlot: OutputSlot[] = [];
  a.sheet.blocks.forEach((b, i) => {
    const m = new Map<string, number>();
    for (const p of a.ports[i].outputs) {
      m.set(p.name, next);
      bySlot[next] = { block: b.id, port: p.name, type: p.type, slot: next };
      next++;
    }
    out.push(m);
    mem.push(Array.from({ length: memoryCount(b.type) }, () => next++));
  });
  const outputSlots: OutputSlot[] = [];
  for (const i of a.order) for (const slot of out[i].values()) outputSlots.push(bySlot[slot]);
  return { out, mem, slots: next, outputSlots };
}

/** Generates the statements of one block. */
function emitBlock(a: AnalysedSheet, L: Layout, i: number): string {
  const b = a.sheet.blocks[i];
  const o = (port: string) => `v[${L.out[i].get(port)}]`;
  const m = (k: number) => `v[${L.mem[i][k]}]`;
  const inp = (port: string): string => {
    const d = a.drivers[i].get(port);
    if (d) return `v[${L.out[d.block].get(d.port)}]`;
    const spec = a.ports[i].inputs.find((p) => p.name === port) as PortSpec;
    const params = b.params as Record<string, unknown>;
    const value = spec.fromParam !== undefined ? (params[spec.fromParam] as number) : spec.default;
    return lit(value);
  };
  const bit = (address: string) => {
    const x = addr(address);
    return { area: x.area, byte: x.byte, mask: 1 << (x.bit ?? 0), bit: x.bit ?? 0 };
  };
  // A non-positive or NaN preset counts as 0 (only a wired PT can be negative).
  const preset = () => `let p = ${inp('PT')}; if (!(p > 0)) p = 0;`;

  switch (b.type) {
    case 'NO_CONTACT': {
      const x = bit(b.params.address);
      return `${o('Q')} = ${inp('IN')} & ((${x.area}[${x.byte}] >> ${x.bit}) & 1);`;
    }
    case 'NC_CONTACT': {
      const x = bit(b.params.address);
      return `${o('Q')} = ${inp('IN')} & (((${x.area}[${x.byte}] >> ${x.bit}) & 1) ^ 1);`;
    }
    case 'COIL': {
      const x = bit(b.params.address);
      return `{ const c = ${inp('IN')}; ${o('Q')} = c; if (c) ${x.area}[${x.byte}] |= ${x.mask}; else ${x.area}[${x.byte}] &= ${~x.mask & 0xff}; }`;
    }
    case 'SET_COIL': {
      const x = bit(b.params.address);
      return `{ const c = ${inp('IN')}; ${o('Q')} = c; if (c) ${x.area}[${x.byte}] |= ${x.mask}; }`;
    }
    case 'RESET_COIL': {
      const x = bit(b.params.address);
      return `{ const c = ${inp('IN')}; ${o('Q')} = c; if (c) ${x.area}[${x.byte}] &= ${~x.mask & 0xff}; }`;
    }
    case 'AND':
    case 'OR':
    case 'XOR': {
      const op = b.type === 'AND' ? ' & ' : b.type === 'OR' ? ' | ' : ' ^ ';
      return `${o('Q')} = ${a.ports[i].inputs.map((p) => inp(p.name)).join(op)};`;
    }
    case 'NOT':
      return `${o('Q')} = ${inp('IN')} ^ 1;`;
    case 'TON':
      // IEC 61131-3 TON: ET runs from 0 while IN is TRUE, Q := ET >= PT, ET stops at PT; IN FALSE clears both.
      return `{ const x = ${inp('IN')}; ${preset()} let e = 0; if (x) { if (${m(0)}) { e = ${o('ET')} + dt; if (e > p) e = p; } } ${o('ET')} = e; ${o('Q')} = x && e >= p ? 1 : 0; ${m(0)} = x; }`;
    case 'TOF':
      // IEC 61131-3 TOF: Q follows IN up; after IN falls ET runs and Q drops at PT; ET stays at PT until IN is TRUE again, which re-arms it.
      return `{ const x = ${inp('IN')}; ${preset()} let e, q; if (x) { e = 0; q = 1; } else if (${m(0)}) { e = 0; q = p > 0 ? 1 : 0; } else if (${o('Q')}) { e = ${o('ET')} + dt; if (e >= p) { e = p; q = 0; } else q = 1; } else { e = ${o('ET')}; q = 0; } ${o('ET')} = e; ${o('Q')} = q; ${m(0)} = x; }`;
    case 'TP':
      // IEC 61131-3 TP: a rising IN while no pulse runs starts a pulse of PT; edges during the pulse are ignored; ET holds PT while IN stays TRUE.
      return `{ const x = ${inp('IN')}; ${preset()} let e = ${o('ET')}, q = ${o('Q')}; if (q) { e = e + dt; if (e >= p) { e = p; q = 0; } } else if (x && !${m(0)}) { e = 0; q = p > 0 ? 1 : 0; } if (!q && !x) e = 0; ${o('ET')} = e; ${o('Q')} = q; ${m(0)} = x; }`;
    case 'CTU':
      // IEC 61131-3 CTU: IF R THEN CV := 0 ELSIF rising CU AND CV < PVmax THEN CV := CV + 1; Q := CV >= PV.
      return `{ const u = ${inp('CU')}; let cv = ${o('CV')}; if (${inp('R')}) cv = 0; else if (u && !${m(0)} && cv < ${CV_MAX}) cv = cv + 1; ${m(0)} = u; ${o('CV')} = cv; ${o('Q')} = cv >= ${inp('PV')} ? 1 : 0; }`;
    case 'CTD':
      // IEC 61131-3 CTD: IF LD THEN CV := PV ELSIF rising CD AND CV > PVmin THEN CV := CV - 1; Q := CV <= 0.
      return `{ const d = ${inp('CD')}; let cv = ${o('CV')}; if (${inp('LD')}) cv = ${inp('PV')}; else if (d && !${m(0)} && cv > ${CV_MIN}) cv = cv - 1; ${m(0)} = d; ${o('CV')} = cv; ${o('Q')} = cv <= 0 ? 1 : 0; }`;
    case 'CTUD':
      // IEC 61131-3 CTUD: R dominates, then LD; simultaneous up and down edges cancel.
      return `{ const u = ${inp('CU')}, d = ${inp('CD')}, ue = u && !${m(0)}, de = d && !${m(1)}; let cv = ${o('CV')}; const pv = ${inp('PV')}; if (${inp('R')}) cv = 0; else if (${inp('LD')}) cv = pv; else if (!(ue && de)) { if (ue && cv < ${CV_MAX}) cv = cv + 1; else if (de && cv > ${CV_MIN}) cv = cv - 1; } ${m(0)} = u; ${m(1)} = d; ${o('CV')} = cv; ${o('QU')} = cv >= pv ? 1 : 0; ${o('QD')} = cv <= 0 ? 1 : 0; }`;
    case 'SR':
      return `${o('Q1')} = ${inp('S1')} | ((${inp('R')} ^ 1) & ${o('Q1')});`;
    case 'RS':
      return `${o('Q1')} = (${inp('R1')} ^ 1) & (${inp('S')} | ${o('Q1')});`;
    case 'R_TRIG':
      // IEC 61131-3 R_TRIG body: Q := CLK AND NOT M; M := CLK (M starts FALSE).
      return `{ const c = ${inp('CLK')}; ${o('Q')} = c & (${m(0)} ^ 1); ${m(0)} = c; }`;
    case 'F_TRIG':
      // IEC 61131-3 F_TRIG body: Q := NOT CLK AND NOT M; M := NOT CLK (M starts FALSE).
      return `{ const c = ${inp('CLK')} ^ 1; ${o('Q')} = c & (${m(0)} ^ 1); ${m(0)} = c; }`;
    case 'GT':
      return `${o('Q')} = ${inp('IN1')} > ${inp('IN2')} ? 1 : 0;`;
    case 'GE':
      return `${o('Q')} = ${inp('IN1')} >= ${inp('IN2')} ? 1 : 0;`;
    case 'EQ':
      return `${o('Q')} = ${inp('IN1')} === ${inp('IN2')} ? 1 : 0;`;
    case 'NE':
      return `${o('Q')} = ${inp('IN1')} !== ${inp('IN2')} ? 1 : 0;`;
    case 'LE':
      return `${o('Q')} = ${inp('IN1')} <= ${inp('IN2')} ? 1 : 0;`;
    case 'LT':
      return `${o('Q')} = ${inp('IN1')} < ${inp('IN2')} ? 1 : 0;`;
    case 'MOVE':
      return `${o('OUT')} = ${inp('IN')};`;
    case 'SEL':
      return `${o('OUT')} = ${inp('G')} ? ${inp('IN1')} : ${inp('IN0')};`;
    case 'LIMIT':
      return `${o('OUT')} = Math.min(Math.max(${inp('IN')}, ${inp('MN')}), ${inp('MX')});`;
    case 'SCALE': {
      const { inMin, inMax, outMin, outMax, clamp } = b.params;
      const y = `${lit(outMin)} + (${inp('IN')} - ${lit(inMin)}) * (${lit(outMax)} - ${lit(outMin)}) / (${lit(inMax)} - ${lit(inMin)})`;
      if (!clamp) return `${o('OUT')} = ${y};`;
      return `${o('OUT')} = Math.min(Math.max(${y}, ${lit(Math.min(outMin, outMax))}), ${lit(Math.max(outMin, outMax))});`;
    }
    case 'WORD_IN': {
      const x = addr(b.params.address);
      const A = x.area;
      const k = x.byte;
      if (x.size === 'B') return `${o('OUT')} = ${b.params.signed ? `(${A}[${k}] << 24) >> 24` : `${A}[${k}]`};`;
      if (x.size === 'W') {
        const w = `(${A}[${k}] | (${A}[${k + 1}] << 8))`;
        return `${o('OUT')} = ${b.params.signed ? `(${w} << 16) >> 16` : w};`;
      }
      const d = `(${A}[${k}] | (${A}[${k + 1}] << 8) | (${A}[${k + 2}] << 16) | (${A}[${k + 3}] << 24))`;
      return `${o('OUT')} = ${d} ${b.params.signed ? '| 0' : '>>> 0'};`;
    }
    case 'WORD_OUT': {
      const x = addr(b.params.address);
      const A = x.area;
      const k = x.byte;
      const bytes = x.size === 'B' ? 1 : x.size === 'W' ? 2 : 4;
      const writes = Array.from({ length: bytes }, (_, j) => `${A}[${k + j}] = ${j === 0 ? 'w' : `w >> ${8 * j}`} & 255;`).join(' ');
      // Rounded to the nearest integer (as REAL_TO_INT), non-finite as 0, then wrapped to the width.
      return `{ let w = ${inp('IN')}; w = w - w === 0 ? Math.round(w) : 0; ${writes} }`;
    }
    case 'CONST':
      return `${o('OUT')} = ${lit(b.params.value)};`;
    case 'CONST_BOOL':
      return `${o('Q')} = ${lit(b.params.value)};`;
    case 'PREV_BOOL':
      return `${o('Q')} = ${m(0)};`;
    case 'PREV_NUM':
      return `${o('OUT')} = ${m(0)};`;
  }
}

/** After every block has run, PREV blocks remember their input for the next scan. */
function emitEpilogue(a: AnalysedSheet, L: Layout): string[] {
  const lines: string[] = [];
  a.sheet.blocks.forEach((b, i) => {
    if (b.type !== 'PREV_BOOL' && b.type !== 'PREV_NUM') return;
    const d = a.drivers[i].get('IN');
    const value = d ? `v[${L.out[d.block].get(d.port)}]` : '0';
    lines.push(`v[${L.mem[i][0]}] = ${value};`);
  });
  return lines;
}

/** Builds the generated JavaScript source (exposed for inspection and tests). */
export function generateSource(a: AnalysedSheet, L: Layout = layout(a)): string[] {
  const chunks: string[] = [];
  let current: string[] = [];
  for (const i of a.order) {
    current.push(emitBlock(a, L, i));
    if (current.length >= BLOCKS_PER_CHUNK) {
      chunks.push(current.join('\n'));
      current = [];
    }
  }
  current.push(...emitEpilogue(a, L));
  if (current.length > 0) chunks.push(current.join('\n'));
  return chunks;
}

/**
 * Validates and compiles a logic sheet. Returns every problem (with paths) for a bad
 * sheet; a good one becomes a {@link CompiledSheet} whose `scan` runs generated code.
 */
export function compileSheet(input: unknown): Result<CompiledSheet, Problem> {
  const analysed = analyseSheet(input);
  if (!analysed.ok) return analysed;
  const a = analysed.value;
  const L = layout(a);
  const fns = generateSource(a, L).map(
    (body) => new Function('v', 'I', 'Q', 'M', 'dt', `"use strict";\n${body}`) as ChunkFn,
  );
  const initial = new Float64Array(L.slots);
  a.sheet.blocks.forEach((b, i) => {
    if (b.type === 'PREV_BOOL') initial[L.out[i].get('Q') as number] = initial[L.mem[i][0]] = b.params.initial ? 1 : 0;
    if (b.type === 'PREV_NUM') initial[L.out[i].get('OUT') as number] = initial[L.mem[i][0]] = b.params.initial;
    if (b.type === 'CONST') initial[L.out[i].get('OUT') as number] = b.params.value;
    if (b.type === 'CONST_BOOL') initial[L.out[i].get('Q') as number] = b.params.value ? 1 : 0;
  });
  const slotIndex = new Map<string, OutputSlot>();
  for (const s of L.outputSlots) slotIndex.set(`${s.block}\u0000${s.port}`, s);
  const period = a.sheet.scanPeriodMs;
  const nChunks = fns.length;

  const compiled: CompiledSheet = {
    sheet: a.sheet,
    order: a.order.map((i) => a.sheet.blocks[i].id),
    scanPeriodMs: period,
    outputSlots: L.outputSlots,
    createState: () => ({ values: initial.slice(), scans: 0 }),
    scan(state: PlcState, image: ProcessImage, dtMs: number = period) {
      const v = state.values;
      if (v.length !== L.slots) throw new Error(`PLC state has ${v.length} slots, this sheet needs ${L.slots}`);
      const dt = Number.isFinite(dtMs) && dtMs > 0 ? dtMs : 0;
      const { I, Q, M } = image;
      for (let k = 0; k < nChunks; k++) fns[k](v, I, Q, M, dt);
      state.scans++;
    },
    readBlockOutputs(state: PlcState): BlockOutputs {
      const out: BlockOutputs = {};
      for (const s of L.outputSlots) {
        const rec = (out[s.block] ??= {});
        const x = state.values[s.slot];
        rec[s.port] = s.type === 'BOOL' ? x !== 0 : x;
      }
      return out;
    },
    readOutput(state: PlcState, blockId: string, port: string) {
      const s = slotIndex.get(`${blockId}\u0000${port}`);
      if (!s) return undefined;
      const x = state.values[s.slot];
      return s.type === 'BOOL' ? x !== 0 : x;
    },
  };
  return { ok: true, value: compiled };
}

/** Deep copy of a PLC state (for snapshots and replay). */
export function clonePlcState(state: PlcState): PlcState {
  return { values: state.values.slice(), scans: state.scans };
}

/** JSON-safe copy of a PLC state. */
export function serializePlcState(state: PlcState): SerializedPlcState {
  return {
    values: Array.from(state.values, (x) =>
      Number.isFinite(x) ? x : Number.isNaN(x) ? 'NaN' : x > 0 ? 'Infinity' : '-Infinity',
    ),
    scans: state.scans,
  };
}

/** Inverse of {@link serializePlcState}. */
export function deserializePlcState(s: SerializedPlcState): PlcState {
  return {
    values: Float64Array.from(s.values, (x) => (typeof x === 'number' ? x : Number(x))),
    scans: s.scans,
  };
}
