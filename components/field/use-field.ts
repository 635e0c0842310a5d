'use client';
/**
 * The Field area's one hook over the workspace store: field devices and terminal-strip rows
 * with their live state, the area's problems, and what its leaves send or edit.
 */
import { useMemo } from 'react';
import type { CellSnapshot } from '@/simulator';
import { shallowEqual, useEditDocument, useSelection, useSendEvent, useSnapshot, useWorkspace } from '@/components/workspace/contract';
import { useRelated } from '@/components/workspace/use-related';
import { useAreaProblems } from '@/components/workspace/use-area-problems';

export type DeviceSnapshot = CellSnapshot['devices'][number];
export type WireSnapshot = CellSnapshot['wires'][number];

/** The field devices with their live state. */
export function useFieldDevices() {
  const field = useWorkspace((s) => s.document.field);
  const devices = useSnapshot((s) => s.devices, shallowEqual);
  const states = useMemo(() => new Map((devices ?? []).map((d) => [d.id, d])), [devices]);
  return { field, states };
}

/** The terminal strip: rows, live wires, the area's problems (wiring rows and whatever no other area edits). */
export function useTerminalStrip() {
  const wiring = useWorkspace((s) => s.document.wiring);
  const canEdit = useWorkspace((s) => s.canEdit);
  const wires = useSnapshot((s) => s.wires, shallowEqual);
  const edit = useEditDocument();
  const { errors } = useAreaProblems('field');
  const live = useMemo(() => new Map((wires ?? []).map((w) => [w.id, w])), [wires]);
  return { wiring, canEdit, live, edit, problems: errors };
}

/** One leaf's link to the shared selection and the run: select it, see whether it is linked to the selection, send, edit. */
export function useFieldItem(kind: 'device' | 'wire', id: string) {
  const [, select] = useSelection();
  const related = useRelated();
  const send = useSendEvent();
  const edit = useEditDocument();
  const selected = kind === 'device' ? related.devices.has(id) : related.wires.has(id);
  return { selected, select: () => select({ kind, id }), send, edit };
}

/** The Field area's hook, as every area has one: the devices and the terminal strip. */
export function useField() {
  return { ...useFieldDevices(), strip: useTerminalStrip() };
}
