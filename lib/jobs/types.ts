/**
 * The job queue's shapes, shared by the server (lib/jobs/queue.ts, the worker) and the browser
 * (components/jobs/*): no `server-only`, no imports from the server side.
 */

// The stored shapes live below db/ and lib/ (db/types/jobs.ts); re-exported here for the browser and lib/.
import type { JobKind, JobProgress, JobState } from '@/db/types/jobs';
export { JOB_KINDS, JOB_STATES, type JobKind, type JobProgress, type JobRecord, type JobState } from '@/db/types/jobs';

/** What every change of a job row announces (PostgreSQL NOTIFY on JOB_EVENTS_CHANNEL, then the SSE stream). */
export interface JobEvent {
  id: string;
  kind: JobKind;
  subject: string;
  state: JobState;
  progress: JobProgress;
  attempts: number;
  version: number;
}

/** The PostgreSQL NOTIFY channel every job row change is announced on (db/migrations/20261204_301_jobs.ts). */
export const JOB_EVENTS_CHANNEL = 'cellwright_jobs';

/** Longest progress note kept (the database refuses longer ones; the worker cuts them). */
export const MAX_PROGRESS_NOTE = 200;

const SUBJECT_RE = /^([a-z][a-z-]{0,30}):([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})$/;

/** Splits `drill:<uuid>` into its kind and id; null when it is not a subject. */
export function parseSubject(subject: string): { kind: string; id: string } | null {
  const m = SUBJECT_RE.exec(subject);
  return m ? { kind: m[1], id: m[2] } : null;
}

/** The subject of a record: `subjectOf('drill', id)` is `drill:<id>` (ids lower-cased, as stored). */
export function subjectOf(kind: string, id: string): string {
  return `${kind}:${id.toLowerCase()}`;
}

/** True once a job will not change any more. */
export function isFinished(state: JobState): boolean {
  return state === 'done' || state === 'failed';
}
