/**
 * Whole-sheet validation: structure (zod) first, then the wiring graph. Every problem
 * is reported with its path; a sheet with any problem is never compiled.
 *
 * Graph rules: ids unique; a connection names an existing block and one of its ports
 * (an output at `from`, an input at `to`); BOOL wires only to BOOL (NUM and TIME mix,
 * see ./catalogue.ts); an input has at most one driver; no algebraic loop (a cycle not
 * broken by a PREV_BOOL or PREV_NUM block) — each loop is reported once, naming its blocks.
 */
import type { z } from 'zod';
import { parseAddressCached, SIZE_BITS, type Address } from '@/simulator/address/address';
import type { Problem, Result } from '@/simulator/shared/result';
import { issuesToProblems } from '@/simulator/shared/zod-problems';
import { blockCatalogue, blockPorts, portTypesCompatible, type PortSpec } from './catalogue';
import { logicSheetSchema, type LogicSheet } from './sheet-schema';

/** Where an input's value comes from: another block's output. */
export type Driver = { block: number; port: string };

/** A validated sheet with its resolved wiring, as the compiler needs it. */
export type AnalysedSheet = {
  sheet: LogicSheet;
  ports: { inputs: PortSpec[]; outputs: PortSpec[] }[];
  /** Per block index: input port name → driver. */
  drivers: Map<string, Driver>[];
  /** Block indices in execution order. */
  order: number[];
  /** Per block index: a SPAN_MAP's raw span as it runs (its own parameters, or resolved); null for other blocks. */
  spans: ({ inMin: number; inMax: number } | null)[];
};

/**
 * The raw span of the analog input behind an address (bottom and top of its nominal span in
 * counts), or null when no analog module covers it. A cell passes its modules' count ranges.
 */
export type AnalogSpanOf = (address: Address) => { lo: number; hi: number } | null;

/** What the sheet alone cannot know. */
export type AnalyseOptions = { analogSpan?: AnalogSpanOf };

/**
 * A SPAN_MAP's raw span when its parameters leave it out: the span of the WORD_IN feeding IN
 * — the analog module's count range when `analogSpan` knows the address, else the word's own
 * range as it is read (unsigned 0..2^n − 1, signed 0..2^(n−1) − 1). Null when IN is not fed
 * by a WORD_IN (nothing says what the raw span is).
 */
function resolvedSpan(sheet: LogicSheet, drivers: Map<string, Driver>[], i: number, options: AnalyseOptions): { inMin: number; inMax: number } | null {
  const b = sheet.blocks[i];
  if (b.type !== 'SPAN_MAP') return null;
  if (b.params.inMin !== undefined && b.params.inMax !== undefined) return { inMin: b.params.inMin, inMax: b.params.inMax };
  const d = drivers[i].get('IN');
  const src = d ? sheet.blocks[d.block] : undefined;
  if (!src || src.type !== 'WORD_IN') return null;
  const address = parseAddressCached(src.params.address);
  if (!address) return null;
  const analog = options.analogSpan?.(address);
  if (analog) return { inMin: analog.lo, inMax: analog.hi };
  const bits = SIZE_BITS[address.size];
  return { inMin: 0, inMax: src.params.signed ? 2 ** (bits - 1) - 1 : 2 ** bits - 1 };
}

/** Turns zod issues into Problems with stable codes (the sheet's names for unions and sizes). */
export function zodIssuesToProblems(issues: readonly z.core.$ZodIssue[], prefix: (string | number)[] = []): Problem[] {
  return issuesToProblems(issues, prefix, (issue) => {
    if (issue.code === 'invalid_union' && 'discriminator' in issue) return 'unknown_block_type';
    if (issue.code === 'too_big' && issue.path.length === 1 && (issue.path[0] === 'blocks' || issue.path[0] === 'connections')) return 'too_large';
    return undefined;
  });
}

/** Validates and analyses a sheet: every problem, or the wiring, execution order and resolved spans. */
export function analyseSheet(input: unknown, options: AnalyseOptions = {}): Result<AnalysedSheet, Problem> {
  const parsed = logicSheetSchema.safeParse(input);
  if (!parsed.success) return { ok: false, errors: zodIssuesToProblems(parsed.error.issues) };
  const sheet = parsed.data;
  const problems: Problem[] = [];
  const blocks = sheet.blocks;
  const n = blocks.length;

  const index = new Map<string, number>();
  blocks.forEach((b, i) => {
    if (index.has(b.id)) {
      problems.push({ path: ['blocks', i, 'id'], code: 'duplicate_id', message: `block id "${b.id}" is used more than once`, related: [b.id] });
    } else index.set(b.id, i);
  });
  const connIds = new Set<string>();
  sheet.connections.forEach((c, j) => {
    if (connIds.has(c.id)) {
      problems.push({ path: ['connections', j, 'id'], code: 'duplicate_id', message: `connection id "${c.id}" is used more than once`, related: [c.id] });
    } else connIds.add(c.id);
  });

  const ports = blocks.map((b) => blockPorts(b.type, b.params as Record<string, unknown>));
  const drivers: Map<string, Driver>[] = blocks.map(() => new Map());
  const driverConn: Map<string, number>[] = blocks.map(() => new Map());
  // Ordering edges: source block → consumer block, except into loop-breaking blocks.
  const succ: number[][] = blocks.map(() => []);
  const edgeConn: { from: number; to: number; conn: number }[] = [];

  sheet.connections.forEach((c, j) => {
    const fi = index.get(c.from.block);
    const ti = index.get(c.to.block);
    if (fi === undefined) {
      problems.push({ path: ['connections', j, 'from', 'block'], code: 'dangling_connection', message: `connection "${c.id}" starts at unknown block "${c.from.block}"` });
    }
    if (ti === undefined) {
      problems.push({ path: ['connections', j, 'to', 'block'], code: 'dangling_connection', message: `connection "${c.id}" ends at unknown block "${c.to.block}"` });
    }
    const out = fi === undefined ? undefined : ports[fi].outputs.find((p) => p.name === c.from.port);
    const inp = ti === undefined ? undefined : ports[ti].inputs.find((p) => p.name === c.to.port);
    if (fi !== undefined && !out) {
      problems.push({
        path: ['connections', j, 'from', 'port'],
        code: 'unknown_port',
        message: `${blocks[fi].type} block "${c.from.block}" has no output "${c.from.port}" (outputs: ${ports[fi].outputs.map((p) => p.name).join(', ') || 'none'})`,
      });
    }
    if (ti !== undefined && !inp) {
      problems.push({
        path: ['connections', j, 'to', 'port'],
        code: 'unknown_port',
        message: `${blocks[ti].type} block "${c.to.block}" has no input "${c.to.port}" (inputs: ${ports[ti].inputs.map((p) => p.name).join(', ') || 'none'})`,
      });
    }
    if (!out || !inp || fi === undefined || ti === undefined) return;
    if (!portTypesCompatible(out.type, inp.type)) {
      problems.push({
        path: ['connections', j],
        code: 'type_mismatch',
        message: `connection "${c.id}" wires ${out.type} output ${c.from.block}.${c.from.port} to ${inp.type} input ${c.to.block}.${c.to.port}`,
      });
      return;
    }
    const earlier = driverConn[ti].get(inp.name);
    if (earlier !== undefined) {
      problems.push({
        path: ['connections', j, 'to'],
        code: 'multiple_drivers',
        message: `input ${c.to.block}.${c.to.port} is already driven by connection "${sheet.connections[earlier].id}"`,
        related: [sheet.connections[earlier].id],
      });
      return;
    }
    driverConn[ti].set(inp.name, j);
    drivers[ti].set(inp.name, { block: fi, port: out.name });
    if (!blockCatalogue[blocks[ti].type].breaksLoops) {
      succ[fi].push(ti);
      edgeConn.push({ from: fi, to: ti, conn: j });
    }
  });

  const order = topologicalOrder(n, succ);
  if (order.length < n) {
    const placed = new Uint8Array(n);
    for (const i of order) placed[i] = 1;
    for (const scc of cycles(n, succ, placed)) {
      const members = new Set(scc);
      const conn = edgeConn.filter((e) => members.has(e.from) && members.has(e.to)).reduce((m, e) => Math.min(m, e.conn), Infinity);
      const ids = [...scc].sort((a, b) => a - b).map((i) => blocks[i].id);
      problems.push({
        path: ['connections', conn],
        code: 'algebraic_loop',
        message: `algebraic loop through blocks ${ids.join(', ')}: break it with a PREV_BOOL or PREV_NUM block (previous-scan value)`,
        related: ids,
      });
    }
  }
  const spans = blocks.map((_, i) => resolvedSpan(sheet, drivers, i, options));
  blocks.forEach((b, i) => {
    if (b.type === 'SPAN_MAP' && spans[i] === null) {
      problems.push({ path: ['blocks', i, 'params', 'inMin'], code: 'raw_span_unknown', message: `SPAN_MAP "${b.id}" has no inMin/inMax and its IN is not fed by a WORD_IN: give the raw span, or wire IN from the WORD_IN of an analog input` });
    }
  });
  if (problems.length > 0) return { ok: false, errors: problems };
  return { ok: true, value: { sheet, ports, drivers, order, spans } };
}

/** Kahn's algorithm; among ready blocks the lowest sheet index goes first (a binary heap). */
function topologicalOrder(n: number, succ: number[][]): number[] {
  const indeg = new Int32Array(n);
  for (const list of succ) for (const t of list) indeg[t]++;
  const heap: number[] = [];
  const push = (x: number) => {
    heap.push(x);
    let i = heap.length - 1;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (heap[p] <= x) break;
      heap[i] = heap[p];
      i = p;
    }
    heap[i] = x;
  };
  const pop = (): number => {
    const top = heap[0];
    const last = heap.pop() as number;
    if (heap.length > 0) {
      let i = 0;
      for (;;) {
        const l = 2 * i + 1;
        if (l >= heap.length) break;
        const r = l + 1;
        const c = r < heap.length && heap[r] < heap[l] ? r : l;
        if (heap[c] >= last) break;
        heap[i] = heap[c];
        i = c;
      }
      heap[i] = last;
    }
    return top;
  };
  for (let i = 0; i < n; i++) if (indeg[i] === 0) push(i);
  const order: number[] = [];
  while (heap.length > 0) {
    const i = pop();
    order.push(i);
    for (const t of succ[i]) if (--indeg[t] === 0) push(t);
  }
  return order;
}

/**
 * Strongly connected components among the unplaced blocks that form a cycle (size > 1,
 * or a block wired to itself). Iterative Tarjan, so 20,000 blocks cannot overflow the stack.
 */
function cycles(n: number, succ: number[][], placed: Uint8Array): number[][] {
  const idx = new Int32Array(n).fill(-1);
  const low = new Int32Array(n);
  const onStack = new Uint8Array(n);
  const stack: number[] = [];
  const out: number[][] = [];
  let counter = 0;
  for (let root = 0; root < n; root++) {
    if (placed[root] || idx[root] !== -1) continue;
    const work: [number, number][] = [[root, 0]];
    idx[root] = low[root] = counter++;
    stack.push(root);
    onStack[root] = 1;
    while (work.length > 0) {
      const frame = work[work.length - 1];
      const [v, k] = frame;
      const next = succ[v];
      if (k < next.length) {
        frame[1] = k + 1;
        const w = next[k];
        if (placed[w]) continue;
        if (idx[w] === -1) {
          idx[w] = low[w] = counter++;
          stack.push(w);
          onStack[w] = 1;
          work.push([w, 0]);
        } else if (onStack[w]) low[v] = Math.min(low[v], idx[w]);
      } else {
        work.pop();
        if (work.length > 0) {
          const parent = work[work.length - 1][0];
          low[parent] = Math.min(low[parent], low[v]);
        }
        if (low[v] === idx[v]) {
          const comp: number[] = [];
          let w: number;
          do {
            w = stack.pop() as number;
            onStack[w] = 0;
            comp.push(w);
          } while (w !== v);
          if (comp.length > 1 || succ[v].includes(v)) out.push(comp);
        }
      }
    }
  }
  return out;
}

/** Validates a sheet document; returns the sheet with defaults applied, or every problem. */
export function validateSheet(input: unknown, options: AnalyseOptions = {}): Result<LogicSheet, Problem> {
  const r = analyseSheet(input, options);
  return r.ok ? { ok: true, value: r.value.sheet } : r;
}
