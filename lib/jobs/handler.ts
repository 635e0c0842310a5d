import 'server-only';

/** What a handler gets besides its payload. */
export interface JobContext {
  /**
   * Records how far the job has come; the page shows it live. Cheap to call often: writes are
   * coalesced (a report made while the previous one is being written replaces any waiting
   * one). Resolves once this report, or a newer one, is stored; never rejects.
   */
  reportProgress(done: number, total: number, note?: string): Promise<void>;
  /**
   * Aborted when the attempt must stop: its time budget is spent, the worker is shutting down,
   * or another worker took the job over. Check it between steps; `signal.reason` says why.
   */
  signal: AbortSignal;
  jobId: string;
}

/**
 * Runs one job. Returns the job's result (JSON; stored on the row, shown by the page) or
 * throws: an ordinary error is retried up to the kind's retry limit, a PermanentJobError
 * (lib/jobs/errors.ts) fails the job at once. Handlers must be safe to run again from the
 * start: an attempt cut short by a dead worker is run again by another.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type JobHandler = (payload: any, ctx: JobContext) => Promise<unknown>;
