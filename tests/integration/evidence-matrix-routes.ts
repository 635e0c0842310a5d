/**
 * The changeover-evidence routes' rows of the role × route matrix (route-matrix.test.ts
 * spreads them into its table). Each `prepare` makes fresh targets owned by the demo lead:
 * a cell (interlock rules, scenarios), a changeover with the demo's rules and scenarios
 * (evidence, jobs, acceptances, traces), or a finished practice run on a cell of theirs.
 * The owner may do everything; the admin reads a changeover's evidence but changes none of it
 * (403) and keeps no cells (403); trainers and other people's ids see 404; students have no
 * changeovers and keep no rules or scenarios (403); anonymous callers 401.
 */
import * as evidence from '@/app/api/changeovers/[id]/evidence/route';
import * as documents from '@/app/api/changeovers/[id]/documents/route';
import * as proofs from '@/app/api/changeovers/[id]/proofs/route';
import * as checks from '@/app/api/changeovers/[id]/checks/route';
import * as verdictAcceptance from '@/app/api/changeovers/[id]/verdicts/[verdictId]/acceptance/route';
import * as checkAcceptance from '@/app/api/changeovers/[id]/checks/[checkId]/acceptance/route';
import * as traces from '@/app/api/changeovers/[id]/checks/[checkId]/traces/route';
import * as rules from '@/app/api/cells/[id]/interlock-rules/route';
import * as rule from '@/app/api/cells/[id]/interlock-rules/[ruleId]/route';
import * as scenarios from '@/app/api/cells/[id]/scenarios/route';
import * as scenario from '@/app/api/cells/[id]/scenarios/[scenarioId]/route';
import * as keep from '@/app/api/runs/[id]/scenario/route';
import { createCell } from '@/db/cells';
import { acceptEvidence, listChecks, listVerdicts, openEvidenceRun } from '@/db/changeover-evidence';
import { listInterlockRules } from '@/db/interlock-rules';
import { listScenarios } from '@/db/scenarios';
import { createRun, insertBatch } from '@/db/runs';
import { db } from '@/db/knex';
import { DEMO_INTERLOCK_RULES, DEMO_SCENARIOS } from '@/db/seeds/demo-evidence';
import { runChangeoverChecks, runChangeoverProofs } from '@/lib/changeovers/jobs';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { evidenceChangeover } from './evidence-fixtures';
import { at, type RouteCase, type World, byRole } from './route-matrix-cases';

/** Changeover reading routes: the owner (demo lead) and the admin. */
const READER = (ok: number) => byRole('changeovers', ok, { trainer: 404, otherTrainer: 404 });
/** Changeover evidence that changes: the owner only. */
const EDITOR = (ok: number) => byRole('changeovers', ok, { trainer: 404, admin: 403, otherTrainer: 404 });
/** A cell's rules and scenarios: its owner; the admin and students by role. */
const CELL_OWNER = (ok: number) => byRole('cellEvidence', ok, { trainer: 404, otherTrainer: 404 });

const leadCell = async (w: World) => (await createCell({ ownerId: w.users.lead.id, name: 'Matrix evidence cell', origin: 'template', document: cellDocumentSchema.parse(structuredClone(pickAndPlaceCell)), message: 'v1' })).id;

/** A changeover whose proofs (and, with `checks`, scenario checks) have run, as the worker would have run them. */
async function provedChangeover(w: World, what: 'proofs' | 'checks'): Promise<{ id: string; verdictId: string; checkId: string }> {
  const { changeover } = await evidenceChangeover(w.users.lead, { scenarios: what === 'checks' });
  const { run } = await openEvidenceRun({ changeoverId: changeover.id, kind: what, baseVersion: 1, proposedVersion: 2, inputsSha256: '0'.repeat(64), total: 0, requestedBy: w.users.lead.id });
  if (what === 'proofs') {
    await runChangeoverProofs({ changeoverId: changeover.id, runId: run.id });
    const v = (await listVerdicts(run.id)).find((x) => x.side === 'proposed' && x.status === 'violated')!;
    return { id: changeover.id, verdictId: v.id, checkId: '' };
  }
  await runChangeoverChecks({ changeoverId: changeover.id, runId: run.id });
  const c = (await listChecks(run.id)).find((x) => x.changed)!;
  return { id: changeover.id, verdictId: '', checkId: c.id };
}

const REASON = { reason: 'Accepted in the matrix: a reason long enough.' };

export const EVIDENCE_ROUTES: RouteCase[] = [
  {
    name: 'GET /api/changeovers/[id]/evidence',
    handler: evidence.GET,
    method: 'GET',
    prepare: async (w) => {
      const { changeover } = await evidenceChangeover(w.users.lead, { scenarios: false });
      return { path: `/api/changeovers/${changeover.id}/evidence`, params: at(changeover.id) };
    },
    expect: READER(200),
  },
  {
    name: 'GET /api/changeovers/[id]/documents',
    handler: documents.GET,
    method: 'GET',
    prepare: async (w) => {
      const { changeover } = await evidenceChangeover(w.users.lead, { rules: false, scenarios: false });
      return { path: `/api/changeovers/${changeover.id}/documents`, params: at(changeover.id) };
    },
    expect: READER(200),
  },
  {
    name: 'POST /api/changeovers/[id]/proofs',
    handler: proofs.POST,
    method: 'POST',
    prepare: async (w) => {
      const { changeover } = await evidenceChangeover(w.users.lead, { scenarios: false });
      return { path: `/api/changeovers/${changeover.id}/proofs`, params: at(changeover.id) };
    },
    expect: EDITOR(202),
  },
  {
    name: 'POST /api/changeovers/[id]/checks',
    handler: checks.POST,
    method: 'POST',
    prepare: async (w) => {
      const { changeover } = await evidenceChangeover(w.users.lead, { rules: false });
      return { path: `/api/changeovers/${changeover.id}/checks`, params: at(changeover.id) };
    },
    expect: EDITOR(202),
  },
  {
    name: 'PUT /api/changeovers/[id]/verdicts/[verdictId]/acceptance',
    handler: verdictAcceptance.PUT,
    method: 'PUT',
    prepare: async (w) => {
      const { id, verdictId } = await provedChangeover(w, 'proofs');
      return { path: `/api/changeovers/${id}/verdicts/${verdictId}/acceptance`, params: at(id, { verdictId }), body: REASON };
    },
    expect: EDITOR(200),
  },
  {
    name: 'DELETE /api/changeovers/[id]/verdicts/[verdictId]/acceptance',
    handler: verdictAcceptance.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const { id, verdictId } = await provedChangeover(w, 'proofs');
      const v = (await db()('changeover_verdicts').where({ id: verdictId }).first())!;
      await acceptEvidence({ changeoverId: id, kind: 'proof', subject: v.rule_id, fingerprint: v.fingerprint, reason: REASON.reason, by: w.users.lead.id });
      return { path: `/api/changeovers/${id}/verdicts/${verdictId}/acceptance`, params: at(id, { verdictId }) };
    },
    expect: EDITOR(200),
  },
  {
    name: 'PUT /api/changeovers/[id]/checks/[checkId]/acceptance',
    handler: checkAcceptance.PUT,
    method: 'PUT',
    prepare: async (w) => {
      const { id, checkId } = await provedChangeover(w, 'checks');
      return { path: `/api/changeovers/${id}/checks/${checkId}/acceptance`, params: at(id, { checkId }), body: REASON };
    },
    expect: EDITOR(200),
  },
  {
    name: 'DELETE /api/changeovers/[id]/checks/[checkId]/acceptance',
    handler: checkAcceptance.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const { id, checkId } = await provedChangeover(w, 'checks');
      const c = (await db()('changeover_checks').where({ id: checkId }).first())!;
      await acceptEvidence({ changeoverId: id, kind: 'check', subject: c.scenario_id, fingerprint: c.fingerprint, reason: REASON.reason, by: w.users.lead.id });
      return { path: `/api/changeovers/${id}/checks/${checkId}/acceptance`, params: at(id, { checkId }) };
    },
    expect: EDITOR(200),
  },
  {
    name: 'GET /api/changeovers/[id]/checks/[checkId]/traces',
    handler: traces.GET,
    method: 'GET',
    prepare: async (w) => {
      const { id, checkId } = await provedChangeover(w, 'checks');
      return { path: `/api/changeovers/${id}/checks/${checkId}/traces`, params: at(id, { checkId }) };
    },
    expect: READER(200),
  },
  {
    name: 'GET /api/cells/[id]/interlock-rules',
    handler: rules.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await leadCell(w);
      return { path: `/api/cells/${id}/interlock-rules`, params: at(id) };
    },
    expect: CELL_OWNER(200),
  },
  {
    name: 'POST /api/cells/[id]/interlock-rules',
    handler: rules.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await leadCell(w);
      return { path: `/api/cells/${id}/interlock-rules`, params: at(id), body: { title: DEMO_INTERLOCK_RULES[0].title, rule: DEMO_INTERLOCK_RULES[0].body } };
    },
    expect: CELL_OWNER(201),
  },
  {
    name: 'PATCH /api/cells/[id]/interlock-rules/[ruleId]',
    handler: rule.PATCH,
    method: 'PATCH',
    prepare: async (w) => {
      const { cellId } = await evidenceChangeover(w.users.lead, { scenarios: false });
      const ruleId = (await listInterlockRules(cellId))[0].id;
      return { path: `/api/cells/${cellId}/interlock-rules/${ruleId}`, params: at(cellId, { ruleId }), body: { title: 'Renamed in the matrix', rule: DEMO_INTERLOCK_RULES[0].body } };
    },
    expect: CELL_OWNER(200),
  },
  {
    name: 'DELETE /api/cells/[id]/interlock-rules/[ruleId]',
    handler: rule.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const { cellId } = await evidenceChangeover(w.users.lead, { scenarios: false });
      const ruleId = (await listInterlockRules(cellId))[0].id;
      return { path: `/api/cells/${cellId}/interlock-rules/${ruleId}`, params: at(cellId, { ruleId }) };
    },
    expect: CELL_OWNER(200),
  },
  {
    name: 'GET /api/cells/[id]/scenarios',
    handler: scenarios.GET,
    method: 'GET',
    prepare: async (w) => {
      const id = await leadCell(w);
      return { path: `/api/cells/${id}/scenarios`, params: at(id) };
    },
    expect: CELL_OWNER(200),
  },
  {
    name: 'POST /api/cells/[id]/scenarios',
    handler: scenarios.POST,
    method: 'POST',
    prepare: async (w) => {
      const id = await leadCell(w);
      const { name, events, rules: r, durationMs } = DEMO_SCENARIOS[0];
      return { path: `/api/cells/${id}/scenarios`, params: at(id), body: { name, events, rules: r, durationMs } };
    },
    expect: CELL_OWNER(201),
  },
  {
    name: 'GET /api/cells/[id]/scenarios/[scenarioId]',
    handler: scenario.GET,
    method: 'GET',
    prepare: async (w) => {
      const { cellId } = await evidenceChangeover(w.users.lead, { rules: false });
      const scenarioId = (await listScenarios(cellId))[0].id;
      return { path: `/api/cells/${cellId}/scenarios/${scenarioId}`, params: at(cellId, { scenarioId }) };
    },
    expect: CELL_OWNER(200),
  },
  {
    name: 'PATCH /api/cells/[id]/scenarios/[scenarioId]',
    handler: scenario.PATCH,
    method: 'PATCH',
    prepare: async (w) => {
      const { cellId } = await evidenceChangeover(w.users.lead, { rules: false });
      const scenarioId = (await listScenarios(cellId))[0].id;
      return { path: `/api/cells/${cellId}/scenarios/${scenarioId}`, params: at(cellId, { scenarioId }), body: { name: 'Renamed in the matrix' } };
    },
    expect: CELL_OWNER(200),
  },
  {
    name: 'DELETE /api/cells/[id]/scenarios/[scenarioId]',
    handler: scenario.DELETE,
    method: 'DELETE',
    prepare: async (w) => {
      const { cellId } = await evidenceChangeover(w.users.lead, { rules: false });
      const scenarioId = (await listScenarios(cellId))[0].id;
      return { path: `/api/cells/${cellId}/scenarios/${scenarioId}`, params: at(cellId, { scenarioId }) };
    },
    expect: CELL_OWNER(200),
  },
  {
    name: 'POST /api/runs/[id]/scenario',
    handler: keep.POST,
    method: 'POST',
    prepare: async (w) => {
      const cellId = await leadCell(w);
      const run = await createRun({ userId: w.users.lead.id, mode: 'practice', cellId, cellVersion: 1, seed: 3 });
      await insertBatch(run.id, { seq: 1, key: `matrix-${run.id}`, untilMs: 3000, events: [{ t: 1000, event: { type: 'press', device: 'start' } }] });
      await db()('runs').where({ id: run.id }).update({ status: 'submitted', submitted_at: db().fn.now(), ended_ms: 3000 });
      return { path: `/api/runs/${run.id}/scenario`, params: at(run.id), body: { name: 'Kept in the matrix' } };
    },
    expect: CELL_OWNER(201),
  },
];
