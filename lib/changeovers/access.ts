import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import type { Changeover } from '@/db/changeovers';
import { findChangeover } from '@/db/changeovers';
import { ROLE_TABLE } from '@/lib/roles';

/**
 * Who may see and do what with a changeover (one place, used by pages, route handlers and the
 * evidence routes alike):
 * - read: the admin (any); the person who opened it and the cell's owner; the person asked to
 *   countersign. Anyone else — another lead, another trainer — gets 404, so ids reveal nothing.
 *   Students have no changeovers at all (403 by role).
 * - edit (text, pin, checks, evidence acceptances, sign, roll back): the person who opened it,
 *   who owns the cell. A reader who is not the editor gets 403.
 * - countersign: a reader other than the signer whose role may countersign (lead, trainer,
 *   admin); the sign-off rules themselves are in sign-off.ts.
 */
function readsChangeover(user: User, co: Changeover): boolean {
  if (!ROLE_TABLE.changeovers.includes(user.role)) return false;
  if (user.role === 'admin') return true;
  return co.openedBy.id === user.id || co.cellOwnerId === user.id || co.countersigner?.id === user.id;
}

function editsChangeover(user: User, co: Changeover): boolean {
  return user.role !== 'admin' && (co.openedBy.id === user.id || co.cellOwnerId === user.id);
}

/** True when the user may read the changeover (false for a missing id too). */
export async function canReadChangeover(user: User, id: string): Promise<boolean> {
  const co = await findChangeover(id);
  return co !== null && readsChangeover(user, co);
}

/** A changeover the user may read: 403 for a role without changeovers, 404 when it is not theirs to see. */
export async function changeoverForReader(user: User, id: string): Promise<Changeover> {
  if (!ROLE_TABLE.changeovers.includes(user.role)) throw new ApiError(403, 'Your role may not do this.');
  const co = await findChangeover(id);
  if (!co || !readsChangeover(user, co)) throw new ApiError(404, 'No such changeover.');
  return co;
}

/** A changeover the user may change: 404 as for reading, 403 when they may read but not change it. */
export async function changeoverForEditor(user: User, id: string): Promise<Changeover> {
  const co = await changeoverForReader(user, id);
  if (!editsChangeover(user, co)) throw new ApiError(403, 'Only the person who opened this changeover can change it.');
  return co;
}

/** A changeover the user may countersign: readable, a countersigning role, and not the one who signed it. */
export async function changeoverForCountersigner(user: User, id: string): Promise<Changeover> {
  const co = await changeoverForReader(user, id);
  if (!ROLE_TABLE.countersign.includes(user.role)) throw new ApiError(403, 'Your role may not countersign.');
  return co;
}

/** What the page may offer this user (buttons shown; the routes check again). */
export function changeoverAbilities(user: User, co: Changeover): { edit: boolean; countersign: boolean } {
  return {
    edit: editsChangeover(user, co),
    countersign: readsChangeover(user, co) && ROLE_TABLE.countersign.includes(user.role) && co.signedBy?.id !== user.id,
  };
}
