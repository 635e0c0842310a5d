import 'server-only';
import { ApiError } from '@/lib/api/errors';
import { enqueueJob, subjectOf } from '@/lib/jobs';
import type { User } from '@/db/users';
import type { Changeover } from '@/db/changeovers';
import {
  acceptEvidence,
  findCheck,
  findVerdict,
  finishEvidenceRun,
  latestDoneEvidenceRun,
  openEvidenceRun,
  setEvidenceRunJob,
  withdrawAcceptance,
  type Acceptance,
  type EvidenceKind,
  type EvidenceRun,
} from '@/db/changeover-evidence';
import { listInterlockRules, toInterlockRule } from '@/db/interlock-rules';
import { listScenariosWithEvents } from '@/db/scenarios';
import { proofsInputsSha256 } from './prove-rules';
import { checksInputsSha256 } from './scenario-check';
import type { EvidenceJobPayload } from './jobs';

/**
 * What the evidence routes do on a changeover: start a proofs or checks job, and accept (or
 * take back the acceptance of) a violation or a changed outcome with a written reason. The
 * evidence may change only while the changeover is open and unsigned: once the opener has
 * signed, the evidence is what they signed on (withdraw the signature first), and a signed-off,
 * rolled-back or withdrawn changeover is closed for good.
 */

const JOB_KIND: Record<EvidenceKind, 'changeover-proofs' | 'changeover-checks'> = { proofs: 'changeover-proofs', checks: 'changeover-checks' };

/** 409 unless the changeover's evidence may still change. */
export function assertEvidenceOpen(co: Changeover): void {
  if (co.state !== 'drafting' && co.state !== 'checked') throw new ApiError(409, `This changeover is ${co.state}: its evidence can no longer change.`, undefined, { body: { state: co.state } });
  if (co.signedBy) throw new ApiError(409, `${co.signedBy.name} has signed this changeover: withdraw the signature to change its evidence.`);
}

/**
 * Opens a proofs or checks run on the changeover's base and current proposal and queues its
 * job (subject `changeover:<id>`, so the page's progress stream sees it). A run of the same
 * kind already open is returned instead (`created: false`).
 */
export async function startEvidenceJob(user: User, co: Changeover, kind: EvidenceKind): Promise<{ run: EvidenceRun; created: boolean }> {
  assertEvidenceOpen(co);
  if (!co.cellActive) throw new ApiError(409, 'The cell of this changeover has been deleted.');
  const baseVersion = co.baseVersion;
  const proposedVersion = co.pinnedVersion ?? co.proposedVersion;
  let inputsSha256: string;
  let total: number;
  if (kind === 'proofs') {
    const rules = (await listInterlockRules(co.cellId)).map(toInterlockRule);
    if (rules.length === 0) throw new ApiError(409, 'The cell keeps no interlock rules yet: add one first.');
    inputsSha256 = proofsInputsSha256(rules, baseVersion, proposedVersion);
    total = rules.length * 2;
  } else {
    const scenarios = await listScenariosWithEvents(co.cellId);
    if (scenarios.length === 0) throw new ApiError(409, 'The cell keeps no scenarios yet: keep a finished run as one first.');
    inputsSha256 = checksInputsSha256(
      scenarios.map((s) => ({ id: s.id, name: s.name, events: s.events, rules: s.rules, faults: s.faults, seed: s.seed, durationMs: s.durationMs })),
      baseVersion,
      proposedVersion,
    );
    total = scenarios.length * 2;
  }
  const opened = await openEvidenceRun({ changeoverId: co.id, kind, baseVersion, proposedVersion, inputsSha256, total, requestedBy: user.id });
  if (!opened.created) return opened;
  try {
    const payload: EvidenceJobPayload = { changeoverId: co.id, runId: opened.run.id };
    const job = await enqueueJob({ kind: JOB_KIND[kind], payload, ownerId: user.id, subject: subjectOf('changeover', co.id) });
    await setEvidenceRunJob(opened.run.id, job.id);
    return { run: { ...opened.run, jobId: job.id }, created: true };
  } catch (e) {
    await finishEvidenceRun(opened.run.id, 'failed', 'The job could not be queued.');
    throw e;
  }
}

/** The verdict an acceptance is for: one on the proposal of the latest proofs, violated or undecided. */
async function acceptableVerdict(co: Changeover, verdictId: string) {
  const v = await findVerdict(co.id, verdictId);
  if (!v) throw new ApiError(404, 'No such verdict.');
  const latest = await latestDoneEvidenceRun(co.id, 'proofs');
  if (latest?.id !== v.runId) throw new ApiError(409, 'This verdict is from an earlier run of the proofs: look at the latest one.');
  if (v.side !== 'proposed') throw new ApiError(409, 'Only the proposal’s verdicts are accepted: the base is what runs today.');
  if (v.status !== 'violated' && v.status !== 'undecided') throw new ApiError(409, v.status === 'proved' ? 'This rule is proved: there is nothing to accept.' : 'This rule could not be proved at all: fix the rule instead of accepting it.');
  return v;
}

/** The check an acceptance is for: a changed outcome of the latest checks. */
async function acceptableCheck(co: Changeover, checkId: string) {
  const c = await findCheck(co.id, checkId);
  if (!c) throw new ApiError(404, 'No such check.');
  const latest = await latestDoneEvidenceRun(co.id, 'checks');
  if (latest?.id !== c.runId) throw new ApiError(409, 'This check is from an earlier run: look at the latest one.');
  if (!c.changed) throw new ApiError(409, 'This scenario’s outcome did not change: there is nothing to accept.');
  return c;
}

/** Accepts a violation (or an undecided answer) on the proposal with a written reason. */
export async function acceptVerdict(user: User, co: Changeover, verdictId: string, reason: string): Promise<Acceptance> {
  assertEvidenceOpen(co);
  const v = await acceptableVerdict(co, verdictId);
  return acceptEvidence({ changeoverId: co.id, kind: 'proof', subject: v.ruleId, fingerprint: v.fingerprint, reason, by: user.id });
}

export async function withdrawVerdictAcceptance(co: Changeover, verdictId: string): Promise<void> {
  assertEvidenceOpen(co);
  const v = await acceptableVerdict(co, verdictId);
  if (!(await withdrawAcceptance(co.id, 'proof', v.ruleId, v.fingerprint))) throw new ApiError(404, 'This verdict is not accepted.');
}

/** Accepts a changed scenario outcome with a written reason. */
export async function acceptCheck(user: User, co: Changeover, checkId: string, reason: string): Promise<Acceptance> {
  assertEvidenceOpen(co);
  const c = await acceptableCheck(co, checkId);
  return acceptEvidence({ changeoverId: co.id, kind: 'check', subject: c.scenarioId, fingerprint: c.fingerprint, reason, by: user.id });
}

export async function withdrawCheckAcceptance(co: Changeover, checkId: string): Promise<void> {
  assertEvidenceOpen(co);
  const c = await acceptableCheck(co, checkId);
  if (!(await withdrawAcceptance(co.id, 'check', c.scenarioId, c.fingerprint))) throw new ApiError(404, 'This outcome is not accepted.');
}
