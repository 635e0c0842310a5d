/**
 * Turns a keyed comparison (delta.ts) into diff entries. Every list with ids (devices,
 * modules, wires, point-map rows, blocks, connections, poses) goes through here, so all of
 * them word, order and locate their entries alike.
 */
import { byCodeUnits, type Keyed, type KeyedDiff } from './delta';
import { describeChanges } from './format';
import type { DiffArea, DiffEntry, DiffTarget, FieldChange } from './types';

/** A thing present on both sides with different fields. */
export type ChangedPair<T> = { key: string; base: Keyed<T>; proposed: Keyed<T>; changes: FieldChange[] };

/** How one kind of thing is named, summarised and located. */
export type KeyedSpec<T> = {
  area: DiffArea;
  target: DiffTarget;
  /** Noun used in details: `block`, `wire`, `point-map row` ... */
  noun: string;
  id: (item: T) => string;
  /** Document path of the item at `index` of its list. */
  path: (index: number) => (string | number)[];
  /** The item in one line, for added and removed entries. */
  text: (item: T) => string;
  /** Entries for a changed item; by default one `changed` entry listing the changes. */
  changed?: (pair: ChangedPair<T>, common: Omit<DiffEntry, 'kind' | 'detail' | 'changes'>) => DiffEntry[];
  /** Fields every entry of this list carries (e.g. `map: 'live'`). */
  extra?: Partial<DiffEntry>;
};

/** Entries for one keyed comparison, ordered by key; a changed key may yield several entries. */
export function keyedEntries<T>(kd: KeyedDiff<T>, spec: KeyedSpec<T>): DiffEntry[] {
  const groups: { key: string; entries: DiffEntry[] }[] = [];
  const common = (item: T, index: number) => ({ area: spec.area, target: spec.target, id: spec.id(item), importance: 'high' as const, path: spec.path(index), ...spec.extra });
  for (const { key, index, item } of kd.added) {
    groups.push({ key, entries: [{ ...common(item, index), kind: 'added', changes: [], value: item, detail: `${spec.noun} ${spec.id(item)} added: ${spec.text(item)}` }] });
  }
  for (const { key, index, item } of kd.removed) {
    groups.push({ key, entries: [{ ...common(item, index), kind: 'removed', changes: [], value: item, detail: `${spec.noun} ${spec.id(item)} removed: ${spec.text(item)}` }] });
  }
  for (const pair of kd.changed) {
    const c = common(pair.proposed.item, pair.proposed.index);
    const entries = spec.changed
      ? spec.changed(pair, c)
      : [{ ...c, kind: 'changed' as const, changes: pair.changes, detail: `${spec.noun} ${c.id}: ${describeChanges(pair.changes)}` }];
    groups.push({ key: pair.key, entries });
  }
  return groups.sort((a, b) => byCodeUnits(a.key, b.key)).flatMap((g) => g.entries);
}

/**
 * Splits a changed item's field changes into edits and a canvas/front-plate `position`
 * move, which becomes its own low-importance `moved` entry.
 */
export function splitPositionMove<T extends { position?: { x: number; y: number } }>(
  pair: ChangedPair<T>,
  common: Omit<DiffEntry, 'kind' | 'detail' | 'changes'>,
  noun: string,
  where: string,
  editDetail: (edits: FieldChange[]) => string,
): DiffEntry[] {
  const moves = pair.changes.filter((ch) => ch.path === 'position' || ch.path.startsWith('position.'));
  const edits = pair.changes.filter((ch) => !moves.includes(ch));
  const out: DiffEntry[] = [];
  if (edits.length > 0) out.push({ ...common, kind: 'changed', changes: edits, detail: editDetail(edits) });
  if (moves.length > 0) {
    const from = pair.base.item.position;
    const to = pair.proposed.item.position;
    const at = (p: { x: number; y: number } | undefined) => (p ? `(${p.x}, ${p.y})` : '—');
    out.push({ ...common, kind: 'moved', importance: 'low', changes: [{ path: 'position', from, to }], detail: `${noun} ${common.id} moved ${where} ${at(from)} → ${at(to)}` });
  }
  return out;
}
