import 'server-only';
import type { Knex } from 'knex';
import type { JobKind, JobProgress, JobRecord, JobState } from './types/jobs';
import { db } from './knex';
import { isUuid } from './users';

/**
 * The `jobs` table (db/migrations/20261204_301_jobs.ts): what the app shows of each job and
 * what must survive restarts. Every write that a worker makes names its attempt
 * (`attempt_token`) and the state it expects, so writes are idempotent and a worker that lost
 * its job (another took it over) changes nothing. The triggers bump `version` and announce
 * each change with NOTIFY.
 */

const iso = (d: Date | string | null) => (d ? new Date(d).toISOString() : null);

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toJob(r: any): JobRecord {
  return {
    id: r.id,
    kind: r.kind as JobKind,
    subject: r.subject,
    ownerId: r.owner_id,
    state: r.state as JobState,
    progress: r.progress as JobProgress,
    result: r.result ?? null,
    error: r.error ?? null,
    attempts: r.attempts,
    version: Number(r.version),
    createdAt: iso(r.created_at)!,
    startedAt: iso(r.started_at),
    finishedAt: iso(r.finished_at),
  };
}

const COLUMNS = ['id', 'kind', 'subject', 'owner_id', 'state', 'progress', 'result', 'error', 'attempts', 'version', 'created_at', 'started_at', 'finished_at'];

export interface NewJobRow {
  id: string;
  kind: string;
  subject: string;
  ownerId: string;
  payload: unknown;
}

/** Inserts a queued job (inside the caller's transaction when `k` is one). */
export async function insertJob(row: NewJobRow, k: Knex = db()): Promise<JobRecord> {
  const [r] = await k('jobs')
    .insert({ id: row.id, kind: row.kind, subject: row.subject, owner_id: row.ownerId, payload: JSON.stringify(row.payload ?? null) })
    .returning(COLUMNS);
  return toJob(r);
}

export async function findJob(id: string): Promise<JobRecord | null> {
  if (!isUuid(id)) return null;
  const r = await db()('jobs').where({ id }).first(COLUMNS);
  return r ? toJob(r) : null;
}

/** A subject's jobs, newest first, at most `limit`. */
export async function listJobsOfSubject(subject: string, limit = 50): Promise<JobRecord[]> {
  return (await db()('jobs').where({ subject }).orderBy([{ column: 'created_at', order: 'desc' }, { column: 'id', order: 'desc' }]).limit(limit).select(COLUMNS)).map(toJob);
}

/** A job as a worker claims it: the record plus the payload its handler needs. */
export interface ClaimedJob {
  job: JobRecord;
  payload: unknown;
}

/**
 * Starts an attempt: a queued job (or a running one whose worker died, handed over by pg-boss)
 * becomes running under the new attempt's token. Null when the job is finished or gone: the
 * delivery is then a duplicate and nothing runs.
 */
export async function claimJob(id: string, token: string): Promise<ClaimedJob | null> {
  if (!isUuid(id)) return null;
  const [r] = await db()('jobs')
    .where({ id })
    .whereIn('state', ['queued', 'running'])
    .update({ state: 'running', attempt_token: token, attempts: db().raw('attempts + 1'), started_at: db().raw('coalesce(started_at, now())') })
    .returning([...COLUMNS, 'payload']);
  return r ? { job: toJob(r), payload: r.payload } : null;
}

/** Records progress of a running attempt; false when the attempt no longer holds the job. */
export async function saveJobProgress(id: string, token: string, progress: JobProgress): Promise<boolean> {
  const n = await db()('jobs').where({ id, state: 'running', attempt_token: token }).update({ progress: JSON.stringify(progress) });
  return n > 0;
}

/** Ends a running attempt as done with its result; false when the attempt no longer holds the job. */
export async function finishJobDone(id: string, token: string, result: unknown, progress?: JobProgress): Promise<boolean> {
  const n = await db()('jobs')
    .where({ id, state: 'running', attempt_token: token })
    .update({
      state: 'done',
      result: JSON.stringify(result ?? null),
      error: null,
      finished_at: db().fn.now(),
      attempt_token: null,
      ...(progress ? { progress: JSON.stringify(progress) } : {}),
    });
  return n > 0;
}

/** Ends a running attempt as failed for good; false when the attempt no longer holds the job. */
export async function finishJobFailed(id: string, token: string, error: string): Promise<boolean> {
  const n = await db()('jobs').where({ id, state: 'running', attempt_token: token }).update({ state: 'failed', error, finished_at: db().fn.now(), attempt_token: null });
  return n > 0;
}

/** A failed attempt that will be tried again: back to queued, with the reason kept. */
export async function requeueJob(id: string, token: string, error: string): Promise<boolean> {
  const n = await db()('jobs').where({ id, state: 'running', attempt_token: token }).update({ state: 'queued', error, attempt_token: null });
  return n > 0;
}

/**
 * Fails every open job that pg-boss no longer holds a live delivery for (its schema is
 * `queueSchema`): the last attempt's worker died and pg-boss gave up after the retries, or the
 * delivery was removed by hand. Only rows untouched for `quietSeconds` are considered, so an
 * attempt that is just ending is left alone. Returns the ids it failed.
 */
export async function failOrphanedJobs(queueSchema: string, quietSeconds = 10): Promise<string[]> {
  if (!/^[a-z_][a-z0-9_]*$/.test(queueSchema)) throw new Error(`bad queue schema name: ${queueSchema}`);
  const rows = await db()('jobs as j')
    .whereIn('j.state', ['queued', 'running'])
    .where('j.updated_at', '<', db().raw(`now() - make_interval(secs => ?)`, [quietSeconds]))
    .whereNotExists(function live() {
      this.select(db().raw('1'))
        .from(`${queueSchema}.job as b`)
        .whereRaw('b.id = j.id')
        .whereRaw(`b.state < 'completed'::${queueSchema}.job_state`);
    })
    .update({
      state: 'failed',
      error: db().raw(`coalesce(j.error || ' ', '') || 'The worker running this job stopped and no attempts are left.'`),
      finished_at: db().fn.now(),
      attempt_token: null,
    })
    .returning('j.id');
  return rows.map((r: { id: string }) => r.id);
}
