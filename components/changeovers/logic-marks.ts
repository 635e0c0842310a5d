import type { DiffEntry } from '@/simulator';

/** How a block or a wire is marked on a changeover's canvas. */
export type Mark = 'new' | 'changed' | 'removed' | 'moved';
/** Which sheet the canvas shows. */
export type Side = 'base' | 'proposed';

/**
 * Which mark each block and connection gets on each sheet, from the logic entries of the diff:
 * added things are new on the proposal, removed ones removed on the base, changed ones changed
 * on both (the base shows what they were), blocks only dragged elsewhere moved on the proposal.
 */
export function logicMarks(entries: readonly DiffEntry[]): Record<Side, { blocks: Map<string, Mark>; connections: Map<string, Mark> }> {
  const out = {
    base: { blocks: new Map<string, Mark>(), connections: new Map<string, Mark>() },
    proposed: { blocks: new Map<string, Mark>(), connections: new Map<string, Mark>() },
  };
  for (const e of entries) {
    const kind = e.target === 'block' ? 'blocks' : e.target === 'connection' ? 'connections' : null;
    if (!kind) continue;
    if (e.kind === 'added') out.proposed[kind].set(e.id, 'new');
    else if (e.kind === 'removed') out.base[kind].set(e.id, 'removed');
    else if (e.kind === 'moved') out.proposed[kind].set(e.id, 'moved');
    else {
      out.proposed[kind].set(e.id, 'changed');
      out.base[kind].set(e.id, 'changed');
    }
  }
  return out;
}
