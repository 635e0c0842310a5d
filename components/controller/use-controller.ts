'use client';
/**
 * The Controller area's one hook over the workspace store: the controller's part of the
 * document, the map it runs now and the staged one, and the store's actions for staging,
 * dropping and rebooting (the store keeps engine and document in step). Leaves that show live
 * values read them through the small hooks below.
 */
import { useCallback, useMemo } from 'react';
import { parsePointRef, resolvePointMap, type CellDocument, type RoutineStep } from '@/simulator';
import { shallowEqual, useCanEdit, useEditDocument, useSendEvent, useSnapshot, useWorkspace } from '@/components/workspace/contract';
import { runningPointMap } from '@/components/workspace/store';

export function useController() {
  const controller = useWorkspace((s) => s.document.controller);
  const canEdit = useCanEdit();
  const editDocument = useEditDocument();
  // What runs now comes from the engine; before the first snapshot, the document's live map.
  const live = useWorkspace(runningPointMap);
  const stagePointMap = useWorkspace((s) => s.stagePointMap);
  const discardStaged = useWorkspace((s) => s.discardStagedPointMap);
  const restartController = useWorkspace((s) => s.restartController);

  const points = useMemo(() => {
    const refs = [...resolvePointMap(live).byRef.keys()];
    const isInput = (r: string) => parsePointRef(r)?.input ?? false;
    return { inputs: refs.filter(isInput), outputs: refs.filter((r) => !isInput(r)) };
  }, [live]);

  const setRoutine = useCallback(
    (routine: RoutineStep[], label: string) =>
      editDocument((d) => {
        d.controller.routine = routine;
      }, label),
    [editDocument],
  );
  const setPoses = useCallback(
    (poses: CellDocument['controller']['poses'], label: string) =>
      editDocument((d) => {
        d.controller.poses = poses;
      }, label),
    [editDocument],
  );
  return { controller, canEdit, live, staged: controller.staged, stagePointMap, discardStaged, restartController, points, setRoutine, setPoses };
}

/** The controller's live state, alarms and handshake, and the power switch. */
export function useControllerStatus() {
  const send = useSendEvent();
  const canEdit = useCanEdit();
  const state = useSnapshot((s) => s.controller.state);
  const detail = useSnapshot((s) => s.controller.detail);
  const powered = useSnapshot((s) => s.controller.powered);
  const servo = useSnapshot((s) => s.controller.servoOn);
  const hold = useSnapshot((s) => s.controller.holdReason);
  const cycles = useSnapshot((s) => s.controller.cyclesCompleted);
  const alarms = useSnapshot((s) => s.controller.alarms, shallowEqual);
  const outputs = useSnapshot((s) => s.controller.handshake, shallowEqual);
  const points = useSnapshot((s) => s.controller.points, shallowEqual);
  const power = useCallback((on: boolean) => send({ type: 'power-controller', on }), [send]);
  return { canEdit, state, detail, powered, servo, hold, cycles, alarms, outputs, points, power };
}

/** Live values of one module's channels, keyed `rack.slot` in the snapshot. */
export function useSlotChannels(rack: number, slot: number): number[] | undefined {
  return useSnapshot((s) => s.controller.channels[`${rack}.${slot}`], shallowEqual);
}

/** Ids of modules a dead-module fault card has taken out. */
export function useDeadModules(): string[] | undefined {
  return useSnapshot((s) => s.controller.moduleFaults, shallowEqual);
}

/** Where the routine is: the step being run and the controller's state. */
export function useRoutineProgress() {
  const pc = useSnapshot((s) => s.controller.pc);
  const state = useSnapshot((s) => s.controller.state);
  return { pc, state };
}

/** The arm's live pose, target and gripper for the 2D view. */
export function useArmState() {
  const pose = useSnapshot((s) => s.arm.pose, shallowEqual);
  const target = useSnapshot((s) => s.arm.target);
  const moving = useSnapshot((s) => s.arm.moving);
  const gripper =
    useSnapshot((s) => {
      const g = s.devices.find((d) => d.type === 'gripper' || d.type === 'vacuum-cup');
      return g ? (g.travel ?? (g.command ? 1 : 0)) : null;
    }) ?? null;
  return { pose, target, moving, gripper };
}
