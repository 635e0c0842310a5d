'use client';
import { useMemo } from 'react';
import { useCellDocument } from './contract';
import { signalLabels } from './signal-labels';

/** Labels by signal key (`%IX0.0`, `DI3`) for the open cell, recomputed only when the document changes. */
export function useSignalLabels(): Record<string, string> {
  const document = useCellDocument();
  return useMemo(() => signalLabels(document), [document]);
}
