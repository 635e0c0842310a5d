import 'server-only';
import { env } from '@/lib/env';
import { userFromRequest } from '@/lib/auth/session';
import { listJobsOfSubject } from '@/db/jobs';
import { canReadSubject } from './access';
import { subscribeJobEvents } from './listener';
import type { JobEvent, JobRecord } from './types';
import { MAX_STREAMS, sseResponse, streamCounter } from '@/lib/live/sse';

/**
 * A subject's job changes as Server-Sent Events (GET /api/jobs/stream). Fed by this process's
 * one LISTEN connection (listener.ts): a browser costs a subscriber, not a query loop.
 *
 * Events:
 * - `snapshot`: the subject's latest jobs (JobRecord[], newest first), sent first and again
 *   after the LISTEN connection was replaced (changes in between were not heard);
 * - `job`: one change (JobEvent). Its `version` orders it against the snapshot: a client keeps,
 *   per job, whichever it saw with the higher version;
 * The stream's shape (keep-alive, the minute's re-check of the session and the right to read
 * the subject, cleanup) is the one every stream has: lib/live/sse.ts.
 */

const SNAPSHOT_JOBS = 20;

const counter = streamCounter('jobs');

/** Streams open in this process (tests and diagnostics). */
export function openJobStreams(): number {
  return counter().open;
}

/** True when another stream may open in this process. */
export function jobStreamCapacity(): boolean {
  return counter().open < MAX_STREAMS;
}

/** The SSE response for `subject`, whose access the caller has already checked for this request. */
export function jobEventStream(req: Request, subject: string): Response {
  return sseResponse(
    req,
    async (ch) => {
      // Events that arrive while the snapshot is read are held and sent after it, so that none
      // is lost between the two; the versions sort out any overlap in the browser.
      let held: JobEvent[] | null = [];
      const snapshot = async () => {
        held ??= [];
        try {
          const jobs: JobRecord[] = await listJobsOfSubject(subject, SNAPSHOT_JOBS);
          ch.send('snapshot', jobs);
        } catch (err) {
          console.error('[jobs] stream snapshot failed', err);
          ch.close();
          return;
        }
        const pending = held;
        held = null;
        for (const e of pending) ch.send('job', e);
      };
      const unsubscribe = await subscribeJobEvents(env().DATABASE_URL, {
        onEvent(e) {
          if (e.subject !== subject) return;
          if (held) held.push(e);
          else ch.send('job', e);
        },
        onResync() {
          void snapshot();
        },
      });
      if (!ch.closed) await snapshot();
      return unsubscribe;
    },
    async () => {
      const user = await userFromRequest(req).catch(() => null);
      return Boolean(user) && (await canReadSubject(user!, subject).catch(() => false));
    },
    counter,
  );
}
