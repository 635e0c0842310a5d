/** The job row's shapes as db/jobs.ts returns them (GET /api/jobs/[id], the stream's snapshot). See db/types/users.ts for why here. */

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

/** A job as the app shows it. The payload stays on the server. */
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
