'use client';
import { useEffect, useState, type ReactNode } from 'react';
import { WorkspaceStoreContext, type WorkspaceInit, type WorkspaceStoreApi } from './contract';
import { createWorkspaceStore, type EngineFactory } from './store';
import { connectEngineWorker } from './engine-connection';

/**
 * Creates this workspace's store once (and its engine worker) and provides it to the areas.
 * `engineFactory` defaults to the Web Worker; tests may pass a fake.
 */
export function WorkspaceProvider({ init, engineFactory, children }: { init: WorkspaceInit; engineFactory?: EngineFactory; children: ReactNode }) {
  // Lazy state: one store per provider instance; the worker is attached in an effect (browser only).
  const [store] = useState<WorkspaceStoreApi>(() => createWorkspaceStore(init));
  useEffect(() => store.getState().attachEngine(engineFactory ?? connectEngineWorker), [store, engineFactory]);
  return <WorkspaceStoreContext.Provider value={store}>{children}</WorkspaceStoreContext.Provider>;
}
