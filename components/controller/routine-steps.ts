/**
 * Pure helpers of the routine editor: the step kinds in words, a sensible new step of each
 * kind, and reordering. Jump and branch targets by index follow a moved step, so reordering
 * never silently retargets a jump (targets by label need nothing).
 */
import type { RoutineStep } from '@/simulator';

export type StepKind = RoutineStep['kind'];

export const STEP_KINDS: StepKind[] = ['wait', 'set', 'pulse', 'set-word', 'move', 'pause', 'branch', 'jump', 'alarm'];

/** What each kind is called in the editor. */
export const STEP_KIND_WORDS: Record<StepKind, string> = {
  wait: 'wait for signal',
  set: 'set signal',
  pulse: 'pulse signal',
  'set-word': 'set word',
  move: 'move to pose',
  pause: 'pause',
  branch: 'branch if',
  jump: 'jump',
  alarm: 'raise alarm',
};

/** A new step of `kind`, using the first suitable mapped point or pose. */
export function defaultStep(kind: StepKind, ctx: { inputs: string[]; outputs: string[]; poses: string[] }, label?: string): RoutineStep {
  const input = ctx.inputs[0] ?? 'DI1';
  const output = ctx.outputs.find((p) => p.startsWith('DO') || p.startsWith('TO')) ?? ctx.outputs[0] ?? 'DO1';
  const word = ctx.outputs.find((p) => p.startsWith('WO')) ?? 'WO1';
  const withLabel = label ? { label } : {};
  switch (kind) {
    case 'wait':
      return { ...withLabel, kind, condition: { point: input, op: '==', value: 1 } };
    case 'set':
      return { ...withLabel, kind, point: output, value: 1 };
    case 'pulse':
      return { ...withLabel, kind, point: output, ms: 500 };
    case 'set-word':
      return { ...withLabel, kind, point: word, value: 0, encoding: 'binary' };
    case 'move':
      return { ...withLabel, kind, pose: ctx.poses[0] ?? 'home' };
    case 'pause':
      return { ...withLabel, kind, ms: 1000 };
    case 'branch':
      return { ...withLabel, kind, condition: { point: input, op: '==', value: 1 }, to: 0 };
    case 'jump':
      return { ...withLabel, kind, to: 0 };
    case 'alarm':
      return { ...withLabel, kind, message: 'Routine alarm' };
  }
}

/** Moves step `from` to position `to`, renumbering index targets of jumps and branches. */
export function moveStep(steps: readonly RoutineStep[], from: number, to: number): RoutineStep[] {
  if (from === to || from < 0 || to < 0 || from >= steps.length || to >= steps.length) return [...steps];
  const order = steps.map((_, i) => i);
  const [moved] = order.splice(from, 1);
  order.splice(to, 0, moved);
  const newIndex = new Map(order.map((old, i) => [old, i]));
  return order.map((old) => {
    const s = steps[old];
    if ((s.kind === 'jump' || s.kind === 'branch') && typeof s.to === 'number') {
      return { ...s, to: newIndex.get(s.to) ?? s.to };
    }
    return s;
  });
}
