/**
 * One interlock rule proved on one version of a cell, as the proofs job stores it. Pure over
 * the engine (no database): the job worker calls it, tests call it directly.
 */
import { proveRules, type InterlockRuleInput } from '@/simulator';
import { documentSha256 } from './hash';

import type { Side, StoredVerdictBody } from '@/db/types/evidence';

// Verdicts are stored: their shapes live below db/ and lib/ (db/types/evidence.ts).
export type { ErrorVerdict, Side, StoredVerdictBody } from '@/db/types/evidence';

export type ProvedRule = {
  status: 'proved' | 'violated' | 'undecided' | 'error';
  /** Every block that can influence the rule was encoded exactly (no abstraction). */
  exact: boolean;
  verdict: StoredVerdictBody;
};

/** Proves one rule on one document with the engine's default depth and budget. */
export function proveOne(document: unknown, rule: InterlockRuleInput): ProvedRule {
  const result = proveRules(document, [rule]);
  if (!result.ok) {
    const problems = result.errors.map((p) => ({ path: p.path.join('.'), message: p.message }));
    return { status: 'error', exact: false, verdict: { rule: rule.id, title: rule.title, status: 'error', problems } };
  }
  const v = result.value[0];
  return { status: v.status, exact: v.exact, verdict: v };
}

const TIMER_TYPES = new Set(['TON', 'TOF', 'TP']);

/**
 * How the verdict treated the timers in the rule's cone of influence: `exact` (encoded scan by
 * scan within the horizon), `abstracted` (at least one timer's output left free — sound for a
 * proof, so a "proved" still holds, but a violation found that way is re-checked on the sheet),
 * or `none` (no timer can influence the rule).
 */
export function timerTreatment(v: StoredVerdictBody): 'exact' | 'abstracted' | 'none' {
  if (v.status === 'error') return 'none';
  const timers = v.encoding.filter((n) => TIMER_TYPES.has(n.type));
  if (timers.length === 0) return 'none';
  return timers.every((n) => n.treatment === 'exact') ? 'exact' : 'abstracted';
}

/** One line on what the verdict rests on: the method and depth, the bound, or the failing scan. */
export function verdictDetail(v: StoredVerdictBody): string {
  switch (v.status) {
    case 'proved':
      return v.method === 'exhaustive' ? `every reachable state lies within ${v.depth} scans` : `k-induction at depth ${v.depth}`;
    case 'violated': {
      const n = v.counterexample.scans.length;
      return `broken after scan ${v.counterexample.failsAtScan + 1} (${n} scan${n === 1 ? '' : 's'} from power-on)`;
    }
    case 'undecided':
      return v.detail;
    case 'error':
      return v.problems.map((p) => (p.path ? `${p.path}: ${p.message}` : p.message)).join('; ');
  }
}

/**
 * What an acceptance of this verdict is an acceptance *of*: the rule as proved (not its
 * title), the side and version, the answer, and the counterexample. A re-run on the same
 * versions with the same rule gives the same fingerprint (the prover is deterministic).
 */
export function verdictFingerprint(rule: InterlockRuleInput, side: Side, version: number, proved: ProvedRule): string {
  const { title: _title, ...body } = rule;
  const v = proved.verdict;
  return documentSha256({ rule: body, side, version, status: proved.status, counterexample: v.status === 'violated' ? v.counterexample : null });
}

/** The inputs of a proofs run: the rules (titles aside) and the versions they run on. */
export function proofsInputsSha256(rules: readonly InterlockRuleInput[], baseVersion: number, proposedVersion: number): string {
  return documentSha256({ rules: rules.map(({ title: _t, ...body }) => body), baseVersion, proposedVersion });
}
