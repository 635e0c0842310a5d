import 'server-only';
import type { Knex } from 'knex';
import type { LoggedEvent } from '@/simulator';
import type { Diagnosis } from './types/drills';
import type { GradeBreakdown } from './types/runs';
import { writeAudit } from './audit';
import { db } from './knex';
import { isUuid } from './users';

export type RunMode = 'drill' | 'practice';
export type RunStatus = 'active' | 'submitted';

export interface Run {
  id: string;
  userId: string;
  userName: string;
  mode: RunMode;
  drillId: string | null;
  assignmentId: string | null;
  cellId: string;
  cellVersion: number;
  seed: number;
  status: RunStatus;
  startedAt: string;
  submittedAt: string | null;
  endedMs: number | null;
  diagnosis: Diagnosis | null;
  grade: number | null;
  breakdown: GradeBreakdown | null;
  traceHash: string | null;
  overrideGrade: number | null;
  overrideReason: string | null;
  overrideBy: string | null;
  /** Batches stored so far and the cell time the last one reached. */
  lastSeq: number;
  untilMs: number;
}

export interface StoredBatch {
  seq: number;
  key: string;
  untilMs: number;
  events: LoggedEvent[];
  createdAt: string;
}

const iso = (d: Date | string | null) => (d ? new Date(d).toISOString() : null);

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toRun(r: any): Run {
  return {
    id: r.id,
    userId: r.user_id,
    userName: r.user_name,
    mode: r.mode,
    drillId: r.drill_id,
    assignmentId: r.assignment_id,
    cellId: r.cell_id,
    cellVersion: r.cell_version,
    seed: Number(r.seed),
    status: r.status,
    startedAt: iso(r.started_at)!,
    submittedAt: iso(r.submitted_at),
    endedMs: r.ended_ms === null || r.ended_ms === undefined ? null : Number(r.ended_ms),
    diagnosis: r.diagnosis,
    grade: r.grade,
    breakdown: r.breakdown,
    traceHash: r.trace_hash,
    overrideGrade: r.override_grade,
    overrideReason: r.override_reason,
    overrideBy: r.override_by,
    lastSeq: r.last_seq ?? 0,
    untilMs: Number(r.until_ms ?? 0),
  };
}

// The last batch by seq carries the run's end: untilMs never goes back (lib/runs/policy.ts
// refuses that), so one backward step on the (run_id, seq) index gives both figures instead of
// aggregating every batch of a long run.
function runQuery(k: Knex = db()) {
  return k('runs as r')
    .join('users as u', 'u.id', 'r.user_id')
    .joinRaw('left join lateral (select b.seq, b.until_ms from run_batches b where b.run_id = r.id order by b.seq desc limit 1) lb on true')
    .select('r.*', 'u.name as user_name', k.raw('coalesce(lb.seq, 0)::int as last_seq'), k.raw('coalesce(lb.until_ms, 0)::bigint as until_ms'));
}

export async function findRun(id: string): Promise<Run | null> {
  if (!isUuid(id)) return null;
  const row = await runQuery().where('r.id', id).first();
  return row ? toRun(row) : null;
}

export interface NewRun {
  userId: string;
  mode: RunMode;
  drillId?: string | null;
  assignmentId?: string | null;
  cellId: string;
  cellVersion: number;
  seed: number;
}

/** A new practice run. */
export async function createRun(input: NewRun): Promise<Run> {
  const [row] = await db()('runs')
    .insert({
      user_id: input.userId,
      mode: input.mode,
      drill_id: input.drillId ?? null,
      assignment_id: input.assignmentId ?? null,
      cell_id: input.cellId,
      cell_version: input.cellVersion,
      seed: input.seed,
    })
    .returning('id');
  return (await findRun(row.id))!;
}

/**
 * The student's one attempt at an assignment: the existing run, or a new one. Two starts
 * racing (two tabs) meet at the unique index and both get the same run.
 */
export async function startAssignmentRun(input: NewRun & { assignmentId: string }): Promise<{ run: Run; created: boolean }> {
  const existing = async () => db()('runs').where({ assignment_id: input.assignmentId, user_id: input.userId }).first('id');
  const found = await existing();
  if (found) return { run: (await findRun(found.id))!, created: false };
  try {
    const [row] = await db()('runs')
      .insert({
        user_id: input.userId,
        mode: 'drill',
        drill_id: input.drillId,
        assignment_id: input.assignmentId,
        cell_id: input.cellId,
        cell_version: input.cellVersion,
        seed: input.seed,
      })
      .returning('id');
    return { run: (await findRun(row.id))!, created: true };
  } catch (err) {
    if ((err as { code?: string }).code !== '23505') throw err;
  }
  const again = await existing();
  return { run: (await findRun(again!.id))!, created: false };
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toBatch(r: any): StoredBatch {
  return { seq: r.seq, key: r.idempotency_key, untilMs: Number(r.until_ms), events: r.events, createdAt: iso(r.created_at)! };
}

/** Every batch of a run in sequence order: the run's whole event log. */
export async function listBatches(runId: string, k: Knex = db()): Promise<StoredBatch[]> {
  return (await k('run_batches').where({ run_id: runId }).orderBy('seq')).map(toBatch);
}

export async function findBatchByKey(runId: string, key: string): Promise<StoredBatch | null> {
  const row = await db()('run_batches').where({ run_id: runId, idempotency_key: key }).first();
  return row ? toBatch(row) : null;
}

export async function lastBatch(runId: string): Promise<StoredBatch | null> {
  const row = await db()('run_batches').where({ run_id: runId }).orderBy('seq', 'desc').first();
  return row ? toBatch(row) : null;
}

export type InsertBatchResult = { ok: true } | { ok: false; reason: 'conflict' | 'submitted' | 'missing' } | { ok: false; reason: 'gap'; expectedSeq: number };

/**
 * Stores a batch in one statement when the run is still active and `seq` follows its last
 * stored batch: the insert selects from the run row with FOR SHARE, so it waits for (and then
 * sees) a concurrent submit's update; a duplicate key or seq (a retry, a racing request) does
 * nothing rather than raising. Only when nothing was stored does a second read say why, so the
 * usual batch costs one round trip.
 */
export async function insertBatch(runId: string, batch: { seq: number; key: string; untilMs: number; events: LoggedEvent[] }): Promise<InsertBatchResult> {
  const res = await db().raw(
    `insert into run_batches (run_id, seq, idempotency_key, until_ms, events, event_count)
     select r.id, ?, ?, ?, ?::jsonb, ? from runs r
      where r.id = ? and r.status = 'active'
        and coalesce((select max(b.seq) from run_batches b where b.run_id = r.id), 0) = ?
      for share of r
     on conflict do nothing`,
    [batch.seq, batch.key, batch.untilMs, JSON.stringify(batch.events), batch.events.length, runId, batch.seq - 1],
  );
  if (res.rowCount === 1) return { ok: true };
  const why = await db().raw(
    `select r.status, coalesce((select max(b.seq) from run_batches b where b.run_id = r.id), 0)::int as last_seq,
            exists (select 1 from run_batches b where b.run_id = r.id and b.idempotency_key = ?) as key_taken
       from runs r where r.id = ?`,
    [batch.key, runId],
  );
  const row = why.rows[0] as { status: RunStatus; last_seq: number; key_taken: boolean } | undefined;
  if (!row) return { ok: false, reason: 'missing' };
  if (row.key_taken) return { ok: false, reason: 'conflict' };
  if (row.status !== 'active') return { ok: false, reason: 'submitted' };
  if (row.last_seq >= batch.seq) return { ok: false, reason: 'conflict' };
  return { ok: false, reason: 'gap', expectedSeq: row.last_seq + 1 };
}

export interface Submission {
  endedMs: number;
  diagnosis: Diagnosis | null;
  grade: number | null;
  breakdown: GradeBreakdown | null;
  traceHash: string;
}

/**
 * Submits a run in one transaction: the run row is locked FOR UPDATE (a batch insert reads it
 * FOR SHARE, so a late batch from any server process waits and then finds the run submitted),
 * the stored log is read under that lock, `grade` turns exactly that log into the submission,
 * and the row is updated before the lock is released. Whatever `grade` throws rolls it all back.
 */
export async function submitLocked(runId: string, grade: (run: Run, batches: StoredBatch[]) => Promise<Submission>): Promise<{ ok: true; run: Run } | { ok: false; reason: 'submitted' | 'missing' }> {
  if (!isUuid(runId)) return { ok: false, reason: 'missing' };
  return db().transaction(async (trx) => {
    const locked = await trx('runs').where({ id: runId }).forUpdate().first('id', 'status');
    if (!locked) return { ok: false as const, reason: 'missing' as const };
    if (locked.status !== 'active') return { ok: false as const, reason: 'submitted' as const };
    const run = toRun(await runQuery(trx).where('r.id', runId).first());
    const s = await grade(run, await listBatches(runId, trx));
    await trx('runs')
      .where({ id: runId })
      .update({
        status: 'submitted',
        submitted_at: trx.fn.now(),
        ended_ms: s.endedMs,
        diagnosis: s.diagnosis ? JSON.stringify(s.diagnosis) : null,
        grade: s.grade,
        breakdown: s.breakdown ? JSON.stringify(s.breakdown) : null,
        trace_hash: s.traceHash,
      });
    return { ok: true as const, run: toRun(await runQuery(trx).where('r.id', runId).first()) };
  });
}

/** Sets (or, with null, removes) a trainer's override of a run's grade, and records it in the audit log in the same transaction. */
export async function overrideGrade(run: Run, grade: number | null, reason: string, by: string): Promise<void> {
  await db().transaction(async (trx) => {
    await trx('runs').where({ id: run.id }).update({ override_grade: grade, override_reason: reason, override_by: by, override_at: trx.fn.now() });
    await writeAudit(
      {
        actorId: by,
        action: 'grade.overridden',
        targetUserId: run.userId,
        detail: { runId: run.id, from: run.overrideGrade ?? run.grade, to: grade, computed: run.grade, reason },
      },
      trx,
    );
  });
}

/** A user's runs, newest first, at most `limit` (GET /api/runs). */
export async function listRunsOfUser(userId: string, limit = 100): Promise<Run[]> {
  return (await runQuery().where('r.user_id', userId).orderBy('r.started_at', 'desc').limit(limit)).map(toRun);
}

/** Every drill attempt of a user (one per assignment at most), newest first: dashboards and the runs page. */
export async function listDrillRunsOfUser(userId: string): Promise<Run[]> {
  return (await runQuery().where({ 'r.user_id': userId, 'r.mode': 'drill' }).orderBy('r.started_at', 'desc')).map(toRun);
}

/** One page of a user's practice runs, newest first, with the cell each ran and the total count. */
export async function pagePracticeRunsOfUser(userId: string, page: number, pageSize: number): Promise<{ runs: (Run & { cellName: string })[]; total: number }> {
  const where = { 'r.user_id': userId, 'r.mode': 'practice' };
  const [rows, count] = await Promise.all([
    runQuery()
      .join('cells as c', 'c.id', 'r.cell_id')
      .select('c.name as cell_name')
      .where(where)
      .orderBy([{ column: 'r.started_at', order: 'desc' }, { column: 'r.id' }])
      .limit(pageSize)
      .offset((page - 1) * pageSize),
    db()('runs as r').where(where).count<{ n: string }[]>({ n: '*' }),
  ]);
  return { runs: rows.map((row) => ({ ...toRun(row), cellName: row.cell_name as string })), total: Number(count[0].n) };
}

/** Runs on a set of assignments (the gradebook). */
export async function listRunsOfAssignments(assignmentIds: string[]): Promise<Run[]> {
  if (assignmentIds.length === 0) return [];
  return (await runQuery().whereIn('r.assignment_id', assignmentIds)).map(toRun);
}

/** Every submitted run (the regrade check). */
export async function listSubmittedRuns(): Promise<Run[]> {
  return (await runQuery().where('r.status', 'submitted').orderBy('r.submitted_at')).map(toRun);
}

/** Every submitted run of a drill, oldest submission first (the drill regrade job). */
export async function listSubmittedRunsOfDrill(drillId: string): Promise<Run[]> {
  if (!isUuid(drillId)) return [];
  return (await runQuery().where({ 'r.drill_id': drillId, 'r.status': 'submitted' }).orderBy([{ column: 'r.submitted_at' }, { column: 'r.id' }])).map(toRun);
}

/** A student's run on an assignment, if any. */
export async function findRunOfAssignment(assignmentId: string, userId: string): Promise<Run | null> {
  const row = await runQuery().where({ 'r.assignment_id': assignmentId, 'r.user_id': userId }).first();
  return row ? toRun(row) : null;
}
