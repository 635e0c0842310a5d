/**
 * The job queue's shapes, shared by the server (lib/jobs/queue.ts, the worker) and the browser
 * (components/jobs/*): no `server-only`, no imports from the server side.
 */

/** Every kind of job the worker knows. A new kind is added here, in JOB_SETTINGS (lib/jobs/settings.ts) and in JOB_HANDLERS (lib/jobs/registry.ts). */
export const JOB_KINDS = ['changeover-proofs', 'changeover-checks', 'drill-regrade', 'changeover-report'] as const;
export type JobKind = (typeof JOB_KINDS)[number];

/**
 * Where a job stands. A failed attempt that will be retried goes back to `queued` with its
 * error kept in `error`; `failed` is final (retries spent, or a failure retrying cannot fix).
 */
export const JOB_STATES = ['queued', 'running', 'done', 'failed'] as const;
export type JobState = (typeof JOB_STATES)[number];

/** How far a job has come, as its handler last reported it; `total` 0 means "not known yet". */
export interface JobProgress {
  done: number;
  total: number;
  note: string;
}

/** A job as the app shows it (GET /api/jobs/[id], the stream's snapshot). The payload stays on the server. */
export interface JobRecord {
  id: string;
  kind: JobKind;
  /** What the job is about, `<kind>:<uuid>` (`changeover:…`, `drill:…`): who may read it follows from it (lib/jobs/access.ts). */
  subject: string;
  ownerId: string;
  state: JobState;
  progress: JobProgress;
  /** The handler's answer once `done` (JSON), else null. */
  result: unknown;
  /** The last attempt's error: final when `failed`, the reason for a retry when `queued` again. */
  error: string | null;
  /** Attempts started so far (0 while it waits for its first). */
  attempts: number;
  /** Grows by one with every change of the row: of two views of a job, the higher version is newer. */
  version: number;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

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
