import 'server-only';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { env } from '@/lib/env';
import { db } from '@/db/knex';
import { findJob, insertJob, listJobsOfSubject } from '@/db/jobs';
import { isUuid } from '@/db/users';
import { sendDelivery, sendingBoss } from './boss';
import { settingsOf } from './settings';
import { parseSubject, type JobKind, type JobRecord } from './types';

/**
 * The queue as the app uses it: enqueue a job, read one, list a subject's jobs. Long work
 * (proofs, scenario checks, regrades) never runs on a request: a route enqueues it and answers
 * at once with the job; a worker process (scripts/worker.ts) runs it, and the page follows its
 * progress through GET /api/jobs/stream.
 */

/** Largest payload a job may carry (JSON bytes): payloads name what to work on, they do not carry it. */
export const MAX_PAYLOAD_BYTES = 64 * 1024;

const enqueueSchema = z.object({
  kind: z.string().regex(/^[a-z][a-z0-9-]{0,62}$/),
  subject: z.string().refine((s) => parseSubject(s.toLowerCase()) !== null, { message: 'A subject is `<kind>:<uuid>`.' }),
  ownerId: z.string().refine(isUuid, { message: 'The owner is a user id.' }),
});

/** What a single job may set beyond its kind's settings (lib/jobs/settings.ts): tests, a one-off long job. */
export interface EnqueueOverrides {
  budgetSeconds?: number;
  retryLimit?: number;
  retryDelaySeconds?: number;
}

/**
 * Queues a job: its row (state `queued`) and its pg-boss delivery are written in one
 * transaction, so a job is never shown without being delivered, nor delivered without a row.
 * The row's insert announces the job on the progress stream. Throws on a malformed kind,
 * subject or owner, or a payload that is not JSON or larger than MAX_PAYLOAD_BYTES.
 */
export async function enqueueJob(input: { kind: JobKind; payload: unknown; ownerId: string; subject: string }, overrides: EnqueueOverrides = {}): Promise<JobRecord> {
  const { kind, ownerId } = enqueueSchema.parse(input);
  const subject = input.subject.toLowerCase();
  const json = JSON.stringify(input.payload ?? null);
  if (json === undefined) throw new Error('a job payload must be JSON');
  if (Buffer.byteLength(json, 'utf8') > MAX_PAYLOAD_BYTES) throw new Error(`a job payload may be at most ${MAX_PAYLOAD_BYTES} bytes`);
  const budgetSeconds = overrides.budgetSeconds ?? settingsOf(kind).budgetSeconds;
  if (!Number.isInteger(budgetSeconds) || budgetSeconds < 1) throw new Error('a job budget is a whole number of seconds, at least 1');
  const boss = await sendingBoss(env().DATABASE_URL);
  const id = randomUUID();
  return db().transaction(async (trx) => {
    const job = await insertJob({ id, kind, subject, ownerId, payload: JSON.parse(json) }, trx);
    await sendDelivery(boss, trx, kind, { jobId: id, budgetSeconds }, { retryLimit: overrides.retryLimit, retryDelaySeconds: overrides.retryDelaySeconds });
    return job;
  });
}

/** One job, or null. */
export function getJob(id: string): Promise<JobRecord | null> {
  return findJob(id);
}

/** A subject's jobs, newest first (at most 50). */
export function listJobs(subject: string): Promise<JobRecord[]> {
  return listJobsOfSubject(subject.toLowerCase());
}
