/**
 * The routine's part of a diff. Steps have no ids and their order is their meaning, so they
 * are aligned as a list (jsondiffpatch's array diff with move detection): a labelled step is
 * the same step wherever it goes; an unlabelled one is recognised by its content. A step that
 * was removed and one that was added in the same gap between unchanged steps, of the same
 * kind, are one step that was edited (`changed`) — that is how a person reads "step 5's
 * timeout went from 2 s to 3 s". Poses are keyed by id.
 */
import type { CellDocument, Condition, RoutineStep } from '@/simulator/schema/cell-document';
import { alignLists, byCodeUnits, diffFields, diffKeyed } from './delta';
import { keyedEntries } from './entries';
import { describeChanges, formatValue } from './format';
import type { DiffEntry } from './types';

/** JSON with sorted keys, so two equal steps written in another key order hash alike. */
function canonicalJson(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonicalJson).join(',')}]`;
  if (v !== null && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    const keys = Object.keys(o).filter((k) => o[k] !== undefined).sort(byCodeUnits);
    return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`).join(',')}}`;
  }
  return JSON.stringify(v);
}

function stepHash(s: RoutineStep): string {
  return s.label ? `label:${s.label}` : `step:${canonicalJson(s)}`;
}

function cond(c: Condition): string {
  return `${c.point} ${c.op} ${c.value}`;
}

/** A step in one line: `wait DI6 == 1 (timeout 10000 ms)`, `move pick`, `set TO1 = 1`. */
export function stepText(s: RoutineStep): string {
  const label = s.label ? ` [${s.label}]` : '';
  switch (s.kind) {
    case 'wait':
      return `wait ${cond(s.condition)}${s.timeoutMs !== undefined ? ` (timeout ${s.timeoutMs} ms)` : ''}${label}`;
    case 'set':
      return `set ${s.point} = ${s.value}${label}`;
    case 'pulse':
      return `pulse ${s.point} ${s.ms} ms${label}`;
    case 'set-word':
      return `set word ${s.point} = ${s.value} (${s.encoding})${label}`;
    case 'move':
      return `move ${s.pose}${s.speedPercent !== undefined ? ` at ${s.speedPercent} %` : ''}${label}`;
    case 'pause':
      return `pause ${s.ms} ms${label}`;
    case 'branch':
      return `branch if ${cond(s.condition)} to ${formatValue(s.to)}${label}`;
    case 'jump':
      return `jump to ${formatValue(s.to)}${label}`;
    case 'alarm':
      return `alarm ${formatValue(s.message)}${label}`;
  }
}

/** The id of a step: its label, or `#<n>` with n counted from 1 as the routine editor shows it. */
function stepId(s: RoutineStep, index: number): string {
  return s.label ?? `#${index + 1}`;
}

const STEPS = ['controller', 'routine'] as const;
const KIND_ORDER = { removed: 0, added: 1, changed: 2, reordered: 3, moved: 4 } as const;

/** Step entries (sequence order) then pose entries (by id), area `routine`. */
export function diffRoutine(base: CellDocument, proposed: CellDocument): DiffEntry[] {
  const a = base.controller.routine;
  const b = proposed.controller.routine;
  const align = alignLists(a, b, stepHash);
  const steps: DiffEntry[] = [];
  const step = (kind: DiffEntry['kind'], baseIndex: number | undefined, proposedIndex: number | undefined, rest: Pick<DiffEntry, 'detail' | 'changes'> & Partial<DiffEntry>): DiffEntry => {
    const s = proposedIndex !== undefined ? b[proposedIndex] : a[baseIndex!];
    const index = proposedIndex ?? baseIndex!;
    return {
      area: 'routine',
      kind,
      target: 'step',
      id: stepId(s, index),
      importance: 'high',
      path: [...STEPS, index],
      ...(baseIndex !== undefined ? { baseIndex } : {}),
      ...(proposedIndex !== undefined ? { proposedIndex } : {}),
      ...rest,
    };
  };
  const changed = (i: number, j: number) => {
    const changes = diffFields(a[i], b[j]);
    if (changes.length > 0) steps.push(step('changed', i, j, { changes, detail: `step ${j + 1} (${stepText(b[j])}): ${describeChanges(changes)}` }));
  };

  // Gaps between steps that kept their order: a removed and an added step of the same kind in
  // one gap are paired, in order, as one edited step.
  const anchors = align.pairs.filter((p) => !p.moved).sort((x, y) => x.baseIndex - y.baseIndex);
  const gapOf = (index: number, side: 'baseIndex' | 'proposedIndex') => anchors.filter((p) => p[side] < index).length;
  const added = new Set(align.added);
  for (const i of align.removed) {
    const j = align.added.find((k) => added.has(k) && gapOf(k, 'proposedIndex') === gapOf(i, 'baseIndex') && b[k].kind === a[i].kind);
    if (j === undefined) {
      steps.push(step('removed', i, undefined, { changes: [], value: a[i], detail: `step ${i + 1} removed: ${stepText(a[i])}` }));
      continue;
    }
    added.delete(j);
    changed(i, j);
  }
  for (const j of added) steps.push(step('added', undefined, j, { changes: [], value: b[j], detail: `step ${j + 1} added: ${stepText(b[j])}` }));
  for (const p of align.pairs) {
    if (p.moved) steps.push(step('reordered', p.baseIndex, p.proposedIndex, { changes: [], detail: `step ${stepText(b[p.proposedIndex])} now runs as step ${p.proposedIndex + 1} (was step ${p.baseIndex + 1})` }));
    changed(p.baseIndex, p.proposedIndex);
  }
  steps.sort((x, y) => (x.proposedIndex ?? x.baseIndex!) - (y.proposedIndex ?? y.baseIndex!) || KIND_ORDER[x.kind] - KIND_ORDER[y.kind]);

  const poses = keyedEntries(diffKeyed(base.controller.poses, proposed.controller.poses, (p) => p.id), {
    area: 'routine',
    target: 'pose',
    noun: 'pose',
    id: (p) => p.id,
    path: (i) => ['controller', 'poses', i],
    text: (p) => `${p.label ? `"${p.label}" ` : ''}at ${formatValue(p.coordinates)}, speed ${p.speed}, accel ${p.accel}`,
  });
  return [...steps, ...poses];
}
