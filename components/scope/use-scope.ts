'use client';
/**
 * The Scope area's one hook module over the workspace store: the source the scope recorder
 * listens to (exact trace chunks and each drawn snapshot's time) and the signals' labels.
 * The recorded histories themselves come from the recorder (scope-context.tsx).
 */
import { useMemo } from 'react';
import { useWorkspaceApi } from '@/components/workspace/contract';
import { useSignalLabels } from '@/components/workspace/use-signal-labels';
import type { ScopeSource } from './scope-recorder';

/** The workspace store as the recorder's source. */
export function useScopeSource(): ScopeSource {
  const api = useWorkspaceApi();
  return useMemo(
    () => ({
      subscribeTrace: (listener) => api.getState().subscribeTrace(listener),
      subscribeSnapshotTime: (listener) =>
        api.subscribe((s, prev) => {
          if (s.snapshot && s.snapshot !== prev.snapshot) listener(s.snapshot.timeMs);
        }),
    }),
    [api],
  );
}

/** What the Scope area reads from the store: plain-language names of its signals. */
export function useScope() {
  return { labels: useSignalLabels() };
}
