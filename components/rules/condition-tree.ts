/**
 * The builder's model of a condition: leaves combined with all / any / not. Both rule formats
 * have this shape — an interlock rule's condition (a PLC bit on or off) and a trace rule's
 * predicate (a signal compared with a value) — so one set of edits serves the proofs' rule
 * form and the drill editor alike. The tree *is* the stored JSON: edits return new trees and
 * never add keys of their own, so a condition read from the database round-trips unchanged.
 *
 * A path walks from the root: a number is a child of an all / any group, `'not'` steps into
 * a not. The root's path is `[]`.
 */

/** A condition tree over leaves `L`. */
export type Tree<L> = L | { all: Tree<L>[] } | { any: Tree<L>[] } | { not: Tree<L> };
export type TreePath = readonly (number | 'not')[];
export type GroupOp = 'all' | 'any';

/** Whether a node is a leaf (neither a group nor a not). */
export function isLeaf<L extends object>(node: Tree<L>): node is L {
  return !('all' in node) && !('any' in node) && !('not' in node);
}

/** The op of a group node, or null for a leaf or a not. */
export function groupOp<L extends object>(node: Tree<L>): GroupOp | null {
  if ('all' in node) return 'all';
  if ('any' in node) return 'any';
  return null;
}

/** The children of a group (empty for a leaf or a not). */
export function childrenOf<L extends object>(node: Tree<L>): Tree<L>[] {
  if ('all' in node) return (node as { all: Tree<L>[] }).all;
  if ('any' in node) return (node as { any: Tree<L>[] }).any;
  return [];
}

/** The node at `path`, or undefined when the path does not lead anywhere. */
export function nodeAt<L extends object>(tree: Tree<L>, path: TreePath): Tree<L> | undefined {
  let node: Tree<L> | undefined = tree;
  for (const step of path) {
    if (!node) return undefined;
    if (step === 'not') node = 'not' in node ? (node as { not: Tree<L> }).not : undefined;
    else node = childrenOf(node)[step];
  }
  return node;
}

/** A copy of `tree` with the node at `path` replaced by `f(node)`. */
export function updateAt<L extends object>(tree: Tree<L>, path: TreePath, f: (node: Tree<L>) => Tree<L>): Tree<L> {
  if (path.length === 0) return f(tree);
  const [step, ...rest] = path;
  if (step === 'not') {
    if (!('not' in tree)) throw new Error('path steps into a not that is not there');
    return { not: updateAt((tree as { not: Tree<L> }).not, rest, f) };
  }
  const op = groupOp(tree);
  const kids = childrenOf(tree);
  if (!op || step < 0 || step >= kids.length) throw new Error(`path step ${step} is not a child here`);
  const next = kids.map((k, i) => (i === step ? updateAt(k, rest, f) : k));
  return (op === 'all' ? { all: next } : { any: next }) as Tree<L>;
}

/**
 * Adds `node` beside the node at `path`: appended to it when it is a group; otherwise the
 * node at `path` and the new one become an `all` group in its place (what "add a condition"
 * under a single condition means: both must hold).
 */
export function addCondition<L extends object>(tree: Tree<L>, path: TreePath, node: Tree<L>): Tree<L> {
  return updateAt(tree, path, (here) => {
    const op = groupOp(here);
    if (op === 'all') return { all: [...childrenOf(here), node] };
    if (op === 'any') return { any: [...childrenOf(here), node] };
    return { all: [here, node] };
  });
}

/**
 * Removes the node at `path` from its group. A group left empty goes too, and so does a not
 * around a removed node. Removing the root (or everything up to it) returns null: the caller
 * puts a fresh leaf there.
 */
export function removeAt<L extends object>(tree: Tree<L>, path: TreePath): Tree<L> | null {
  if (path.length === 0) return null;
  const parentPath = path.slice(0, -1);
  const last = path[path.length - 1];
  const parent = nodeAt(tree, parentPath);
  if (!parent) return tree;
  if (last === 'not') return removeAt(tree, parentPath);
  const op = groupOp(parent);
  const kids = childrenOf(parent);
  if (!op) return tree;
  if (kids.length <= 1) return removeAt(tree, parentPath);
  const rest = kids.filter((_, i) => i !== last);
  return updateAt(tree, parentPath, () => (op === 'all' ? { all: rest } : { any: rest }) as Tree<L>);
}

/** Switches the group at `path` between all and any (a leaf or a not is left as it is). */
export function setGroupOp<L extends object>(tree: Tree<L>, path: TreePath, op: GroupOp): Tree<L> {
  return updateAt(tree, path, (here) => {
    const kids = childrenOf(here);
    if (!groupOp(here)) return here;
    return (op === 'all' ? { all: kids } : { any: kids }) as Tree<L>;
  });
}

/** Wraps the node at `path` in a not, or takes the not away when it already is one. */
export function toggleNot<L extends object>(tree: Tree<L>, path: TreePath): Tree<L> {
  return updateAt(tree, path, (here) => ('not' in here ? (here as { not: Tree<L> }).not : { not: here }));
}

/** Turns the node at `path` into a group of `op` holding it and `node` (to start an "or" under an "and", say). */
export function wrapInGroup<L extends object>(tree: Tree<L>, path: TreePath, op: GroupOp, node: Tree<L>): Tree<L> {
  return updateAt(tree, path, (here) => (op === 'all' ? { all: [here, node] } : { any: [here, node] }) as Tree<L>);
}

/** Lifts a group of one child into that child (the builder offers it; saving never does it behind the lead's back). */
export function unwrapSingle<L extends object>(tree: Tree<L>, path: TreePath): Tree<L> {
  return updateAt(tree, path, (here) => {
    const kids = childrenOf(here);
    return groupOp(here) && kids.length === 1 ? kids[0] : here;
  });
}

/** Every leaf with its path, depth first in reading order. */
export function leaves<L extends object>(tree: Tree<L>, path: (number | 'not')[] = []): { path: TreePath; leaf: L }[] {
  if (isLeaf(tree)) return [{ path, leaf: tree }];
  if ('not' in tree) return leaves((tree as { not: Tree<L> }).not, [...path, 'not']);
  return childrenOf(tree).flatMap((k, i) => leaves(k, [...path, i]));
}

/** How deep the tree nests (a lone leaf is 1), for the engine's nesting limit. */
export function depth<L extends object>(tree: Tree<L>): number {
  if (isLeaf(tree)) return 1;
  if ('not' in tree) return 1 + depth((tree as { not: Tree<L> }).not);
  return 1 + Math.max(0, ...childrenOf(tree).map((k) => depth(k)));
}

/** A path as a stable text (React keys, test ids): `root`, `0`, `1.not.0`. */
export function pathKey(path: TreePath): string {
  return path.length === 0 ? 'root' : path.join('.');
}
