import 'server-only';
import { channelListener } from '@/lib/notify/channel-listener';
import { JOB_EVENTS_CHANNEL, JOB_STATES, type JobEvent } from './types';

/**
 * Job changes as this process hears them: one shared `LISTEN cellwright_jobs` connection
 * (lib/notify/channel-listener.ts), fanned out to each open progress stream and the worker's
 * wake-ups.
 */
export interface JobEventSubscriber {
  onEvent(event: JobEvent): void;
  /** The connection was replaced: events may have been missed; read the current state again. */
  onResync?(): void;
}

const STATE_SET = new Set<string>(JOB_STATES);

/** A NOTIFY payload as a JobEvent, or null when it is not one. */
export function parseJobEvent(payload: string | undefined): JobEvent | null {
  if (!payload) return null;
  try {
    const e = JSON.parse(payload) as Partial<JobEvent>;
    if (typeof e.id !== 'string' || typeof e.subject !== 'string' || typeof e.kind !== 'string' || !STATE_SET.has(e.state as string)) return null;
    const p = e.progress ?? { done: 0, total: 0, note: '' };
    return {
      id: e.id,
      kind: e.kind,
      subject: e.subject,
      state: e.state!,
      progress: { done: Number(p.done) || 0, total: Number(p.total) || 0, note: String(p.note ?? '') },
      attempts: Number(e.attempts) || 0,
      version: Number(e.version) || 0,
    };
  } catch {
    return null;
  }
}

const listener = channelListener<JobEvent>(JOB_EVENTS_CHANNEL, 'job-events', parseJobEvent);

/**
 * Subscribes to every job change in the database at `databaseUrl`. Resolves once this
 * process's connection listens (or, if it cannot yet, once it has tried; it keeps retrying
 * and calls `onResync` when it is back), with the function that unsubscribes.
 */
export function subscribeJobEvents(databaseUrl: string, subscriber: JobEventSubscriber): Promise<() => void> {
  return listener.subscribe(databaseUrl, { onMessage: (e) => subscriber.onEvent(e), onResync: () => subscriber.onResync?.() });
}

/** True while this process's job event connection is listening (tests and diagnostics). */
export function jobEventsListening(): boolean {
  return listener.listening();
}

/** Closes the connection and forgets every subscriber (tests, the worker's shutdown). */
export function closeJobEvents(): Promise<void> {
  return listener.close();
}

/** Test hook: breaks the current connection as a network failure would, to exercise the reconnect. */
export function breakJobEventsConnection(): void {
  listener.breakConnection();
}
