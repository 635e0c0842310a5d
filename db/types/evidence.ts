import type { FaultCard, LoggedEvent, Rule, Verdict } from '@/simulator';

/**
 * Changeover evidence as db/changeover-evidence.ts and db/scenarios.ts store it: proved rules'
 * verdicts and scenario outcomes on each side. See db/types/users.ts for why here.
 */

/** The two versions a changeover compares. */
export type Side = 'base' | 'proposed';

/** A rule the engine could not prove at all (its signals or the sheet do not validate). */
export type ErrorVerdict = { rule: string; title: string; status: 'error'; problems: { path: string; message: string }[] };

export type StoredVerdictBody = Verdict | ErrorVerdict;

/** A scenario as a cell keeps it: an event script with its rules and fault cards. */
export type ScenarioInput = { name: string; events: LoggedEvent[]; rules: Rule[]; faults: FaultCard[]; seed: number | null; durationMs: number };

export type RuleStatus = 'pass' | 'fail' | 'inconclusive' | 'error';

export type RuleOutcome = { id: string; label?: string; status: RuleStatus; violation?: { timeMs: number; message: string } };

/** What a scenario did on one version. `hash` is over the compared signals only. */
export type ScenarioOutcome = { version: number; ok: boolean; endMs: number; hash: string | null; rules: RuleOutcome[]; problems: string[] };

export type OutcomeChange =
  | { kind: 'rule'; rule: string; label?: string; from: RuleStatus | 'absent'; to: RuleStatus | 'absent' }
  | { kind: 'trace'; from: string | null; to: string | null }
  | { kind: 'error'; side: Side; message: string };
