import type { JobEvent, JobRecord } from '@/lib/jobs/types';

/**
 * How the browser keeps its view of a subject's jobs (use-job-stream.ts): records from the
 * stream's snapshot or a GET, and events from the stream, merged per job by `version` — the
 * row's change counter — so that whichever arrives last, the newest state wins. Pure, so it
 * is unit-tested without a browser.
 */

export type JobMap = ReadonlyMap<string, JobRecord>;

/** A full record (snapshot, GET, a route's answer): kept unless the map already holds a newer version. */
export function mergeRecord(map: JobMap, job: JobRecord): JobMap {
  const have = map.get(job.id);
  if (have && have.version > job.version) return map;
  if (have && have.version === job.version && have.result !== null && job.result === null) return map;
  const next = new Map(map);
  next.set(job.id, job);
  return next;
}

/**
 * An event: it carries state and progress but not the result, error or times, which are kept
 * from the record (the caller reads the record again when a job finishes). An event of a job
 * not seen yet makes a partial record.
 */
export function mergeEvent(map: JobMap, e: JobEvent, now = new Date().toISOString()): JobMap {
  const have = map.get(e.id);
  if (have && have.version >= e.version) return map;
  const next = new Map(map);
  next.set(
    e.id,
    have
      ? { ...have, state: e.state, progress: e.progress, attempts: e.attempts, version: e.version }
      : { id: e.id, kind: e.kind, subject: e.subject, ownerId: '', state: e.state, progress: e.progress, result: null, error: null, attempts: e.attempts, version: e.version, createdAt: now, startedAt: null, finishedAt: null },
  );
  return next;
}

/** Newest first (creation time, then id, as the server lists them). */
export function sortedJobs(map: JobMap): JobRecord[] {
  return [...map.values()].sort((a, b) => (a.createdAt === b.createdAt ? (a.id < b.id ? 1 : -1) : a.createdAt < b.createdAt ? 1 : -1));
}

