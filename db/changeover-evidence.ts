import 'server-only';
import type { Knex } from 'knex';
import type { InterlockRuleInput, Trace } from '@/simulator';
import type { OutcomeChange, ScenarioInput, ScenarioOutcome, Side, StoredVerdictBody } from './types/evidence';
import { db } from './knex';
import { isUuid } from './users';

/**
 * A changeover's evidence (migration 20261204_402_changeover_evidence): proofs and checks
 * runs, their verdicts and scenario outcomes, and the written acceptances. The rules on what
 * counts as ready are in lib/changeovers/evidence.ts; these functions only read and write.
 */
export type EvidenceKind = 'proofs' | 'checks';
export type EvidenceRunStatus = 'queued' | 'running' | 'done' | 'failed';

export interface PersonRef {
  id: string;
  name: string;
}

export interface EvidenceRun {
  id: string;
  changeoverId: string;
  kind: EvidenceKind;
  baseVersion: number;
  proposedVersion: number;
  inputsSha256: string;
  status: EvidenceRunStatus;
  total: number;
  done: number;
  current: string;
  error: string | null;
  jobId: string | null;
  requestedBy: PersonRef;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

export interface StoredVerdict {
  id: string;
  runId: string;
  changeoverId: string;
  ruleId: string;
  position: number;
  title: string;
  rule: InterlockRuleInput;
  side: Side;
  version: number;
  status: 'proved' | 'violated' | 'undecided' | 'error';
  exact: boolean;
  verdict: StoredVerdictBody;
  fingerprint: string;
}

/** The scenario as a check ran it (its script is kept, so the check can be shown after the scenario changes). */
export type CheckScenario = ScenarioInput & { id: string };

export interface StoredCheck {
  id: string;
  runId: string;
  changeoverId: string;
  scenarioId: string;
  position: number;
  name: string;
  scenario: CheckScenario;
  base: ScenarioOutcome;
  proposed: ScenarioOutcome;
  changes: OutcomeChange[];
  changed: boolean;
  fingerprint: string;
}

export type AcceptanceKind = 'proof' | 'check';

export interface Acceptance {
  id: string;
  changeoverId: string;
  kind: AcceptanceKind;
  subject: string;
  fingerprint: string;
  reason: string;
  acceptedBy: PersonRef;
  acceptedAt: string;
}

/** An open run that has not reported for this long lost its worker (see the migration). */
export const STALE_RUN_MINUTES = 10;

const iso = (d: Date | string | null) => (d === null || d === undefined ? null : new Date(d).toISOString());

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toRun(r: any): EvidenceRun {
  return {
    id: r.id,
    changeoverId: r.changeover_id,
    kind: r.kind,
    baseVersion: r.base_version,
    proposedVersion: r.proposed_version,
    inputsSha256: r.inputs_sha256,
    status: r.status,
    total: r.total,
    done: r.done,
    current: r.current,
    error: r.error,
    jobId: r.job_id,
    requestedBy: { id: r.requested_by, name: r.requested_by_name ?? '' },
    createdAt: iso(r.created_at)!,
    startedAt: iso(r.started_at),
    finishedAt: iso(r.finished_at),
  };
}

function runQuery(k: Knex = db()) {
  return k('changeover_evidence_runs as r').join('users as u', 'u.id', 'r.requested_by').select('r.*', 'u.name as requested_by_name');
}

export async function findEvidenceRun(id: string): Promise<EvidenceRun | null> {
  if (!isUuid(id)) return null;
  const row = await runQuery().where('r.id', id).first();
  return row ? toRun(row) : null;
}

/** The newest run of a kind for a changeover (open or finished), or null. */
export async function latestEvidenceRun(changeoverId: string, kind: EvidenceKind): Promise<EvidenceRun | null> {
  if (!isUuid(changeoverId)) return null;
  const row = await runQuery().where({ 'r.changeover_id': changeoverId, 'r.kind': kind }).orderBy('r.created_at', 'desc').first();
  return row ? toRun(row) : null;
}

/** The newest finished (done) run of a kind, or null. */
export async function latestDoneEvidenceRun(changeoverId: string, kind: EvidenceKind): Promise<EvidenceRun | null> {
  if (!isUuid(changeoverId)) return null;
  const row = await runQuery().where({ 'r.changeover_id': changeoverId, 'r.kind': kind, 'r.status': 'done' }).orderBy('r.created_at', 'desc').first();
  return row ? toRun(row) : null;
}

export interface NewEvidenceRun {
  changeoverId: string;
  kind: EvidenceKind;
  baseVersion: number;
  proposedVersion: number;
  inputsSha256: string;
  total: number;
  requestedBy: string;
}

/**
 * Opens a run, or returns the one already open for this changeover and kind (`created:
 * false`): one job of a kind at a time. An open run that has not moved for
 * {@link STALE_RUN_MINUTES} minutes is marked failed first, so a lost worker cannot block
 * the evidence for ever.
 */
export async function openEvidenceRun(input: NewEvidenceRun): Promise<{ run: EvidenceRun; created: boolean }> {
  return db().transaction(async (trx) => {
    // Serialise openers of one changeover on its row.
    await trx('changeovers').where({ id: input.changeoverId }).forUpdate().first('id');
    await trx('changeover_evidence_runs')
      .where({ changeover_id: input.changeoverId, kind: input.kind })
      .whereIn('status', ['queued', 'running'])
      .where('updated_at', '<', trx.raw(`now() - interval '${STALE_RUN_MINUTES} minutes'`))
      .update({ status: 'failed', error: 'The worker stopped reporting; run the job again.', finished_at: trx.fn.now(), updated_at: trx.fn.now() });
    const open = await runQuery(trx).where({ 'r.changeover_id': input.changeoverId, 'r.kind': input.kind }).whereIn('r.status', ['queued', 'running']).first();
    if (open) return { run: toRun(open), created: false };
    const [row] = await trx('changeover_evidence_runs')
      .insert({
        changeover_id: input.changeoverId,
        kind: input.kind,
        base_version: input.baseVersion,
        proposed_version: input.proposedVersion,
        inputs_sha256: input.inputsSha256,
        total: input.total,
        requested_by: input.requestedBy,
      })
      .returning('id');
    return { run: toRun(await runQuery(trx).where('r.id', row.id).first()), created: true };
  });
}

export async function setEvidenceRunJob(id: string, jobId: string | null): Promise<void> {
  await db()('changeover_evidence_runs').where({ id }).update({ job_id: jobId, updated_at: db().fn.now() });
}

/**
 * Starts (or, after a worker restart, restarts) a run: results of an interrupted attempt are
 * dropped and its progress reset. Returns null when the run is already finished, so a job
 * delivered twice does nothing the second time. `inputsSha256` is what the job actually
 * read (the rules or scenarios may have changed since the run was requested).
 */
export async function beginEvidenceRun(id: string, total: number, inputsSha256: string): Promise<EvidenceRun | null> {
  return db().transaction(async (trx) => {
    const row = await trx('changeover_evidence_runs').where({ id }).forUpdate().first();
    if (!row || (row.status !== 'queued' && row.status !== 'running')) return null;
    await trx('changeover_verdicts').where({ run_id: id }).delete();
    await trx('changeover_checks').where({ run_id: id }).delete();
    await trx('changeover_evidence_runs')
      .where({ id })
      .update({ status: 'running', total, done: 0, current: '', inputs_sha256: inputsSha256, started_at: trx.fn.now(), updated_at: trx.fn.now() });
    return toRun(await runQuery(trx).where('r.id', id).first());
  });
}

export async function reportEvidenceProgress(id: string, done: number, current: string): Promise<void> {
  await db()('changeover_evidence_runs').where({ id, status: 'running' }).update({ done, current, updated_at: db().fn.now() });
}

export async function finishEvidenceRun(id: string, status: 'done' | 'failed', error: string | null = null): Promise<void> {
  await db()('changeover_evidence_runs')
    .where({ id })
    .whereIn('status', ['queued', 'running'])
    .update({ status, error, current: '', finished_at: db().fn.now(), updated_at: db().fn.now() });
}

// ---- verdicts

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toVerdict(r: any): StoredVerdict {
  return {
    id: r.id,
    runId: r.run_id,
    changeoverId: r.changeover_id,
    ruleId: r.rule_id,
    position: r.position,
    title: r.title,
    rule: r.rule,
    side: r.side,
    version: r.version,
    status: r.status,
    exact: r.exact,
    verdict: r.verdict,
    fingerprint: r.fingerprint,
  };
}

export type NewVerdict = Omit<StoredVerdict, 'id'>;

export async function insertVerdicts(rows: NewVerdict[]): Promise<void> {
  if (rows.length === 0) return;
  await db()('changeover_verdicts').insert(
    rows.map((v) => ({
      run_id: v.runId,
      changeover_id: v.changeoverId,
      rule_id: v.ruleId,
      position: v.position,
      title: v.title,
      rule: JSON.stringify(v.rule),
      side: v.side,
      version: v.version,
      status: v.status,
      exact: v.exact,
      verdict: JSON.stringify(v.verdict),
      fingerprint: v.fingerprint,
    })),
  );
}

export async function listVerdicts(runId: string): Promise<StoredVerdict[]> {
  return (await db()('changeover_verdicts').where({ run_id: runId }).orderBy([{ column: 'position' }, { column: 'side' }])).map(toVerdict);
}

/** One verdict of a changeover (null for another changeover's). */
export async function findVerdict(changeoverId: string, id: string): Promise<StoredVerdict | null> {
  if (!isUuid(changeoverId) || !isUuid(id)) return null;
  const row = await db()('changeover_verdicts').where({ changeover_id: changeoverId, id }).first();
  return row ? toVerdict(row) : null;
}

// ---- checks

const CHECK_COLUMNS = ['id', 'run_id', 'changeover_id', 'scenario_id', 'position', 'name', 'scenario', 'base', 'proposed', 'changes', 'changed', 'fingerprint'];

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toCheck(r: any): StoredCheck {
  return {
    id: r.id,
    runId: r.run_id,
    changeoverId: r.changeover_id,
    scenarioId: r.scenario_id,
    position: r.position,
    name: r.name,
    scenario: r.scenario,
    base: r.base,
    proposed: r.proposed,
    changes: r.changes,
    changed: r.changed,
    fingerprint: r.fingerprint,
  };
}

export type NewCheck = Omit<StoredCheck, 'id'> & { baseTrace: Trace | null; proposedTrace: Trace | null };

export async function insertCheck(c: NewCheck): Promise<void> {
  await db()('changeover_checks').insert({
    run_id: c.runId,
    changeover_id: c.changeoverId,
    scenario_id: c.scenarioId,
    position: c.position,
    name: c.name,
    scenario: JSON.stringify(c.scenario),
    base: JSON.stringify(c.base),
    proposed: JSON.stringify(c.proposed),
    changes: JSON.stringify(c.changes),
    changed: c.changed,
    base_trace: c.baseTrace ? JSON.stringify(c.baseTrace) : null,
    proposed_trace: c.proposedTrace ? JSON.stringify(c.proposedTrace) : null,
    fingerprint: c.fingerprint,
  });
}

/** A run's checks without their traces. */
export async function listChecks(runId: string): Promise<StoredCheck[]> {
  return (await db()('changeover_checks').where({ run_id: runId }).orderBy('position').select(CHECK_COLUMNS)).map(toCheck);
}

export async function findCheck(changeoverId: string, id: string): Promise<StoredCheck | null> {
  if (!isUuid(changeoverId) || !isUuid(id)) return null;
  const row = await db()('changeover_checks').where({ changeover_id: changeoverId, id }).select(CHECK_COLUMNS).first();
  return row ? toCheck(row) : null;
}

/** The two traces of a check, for the comparison scope. */
export async function checkTraces(changeoverId: string, id: string): Promise<{ base: Trace | null; proposed: Trace | null } | null> {
  if (!isUuid(changeoverId) || !isUuid(id)) return null;
  const row = await db()('changeover_checks').where({ changeover_id: changeoverId, id }).select('base_trace', 'proposed_trace').first();
  return row ? { base: row.base_trace, proposed: row.proposed_trace } : null;
}

// ---- acceptances

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toAcceptance(r: any): Acceptance {
  return {
    id: r.id,
    changeoverId: r.changeover_id,
    kind: r.kind,
    subject: r.subject,
    fingerprint: r.fingerprint,
    reason: r.reason,
    acceptedBy: { id: r.accepted_by, name: r.accepted_by_name ?? '' },
    acceptedAt: iso(r.accepted_at)!,
  };
}

export async function listAcceptances(changeoverId: string): Promise<Acceptance[]> {
  if (!isUuid(changeoverId)) return [];
  const rows = await db()('changeover_acceptances as a')
    .join('users as u', 'u.id', 'a.accepted_by')
    .where('a.changeover_id', changeoverId)
    .orderBy('a.accepted_at')
    .select('a.*', 'u.name as accepted_by_name');
  return rows.map(toAcceptance);
}

/**
 * Records (or, for the same thing accepted again, rewrites) an acceptance with its reason,
 * who and when. The caller has checked that the changeover may still change.
 */
export async function acceptEvidence(input: { changeoverId: string; kind: AcceptanceKind; subject: string; fingerprint: string; reason: string; by: string }): Promise<Acceptance> {
  const k = db();
  await k('changeover_acceptances')
    .insert({ changeover_id: input.changeoverId, kind: input.kind, subject: input.subject, fingerprint: input.fingerprint, reason: input.reason, accepted_by: input.by })
    .onConflict(['changeover_id', 'kind', 'subject', 'fingerprint'])
    .merge({ reason: input.reason, accepted_by: input.by, accepted_at: k.fn.now() });
  const row = await k('changeover_acceptances as a')
    .join('users as u', 'u.id', 'a.accepted_by')
    .where({ 'a.changeover_id': input.changeoverId, 'a.kind': input.kind, 'a.subject': input.subject, 'a.fingerprint': input.fingerprint })
    .select('a.*', 'u.name as accepted_by_name')
    .first();
  return toAcceptance(row);
}

export async function withdrawAcceptance(changeoverId: string, kind: AcceptanceKind, subject: string, fingerprint: string): Promise<boolean> {
  return (await db()('changeover_acceptances').where({ changeover_id: changeoverId, kind, subject, fingerprint }).delete()) > 0;
}
