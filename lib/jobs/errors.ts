/**
 * Errors a job handler may throw to steer the worker (lib/jobs/worker.ts). Any other error
 * counts as an ordinary failure and the attempt is retried while retries remain.
 */

/** A failure that trying again cannot fix (the drill is gone, the input is malformed): the job fails at once. */
export class PermanentJobError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PermanentJobError';
  }
}

/** Why a job's AbortSignal fired. */
export type AbortCause = 'budget' | 'shutdown' | 'lost';

/** The `reason` of an aborted job's signal. */
export class JobAbortError extends Error {
  constructor(
    public readonly why: AbortCause,
    message: string,
  ) {
    super(message);
    this.name = 'JobAbortError';
  }
}
