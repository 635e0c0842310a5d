/**
 * Compiles a logic sheet to straight-line JavaScript: one statement group per block in
 * execution order, reading and writing numbered slots of a Float64Array and the process
 * image's byte arrays, so a scan never walks the graph. The generated source is split into
 * functions of at most {@link BLOCKS_PER_CHUNK} blocks because very large functions are
 * left unoptimised by JavaScript engines (and optimising-compile time grows faster than
 * linearly with function size; 200 measured best for scan rate on V8 11 / Node 20).
 *
 * The code is kept lean because an optimising JIT compiles it in the background while the
 * first scans run slowly: unconnected inputs, parameter presets and CONST outputs are
 * folded in as literals; a value read again later in the same chunk is kept in a local
 * instead of being reloaded; pass-through blocks (coils, MOVE) share their driver's slot;
 * timers and counters evaluate every operation on every scan and only branch to choose
 * among ready values, so the JIT never lacks type feedback for a rarely taken path.
 * Every block output is still stored to its slot each scan, so `PlcState.values` holds
 * the live value of every wire.
 *
 * Block semantics follow IEC 61131-3 (standard function blocks); the comments in
 * `emitBlock` (./emit.ts) give the clause-level rule each one implements. The reference interpreter
 * (./interpret.ts) implements the same rules independently, and tests check the two agree.
 *
 * Generated code only ever interpolates numbers produced here (slot indices, byte and bit
 * numbers, validated finite parameters) — never a string from the document.
 */
import type { Problem, Result } from '@/simulator/shared/result';
import type { ProcessImage } from '@/simulator/address/process-image';
import type { BlockOutputs, CompiledSheet, OutputSlot, PlcState, SerializedPlcState } from './api';
import { emitBlock, emitEpilogue, type Chunk, type Layout } from './emit';
import { analyseSheet, type AnalysedSheet, type AnalyseOptions } from './validate';
import type { SheetBlock } from './sheet-schema';

/** Blocks per generated function. */
export const BLOCKS_PER_CHUNK = 200;

type ChunkFn = (v: Float64Array, I: Uint8Array, Q: Uint8Array, M: Uint8Array, dt: number) => void;

/** Blocks whose only output always equals their IN input: coils pass power flow on, MOVE copies. */
const PASS_THROUGH: Partial<Record<SheetBlock['type'], string>> = { COIL: 'Q', SET_COIL: 'Q', RESET_COIL: 'Q', MOVE: 'OUT' };

/** Whether a block's output slots start at 0 in a fresh state (every block but non-zero PREV / CONST). */
function startsAtZero(b: SheetBlock): boolean {
  switch (b.type) {
    case 'PREV_BOOL':
    case 'CONST_BOOL':
      return b.type === 'PREV_BOOL' ? !b.params.initial : !b.params.value;
    case 'PREV_NUM':
      return Object.is(b.params.initial, 0);
    case 'CONST':
      return Object.is(b.params.value, 0);
    default:
      return true;
  }
}
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

/**
 * Assigns state slots. A wired pass-through block (coil, MOVE) shares its driver's output
 * slot instead of getting its own: the two values are equal whenever anyone can look
 * (after the scan, and in a fresh state, where both are 0), so every output still reads
 * live from `PlcState.values` while the generated code saves a store per coil.
 */
function layout(a: AnalysedSheet): Layout {
  let next = 0;
  const out: Map<string, number>[] = [];
  const mem: number[][] = [];
  const shared = new Set<number>();
  a.sheet.blocks.forEach((b, i) => {
    const m = new Map<string, number>();
    const d = a.drivers[i].get('IN');
    const port = PASS_THROUGH[b.type];
    if (port !== undefined && d && startsAtZero(a.sheet.blocks[d.block])) shared.add(i);
    else for (const p of a.ports[i].outputs) m.set(p.name, next++);
    out.push(m);
    mem.push(Array.from({ length: memoryCount(b.type) }, () => next++));
  });
  // In execution order a driver's slot is known before its pass-through consumers' (chains
  // of MOVEs resolve to the first block's slot).
  for (const i of a.order) {
    if (!shared.has(i)) continue;
    const d = a.drivers[i].get('IN') as { block: number; port: string };
    out[i].set(PASS_THROUGH[a.sheet.blocks[i].type] as string, out[d.block].get(d.port) as number);
  }
  const outputSlots: OutputSlot[] = [];
  for (const i of a.order) {
    for (const p of a.ports[i].outputs) outputSlots.push({ block: a.sheet.blocks[i].id, port: p.name, type: p.type, slot: out[i].get(p.name) as number });
  }
  return { out, mem, slots: next, outputSlots, shared };
}

/** Builds the generated JavaScript source, one string per chunk (exposed for inspection and tests). */
export function generateSource(a: AnalysedSheet, L: Layout = layout(a), blocksPerChunk: number = BLOCKS_PER_CHUNK): string[] {
  const n = a.order.length;
  const chunkOf = new Int32Array(a.sheet.blocks.length);
  a.order.forEach((blockIndex, k) => (chunkOf[blockIndex] = Math.floor(k / blocksPerChunk)));
  const chunkCount = Math.max(1, Math.ceil(n / blocksPerChunk));
  const last = chunkCount - 1;
  // Which output slots a later block in the same chunk reads (PREV inputs are read by the
  // epilogue, which runs at the end of the last chunk).
  const readHere: Set<number>[] = Array.from({ length: chunkCount }, () => new Set());
  a.sheet.blocks.forEach((b, i) => {
    const prev = b.type === 'PREV_BOOL' || b.type === 'PREV_NUM';
    for (const d of a.drivers[i].values()) {
      const consumerChunk = prev ? last : chunkOf[i];
      if (chunkOf[d.block] === consumerChunk) readHere[consumerChunk].add(L.out[d.block].get(d.port) as number);
    }
  });
  const chunks: string[] = [];
  for (let c = 0; c < chunkCount; c++) {
    const C: Chunk = { locals: new Set(), readHere: readHere[c] };
    const lines = a.order.slice(c * blocksPerChunk, (c + 1) * blocksPerChunk).map((i) => emitBlock(a, L, C, i));
    if (c === last) lines.push(...emitEpilogue(a, L, C));
    chunks.push(lines.map((line) => line.trim()).filter((line) => line !== '').join('\n'));
  }
  return chunks;
}

/**
 * Validates and compiles a logic sheet. Returns every problem (with paths) for a bad
 * sheet; a good one becomes a {@link CompiledSheet} whose `scan` runs generated code.
 */
export function compileSheet(input: unknown): Result<CompiledSheet, Problem> {
  return compileSheetWith(input, {});
}

/** Compile options: what the sheet alone cannot know, and code generation for tests and benchmarks. */
export type CompileOptions = AnalyseOptions & {
  /** Blocks per generated function (default {@link BLOCKS_PER_CHUNK}); small values exercise chunk boundaries. */
  blocksPerChunk?: number;
};

/** {@link compileSheet} with explicit code-generation options. */
export function compileSheetWith(input: unknown, options: CompileOptions): Result<CompiledSheet, Problem> {
  const analysed = analyseSheet(input, options);
  if (!analysed.ok) return analysed;
  const a = analysed.value;
  const L = layout(a);
  const perChunk = Math.max(1, Math.floor(options.blocksPerChunk ?? BLOCKS_PER_CHUNK));
  const fns = generateSource(a, L, perChunk).map(
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
