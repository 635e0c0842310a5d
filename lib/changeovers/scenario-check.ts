/**
 * One scenario re-simulated on one version of a cell, and the two outcomes compared: the
 * checks job's engine work. Pure over the engine (no database).
 *
 * The trace both versions are compared on is made of the signals they both have among the
 * PLC's addresses, the robot's handshake outputs and the controller's state — what a lead
 * would watch — so a signal the proposal adds (a second guard's input) does not by itself
 * make every trace differ; a scenario's rules may still name it.
 */
import { checkRules, hashTrace, replay, ruleSignals, type Rule, type Trace } from '@/simulator';
import { documentSha256 } from './hash';
import type { OutcomeChange, RuleOutcome, ScenarioInput, ScenarioOutcome } from '@/db/types/evidence';

// Scenarios and their outcomes are stored: their shapes live below db/ and lib/ (db/types/evidence.ts).
export type { OutcomeChange, RuleOutcome, RuleStatus, ScenarioInput, ScenarioOutcome } from '@/db/types/evidence';

/** Most samples of one trace kept for the comparison scope (a long scenario is cut, and says so). */
export const MAX_STORED_SAMPLES = 150_000;

const WATCHED_FIXED = new Set(['ctl.state', 'ctl.cycles', 'ctl.servo', 'arm.moving']);

/** The signals a scenario's traces are compared on: those both versions expose, in a fixed order. */
export function comparisonSignals(baseNames: readonly string[], proposedNames: readonly string[]): string[] {
  const other = new Set(proposedNames);
  const watched = (n: string) => WATCHED_FIXED.has(n) || n.startsWith('hs.') || /^plc\.%[IQM][XW]/.test(n);
  return [...new Set(baseNames)].filter((n) => watched(n) && other.has(n)).sort();
}

/** The trace cut to its first `n` signals (the compared ones), re-indexed as it stands. */
function project(trace: Trace, n: number): Trace {
  return { signals: trace.signals.slice(0, n), samples: trace.samples.filter(([, i]) => i < n), endMs: trace.endMs };
}

/**
 * Replays a scenario on a document and checks its rules. A rule naming a signal this version
 * lacks reads `error` (the others are still checked); a script the version refuses (a device
 * it no longer has) makes the whole outcome an error with the engine's problems.
 */
export function runScenario(document: unknown, version: number, names: readonly string[], scenario: ScenarioInput, compare: readonly string[]): { outcome: ScenarioOutcome; trace: Trace | null } {
  const have = new Set(names);
  const checkable: Rule[] = [];
  const missing: RuleOutcome[] = [];
  const extra: string[] = [];
  for (const r of scenario.rules) {
    // Any PLC address can be read (an unwired input reads off), and a fault card's signal exists once it is armed.
    const lacking = ruleSignals(r).filter((s) => !have.has(s) && !s.startsWith('fault.') && !/^plc\.%/.test(s));
    if (lacking.length > 0) {
      missing.push({ id: r.id, ...(r.label ? { label: r.label } : {}), status: 'error', violation: { timeMs: 0, message: `this version has no signal ${lacking.join(', ')}` } });
      continue;
    }
    checkable.push(r);
    for (const s of ruleSignals(r)) if (!compare.includes(s) && !extra.includes(s)) extra.push(s);
  }
  const signals = [...compare, ...extra];
  const replayed = replay(document, scenario.events, {
    trace: signals,
    faults: scenario.faults,
    ...(scenario.seed !== null ? { seed: scenario.seed } : {}),
    untilMs: scenario.durationMs,
  });
  if (!replayed.ok) {
    const problems = replayed.errors.slice(0, 20).map((p) => (p.path.length ? `${p.path.join('.')}: ${p.message}` : p.message));
    return { outcome: { version, ok: false, endMs: scenario.durationMs, hash: null, rules: [], problems }, trace: null };
  }
  const trace = replayed.value.trace;
  const checked = checkRules(trace, checkable);
  const byId = new Map<string, RuleOutcome>();
  if (checked.ok) {
    for (const r of checked.value) {
      const rule = checkable.find((x) => x.id === r.id);
      byId.set(r.id, {
        id: r.id,
        ...(rule?.label ? { label: rule.label } : {}),
        status: r.status,
        ...(r.violation ? { violation: { timeMs: r.violation.timeMs, message: r.violation.message } } : {}),
      });
    }
  }
  for (const m of missing) byId.set(m.id, m);
  const rules = scenario.rules.map((r) => byId.get(r.id) ?? { id: r.id, status: 'error' as const, violation: { timeMs: 0, message: 'not checked' } });
  const problems = checked.ok ? [] : checked.errors.map((p) => p.message);
  return {
    outcome: { version, ok: true, endMs: trace.endMs, hash: hashTrace(project(trace, compare.length)), rules, problems },
    trace,
  };
}

/**
 * What changed between the base's and the proposal's outcome: each rule whose result differs,
 * a side that could not run the scenario, and the compared trace's hash. Any of them is a
 * changed outcome the lead must accept with a reason before sign-off — a different trace with
 * the same rule results still means the cell behaves differently in this scenario.
 */
export function compareOutcomes(base: ScenarioOutcome, proposed: ScenarioOutcome): { changes: OutcomeChange[]; changed: boolean } {
  const changes: OutcomeChange[] = [];
  if (!base.ok) changes.push({ kind: 'error', side: 'base', message: base.problems.join('; ') });
  if (!proposed.ok) changes.push({ kind: 'error', side: 'proposed', message: proposed.problems.join('; ') });
  const ids = [...new Set([...base.rules.map((r) => r.id), ...proposed.rules.map((r) => r.id)])];
  for (const id of ids) {
    const a = base.rules.find((r) => r.id === id);
    const b = proposed.rules.find((r) => r.id === id);
    if (a?.status === b?.status) continue;
    changes.push({ kind: 'rule', rule: id, ...((a?.label ?? b?.label) ? { label: a?.label ?? b?.label } : {}), from: a?.status ?? 'absent', to: b?.status ?? 'absent' });
  }
  if (base.hash !== proposed.hash) changes.push({ kind: 'trace', from: base.hash, to: proposed.hash });
  return { changes, changed: changes.length > 0 };
}

/** What accepting a changed outcome accepts: the scenario as run, both versions and both outcomes. */
export function checkFingerprint(scenario: ScenarioInput, base: ScenarioOutcome, proposed: ScenarioOutcome): string {
  const { name: _n, ...script } = scenario;
  return documentSha256({ script, base, proposed });
}

/** The inputs of a checks run: every scenario's script and rules, and the versions. */
export function checksInputsSha256(scenarios: readonly (ScenarioInput & { id: string })[], baseVersion: number, proposedVersion: number): string {
  return documentSha256({ scenarios: scenarios.map(({ name: _n, ...s }) => s), baseVersion, proposedVersion });
}

/** A trace cut to at most {@link MAX_STORED_SAMPLES} samples for storage, with whether it was cut. */
export function storableTrace(trace: Trace): Trace & { truncated?: true } {
  if (trace.samples.length <= MAX_STORED_SAMPLES) return trace;
  const samples = trace.samples.slice(0, MAX_STORED_SAMPLES);
  return { signals: trace.signals, samples, endMs: samples[samples.length - 1][0], truncated: true };
}
