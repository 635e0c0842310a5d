/**
 * Test helper: the independent oracle for the prover's cross-check (oracle-a/b.test.ts).
 * It shares no code with the prover: it runs the engine's compiled sheet (itself
 * property-tested against the reference interpreter in simulator/plc) on every input
 * vector from every reachable concrete state, breadth first, with its own rule monitors,
 * so the first violating level is the shortest counterexample's last scan.
 *
 * A search that empties its frontier is complete: then "no violation" must be `proved`
 * and a violation at scan d must be `violated` at exactly scan d. A search cut off by its
 * depth or scan limit still requires that the prover reports no violation the oracle
 * would have seen. Every counterexample the prover reports is replayed here too.
 */
import { expect } from 'vitest';
import { createProcessImage, getBit } from '@/simulator/address/process-image';
import { compileSheet, type CompiledSheet, type PlcState } from '@/simulator/plc';
import { proveRules, type Verdict } from './prove';
import type { InterlockRuleInput, RuleCondition } from './rules';
import { generate, OUT_BITS, prng } from './test-sheets';

// ---- the oracle's own rule semantics (written from the rule definitions in ./rules.ts)
/** Post-scan bits by watch position. */
type Bits = Uint8Array;
type Test = (bits: Bits) => boolean;
function compileCondition(c: RuleCondition, index: Map<string, number>): Test {
  if ('signal' in c) {
    const i = index.get(c.signal) as number;
    const want = c.value === 'on' ? 1 : 0;
    return (bits) => bits[i] === want;
  }
  if ('all' in c) {
    const xs = c.all.map((x) => compileCondition(x, index));
    return (bits) => xs.every((x) => x(bits));
  }
  if ('any' in c) {
    const xs = c.any.map((x) => compileCondition(x, index));
    return (bits) => xs.some((x) => x(bits));
  }
  const x = compileCondition(c.not, index);
  return (bits) => !x(bits);
}
/** Monitor state: [after held last scan (0/1), scans since the oldest unanswered trigger or −1]. */
type Mon = [number, number];
type Monitor = (m: Mon, bits: Bits) => { next: Mon; broken: boolean };
function compileRule(rule: InterlockRuleInput, index: Map<string, number>): Monitor {
  const c = (x: RuleCondition) => compileCondition(x, index);
  if (rule.kind === 'never') {
    const [a, b] = [c(rule.what), c(rule.while)];
    return (m, bits) => ({ next: m, broken: a(bits) && b(bits) });
  }
  if (rule.kind === 'only-if') {
    const a = c(rule.what);
    const req = rule.requires.map(c);
    return (m, bits) => ({ next: m, broken: a(bits) && !req.every((x) => x(bits)) });
  }
  const [after, expect_] = [c(rule.after), c(rule.expect)];
  const holdsTrigger = rule.trigger === 'holds';
  return (m, bits) => {
    const x = after(bits);
    const fired = holdsTrigger ? x : x && m[0] === 0;
    if (expect_(bits)) return { next: [x ? 1 : 0, -1], broken: false };
    const age = m[1] >= 0 ? m[1] + 1 : fired ? 0 : -1;
    return { next: [x ? 1 : 0, age], broken: age >= 0 && age >= rule.scans };
  };
}

/** A concrete state of the product: the PLC's state, its Q and M bytes, and every rule's monitor. */
type Concrete = { plc: PlcState; Q: number; M: number; mons: Mon[] };
/** Per rule: the first violating scan, or null; `levels`: how many scans deep every run was explored. */
type OracleResult = { violatedAt: (number | null)[]; complete: boolean; levels: number };
const MAX_LEVEL = 20;
const MAX_SCANS = 20_000;
const FROZEN: Mon = [0, -2];

type WatchBits = [area: 'I' | 'Q' | 'M', byte: number, bit: number][];
const scratch = createProcessImage(2);
/**
 * One scan from `s` with input vector `v` (bit k → %IX(k>>3).(k&7)) into `into`, a
 * scratch state (copied only when the search keeps it); the post-scan bits by watch position.
 */
function scanInto(c: CompiledSheet, s: Concrete, v: number, watch: WatchBits, into: PlcState) {
  into.values.set(s.plc.values);
  into.scans = s.plc.scans;
  const image = scratch;
  image.I[0] = v & 255;
  image.I[1] = (v >> 8) & 255;
  image.Q[0] = s.Q;
  image.M[0] = s.M;
  c.scan(into, image);
  const bits = new Uint8Array(watch.length);
  watch.forEach(([area, byte, bit], i) => (bits[i] = getBit(image, area, byte, bit) ? 1 : 0));
  return { Q: image.Q[0], M: image.M[0], bits };
}

/**
 * Breadth-first search over the product of the PLC and all rule monitors. Each product
 * state is expanded at its first (smallest) depth, so the first level with a bad
 * transition for a rule is its shortest counterexample's last scan. A rule's monitor is
 * frozen once it has been violated (it no longer matters, and its count would grow).
 */
function oracle(c: CompiledSheet, monitors: Monitor[], nInputs: number, watch: WatchBits): OracleResult {
  const violatedAt: (number | null)[] = monitors.map(() => null);
  let frontier: Concrete[] = [{ plc: c.createState(), Q: 0, M: 0, mons: monitors.map((): Mon => [0, -1]) }];
  const seen = new Set<string>();
  let scans = 0;
  const work = c.createState();
  for (let level = 0; level <= MAX_LEVEL; level++) {
    const next: Concrete[] = [];
    for (const s of frontier) {
      for (let v = 0; v < 2 ** nInputs; v++) {
        const out = scanInto(c, s, v, watch, work);
        scans++;
        const mons = monitors.map((m, r) => {
          if (violatedAt[r] !== null && violatedAt[r] < level) return FROZEN;
          const step = m(s.mons[r], out.bits);
          if (step.broken && violatedAt[r] === null) violatedAt[r] = level;
          return violatedAt[r] !== null ? FROZEN : step.next;
        });
        const key = `${Buffer.from(work.values.buffer).toString('latin1')}|${out.Q}|${out.M}|${mons.join(';')}`;
        if (seen.has(key)) continue;
        seen.add(key);
        next.push({ plc: { values: work.values.slice(), scans: work.scans }, Q: out.Q, M: out.M, mons });
      }
      if (scans > MAX_SCANS) return { violatedAt, complete: violatedAt.every((x) => x !== null), levels: level };
    }
    if (violatedAt.every((x) => x !== null) || next.length === 0) return { violatedAt, complete: true, levels: level + 1 };
    frontier = next;
  }
  return { violatedAt, complete: violatedAt.every((x) => x !== null), levels: MAX_LEVEL + 1 };
}

/** Replays a counterexample with the oracle's scan and monitor; the scan where it breaks, or null. */
function replayCex(c: CompiledSheet, monitor: Monitor, inputs: string[], watch: WatchBits, v: Extract<Verdict, { status: 'violated' }>): number | null {
  let s: Concrete = { plc: c.createState(), Q: 0, M: 0, mons: [[0, -1]] };
  const work = c.createState();
  for (let k = 0; k < v.counterexample.scans.length; k++) {
    const given = v.counterexample.scans[k].inputs;
    const vector = inputs.reduce((acc, a, i) => acc | ((given[a] ? 1 : 0) << i), 0);
    const out = scanInto(c, s, vector, watch, work);
    const { next, broken } = monitor(s.mons[0], out.bits);
    if (broken) return k;
    s = { plc: { values: work.values.slice(), scans: work.scans }, Q: out.Q, M: out.M, mons: [next] };
  }
  return null;
}

const cpuMs = (since: NodeJS.CpuUsage) => {
  const d = process.cpuUsage(since);
  return Math.round((d.user + d.system) / 1000);
};

/** Counts of one cross-check run (times are CPU ms, which a busy machine does not inflate). */
export type Tally = {
  sheets: number;
  rules: number;
  /** Agreements: no violation in a complete search and `proved`; a violation at scan d and `violated` at d. */
  provedComplete: number;
  violatedAgreed: number;
  /** Searches cut off by their limits, and how many of those rules the prover proved. */
  incomplete: number;
  provedIncomplete: number;
  undecided: number;
  /** Rules whose cone holds an abstracted block. */
  inexact: number;
  maxInputs: number;
  proverMs: number;
  oracleMs: number;
};

/**
 * Generates `count` sheets from `seed`, proves their rules and checks every verdict
 * against the oracle. With `timerHorizonScans` small, timers are abstracted: then a
 * verdict may be undecided, but `proved` must still mean no violation and `violated` the
 * oracle's own shortest one (soundness of the abstraction).
 */
export function crossCheck(seed: number, count: number, options: { timerHorizonScans?: number } = {}): Tally {
  const abstracting = options.timerHorizonScans !== undefined;
  const r = prng(seed);
  const tally: Tally = { sheets: 0, rules: 0, provedComplete: 0, violatedAgreed: 0, incomplete: 0, provedIncomplete: 0, undecided: 0, inexact: 0, maxInputs: 0, proverMs: 0, oracleMs: 0 };
  for (let n = 0; n < count; n++) {
    const g = generate(r, n);
    const compiled = compileSheet(g.sheet);
    if (!compiled.ok) throw new Error(`generator made an invalid sheet: ${JSON.stringify(compiled.errors)}`);
    const t0 = process.cpuUsage();
    const verdicts = proveRules(g.sheet, g.rules, { maxDepth: MAX_LEVEL + 10, ...options });
    tally.proverMs += cpuMs(t0);
    if (!verdicts.ok) throw new Error(`prover refused sheet ${n}: ${JSON.stringify(verdicts.errors)}`);
    const names = [...new Set([...g.inputs, ...OUT_BITS])];
    const index = new Map(names.map((a, i) => [a, i]));
    const watch = names.map((a) => {
      const m = /^%([IQM])X(\d+)\.(\d)$/.exec(a) as RegExpExecArray;
      return [m[1] as 'I' | 'Q' | 'M', Number(m[2]), Number(m[3])] as WatchBits[number];
    });
    const monitors = g.rules.map((rule) => compileRule(rule, index));
    const t1 = process.cpuUsage();
    const o = oracle(compiled.value, monitors, g.inputs.length, watch);
    tally.oracleMs += cpuMs(t1);
    tally.sheets++;
    tally.maxInputs = Math.max(tally.maxInputs, g.inputs.length);
    g.rules.forEach((rule, i) => {
      tally.rules++;
      const v = verdicts.value[i];
      const where = `sheet ${n} rule ${i}: ${JSON.stringify({ sheet: g.sheet, rule, verdict: v.status })}`;
      // Without a small horizon every block here is encoded exactly (timers of at most 5 scans, constant presets and comparisons).
      if (!abstracting) expect(v.exact, where).toBe(true);
      if (!v.exact) tally.inexact++;
      const seenAt = o.violatedAt[i];
      if (v.status === 'violated') {
        expect(replayCex(compiled.value, monitors[i], g.inputs, watch, v), where).toBe(v.counterexample.failsAtScan);
        expect(v.counterexample.scans).toHaveLength(v.counterexample.failsAtScan + 1);
        // Shortest: the oracle's first violation, or beyond what it explored.
        if (seenAt !== null) expect(v.counterexample.failsAtScan, where).toBe(seenAt);
        else expect(v.counterexample.failsAtScan, where).toBeGreaterThanOrEqual(o.levels);
      }
      if (v.status === 'proved') expect(seenAt, where).toBeNull();
      if (v.status === 'undecided') {
        tally.undecided++;
        // Undecided says "no violation within `bound` scans": the oracle must agree.
        if (seenAt !== null) expect(v.bound, where).toBeLessThanOrEqual(seenAt);
        if (!abstracting) expect(v.reason, where).not.toBe('abstraction');
      }
      if (seenAt !== null) {
        if (!abstracting) expect(v.status, where).toBe('violated');
        if (v.status === 'violated') tally.violatedAgreed++;
      } else if (o.complete) {
        if (!abstracting) expect(v.status, where).toBe('proved');
        if (v.status === 'proved') tally.provedComplete++;
      } else {
        tally.incomplete++;
        if (v.status === 'proved') tally.provedIncomplete++;
      }
    });
  }
  return tally;
}
