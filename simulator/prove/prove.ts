/**
 * The interlock prover's entry: `proveRules(document or sheet, rules, options)` checks each
 * rule over every input combination and every reachable state of the logic sheet and
 * returns one verdict per rule. Pure and deterministic: no clock, no randomness; effort
 * is bounded by a depth and a clause budget, and the caller puts wall-time limits around it.
 *
 * Scope: the logic sheet alone, as the PLC solves it each scan — every %IX input free in
 * every scan, memory starting off. Forces, faults, wiring and the controller are outside
 * the proof (a forced %Q point is the operator's override, not the program's behaviour).
 */
import { analyseSheet } from '@/simulator/plc/validate';
import { compileSheet } from '@/simulator/plc/compile';
import type { Problem, Result } from '@/simulator/shared/result';
import { issuesToProblems } from '@/simulator/shared/zod-problems';
import { checkSafety, createSatSession, type CheckStats, type SatSession } from './bmc';
import { createReplayer, firstViolation } from './concrete';
import { encodeSheet } from './encode';
import { addMonitor } from './monitor';
import { describeRule, interlockRulesSchema, ruleAddresses, signalLabels, type InterlockRule, type SignalLabels } from './rules';
import type { EncodingNote } from './system';
import type { CompiledSheet } from '@/simulator/plc/api';
import type { CellDocument } from '@/simulator/schema/cell-document';

/** Options of {@link proveRules}. */
export type ProveOptions = {
  /** Deepest scan a counterexample is searched to (0-based), and the largest induction depth. */
  maxDepth?: number;
  /**
   * Most clauses handed to the SAT solver per rule: a deterministic stand-in for time, and
   * a bound on memory (the solver keeps every clause; some hundred bytes each).
   */
  budget?: number;
  /** Longest timer encoded exactly, in scans; longer ones are abstracted (see the verdict's notes). */
  timerHorizonScans?: number;
};

/** Defaults of {@link ProveOptions}. */
export const PROVE_DEFAULTS: Required<ProveOptions> = { maxDepth: 40, budget: 250_000, timerHorizonScans: 1000 };

/** A run that breaks a rule: the shortest one. */
export type Counterexample = {
  /** The sheet's scan period; scan k runs at (k + 1) · period of cell time. */
  scanPeriodMs: number;
  /** The %IX inputs that can influence the rule, canonical; no other input can change its signals. */
  inputs: string[];
  /** One entry per scan: the inputs read that scan, and the rule's signals after it. */
  scans: { inputs: Record<string, boolean>; signals: Record<string, boolean> }[];
  /** The scan (0-based, the last) after which the rule is broken. */
  failsAtScan: number;
};

/** A proof's answer for one rule. */
export type Verdict = {
  rule: string;
  title: string;
  /** The rule in plain English. */
  text: string;
  /** True when every block that can influence the rule is encoded exactly (see `encoding`). */
  exact: boolean;
  /** How each block in the rule's cone of influence with state or an abstraction was encoded. */
  encoding: EncodingNote[];
  stats: CheckStats;
} & (
  | {
      status: 'proved';
      /** `k-induction` at `depth`, or `exhaustive`: every reachable state lies within `depth` scans. */
      method: 'k-induction' | 'exhaustive';
      depth: number;
    }
  | { status: 'violated'; counterexample: Counterexample }
  | {
      status: 'undecided';
      /** No violation within the first `bound` scans. */
      bound: number;
      reason: 'max-depth' | 'budget' | 'abstraction';
      detail: string;
    }
);

/** Replays at most this many candidate input vectors while simplifying a counterexample. */
const SIMPLIFY_RUNS = 2000;

/**
 * Proves interlock rules on a cell document's logic sheet (or a bare logic sheet).
 * Returns every problem of an invalid sheet or rule list, with paths (`['plc', 'sheet', …]`,
 * `['rules', i, …]`); otherwise one verdict per rule, in order.
 */
export function proveRules(input: unknown, rules: unknown, options: ProveOptions = {}): Result<Verdict[], Problem> {
  const whole = (x: number | undefined, fallback: number) => (x !== undefined && Number.isFinite(x) ? Math.max(0, Math.floor(x)) : fallback);
  const opts = {
    maxDepth: whole(options.maxDepth, PROVE_DEFAULTS.maxDepth),
    budget: whole(options.budget, PROVE_DEFAULTS.budget),
    timerHorizonScans: whole(options.timerHorizonScans, PROVE_DEFAULTS.timerHorizonScans),
  };
  const isCell = typeof input === 'object' && input !== null && 'plc' in input;
  const sheetInput = isCell ? (input as { plc?: { sheet?: unknown } }).plc?.sheet : input;
  const prefix = isCell ? ['plc', 'sheet'] : [];
  const problems: Problem[] = [];
  const analysed = analyseSheet(sheetInput);
  if (!analysed.ok) problems.push(...analysed.errors.map((p) => ({ ...p, path: [...prefix, ...p.path] })));
  const parsed = interlockRulesSchema.safeParse(rules);
  if (!parsed.success) problems.push(...issuesToProblems(parsed.error.issues, ['rules'], () => undefined));
  if (!analysed.ok || !parsed.success) return { ok: false, errors: problems };
  // Compiled only when a counterexample needs replaying.
  let compiled: CompiledSheet | null = null;
  const replayer = (): CompiledSheet => {
    if (!compiled) {
      const c = compileSheet(analysed.value.sheet);
      // The sheet was analysed above, so it compiles; anything else is a bug in the engine.
      if (!c.ok) throw new Error(`analysed sheet does not compile: ${c.errors.map((e) => e.message).join('; ')}`);
      compiled = c.value;
    }
    return compiled;
  };

  const labels: SignalLabels | undefined = isCell ? safeLabels(input as CellDocument) : undefined;
  const watch = [...new Set(parsed.data.flatMap((r) => ruleAddresses(r)))];
  const enc = encodeSheet(analysed.value, { timerHorizonScans: opts.timerHorizonScans, watch });
  const ts = enc.system;
  // Created on first use: a rule whose violation is a constant needs no solver.
  let session: SatSession | null = null;
  const verdicts = parsed.data.map((rule): Verdict => {
    const bad = addMonitor(enc, rule);
    const { outcome, stats, cone } = checkSafety(ts, bad, { maxDepth: opts.maxDepth, budget: opts.budget }, () => (session ??= createSatSession()));
    const blocks = new Set<number>();
    for (const j of cone.state) if (ts.state[j].block !== undefined) blocks.add(ts.state[j].block as number);
    for (const j of cone.step) if (ts.step[j].block !== undefined) blocks.add(ts.step[j].block as number);
    const encoding = [...blocks].sort((a, b) => a - b).flatMap((b) => (ts.notes.has(b) ? [ts.notes.get(b) as EncodingNote] : []));
    const exact = encoding.every((n) => n.treatment === 'exact');
    const head = { rule: rule.id, title: rule.title, text: describeRule(rule, labels), exact, encoding, stats };
    if (outcome.kind === 'proved') return { ...head, status: 'proved', method: outcome.method, depth: outcome.depth };
    if (outcome.kind === 'undecided') {
      const detail =
        outcome.reason === 'budget'
          ? `the clause budget (${opts.budget}) ran out after ${outcome.bound} scans without a violation`
          : `no violation within ${outcome.bound} scans, and induction did not close by depth ${opts.maxDepth}`;
      return { ...head, status: 'undecided', bound: outcome.bound, reason: outcome.reason, detail };
    }
    const inputs = cone.step.filter((j) => ts.step[j].kind === 'input').map((j) => ts.step[j].address as string);
    const vectors = outcome.steps.map((values) => {
      const v: Record<string, boolean> = {};
      for (const j of cone.step) if (ts.step[j].kind === 'input') v[ts.step[j].address as string] = values.get(j) as boolean;
      return v;
    });
    const signals = ruleAddresses(rule);
    const replayed = concreteCounterexample(replayer(), rule, vectors, outcome.depth, inputs, signals);
    if (!replayed) {
      // With every block exact the encoding is the sheet, so its counterexamples always replay.
      if (exact) throw new Error(`counterexample for rule ${rule.id} does not replay on an exactly encoded sheet`);
      return {
        ...head,
        status: 'undecided',
        bound: outcome.depth,
        reason: 'abstraction',
        detail: `a run of ${outcome.depth + 1} scans breaks the rule only when the abstracted blocks (${encoding
          .filter((n) => n.treatment === 'abstracted')
          .map((n) => n.block)
          .join(', ')}) behave freely, and it does not replay on the sheet itself`,
      };
    }
    return { ...head, status: 'violated', counterexample: replayed };
  });
  return { ok: true, value: verdicts };
}

function safeLabels(document: CellDocument): SignalLabels | undefined {
  try {
    return signalLabels(document);
  } catch {
    // An unvalidated document may hold anything outside its sheet; labels are only a courtesy.
    return undefined;
  }
}

/**
 * Replays a candidate counterexample on the compiled sheet; when it breaks the rule at
 * `depth`, simplifies it (inputs turned off one at a time while it still does, so the
 * run shows only what matters) and returns it with the rule's signals along it.
 */
function concreteCounterexample(
  compiled: CompiledSheet,
  rule: InterlockRule,
  vectors: Record<string, boolean>[],
  depth: number,
  inputs: string[],
  signals: string[],
): Counterexample | null {
  const run = createReplayer(compiled, inputs, signals);
  const breaks = (vs: Record<string, boolean>[]) => firstViolation(rule, run(vs)) === depth;
  if (!breaks(vectors)) return null;
  let runs = 0;
  const current = vectors.map((v) => ({ ...v }));
  for (let k = current.length - 1; k >= 0 && runs < SIMPLIFY_RUNS; k--) {
    for (const name of inputs) {
      if (!current[k][name] || runs >= SIMPLIFY_RUNS) continue;
      current[k][name] = false;
      runs++;
      if (!breaks(current)) current[k][name] = true;
    }
  }
  const frames = run(current);
  return {
    scanPeriodMs: compiled.scanPeriodMs,
    inputs,
    scans: current.map((v, k) => ({ inputs: v, signals: Object.fromEntries(signals.map((s) => [s, frames[k][s] ?? false])) })),
    failsAtScan: depth,
  };
}
