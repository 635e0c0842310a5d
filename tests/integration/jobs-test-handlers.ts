/**
 * Job handlers of the queue's own tests (jobs.test.ts), with kinds no real worker works: the
 * tests run workers with these in-process (`test-inproc`) and in a child process they can kill
 * (`test-child`, jobs-test-worker.ts). One handler; the payload says what to do.
 */
import { PermanentJobError } from '@/lib/jobs/errors';
import type { JobHandler } from '@/lib/jobs/registry';

export const IN_PROCESS_KIND = 'test-inproc';
export const CHILD_KIND = 'test-child';

export interface TestPayload {
  /** Steps to take, each `stepMs` long, reporting progress after each. */
  steps?: number;
  stepMs?: number;
  /** Throw an ordinary error (retried) or a PermanentJobError (not retried) before any step. */
  fail?: 'always' | 'permanent';
  message?: string;
  /** Wait for the AbortSignal, then throw its reason (how a budget or a shutdown reaches a handler). */
  waitForAbort?: boolean;
  echo?: unknown;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export const testHandler: JobHandler = async (payload: TestPayload, ctx) => {
  if (payload.fail === 'permanent') throw new PermanentJobError(payload.message ?? 'permanent failure');
  if (payload.fail === 'always') throw new Error(payload.message ?? 'ordinary failure');
  if (payload.waitForAbort) {
    await new Promise((_, reject) => {
      if (ctx.signal.aborted) reject(ctx.signal.reason);
      ctx.signal.addEventListener('abort', () => reject(ctx.signal.reason), { once: true });
    });
  }
  const steps = payload.steps ?? 0;
  for (let i = 1; i <= steps; i++) {
    if (ctx.signal.aborted) throw ctx.signal.reason;
    await sleep(payload.stepMs ?? 10);
    await ctx.reportProgress(i, steps, `step ${i}`);
  }
  return { echo: payload.echo ?? null, steps };
};
