import 'server-only';
import { channelListener } from '@/lib/notify/channel-listener';
import { LIVE_CHANNEL, type LiveNotice } from './types';

/**
 * Live-board notices as this process hears them: one shared `LISTEN cellwright_live`
 * connection (lib/notify/channel-listener.ts, the same one the job queue's listener is built
 * on), fanned out to every open live board and student message stream.
 */
export interface LiveSubscriber {
  onNotice(n: LiveNotice): void;
  onResync?(): void;
}

/** A NOTIFY payload as a LiveNotice, or null when it is not one. */
export function parseLiveNotice(payload: string | undefined): LiveNotice | null {
  if (!payload) return null;
  try {
    const n = JSON.parse(payload) as Record<string, unknown>;
    if (typeof n.assignmentId !== 'string') return null;
    if (n.kind === 'batch' && typeof n.runId === 'string' && typeof n.userId === 'string')
      return { kind: 'batch', assignmentId: n.assignmentId, runId: n.runId, userId: n.userId, seq: Number(n.seq) || 0, untilMs: Number(n.untilMs) || 0 };
    if (n.kind === 'run' && typeof n.runId === 'string' && typeof n.userId === 'string')
      return { kind: 'run', assignmentId: n.assignmentId, runId: n.runId, userId: n.userId, status: String(n.status) };
    if (n.kind === 'message' && typeof n.messageId === 'string')
      return { kind: 'message', assignmentId: n.assignmentId, messageId: n.messageId, userId: typeof n.userId === 'string' ? n.userId : null };
    return null;
  } catch {
    return null;
  }
}

const listener = channelListener<LiveNotice>(LIVE_CHANNEL, 'live-events', parseLiveNotice);

/** Subscribes to every live notice; resolves once this process listens (or has tried), with the unsubscribe. */
export function subscribeLive(databaseUrl: string, subscriber: LiveSubscriber): Promise<() => void> {
  return listener.subscribe(databaseUrl, { onMessage: (n) => subscriber.onNotice(n), onResync: () => subscriber.onResync?.() });
}

/** Closes the connection and forgets every subscriber (tests). */
export function closeLiveEvents(): Promise<void> {
  return listener.close();
}
