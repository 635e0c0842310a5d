'use client';
/**
 * The Logic area's one hook over the workspace store: the sheet, its edits (each one undo step),
 * the selected block (the workspace's one shared selection), the sheet's problems, whether
 * the cell runs, and the cell's name and a whole-sheet replacement for the sheet files.
 * Blocks and wires read their live values through `useLiveOutput`.
 */
import { useCallback, useMemo } from 'react';
import type { CellDocument, Problem } from '@/simulator';
import { useCanEdit, useEditDocument, useSnapshot, useWorkspace, useWorkspaceApi } from '@/components/workspace/contract';
import { useAreaProblems } from '@/components/workspace/use-area-problems';
import type { Sheet } from './sheet-graph';

type DocSheet = CellDocument['plc']['sheet'];
const SHEET_PATH = 2; // problems' paths start ['plc', 'sheet', …]

export function useLogic() {
  const sheet = useWorkspace((s) => s.document.plc.sheet) as Sheet;
  const editDocument = useEditDocument();
  const canEdit = useCanEdit();
  const running = useWorkspace((s) => s.engine.running);
  const selectedId = useWorkspace((s) => (s.selection?.kind === 'block' ? s.selection.id : null));
  const cellName = useWorkspace((s) => s.document.name);
  const replaceLogicSheet = useWorkspace((s) => s.replaceLogicSheet);
  const api = useWorkspaceApi();
  const { errors } = useAreaProblems('logic');
  // The canvas indexes problems by paths inside the sheet.
  const problems = useMemo<Problem[]>(
    () => errors.filter((p) => p.path[1] === 'sheet').map((p) => ({ ...p, path: p.path.slice(SHEET_PATH) })),
    [errors],
  );
  /** Replaces the sheet as one undo step; `keepRun` for edits that change no behaviour (moving blocks). */
  const editSheet = useCallback(
    (next: Sheet, label: string, keepRun = false) =>
      editDocument(
        (draft) => {
          draft.plc.sheet = next as DocSheet;
        },
        label,
        keepRun ? { engine: 'keep' } : undefined,
      ),
    [editDocument],
  );
  /** Replaces the whole sheet (an imported file) as one undo step. */
  const replaceSheet = useCallback((next: Sheet, label: string) => replaceLogicSheet(next as DocSheet, label), [replaceLogicSheet]);
  const selectBlock = useCallback(
    (id: string | null) => {
      const { selection, select } = api.getState();
      if (id) select({ kind: 'block', id });
      // Clearing the canvas selection clears a selected block only, never another area's selection.
      else if (selection?.kind === 'block') select(null);
    },
    [api],
  );
  return { sheet, editSheet, replaceSheet, cellName, canEdit, running, selectedId, selectBlock, problems };
}

/** The live value of one block output (undefined before the first snapshot). */
export function useLiveOutput(block: string, port: string): number | boolean | undefined {
  return useSnapshot((s) => s.plc.blockOutputs[block]?.[port]);
}
