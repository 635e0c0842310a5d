'use client';
/**
 * The Monitor area's one hook over the workspace store: every PLC address and controller point
 * with its live value, what each is wired to, which carry the e-stop chain or a guard, and the
 * force controls where the workspace allows forcing. The force banner reads `useForces`.
 */
import { useMemo } from 'react';
import { shallowEqual, useForceAllowed, useSelection, useSendEvent, useSnapshot, useWorkspace } from '@/components/workspace/contract';
import { useRelated } from '@/components/workspace/use-related';
import { useSignalLabels } from '@/components/workspace/use-signal-labels';
import { safetyCarriers } from './safety-points';

export function useMonitor() {
  const forceAllowed = useForceAllowed();
  const addresses = useSnapshot((s) => s.plc.addresses, shallowEqual);
  const points = useSnapshot((s) => s.controller.points, shallowEqual);
  const document = useWorkspace((s) => s.document);
  const labels = useSignalLabels();
  const carriers = useMemo(() => safetyCarriers(document), [document]);
  return { forceAllowed, addresses: addresses ?? {}, points: points ?? [], wiring: document.wiring, labels, carriers };
}

/** One monitor row's link to the shared selection (its own target, or an address wired to the selected device or row). */
export function useMonitorRow(kind: 'address' | 'point', target: string) {
  const [selection, select] = useSelection();
  const related = useRelated();
  const selected = (selection?.kind === kind && selection.id === target) || (kind === 'address' && related.addresses.has(target));
  return { selected, select: () => select({ kind, id: target }) };
}

/** Force and unforce (the store refuses both where forcing is not allowed). */
export function useForceActions() {
  const send = useSendEvent();
  return useMemo(
    () => ({
      force: (target: string, value: number) => send({ type: 'force', target, value }),
      unforce: (target: string) => send({ type: 'unforce', target }),
    }),
    [send],
  );
}

/** The targets forced now, and whether this workspace lets them be released here. */
export function useForces() {
  const targets = useSnapshot((s) => Object.keys(s.forces), shallowEqual) ?? [];
  const forceAllowed = useForceAllowed();
  return { targets, forceAllowed, ...useForceActions() };
}
