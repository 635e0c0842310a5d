import 'server-only';
import { createCell, type CellDocument } from '@/simulator';
import { PermanentJobError, type JobHandler } from '@/lib/jobs';
import { JobAbortError } from '@/lib/jobs/errors';
import { findChangeover, versionDocuments } from '@/db/changeovers';
import {
  beginEvidenceRun,
  findEvidenceRun,
  finishEvidenceRun,
  insertCheck,
  insertVerdicts,
  reportEvidenceProgress,
  type EvidenceRun,
  type NewVerdict,
} from '@/db/changeover-evidence';
import { listInterlockRules, toInterlockRule } from '@/db/interlock-rules';
import { listScenariosWithEvents } from '@/db/scenarios';
import { proofsInputsSha256, proveOne, verdictFingerprint, type Side } from './prove-rules';
import { checkFingerprint, checksInputsSha256, compareOutcomes, comparisonSignals, runScenario, storableTrace, type ScenarioInput } from './scenario-check';

/**
 * The changeover evidence jobs, run by the job worker process (scripts/worker.ts) — never on
 * a request's event loop: `changeover-proofs` proves every interlock rule of the cell on the
 * changeover's base and proposal; `changeover-checks` re-simulates every scenario of the cell
 * on both and compares the outcomes. Each reports progress before every rule or scenario (in
 * its run row, which the changeover page reads, and to the queue's progress stream) and
 * stores its results in the run. An attempt cut short (a worker stopped or lost the job) is
 * run again from the start by the queue; any other failure fails the run and the job for
 * good — the same inputs would fail the same way, and the lead can run it again.
 */

/** What the routes enqueue: the run row the job fills. */
export type EvidenceJobPayload = { changeoverId: string; runId: string };

/** Progress as the queue's stream carries it. */
export type EvidenceProgress = { done: number; total: number; message: string };

export type EvidenceJobResult = { runId: string; status: 'done' | 'failed' | 'skipped'; summary: string };

/** How a job reports and is stopped (the queue's context, or nothing in tests). */
export type EvidenceHooks = { report?: (p: EvidenceProgress) => unknown; signal?: AbortSignal };

const payloadOf = (raw: unknown): EvidenceJobPayload => {
  const p = raw as Partial<EvidenceJobPayload> | null;
  if (!p || typeof p.changeoverId !== 'string' || typeof p.runId !== 'string') throw new PermanentJobError('the job names no changeover run');
  return { changeoverId: p.changeoverId, runId: p.runId };
};

async function documentsOf(run: EvidenceRun): Promise<{ cellId: string; base: CellDocument; proposed: CellDocument }> {
  const co = await findChangeover(run.changeoverId);
  if (!co) throw new Error('the changeover is gone');
  const docs = await versionDocuments(co.cellId, [run.baseVersion, run.proposedVersion]);
  const base = docs.get(run.baseVersion);
  const proposed = docs.get(run.proposedVersion);
  if (!base || !proposed) throw new Error(`version ${!base ? run.baseVersion : run.proposedVersion} of the cell is missing`);
  return { cellId: co.cellId, base, proposed };
}

/**
 * Runs `work` on a run. A stopped attempt (worker shutting down, job lost to another worker)
 * is thrown on for the queue to run again; any other failure, the budget included, fails the
 * run (with its message, shown on the page) and the job.
 */
async function withRun(payload: EvidenceJobPayload, signal: AbortSignal | undefined, work: (run: EvidenceRun) => Promise<string>): Promise<EvidenceJobResult> {
  const run = await findEvidenceRun(payload.runId);
  if (!run || run.changeoverId !== payload.changeoverId) return { runId: payload.runId, status: 'skipped', summary: 'no such run' };
  if (run.status === 'done' || run.status === 'failed') return { runId: run.id, status: 'skipped', summary: `already ${run.status}` };
  try {
    const summary = await work(run);
    await finishEvidenceRun(run.id, 'done');
    return { runId: run.id, status: 'done', summary };
  } catch (e) {
    const why = signal?.aborted && signal.reason instanceof JobAbortError ? signal.reason.why : null;
    if (why === 'shutdown' || why === 'lost') throw e;
    const message = why === 'budget' ? 'The job took longer than its time budget.' : e instanceof Error ? e.message : String(e);
    await finishEvidenceRun(run.id, 'failed', message.slice(0, 2000));
    throw new PermanentJobError(message);
  }
}

/** Throws the abort reason between steps, so a stopped attempt ends at once. */
function checkpoint(signal: AbortSignal | undefined): void {
  if (signal?.aborted) throw signal.reason instanceof Error ? signal.reason : new Error('the job was stopped');
}

/** The `changeover-proofs` job: every rule of the cell, proved on base and proposal. */
export function runChangeoverProofs(payload: EvidenceJobPayload, { report = () => undefined, signal }: EvidenceHooks = {}): Promise<EvidenceJobResult> {
  return withRun(payload, signal, async (run) => {
    const { cellId, base, proposed } = await documentsOf(run);
    const rules = (await listInterlockRules(cellId)).map(toInterlockRule);
    const total = rules.length * 2;
    if (!(await beginEvidenceRun(run.id, total, proofsInputsSha256(rules, run.baseVersion, run.proposedVersion)))) throw new PermanentJobError('the run was closed before it started');
    const docs: Record<Side, { document: CellDocument; version: number }> = {
      base: { document: base, version: run.baseVersion },
      proposed: { document: proposed, version: run.proposedVersion },
    };
    let done = 0;
    let violated = 0;
    for (const [position, rule] of rules.entries()) {
      const rows: NewVerdict[] = [];
      for (const side of ['base', 'proposed'] as const) {
        checkpoint(signal);
        const message = `Proving “${rule.title || rule.id}” on the ${side} (version ${docs[side].version})`;
        await reportEvidenceProgress(run.id, done, message);
        await report({ done, total, message });
        const proved = proveOne(docs[side].document, rule);
        if (side === 'proposed' && proved.status === 'violated') violated++;
        rows.push({
          runId: run.id,
          changeoverId: run.changeoverId,
          ruleId: rule.id,
          position,
          title: rule.title,
          rule,
          side,
          version: docs[side].version,
          status: proved.status,
          exact: proved.exact,
          verdict: proved.verdict,
          fingerprint: verdictFingerprint(rule, side, docs[side].version, proved),
        });
        done++;
      }
      await insertVerdicts(rows);
    }
    await reportEvidenceProgress(run.id, done, '');
    await report({ done, total, message: 'Proofs finished' });
    return `${rules.length} rules proved on both versions; ${violated} violated on the proposal`;
  });
}

function signalNamesOf(document: CellDocument): string[] {
  const made = createCell(document);
  if (!made.ok) return [];
  const names = made.value.signalNames();
  made.value.dispose();
  return names;
}

/** The `changeover-checks` job: every scenario of the cell, re-run on base and proposal and compared. */
export function runChangeoverChecks(payload: EvidenceJobPayload, { report = () => undefined, signal }: EvidenceHooks = {}): Promise<EvidenceJobResult> {
  return withRun(payload, signal, async (run) => {
    const { cellId, base, proposed } = await documentsOf(run);
    const scenarios = await listScenariosWithEvents(cellId);
    const total = scenarios.length * 2;
    const inputs = scenarios.map((s) => ({ id: s.id, name: s.name, events: s.events, rules: s.rules, faults: s.faults, seed: s.seed, durationMs: s.durationMs }));
    if (!(await beginEvidenceRun(run.id, total, checksInputsSha256(inputs, run.baseVersion, run.proposedVersion)))) throw new PermanentJobError('the run was closed before it started');
    const names = { base: signalNamesOf(base), proposed: signalNamesOf(proposed) };
    const compare = comparisonSignals(names.base, names.proposed);
    let done = 0;
    let changed = 0;
    for (const [position, s] of scenarios.entries()) {
      const input: ScenarioInput = { name: s.name, events: s.events, rules: s.rules, faults: s.faults, seed: s.seed, durationMs: s.durationMs };
      checkpoint(signal);
      const message = (side: Side) => `Running “${s.name}” on the ${side}`;
      await reportEvidenceProgress(run.id, done, message('base'));
      await report({ done, total, message: message('base') });
      const a = runScenario(base, run.baseVersion, names.base, input, compare);
      done++;
      await reportEvidenceProgress(run.id, done, message('proposed'));
      await report({ done, total, message: message('proposed') });
      const b = runScenario(proposed, run.proposedVersion, names.proposed, input, compare);
      done++;
      const diff = compareOutcomes(a.outcome, b.outcome);
      if (diff.changed) changed++;
      await insertCheck({
        runId: run.id,
        changeoverId: run.changeoverId,
        scenarioId: s.id,
        position,
        name: s.name,
        scenario: { id: s.id, ...input },
        base: a.outcome,
        proposed: b.outcome,
        changes: diff.changes,
        changed: diff.changed,
        fingerprint: checkFingerprint(input, a.outcome, b.outcome),
        baseTrace: a.trace ? storableTrace(a.trace) : null,
        proposedTrace: b.trace ? storableTrace(b.trace) : null,
      });
    }
    await reportEvidenceProgress(run.id, done, '');
    await report({ done, total, message: 'Checks finished' });
    return `${scenarios.length} scenarios run on both versions; ${changed} changed`;
  });
}

const hooksOf = (ctx: Parameters<JobHandler>[1]): EvidenceHooks => ({ report: (p) => ctx.reportProgress(p.done, p.total, p.message), signal: ctx.signal });

/** The queue's handler of `changeover-proofs` (lib/jobs/registry.ts). */
export const changeoverProofsJob: JobHandler = (payload, ctx) => runChangeoverProofs(payloadOf(payload), hooksOf(ctx));

/** The queue's handler of `changeover-checks` (lib/jobs/registry.ts). */
export const changeoverChecksJob: JobHandler = (payload, ctx) => runChangeoverChecks(payloadOf(payload), hooksOf(ctx));
