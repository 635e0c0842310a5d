import 'server-only';
import { env } from '@/lib/env';
import { userFromRequest } from '@/lib/auth/session';
import { listJobsOfSubject } from '@/db/jobs';
import { canReadSubject } from './access';
import { subscribeJobEvents } from './listener';
import type { JobEvent, JobRecord } from './types';

/**
 * A subject's job changes as Server-Sent Events (GET /api/jobs/stream). Fed by this process's
 * one LISTEN connection (listener.ts): a browser costs a subscriber, not a query loop.
 *
 * Events:
 * - `snapshot`: the subject's latest jobs (JobRecord[], newest first), sent first and again
 *   after the LISTEN connection was replaced (changes in between were not heard);
 * - `job`: one change (JobEvent). Its `version` orders it against the snapshot: a client keeps,
 *   per job, whichever it saw with the higher version;
 * - a comment every 20 s keeps proxies from closing an idle stream.
 * Every minute the session and the right to read the subject are checked again; the stream
 * ends when either is gone (the browser's reconnect then gets the 401/403/404).
 */

const HEARTBEAT_MS = 20_000;
const RECHECK_MS = 60_000;
const SNAPSHOT_JOBS = 20;
/** Streams one app process keeps open at once; past it a new stream is refused with 503. */
const MAX_STREAMS = 2000;

const g = globalThis as unknown as { cellwrightJobStreams?: { open: number } };
const counter = () => (g.cellwrightJobStreams ??= { open: 0 });

/** Streams open in this process (tests and diagnostics). */
export function openJobStreams(): number {
  return counter().open;
}

/** True when another stream may open in this process. */
export function jobStreamCapacity(): boolean {
  return counter().open < MAX_STREAMS;
}

const encoder = new TextEncoder();

function frame(event: string, data: unknown): Uint8Array {
  return encoder.encode(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
}

/** The SSE response for `subject`, whose access the caller has already checked for this request. */
export function jobEventStream(req: Request, subject: string): Response {
  let cleanup: (() => void) | null = null;
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      counter().open += 1;
      let closed = false;
      const timers: NodeJS.Timeout[] = [];
      let unsubscribe: (() => void) | null = null;
      const close = () => {
        if (closed) return;
        closed = true;
        counter().open -= 1;
        for (const t of timers) clearInterval(t);
        unsubscribe?.();
        req.signal.removeEventListener('abort', close);
        try {
          controller.close();
        } catch {
          // Already closed by the reader.
        }
      };
      cleanup = close;
      const send = (chunk: Uint8Array) => {
        if (closed) return;
        try {
          controller.enqueue(chunk);
        } catch {
          close();
        }
      };
      req.signal.addEventListener('abort', close);
      if (req.signal.aborted) return close();

      // Events that arrive while the snapshot is read are held and sent after it, so that none
      // is lost between the two; the versions sort out any overlap in the browser.
      let held: JobEvent[] | null = [];
      const snapshot = async () => {
        held ??= [];
        try {
          const jobs: JobRecord[] = await listJobsOfSubject(subject, SNAPSHOT_JOBS);
          send(frame('snapshot', jobs));
        } catch (err) {
          console.error('[jobs] stream snapshot failed', err);
          close();
          return;
        }
        const pending = held;
        held = null;
        for (const e of pending) send(frame('job', e));
      };

      send(encoder.encode('retry: 3000\n\n'));
      unsubscribe = await subscribeJobEvents(env().DATABASE_URL, {
        onEvent(e) {
          if (e.subject !== subject) return;
          if (held) held.push(e);
          else send(frame('job', e));
        },
        onResync() {
          void snapshot();
        },
      });
      if (closed) {
        unsubscribe();
        return;
      }
      await snapshot();
      // Closed while the snapshot was read: no timers to leave behind.
      if (closed) return;

      timers.push(setInterval(() => send(encoder.encode(': keep-alive\n\n')), HEARTBEAT_MS));
      timers.push(
        setInterval(() => {
          void (async () => {
            const user = await userFromRequest(req).catch(() => null);
            if (!user || !(await canReadSubject(user, subject).catch(() => false))) close();
          })();
        }, RECHECK_MS),
      );
    },
    cancel() {
      cleanup?.();
    },
  });
  return new Response(stream, {
    status: 200,
    headers: {
      'content-type': 'text/event-stream; charset=utf-8',
      // no-transform: a compressing proxy (or Next.js's own compression) must not buffer the events.
      'cache-control': 'no-store, no-transform',
      'x-accel-buffering': 'no',
    },
  });
}
