'use client';
import { createContext, useContext, useEffect, useState, useSyncExternalStore, type ReactNode } from 'react';
import { useScopeSource } from './use-scope';
import { createScopeRecorder, type ScopeData, type ScopeRecorder } from './scope-recorder';

const ScopeRecorderContext = createContext<ScopeRecorder | null>(null);

/** Records scope history for the whole workspace session, whichever area is open. */
export function ScopeRecorderProvider({ children }: { children: ReactNode }) {
  const source = useScopeSource();
  const [recorder] = useState(() => createScopeRecorder(source));
  useEffect(() => recorder.start(), [recorder]);
  return <ScopeRecorderContext.Provider value={recorder}>{children}</ScopeRecorderContext.Provider>;
}

/** The recorded histories; re-renders once per drawn snapshot unless `frozen`. */
export function useScopeData(frozen: boolean): ScopeData {
  const recorder = useContext(ScopeRecorderContext);
  if (!recorder) throw new Error('useScopeData needs a <ScopeRecorderProvider>');
  useSyncExternalStore(recorder.subscribe, recorder.getVersion, recorder.getVersion);
  const [held, setHeld] = useState<ScopeData | null>(null);
  if (frozen && !held) setHeld(recorder.getData());
  if (!frozen && held) setHeld(null);
  return frozen && held ? held : recorder.getData();
}
