/**
 * Grading a run on the server: re-simulate the stored log from scratch on the drill's cell
 * version with its hidden faults and the run's seed, check the drill's rules on the trace,
 * score the diagnosis, and hash the trace. Nothing from the client's own simulation is used,
 * and the same inputs always give the same grade (the engine is deterministic).
 */
import { checkRules, hashTrace, type LoggedEvent, type Problem, type Result } from '@/simulator';
import type { WeightedRule } from '@/lib/schemas/drills';
import type { Diagnosis } from '@/lib/schemas/runs';
import type { DiagnosisScore, GradeBreakdown, RuleScore } from '@/db/types/runs';
import { gradeSignals, replayRun, type RunContext } from './engine';

// The breakdown is stored with the run: its shapes live below db/ and lib/ (db/types/runs.ts).
export type { DiagnosisScore, GradeBreakdown, RuleScore } from '@/db/types/runs';

export interface GradeResult {
  /** Percent, 0–100, one decimal. */
  grade: number;
  breakdown: GradeBreakdown;
  traceHash: string;
}

export interface GradeInput {
  context: Omit<RunContext, 'trace'>;
  events: readonly LoggedEvent[];
  endedMs: number;
  rules: readonly WeightedRule[];
  answer: { kind: string; location: string };
  diagnosisWeight: number;
  diagnosis: Diagnosis | null;
}

/** Location ids compared as a set: case and order do not matter ("w-a, w-b" = "W-B+w-a"). */
export function locationKey(location: string): string {
  return [...new Set(location.toLowerCase().split(/[\s,+;/]+/).filter(Boolean))].sort().join(',');
}

/**
 * Diagnosis score (the answer's location may list alternatives with "|"): the whole weight for the right kind at the right place, half for the right
 * kind at the wrong place (the student recognised the symptom), nothing otherwise — a right
 * place with the wrong kind is not a diagnosis.
 */
export function scoreDiagnosis(answer: { kind: string; location: string }, given: Diagnosis | null, weight: number): DiagnosisScore {
  const kindCorrect = given !== null && given.kind === answer.kind;
  // The answer may list equivalent places separated by "|" (a device or the row it is wired on).
  const accepted = answer.location.split('|').map(locationKey);
  const locationCorrect = given !== null && accepted.includes(locationKey(given.location));
  const earned = kindCorrect ? (locationCorrect ? weight : weight / 2) : 0;
  return { weight, earned, kindCorrect, locationCorrect, given };
}

function round1(x: number): number {
  return Math.round(x * 10) / 10;
}

/**
 * Re-simulates and grades a run. Rules earn their weight only when they pass (an
 * inconclusive rule — the run ended before its deadline — earns nothing). The grade is
 * earned / possible in percent; a drill with no weights at all grades 0.
 */
export function gradeRun(input: GradeInput): Result<GradeResult, Problem> {
  const rules = input.rules.map((w) => w.rule);
  const replayed = replayRun({ ...input.context, trace: gradeSignals(rules) }, input.events, input.endedMs);
  if (!replayed.ok) return replayed;
  const cell = replayed.value;
  try {
    const trace = cell.trace();
    const checked = checkRules(trace, rules);
    if (!checked.ok) return checked;
    const ruleScores: RuleScore[] = checked.value.map((r, i) => ({
      id: r.id,
      label: input.rules[i].rule.label ?? null,
      kind: r.kind,
      weight: input.rules[i].weight,
      status: r.status,
      earned: r.status === 'pass' ? input.rules[i].weight : 0,
      violation: r.violation ?? null,
    }));
    const diagnosis = scoreDiagnosis(input.answer, input.diagnosis, input.diagnosisWeight);
    const earned = ruleScores.reduce((s, r) => s + r.earned, 0) + diagnosis.earned;
    const possible = ruleScores.reduce((s, r) => s + r.weight, 0) + diagnosis.weight;
    const grade = possible > 0 ? round1((100 * earned) / possible) : 0;
    return {
      ok: true,
      value: { grade, breakdown: { rules: ruleScores, diagnosis, earned, possible, endedMs: input.endedMs }, traceHash: hashTrace(trace) },
    };
  } finally {
    cell.dispose();
  }
}
