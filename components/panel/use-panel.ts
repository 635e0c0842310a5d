'use client';
/**
 * The Panel area's one hook over the workspace store: the plate's devices with their live
 * state, edit mode, the shared selection, and the panel's colour warnings. The leaves take
 * what they need from here (`usePanelSend`, `usePanelEditing`), never from the store itself.
 */
import { useMemo } from 'react';
import type { CellSnapshot } from '@/simulator';
import { shallowEqual, useEditDocument, useSelection, useSendEvent, useSnapshot, useWorkspace } from '@/components/workspace/contract';
import { useRelated } from '@/components/workspace/use-related';
import { useAreaProblems } from '@/components/workspace/use-area-problems';

export type DeviceSnapshot = CellSnapshot['devices'][number];

export function usePanel() {
  const panel = useWorkspace((s) => s.document.panel);
  const editMode = useWorkspace((s) => s.editMode && s.canEdit);
  const devices = useSnapshot((s) => s.devices, shallowEqual);
  const [selection, select] = useSelection();
  const edit = useEditDocument();
  const related = useRelated();
  // The engine's IEC 60204-1 colour warnings about the panel (the cell runs anyway).
  const { warnings } = useAreaProblems('panel');
  const states = useMemo(() => new Map((devices ?? []).map((d) => [d.id, d])), [devices]);
  return { panel, editMode, states, selection, select, edit, related, warnings };
}

/** Operating a device: press, release, turn, set (the run's event log records each). */
export function usePanelSend() {
  return useSendEvent();
}

/** Editing the plate: change the document (one undo step each) and move the selection. */
export function usePanelEditing() {
  const edit = useEditDocument();
  const [, select] = useSelection();
  return { edit, select };
}
