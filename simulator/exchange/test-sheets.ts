/**
 * Sheets for the exchange tests: one per catalogue block type (every input wired, or none),
 * seeded random sheets with awkward ids, labels, numbers and addresses, and a scan-by-scan
 * run that records what a sheet does. Used only by *.test.ts.
 */
import { createProcessImage } from '@/simulator/address/process-image';
import type { BlockOutputs, LogicSheetInput } from '@/simulator/plc/api';
import { BLOCK_TYPES, blockPorts, type BlockType, type PortType } from '@/simulator/plc/catalogue';
import { compileSheet } from '@/simulator/plc/compile';
import { interpretSheet } from '@/simulator/plc/interpret';

type BlockInput = LogicSheetInput['blocks'][number];
type ConnectionInput = LogicSheetInput['connections'][number];

/** Parameters unlike the catalogue defaults, so a lost parameter shows. */
export const SAMPLE_PARAMS: Record<BlockType, Record<string, unknown>> = {
  NO_CONTACT: { address: '%IX2.3' },
  NC_CONTACT: { address: '%MX4.1' },
  COIL: { address: '%QX3.4' },
  SET_COIL: { address: '%MX5.0' },
  RESET_COIL: { address: '%QX3.5' },
  AND: { inputs: 3 },
  OR: { inputs: 4 },
  XOR: { inputs: 3 },
  NOT: {},
  TON: { PT: 30 },
  TOF: { PT: 40 },
  TP: { PT: 25 },
  CTU: { PV: 3 },
  CTD: { PV: 2 },
  CTUD: { PV: 4 },
  SR: {},
  RS: {},
  R_TRIG: {},
  F_TRIG: {},
  GT: {},
  GE: {},
  EQ: {},
  NE: {},
  LE: {},
  LT: {},
  MOVE: {},
  SEL: {},
  LIMIT: {},
  SPAN_MAP: { inMin: 4, inMax: 20, outMin: -50, outMax: 150, clamp: true },
  WORD_IN: { address: '%IB6', signed: true },
  WORD_OUT: { address: '%QD8' },
  CONST: { value: 2.5 },
  CONST_BOOL: { value: true },
  PREV_BOOL: { initial: true },
  PREV_NUM: { initial: -1.5 },
};

const blk = (id: string, type: BlockType, params: Record<string, unknown>, x: number, y: number, label?: string): BlockInput =>
  ({ id, type, params, position: { x, y }, ...(label === undefined ? {} : { label }) }) as BlockInput;
const wire = (id: string, from: string, fromPort: string, to: string, toPort: string): ConnectionInput => ({ id, from: { block: from, port: fromPort }, to: { block: to, port: toPort } });

/**
 * A sheet around one block of `type`: with `wired`, every input comes from a contact (BOOL)
 * or a WORD_IN (numbers and times); every output drives a coil or a WORD_OUT, and each
 * BOOL coil's pass-through Q drives a second coil.
 */
export function sheetForType(type: BlockType, wired: boolean): LogicSheetInput {
  const params = SAMPLE_PARAMS[type];
  const ports = blockPorts(type, params);
  const blocks: BlockInput[] = [blk('dut', type, params, 200, 40, `${type} under test`)];
  const connections: ConnectionInput[] = [];
  if (wired) {
    ports.inputs.forEach((p, k) => {
      const src = `src_${p.name}`;
      if (p.type === 'BOOL') blocks.push(blk(src, 'NO_CONTACT', { address: `%IX0.${k}` }, 0, 40 * k));
      else blocks.push(blk(src, 'WORD_IN', { address: `%IW${8 + 2 * k}`, signed: false }, 0, 40 * k));
      connections.push(wire(`in_${p.name}`, src, p.type === 'BOOL' ? 'Q' : 'OUT', 'dut', p.name));
    });
  }
  ports.outputs.forEach((p, k) => {
    const sink = `sink_${p.name}`;
    if (p.type === 'BOOL') {
      blocks.push(blk(sink, 'COIL', { address: `%QX10.${k}` }, 400, 40 * k));
      blocks.push(blk(`${sink}_again`, 'COIL', { address: `%QX11.${k}` }, 500, 40 * k));
      connections.push(wire(`again_${p.name}`, sink, 'Q', `${sink}_again`, 'IN'));
    } else blocks.push(blk(sink, 'WORD_OUT', { address: `%QW${20 + 2 * k}` }, 400, 40 * k));
    connections.push(wire(`out_${p.name}`, 'dut', p.name, sink, 'IN'));
  });
  return { scanPeriodMs: 10, blocks, connections };
}

/** A small seeded generator (an LCG, Numerical Recipes constants — common practice), so tests repeat exactly. */
export function createRng(seed: number): { int(n: number): number; pick<T>(xs: readonly T[]): T; chance(p: number): boolean } {
  let s = seed >>> 0;
  const next = () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
  return { int: (n) => Math.floor(next() * n), pick: (xs) => xs[Math.floor(next() * xs.length)], chance: (p) => next() < p };
}

const AWKWARD_IDS = ['TON', 'end_if', 'a.b', 'x:y', 'has-dash', '9lives', 'A', 'a', 'IX0_0', 'CW_SPAN_MAP', 'WORD_TO_INT', 'T', '__x__', 'CellLogic'];
const AWKWARD_LABELS = [undefined, 'Plain label', 'tab\there', 'line\nbreak', '<&"\'>', 'ctrl\u0001char', 'emoji 😀', 'lone \ud800 surrogate', '(* not a comment *)', '  spaced  '];
const POSITIONS = [0, -0, -12.5, 1e-7, 1e21, 123.456, 640];

function randomParams(type: BlockType, r: ReturnType<typeof createRng>): Record<string, unknown> {
  const bit = (areas: string[]) => `%${r.pick(areas)}X${r.int(4)}.${r.int(8)}`;
  const word = (areas: string[], first: number) => {
    const size = r.pick(['B', 'W', 'D']);
    return `%${r.pick(areas)}${size}${first + 4 * r.int(4)}`;
  };
  switch (type) {
    case 'NO_CONTACT':
    case 'NC_CONTACT':
      return { address: r.chance(0.2) ? r.pick(['%ix0.1', '%I1.3', '%MX0.0']) : bit(['I', 'I', 'Q', 'M']) };
    case 'COIL':
    case 'SET_COIL':
    case 'RESET_COIL':
      return { address: bit(['Q', 'M']) };
    case 'AND':
    case 'OR':
    case 'XOR':
      return { inputs: 2 + r.int(4) };
    case 'TON':
    case 'TOF':
    case 'TP':
      return { PT: r.pick([0, 10, 35, 1.5, 2147483647]) };
    case 'CTU':
    case 'CTD':
    case 'CTUD':
      return { PV: r.pick([-3, 0, 2, 32767]) };
    case 'SPAN_MAP':
      return { inMin: r.pick([0, 4, -1.25]), inMax: r.pick([20, 4095, 65535]), outMin: r.pick([0, -50]), outMax: r.pick([100, 1e-7]), clamp: r.chance(0.5) };
    case 'WORD_IN':
      return { address: word(['I', 'Q', 'M'], 8), signed: r.chance(0.5) };
    case 'WORD_OUT':
      return { address: word(['Q', 'M'], 40) };
    case 'CONST':
      return { value: r.pick([0, -0, 2.5, -7, 1e21, 1e-7, 123456789.125]) };
    case 'CONST_BOOL':
      return { value: r.chance(0.5) };
    case 'PREV_BOOL':
      return { initial: r.chance(0.5) };
    case 'PREV_NUM':
      return { initial: r.pick([0, -1.5, 40]) };
    default:
      return {};
  }
}

const compatible = (from: PortType, to: PortType) => from === to || (from !== 'BOOL' && to !== 'BOOL');

/**
 * A random valid sheet: blocks of every type with awkward ids, labels, positions and
 * numbers; inputs wired from earlier blocks (PREV blocks from anywhere, closing loops).
 */
export function randomSheet(seed: number): LogicSheetInput {
  const r = createRng(seed);
  const n = 3 + r.int(22);
  const ids = new Set<string>();
  const blocks: BlockInput[] = [];
  for (let i = 0; i < n; i++) {
    let id = r.chance(0.4) ? r.pick(AWKWARD_IDS) : `b${i}`;
    while (ids.has(id)) id = `${id}_${i}`;
    ids.add(id);
    const type = r.pick(BLOCK_TYPES);
    blocks.push(blk(id, type, randomParams(type, r), r.pick(POSITIONS), r.pick(POSITIONS), r.pick(AWKWARD_LABELS)));
  }
  const connections: ConnectionInput[] = [];
  blocks.forEach((b, i) => {
    const prev = b.type === 'PREV_BOOL' || b.type === 'PREV_NUM';
    for (const p of blockPorts(b.type as BlockType, b.params as Record<string, unknown>).inputs) {
      if (!r.chance(0.7)) continue;
      const sources = blocks.flatMap((s, j) =>
        (j < i || prev || ((s.type === 'PREV_BOOL' || s.type === 'PREV_NUM') && j !== i)) && j !== i
          ? blockPorts(s.type as BlockType, s.params as Record<string, unknown>).outputs.filter((o) => compatible(o.type, p.type)).map((o) => ({ block: s.id, port: o.name }))
          : [],
      );
      if (sources.length === 0) continue;
      const from = r.pick(sources);
      connections.push({ id: r.chance(0.2) ? `w.${connections.length}:x` : `c${connections.length}`, from, to: { block: b.id, port: p.name } });
    }
  });
  // Shuffle the wire list so its order is not the blocks' order.
  for (let k = connections.length - 1; k > 0; k--) {
    const j = r.int(k + 1);
    [connections[k], connections[j]] = [connections[j], connections[k]];
  }
  return { scanPeriodMs: r.pick([10, 0.5, 25]), blocks, connections };
}

/** What a sheet did, scan by scan: the Q and M image bytes and every block output. */
export type Run = { images: number[][]; outputs: BlockOutputs[] };

/**
 * Runs a sheet for `scans` scans with the compiler (or the reference interpreter): every
 * fifth scan the I area changes — bytes 0..7 to any value, bytes 8..31 to small words
 * (0..63) so that word-fed presets let timers finish within the run.
 */
export function runSheet(sheet: unknown, scans: number, seed: number, engine: 'compiled' | 'interpreted' = 'compiled'): Run {
  const r = createRng(seed);
  const image = createProcessImage();
  const run: Run = { images: [], outputs: [] };
  const compiled = engine === 'compiled' ? compileSheet(sheet) : undefined;
  const interpreted = engine === 'interpreted' ? interpretSheet(sheet) : undefined;
  if ((compiled && !compiled.ok) || (interpreted && !interpreted.ok)) throw new Error('runSheet: the sheet does not validate');
  const state = compiled?.ok ? compiled.value.createState() : undefined;
  for (let s = 0; s < scans; s++) {
    if (s % 5 === 0) for (let k = 0; k < 32; k++) image.I[k] = k < 8 ? r.int(256) : k % 2 === 0 ? r.int(64) : 0;
    if (compiled?.ok && state) {
      compiled.value.scan(state, image);
      run.outputs.push(compiled.value.readBlockOutputs(state));
    } else if (interpreted?.ok) {
      interpreted.value.scan(image);
      run.outputs.push(interpreted.value.readBlockOutputs());
    }
    run.images.push([...image.Q.slice(0, 64), ...image.M.slice(0, 64)]);
  }
  return run;
}
