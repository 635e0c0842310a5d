'use client';
import { useCallback, useEffect, useRef, useState } from 'react';
import type { JobEvent, JobRecord } from '@/lib/jobs/types';
import { isFinished } from '@/lib/jobs/types';
import { mergeEvent, mergeRecord, sortedJobs, type JobMap } from './job-merge';

/** Where the live connection stands: `lost` while the browser waits to reconnect. */
export type JobStreamConnection = 'connecting' | 'open' | 'lost';

export interface JobStream {
  /** The subject's jobs, newest first, as last heard. */
  jobs: JobRecord[];
  connection: JobStreamConnection;
  /** Adds a job this page just queued (a route's answer), before the stream mentions it. */
  track(job: JobRecord): void;
}

/**
 * Follows a subject's jobs live (GET /api/jobs/stream?subject=…, Server-Sent Events): the
 * stream opens with a snapshot, then sends each change. EventSource reconnects by itself
 * (the server asks for 3 s); when it has given up (the server refused or went away) the hook
 * opens a new one after a growing pause, up to 60 s. On a lost connection it reads each
 * unfinished job once (GET /api/jobs/[id]) rather than poll; the next snapshot brings the
 * rest. When a job finishes, its record is read once for the result or error.
 */
export function useJobStream(subject: string | null, initial: readonly JobRecord[] = []): JobStream {
  const [map, setMap] = useState<JobMap>(() => initial.reduce<JobMap>((m, j) => mergeRecord(m, j), new Map()));
  const [connection, setConnection] = useState<JobStreamConnection>('connecting');
  const mapRef = useRef(map);
  useEffect(() => {
    mapRef.current = map;
  }, [map]);
  const reading = useRef(new Set<string>());

  const read = useCallback(async (id: string) => {
    if (reading.current.has(id)) return;
    reading.current.add(id);
    try {
      const res = await fetch(`/api/jobs/${id}`, { credentials: 'same-origin', cache: 'no-store' });
      if (!res.ok) return;
      const { job } = (await res.json()) as { job: JobRecord };
      setMap((m) => mergeRecord(m, job));
    } catch {
      // Offline: the stream's next snapshot catches up.
    } finally {
      reading.current.delete(id);
    }
  }, []);

  useEffect(() => {
    if (!subject) return;
    let source: EventSource | null = null;
    let retryTimer: ReturnType<typeof setTimeout> | null = null;
    let pauseMs = 3000;
    let readSinceLost = false;
    let stopped = false;

    const open = () => {
      setConnection('connecting');
      source = new EventSource(`/api/jobs/stream?subject=${encodeURIComponent(subject)}`);
      source.addEventListener('open', () => {
        setConnection('open');
        pauseMs = 3000;
        readSinceLost = false;
      });
      source.addEventListener('snapshot', (ev) => {
        const jobs = JSON.parse((ev as MessageEvent<string>).data) as JobRecord[];
        setMap((m) => jobs.reduce<JobMap>((acc, j) => mergeRecord(acc, j), m));
      });
      source.addEventListener('job', (ev) => {
        const e = JSON.parse((ev as MessageEvent<string>).data) as JobEvent;
        setMap((m) => mergeEvent(m, e));
        // Events carry no result or error: a finished job is read once for them.
        if (isFinished(e.state)) void read(e.id);
      });
      source.addEventListener('error', () => {
        setConnection('lost');
        if (!readSinceLost) {
          readSinceLost = true;
          for (const job of mapRef.current.values()) if (!isFinished(job.state)) void read(job.id);
        }
        // CLOSED: the browser will not retry (a refusal, or the server is gone); try again later ourselves.
        if (source?.readyState === EventSource.CLOSED && !stopped) {
          source.close();
          retryTimer = setTimeout(open, pauseMs);
          pauseMs = Math.min(60_000, pauseMs * 2);
        }
      });
    };
    open();
    return () => {
      stopped = true;
      if (retryTimer) clearTimeout(retryTimer);
      source?.close();
    };
  }, [subject, read]);

  const track = useCallback((job: JobRecord) => setMap((m) => mergeRecord(m, job)), []);
  return { jobs: sortedJobs(map), connection, track };
}
