import type { JobKind } from './types';

/** How one kind of job is run: its time budget and how often a failed attempt is tried again. */
export interface JobSettings {
  /** Wall-clock time one attempt may take; past it the handler's AbortSignal fires and the attempt fails for good. */
  budgetSeconds: number;
  /** Further attempts after a failed one (a worker that stopped mid-job also counts as a failure). */
  retryLimit: number;
  /** Wait before the first retry; doubled (with jitter) for each further one by pg-boss. */
  retryDelaySeconds: number;
}

/**
 * Per kind. The budgets are generous guesses for the demo-sized cells and classes (no
 * measurement behind them yet): a proof of twenty rules takes about a second on the bench,
 * a regrade well under a second per run.
 */
export const JOB_SETTINGS: Record<JobKind, JobSettings> = {
  'changeover-proofs': { budgetSeconds: 600, retryLimit: 2, retryDelaySeconds: 5 },
  'changeover-checks': { budgetSeconds: 600, retryLimit: 2, retryDelaySeconds: 5 },
  'drill-regrade': { budgetSeconds: 900, retryLimit: 2, retryDelaySeconds: 5 },
  // Printing one signed record takes well under a second (lib/reports); retries cover a bucket that was briefly away.
  'changeover-report': { budgetSeconds: 120, retryLimit: 3, retryDelaySeconds: 5 },
};

/** For a kind the table does not name (tests' own kinds). */
export const DEFAULT_JOB_SETTINGS: JobSettings = { budgetSeconds: 300, retryLimit: 2, retryDelaySeconds: 5 };

export function settingsOf(kind: string): JobSettings {
  return (JOB_SETTINGS as Record<string, JobSettings>)[kind] ?? DEFAULT_JOB_SETTINGS;
}

/** The PostgreSQL schema pg-boss keeps its own tables in. */
export const QUEUE_SCHEMA = 'pgboss';

/**
 * After its budget a handler gets this long to notice its AbortSignal and stop; then the
 * worker records the attempt as failed whether the handler has stopped or not.
 */
export function graceSeconds(budgetSeconds: number): number {
  return Math.min(10, Math.max(1, Math.ceil(budgetSeconds / 4)));
}

/**
 * pg-boss's own expiry of an attempt: the budget plus twice the grace, so the worker always
 * records the outcome before pg-boss gives up on the attempt. pg-boss uses it for an attempt
 * whose worker died: once it passes, the job is handed to another worker.
 */
export function expireInSeconds(budgetSeconds: number): number {
  return budgetSeconds + 2 * graceSeconds(budgetSeconds);
}
