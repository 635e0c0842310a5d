'use client';
import { useMemo } from 'react';
import { useWorkspace } from './contract';
import { relatedToSelection, type Related } from './selection';

/** Devices, rows and addresses linked to the shared selection (see selection.ts). */
export function useRelated(): Related {
  const selection = useWorkspace((s) => s.selection);
  const wiring = useWorkspace((s) => s.document.wiring);
  return useMemo(() => relatedToSelection(selection, wiring), [selection, wiring]);
}
