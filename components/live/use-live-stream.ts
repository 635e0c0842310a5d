'use client';
import { useEffect, useRef, useState } from 'react';

export type LiveConnection = 'connecting' | 'open' | 'lost';

/**
 * Opens an EventSource on `url` and hands each named event to `handlers`. EventSource
 * reconnects by itself (the server asks for 3 s); when it has given up, a new one is opened
 * after a growing pause, up to 60 s. The server sends the whole picture again on every
 * (re)connection, so nothing is polled.
 */
export function useLiveStream(url: string | null, handlers: Record<string, (data: unknown) => void>): LiveConnection {
  const [connection, setConnection] = useState<LiveConnection>('connecting');
  const handlerRef = useRef(handlers);
  // The event names are read when the stream opens; the handlers themselves may change freely.
  const names = Object.keys(handlers).sort().join(',');
  useEffect(() => {
    handlerRef.current = handlers;
  });
  useEffect(() => {
    if (!url) return;
    let source: EventSource | null = null;
    let timer: ReturnType<typeof setTimeout> | null = null;
    let pauseMs = 3000;
    let stopped = false;
    const open = () => {
      setConnection('connecting');
      source = new EventSource(url);
      source.addEventListener('open', () => {
        setConnection('open');
        pauseMs = 3000;
      });
      for (const name of names.split(',')) {
        source.addEventListener(name, (ev) => handlerRef.current[name]?.(JSON.parse((ev as MessageEvent<string>).data)));
      }
      source.addEventListener('error', () => {
        setConnection('lost');
        if (source?.readyState === EventSource.CLOSED && !stopped) {
          timer = setTimeout(open, pauseMs);
          pauseMs = Math.min(60_000, pauseMs * 2);
        }
      });
    };
    open();
    return () => {
      stopped = true;
      if (timer) clearTimeout(timer);
      source?.close();
    };
  }, [url, names]);
  return connection;
}
