/**
 * The one place that talks to jsondiffpatch. Lists of things with ids are turned into
 * `{ [id]: thing }` maps before diffing: jsondiffpatch's array diff is an LCS, quadratic in the
 * list length (seconds at 10,000 blocks with scattered inserts), while a map diff is linear
 * (shared/TOOLCHAIN.md). Only the routine, whose order is its meaning and which has no ids,
 * goes through the array diff (at most 1,000 steps, CELL_LIMITS).
 */
import * as jsondiffpatch from 'jsondiffpatch';
import type { Delta } from 'jsondiffpatch';
import type { FieldChange } from './types';

// Nested arrays inside one thing (stack-light tiers, pose coordinates) are short and are
// reported whole (see flattenDelta), so no move detection is needed there.
const mapPatcher = jsondiffpatch.create({ arrays: { detectMove: false } });

/** One item of a list with the key it is diffed under and its index in its own list. */
export type Keyed<T> = { key: string; index: number; item: T };

/** A keyed comparison: what only one side has, and what both have with different fields. */
export type KeyedDiff<T> = {
  added: Keyed<T>[];
  removed: Keyed<T>[];
  changed: { key: string; base: Keyed<T>; proposed: Keyed<T>; changes: FieldChange[] }[];
};

// Ids become map keys behind a prefix: a logic-sheet id may be `__proto__`, which as a plain
// property name would set the map's prototype instead of adding a key.
const PREFIX = '$';

function keyed<T>(items: readonly T[], keyOf: (t: T) => string, view: (t: T) => unknown) {
  const byKey = new Map<string, Keyed<T> & { view: unknown }>();
  items.forEach((item, index) => {
    let key = keyOf(item);
    // A document that failed cross-reference validation may repeat an id; keep every copy
    // (the second as `id#2` ...) so nothing silently disappears from the diff.
    for (let n = 2; byKey.has(key); n++) key = `${keyOf(item)}#${n}`;
    byKey.set(key, { key, index, item, view: view(item) });
  });
  return byKey;
}

/**
 * Equality of two JSON values (a field that is undefined counts as absent, as in JSON).
 * Only a pre-filter: things equal here are left out before jsondiffpatch runs, which then
 * diffs the few that differ. Between two versions of a 10,000-block sheet that cuts the diff
 * from ~100 ms (jsondiffpatch walks every field of every block) to a few ms.
 */
function jsonEqual(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const bb = b as unknown[];
    return a.length === bb.length && a.every((x, i) => jsonEqual(x, bb[i]));
  }
  const ao = a as Record<string, unknown>;
  const bo = b as Record<string, unknown>;
  let count = 0;
  for (const k in ao) {
    if (!Object.prototype.hasOwnProperty.call(ao, k) || ao[k] === undefined) continue;
    if (!Object.prototype.hasOwnProperty.call(bo, k) || !jsonEqual(ao[k], bo[k])) return false;
    count++;
  }
  for (const k in bo) if (Object.prototype.hasOwnProperty.call(bo, k) && bo[k] !== undefined) count--;
  return count === 0;
}

/** Code-unit order: the same on every machine and locale (localeCompare is not). */
export function byCodeUnits(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/**
 * Diffs two lists of things by key with jsondiffpatch. `view` picks what is compared (for
 * example a point-map row with its points keyed by logical point); field changes are paths in
 * that view. Results are sorted by key.
 */
export function diffKeyed<T>(base: readonly T[], proposed: readonly T[], keyOf: (t: T) => string, view: (t: T) => unknown = (t) => t): KeyedDiff<T> {
  const a = keyed(base, keyOf, view);
  const b = keyed(proposed, keyOf, view);
  const left: Record<string, unknown> = {};
  const right: Record<string, unknown> = {};
  for (const [key, x] of a) {
    const y = b.get(key);
    if (y && jsonEqual(x.view, y.view)) continue;
    left[PREFIX + key] = x.view;
    if (y) right[PREFIX + key] = y.view;
  }
  for (const [key, y] of b) if (!a.has(key)) right[PREFIX + key] = y.view;
  const out: KeyedDiff<T> = { added: [], removed: [], changed: [] };
  const delta = mapPatcher.diff(left, right) as Record<string, Delta> | undefined;
  if (!delta) return out;
  const plain = (k: Keyed<T>): Keyed<T> => ({ key: k.key, index: k.index, item: k.item });
  for (const prefixed of Object.keys(delta).sort(byCodeUnits)) {
    const key = prefixed.slice(PREFIX.length);
    const d = delta[prefixed];
    if (isAdded(d)) out.added.push(plain(b.get(key)!));
    else if (isDeleted(d)) out.removed.push(plain(a.get(key)!));
    else out.changed.push({ key, base: plain(a.get(key)!), proposed: plain(b.get(key)!), changes: flattenDelta(d, left[prefixed], right[prefixed]) });
  }
  return out;
}

/** Field changes between two values (objects compared field by field, arrays whole). */
export function diffFields(base: unknown, proposed: unknown): FieldChange[] {
  const d = mapPatcher.diff(base, proposed);
  return d === undefined ? [] : flattenDelta(d, base, proposed);
}

function isAdded(d: Delta): boolean {
  return Array.isArray(d) && d.length === 1;
}

function isDeleted(d: Delta): boolean {
  return Array.isArray(d) && d.length === 3 && d[2] === 0;
}

function child(v: unknown, key: string): unknown {
  return v !== null && typeof v === 'object' && Object.prototype.hasOwnProperty.call(v, key) ? (v as Record<string, unknown>)[key] : undefined;
}

/**
 * Turns a jsondiffpatch delta into dotted field changes. An array inside a thing is reported
 * as one change with its whole old and new value: for tiers, coordinates or selector
 * positions a person reads "[red, yellow] → [red, yellow, green]" better than index edits.
 */
export function flattenDelta(delta: Delta, base: unknown, proposed: unknown, prefix = ''): FieldChange[] {
  if (delta === undefined) return [];
  if (Array.isArray(delta)) {
    if (delta.length === 1) return leaves(prefix, delta[0], 'to');
    if (delta.length === 2) return [{ path: prefix, from: delta[0], to: delta[1] }];
    if (delta.length === 3 && delta[2] === 0) return leaves(prefix, delta[0], 'from');
    return [{ path: prefix, from: base, to: proposed }];
  }
  const obj = delta as Record<string, Delta>;
  if ((delta as { _t?: unknown })._t === 'a') return [{ path: prefix, from: base, to: proposed }];
  const out: FieldChange[] = [];
  for (const key of Object.keys(obj).sort(byCodeUnits)) {
    out.push(...flattenDelta(obj[key], child(base, key), child(proposed, key), prefix ? `${prefix}.${key}` : key));
  }
  return out;
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

// An added or removed object field reads better as its leaves (`DI7 label set to "Rear
// guard"`) than as one JSON blob; an empty object stays one change so it is not lost.
function leaves(path: string, value: unknown, side: 'from' | 'to'): FieldChange[] {
  if (!isPlainObject(value) || Object.keys(value).length === 0) return [{ path, [side]: value }];
  return Object.keys(value)
    .filter((k) => value[k] !== undefined)
    .sort(byCodeUnits)
    .flatMap((k) => leaves(path ? `${path}.${k}` : k, value[k], side));
}

/**
 * Collapses field changes to the thing's top-level fields with their whole values: a wire
 * end that changes from `{ plc }` to `{ controller }` is one move, not a removed and an
 * added sub-field.
 */
export function collapseToTop(changes: readonly FieldChange[], base: object, proposed: object): FieldChange[] {
  const tops = [...new Set(changes.map((c) => c.path.split('.')[0]))];
  return tops.map((path) => {
    const from = child(base, path);
    const to = child(proposed, path);
    return { path, ...(from === undefined ? {} : { from }), ...(to === undefined ? {} : { to }) };
  });
}

/** How the items of two ordered lists correspond. Indices are 0-based. */
export type Alignment = {
  /** Items present on both sides (same hash); `moved` when it now runs at another place in the order. */
  pairs: { baseIndex: number; proposedIndex: number; moved: boolean }[];
  removed: number[];
  added: number[];
};

/**
 * Aligns two ordered lists with jsondiffpatch's array diff (LCS with move detection) under
 * the given hash; items with equal hashes are the same item, possibly edited.
 */
export function alignLists<T extends object>(base: readonly T[], proposed: readonly T[], hash: (item: T) => string): Alignment {
  const patcher = jsondiffpatch.create({ objectHash: (o) => hash(o as T), arrays: { detectMove: true, includeValueOnMove: false } });
  const delta = patcher.diff(base, proposed) as Record<string, Delta> | undefined;
  const removed = new Set<number>();
  const movedFrom = new Map<number, number>();
  const added = new Set<number>();
  for (const key of Object.keys(delta ?? {})) {
    if (key === '_t') continue;
    const d = delta![key];
    if (key.startsWith('_')) {
      const i = Number(key.slice(1));
      if (Array.isArray(d) && d[2] === 3) movedFrom.set(i, d[1] as number);
      else removed.add(i);
    } else if (isAdded(d)) added.add(Number(key));
  }
  const movedTo = new Set(movedFrom.values());
  // Items that kept their relative order are the LCS: zip what is left of both sides.
  const keptBase = base.map((_, i) => i).filter((i) => !removed.has(i) && !movedFrom.has(i));
  const keptProposed = proposed.map((_, j) => j).filter((j) => !added.has(j) && !movedTo.has(j));
  const pairs: Alignment['pairs'] = keptBase.map((i, k) => ({ baseIndex: i, proposedIndex: keptProposed[k], moved: false }));
  for (const [i, j] of movedFrom) pairs.push({ baseIndex: i, proposedIndex: j, moved: true });
  pairs.sort((x, y) => x.proposedIndex - y.proposedIndex);
  const num = (x: number, y: number) => x - y;
  return { pairs, removed: [...removed].sort(num), added: [...added].sort(num) };
}
