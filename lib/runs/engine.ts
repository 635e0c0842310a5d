/**
 * Building a run's cell and replaying its log: pure functions over the engine (no database),
 * shared by the live-run cache, the grader and the replay routes. The replay loop itself is
 * the engine's `applyLog` (the browser's replays use the same one).
 */
import { applyLog, createCell, ruleSignals, type Cell, type FaultCard, type LoggedEvent, type Problem, type Result, type Rule } from '@/simulator';

/** Everything a run's simulation depends on; the same context and log always give the same trace. */
export interface RunContext {
  document: unknown;
  seed: number;
  /** Hidden fault cards of the drill (empty for practice). */
  faults: FaultCard[];
  /** Signals recorded in the trace. */
  trace: string[];
}

/** Signals the grade's trace records: a few that every run has, then each rule's signals in order. */
export function gradeSignals(rules: readonly Rule[]): string[] {
  const out = ['ctl.state', 'ctl.cycles', 'arm.moving'];
  for (const r of rules) for (const s of ruleSignals(r)) if (!out.includes(s)) out.push(s);
  return out;
}

/** Creates the run's cell at time 0. */
export function buildCell(ctx: RunContext): Result<Cell, Problem> {
  return createCell(ctx.document, { seed: ctx.seed, faults: ctx.faults, trace: ctx.trace });
}

/** A fresh cell with the whole log applied up to `untilMs` (the caller disposes it). */
export function replayRun(ctx: RunContext, events: readonly LoggedEvent[], untilMs: number): Result<Cell, Problem> {
  const made = buildCell(ctx);
  if (!made.ok) return made;
  const applied = applyLog(made.value, events, untilMs);
  if (!applied.ok) {
    made.value.dispose();
    return applied;
  }
  return made;
}
