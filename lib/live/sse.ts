import 'server-only';

/**
 * A Server-Sent Events response, the one shape for every stream (the live board's, a student's
 * messages, the job queue's in lib/jobs/stream.ts): `retry: 3000`, a keep-alive comment every
 * 20 s, a re-check of the reader's right every minute, and the cleanup run once whether the
 * browser leaves or the server ends the stream. Each kind of stream counts its own open streams.
 */

const HEARTBEAT_MS = 20_000;
const RECHECK_MS = 60_000;
const encoder = new TextEncoder();

export interface SseChannel {
  send(event: string, data: unknown): void;
  close(): void;
  readonly closed: boolean;
}

/** How many streams of one kind are open in this process. */
export interface StreamCounter {
  open: number;
}

/** Streams one app process keeps open at once, per kind; past it a new stream is refused with 503. */
export const MAX_STREAMS = 2000;

/** The open-stream count of one kind, kept on globalThis so a reloaded module keeps counting. */
export function streamCounter(kind: string): () => StreamCounter {
  const g = globalThis as unknown as { cellwrightStreams?: Record<string, StreamCounter> };
  return () => ((g.cellwrightStreams ??= {})[kind] ??= { open: 0 });
}

/** Live-board and message streams open in this process (tests and diagnostics). */
const counter = streamCounter('live');
export const openLiveStreams = () => counter().open;
export const liveStreamCapacity = () => counter().open < MAX_STREAMS;

export function sseResponse(
  req: Request,
  start: (ch: SseChannel) => Promise<(() => void) | void>,
  stillAllowed: () => Promise<boolean>,
  streams: () => StreamCounter = counter,
): Response {
  let cleanup: (() => void) | null = null;
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      streams().open += 1;
      let closed = false;
      const timers: NodeJS.Timeout[] = [];
      let stop: (() => void) | void;
      const close = () => {
        if (closed) return;
        closed = true;
        streams().open -= 1;
        for (const t of timers) clearInterval(t);
        stop?.();
        req.signal.removeEventListener('abort', close);
        try {
          controller.close();
        } catch {
          // Already closed by the reader.
        }
      };
      cleanup = close;
      const raw = (chunk: string) => {
        if (closed) return;
        try {
          controller.enqueue(encoder.encode(chunk));
        } catch {
          close();
        }
      };
      const ch: SseChannel = {
        send: (event, data) => raw(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`),
        close,
        get closed() {
          return closed;
        },
      };
      req.signal.addEventListener('abort', close);
      if (req.signal.aborted) return close();
      raw('retry: 3000\n\n');
      try {
        stop = await start(ch);
      } catch (err) {
        console.error('[live] stream start failed', err);
        return close();
      }
      if (closed) {
        stop?.();
        return;
      }
      timers.push(setInterval(() => raw(': keep-alive\n\n'), HEARTBEAT_MS));
      timers.push(
        setInterval(() => {
          void stillAllowed()
            .catch(() => false)
            .then((ok) => {
              if (!ok) close();
            });
        }, RECHECK_MS),
      );
    },
    cancel() {
      cleanup?.();
    },
  });
  return new Response(stream, {
    status: 200,
    headers: { 'content-type': 'text/event-stream; charset=utf-8', 'cache-control': 'no-store, no-transform', 'x-accel-buffering': 'no' },
  });
}
