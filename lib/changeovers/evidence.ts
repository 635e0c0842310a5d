import 'server-only';
import { findChangeover, type Changeover } from '@/db/changeovers';
import {
  latestDoneEvidenceRun,
  latestEvidenceRun,
  listAcceptances,
  listChecks,
  listVerdicts,
  type Acceptance,
  type EvidenceRun,
  type StoredCheck,
  type StoredVerdict,
} from '@/db/changeover-evidence';
import { listInterlockRules, toInterlockRule } from '@/db/interlock-rules';
import { listScenariosWithEvents } from '@/db/scenarios';
import { describeRule, type InterlockRuleInput } from '@/simulator';
import { proofsInputsSha256, timerTreatment, verdictDetail } from './prove-rules';
import { checksInputsSha256, type OutcomeChange, type ScenarioOutcome } from './scenario-check';

/**
 * A changeover's evidence and whether it is enough to sign: the proofs of the cell's interlock
 * rules and the scenario checks, each on the changeover's base and proposal, with the written
 * acceptances. The sign-off calls {@link loadEvidence} and stores what it returns in the
 * signed record, so everything here is plain JSON.
 *
 * Ready means: the proposal is pinned; the latest proofs ran on the current base and pinned
 * proposal with the cell's current rules (at least one), and every rule is proved on the
 * proposal or its violation (or undecided answer) is accepted with a reason; and, when the
 * cell keeps scenarios, the latest checks ran on the same versions with the current
 * scenarios and every changed outcome is accepted with a reason.
 */

export type Person = { id: string; name: string };

/** A written acceptance: why, who, when. */
export type AcceptanceInfo = { reason: string; by: Person; at: string };

/** One side's verdict in brief. */
export type VerdictSummary = {
  verdictId: string;
  version: number;
  status: 'proved' | 'violated' | 'undecided' | 'error';
  /** Every block that can influence the rule was encoded exactly. */
  exact: boolean;
  /** How timers in the rule's reach were treated (`none`: no timer can influence it). */
  timers: 'exact' | 'abstracted' | 'none';
  /** What the verdict rests on: method and depth, the bound, or the failing scan. */
  detail: string;
};

export type ProofEvidence = {
  ruleId: string;
  title: string;
  /** The rule in plain English, as the prover words it. */
  sentence: string;
  rule: InterlockRuleInput;
  base: VerdictSummary | null;
  proposed: VerdictSummary | null;
  /** The acceptance of the proposal's violation or undecided answer, when there is one. */
  acceptance: AcceptanceInfo | null;
  /** Proved on the proposal, or its answer accepted with a reason. */
  settled: boolean;
};

export type CheckEvidence = {
  checkId: string;
  scenarioId: string;
  name: string;
  base: ScenarioOutcome;
  proposed: ScenarioOutcome;
  changes: OutcomeChange[];
  changed: boolean;
  acceptance: AcceptanceInfo | null;
  /** Unchanged, or the change accepted with a reason. */
  settled: boolean;
};

export type Evidence = {
  proofs: ProofEvidence[];
  checks: CheckEvidence[];
  ready: boolean;
  blockers: string[];
  ranOn: { baseVersion: number; proposedVersion: number } | null;
};

/** The evidence with the runs it came from and the ones under way (the changeover page's sections). */
export type EvidenceDetail = Evidence & {
  runs: { proofs: EvidenceRun | null; checks: EvidenceRun | null };
  open: { proofs: EvidenceRun | null; checks: EvidenceRun | null };
  /** The newest run of each kind when it failed (its `error` says why), else null. */
  failed: { proofs: EvidenceRun | null; checks: EvidenceRun | null };
  current: { rules: number; scenarios: number; rulesSha256: string; scenariosSha256: string };
};

const acceptanceInfo = (a: Acceptance | undefined): AcceptanceInfo | null => (a ? { reason: a.reason, by: a.acceptedBy, at: a.acceptedAt } : null);

function summary(v: StoredVerdict | undefined): VerdictSummary | null {
  if (!v) return null;
  return { verdictId: v.id, version: v.version, status: v.status, exact: v.exact, timers: timerTreatment(v.verdict), detail: verdictDetail(v.verdict) };
}

function proofEvidence(verdicts: StoredVerdict[], acceptances: Acceptance[]): ProofEvidence[] {
  const byRule = new Map<string, { base?: StoredVerdict; proposed?: StoredVerdict }>();
  for (const v of verdicts) {
    const e = byRule.get(v.ruleId) ?? {};
    e[v.side] = v;
    byRule.set(v.ruleId, e);
  }
  return [...byRule.entries()]
    .map(([ruleId, { base, proposed }]) => {
      const any = (proposed ?? base)!;
      const acceptance = proposed ? acceptances.find((a) => a.kind === 'proof' && a.subject === ruleId && a.fingerprint === proposed.fingerprint) : undefined;
      const acceptable = proposed?.status === 'violated' || proposed?.status === 'undecided';
      const sentence = proposed && proposed.verdict.status !== 'error' ? proposed.verdict.text : describeRule(any.rule);
      return {
        position: any.position,
        ruleId,
        title: any.title,
        sentence,
        rule: any.rule,
        base: summary(base),
        proposed: summary(proposed),
        acceptance: acceptable ? acceptanceInfo(acceptance) : null,
        settled: proposed?.status === 'proved' || (acceptable && acceptance !== undefined),
      };
    })
    .sort((a, b) => a.position - b.position)
    .map(({ position: _p, ...e }) => e);
}

function checkEvidence(checks: StoredCheck[], acceptances: Acceptance[]): CheckEvidence[] {
  return checks.map((c) => {
    const acceptance = c.changed ? acceptances.find((a) => a.kind === 'check' && a.subject === c.scenarioId && a.fingerprint === c.fingerprint) : undefined;
    return {
      checkId: c.id,
      scenarioId: c.scenarioId,
      name: c.name,
      base: c.base,
      proposed: c.proposed,
      changes: c.changes,
      changed: c.changed,
      acceptance: acceptanceInfo(acceptance),
      settled: !c.changed || acceptance !== undefined,
    };
  });
}

const STATUS_WORDS: Record<string, string> = { violated: 'is violated on the proposal', undecided: 'is undecided on the proposal', error: 'could not be proved on the proposal' };

function changeWords(c: OutcomeChange): string {
  if (c.kind === 'rule') return `rule ${c.label ?? c.rule} ${c.from} → ${c.to}`;
  if (c.kind === 'trace') return 'the trace differs';
  return `the ${c.side} could not run it`;
}

const versions = (r: { baseVersion: number; proposedVersion: number }) => `version ${r.baseVersion} → ${r.proposedVersion}`;

/** The evidence as the changeover page and the sign-off read it, with the runs behind it. */
export async function loadEvidenceDetail(changeoverId: string, known?: Changeover): Promise<EvidenceDetail> {
  const co = known ?? (await findChangeover(changeoverId));
  if (!co) throw new Error(`changeover ${changeoverId} is missing`);
  // The newest runs of each kind, whatever their state: one under way, or one that failed.
  const [proofsRun, checksRun, latestProofs, latestChecks, acceptances, rules, scenarios] = await Promise.all([
    latestDoneEvidenceRun(co.id, 'proofs'),
    latestDoneEvidenceRun(co.id, 'checks'),
    latestEvidenceRun(co.id, 'proofs'),
    latestEvidenceRun(co.id, 'checks'),
    listAcceptances(co.id),
    listInterlockRules(co.cellId),
    listScenariosWithEvents(co.cellId),
  ]);
  const [verdicts, checks] = await Promise.all([proofsRun ? listVerdicts(proofsRun.id) : [], checksRun ? listChecks(checksRun.id) : []]);
  const proofs = proofEvidence(verdicts, acceptances);
  const checkList = checkEvidence(checks, acceptances);

  const target = { baseVersion: co.baseVersion, proposedVersion: co.pinnedVersion ?? co.proposedVersion };
  const rulesSha256 = proofsInputsSha256(rules.map(toInterlockRule), target.baseVersion, target.proposedVersion);
  const scenariosSha256 = checksInputsSha256(
    scenarios.map((s) => ({ id: s.id, name: s.name, events: s.events, rules: s.rules, faults: s.faults, seed: s.seed, durationMs: s.durationMs })),
    target.baseVersion,
    target.proposedVersion,
  );

  const blockers: string[] = [];
  // Worded as the sign-off words it (lib/changeovers/sign-off.ts), which lists each sentence once.
  if (co.pinnedVersion === null) blockers.push('The proposal is not pinned yet: pin it and run the checks, so the signatures cover one fixed version.');
  const isOpen = (r: EvidenceRun | null) => r !== null && (r.status === 'queued' || r.status === 'running');
  if (isOpen(latestProofs)) blockers.push('The proofs are running.');
  if (isOpen(latestChecks)) blockers.push('The scenario checks are running.');

  if (rules.length === 0) blockers.push('The cell keeps no interlock rules: state at least one rule the change must keep.');
  else if (!proofsRun) blockers.push('The proofs have not run.');
  else if (proofsRun.baseVersion !== target.baseVersion || proofsRun.proposedVersion !== target.proposedVersion)
    blockers.push(`The proofs ran on ${versions(proofsRun)}; the changeover is now ${versions(target)}: run them again.`);
  else if (proofsRun.inputsSha256 !== rulesSha256) blockers.push('The interlock rules changed after the proofs ran: run them again.');
  else for (const p of proofs) if (!p.settled) blockers.push(`Rule “${p.title || p.sentence}” ${STATUS_WORDS[p.proposed?.status ?? 'error'] ?? 'has no verdict on the proposal'} and is not accepted with a reason.`);

  if (scenarios.length > 0) {
    if (!checksRun) blockers.push('The scenario checks have not run.');
    else if (checksRun.baseVersion !== target.baseVersion || checksRun.proposedVersion !== target.proposedVersion)
      blockers.push(`The scenario checks ran on ${versions(checksRun)}; the changeover is now ${versions(target)}: run them again.`);
    else if (checksRun.inputsSha256 !== scenariosSha256) blockers.push('The scenarios changed after the checks ran: run them again.');
    else for (const c of checkList) if (!c.settled) blockers.push(`Scenario “${c.name}”: ${c.changes.map(changeWords).join('; ')} — not accepted with a reason.`);
  }

  const ranFrom = proofsRun ?? checksRun;
  return {
    proofs,
    checks: checkList,
    ready: blockers.length === 0,
    blockers,
    ranOn: ranFrom ? { baseVersion: ranFrom.baseVersion, proposedVersion: ranFrom.proposedVersion } : null,
    runs: { proofs: proofsRun, checks: checksRun },
    open: { proofs: isOpen(latestProofs) ? latestProofs : null, checks: isOpen(latestChecks) ? latestChecks : null },
    failed: { proofs: latestProofs?.status === 'failed' ? latestProofs : null, checks: latestChecks?.status === 'failed' ? latestChecks : null },
    current: { rules: rules.length, scenarios: scenarios.length, rulesSha256, scenariosSha256 },
  };
}

/**
 * The evidence for sign-off: every proof and check with its acceptance, whether it is enough
 * to sign (`ready`), what stands in the way (`blockers`, plain sentences), and the versions
 * it ran on.
 */
export async function loadEvidence(changeoverId: string): Promise<Evidence> {
  const { proofs, checks, ready, blockers, ranOn } = await loadEvidenceDetail(changeoverId);
  return { proofs, checks, ready, blockers, ranOn };
}
