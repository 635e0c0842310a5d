/**
 * Interlock-prover benchmark: twenty rules proved over one generated logic sheet with 32
 * free inputs, latches, edge detectors and counters. Target ≤ 1,000 ms (warm-up once,
 * then the median of three runs).
 *
 * The sheet: 8 invented stations, 4 inputs each (start NO, stop NC, guard switch, part
 * sensor). Per station s:
 *   start → R_TRIG · AND(edge, stop ok, guard closed, neighbour s−1 not running) → RS set
 *   OR(stop pressed, guard open, batch done) → RS reset (reset-dominant)
 *   part → CTU (PV 2..4, reset by the start edge) → coil %MX(s).0 "batch done"
 *   RS.Q1 AND guard closed → coil %QX(s).0 "run";  stop → F_TRIG → coil %MX(s).1
 * Rules: per station "never run while the guard is open" (proved); for four stations
 * "batch done only with a part present" (violated after 4 to 8 scans: the count stays
 * latched), for four "a stop press is flagged in the same scan" (proved by induction);
 * and four "never stations s and s+1 running together" (violated: the interlock only
 * looks one way).
 *
 * Run alone: `npx tsx tests/bench/proof-bench.ts`.
 */
import { proveRules, type InterlockRuleInput, type LogicSheetInput } from '@/simulator';
import { median } from './bench-support';

const STATIONS = 8;
const bit = (area: 'I' | 'Q' | 'M', byte: number, b: number) => `%${area}X${byte}.${b}`;

/** The generated sheet (32 inputs: %IX0.0 … %IX3.7). */
export function proofBenchSheet(): LogicSheetInput {
  const blocks: LogicSheetInput['blocks'] = [];
  const connections: LogicSheetInput['connections'] = [];
  const at = { x: 0, y: 0 };
  const add = (id: string, type: LogicSheetInput['blocks'][number]['type'], params: Record<string, unknown> = {}) =>
    blocks.push({ id, type, params, position: at } as LogicSheetInput['blocks'][number]);
  const wire = (from: string, fp: string, to: string, tp: string) => connections.push({ id: `${from}.${fp}:${to}.${tp}`, from: { block: from, port: fp }, to: { block: to, port: tp } });
  for (let s = 0; s < STATIONS; s++) {
    const id = (x: string) => `s${s}_${x}`;
    const input = (k: number) => bit('I', s >> 1, (s & 1) * 4 + k);
    add(id('start'), 'NO_CONTACT', { address: input(0) });
    add(id('stopOk'), 'NO_CONTACT', { address: input(1) });
    add(id('stopPressed'), 'NC_CONTACT', { address: input(1) });
    add(id('guard'), 'NO_CONTACT', { address: input(2) });
    add(id('guardOpen'), 'NC_CONTACT', { address: input(2) });
    add(id('guardNow'), 'NO_CONTACT', { address: input(2) });
    add(id('part'), 'NO_CONTACT', { address: input(3) });
    add(id('neighbourIdle'), 'NC_CONTACT', { address: bit('Q', (s + STATIONS - 1) % STATIONS, 0) });
    add(id('edge'), 'R_TRIG');
    add(id('permit'), 'AND', { inputs: 4 });
    add(id('reset'), 'OR', { inputs: 3 });
    add(id('latch'), 'RS');
    add(id('count'), 'CTU', { PV: 2 + (s % 3) });
    add(id('done'), 'COIL', { address: bit('M', s, 0) });
    add(id('run'), 'COIL', { address: bit('Q', s, 0) });
    add(id('stopEdge'), 'F_TRIG');
    add(id('stopped'), 'COIL', { address: bit('M', s, 1) });
    wire(id('start'), 'Q', id('edge'), 'CLK');
    wire(id('edge'), 'Q', id('permit'), 'IN1');
    wire(id('stopOk'), 'Q', id('permit'), 'IN2');
    wire(id('guard'), 'Q', id('permit'), 'IN3');
    wire(id('neighbourIdle'), 'Q', id('permit'), 'IN4');
    wire(id('permit'), 'Q', id('latch'), 'S');
    wire(id('stopPressed'), 'Q', id('reset'), 'IN1');
    wire(id('guardOpen'), 'Q', id('reset'), 'IN2');
    wire(id('count'), 'Q', id('reset'), 'IN3');
    wire(id('reset'), 'Q', id('latch'), 'R1');
    wire(id('part'), 'Q', id('count'), 'CU');
    wire(id('edge'), 'Q', id('count'), 'R');
    wire(id('count'), 'Q', id('done'), 'IN');
    wire(id('latch'), 'Q1', id('guardNow'), 'IN');
    wire(id('guardNow'), 'Q', id('run'), 'IN');
    wire(id('stopOk'), 'Q', id('stopEdge'), 'CLK');
    wire(id('stopEdge'), 'Q', id('stopped'), 'IN');
  }
  return { scanPeriodMs: 10, blocks, connections };
}

/** The twenty rules. */
export function proofBenchRules(): InterlockRuleInput[] {
  const rules: InterlockRuleInput[] = [];
  const input = (s: number, k: number) => bit('I', s >> 1, (s & 1) * 4 + k);
  for (let s = 0; s < STATIONS; s++) {
    rules.push({ id: `s${s}-guard`, title: `Station ${s}: no run with the guard open`, kind: 'never', what: { signal: bit('Q', s, 0), value: 'on' }, while: { signal: input(s, 2), value: 'off' } });
  }
  for (let s = 0; s < 4; s++) {
    // Violated: "batch done" stays latched in the counter after the part leaves (needs 2·PV edges' worth of scans).
    rules.push({ id: `s${s}-done`, title: `Station ${s}: batch done only with a part present`, kind: 'only-if', what: { signal: bit('M', s, 0), value: 'on' }, requires: [{ signal: input(s, 3), value: 'on' }] });
  }
  for (let s = 4; s < STATIONS; s++) {
    // Proved by induction: the F_TRIG pulse answers the stop press in the same scan.
    rules.push({ id: `s${s}-stopped`, title: `Station ${s}: a stop press is flagged at once`, kind: 'within', after: { signal: input(s, 1), value: 'off' }, expect: { signal: bit('M', s, 1), value: 'on' }, scans: 0 });
  }
  for (let s = 0; s < 4; s++) {
    rules.push({
      id: `pair${s}`,
      title: `Stations ${s} and ${s + 1} never run together`,
      kind: 'never',
      what: { signal: bit('Q', s, 0), value: 'on' },
      while: { signal: bit('Q', s + 1, 0), value: 'on' },
    });
  }
  return rules;
}

/** Proves the twenty rules; returns the median wall time of three runs after a warm-up. */
export function proofBench(): { proof_ms_20_rules_32_inputs: number } {
  const sheet = proofBenchSheet();
  const rules = proofBenchRules();
  const once = () => {
    const t0 = performance.now();
    const r = proveRules(sheet, rules);
    const ms = performance.now() - t0;
    if (!r.ok) throw new Error(`bench sheet or rules invalid: ${JSON.stringify(r.errors)}`);
    if (r.value.length !== 20) throw new Error('expected twenty verdicts');
    return { ms, verdicts: r.value };
  };
  once();
  const runs = [once(), once(), once()];
  return { proof_ms_20_rules_32_inputs: Math.round(median(runs.map((x) => x.ms))) };
}

if (process.argv[1]?.endsWith('proof-bench.ts')) {
  const sheet = proofBenchSheet();
  const r = proveRules(sheet, proofBenchRules());
  if (r.ok) for (const v of r.value) process.stdout.write(`${v.rule}: ${v.status}${v.status === 'violated' ? ` at scan ${v.counterexample.failsAtScan}` : v.status === 'proved' ? ` (${v.method} ${v.depth})` : ` (${v.reason})`}\n`);
  process.stdout.write(`${JSON.stringify(proofBench())}\n`);
}
