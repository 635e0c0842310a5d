/**
 * A changeover's evidence against the real database: the proofs and checks jobs on the demo
 * changeover (their handlers run here directly, as the worker process would run them),
 * acceptances with reasons, readiness, and who may see and do what.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as evidenceRoute from '@/app/api/changeovers/[id]/evidence/route';
import * as proofsRoute from '@/app/api/changeovers/[id]/proofs/route';
import * as checksRoute from '@/app/api/changeovers/[id]/checks/route';
import * as verdictAcceptance from '@/app/api/changeovers/[id]/verdicts/[verdictId]/acceptance/route';
import * as checkAcceptance from '@/app/api/changeovers/[id]/checks/[checkId]/acceptance/route';
import * as traces from '@/app/api/changeovers/[id]/checks/[checkId]/traces/route';
import * as documents from '@/app/api/changeovers/[id]/documents/route';
import * as rulesRoute from '@/app/api/cells/[id]/interlock-rules/route';
import * as ruleRoute from '@/app/api/cells/[id]/interlock-rules/[ruleId]/route';
import { closeDb, db } from '@/db/knex';
import { findChangeover, pinProposal, signChangeover } from '@/db/changeovers';
import { findEvidenceRun, listVerdicts } from '@/db/changeover-evidence';
import { listInterlockRules } from '@/db/interlock-rules';
import { listScenarios } from '@/db/scenarios';
import { DEMO_CHANGEOVER } from '@/db/seeds/demo-changeovers';
import { DEMO_INTERLOCK_RULES } from '@/db/seeds/demo-evidence';
import type { User } from '@/db/users';
import { loadEvidence, type EvidenceDetail } from '@/lib/changeovers/evidence';
import { runChangeoverChecks, runChangeoverProofs } from '@/lib/changeovers/jobs';
import { call, demoUser, makeUser, sessionCookie } from './helpers';
import { evidenceChangeover } from './evidence-fixtures';

let lead: User;
let leadCookie: string;
const BROKEN = DEMO_INTERLOCK_RULES[0].title;
const FIXED = DEMO_INTERLOCK_RULES[1].title;

beforeAll(async () => {
  lead = await demoUser('lead@brennick.test');
  leadCookie = await sessionCookie(lead);
});

afterAll(async () => {
  await closeDb();
});

type EvidenceBody = { evidence: EvidenceDetail; canEdit: boolean; rules: unknown[]; scenarios: unknown[] };

async function evidenceOf(id: string, cookie = leadCookie): Promise<EvidenceBody> {
  const res = await call(evidenceRoute.GET, `/api/changeovers/${id}/evidence`, { cookie, params: { id } });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as EvidenceBody;
}

/** Requests a job through its route (the job is queued) and runs its handler here, as the worker would. */
async function runJob(kind: 'proofs' | 'checks', id: string): Promise<string> {
  const route = kind === 'proofs' ? proofsRoute : checksRoute;
  const res = await call(route.POST, `/api/changeovers/${id}/${kind}`, { method: 'POST', cookie: leadCookie, params: { id } });
  expect(res.status, JSON.stringify(res.body)).toBe(202);
  const { run, created } = res.body as { run: { id: string; jobId: string | null; status: string }; created: boolean };
  expect(created).toBe(true);
  expect(run.status).toBe('queued');
  expect(run.jobId).toBeTruthy();
  const job = await db()('jobs').where({ id: run.jobId }).first();
  expect(job).toMatchObject({ kind: `changeover-${kind}`, subject: `changeover:${id}` });
  const progress: number[] = [];
  const result = await (kind === 'proofs' ? runChangeoverProofs : runChangeoverChecks)({ changeoverId: id, runId: run.id }, { report: (p) => progress.push(p.done) });
  expect(result.status).toBe('done');
  expect(progress.length).toBeGreaterThan(1);
  expect((await findEvidenceRun(run.id))?.status).toBe('done');
  return run.id;
}

describe('the demo changeover', () => {
  it('comes with the cell’s interlock rules and two scenarios', async () => {
    const co = await db()('changeovers').where({ title: DEMO_CHANGEOVER.title }).first('id', 'cell_id');
    expect(co).toBeTruthy();
    expect((await listInterlockRules(co.cell_id)).map((r) => r.title)).toEqual(DEMO_INTERLOCK_RULES.map((r) => r.title));
    expect((await listScenarios(co.cell_id)).map((s) => s.name).sort()).toEqual(['Normal part cycle', 'Rear guard opened mid-cycle']);
    const body = await evidenceOf(co.id);
    expect(body.canEdit).toBe(true);
    expect(body.evidence.ready).toBe(false);
  });
});

describe('proofs, checks, acceptances and readiness', () => {
  let id: string;

  beforeAll(async () => {
    ({ changeover: { id } } = await evidenceChangeover(lead));
  });

  it('before anything runs, the evidence is not ready and says why', async () => {
    const { evidence } = await evidenceOf(id);
    expect(evidence.ready).toBe(false);
    expect(evidence.ranOn).toBeNull();
    expect(evidence.blockers).toEqual(expect.arrayContaining([expect.stringMatching(/not pinned/), 'The proofs have not run.', 'The scenario checks have not run.']));
  });

  it('the proofs job finds the broken interlock on the proposal, proves it on the base, and says how timers were treated', async () => {
    const runId = await runJob('proofs', id);
    const { evidence } = await evidenceOf(id);
    expect(evidence.ranOn).toEqual({ baseVersion: 1, proposedVersion: 2 });
    const broken = evidence.proofs.find((p) => p.title === BROKEN)!;
    expect(broken.base).toMatchObject({ status: 'proved', version: 1 });
    expect(broken.proposed).toMatchObject({ status: 'violated', version: 2 });
    expect(broken.settled).toBe(false);
    const fixed = evidence.proofs.find((p) => p.title === FIXED)!;
    expect(fixed.base?.status).toBe('violated');
    expect(fixed.proposed?.status).toBe('proved');
    const pulse = evidence.proofs.find((p) => p.title.startsWith('Start request is a pulse'))!;
    expect(pulse.proposed).toMatchObject({ status: 'proved', timers: 'exact' });
    expect(evidence.proofs.filter((p) => p.proposed?.status === 'proved')).toHaveLength(DEMO_INTERLOCK_RULES.length - 1);
    expect(evidence.blockers).toEqual(expect.arrayContaining([expect.stringContaining(`Rule “${BROKEN}” is violated on the proposal`)]));
    // The violated verdict carries its counterexample: the shortest run, here one scan.
    const verdicts = await listVerdicts(runId);
    const v = verdicts.find((x) => x.title === BROKEN && x.side === 'proposed')!;
    expect(v.verdict.status).toBe('violated');
    if (v.verdict.status === 'violated') {
      expect(v.verdict.counterexample.scans).toHaveLength(1);
      expect(v.verdict.counterexample.scans[0].inputs).toMatchObject({ '%IX0.4': true, '%IX0.7': false, '%IX0.1': true });
    }
  });

  it('the checks job reports the changed outcome of the rear-guard scenario and leaves the normal cycle unchanged', async () => {
    await runJob('checks', id);
    const { evidence } = await evidenceOf(id);
    const normal = evidence.checks.find((c) => c.name === 'Normal part cycle')!;
    expect(normal.changed).toBe(false);
    expect(normal.base.hash).toBe(normal.proposed.hash);
    const rear = evidence.checks.find((c) => c.name === 'Rear guard opened mid-cycle')!;
    expect(rear.changed).toBe(true);
    expect(rear.changes).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ kind: 'rule', rule: 'yellow-on-rear-open', from: 'fail', to: 'pass' }),
        expect.objectContaining({ kind: 'rule', rule: 'arm-stops-on-rear-open', from: 'pass', to: 'fail' }),
        expect.objectContaining({ kind: 'trace' }),
      ]),
    );
    const t = await call(traces.GET, `/api/changeovers/${id}/checks/${rear.checkId}/traces`, { cookie: leadCookie, params: { id, checkId: rear.checkId } });
    expect(t.status).toBe(200);
    const body = t.body as { traces: { base: { signals: string[] }; proposed: { signals: string[] } } };
    expect(body.traces.base.signals).toContain('plc.%QX1.1');
    expect(body.traces.proposed.signals).toContain('plc.%QX1.1');
  });

  it('a second request while a run is open returns that run instead of another', async () => {
    const first = await call(proofsRoute.POST, `/api/changeovers/${id}/proofs`, { method: 'POST', cookie: leadCookie, params: { id } });
    const second = await call(proofsRoute.POST, `/api/changeovers/${id}/proofs`, { method: 'POST', cookie: leadCookie, params: { id } });
    expect(first.status).toBe(202);
    expect(second.body).toMatchObject({ created: false, run: { id: (first.body as { run: { id: string } }).run.id } });
    await runChangeoverProofs({ changeoverId: id, runId: (first.body as { run: { id: string } }).run.id });
  });

  it('accepting needs a written reason; who and when are kept; then the evidence is ready once pinned', async () => {
    const { evidence } = await evidenceOf(id);
    const broken = evidence.proofs.find((p) => p.title === BROKEN)!;
    const vid = broken.proposed!.verdictId;
    const short = await call(verdictAcceptance.PUT, `/x`, { method: 'PUT', cookie: leadCookie, params: { id, verdictId: vid }, body: { reason: 'ok' } });
    expect(short.status).toBe(422);
    expect(short.body).toMatchObject({ fields: { reason: [expect.stringMatching(/at least 10/)] } });
    // A proved verdict has nothing to accept; a base verdict is never accepted.
    const proved = evidence.proofs.find((p) => p.title === FIXED)!;
    expect((await call(verdictAcceptance.PUT, `/x`, { method: 'PUT', cookie: leadCookie, params: { id, verdictId: proved.proposed!.verdictId }, body: { reason: 'nothing to accept here' } })).status).toBe(409);
    expect((await call(verdictAcceptance.PUT, `/x`, { method: 'PUT', cookie: leadCookie, params: { id, verdictId: proved.base!.verdictId }, body: { reason: 'the base is not accepted' } })).status).toBe(409);

    const reason = 'The rear door is interlocked by a safety relay in the real cell; the PLC path is fixed next shutdown (MOC 2026-114).';
    const ok = await call(verdictAcceptance.PUT, `/x`, { method: 'PUT', cookie: leadCookie, params: { id, verdictId: vid }, body: { reason } });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body).toMatchObject({ acceptance: { reason, acceptedBy: { id: lead.id, name: lead.name } } });

    const rear = evidence.checks.find((c) => c.changed)!;
    const acc = await call(checkAcceptance.PUT, `/x`, { method: 'PUT', cookie: leadCookie, params: { id, checkId: rear.checkId }, body: { reason: 'Expected: the rear door now lights yellow; arm stop tracked with the rule above.' } });
    expect(acc.status).toBe(200);
    const unchanged = evidence.checks.find((c) => !c.changed)!;
    expect((await call(checkAcceptance.PUT, `/x`, { method: 'PUT', cookie: leadCookie, params: { id, checkId: unchanged.checkId }, body: { reason: 'nothing changed in this one' } })).status).toBe(409);

    let now = await loadEvidence(id);
    expect(now.proofs.find((p) => p.title === BROKEN)).toMatchObject({ settled: true, acceptance: { reason, by: { id: lead.id } } });
    expect(now.blockers).toEqual([expect.stringMatching(/not pinned/)]);
    expect(now.ready).toBe(false);
    expect((await pinProposal(id, lead.id)).ok).toBe(true);
    now = await loadEvidence(id);
    expect(now.blockers).toEqual([]);
    expect(now.ready).toBe(true);
    expect(now.ranOn).toEqual({ baseVersion: 1, proposedVersion: 2 });

    // Taking an acceptance back makes it a blocker again; giving it again settles it.
    expect((await call(verdictAcceptance.DELETE, `/x`, { method: 'DELETE', cookie: leadCookie, params: { id, verdictId: vid } })).status).toBe(200);
    expect((await loadEvidence(id)).ready).toBe(false);
    await call(verdictAcceptance.PUT, `/x`, { method: 'PUT', cookie: leadCookie, params: { id, verdictId: vid }, body: { reason } });
    expect((await loadEvidence(id)).ready).toBe(true);
  });

  it('an edited rule makes the proofs stale; the evidence is frozen once signed', async () => {
    const co = (await findChangeover(id))!;
    const rules = await listInterlockRules(co.cellId);
    const last = rules[rules.length - 1];
    const patch = await call(ruleRoute.PATCH, `/x`, { method: 'PATCH', cookie: leadCookie, params: { id: co.cellId, ruleId: last.id }, body: { title: last.title, rule: { ...last.body, scans: 11 } } });
    expect(patch.status, JSON.stringify(patch.body)).toBe(200);
    expect((await loadEvidence(id)).blockers).toEqual(['The interlock rules changed after the proofs ran: run them again.']);
    await call(ruleRoute.PATCH, `/x`, { method: 'PATCH', cookie: leadCookie, params: { id: co.cellId, ruleId: last.id }, body: { title: last.title, rule: last.body } });
    expect((await loadEvidence(id)).ready).toBe(true);

    expect((await signChangeover(id, lead.id, { baseVersion: 1, proposedVersion: 2 })).ok).toBe(true);
    const res = await call(proofsRoute.POST, `/x`, { method: 'POST', cookie: leadCookie, params: { id } });
    expect(res.status).toBe(409);
    const verdict = (await loadEvidence(id)).proofs.find((p) => p.title === BROKEN)!.proposed!.verdictId;
    expect((await call(verdictAcceptance.DELETE, `/x`, { method: 'DELETE', cookie: leadCookie, params: { id, verdictId: verdict } })).status).toBe(409);
  });

  it('an invalid rule is refused with the field that is wrong', async () => {
    const co = (await findChangeover(id))!;
    const bad = await call(rulesRoute.POST, `/x`, { method: 'POST', cookie: leadCookie, params: { id: co.cellId }, body: { title: 'Bad', rule: { kind: 'never', what: { signal: '%QW2', value: 'on' }, while: { signal: '%IX0.1', value: 'on' } } } });
    expect(bad.status).toBe(422);
    expect(Object.keys((bad.body as { fields: object }).fields)).toEqual(expect.arrayContaining([expect.stringMatching(/^rule\.what/)]));
  });
});

describe('who may see and do what', () => {
  let id: string;
  let cellId: string;

  beforeAll(async () => {
    ({ changeover: { id }, cellId } = await evidenceChangeover(lead, { scenarios: false }));
  });

  it('reading: the owner lead and the admin; another lead and a trainer 404; a student 403', async () => {
    const status = async (user: User) => (await call(evidenceRoute.GET, `/x`, { cookie: await sessionCookie(user), params: { id } })).status;
    expect(await status(lead)).toBe(200);
    expect(await status(await demoUser('admin@kestrelvale.test'))).toBe(200);
    expect(await status(await makeUser('lead'))).toBe(404);
    expect(await status(await demoUser('trainer@kestrelvale.test'))).toBe(404);
    expect(await status(await demoUser('ada.lindqvist@kestrelvale.test'))).toBe(403);
    expect((await call(documents.GET, `/x`, { params: { id } })).status).toBe(401);
  });

  it('running and accepting: the owner only (the admin reads but may not change the evidence)', async () => {
    const admin = await sessionCookie(await demoUser('admin@kestrelvale.test'));
    expect((await call(proofsRoute.POST, `/x`, { method: 'POST', cookie: admin, params: { id } })).status).toBe(403);
    expect((await call(proofsRoute.POST, `/x`, { method: 'POST', cookie: await sessionCookie(await makeUser('lead')), params: { id } })).status).toBe(404);
    // No scenarios: nothing to check.
    expect((await call(checksRoute.POST, `/x`, { method: 'POST', cookie: leadCookie, params: { id } })).status).toBe(409);
  });

  it('a trainer’s own changeover is theirs to prove', async () => {
    const trainer = await makeUser('trainer');
    const { changeover } = await evidenceChangeover(trainer, { scenarios: false });
    const res = await call(proofsRoute.POST, `/x`, { method: 'POST', cookie: await sessionCookie(trainer), params: { id: changeover.id } });
    expect(res.status).toBe(202);
    expect((await call(evidenceRoute.GET, `/x`, { cookie: leadCookie, params: { id: changeover.id } })).status).toBe(404);
  });

  it('the cell’s rules: its owner only', async () => {
    expect((await call(rulesRoute.GET, `/x`, { cookie: leadCookie, params: { id: cellId } })).status).toBe(200);
    expect((await call(rulesRoute.GET, `/x`, { cookie: await sessionCookie(await makeUser('lead')), params: { id: cellId } })).status).toBe(404);
    expect((await call(rulesRoute.GET, `/x`, { cookie: await sessionCookie(await demoUser('ada.lindqvist@kestrelvale.test')), params: { id: cellId } })).status).toBe(403);
  });
});

describe('a job that fails', () => {
  it('fails its run with the reason, which the evidence shows, and the job for good', async () => {
    const { changeover } = await evidenceChangeover(lead, { scenarios: false });
    const res = await call(proofsRoute.POST, `/x`, { method: 'POST', cookie: leadCookie, params: { id: changeover.id } });
    const runId = (res.body as { run: { id: string } }).run.id;
    // The proposal's version disappears under the run (as a broken restore would leave it).
    await db()('changeover_evidence_runs').where({ id: runId }).update({ proposed_version: 99 });
    await expect(runChangeoverProofs({ changeoverId: changeover.id, runId })).rejects.toMatchObject({ name: 'PermanentJobError' });
    const { evidence } = await evidenceOf(changeover.id);
    expect(evidence.open.proofs).toBeNull();
    expect(evidence.failed.proofs).toMatchObject({ id: runId, status: 'failed', error: expect.stringMatching(/version 99/) });
    expect(evidence.blockers).toContain('The proofs have not run.');
  });
});
