/**
 * Code generation for one block of a logic sheet: the JavaScript statements that compute its
 * outputs from its drivers' slots (or folded literals) and its own memory slots, following
 * IEC 61131-3 (standard function blocks); the comments below give the clause-level rule
 * each one implements. compile.ts lays out the slots and assembles the chunks.
 *
 * Generated code only ever interpolates numbers produced here (slot indices, byte and bit
 * numbers, validated finite parameters) — never a string from the document.
 */
import { parseAddress, type Address } from '@/simulator/address/address';
import type { OutputSlot } from './api';
import type { PortSpec } from './catalogue';
import type { AnalysedSheet } from './validate';

/** INT limits used by the counters (IEC 61131-3 PVmax/PVmin for INT counters). */
const CV_MAX = 32767;
const CV_MIN = -32768;

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

/** Where each block's outputs and memory live in the state's slots. */
export type Layout = {
  out: Map<string, number>[];
  mem: number[][];
  slots: number;
  outputSlots: OutputSlot[];
  /** Pass-through blocks whose output shares its driver's slot (see {@link layout}). */
  shared: Set<number>;
};

/** Folds a literal BOOL operand list for AND / OR / XOR (operands are '0', '1' or an expression). */
function foldAnd(xs: string[]): string {
  if (xs.includes('0')) return '0';
  const rest = xs.filter((x) => x !== '1');
  return rest.length === 0 ? '1' : rest.length === 1 ? rest[0] : `(${rest.join(' & ')})`;
}
function foldOr(xs: string[]): string {
  if (xs.includes('1')) return '1';
  const rest = xs.filter((x) => x !== '0');
  return rest.length === 0 ? '0' : rest.length === 1 ? rest[0] : `(${rest.join(' | ')})`;
}
function foldXor(xs: string[]): string {
  const ones = xs.filter((x) => x === '1').length;
  const rest = xs.filter((x) => x !== '0' && x !== '1');
  if (rest.length === 0) return ones % 2 === 1 ? '1' : '0';
  const e = rest.length === 1 ? rest[0] : `(${rest.join(' ^ ')})`;
  return ones % 2 === 1 ? `(${e} ^ 1)` : e;
}
function foldNot(x: string): string {
  return x === '0' ? '1' : x === '1' ? '0' : `(${x} ^ 1)`;
}

/**
 * Per-chunk emission context. Outputs computed earlier in the same chunk and read again
 * in it live in `const` locals (`s<slot>`), so consumers use a register instead of a
 * Float64Array load; every output is still stored to its slot so `PlcState.values`
 * (and `readBlockOutputs`) hold the live value of every wire after each scan.
 */
export type Chunk = {
  /** Slots assigned to a local so far in this chunk. */
  locals: Set<number>;
  /** Slots read by a later block of the same chunk (or its epilogue). */
  readHere: Set<number>;
};

/** The value of the output slot of a driving block: a literal, a local or a slot load. */
export function driverValue(a: AnalysedSheet, L: Layout, C: Chunk, d: { block: number; port: string }): string {
  const src = a.sheet.blocks[d.block];
  // Constants never change during a scan: use their value directly.
  if (src.type === 'CONST') return lit(src.params.value);
  if (src.type === 'CONST_BOOL') return lit(src.params.value);
  const slot = L.out[d.block].get(d.port) as number;
  return C.locals.has(slot) ? `s${slot}` : `v[${slot}]`;
}

/** Generates the statements of one block. */
export function emitBlock(a: AnalysedSheet, L: Layout, C: Chunk, i: number): string {
  const b = a.sheet.blocks[i];
  const slotOf = (port: string) => L.out[i].get(port) as number;
  /** Previous-scan value of one of this block's own outputs (read before it is stored). */
  const o = (port: string) => `v[${slotOf(port)}]`;
  const m = (k: number) => `v[${L.mem[i][k]}]`;
  const inp = (port: string): string => {
    const d = a.drivers[i].get(port);
    if (d) return driverValue(a, L, C, d);
    const spec = a.ports[i].inputs.find((p) => p.name === port) as PortSpec;
    const params = b.params as Record<string, unknown>;
    const value = spec.fromParam !== undefined ? (params[spec.fromParam] as number) : spec.default;
    return lit(value);
  };
  /**
   * Stores an output: into a local first when a later block of this chunk reads it.
   * `expr` may be a literal, a local or any side-effect-free expression.
   */
  const put = (port: string, expr: string): string => {
    // A shared slot already holds the value: its driver stored it (or holds it in a local).
    if (L.shared.has(i)) return '';
    const slot = slotOf(port);
    if (!C.readHere.has(slot)) return `v[${slot}] = ${expr};`;
    C.locals.add(slot);
    return `const s${slot} = ${expr}; v[${slot}] = s${slot};`;
  };
  const bit = (address: string) => {
    const x = addr(address);
    const k = x.bit ?? 0;
    return { at: `${x.area}[${x.byte}]`, mask: 1 << k, bit: k };
  };
  // Bit k of a byte as 0/1.
  const readBit = (at: string, k: number) => (k === 0 ? `(${at} & 1)` : `((${at} >> ${k}) & 1)`);
  const readBitInv = (at: string, k: number) => (k === 0 ? `(~${at} & 1)` : `((~${at} >> ${k}) & 1)`);
  // A non-positive or NaN preset counts as 0 (only a wired PT can be negative or NaN);
  // a parameter preset is validated non-negative and folded into the code.
  const preset = (): { decl: string; p: string } => {
    if (!a.drivers[i].has('PT')) {
      const value = (b.params as { PT: number }).PT;
      return { decl: '', p: lit(value > 0 ? value : 0) };
    }
    return { decl: `let p${i} = ${inp('PT')}; if (!(p${i} > 0)) p${i} = 0; `, p: `p${i}` };
  };
  // An input used more than once: a literal or a local as it is, anything else (a slot
  // load, a parenthesised literal) read once into a const.
  const once = (name: string, expr: string) => (/^[\w[\]]+$/.test(expr) && !expr.startsWith('v[') ? { decl: '', ref: expr } : { decl: `const ${name}${i} = ${expr}; `, ref: `${name}${i}` });

  switch (b.type) {
    case 'NO_CONTACT': {
      const x = bit(b.params.address);
      return put('Q', foldAnd([inp('IN'), readBit(x.at, x.bit)]));
    }
    case 'NC_CONTACT': {
      const x = bit(b.params.address);
      return put('Q', foldAnd([inp('IN'), readBitInv(x.at, x.bit)]));
    }
    case 'COIL': {
      const x = bit(b.params.address);
      const c = inp('IN');
      if (c === '1') return `${put('Q', '1')} ${x.at} |= ${x.mask};`;
      if (c === '0') return `${put('Q', '0')} ${x.at} &= ${~x.mask & 0xff};`;
      const r = once('c', c);
      // Branch-free: clear the bit, then or in the (0/1) power flow shifted into place.
      return `${r.decl}${put('Q', r.ref)} ${x.at} = (${x.at} & ${~x.mask & 0xff}) | ${x.bit === 0 ? r.ref : `(${r.ref} << ${x.bit})`};`;
    }
    case 'SET_COIL': {
      const x = bit(b.params.address);
      const c = inp('IN');
      const r = once('c', c);
      if (c === '0') return put('Q', '0');
      return `${r.decl}${put('Q', r.ref)} ${x.at} |= ${x.bit === 0 ? r.ref : `${r.ref} << ${x.bit}`};`;
    }
    case 'RESET_COIL': {
      const x = bit(b.params.address);
      const c = inp('IN');
      const r = once('c', c);
      if (c === '0') return put('Q', '0');
      // ~(c << bit) is negative; the byte store keeps its low 8 bits, clearing only this bit when c is 1.
      return `${r.decl}${put('Q', r.ref)} ${x.at} &= ~${x.bit === 0 ? r.ref : `(${r.ref} << ${x.bit})`};`;
    }
    case 'AND':
      return put('Q', foldAnd(a.ports[i].inputs.map((p) => inp(p.name))));
    case 'OR':
      return put('Q', foldOr(a.ports[i].inputs.map((p) => inp(p.name))));
    case 'XOR':
      return put('Q', foldXor(a.ports[i].inputs.map((p) => inp(p.name))));
    case 'NOT':
      return put('Q', foldNot(inp('IN')));
    // Timers and counters below load every slot and evaluate every comparison and sum on
    // every scan, and branch only to choose among ready values: an optimising JIT then has
    // type feedback for each operation from the first scans and never has to drop back to
    // the interpreter when a rarely taken path (a reset, a count limit) finally runs.
    case 'TON': {
      // IEC 61131-3 TON: ET runs from 0 while IN is TRUE, Q := ET >= PT, ET stops at PT; IN FALSE clears both.
      const { decl, p } = preset();
      const x = once('x', inp('IN'));
      const [was, t, e] = [`a${i}`, `t${i}`, `e${i}`];
      return `${x.decl}${decl}const ${was} = ${m(0)}, ${t} = ${o('ET')} + dt; const ${e} = ${x.ref} && ${was} ? (${t} > ${p} ? ${p} : ${t}) : 0; ${put('ET', e)} ${put('Q', `${e} >= ${p} && ${x.ref} ? 1 : 0`)} ${m(0)} = ${x.ref};`;
    }
    case 'TOF': {
      // IEC 61131-3 TOF: Q follows IN up; after IN falls ET runs and Q drops at PT; ET stays at PT until IN is TRUE again, which re-arms it.
      const { decl, p } = preset();
      const x = once('x', inp('IN'));
      const [was, oq, oe, t, reach, pos, e, q] = ['a', 'oq', 'oe', 't', 'r', 'g', 'e', 'q'].map((n) => `${n}${i}`);
      return `${x.decl}${decl}const ${was} = ${m(0)}, ${oq} = ${o('Q')}, ${oe} = ${o('ET')}, ${t} = ${oe} + dt, ${reach} = ${t} >= ${p} ? 1 : 0, ${pos} = ${p} > 0 ? 1 : 0; let ${e}, ${q}; if (${x.ref}) { ${e} = 0; ${q} = 1; } else if (${was}) { ${e} = 0; ${q} = ${pos}; } else if (${oq}) { if (${reach}) { ${e} = ${p}; ${q} = 0; } else { ${e} = ${t}; ${q} = 1; } } else { ${e} = ${oe}; ${q} = 0; } ${put('ET', e)} ${put('Q', q)} ${m(0)} = ${x.ref};`;
    }
    case 'TP': {
      // IEC 61131-3 TP: a rising IN while no pulse runs starts a pulse of PT; edges during the pulse are ignored; ET holds PT while IN stays TRUE.
      const { decl, p } = preset();
      const x = once('x', inp('IN'));
      const [was, t, reach, pos, e, q] = ['a', 't', 'r', 'g', 'e', 'q'].map((n) => `${n}${i}`);
      return `${x.decl}${decl}const ${was} = ${m(0)}, ${t} = ${o('ET')} + dt, ${reach} = ${t} >= ${p} ? 1 : 0, ${pos} = ${p} > 0 ? 1 : 0; let ${e} = ${o('ET')}, ${q} = ${o('Q')}; if (${q}) { if (${reach}) { ${e} = ${p}; ${q} = 0; } else ${e} = ${t}; } else if (${x.ref} && !${was}) { ${e} = 0; ${q} = ${pos}; } if (!${q} && !${x.ref}) ${e} = 0; ${put('ET', e)} ${put('Q', q)} ${m(0)} = ${x.ref};`;
    }
    case 'CTU': {
      // IEC 61131-3 CTU: IF R THEN CV := 0 ELSIF rising CU AND CV < PVmax THEN CV := CV + 1; Q := CV >= PV.
      const u = once('u', inp('CU'));
      const r = inp('R');
      const [was, c, k, room, n] = ['a', 'c', 'k', 'h', 'n'].map((x) => `${x}${i}`);
      const counted = `${u.ref} && !${was} && ${room} ? ${k} : ${c}`;
      const next = r === '0' ? counted : r === '1' ? '0' : `${r} ? 0 : ${counted}`;
      return `${u.decl}const ${was} = ${m(0)}, ${c} = ${o('CV')}, ${k} = ${c} + 1, ${room} = ${c} < ${CV_MAX} ? 1 : 0; const ${n} = ${next}; ${m(0)} = ${u.ref}; ${put('CV', n)} ${put('Q', `${n} >= ${inp('PV')} ? 1 : 0`)}`;
    }
    case 'CTD': {
      // IEC 61131-3 CTD: IF LD THEN CV := PV ELSIF rising CD AND CV > PVmin THEN CV := CV - 1; Q := CV <= 0.
      const d = once('d', inp('CD'));
      const ld = inp('LD');
      const [was, c, k, room, n] = ['a', 'c', 'k', 'h', 'n'].map((x) => `${x}${i}`);
      const counted = `${d.ref} && !${was} && ${room} ? ${k} : ${c}`;
      const next = ld === '0' ? counted : ld === '1' ? inp('PV') : `${ld} ? ${inp('PV')} : ${counted}`;
      return `${d.decl}const ${was} = ${m(0)}, ${c} = ${o('CV')}, ${k} = ${c} - 1, ${room} = ${c} > ${CV_MIN} ? 1 : 0; const ${n} = ${next}; ${m(0)} = ${d.ref}; ${put('CV', n)} ${put('Q', `${n} <= 0 ? 1 : 0`)}`;
    }
    case 'CTUD': {
      // IEC 61131-3 CTUD: R dominates, then LD; simultaneous up and down edges cancel.
      const [u, d, ue, de, pv, c, up, dn, hi, lo, n] = ['u', 'd', 'ue', 'de', 'pv', 'c', 'k', 'j', 'h', 'l', 'n'].map((x) => `${x}${i}`);
      return `const ${u} = ${inp('CU')}, ${d} = ${inp('CD')}, ${ue} = ${u} && !${m(0)} ? 1 : 0, ${de} = ${d} && !${m(1)} ? 1 : 0, ${pv} = ${inp('PV')}, ${c} = ${o('CV')}, ${up} = ${c} + 1, ${dn} = ${c} - 1, ${hi} = ${c} < ${CV_MAX} ? 1 : 0, ${lo} = ${c} > ${CV_MIN} ? 1 : 0; const ${n} = ${inp('R')} ? 0 : ${inp('LD')} ? ${pv} : ${ue} && ${de} ? ${c} : ${ue} && ${hi} ? ${up} : ${de} && ${lo} ? ${dn} : ${c}; ${m(0)} = ${u}; ${m(1)} = ${d}; ${put('CV', n)} ${put('QU', `${n} >= ${pv} ? 1 : 0`)} ${put('QD', `${n} <= 0 ? 1 : 0`)}`;
    }
    case 'SR':
      return put('Q1', foldOr([inp('S1'), foldAnd([foldNot(inp('R')), o('Q1')])]));
    case 'RS':
      return put('Q1', foldAnd([foldNot(inp('R1')), foldOr([inp('S'), o('Q1')])]));
    case 'R_TRIG': {
      // IEC 61131-3 R_TRIG body: Q := CLK AND NOT M; M := CLK (M starts FALSE).
      const c = once('c', inp('CLK'));
      return `${c.decl}${put('Q', foldAnd([c.ref, foldNot(m(0))]))} ${m(0)} = ${c.ref};`;
    }
    case 'F_TRIG': {
      // IEC 61131-3 F_TRIG body: Q := NOT CLK AND NOT M; M := NOT CLK (M starts FALSE).
      const c = once('c', foldNot(inp('CLK')));
      return `${c.decl}${put('Q', foldAnd([c.ref, foldNot(m(0))]))} ${m(0)} = ${c.ref};`;
    }
    case 'GT':
      return put('Q', `${inp('IN1')} > ${inp('IN2')} ? 1 : 0`);
    case 'GE':
      return put('Q', `${inp('IN1')} >= ${inp('IN2')} ? 1 : 0`);
    case 'EQ':
      return put('Q', `${inp('IN1')} === ${inp('IN2')} ? 1 : 0`);
    case 'NE':
      return put('Q', `${inp('IN1')} !== ${inp('IN2')} ? 1 : 0`);
    case 'LE':
      return put('Q', `${inp('IN1')} <= ${inp('IN2')} ? 1 : 0`);
    case 'LT':
      return put('Q', `${inp('IN1')} < ${inp('IN2')} ? 1 : 0`);
    case 'MOVE':
      return put('OUT', inp('IN'));
    case 'SEL':
      return put('OUT', `${inp('G')} ? ${inp('IN1')} : ${inp('IN0')}`);
    case 'LIMIT':
      return put('OUT', `Math.min(Math.max(${inp('IN')}, ${inp('MN')}), ${inp('MX')})`);
    case 'SPAN_MAP': {
      const { outMin, outMax, clamp } = b.params;
      // The raw span as resolved by the analysis (its own parameters, or the analog input it reads).
      const { inMin, inMax } = a.spans[i] as { inMin: number; inMax: number };
      const y = `${lit(outMin)} + (${inp('IN')} - ${lit(inMin)}) * (${lit(outMax)} - ${lit(outMin)}) / (${lit(inMax)} - ${lit(inMin)})`;
      if (!clamp) return put('OUT', y);
      return put('OUT', `Math.min(Math.max(${y}, ${lit(Math.min(outMin, outMax))}), ${lit(Math.max(outMin, outMax))})`);
    }
    case 'WORD_IN': {
      const x = addr(b.params.address);
      const A = x.area;
      const k = x.byte;
      if (x.size === 'B') return put('OUT', b.params.signed ? `(${A}[${k}] << 24) >> 24` : `${A}[${k}]`);
      if (x.size === 'W') {
        const w = `(${A}[${k}] | (${A}[${k + 1}] << 8))`;
        return put('OUT', b.params.signed ? `(${w} << 16) >> 16` : w);
      }
      const d = `(${A}[${k}] | (${A}[${k + 1}] << 8) | (${A}[${k + 2}] << 16) | (${A}[${k + 3}] << 24))`;
      return put('OUT', `${d} ${b.params.signed ? '| 0' : '>>> 0'}`);
    }
    case 'WORD_OUT': {
      const x = addr(b.params.address);
      const A = x.area;
      const k = x.byte;
      const bytes = x.size === 'B' ? 1 : x.size === 'W' ? 2 : 4;
      const w = `w${i}`;
      const writes = Array.from({ length: bytes }, (_, j) => `${A}[${k + j}] = ${j === 0 ? w : `${w} >> ${8 * j}`} & 255;`).join(' ');
      // Rounded to the nearest integer (as REAL_TO_INT), non-finite as 0, then wrapped to the width.
      return `let ${w} = ${inp('IN')}; ${w} = ${w} - ${w} === 0 ? Math.round(${w}) : 0; ${writes}`;
    }
    case 'CONST':
      return put('OUT', lit(b.params.value));
    case 'CONST_BOOL':
      return put('Q', lit(b.params.value));
    case 'PREV_BOOL':
      return put('Q', m(0));
    case 'PREV_NUM':
      return put('OUT', m(0));
  }
}

/** After every block has run, PREV blocks remember their input for the next scan. */
export function emitEpilogue(a: AnalysedSheet, L: Layout, C: Chunk): string[] {
  const lines: string[] = [];
  a.sheet.blocks.forEach((b, i) => {
    if (b.type !== 'PREV_BOOL' && b.type !== 'PREV_NUM') return;
    const d = a.drivers[i].get('IN');
    const value = d ? driverValue(a, L, C, d) : '0';
    lines.push(`v[${L.mem[i][0]}] = ${value};`);
  });
  return lines;
}

